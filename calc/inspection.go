package calc

import (
	"fmt"
	"math"
	"strconv"
	"time"
)

// InspectionDue is the inspection-due check: whether the periodic inspection is current.
//
//	next due = last + intervalMonths calendar months
//	demand   = days from the last inspection to asOf            [d]
//	capacity = days from the last inspection to the next due date [d]
//	utilisation = demand / capacity
//
// so a hoist inspected today has utilisation 0, one whose inspection falls due today 1
// (not overdue: pass or marginal, as the caller's band decides) and an overdue one more
// than 1. The interval comes from the caller's rules (ASME B30.16 / B30.2 periodic
// inspection: normal service yearly, heavy semiannually, severe quarterly; standards.md,
// seen). Dates are read as calendar dates in their own location; no clock is read.
//
// Months are calendar months: the day of the month is kept, and a day the target month
// lacks becomes its last day (the earlier date, so never a longer interval than the
// calendar gives). So 2026-01-31 + 1 month is 2026-02-28, 2024-01-31 + 1 month is
// 2024-02-29 (leap year), and 2024-02-29 + 12 months is 2025-02-28. Any start on or before
// the 28th gives the same day of the month.
//
// Figures: next_due (Text, ISO date), days_overdue (asOf − next due, ≥ 0), days_to_due
// (next due − asOf, ≥ 0), days_since_last, interval_days.
//
// It returns a *RangeError when the last inspection date or the run date is missing, the
// last inspection is after the run date, or intervalMonths < 1.
func InspectionDue(last, asOf time.Time, intervalMonths int) (Outcome, error) {
	return inspectionDue(last, asOf, intervalMonths, true, nil)
}

// InspectionDueNumbers is InspectionDue without the calculation record (Outcome.Steps):
// the same numbers, figures and note, for bulk runs. The figures are kept in figs (see
// FigureBuf; nil: a slice of their own).
func InspectionDueNumbers(last, asOf time.Time, intervalMonths int, figs *FigureBuf) (Outcome, error) {
	return inspectionDue(last, asOf, intervalMonths, false, figs)
}

func inspectionDue(last, asOf time.Time, intervalMonths int, record bool, figs *FigureBuf) (Outcome, error) {
	return dueCheck(periodicInspection, last, time.Time{}, asOf, intervalMonths, record, figs)
}

// InspectionDueRegister is InspectionDue where the register also gives its own next due
// date (a schedule shorter than the rules', six-monthly examinations say): the earlier
// of last + interval and the register's date governs, so the register can make the
// inspection fall due sooner, never later. A register date later than the rules allow is
// not used, and the note says so. The note names which date governs; the figure
// register_next_due is added. skipRecord leaves out the calculation record; figs as
// InspectionDueNumbers. It returns a *RangeError as InspectionDue does, and when the
// register's date is not after the last inspection.
func InspectionDueRegister(last, registerDue, asOf time.Time, intervalMonths int, skipRecord bool, figs *FigureBuf) (Outcome, error) {
	if registerDue.IsZero() {
		return inspectionDue(last, asOf, intervalMonths, !skipRecord, figs)
	}
	if !last.IsZero() && !lifeDay(registerDue).After(lifeDay(last)) {
		return Outcome{}, &RangeError{Field: "next_inspection", Msg: fmt.Sprintf("next inspection due %s is not after the last inspection %s", lifeISO(lifeDay(registerDue)), lifeISO(lifeDay(last)))}
	}
	return dueCheck(periodicInspection, last, registerDue, asOf, intervalMonths, !skipRecord, figs)
}

