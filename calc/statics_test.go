package calc_test

import (
	"math"
	"strings"
	"testing"

	"hoistfleet/calc"
)

// siHoist is the hand-calculated SI hoist of these tests: 5 t on 2 parts, one rope end,
// η_s 0.98 (rolling bearings, standards.md "Reeving": seen), 20 mm rope, 400 mm drum,
// one layer, gear 40 at η_g 0.94, 22 kW at 1460 rpm, 24 m/min, g = 9.81.
// By hand: W = 49050 N; η_R = (1 − 0.98²)/(2 × 0.02) = 0.99; F = 49050/(2 × 0.99) =
// 24772.727 N; r_1 = 0.2 m; drum torque e F r = 4954.545 N m; motor torque
// 4954.545/(40 × 0.94) = 131.7698 N m; ω_m = 2π 1460/60 = 152.8908 rad/s;
// M_r = 22000/152.8908 = 143.8935 N m.
func siHoist() calc.Hoist {
	return calc.Hoist{
		G: 9.81, RatedLoadKg: 5000, Parts: 2, RopeEnds: 1, SheaveEff: 0.98,
		RopeDiameterM: 0.020, RopeMBFN: 279104,
		DrumDiameterM: 0.400, Layers: 1, Grooves: 30, Grooved: true, LiftHeightM: 10,
		SheaveDiameterM: 0.355, FleetAngleDeg: 1.0,
		GearRatio: 40, GearEff: 0.94, GearBackEff: 0.94,
		MotorPowerW: 22000, MotorSpeedRPM: 1460,
		BrakeTorqueNm: 200, Brakes: 1,
		HoistSpeedMS: 0.4,
	}
}

type figCheck struct {
	name string
	got  float64
	want float64
	rel  float64
	src  string
}

func runFigChecks(t *testing.T, cs []figCheck) {
	t.Helper()
	for _, c := range cs {
		if !approxEqual(c.got, c.want, 0, c.rel) {
			t.Errorf("%s = %.9g, want %.9g (rel %g; %s)", c.name, c.got, c.want, c.rel, c.src)
		}
	}
}

func TestDrumAndSheaveRatio(t *testing.T) {
	h := siHoist()
	// D/d = 400/20 = 20; h1 = 18 (ISO 4308-1 M5, standards.md memory medium):
	// u = 18/20 = 0.9 (hand).
	o, err := calc.DrumRatio(h, 18)
	if err != nil {
		t.Fatal(err)
	}
	// D_s/d = 355/20 = 17.75; h2 = 20 (M5): u = 20/17.75 = 1.1267606 (hand).
	s, err := calc.SheaveRatio(h, 20)
	if err != nil {
		t.Fatal(err)
	}
	runFigChecks(t, []figCheck{
		{"drum capacity", o.Capacity, 20, 1e-12, "400/20 hand"},
		{"drum demand", o.Demand, 18, 0, "h1 M5"},
		{"drum u", o.Utilisation, 0.9, 1e-12, "hand"},
		{"drum_ratio", o.Figure("drum_ratio"), 20, 1e-12, "hand"},
		{"sheave capacity", s.Capacity, 17.75, 1e-12, "355/20 hand"},
		{"sheave u", s.Utilisation, 1.1267606, 1e-7, "hand"},
		{"sheave_ratio", s.Figure("sheave_ratio"), 17.75, 1e-12, "hand"},
	})

	// US customary: 24 in drum, 1/2 in rope → D/d = 48; 18 in sheave → 36. The ratio
	// of two lengths does not depend on the unit (in = 0.0254 m, NIST SP 811).
	us := calc.Hoist{DrumDiameterM: 24 * nistIn, RopeDiameterM: 0.5 * nistIn, SheaveDiameterM: 18 * nistIn}
	o, _ = calc.DrumRatio(us, 25)
	s, _ = calc.SheaveRatio(us, 28)
	runFigChecks(t, []figCheck{
		{"US drum ratio", o.Capacity, 48, 1e-12, "24/0.5"},
		{"US drum u", o.Utilisation, 25.0 / 48, 1e-12, "h1 25 (M8)"},
		{"US sheave ratio", s.Capacity, 36, 1e-12, "18/0.5"},
	})

	for _, tt := range []struct {
		name  string
		mod   func(*calc.Hoist)
		h1    float64
		field string
	}{
		{"no drum", func(h *calc.Hoist) { h.DrumDiameterM = 0 }, 18, "drum_diameter"},
		{"no rope", func(h *calc.Hoist) { h.RopeDiameterM = -0.02 }, 18, "rope_diameter"},
		{"no h1", func(h *calc.Hoist) {}, 0, ""},
	} {
		h := siHoist()
		tt.mod(&h)
		_, err := calc.DrumRatio(h, tt.h1)
		checkRangeError(t, err, tt.field)
	}
	h.SheaveDiameterM = 0
	_, err = calc.SheaveRatio(h, 20)
	checkRangeError(t, err, "sheave_diameter")
}

