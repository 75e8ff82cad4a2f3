package fleet

import (
	"strconv"
	"strings"
	"testing"
)

// TestImplausibleValuesAreErrors: a unit slip is an error of the checks that use the value,
// with a message naming the likely unit, never a pass; the sound demo-like hoists raise none.
// Winch A: 14 mm rope of 136.8 kN (EN 12385-4: 14² × 1960 × 0.356 / 1000), 7.5 kW, 5 t at
// 6 m/min (m g v = 5120 × 9.80665 × 0.1 = 5.02 kW), 75 N m brake on a 1440 rpm motor
// (M_r = 7500 / 150.8 = 49.7 N m).
func TestImplausibleValuesAreErrors(t *testing.T) {
	c := isoChecker(t)
	for _, a := range []*Asset{winchA(t).asset(), winchB(t).asset()} {
		for _, m := range c.Check(a).Messages {
			if strings.Contains(m, "implausible") {
				t.Errorf("%s: a sound hoist is called implausible: %s", a.ID, m)
			}
		}
	}
	cases := []struct {
		name, key string
		b         *assetBuilder
		check     string
		want      string
	}{
		{"MBF in N in a kN column", "rope_mbf", winchA(t).raw("rope_mbf", 136.8e3*kN, "136800"), "rope-design-factor", "check the unit: 137?"},
		{"motor power in W in a kW column", "motor_power", winchA(t).raw("motor_power", 7500*kW, "7500"), "motor-power", "check the units of Motor power"},
		{"drum in mm in an m column", "drum_diameter", winchA(t).raw("drum_diameter", 300, "300"), "drum-ratio", "D/d = 21400"},
		{"brake ten hundred times the motor", "brake_torque", winchA(t).raw("brake_torque", 7500, "7500"), "brake-holding", "× the motor's rated torque"},
		{"zero rotor inertia", "motor_inertia", winchA(t).raw("motor_inertia", 0, "0"), "motor-accel-torque", "is zero"},
	}
	for _, tc := range cases {
		r := c.Check(tc.b.asset())
		cr := mustCheck(t, r, tc.check)
		if cr.Status != StatusError || !strings.Contains(cr.Message, tc.want) || !strings.Contains(cr.Message, "implausible value") {
			t.Errorf("%s: %s is %s %q, want error with %q", tc.name, tc.check, cr.Status, cr.Message, tc.want)
		}
		if r.Status == StatusPass {
			t.Errorf("%s: the hoist passes", tc.name)
		}
	}
}

// TestBrakeFrictionWorkPlausible: a brake's permitted friction work of 0 is not "no
// limit" but no rating (an error of brake-energy), and 3 J (3 kJ written in a J column)
// is a unit slip naming the likely value.
func TestBrakeFrictionWorkPlausible(t *testing.T) {
	c := isoChecker(t)
	for _, tc := range []struct {
		j    float64
		want string
	}{{0, "is not a positive number"}, {3, "check the unit: 3000?"}} {
		cr := mustCheck(t, c.Check(winchA(t).raw("brake_friction_work", tc.j, strconv.FormatFloat(tc.j, 'f', -1, 64)).asset()), "brake-energy")
		if cr.Status != StatusError || !strings.Contains(cr.Message, tc.want) {
			t.Errorf("%g J: %s %q, want error %q", tc.j, cr.Status, cr.Message, tc.want)
		}
	}
	if cr := mustCheck(t, c.Check(winchA(t).num("brake_friction_work", 20e3).asset()), "brake-energy"); cr.Status == StatusError {
		t.Errorf("20 kJ: %s %q", cr.Status, cr.Message)
	}
}
