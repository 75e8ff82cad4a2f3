package calc

import (
	"math"
	"time"
)

// LimitDeviceInput is what the limit-devices check reads.
type LimitDeviceInput struct {
	// UpperFitted: the register says an upper hook limit device (upper limit switch) is
	// fitted; UpperRequired: the rules in force ask for one.
	UpperFitted, UpperRequired bool
	// LowerRequired: the rules in force ask for a lower hook limit device as well;
	// LowerFitted: the register says one is fitted; LowerKnown: the register says
	// whether one is (lower_fitted is NaN without it).
	LowerRequired, LowerFitted, LowerKnown bool
	LastTest                               time.Time // the limit devices' last test (needed when fitted)
	AsOf                                   time.Time // the run's date
	IntervalMonths                         int       // test interval from the rules [calendar months]
	SkipRecord                             bool      // numbers only, no calculation record (bulk runs)
	Figs                                   *FigureBuf
}

var limitTest = dueTexts{field: "limit_last_test", intervalField: "service", what: "limit device test", short: "limit device test"}

// LimitDevices is the limit-devices check: the hook's limit devices fitted and their test
// kept current.
//
//	upper limit device required and not fitted   → fail (no utilisation: a missing device
//	                                               has no margin)
//	lower limit device required and not fitted   → fail
//	neither fitted nor required                  → info
//	otherwise the test is current: as InspectionDue with the devices' last test date and
//	the rule's interval: demand days since the test [d], capacity days from the test to
//	the next due date [d], utilisation = demand / capacity (overdue: above 1)
//
// An upper limit device on every hoist: ASME B30.2 and B30.16 (memory, medium); 29 CFR
// 1910.179(n)(4)(i) has the upper limit switch of each hoist tried out under no load at
// the start of each operator's shift (law, seen as quoted in OSHA's interpretation letter
// of 29 November 1993). Whether a lower limit device is required, and the test interval,
// are the rules' (common practice: tested at each periodic inspection).
//
// Figures: upper_fitted (1 or 0), lower_fitted (1, 0, or NaN when the register does not
// say and the rules do not ask), and with the devices fitted InspectionDue's next_due,
// days_overdue, days_to_due, days_since_last, interval_days.
//
// It returns a *RangeError (devices fitted) for a missing or future test date or an
// interval < 1 month.
func LimitDevices(in LimitDeviceInput) (Outcome, error) {
	lower := math.NaN()
	if in.LowerKnown {
		lower = 0
		if in.LowerFitted {
			lower = 1
		}
	}
	upper := 0.0
	if in.UpperFitted {
		upper = 1
	}
	fitted := []Figure{{Name: "upper_fitted", Value: upper, Unit: "1"}, {Name: "lower_fitted", Value: lower, Unit: "1"}}
	if !in.UpperFitted && !in.UpperRequired && !(in.LowerRequired || in.LowerFitted) {
		return Outcome{Demand: math.NaN(), Capacity: math.NaN(), Unit: "1", Utilisation: math.NaN(), Verdict: Info,
			Figures: in.Figs.take(fitted), Note: "no hook limit device fitted; the rules in force require none"}, nil
	}
	if (in.UpperRequired && !in.UpperFitted) || (in.LowerRequired && !in.LowerFitted) {
		o := Outcome{Demand: math.NaN(), Capacity: math.NaN(), Unit: "1", Utilisation: math.NaN(), Verdict: Fail,
			Figures: in.Figs.take(fitted)}
		switch {
		case in.UpperRequired && !in.UpperFitted:
			o.Note = "no upper limit device: nothing stops the hook block being hoisted into the drum or the structure (two-blocking); fit one before further use"
		default:
			o.Note = "no lower limit device, which the rules in force require: fit one before further use"
		}
		if !in.SkipRecord {
			o.Steps = []Step{{Symbol: "upper", Formula: "upper limit device fitted (1) or not (0)", Numbers: "register", Value: upper, Unit: "1"}}
			if in.LowerRequired {
				o.Steps = append(o.Steps, Step{Symbol: "lower", Formula: "lower limit device fitted (1) or not (0); the rules require one", Numbers: "register", Value: lower, Unit: "1"})
			}
		}
		return o, nil
	}
	o, err := dueCheck(limitTest, in.LastTest, time.Time{}, in.AsOf, in.IntervalMonths, !in.SkipRecord, nil)
	if err != nil {
		return Outcome{}, err
	}
	o.Figures = in.Figs.take(append(fitted, o.Figures...))
	return o, nil
}