func TestDrumCapacity(t *testing.T) {
	// Single layer, by hand: π D = 1.2566371 m; H n_e = 10 × 2 = 20 m; 2 dead wraps
	// (29 CFR 1910.179(h)(2), standards.md law) = 2.5132741 m; demand 22.5132741 m;
	// capacity 30 × 1.2566371 = 37.6991118 m; u = 0.5971831; wraps left at the lowest
	// hook 30 − 20/1.2566371 = 14.0845057.
	h := siHoist()
	o, err := calc.DrumCapacity(h, 2)
	if err != nil {
		t.Fatal(err)
	}
	runFigChecks(t, []figCheck{
		{"demand", o.Demand, 22.5132741, 1e-8, "hand"},
		{"rope_per_end_m", o.Figure("rope_per_end_m"), 22.5132741, 1e-8, "hand"},
		{"capacity", o.Capacity, 37.6991118, 1e-8, "hand"},
		{"u", o.Utilisation, 0.5971831, 1e-6, "hand"},
		{"wraps left", o.Figure("wraps_left_at_lowest_hook"), 14.0845057, 1e-8, "hand"},
		{"layers needed", o.Figure("layers_needed"), 1, 0, "hand"},
	})
	if o.Unit != "m" {
		t.Errorf("unit %q", o.Unit)
	}

	// Two layers, H = 25 m: D_2 = D + √3 d = 0.4 + 0.0346410 = 0.4346410 m (nesting of
	// circles of diameter d: each layer √3/2 d higher in radius, textbook geometry);
	// capacity 30 π (0.4 + 0.4346410) = 78.6630625 m; lift rope 50 m; demand 52.5132741 m;
	// u = 0.6675722; left 28.6630625 m < one layer → 28.6630625/1.2566371 = 22.8093404 turns.
	h.Layers, h.LiftHeightM = 2, 25
	o, err = calc.DrumCapacity(h, 2)
	if err != nil {
		t.Fatal(err)
	}
	runFigChecks(t, []figCheck{
		{"capacity 2 layers", o.Capacity, 78.6630625, 1e-8, "hand"},
		{"u 2 layers", o.Utilisation, 0.6675722, 1e-6, "hand"},
		{"wraps left 2 layers", o.Figure("wraps_left_at_lowest_hook"), 22.8093404, 1e-8, "hand"},
		{"layers needed", o.Figure("layers_needed"), 2, 0, "52.5 m > 37.7 m on layer 1"},
	})

	// Invariant: the rope fits with exactly w_min wraps left when u = 1. Choose the lift
	// that fills the single-layer drum but for 2 wraps: H = (G − 2) π D / n_e.
	h = siHoist()
	h.LiftHeightM = (30 - 2) * math.Pi * 0.4 / 2
	o, _ = calc.DrumCapacity(h, 2)
	if !approxEqual(o.Utilisation, 1, 0, 1e-12) || !approxEqual(o.Figure("wraps_left_at_lowest_hook"), 2, 0, 1e-12) {
		t.Errorf("at the limit: u = %.15g, wraps left %.15g; want 1 and 2", o.Utilisation, o.Figure("wraps_left_at_lowest_hook"))
	}
	// One metre more of lift: fails, and the note says the wraps are short.
	h.LiftHeightM++
	o, _ = calc.DrumCapacity(h, 2)
	if o.Utilisation <= 1 || o.Note == "" || o.Figure("wraps_left_at_lowest_hook") >= 2 {
		t.Errorf("over the limit: u = %g, wraps %g, note %q", o.Utilisation, o.Figure("wraps_left_at_lowest_hook"), o.Note)
	}

	// Load-independent.
	h = siHoist()
	a, _ := calc.DrumCapacity(h, 2)
	b, _ := calc.DrumCapacity(h.WithRatedLoad(50000), 2)
	if a.Utilisation != b.Utilisation {
		t.Errorf("drum capacity depends on load: %g vs %g", a.Utilisation, b.Utilisation)
	}

	// US customary: 16 in drum, 5/8 in rope, 40 grooves, 2 layers, lift 30 ft on n_e = 2,
	// 2 dead wraps. In feet: demand 60 + 2π(16/12); capacity 40π(16/12) +
	// 40π(16 + √3 × 0.625)/12. Same result in metres with ft = 0.3048, in = 0.0254 m.
	us := calc.Hoist{Parts: 4, RopeEnds: 2, SheaveEff: 0.98, DrumDiameterM: 16 * nistIn, RopeDiameterM: 0.625 * nistIn,
		Layers: 2, Grooves: 40, LiftHeightM: 30 * nistFt}
	o, err = calc.DrumCapacity(us, 2)
	if err != nil {
		t.Fatal(err)
	}
	demandFt := 60 + 2*math.Pi*16/12
	capFt := 40*math.Pi*16/12 + 40*math.Pi*(16+math.Sqrt(3)*0.625)/12
	runFigChecks(t, []figCheck{
		{"US demand", o.Demand / nistFt, demandFt, 1e-12, "ft"},
		{"US capacity", o.Capacity / nistFt, capFt, 1e-12, "ft"},
		{"US u", o.Utilisation, demandFt / capFt, 1e-12, "ratio"},
	})

	for _, tt := range []struct {
		name  string
		mod   func(*calc.Hoist)
		field string
	}{
		{"no grooves", func(h *calc.Hoist) { h.Grooves = 0 }, "drum_grooves"},
		{"no drum", func(h *calc.Hoist) { h.DrumDiameterM = math.NaN() }, "drum_diameter"},
		{"negative lift", func(h *calc.Hoist) { h.LiftHeightM = -1 }, "lift_height"},
		{"zero layers", func(h *calc.Hoist) { h.Layers = 0 }, "rope_layers"},
		{"layers without rope", func(h *calc.Hoist) { h.Layers, h.RopeDiameterM = 2, 0 }, "rope_diameter"},
		{"bad reeving", func(h *calc.Hoist) { h.Parts = 0 }, "parts_of_line"},
	} {
		h := siHoist()
		tt.mod(&h)
		_, err := calc.DrumCapacity(h, 2)
		checkRangeError(t, err, tt.field)
	}
	_, err = calc.DrumCapacity(siHoist(), -1)
	checkRangeError(t, err, "")

	// One layer with no rope diameter: fine while the rope fits one layer, and says so
	// (layers_needed NaN with a note) when it does not.
	h = siHoist()
	h.RopeDiameterM = 0
	o, err = calc.DrumCapacity(h, 2)
	if err != nil || o.Figure("layers_needed") != 1 {
		t.Errorf("no rope diameter, rope fits: err %v, layers %g", err, o.Figure("layers_needed"))
	}
	h.LiftHeightM = 30
	o, err = calc.DrumCapacity(h, 2)
	if err != nil || !math.IsNaN(o.Figure("layers_needed")) || o.Note == "" {
		t.Errorf("no rope diameter, rope does not fit: err %v, layers %g, note %q", err, o.Figure("layers_needed"), o.Note)
	}
}

