package fleet

import (
	"math"

	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"hoistfleet/fleet/rules"
)

// TestActionRemediesWork: an action's numbers are not decoration. For each kind of
// failure the action names a capacity; fitting exactly that capacity (as the action prints
// it) must make the check pass, and derating to the printed load must make every
// load-dependent check pass.
func TestActionRemediesWork(t *testing.T) {
	c := isoChecker(t)
	atLeast := regexp.MustCompile(`at least ([0-9.]+) (N m|kW|kN)`)
	derateTo := regexp.MustCompile(`Derate to ([0-9.]+) t`)
	cases := []struct {
		name  string
		spoil func(b *assetBuilder) *assetBuilder
		check string
		key   string  // the register field the remedy sets
		scale float64 // SI per printed unit
	}{
		{"brake too weak", func(b *assetBuilder) *assetBuilder { return b.num("brake_torque", 40) }, "brake-holding", "brake_torque", 1},
		{"motor too small", func(b *assetBuilder) *assetBuilder { return b.num("motor_power", 4*kW) }, "motor-power", "motor_power", 1000},
		{"rope too weak", func(b *assetBuilder) *assetBuilder { return b.num("rope_mbf", 45*kN) }, "rope-design-factor", "rope_mbf", 1000},
		{"gearbox too small", func(b *assetBuilder) *assetBuilder { return b.num("gearbox_rated_torque", 5000) }, "gearbox-torque", "gearbox_rated_torque", 1},
	}
	for _, tc := range cases {
		r := c.Check(tc.spoil(winchA(t)).asset())
		if cr := mustCheck(t, r, tc.check); cr.Status != StatusFail {
			t.Fatalf("%s: %s is %s, want fail (the test hoist no longer fails)", tc.name, tc.check, cr.Status)
		}
		m := atLeast.FindStringSubmatch(r.Action)
		d := derateTo.FindStringSubmatch(r.Action)
		if m == nil {
			t.Errorf("%s: action %q names no capacity", tc.name, r.Action)
			continue
		}
		if d == nil && r.MaxRatedLoadKg > 0 {
			t.Errorf("%s: action %q offers no derating to the rating %g kg", tc.name, r.Action, r.MaxRatedLoadKg)
		}
		need, _ := strconv.ParseFloat(m[1], 64)
		fixed := c.Check(tc.spoil(winchA(t)).num(tc.key, need*tc.scale).asset())
		if cr := mustCheck(t, fixed, tc.check); cr.Status == StatusFail {
			t.Errorf("%s: with the action's %s %s %s still fails (u = %.4f)", tc.name, m[1], m[2], tc.check, cr.Utilisation)
		}
		if d == nil {
			continue // no load makes it pass (the brake torque alone is too much for the gearbox)
		}
		derated, _ := strconv.ParseFloat(d[1], 64)
		low := c.Check(withLoad(tc.spoil(winchA(t)).asset(), derated*tonne))
		for _, cr := range low.Checks {
			if cr.LoadDependent && cr.Status == StatusFail {
				t.Errorf("%s: derated to %s t, %s still fails", tc.name, d[1], cr.ID)
			}
		}
	}
}

// TestActionKinds: every kind of verdict gets its action, with the number that makes it
// concrete (inspection overdue counted by hand, as of 2026-06-01: 2025-01-01 + 12 months
// = 2026-01-01, and 2026-01-01 → 2026-06-01 is 31 + 28 + 31 + 30 + 31 = 151 days).
func TestActionKinds(t *testing.T) {
	c := isoChecker(t)
	day := func(y, m, d int) time.Time { return time.Date(y, time.Month(m), d, 0, 0, 0, 0, time.UTC) }
	cases := []struct {
		name   string
		a      *Asset
		status Status
		want   []string
	}{
		{"pass", winchA(t).asset(), StatusPass, nil},
		{"inspection overdue", winchA(t).date("last_inspection", day(2025, 1, 1)).date("limiter_last_test", day(2026, 5, 1)).asset(),
			StatusFail, []string{"Examine now: periodic inspection 151 days overdue"}},
		{"limiter missing", winchA(t).text("limiter_fitted", "no").asset(), StatusFail, []string{"Fit an overload limiter (required from 1 t)"}},
		{"unreadable cell", winchA(t).bad("lift_height", "twelve", "not a number").asset(), StatusError, []string{"Fix the register: "}},
		{"missing column", winchA(t).drop("operating_hours").asset(), StatusUnchecked, []string{"Add to the register: Operating hours"}},
		{"rope worn", winchA(t).num("rope_measured_diameter", 12.5*mm).asset(), StatusFail, []string{"Discard the rope: diameter down 10.7 % (limit 7.5 %)"}},
		{"D/d too small", winchA(t).num("drum_diameter", 200*mm).asset(), StatusFail, []string{"drum too small for the rope: D/d 14.3 against 18 required"}},
	}
	for _, tc := range cases {
		r := c.Check(tc.a)
		if r.Status != tc.status {
			t.Errorf("%s: status %s, want %s (action %q)", tc.name, r.Status, tc.status, r.Action)
			continue
		}
		if tc.status == StatusPass && r.Action != "" {
			t.Errorf("%s: a passing hoist has the action %q", tc.name, r.Action)
		}
		for _, w := range tc.want {
			if !strings.Contains(strings.ToLower(r.Action), strings.ToLower(w)) {
				t.Errorf("%s: action %q lacks %q", tc.name, r.Action, w)
			}
		}
	}
}

