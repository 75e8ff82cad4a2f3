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
	// Setting is the limiter's trip setting as a fraction of the rated load (1.1 for
	// 110 %); NaN or 0: not given. MaxSetting is the largest trip setting the rules
	// allow, as a fraction; NaN: the rules in force verify none.
	Setting, MaxSetting float64
	// SettingOnly judges the trip setting alone (the check's review against a review
	// limit, design.md Revision 2 "Review limits"): no test date is needed.
	SettingOnly bool
	SkipRecord  bool // numbers only, no calculation record (bulk runs)
	Figs        *FigureBuf
}

var limiterTest = dueTexts{field: "limiter_last_test", intervalField: "service", what: "overload limiter test", short: "limiter test"}

// OverloadLimiter is the overload-limiter check: a rated capacity limiter where the
// rules require one, its test kept current and its trip setting within the rules.
//
//	required  ⇔ m_L ≥ m_req                 (m_req from the rules; none: never required)
//	not fitted, required      → fail (no utilisation: a missing device has no margin)
//	not fitted, not required  → info
//	fitted → the test is current: as InspectionDue with the limiter's last test date and
//	         the rule's interval: demand days since the test [d], capacity days from the
//	         test to the next due date [d], u_test = demand / capacity
//	       → the trip setting: u_set = s / s_max (s the setting and s_max the rules'
//	         largest, both as fractions of the rated load [1]), where both are known
//	       utilisation = max(u_test, u_set); demand and capacity are the governing part's
//
// A limiter set at exactly s_max has u_set = 1 (not exceeded). The largest trip setting is
// a rule value: EN 14492-2 / EN 15011 practice is to trip at not more than 110 % of the
// rated load (memory, low: the rule row is a review limit until the documents are read,
// so in the built-in profiles a setting above it makes the check marginal at worst; the
// fleet prepares the check once more with SettingOnly for that review).
//
// The requirement follows the Machinery Directive 2006/42/EC Annex I 4.2.2: lifting
// machinery with a maximum working load of at least 1 000 kg must have devices that warn
// the driver and prevent dangerous movements on overload (memory, medium-high; the rule
// row carries the value and its provenance). The test interval is the rules' (common
// practice: tested at each periodic inspection).
//
// Figures: required_from_kg (NaN when none is required); with a limiter fitted also
// InspectionDue's next_due, days_overdue, days_to_due, days_since_last, interval_days,
// and trip_setting, max_trip_setting, setting_utilisation (fractions; NaN when unknown).
//
// It returns a *RangeError for a rated load ≤ 0, a trip setting ≤ 0 or above 10 (1000 %),
// or (limiter fitted) a missing or future test date or an interval < 1 month.
func OverloadLimiter(in LimiterInput) (Outcome, error) {
	if !(in.RatedLoadKg > 0) || math.IsInf(in.RatedLoadKg, 0) {
		return Outcome{}, &RangeError{Field: "rated_load", Msg: "rated load must be > 0 (got " + dutyNum(in.RatedLoadKg) + " kg)"}
	}
	if in.Setting == 0 {
		in.Setting = math.NaN()
	}
	if !math.IsNaN(in.Setting) && !(in.Setting > 0 && in.Setting <= 10) {
		return Outcome{}, &RangeError{Field: "limiter_setting", Msg: "limiter trip setting must be in (0, 1000] % of the rated load (got " + dutyNum(in.Setting*100) + " %)"}
	}
	uSet := in.Setting / in.MaxSetting // NaN when either is unknown
	if in.SettingOnly {
		return limiterSetting(in, uSet), nil
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
	// The setting governs only when it is above the largest the rules allow: a limiter
	// set at or below it is right, however close (no marginal band for a setting).
	if uSet > 1+1e-9 && uSet > o.Utilisation { // NaN compares false: the test governs
		s := limiterSetting(in, uSet)
		o.Demand, o.Capacity, o.Unit, o.Utilisation = s.Demand, s.Capacity, s.Unit, s.Utilisation
		o.Note = s.Note + "; " + o.Note
		o.Steps = append(o.Steps, s.Steps...)
	} else if !math.IsNaN(uSet) && !in.SkipRecord {
		o.Steps = append(o.Steps, limiterSetting(in, uSet).Steps...)
	}
	if in.Setting > 0 && in.Setting < 1 {
		// Not a hazard, but the hoist cannot lift its rated load: worth a word.
		o.Note += "; the limiter trips at " + dutyNum(in.Setting*100) + " % of the rated load, below it: the hoist cannot lift its rated load (check the setting or the rating)"
	}
	var buf [12]Figure // the figures gathered here are copied by take
	fs := append(buf[:0], Figure{Name: "required_from_kg", Value: in.RequiredFromKg, Unit: "kg"})
	fs = append(fs, o.Figures...)
	fs = append(fs, Figure{Name: "trip_setting", Value: in.Setting, Unit: "1"},
		Figure{Name: "max_trip_setting", Value: in.MaxSetting, Unit: "1"},
		Figure{Name: "setting_utilisation", Value: uSet, Unit: "1"})
	o.Figures = in.Figs.take(fs)
	return o, nil
}

// limiterSetting is the trip-setting part of OverloadLimiter: demand the setting,
// capacity the largest setting the rules allow, both as fractions of the rated load.
func limiterSetting(in LimiterInput, u float64) Outcome {
	o := Outcome{Demand: in.Setting, Capacity: in.MaxSetting, Unit: "1", Utilisation: u, Verdict: ByUtilisation}
	if u > 1+1e-9 {
		o.Note = "overload limiter set to trip at " + dutyNum(in.Setting*100) + " % of the rated load, above the " + dutyNum(in.MaxSetting*100) + " % the rules allow"
	} else if !math.IsNaN(u) {
		o.Note = "overload limiter trips at " + dutyNum(in.Setting*100) + " % of the rated load (at most " + dutyNum(in.MaxSetting*100) + " %)"
	}
	if !in.SkipRecord && !math.IsNaN(u) {
		o.Steps = []Step{{Symbol: "u_set", Formula: "trip setting / largest trip setting", Numbers: dutyNum(in.Setting*100) + " % / " + dutyNum(in.MaxSetting*100) + " %", Value: u, Unit: "1"}}
	}
	if in.SettingOnly {
		o.Figures = in.Figs.take([]Figure{{Name: "setting_utilisation", Value: u, Unit: "1"}})
	}
	return o
}