func TestFleetAngle(t *testing.T) {
	// Limits: Wire Rope Users Manual ≤ 2° grooved, ≤ 1.5° plain, avoid < 0.5°
	// (standards.md "Fleet angle": seen).
	tests := []struct {
		name    string
		angle   float64
		grooved bool
		wantU   float64
		verdict calc.Verdict
	}{
		{"grooved 1.0", 1.0, true, 0.5, calc.ByUtilisation},
		{"grooved at limit", 2.0, true, 1, calc.ByUtilisation},
		{"grooved over", 2.5, true, 1.25, calc.ByUtilisation},
		{"plain 1.2", 1.2, false, 0.8, calc.ByUtilisation},
		{"plain over", 1.8, false, 1.2, calc.ByUtilisation},
		{"below minimum", 0.3, true, 0.15, calc.Marginal},
		{"zero", 0, false, 0, calc.Marginal},
		{"at minimum", 0.5, true, 0.25, calc.ByUtilisation},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			h := siHoist()
			h.FleetAngleDeg, h.Grooved = tt.angle, tt.grooved
			maxDeg := 1.5
			if tt.grooved {
				maxDeg = 2
			}
			o, err := calc.FleetAngle(h, maxDeg, 0.5)
			if err != nil {
				t.Fatal(err)
			}
			if !approxEqual(o.Utilisation, tt.wantU, 0, 1e-12) || o.Verdict != tt.verdict || o.Unit != "deg" {
				t.Errorf("u = %g verdict %v unit %q; want %g %v deg", o.Utilisation, o.Verdict, o.Unit, tt.wantU, tt.verdict)
			}
			if (tt.verdict == calc.Marginal) != (o.Note != "") {
				t.Errorf("note %q", o.Note)
			}
		})
	}
	h := siHoist()
	h.FleetAngleDeg = -1
	_, err := calc.FleetAngle(h, 2, 0.5)
	checkRangeError(t, err, "fleet_angle")
	_, err = calc.FleetAngle(siHoist(), 0, 0)
	checkRangeError(t, err, "")
	_, err = calc.FleetAngle(siHoist(), 2, 2)
	checkRangeError(t, err, "")
}

func TestMotorTorqueHand(t *testing.T) {
	o, err := calc.MotorTorque(siHoist())
	if err != nil {
		t.Fatal(err)
	}
	// Hand values: see siHoist. u = 131.76983/143.89351 = 0.9157454.
	runFigChecks(t, []figCheck{
		{"demand", o.Demand, 131.76983, 1e-6, "hand"},
		{"capacity", o.Capacity, 143.89351, 1e-6, "hand"},
		{"u", o.Utilisation, 0.9157454, 1e-6, "hand"},
		{"rope_tension_n", o.Figure("rope_tension_n"), 24772.727, 1e-7, "hand"},
		{"drum_torque_nm", o.Figure("drum_torque_nm"), 4954.5455, 1e-7, "hand"},
	})
	if o.Unit != "N m" || o.Note != "" {
		t.Errorf("unit %q, note %q (one layer: no outer-layer note)", o.Unit, o.Note)
	}
}

