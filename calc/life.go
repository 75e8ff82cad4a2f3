package calc

import (
	"fmt"
	"math"
	"time"
)

// fullLoadDurations are the FEM 9.755 theoretical durations of service at full load D,
// hours, of mechanism classes 1Dm…5m (= M1…M8) (standards.md: FEM 9.755, seen).
var fullLoadDurations = [...]float64{100, 200, 400, 800, 1600, 3200, 6300, 12500}

// FullLoadDuration returns the FEM 9.755 theoretical duration of service at full load D,
// in hours, of mechanism group 1…8 (M1…M8 = FEM 1Dm…5m): 100, 200, 400, 800, 1 600,
// 3 200, 6 300, 12 500 h. It returns NaN for any other group. Source: FEM 9.755
// (standards.md, seen). This is the published table, for tests and defaults; the check
// takes D from the rule table in force.
func FullLoadDuration(group int) float64 {
	if group < 1 || group > len(fullLoadDurations) {
		return math.NaN()
	}
	return fullLoadDurations[group-1]
}

// LifeInput is what the FEM 9.755 safe-working-period check needs.
type LifeInput struct {
	// OperatingHours is T, the hours run since commissioning (or since the last general
	// overhaul) [h], ≥ 0.
	OperatingHours float64
	// Km is the ISO 4301-1 spectrum factor of that running, in (0, 1].
	Km float64
	// RecordFactor is X, the factor on the recorded hours for how they were recorded
	// (1.2 hour counter and log, 1.4 log only, 1.5 neither, as commonly applied; from the
	// rule table), ≥ 1.
	RecordFactor float64
	// FullLoadDurationH is D, the theoretical duration of service at full load of the
	// mechanism class [h] (from the rule table; FullLoadDuration gives FEM 9.755's), > 0.
	FullLoadDurationH float64
	// Commissioned is the date the hours were counted from (zero = unknown); AsOf is the
	// run's date (zero = unknown). Both are read as calendar dates. They only set the
	// usage rate and the projected overhaul date.
	Commissioned, AsOf time.Time
	// Overhaul is the date of the last general overhaul (zero = none recorded) and
	// HoursAtOverhaul the hour meter then [h] (NaN = not recorded). FEM 9.755's used part
	// S restarts at a general overhaul: with the hour meter at the overhaul, T counts the
	// hours since then.
	Overhaul        time.Time
	HoursAtOverhaul float64
	// SkipRecord: do not build Outcome.Steps (the calculation record); same numbers.
	SkipRecord bool
	// Figs keeps the figures (see FigureBuf); nil: a slice of their own.
	Figs *FigureBuf
}