// TestTonnesRoundsDown: a derating is never rounded up, a requirement never down.
func TestTonnesRoundsDown(t *testing.T) {
	for _, c := range []struct {
		kg   float64
		want string
	}{{10422.3, "10.4 t"}, {999.99, "0.999 t"}, {1000, "1 t"}, {27695, "27.6 t"}, {150000, "150 t"}} {
		if got := tonnes(c.kg); got != c.want {
			t.Errorf("tonnes(%g) = %q, want %q", c.kg, got, c.want)
		}
	}
	for _, c := range []struct {
		v    float64
		want string
	}{{368.6, "369"}, {1109.57, "1110"}, {27.4254, "27.5"}, {284.0, "284"}} {
		if got := up3(c.v); got != c.want {
			t.Errorf("up3(%g) = %q, want %q", c.v, got, c.want)
		}
	}
	for _, c := range []struct {
		v    float64
		want string
	}{{5000, "5000"}, {0.0123456, "0.0123"}, {4.728, "4.73"}, {-194.9, "-195"}} {
		if got := num3(c.v); got != c.want {
			t.Errorf("num3(%g) = %q, want %q", c.v, got, c.want)
		}
	}
	if !math.IsNaN(RequiredCapacity(&CheckResult{Utilisation: math.NaN(), Capacity: 1})) {
		t.Error("RequiredCapacity without a utilisation is not NaN")
	}
}

// TestActionForARuleFailure: a check that fails on a rule while its capacity suffices
// (US profile, no control braking on a gear train that is not self-locking: 29 CFR
// 1910.179(f)(1)(ii)) gets the rule's words, not a capacity it already has.
func TestActionForARuleFailure(t *testing.T) {
	us, err := rules.Profile("us")
	if err != nil {
		t.Fatal(err)
	}
	c, err := NewChecker(Options{Rules: us, MarginalBand: 0.10, AsOf: asOf})
	if err != nil {
		t.Fatal(err)
	}
	r := c.Check(winchA(t).text("control_braking", "none").asset())
	cr := mustCheck(t, r, "brake-holding")
	if cr.Status != StatusFail || cr.Utilisation > 1 {
		t.Fatalf("brake-holding %s at u %g: the test hoist no longer fails on the rule alone", cr.Status, cr.Utilisation)
	}
	if strings.Contains(r.Action, "at least") || !strings.Contains(r.Action, "control braking") {
		t.Errorf("action %q: want the control-braking rule, not a brake torque", r.Action)
	}
}

// TestRopeWearBrokenWiresAction: a rope discarded on its broken wires says which count
// governs and its discard count (ASME B30.2: 4 in one strand in one lay, 12 in one lay),
// also when no diameter was measured (the action once read "diameter down NaN %").
func TestRopeWearBrokenWiresAction(t *testing.T) {
	c := isoChecker(t)
	for _, tc := range []struct {
		name string
		a    *Asset
		want string
	}{
		{"strand", winchA(t).num("rope_broken_wires_strand", 5).asset(), "Discard the rope: 5 broken wires in one strand in one lay (discard at 4)"},
		{"lay, no diameter", winchA(t).drop("rope_measured_diameter").num("rope_broken_wires", 13).asset(), "Discard the rope: 13 broken wires in one lay (discard at 12)"},
	} {
		r := c.Check(tc.a)
		if cr := mustCheck(t, r, "rope-wear"); cr.Status != StatusFail {
			t.Errorf("%s: rope-wear %s %q, want fail", tc.name, cr.Status, cr.Message)
		}
		if !strings.Contains(r.Action, tc.want) {
			t.Errorf("%s: action %q lacks %q", tc.name, r.Action, tc.want)
		}
	}
}

// TestRotationResistantBrokenWires: ASME B30.2 judges rotation-resistant running rope by
// broken wires in 6 and 30 rope diameters, not per lay (memory, medium): 13 broken wires
// counted per lay on such a rope are not judged by the 12-per-lay count (they would fail
// another rope), and the note says they were not assessed.
func TestRotationResistantBrokenWires(t *testing.T) {
	c := isoChecker(t)
	other := mustCheck(t, c.Check(winchA(t).num("rope_broken_wires", 13).asset()), "rope-wear")
	if other.Status != StatusFail {
		t.Fatalf("13 per lay on a steel-core rope: %s, want fail", other.Status)
	}
	cr := mustCheck(t, c.Check(winchA(t).text("rope_construction", "rotation resistant").num("rope_broken_wires", 13).asset()), "rope-wear")
	if cr.Status == StatusFail || !strings.Contains(cr.Message, "not assessed: the rules give no such count for this rope") {
		t.Errorf("rotation-resistant rope, 13 per lay: %s %q", cr.Status, cr.Message)
	}
}