func TestMotorTorqueInvariants(t *testing.T) {
	// Affine in the rated load (statics): equal load steps give equal torque steps.
	h := siHoist()
	h.HookBlockKg = 80
	m := func(kg float64) float64 {
		o, err := calc.MotorTorque(h.WithRatedLoad(kg))
		if err != nil {
			t.Fatal(err)
		}
		return o.Demand
	}
	if a, b, c := m(1000), m(3000), m(5000); !approxEqual(c-b, b-a, 0, 1e-12) {
		t.Errorf("motor torque not affine in load: %g %g %g", a, b, c)
	}
	// Zero total mass: zero torque.
	h.HookBlockKg = 0
	if z := m(0); z != 0 {
		t.Errorf("zero load torque %g", z)
	}

	// Outer layer: three layers raise the demand by r_L/r_1, with r_L = D/2 + 2(√3/2)d
	// from the nesting of circles of diameter d (textbook geometry), and say so.
	one, _ := calc.MotorTorque(siHoist())
	h = siHoist()
	h.Layers = 3
	three, err := calc.MotorTorque(h)
	if err != nil {
		t.Fatal(err)
	}
	rL := 0.2 + 2*(math.Sqrt(3)/2)*0.020
	if !approxEqual(three.Demand/one.Demand, rL/0.2, 0, 1e-12) {
		t.Errorf("outer layer ratio %.12g, want r_L/r_1 = %.12g", three.Demand/one.Demand, rL/0.2)
	}
	if !approxEqual(three.Figure("radius_m"), rL, 0, 1e-12) || !strings.Contains(three.Note, "outer layer") {
		t.Errorf("radius %g, note %q", three.Figure("radius_m"), three.Note)
	}
	// Twin-rope drum, same load, twice the parts: e F r is the same drum torque as one
	// end on half the parts (n_e equal), since e/n = 1/n_e.
	h = siHoist()
	h.Parts, h.RopeEnds = 4, 2
	twin, _ := calc.MotorTorque(h)
	if !approxEqual(twin.Demand, one.Demand, 0, 1e-12) {
		t.Errorf("twin drum %g vs single %g", twin.Demand, one.Demand)
	}
}

func TestMotorPower(t *testing.T) {
	// Hand: P = W v / (η_R η_g) = 49050 × 0.4 / (0.99 × 0.94) = 21083.172 W; u = 0.9583260.
	o, err := calc.MotorPower(siHoist())
	if err != nil {
		t.Fatal(err)
	}
	runFigChecks(t, []figCheck{
		{"demand", o.Demand, 21083.172, 1e-7, "hand"},
		{"u", o.Utilisation, 0.9583260, 1e-6, "hand"},
		{"hoisting_efficiency", o.Figure("hoisting_efficiency"), 0.9306, 1e-12, "0.99 × 0.94"},
	})

	// Textbook identity (standards.md "Rigid-body dynamics checks"): steady hoisting
	// power P = m g v / η. One part, no sheaves, one layer: η = η_g.
	for _, tt := range []struct{ m, v, eta float64 }{{1000, 0.5, 0.9}, {12000, 0.1, 0.85}, {250, 1.2, 1}} {
		h := calc.Hoist{G: 9.81, RatedLoadKg: tt.m, Parts: 1, RopeEnds: 1, SheaveEff: 0.98, DrumDiameterM: 0.3,
			Layers: 1, GearRatio: 30, GearEff: tt.eta, MotorPowerW: 50000, MotorSpeedRPM: 1450, HoistSpeedMS: tt.v}
		o, err := calc.MotorPower(h)
		if err != nil {
			t.Fatal(err)
		}
		if want := tt.m * 9.81 * tt.v / tt.eta; !approxEqual(o.Demand, want, 0, 1e-12) {
			t.Errorf("P(m=%g, v=%g, η=%g) = %g, want m g v/η = %g", tt.m, tt.v, tt.eta, o.Demand, want)
		}
	}

	// Power = torque × angular speed: at the speed that gives v on the first layer
	// (ω_m = v i n_e / r_1), the steady torque times ω_m is the power demand.
	h := siHoist()
	tq, _ := calc.MotorTorque(h)
	omega := h.HoistSpeedMS * h.GearRatio * 2 / 0.2
	if !approxEqual(tq.Demand*omega, o.Demand, 0, 1e-12) {
		t.Errorf("M ω = %g, P = %g", tq.Demand*omega, o.Demand)
	}

	// Outer layer: rope speed and power rise by r_L/r_1.
	h.Layers = 2
	two, _ := calc.MotorPower(h)
	rL := 0.2 + (math.Sqrt(3)/2)*0.020
	if !approxEqual(two.Demand/o.Demand, rL/0.2, 0, 1e-12) || two.Note == "" {
		t.Errorf("outer-layer power ratio %g, want %g; note %q", two.Demand/o.Demand, rL/0.2, two.Note)
	}
	if !approxEqual(two.Figure("hook_speed_m_s"), 0.4*rL/0.2, 0, 1e-12) {
		t.Errorf("hook speed on the outer layer %g", two.Figure("hook_speed_m_s"))
	}

	h = siHoist()
	h.HoistSpeedMS = 0
	_, err = calc.MotorPower(h)
	checkRangeError(t, err, "hoist_speed")
}

