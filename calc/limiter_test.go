package calc_test

import (
	"math"
	"strings"
	"testing"

	"hoistfleet/calc"
)

// TestOverloadLimiter checks the overload-limiter check against its definitions. The
// requirement threshold is the Machinery Directive 2006/42/EC Annex I 4.2.2 figure,
// "a maximum working load of at least 1 000 kg" (memory, medium-high): at exactly
// 1 000 kg a limiter is required, 0.1 kg below it is not. The test interval is calendar
// months, as InspectionDue: 2025-11-30 + 12 months = 2026-11-30, so as of 2026-12-01 the
// test is 1 day overdue and 366 days have passed of a 365-day interval (2026 is not a leap
// year; Gregorian calendar, counted by hand).
func TestOverloadLimiter(t *testing.T) {
	asOf := date(2026, 12, 1)
	cases := []struct {
		name       string
		in         calc.LimiterInput
		verdict    calc.Verdict
		u          float64 // NaN: no utilisation
		demand     float64
		noteSubstr string
	}{
		{"missing at the threshold: required", calc.LimiterInput{RatedLoadKg: 1000, RequiredFromKg: 1000},
			calc.Fail, math.NaN(), math.NaN(), "the rules require one from 1000 kg"},
		{"missing just below the threshold", calc.LimiterInput{RatedLoadKg: 999.9, RequiredFromKg: 1000},
			calc.Info, math.NaN(), math.NaN(), "only from 1000 kg"},
		{"missing, no requirement in the rules", calc.LimiterInput{RatedLoadKg: 50000, RequiredFromKg: math.NaN()},
			calc.Info, math.NaN(), math.NaN(), "require none"},
		{"fitted, tested today", calc.LimiterInput{Fitted: true, RatedLoadKg: 5000, RequiredFromKg: 1000, LastTest: asOf, IntervalMonths: 12},
			calc.ByUtilisation, 0, 0, "next overload limiter test due 2027-12-01"},
		{"fitted, one day overdue", calc.LimiterInput{Fitted: true, RatedLoadKg: 5000, RequiredFromKg: 1000, LastTest: date(2025, 11, 30), IntervalMonths: 12},
			calc.ByUtilisation, 366.0 / 365.0, 366, "overdue by 1 days (due 2026-11-30)"},
		{"fitted below the threshold is still tested", calc.LimiterInput{Fitted: true, RatedLoadKg: 500, RequiredFromKg: 1000, LastTest: date(2026, 6, 1), IntervalMonths: 6},
			calc.ByUtilisation, 183.0 / 183.0, 183, "due 2026-12-01"},
	}
	for _, c := range cases {
		c.in.AsOf = asOf
		for _, skip := range []bool{false, true} {
			in := c.in
			in.SkipRecord = skip
			o, err := calc.OverloadLimiter(in)
			if err != nil {
				t.Fatalf("%s: %v", c.name, err)
			}
			if o.Verdict != c.verdict {
				t.Errorf("%s: verdict %v, want %v", c.name, o.Verdict, c.verdict)
			}
			if !sameNaN(o.Utilisation, c.u) || !sameNaN(o.Demand, c.demand) {
				t.Errorf("%s: u %g demand %g, want %g %g", c.name, o.Utilisation, o.Demand, c.u, c.demand)
			}
			if !strings.Contains(o.Note, c.noteSubstr) {
				t.Errorf("%s: note %q lacks %q", c.name, o.Note, c.noteSubstr)
			}
			if got := o.Figure("required_from_kg"); !sameNaN(got, c.in.RequiredFromKg) {
				t.Errorf("%s: required_from_kg %g", c.name, got)
			}
			if skip != (len(o.Steps) == 0) {
				t.Errorf("%s: SkipRecord %v but %d steps", c.name, skip, len(o.Steps))
			}
		}
	}
	for _, bad := range []calc.LimiterInput{
		{RatedLoadKg: 0, RequiredFromKg: 1000},
		{Fitted: true, RatedLoadKg: 5000, AsOf: asOf, IntervalMonths: 12},                             // no test date
		{Fitted: true, RatedLoadKg: 5000, AsOf: asOf, LastTest: date(2027, 1, 1), IntervalMonths: 12}, // test after the as-of date
		{Fitted: true, RatedLoadKg: 5000, AsOf: asOf, LastTest: date(2026, 1, 1), IntervalMonths: 0},
	} {
		if _, err := calc.OverloadLimiter(bad); err == nil {
			t.Errorf("%+v: no error", bad)
		}
	}
}

