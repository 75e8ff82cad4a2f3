package calc

import (
	"math"
	"time"
)

// LimiterInput is what the overload-limiter check reads.
type LimiterInput struct {
	// Fitted: the register says a rated capacity limiter (overload limiter) is fitted.
	Fitted      bool
	RatedLoadKg float64 // rated (or proposed) load m_L [kg]
	// RequiredFromKg is the rated load from which the rules in force require a limiter
	// [kg]; NaN when they require none.
	RequiredFromKg float64
	LastTest       time.Time // the limiter's last test (needed when Fitted)
	AsOf           time.Time // the run's date
	IntervalMonths int       // test interval from the rules [calendar months]
	SkipRecord     bool      // numbers only, no calculation record (bulk runs)
	Figs           *FigureBuf
}

var limiterTest = dueTexts{field: "limiter_last_test", intervalField: "service", what: "overload limiter test", short: "limiter test"}

// OverloadLimiter is the overload-limiter check: a rated capacity limiter where the
// rules require one, and its test kept current.
//
//	required  ⇔ m_L ≥ m_req                 (m_req from the rules; none: never required)
//	not fitted, required      → fail (no utilisation: a missing device has no margin)
//	not fitted, not required  → info
//	fitted → the test is current: as InspectionDue with the limiter's last test date and
//	         the rule's interval: demand days since the test [d], capacity days from the
//	         test to the next due date [d], utilisation = demand / capacity
//
// The requirement follows the Machinery Directive 2006/42/EC Annex I 4.2.2: lifting
// machinery with a maximum working load of at least 1 000 kg must have devices that warn
// the driver and prevent dangerous movements on overload (memory, medium-high; the rule
// row carries the value and its provenance). The test interval is the rules' (common
// practice: tested at each periodic inspection).
//
// Figures: required_from_kg (NaN when none is required); with a limiter fitted also
// InspectionDue's next_due, days_overdue, days_to_due, days_since_last, interval_days.
//
// It returns a *RangeError for a rated load ≤ 0, or (limiter fitted) a missing or future
// test date or an interval < 1 month.
func OverloadLimiter(in LimiterInput) (Outcome, error) {
	if !(in.RatedLoadKg > 0) || math.IsInf(in.RatedLoadKg, 0) {
		return Outcome{}, &RangeError{Field: "rated_load", Msg: "rated load must be > 0 (got " + dutyNum(in.RatedLoadKg) + " kg)"}
	}
	required := in.RatedLoadKg >= in.RequiredFromKg // false for NaN: none required
	if !in.Fitted {
		o := Outcome{Demand: math.NaN(), Capacity: math.NaN(), Unit: "kg", Utilisation: math.NaN(),
			Figures: in.Figs.take([]Figure{{Name: "required_from_kg", Value: in.RequiredFromKg, Unit: "kg"}})}
		switch {
		case required:
			o.Verdict = Fail
			o.Note = "no overload limiter fitted: the rules require one from " + dutyNum(in.RequiredFromKg) + " kg of rated load; fit one, or show that the register is wrong"
		case math.IsNaN(in.RequiredFromKg):
			o.Verdict = Info
			o.Note = "no overload limiter fitted; the rules in force require none"
		default:
			o.Verdict = Info
			o.Note = "no overload limiter fitted; the rules require one only from " + dutyNum(in.RequiredFromKg) + " kg of rated load"
		}
		if !in.SkipRecord {
			o.Steps = []Step{{Symbol: "m_req", Formula: "rated load from which a limiter is required", Numbers: "rule", Value: in.RequiredFromKg, Unit: "kg"}}
		}
		return o, nil
	}
	o, err := dueCheck(limiterTest, in.LastTest, time.Time{}, in.AsOf, in.IntervalMonths, !in.SkipRecord, nil)
	if err != nil {
		return Outcome{}, err
	}
	o.Figures = in.Figs.take(append([]Figure{{Name: "required_from_kg", Value: in.RequiredFromKg, Unit: "kg"}}, o.Figures...))
	return o, nil
}