func TestHoistSpeed(t *testing.T) {
	// Hand: ω_m = 2π 1460/60 = 152.890842 rad/s; v_calc = 152.890842 × 0.2/(40 × 2) =
	// 0.382227106 m/s (22.93 m/min); declared 0.4 m/s: deviation −0.0444322; with the
	// 10 % tolerance (common practice, no published source) u = 0.444322.
	o, err := calc.HoistSpeed(siHoist(), 0.10)
	if err != nil {
		t.Fatal(err)
	}
	runFigChecks(t, []figCheck{
		{"calculated_speed_m_s", o.Figure("calculated_speed_m_s"), 0.382227106, 1e-8, "hand"},
		{"demand", o.Demand, 0.0444322, 1e-5, "hand"},
		{"speed_deviation", o.Figure("speed_deviation"), -0.0444322, 1e-5, "hand"},
		{"u", o.Utilisation, 0.444322, 1e-5, "hand"},
		{"capacity", o.Capacity, 0.10, 0, "tolerance"},
	})
	// Kinematic invariant: declaring exactly v_calc gives zero deviation; load-independent.
	h := siHoist()
	h.HoistSpeedMS = o.Figure("calculated_speed_m_s")
	z, _ := calc.HoistSpeed(h.WithRatedLoad(1e5), 0.10)
	if !approxEqual(z.Demand, 0, 1e-15, 0) {
		t.Errorf("self-consistent speed deviation %g", z.Demand)
	}
	_, err = calc.HoistSpeed(siHoist(), 0)
	checkRangeError(t, err, "")
	h = siHoist()
	h.GearRatio = 0
	_, err = calc.HoistSpeed(h, 0.1)
	checkRangeError(t, err, "gear_ratio")
	h = siHoist()
	h.MotorSpeedRPM = -1
	_, err = calc.HoistSpeed(h, 0.1)
	checkRangeError(t, err, "motor_speed")
}

func TestBrakeHolding(t *testing.T) {
	// 29 CFR 1910.179(f)(2) (standards.md: law): ≥ 125 % of the rated-load hoisting
	// torque where the brake acts. Motor shaft, by hand: 1.25 × 131.76983 = 164.71228 N m
	// against one 200 N m brake: u = 0.8235614.
	o, err := calc.BrakeHolding(siHoist(), calc.BrakeRule{Factor: 1.25})
	if err != nil {
		t.Fatal(err)
	}
	runFigChecks(t, []figCheck{
		{"demand", o.Demand, 164.71228, 1e-6, "hand"},
		{"full_load_hoisting_torque_nm", o.Figure("full_load_hoisting_torque_nm"), 131.76983, 1e-6, "hand"},
		{"u", o.Utilisation, 0.8235614, 1e-6, "hand"},
		{"brake_capacity_nm", o.Figure("brake_capacity_nm"), 200, 0, "input"},
		{"brake_factor", o.Figure("brake_factor"), 1.25, 0, "rule"},
	})
	if o.Unit != "N m" {
		t.Errorf("unit %q", o.Unit)
	}

	// Drum brake: e F r = 4954.5455 N m, × 1.25 = 6193.1818 N m against 6500 N m:
	// u = 0.9527972 (hand).
	h := siHoist()
	h.BrakeOnDrum, h.BrakeTorqueNm = true, 6500
	h.GearRatio, h.GearEff = 0, 0 // not needed for a drum brake
	d, err := calc.BrakeHolding(h, calc.BrakeRule{Factor: 1.25})
	if err != nil {
		t.Fatal(err)
	}
	runFigChecks(t, []figCheck{
		{"drum demand", d.Demand, 6193.1818, 1e-7, "hand"},
		{"drum u", d.Utilisation, 0.9527972, 1e-6, "hand"},
	})

	// Two brakes: both together (N_b M_b), or each alone at 100 % (29 CFR 1910.179(f)(2)).
	h = siHoist()
	h.Brakes, h.BrakeTorqueNm = 2, 150
	both, _ := calc.BrakeHolding(h, calc.BrakeRule{Factor: 1.25})
	each, _ := calc.BrakeHolding(h, calc.BrakeRule{Factor: 1.0, Each: true})
	runFigChecks(t, []figCheck{
		{"both capacity", both.Capacity, 300, 0, "2 × 150"},
		{"both u", both.Utilisation, 164.71228 / 300, 1e-6, "hand"},
		{"each capacity", each.Capacity, 150, 0, "one brake"},
		{"each u", each.Utilisation, 131.76983 / 150, 1e-6, "hand"},
	})
	if !strings.Contains(each.Note, "each") {
		t.Errorf("note %q", each.Note)
	}

	// Outer layer governs and the demand scales with r_L/r_1; affine in load.
	h = siHoist()
	h.Layers = 2
	two, _ := calc.BrakeHolding(h, calc.BrakeRule{Factor: 1.25})
	rL := 0.2 + (math.Sqrt(3)/2)*0.020
	if !approxEqual(two.Demand/o.Demand, rL/0.2, 0, 1e-12) || !strings.Contains(two.Note, "outer layer") {
		t.Errorf("outer layer ratio %g, note %q", two.Demand/o.Demand, two.Note)
	}
	u := func(kg float64) float64 {
		r, _ := calc.BrakeHolding(siHoist().WithRatedLoad(kg), calc.BrakeRule{Factor: 1.25})
		return r.Utilisation
	}
	if !approxEqual(u(3000)-u(2000), u(2000)-u(1000), 0, 1e-12) {
		t.Errorf("brake utilisation not affine in load")
	}

	for _, tt := range []struct {
		name  string
		mod   func(*calc.Hoist)
		field string
	}{
		{"no brake torque", func(h *calc.Hoist) { h.BrakeTorqueNm = 0 }, "brake_torque"},
		{"no brakes", func(h *calc.Hoist) { h.Brakes = 0 }, "brakes"},
		{"motor brake no gear", func(h *calc.Hoist) { h.GearRatio = 0 }, "gear_ratio"},
		{"gear eff > 1", func(h *calc.Hoist) { h.GearEff = 1.1 }, "gear_efficiency"},
	} {
		h := siHoist()
		tt.mod(&h)
		_, err := calc.BrakeHolding(h, calc.BrakeRule{Factor: 1.25})
		checkRangeError(t, err, tt.field)
	}
	_, err = calc.BrakeHolding(siHoist(), calc.BrakeRule{Factor: math.Inf(1)})
	checkRangeError(t, err, "")
}

