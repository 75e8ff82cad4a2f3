package calc_test

import (
	"math"
	"strings"
	"testing"

	"hoistfleet/calc"
)

// TestMotorDuty checks the motor-duty check against its definitions. Requirements by
// group: FEM 9.683 as recalled (memory, low): 2m (M5) 40 % ED and 240 starts an hour.
// Starts: at least two a hoisting cycle (one to hoist, one to lower: a limiting case,
// common practice for the count). Ratios by hand.
func TestMotorDuty(t *testing.T) {
	nan := math.NaN()
	cases := []struct {
		name    string
		in      calc.MotorDutyInput
		verdict calc.Verdict
		u       float64
		unit    string
		starts  float64 // z_act
		note    string
	}{
		// The group's requirements are minimum ratings: judged without the marginal band.
		{"40 % ED motor in a 2m group: at its limit",
			calc.MotorDutyInput{RatedDutyFactor: 0.40, RatedStarts: 240, RequiredDutyFactor: 0.40, RequiredStarts: 240, StartsPerHour: nan, CyclesPerHour: nan, StartsPerCycle: 2},
			calc.WithoutBand, 1, "1", nan, ""},
		{"25 % ED motor in a 2m group: 40/25",
			calc.MotorDutyInput{RatedDutyFactor: 0.25, RatedStarts: 240, RequiredDutyFactor: 0.40, RequiredStarts: 240, StartsPerHour: nan, CyclesPerHour: nan, StartsPerCycle: 2},
			calc.WithoutBand, 1.6, "1", nan, "duty factor the group asks 40 % ED exceed the motor's 25 % ED"},
		// The starts run against the motor's rating take the band: 170 of 180 is near it.
		{"170 starts an hour on a 180-start motor",
			calc.MotorDutyInput{RatedDutyFactor: 0.40, RatedStarts: 180, RequiredDutyFactor: nan, RequiredStarts: nan, StartsPerHour: 170, CyclesPerHour: nan, StartsPerCycle: 2},
			calc.ByUtilisation, 170.0 / 180, "1/h", 170, ""},
		{"150 cycles an hour on a 240-start motor: 300/240",
			calc.MotorDutyInput{RatedDutyFactor: 0.40, RatedStarts: 240, RequiredDutyFactor: nan, RequiredStarts: nan, StartsPerHour: nan, CyclesPerHour: 150, StartsPerCycle: 2},
			calc.ByUtilisation, 1.25, "1/h", 300, "starts per hour run 300/h exceed the motor's 240/h"},
		{"counted starts below two a cycle are raised",
			calc.MotorDutyInput{RatedDutyFactor: nan, RatedStarts: 360, RequiredDutyFactor: nan, RequiredStarts: nan, StartsPerHour: 100, CyclesPerHour: 60, StartsPerCycle: 2},
			calc.ByUtilisation, 120.0 / 360, "1/h", 120, "fewer than 2 a cycle"},
		{"counted starts above two a cycle stand",
			calc.MotorDutyInput{RatedDutyFactor: nan, RatedStarts: 360, RequiredDutyFactor: nan, RequiredStarts: nan, StartsPerHour: 200, CyclesPerHour: 60, StartsPerCycle: 2},
			calc.ByUtilisation, 200.0 / 360, "1/h", 200, ""},
		{"nothing verified to compare",
			calc.MotorDutyInput{RatedDutyFactor: 0.4, RatedStarts: 240, RequiredDutyFactor: nan, RequiredStarts: nan, StartsPerHour: nan, CyclesPerHour: nan, StartsPerCycle: 2},
			calc.Info, nan, "1", nan, "nothing verified to compare"},
	}
	for _, c := range cases {
		for _, skip := range []bool{false, true} {
			in := c.in
			in.SkipRecord = skip
			o, err := calc.MotorDuty(in)
			if err != nil {
				t.Fatalf("%s: %v", c.name, err)
			}
			if o.Verdict != c.verdict || !sameNaN(o.Utilisation, c.u) || o.Unit != c.unit {
				t.Errorf("%s: verdict %v u %g unit %s, want %v %g %s", c.name, o.Verdict, o.Utilisation, o.Unit, c.verdict, c.u, c.unit)
			}
			if got := o.Figure("starts_per_hour"); !sameNaN(got, c.starts) {
				t.Errorf("%s: starts %g, want %g", c.name, got, c.starts)
			}
			if c.note != "" && !strings.Contains(o.Note, c.note) {
				t.Errorf("%s: note %q lacks %q", c.name, o.Note, c.note)
			}
			if !math.IsNaN(o.Utilisation) && !approxEqual(o.Utilisation, o.Demand/o.Capacity, 0, 1e-15) {
				t.Errorf("%s: utilisation %g is not demand/capacity %g/%g", c.name, o.Utilisation, o.Demand, o.Capacity)
			}
		}
	}
	for _, bad := range []calc.MotorDutyInput{
		{RatedDutyFactor: 1.5, RatedStarts: nan, RequiredDutyFactor: nan, RequiredStarts: nan, StartsPerHour: nan, CyclesPerHour: nan},
		{RatedDutyFactor: nan, RatedStarts: 0, RequiredDutyFactor: nan, RequiredStarts: nan, StartsPerHour: nan, CyclesPerHour: nan},
		{RatedDutyFactor: nan, RatedStarts: 100, RequiredDutyFactor: nan, RequiredStarts: nan, StartsPerHour: -1, CyclesPerHour: nan},
	} {
		if _, err := calc.MotorDuty(bad); err == nil {
			t.Errorf("%+v: no error", bad)
		}
	}
}