// InspectionDueSchedule is InspectionDueRegister where the register gives the hoist's own
// inspection interval in months (registerMonths > 0; a hoist in arduous service examined
// every 6 months) as well as, or instead of, a next due date (registerDue, zero when not
// given): the register's schedule is the earlier of registerDue and last + registerMonths,
// and it governs where it is earlier than the rules' last + intervalMonths, as in
// InspectionDueRegister; a schedule later than the rules allow is not used, and said so.
// The figure register_interval_months is added. It returns a *RangeError as
// InspectionDueRegister does.
func InspectionDueSchedule(last, registerDue time.Time, registerMonths int, asOf time.Time, intervalMonths int, skipRecord bool, figs *FigureBuf) (Outcome, error) {
	if registerMonths <= 0 {
		return InspectionDueRegister(last, registerDue, asOf, intervalMonths, skipRecord, figs)
	}
	if last.IsZero() {
		return dueCheck(periodicInspection, last, time.Time{}, asOf, intervalMonths, !skipRecord, figs)
	}
	byInterval := addMonthsClamped(lifeDay(last), registerMonths)
	says := "the register's " + strconv.Itoa(registerMonths) + "-month interval"
	due := byInterval
	if !registerDue.IsZero() {
		if !lifeDay(registerDue).After(lifeDay(last)) {
			return Outcome{}, &RangeError{Field: "next_inspection", Msg: fmt.Sprintf("next inspection due %s is not after the last inspection %s", lifeISO(lifeDay(registerDue)), lifeISO(lifeDay(last)))}
		}
		if lifeDay(registerDue).Before(byInterval) {
			due, says = lifeDay(registerDue), "the register's next due date"
		}
	}
	return dueCheckFrom(periodicInspection, last, due, says, registerMonths, asOf, intervalMonths, !skipRecord, figs)
}

// dueTexts names what a due-date check is about, for its notes and errors.
type dueTexts struct {
	field, intervalField string // schema keys of the last date and of what sets the interval
	what, short          string // "periodic inspection", "inspection"
}

var periodicInspection = dueTexts{field: "last_inspection", intervalField: "service", what: "periodic inspection", short: "inspection"}

// dueCheck is a check that something done periodically is current: the last date plus
// an interval of calendar months against the as-of date (InspectionDue's definitions).
// registerDue, when not zero, is the register's own next due date: the earlier of it and
// last + interval governs (InspectionDueRegister).
func dueCheck(t dueTexts, last, registerDue, asOf time.Time, intervalMonths int, record bool, figs *FigureBuf) (Outcome, error) {
	return dueCheckFrom(t, last, registerDue, "the register's next due date", 0, asOf, intervalMonths, record, figs)
}

// dueCheckFrom is dueCheck with the words for what set registerDue ("the register's
// next due date", "the register's 6-month interval") and the register's own interval in
// months (0 none: no figure register_interval_months).
func dueCheckFrom(t dueTexts, last, registerDue time.Time, registerSays string, registerMonths int, asOf time.Time, intervalMonths int, record bool, figs *FigureBuf) (Outcome, error) {
	switch {
	case last.IsZero():
		return Outcome{}, &RangeError{Field: t.field, Msg: "no last " + t.short + " date"}
	case asOf.IsZero():
		return Outcome{}, &RangeError{Msg: "no as-of date for the " + t.short + " check"}
	case intervalMonths < 1:
		return Outcome{}, &RangeError{Field: t.intervalField, Msg: fmt.Sprintf("%s interval must be ≥ 1 month (got %d)", t.short, intervalMonths)}
	}
	l, a := lifeDay(last), lifeDay(asOf)
	if a.Before(l) {
		return Outcome{}, &RangeError{Field: t.field, Msg: fmt.Sprintf("last %s %s is after the as-of date %s", t.short, lifeISO(l), lifeISO(a))}
	}
	next := addMonthsClamped(l, intervalMonths)
	ruleNext, governs := next, ""
	if !registerDue.IsZero() {
		rd := lifeDay(registerDue)
		if rd.Before(next) {
			next = rd
			governs = "; " + registerSays + " governs (earlier than the rules' " + lifeISO(ruleNext) + ")"
		} else if rd.After(next) {
			governs = "; " + registerSays + " (" + lifeISO(rd) + ") is later than the rules' interval allows: the rules' date is used, check the register"
		}
	}
	since := lifeDaysBetween(l, a)
	interval := lifeDaysBetween(l, next)
	overdue := max(0, lifeDaysBetween(next, a))
	toDue := max(0, lifeDaysBetween(a, next))
	u := float64(since) / float64(interval)

	nextISO := lifeISO(next)
	o := Outcome{
		Demand:      float64(since),
		Capacity:    float64(interval),
		Unit:        "d",
		Utilisation: u,
		Verdict:     ByUtilisation,
	}
	figures := []Figure{
		{Name: "next_due", Value: math.NaN(), Text: nextISO},
		{Name: "days_overdue", Value: float64(overdue), Unit: "d"},
		{Name: "days_to_due", Value: float64(toDue), Unit: "d"},
		{Name: "days_since_last", Value: float64(since), Unit: "d"},
		{Name: "interval_days", Value: float64(interval), Unit: "d"},
	}
	if !registerDue.IsZero() {
		figures = append(figures, Figure{Name: "register_next_due", Value: math.NaN(), Text: lifeISO(lifeDay(registerDue))})
	}
	if registerMonths > 0 {
		figures = append(figures, Figure{Name: "register_interval_months", Value: float64(registerMonths), Unit: "1"})
	}
	o.Figures = figs.take(figures)
	if record {
		o.Steps = []Step{
			{Symbol: "next due", Formula: "last + interval (calendar months)", Numbers: fmt.Sprintf("%s + %d months = %s", lifeISO(l), intervalMonths, lifeISO(ruleNext)), Value: math.NaN(), Unit: "date"},
			{Symbol: "days since", Formula: "as-of − last", Numbers: fmt.Sprintf("%s − %s", lifeISO(a), lifeISO(l)), Value: float64(since), Unit: "d"},
			{Symbol: "interval", Formula: "next due − last", Numbers: fmt.Sprintf("%s − %s", lifeISO(next), lifeISO(l)), Value: float64(interval), Unit: "d"},
			{Symbol: "u", Formula: "days since / interval", Numbers: fmt.Sprintf("%d / %d", since, interval), Value: u, Unit: "1"},
		}
	}
	if governs != "" && record && next != ruleNext {
		o.Steps = append(o.Steps[:1], append([]Step{{Symbol: "next due", Formula: registerSays + ", earlier", Numbers: lifeISO(next), Value: math.NaN(), Unit: "date"}}, o.Steps[1:]...)...)
	}
	if overdue > 0 {
		o.Note = t.what + " overdue by " + strconv.Itoa(overdue) + " days (due " + nextISO + ")" + governs
	} else {
		o.Note = "next " + t.what + " due " + nextISO + governs
	}
	return o, nil
}