// TestBrakeHoldingRevision2 checks design.md Revision 2's holding-brake rule: the factor's
// basis (static or hoisting torque), each of two brakes alone, the control braking means
// and the minimum number of brakes.
func TestBrakeHoldingRevision2(t *testing.T) {
	// Static torque at the motor shaft, by hand: T_s = e W r / (n i) = 1 × 5000 × 9.81 ×
	// 0.2 / (2 × 40) = 122.625 N m (no losses). ISO floor: 1.25 T_s (2006/42/EC Annex I
	// 4.1.2.3 static test coefficient, memory high) = 153.28125 N m against 200 N m.
	st, err := calc.BrakeHolding(siHoist(), calc.BrakeRule{Factor: 1.25, Static: true})
	if err != nil {
		t.Fatal(err)
	}
	runFigChecks(t, []figCheck{
		{"static_torque_nm", st.Figure("static_torque_nm"), 122.625, 1e-12, "hand"},
		{"static demand", st.Demand, 153.28125, 1e-12, "hand"},
		{"static u", st.Utilisation, 0.76640625, 1e-12, "hand"},
		// T_h / T_s = 1 / (η_R η_g): the losses count against the hoisting torque
		// (η_R for 2 parts at 0.98 = 0.99, η_g 0.94).
		{"T_h / T_s", st.Figure("full_load_hoisting_torque_nm") / st.Figure("static_torque_nm"), 1 / (0.99 * 0.94), 1e-12, "identity"},
	})

	// Two brakes each 0.8 × the rated-load hoisting torque: together they meet the ISO
	// floor easily (1.25 T_s / (2 × 0.8 T_h) = 0.72), but neither holds the load alone:
	// u_each = 1.0 T_h / (0.8 T_h) = 1.25 (each-brake factor 1.0: 29 CFR
	// 1910.179(f)(2)(i)(c), law; redundancy in the ISO profile) — a fail.
	h := siHoist()
	th := 131.76983 // T_h by hand (TestBrakeHolding)
	h.Brakes, h.BrakeTorqueNm = 2, 0.8*th
	two, err := calc.BrakeHolding(h, calc.BrakeRule{Factor: 1.25, Static: true, EachFactor: 1})
	if err != nil {
		t.Fatal(err)
	}
	runFigChecks(t, []figCheck{
		{"each u", two.Utilisation, 1.25, 1e-6, "1 / 0.8"},
		{"each_brake_utilisation", two.Figure("each_brake_utilisation"), 1.25, 1e-6, "1 / 0.8"},
		{"each capacity", two.Capacity, 0.8 * th, 1e-12, "one brake"},
	})
	if !strings.Contains(two.Note, "each brake alone") {
		t.Errorf("note %q does not say each brake governs", two.Note)
	}
	// One brake: the each-brake rule does not apply.
	one, _ := calc.BrakeHolding(siHoist(), calc.BrakeRule{Factor: 1.25, EachFactor: 1})
	if !math.IsNaN(one.Figure("each_brake_utilisation")) {
		t.Errorf("one brake: each_brake_utilisation %g, want NaN", one.Figure("each_brake_utilisation"))
	}

	// 29 CFR 1910.179(f)(1)(ii) (law, read in OSHA's letter of 15 November 2005): a hoist
	// without a control braking means fails unless its worm gear is self-locking.
	cite := "29 CFR 1910.179(f)(1)(ii)"
	none, _ := calc.BrakeHolding(siHoist(), calc.BrakeRule{Factor: 1.25, ControlBrakingCite: cite})
	if none.Verdict != calc.Fail || !strings.Contains(none.Note, cite) {
		t.Errorf("no control braking: verdict %v, note %q; want Fail citing %s", none.Verdict, none.Note, cite)
	}
	lock := siHoist()
	lock.GearBackEff = -0.1
	if o, _ := calc.BrakeHolding(lock, calc.BrakeRule{Factor: 1.25, ControlBrakingCite: cite}); o.Verdict != calc.ByUtilisation {
		t.Errorf("self-locking train without control braking: verdict %v, want ByUtilisation", o.Verdict)
	}
	// Cal. Code Regs. tit. 8 §4898(h) (law, read): hot metal with power control braking
	// needs at least two holding brakes.
	if o, _ := calc.BrakeHolding(siHoist(), calc.BrakeRule{Factor: 1.25, MinBrakes: 2, MinBrakesCite: "§4898(h)"}); o.Verdict != calc.Fail {
		t.Errorf("one brake where two are required: verdict %v, want Fail", o.Verdict)
	}
	h = siHoist()
	h.Brakes, h.BrakeTorqueNm = 2, 200
	if o, _ := calc.BrakeHolding(h, calc.BrakeRule{Factor: 1.25, MinBrakes: 2, MinBrakesCite: "§4898(h)"}); o.Verdict != calc.ByUtilisation {
		t.Errorf("two brakes where two are required: verdict %v", o.Verdict)
	}
}