func sameNaN(a, b float64) bool {
	if math.IsNaN(a) || math.IsNaN(b) {
		return math.IsNaN(a) && math.IsNaN(b)
	}
	return math.Abs(a-b) <= 1e-12*math.Max(1, math.Abs(b))
}

// TestLimiterTripSetting: the trip setting against the largest the rules allow, at and
// beside the limit. 110 % is EN 14492-2 / EN 15011 practice as recalled (memory, low; a
// review limit in the built-in profiles): a limiter set at exactly 110 % is within it
// (u = 1), 110.5 % is not (u = 110.5/110), 100 % is well within (u = 100/110). A setting
// within the limit is right however close (no marginal band), so in the whole check it
// governs only above the limit: at or below it the test's utilisation (183 of 365 days,
// 0.50) stands; the setting alone (the review's evaluation) always gives its own.
func TestLimiterTripSetting(t *testing.T) {
	asOf := date(2026, 12, 1)
	base := calc.LimiterInput{Fitted: true, RatedLoadKg: 5000, RequiredFromKg: 1000, LastTest: date(2026, 6, 1), AsOf: asOf, IntervalMonths: 12, MaxSetting: 1.10}
	for _, c := range []struct {
		setting float64
		u       float64
		exceed  bool
	}{{1.10, 1, false}, {1.105, 1.105 / 1.10, true}, {1.00, 1 / 1.10, false}} {
		for _, only := range []bool{false, true} {
			in := base
			in.Setting, in.SettingOnly = c.setting, only
			o, err := calc.OverloadLimiter(in)
			if err != nil {
				t.Fatal(err)
			}
			want, unit := c.u, "1"
			if !only && !c.exceed {
				want, unit = 183.0/365, "d" // the test governs
			}
			if !approxEqual(o.Utilisation, want, 0, 1e-12) || o.Unit != unit {
				t.Errorf("setting %g (only %v): u %g %s, want %g %s", c.setting, only, o.Utilisation, o.Unit, want, unit)
			}
			if got := o.Figure("setting_utilisation"); !only && !approxEqual(got, c.u, 0, 1e-12) {
				t.Errorf("setting %g: setting_utilisation %g, want %g", c.setting, got, c.u)
			}
			if got := strings.Contains(o.Note, "above the 110 %"); got != c.exceed {
				t.Errorf("setting %g: note %q", c.setting, o.Note)
			}
		}
	}
	// Without a verified limit the test governs and the setting is only shown.
	in := base
	in.Setting, in.MaxSetting = 1.25, math.NaN()
	o, err := calc.OverloadLimiter(in)
	if err != nil {
		t.Fatal(err)
	}
	if o.Unit != "d" || !approxEqual(o.Utilisation, 183.0/365, 0, 1e-12) || o.Figure("trip_setting") != 1.25 {
		t.Errorf("no limit: u %g %s, trip_setting %g", o.Utilisation, o.Unit, o.Figure("trip_setting"))
	}
	in.Setting = -0.1
	if _, err := calc.OverloadLimiter(in); err == nil {
		t.Error("a negative setting: no error")
	}
}

// TestLimiterBelowRatedLoad: a limiter set to trip below the rated load is no hazard (the
// check passes) but the hoist cannot lift its rating: the note says so.
func TestLimiterBelowRatedLoad(t *testing.T) {
	in := calc.LimiterInput{Fitted: true, RatedLoadKg: 5000, RequiredFromKg: 1000, LastTest: date(2026, 6, 1), AsOf: date(2026, 12, 1),
		IntervalMonths: 12, MaxSetting: 1.10, Setting: 0.90}
	o, err := calc.OverloadLimiter(in)
	if err != nil {
		t.Fatal(err)
	}
	if !(o.Utilisation < 1) || !strings.Contains(o.Note, "trips at 90 % of the rated load, below it") {
		t.Errorf("u %g note %q", o.Utilisation, o.Note)
	}
}