// DesignLife is the design-life check: the used part of the theoretical design life of a
// mechanism by the FEM 9.755 safe-working-period method,
//
//	S = X · km · T   [h]   (demand: full-load-equivalent hours used)
//	D                [h]   (capacity: duration at full load for the class)
//	utilisation = S / D
//
// with T the operating hours, km the spectrum factor and X the record-keeping factor. A
// general overhaul is due when S reaches D; past D the utilisation exceeds 1. Source:
// FEM 9.755 (standards.md: D seen; S = Σ X·km,i·T_i seen; X as commonly applied, not
// verified that FEM 9.755 itself sets it).
//
// After a general overhaul S restarts (FEM 9.755: the safe working period begins again
// once the mechanism has been overhauled; memory, low: the period allowed after an
// overhaul is the one the overhaul's expert sets (DGUV Vorschrift 54 §35a, seen, refers
// to FEM 9.755 for the conditions of further operation), counted here as a full D again,
// and the note says so): with the hour meter at
// the overhaul T_o, T = T_meter − T_o, and the usage rate is counted from the overhaul's
// date where it is given. An overhaul date without the hour meter reading cannot restart
// S: the hours are then counted from commissioning (the conservative reading) and the
// note says so. The figure counted_from names the period counted.
//
// Figures: used_h (S), remaining_h (D − S, negative when past D), remaining_operating_h
// ((D − S)/(X km), hour-meter hours left at this spectrum), usage_rate_h_per_day
// (T / days from Commissioned to AsOf; NaN when a date is missing, the span is not
// positive or the rate exceeds 24 h a day), overhaul_due (Text: the ISO date when S
// reaches D at that rate, AsOf + remaining_operating_h / rate days rounded down, in the
// past when S > D; empty when the rate is unknown or zero), counted_from (Text:
// "commissioning" or "overhaul YYYY-MM-DD", or "overhaul" when only the hour meter at it
// is known), period_h (T, the hours counted). No clock is read: AsOf is the caller's.
//
// It returns a *RangeError for T < 0, km outside (0, 1], X < 1 or D ≤ 0, an hour meter
// at the overhaul below 0 or above the present reading, or an overhaul dated after the
// run's date or before commissioning.
func DesignLife(in LifeInput) (Outcome, error) {
	period, err := lifePeriod(&in)
	if err != nil {
		return Outcome{}, err
	}
	switch {
	case !(in.OperatingHours >= 0) || math.IsInf(in.OperatingHours, 0):
		return Outcome{}, &RangeError{Field: "operating_hours", Msg: fmt.Sprintf("operating hours must be ≥ 0 (got %s)", dutyNum(in.OperatingHours))}
	case !(in.Km > 0 && in.Km <= 1*(1+dutyLimitTol)):
		return Outcome{}, &RangeError{Field: "spectrum_factor", Msg: fmt.Sprintf("spectrum factor km must be in (0, 1] (got %s)", dutyNum(in.Km))}
	case !(in.RecordFactor >= 1) || math.IsInf(in.RecordFactor, 0):
		return Outcome{}, &RangeError{Field: "usage_records", Msg: fmt.Sprintf("record-keeping factor X must be ≥ 1 (got %s)", dutyNum(in.RecordFactor))}
	case !(in.FullLoadDurationH > 0) || math.IsInf(in.FullLoadDurationH, 0):
		return Outcome{}, &RangeError{Field: "duty_group", Msg: fmt.Sprintf("full-load duration D must be > 0 h (got %s)", dutyNum(in.FullLoadDurationH))}
	}
	x, km, t, d := in.RecordFactor, in.Km, period.hours, in.FullLoadDurationH
	s := x * km * t
	remaining := d - s
	remainingOp := remaining / (x * km)

	o := Outcome{
		Demand:      s,
		Capacity:    d,
		Unit:        "h",
		Utilisation: s / d,
		Verdict:     ByUtilisation,
	}
	rec := !in.SkipRecord
	if rec {
		if period.fromOverhaul {
			o.Steps = append(o.Steps, Step{Symbol: "T", Formula: "hour meter now − hour meter at the general overhaul", Numbers: fmt.Sprintf("%s − %s", dutyNum(in.OperatingHours), dutyNum(in.HoursAtOverhaul)), Value: t, Unit: "h"})
		}
		o.Steps = append(o.Steps, []Step{
			{Symbol: "S", Formula: "X · km · T", Numbers: fmt.Sprintf("%s · %s · %s", dutyNum(x), dutyNum(km), dutyNum(t)), Value: s, Unit: "h"},
			{Symbol: "D", Formula: "full-load duration of the class", Numbers: dutyNum(d), Value: d, Unit: "h"},
			{Symbol: "u", Formula: "S / D", Numbers: fmt.Sprintf("%s / %s", dutyNum(s), dutyNum(d)), Value: s / d, Unit: "1"},
			{Symbol: "D − S", Formula: "D − S", Numbers: fmt.Sprintf("%s − %s", dutyNum(d), dutyNum(s)), Value: remaining, Unit: "h"},
			{Symbol: "T_left", Formula: "(D − S) / (X · km)", Numbers: fmt.Sprintf("%s / (%s · %s)", dutyNum(remaining), dutyNum(x), dutyNum(km)), Value: remainingOp, Unit: "h"},
		}...)
	}

	rate := math.NaN()
	due := ""
	var note string
	switch {
	case period.start.IsZero() && period.fromOverhaul:
		// said in the period's note
	case period.start.IsZero() || in.AsOf.IsZero():
		note = "no commissioning date or run date: usage rate and overhaul date unknown"
	default:
		c, a := lifeDay(period.start), lifeDay(in.AsOf)
		days := lifeDaysBetween(c, a)
		switch {
		case days <= 0:
			note = fmt.Sprintf("%s %s is not before the run date %s: usage rate unknown", period.startWord, lifeISO(c), lifeISO(a))
		case t/float64(days) > 24:
			note = fmt.Sprintf("%s h in %d days is more than 24 h a day: check the commissioning date and the hour meter", dutyNum(t), days)
		default:
			rate = t / float64(days)
			if rec {
				o.Steps = append(o.Steps, Step{Symbol: "rate", Formula: "T / " + period.rateWord, Numbers: fmt.Sprintf("%s / %d", dutyNum(t), days), Value: rate, Unit: "h/day"})
			}
			if rate > 0 {
				// Days are rounded down; 1e-9 d keeps an exact whole number of days
				// (608.9999999 from rounding) from losing a day.
				left := math.Floor(remainingOp/rate + 1e-9)
				if math.Abs(left) < 1e6 { // beyond ~2700 years a date means nothing
					dd := a.AddDate(0, 0, int(left))
					due = lifeISO(dd)
					if rec {
						o.Steps = append(o.Steps, Step{Symbol: "overhaul due", Formula: "as-of + T_left / rate (days, rounded down)",
							Numbers: fmt.Sprintf("%s + ⌊%s / %s⌋ d = %s", lifeISO(a), dutyNum(remainingOp), dutyNum(rate), due), Value: math.NaN(), Unit: "date"})
					}
				} else {
					note = "at the present usage rate the full-load duration is not reached within a thousand years"
				}
			} else {
				note = "no hours run yet: overhaul date unknown"
			}
		}
	}
	if s > d {
		if note != "" {
			note = "; " + note
		}
		note = fmt.Sprintf("past the full-load duration by %s h: general overhaul due", dutyNum(s-d)) + note
	}
	if period.note != "" {
		if note != "" {
			note = period.note + "; " + note
		} else {
			note = period.note
		}
	}
	o.Note = note
	o.Figures = in.Figs.take([]Figure{
		{Name: "used_h", Value: s, Unit: "h"},
		{Name: "remaining_h", Value: remaining, Unit: "h"},
		{Name: "remaining_operating_h", Value: remainingOp, Unit: "h"},
		{Name: "usage_rate_h_per_day", Value: rate, Unit: "h/day"},
		{Name: "overhaul_due", Value: math.NaN(), Text: due},
		{Name: "counted_from", Value: math.NaN(), Text: period.countedFrom},
		{Name: "period_h", Value: t, Unit: "h"},
	})
	return o, nil
}