func TestMotorErrors(t *testing.T) {
	for _, tt := range []struct {
		name  string
		mod   func(*calc.Hoist)
		field string
	}{
		{"no power", func(h *calc.Hoist) { h.MotorPowerW = 0 }, "motor_power"},
		{"no speed", func(h *calc.Hoist) { h.MotorSpeedRPM = math.NaN() }, "motor_speed"},
		{"no ratio", func(h *calc.Hoist) { h.GearRatio = 0 }, "gear_ratio"},
		{"gear eff 0", func(h *calc.Hoist) { h.GearEff = 0 }, "gear_efficiency"},
		{"no drum", func(h *calc.Hoist) { h.DrumDiameterM = 0 }, "drum_diameter"},
		{"layers without rope", func(h *calc.Hoist) { h.Layers, h.RopeDiameterM = 3, 0 }, "rope_diameter"},
		{"bad reeving", func(h *calc.Hoist) { h.Parts, h.RopeEnds = 5, 2 }, "parts_of_line"},
		{"negative load", func(h *calc.Hoist) { h.RatedLoadKg = math.Inf(-1) }, "rated_load"},
	} {
		t.Run(tt.name, func(t *testing.T) {
			h := siHoist()
			tt.mod(&h)
			_, err := calc.MotorTorque(h)
			checkRangeError(t, err, tt.field)
		})
	}
}

// usHoist is a hoist specified in US customary units, converted to SI with the NIST SP
// 811 factors: 10 000 lb rated load, 150 lb block, 4 parts on a twin-grooved drum
// (n_e = 2), η_s 0.98, one deflection sheave, 5/8 in rope with 41 200 lbf MBF, 16 in drum,
// 2 layers, 40 grooves, 30 ft lift, gear 50 at η_g 0.93, 30 hp at 1750 rpm, 70 ft/min,
// one 120 lbf·ft motor brake, g = g_n.
func usHoist() calc.Hoist {
	return calc.Hoist{
		G: gn, RatedLoadKg: 10000 * nistLb, HookBlockKg: 150 * nistLb, Parts: 4, RopeEnds: 2,
		SheaveEff: 0.98, DeflectionSheaves: 1,
		RopeDiameterM: 0.625 * nistIn, RopeMBFN: 41200 * nistLbf,
		DrumDiameterM: 16 * nistIn, Layers: 2, Grooves: 40, Grooved: true, LiftHeightM: 30 * nistFt,
		SheaveDiameterM: 12 * nistIn,
		GearRatio:       50, GearEff: 0.93,
		MotorPowerW: 30 * nistHp, MotorSpeedRPM: 1750,
		BrakeTorqueNm: 120 * nistLbfFt, Brakes: 1,
		HoistSpeedMS: 70 * nistFt / 60,
	}
}