// LoadTest is the load-test check: whether the last load test covers the rated (or
// proposed) load.
//
//	demand   = rated or proposed load m_L                 [kg]
//	capacity = test load / test factor (covered rated load) [kg]
//	utilisation = m_L · factor / test load
//
// The test factor comes from the caller's rules for the test type: 1.25 for a static test
// and 1.1 for a dynamic test (Machinery Directive 2006/42/EC Annex I 4.1.2.3, the maker's
// verification coefficients; standards.md, law, memory high). A US rule of a test at
// 100–125 % of rated load (29 CFR 1910.179(k)(2)) is a factor of 1 to 1.25. The check
// does not depend on the test date and is not part of the rating.
//
// Figures: covered_rated_load_kg (test load / factor), test_load_ratio (test load / m_L).
//
// It returns a *RangeError for a rated load ≤ 0, a test load ≤ 0 or a factor < 1.
func LoadTest(ratedKg, testKg, testFactor float64) (Outcome, error) {
	return loadTest(ratedKg, testKg, testFactor, true, nil)
}

// LoadTestNumbers is LoadTest without the calculation record (Outcome.Steps): the same
// numbers, figures and note, for bulk runs. The figures are kept in figs (see FigureBuf;
// nil: a slice of their own).
func LoadTestNumbers(ratedKg, testKg, testFactor float64, figs *FigureBuf) (Outcome, error) {
	return loadTest(ratedKg, testKg, testFactor, false, figs)
}

