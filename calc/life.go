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
// Figures: used_h (S), remaining_h (D − S, negative when past D), remaining_operating_h
// ((D − S)/(X km), hour-meter hours left at this spectrum), usage_rate_h_per_day
// (T / days from Commissioned to AsOf; NaN when a date is missing, the span is not
// positive or the rate exceeds 24 h a day), overhaul_due (Text: the ISO date when S
// reaches D at that rate, AsOf + remaining_operating_h / rate days rounded down, in the
// past when S > D; empty when the rate is unknown or zero). No clock is read: AsOf is
// the caller's.
//
// It returns a *RangeError for T < 0, km outside (0, 1], X < 1 or D ≤ 0.
func DesignLife(in LifeInput) (Outcome, error) {
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
	x, km, t, d := in.RecordFactor, in.Km, in.OperatingHours, in.FullLoadDurationH
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
		o.Steps = []Step{
			{Symbol: "S", Formula: "X · km · T", Numbers: fmt.Sprintf("%s · %s · %s", dutyNum(x), dutyNum(km), dutyNum(t)), Value: s, Unit: "h"},
			{Symbol: "D", Formula: "full-load duration of the class", Numbers: dutyNum(d), Value: d, Unit: "h"},
			{Symbol: "u", Formula: "S / D", Numbers: fmt.Sprintf("%s / %s", dutyNum(s), dutyNum(d)), Value: s / d, Unit: "1"},
			{Symbol: "D − S", Formula: "D − S", Numbers: fmt.Sprintf("%s − %s", dutyNum(d), dutyNum(s)), Value: remaining, Unit: "h"},
			{Symbol: "T_left", Formula: "(D − S) / (X · km)", Numbers: fmt.Sprintf("%s / (%s · %s)", dutyNum(remaining), dutyNum(x), dutyNum(km)), Value: remainingOp, Unit: "h"},
		}
	}

	rate := math.NaN()
	due := ""
	var note string
	switch {
	case in.Commissioned.IsZero() || in.AsOf.IsZero():
		note = "no commissioning date or run date: usage rate and overhaul date unknown"
	default:
		c, a := lifeDay(in.Commissioned), lifeDay(in.AsOf)
		days := lifeDaysBetween(c, a)
		switch {
		case days <= 0:
			note = fmt.Sprintf("commissioned %s is not before the run date %s: usage rate unknown", lifeISO(c), lifeISO(a))
		case t/float64(days) > 24:
			note = fmt.Sprintf("%s h in %d days is more than 24 h a day: check the commissioning date and the hour meter", dutyNum(t), days)
		default:
			rate = t / float64(days)
			if rec {
				o.Steps = append(o.Steps, Step{Symbol: "rate", Formula: "T / days in service", Numbers: fmt.Sprintf("%s / %d", dutyNum(t), days), Value: rate, Unit: "h/day"})
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
	o.Note = note
	o.Figures = in.Figs.take([]Figure{
		{Name: "used_h", Value: s, Unit: "h"},
		{Name: "remaining_h", Value: remaining, Unit: "h"},
		{Name: "remaining_operating_h", Value: remainingOp, Unit: "h"},
		{Name: "usage_rate_h_per_day", Value: rate, Unit: "h/day"},
		{Name: "overhaul_due", Value: math.NaN(), Text: due},
	})
	return o, nil
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