func TestUSCustomaryHoist(t *testing.T) {
	// Expected values worked in US units only (lbf, ft, ft·lbf/s, hp = 550 ft·lbf/s), then
	// compared with the SI results converted back with NIST SP 811 factors. A pound mass
	// under g_n weighs one pound-force (lbf = lb × g_n exactly, NIST SP 811).
	h := usHoist()
	wLbf := 10150.0
	etaR := (1 - 0.98*0.98) / (2 * (1 - 0.98)) // n_e = 2
	etaRD := etaR * 0.98                       // one deflection sheave
	fLbf := wLbf / (4 * etaRD)
	r1Ft := 8.0 / 12
	rLFt := (8 + math.Sqrt(3)/2*0.625) / 12
	motorLbfFt := 2 * fLbf * rLFt / (50 * 0.93)
	omega := 2 * math.Pi * 1750 / 60
	ratedLbfFt := 30 * 550 / omega
	powerHp := wLbf * (70.0 / 60) * (rLFt / r1Ft) / (etaRD * 0.93) / 550
	vCalcFtMin := 1750 * 2 * math.Pi * r1Ft / (50 * 2)

	rope, err := calc.RopeDesignFactor(h, 5, true)
	if err != nil {
		t.Fatal(err)
	}
	tq, err := calc.MotorTorque(h)
	if err != nil {
		t.Fatal(err)
	}
	pw, err := calc.MotorPower(h)
	if err != nil {
		t.Fatal(err)
	}
	sp, err := calc.HoistSpeed(h, 0.10)
	if err != nil {
		t.Fatal(err)
	}
	br, err := calc.BrakeHolding(h, calc.BrakeRule{Factor: 1.25})
	if err != nil {
		t.Fatal(err)
	}
	dr, err := calc.DrumRatio(h, 18)
	if err != nil {
		t.Fatal(err)
	}
	const rel = 1e-12
	runFigChecks(t, []figCheck{
		{"rope tension [lbf]", rope.Figure("rope_tension_n") / nistLbf, fLbf, rel, "W/(n η_RD) in lbf"},
		{"static design factor", rope.Capacity, 41200 / (wLbf / 4), rel, "29 CFR basis W/n"},
		{"motor torque [lbf ft]", tq.Demand / nistLbfFt, motorLbfFt, rel, "e F r_L/(i η_g) in lbf ft"},
		{"rated torque [lbf ft]", tq.Capacity / nistLbfFt, ratedLbfFt, rel, "550 P[hp]/ω"},
		{"motor torque u", tq.Utilisation, motorLbfFt / ratedLbfFt, rel, "ratio"},
		{"power [hp]", pw.Demand / nistHp, powerHp, rel, "W v (r_L/r_1)/η_h in ft lbf/s / 550"},
		{"power u", pw.Utilisation, powerHp / 30, rel, "ratio"},
		{"calc speed [ft/min]", sp.Figure("calculated_speed_m_s") / (nistFt / 60), vCalcFtMin, rel, "N 2π r_1/(i n_e)"},
		{"speed deviation", sp.Demand, math.Abs(vCalcFtMin-70) / 70, rel, "ratio"},
		{"brake demand [lbf ft]", br.Demand / nistLbfFt, 1.25 * motorLbfFt, rel, "29 CFR 1910.179(f)(2) 125 %"},
		{"brake u", br.Utilisation, 1.25 * motorLbfFt / 120, rel, "ratio"},
		{"D/d", dr.Capacity, 16 / 0.625, rel, "25.6"},
	})
	if !strings.Contains(tq.Note, "outer layer") {
		t.Errorf("two layers: note %q", tq.Note)
	}
}

func TestOutcomesConsistent(t *testing.T) {
	// Every static check: utilisation = demand / capacity, finite steps with their numbers
	// written out, no NaN outside documented figures.
	h := siHoist()
	h.Layers = 2
	outs := map[string]func() (calc.Outcome, error){
		"rope-design-factor": func() (calc.Outcome, error) { return calc.RopeDesignFactor(h, 4.5, false) },
		"drum-ratio":         func() (calc.Outcome, error) { return calc.DrumRatio(h, 18) },
		"sheave-ratio":       func() (calc.Outcome, error) { return calc.SheaveRatio(h, 20) },
		"drum-capacity":      func() (calc.Outcome, error) { return calc.DrumCapacity(h, 2) },
		"fleet-angle":        func() (calc.Outcome, error) { return calc.FleetAngle(h, 2, 0.5) },
		"motor-torque":       func() (calc.Outcome, error) { return calc.MotorTorque(h) },
		"motor-power":        func() (calc.Outcome, error) { return calc.MotorPower(h) },
		"hoist-speed":        func() (calc.Outcome, error) { return calc.HoistSpeed(h, 0.1) },
		"brake-holding":      func() (calc.Outcome, error) { return calc.BrakeHolding(h, calc.BrakeRule{Factor: 1.25}) },
	}
	for id, f := range outs {
		o, err := f()
		if err != nil {
			t.Errorf("%s: %v", id, err)
			continue
		}
		if !approxEqual(o.Utilisation, o.Demand/o.Capacity, 0, 1e-12) {
			t.Errorf("%s: u = %g, demand/capacity = %g", id, o.Utilisation, o.Demand/o.Capacity)
		}
		if len(o.Steps) == 0 || o.Unit == "" {
			t.Errorf("%s: no steps or no unit", id)
		}
		for _, s := range o.Steps {
			if s.Symbol == "" || s.Formula == "" || s.Numbers == "" || math.IsNaN(s.Value) || strings.Contains(s.Numbers, "%!") {
				t.Errorf("%s: bad step %+v", id, s)
			}
		}
		for _, fg := range o.Figures {
			if math.IsNaN(fg.Value) || fg.Name == "" || fg.Unit == "" {
				t.Errorf("%s: bad figure %+v", id, fg)
			}
		}
	}
}

// TestMotorPowerWithoutGearRatio: the steady hoisting power P = W v / η_h (textbook) does
// not depend on the gear ratio, so a register without one still gets the power check, with
// the same numbers.
func TestMotorPowerWithoutGearRatio(t *testing.T) {
	h := hoistA()
	want, err := calc.MotorPower(h)
	if err != nil {
		t.Fatal(err)
	}
	h.GearRatio = 0
	got, err := calc.MotorPower(h)
	if err != nil {
		t.Fatalf("without a gear ratio: %v", err)
	}
	if got.Demand != want.Demand || got.Utilisation != want.Utilisation {
		t.Errorf("without a gear ratio: demand %g u %g, want %g %g", got.Demand, got.Utilisation, want.Demand, want.Utilisation)
	}
}