func loadTest(ratedKg, testKg, testFactor float64, record bool, figs *FigureBuf) (Outcome, error) {
	switch {
	case !(ratedKg > 0) || math.IsInf(ratedKg, 0):
		return Outcome{}, &RangeError{Field: "rated_load", Msg: fmt.Sprintf("rated load must be > 0 (got %s kg)", dutyNum(ratedKg))}
	case !(testKg > 0) || math.IsInf(testKg, 0):
		return Outcome{}, &RangeError{Field: "test_load", Msg: fmt.Sprintf("test load must be > 0 (got %s kg)", dutyNum(testKg))}
	case !(testFactor >= 1) || math.IsInf(testFactor, 0):
		return Outcome{}, &RangeError{Field: "test_type", Msg: fmt.Sprintf("test factor must be ≥ 1 (got %s)", dutyNum(testFactor))}
	}
	covered := testKg / testFactor
	u := ratedKg / covered
	o := Outcome{
		Demand:      ratedKg,
		Capacity:    covered,
		Unit:        "kg",
		Utilisation: u,
		Verdict:     ByUtilisation,
		Figures: figs.take([]Figure{
			{Name: "covered_rated_load_kg", Value: covered, Unit: "kg"},
			{Name: "test_load_ratio", Value: testKg / ratedKg, Unit: "1"},
		}),
	}
	if record {
		o.Steps = []Step{
			{Symbol: "m_cov", Formula: "test load / test factor", Numbers: dutyNum(testKg) + " / " + dutyNum(testFactor), Value: covered, Unit: "kg"},
			{Symbol: "u", Formula: "m_L / m_cov", Numbers: dutyNum(ratedKg) + " / " + dutyNum(covered), Value: u, Unit: "1"},
		}
	}
	if u > 1+1e-9 { // the tolerance absorbs rounding of unit conversions at exactly the limit
		o.Note = "the last test covers " + dutyNum(covered) + " kg: a new load test is needed for " + dutyNum(ratedKg) + " kg"
	}
	return o, nil
}

// addMonthsClamped adds n calendar months to the date d, keeping the day of the month or,
// where the target month is shorter, taking its last day.
func addMonthsClamped(d time.Time, n int) time.Time {
	y, m, day := d.Date()
	first := time.Date(y, m+time.Month(n), 1, 0, 0, 0, 0, d.Location())
	last := first.AddDate(0, 1, -1).Day()
	return time.Date(first.Year(), first.Month(), min(day, last), 0, 0, 0, 0, d.Location())
}

// ComponentRating computes the check `component-rating` (design.md Revision 2,
// "Component rating and the rating cap"): the rated (or proposed) load against the
// lowest rating of the parts the mechanism checks do not cover — hook, bottom block,
// trolley, supporting structure — given in the register as the Component WLL.
//
//	demand = m_L [kg],  capacity = Component WLL [kg],  utilisation = m_L / WLL
//
// The utilisation is linear in the rated load and reaches 1 at m_L = WLL, the check's
// limiting rated load. A rated load above the Component WLL fails. Valid ranges: m_L ≥ 0,
// WLL > 0 (h.ComponentWLLKg). Figures: component_wll_kg.
func ComponentRating(h Hoist) (Outcome, error) {
	switch {
	case !(h.RatedLoadKg >= 0) || math.IsInf(h.RatedLoadKg, 0):
		return Outcome{}, &RangeError{Field: "rated_load", Msg: fmt.Sprintf("rated load must be ≥ 0 (got %s kg)", dutyNum(h.RatedLoadKg))}
	case !(h.ComponentWLLKg > 0) || math.IsInf(h.ComponentWLLKg, 0):
		return Outcome{}, &RangeError{Field: "component_wll", Msg: fmt.Sprintf("component WLL must be > 0 (got %s kg)", dutyNum(h.ComponentWLLKg))}
	}
	u := h.RatedLoadKg / h.ComponentWLLKg
	o := Outcome{Demand: h.RatedLoadKg, Capacity: h.ComponentWLLKg, Unit: "kg", Utilisation: u, Verdict: ByUtilisation}
	if h.SkipDetail {
		return o, nil
	}
	o.Figures = h.Figs.take([]Figure{{Name: "component_wll_kg", Value: h.ComponentWLLKg, Unit: "kg"}})
	if !h.SkipRecord {
		o.Steps = []Step{{Symbol: "u", Formula: "m_L / WLL", Numbers: dutyNum(h.RatedLoadKg) + " / " + dutyNum(h.ComponentWLLKg), Value: u, Unit: "1"}}
	}
	if u > 1+1e-9 {
		o.Note = "the rated load is above the lowest rating of hook, block, trolley or structure (Component WLL " + dutyNum(h.ComponentWLLKg) + " kg)"
	}
	return o, nil
}