// lifeSpan is the period whose hours DesignLife counts.
type lifeSpan struct {
	hours        float64   // T [h]
	fromOverhaul bool      // T = T_meter − T_o
	start        time.Time // the date the hours are counted from (zero: unknown)
	startWord    string    // "commissioned" or "overhaul", before the start date in notes
	rateWord     string    // the rate's denominator in the record
	countedFrom  string    // the counted_from figure
	note         string    // what the reader must know about the period ("" for none)
}

// lifePeriod works out which hours DesignLife counts: since commissioning, or since the
// last general overhaul where the hour meter at it is known (FEM 9.755: S restarts).
func lifePeriod(in *LifeInput) (lifeSpan, error) {
	p := lifeSpan{hours: in.OperatingHours, start: in.Commissioned, startWord: "commissioned", rateWord: "days in service", countedFrom: "commissioning"}
	// The zero LifeInput records no overhaul: HoursAtOverhaul 0 counts only with a date
	// (callers without a reading pass NaN).
	hasHours := !math.IsNaN(in.HoursAtOverhaul) && !(in.HoursAtOverhaul == 0 && in.Overhaul.IsZero())
	if !in.Overhaul.IsZero() {
		o := lifeDay(in.Overhaul)
		if !in.AsOf.IsZero() && o.After(lifeDay(in.AsOf)) {
			return p, &RangeError{Field: "last_overhaul", Msg: fmt.Sprintf("last general overhaul %s is after the run date %s", lifeISO(o), lifeISO(lifeDay(in.AsOf)))}
		}
		if !in.Commissioned.IsZero() && o.Before(lifeDay(in.Commissioned)) {
			return p, &RangeError{Field: "last_overhaul", Msg: fmt.Sprintf("last general overhaul %s is before commissioning %s", lifeISO(o), lifeISO(lifeDay(in.Commissioned)))}
		}
	}
	switch {
	case hasHours:
		if !(in.HoursAtOverhaul >= 0) || math.IsInf(in.HoursAtOverhaul, 0) || in.HoursAtOverhaul > in.OperatingHours {
			return p, &RangeError{Field: "overhaul_hours", Msg: fmt.Sprintf("hour meter at the overhaul must be between 0 and the present reading %s h (got %s h)", dutyNum(in.OperatingHours), dutyNum(in.HoursAtOverhaul))}
		}
		p.hours, p.fromOverhaul = in.OperatingHours-in.HoursAtOverhaul, true
		if in.Overhaul.IsZero() {
			p.start, p.startWord, p.countedFrom = time.Time{}, "overhaul", "overhaul"
			p.note = fmt.Sprintf("S counted from the last general overhaul (hour meter %s h then; its date not given, so the usage rate is unknown): %s h since, against a full D again: check the period the overhaul report allows", dutyNum(in.HoursAtOverhaul), dutyNum(p.hours))
			return p, nil
		}
		p.start, p.startWord, p.rateWord = in.Overhaul, "overhaul", "days since the overhaul"
		p.countedFrom = "overhaul " + lifeISO(lifeDay(in.Overhaul))
		p.note = fmt.Sprintf("S counted from the general overhaul of %s (hour meter %s h then): %s h since, against a full D again: check the period the overhaul report allows", lifeISO(lifeDay(in.Overhaul)), dutyNum(in.HoursAtOverhaul), dutyNum(p.hours))
	case !in.Overhaul.IsZero():
		p.note = fmt.Sprintf("general overhaul of %s recorded without the hour meter at it: S counted from commissioning (conservative); add Overhaul hour meter to restart it", lifeISO(lifeDay(in.Overhaul)))
	}
	return p, nil
}

// lifeDay returns t's calendar date (in t's own location) as UTC midnight.
func lifeDay(t time.Time) time.Time {
	return time.Date(t.Year(), t.Month(), t.Day(), 0, 0, 0, 0, time.UTC)
}

// lifeDaysBetween returns the whole days from a to b, both UTC midnights (negative when b
// is before a).
func lifeDaysBetween(a, b time.Time) int {
	return int(math.Round(b.Sub(a).Hours() / 24))
}

// lifeISO formats a date as ISO 8601 (YYYY-MM-DD).
func lifeISO(t time.Time) string { return t.Format(time.DateOnly) }
