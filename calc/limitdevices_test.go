package calc_test

import (
	"math"
	"strings"
	"testing"

	"hoistfleet/calc"
)

// TestLimitDevices: an upper limit device on every hoist (ASME B30.2 / B30.16, memory
// medium; 29 CFR 1910.179(n)(4)(i): the upper limit switch of each hoist is tried at
// the start of each shift, law, seen), a lower one where the rules ask, and their test
// against the interval in calendar months (as InspectionDue: 2025-11-30 + 12 months =
// 2026-11-30, so as of 2026-12-01 one day overdue, 366 of 365 days; counted by hand).
func TestLimitDevices(t *testing.T) {
	asOf := date(2026, 12, 1)
	cases := []struct {
		name       string
		in         calc.LimitDeviceInput
		lowerKnown bool
		verdict    calc.Verdict
		u          float64
		note       string
	}{
		{"no upper limit device", calc.LimitDeviceInput{UpperRequired: true}, false, calc.Fail, math.NaN(), "no upper limit device"},
		{"no lower limit device where the rules ask", calc.LimitDeviceInput{UpperFitted: true, UpperRequired: true, LowerRequired: true}, true, calc.Fail, math.NaN(), "no lower limit device"},
		{"no lower limit device where the rules do not ask", calc.LimitDeviceInput{UpperFitted: true, UpperRequired: true, LastTest: date(2026, 6, 1), IntervalMonths: 12}, true, calc.ByUtilisation, 183.0 / 365, "next limit device test due 2027-06-01"},
		{"one day overdue", calc.LimitDeviceInput{UpperFitted: true, UpperRequired: true, LastTest: date(2025, 11, 30), IntervalMonths: 12}, false, calc.ByUtilisation, 366.0 / 365, "overdue by 1 days (due 2026-11-30)"},
		{"none fitted, none required", calc.LimitDeviceInput{}, false, calc.Info, math.NaN(), "require none"},
		{"both fitted, tested today", calc.LimitDeviceInput{UpperFitted: true, UpperRequired: true, LowerRequired: true, LowerFitted: true, LastTest: asOf, IntervalMonths: 6}, true, calc.ByUtilisation, 0, "due 2027-06-01"},
	}
	for _, c := range cases {
		c.in.AsOf, c.in.LowerKnown = asOf, c.lowerKnown
		o, err := calc.LimitDevices(c.in)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		if o.Verdict != c.verdict || !sameNaN(o.Utilisation, c.u) {
			t.Errorf("%s: verdict %v u %g, want %v %g", c.name, o.Verdict, o.Utilisation, c.verdict, c.u)
		}
		if !strings.Contains(o.Note, c.note) {
			t.Errorf("%s: note %q lacks %q", c.name, o.Note, c.note)
		}
		if got := o.Figure("lower_fitted"); math.IsNaN(got) == c.lowerKnown {
			t.Errorf("%s: lower_fitted %g with lowerKnown %v", c.name, got, c.lowerKnown)
		}
	}
	if _, err := calc.LimitDevices(calc.LimitDeviceInput{UpperFitted: true, UpperRequired: true, AsOf: asOf, IntervalMonths: 12}); err == nil {
		t.Error("fitted without a test date: no error")
	}
}
