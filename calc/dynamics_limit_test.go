package calc_test

import (
	"math"
	"testing"

	"hoistfleet/calc"
)

// TestBrakeStopLimitKg checks the closed-form load limit against BrakeStop itself (an
// independent route: the check's own fail verdict) just below and just above the limit,
// for both brake locations and a two-layer drum (r_L governs).
func TestBrakeStopLimitKg(t *testing.T) {
	base := calc.Hoist{G: calc.StandardGravity, RatedLoadKg: 5000, HookBlockKg: 120, Parts: 4, RopeEnds: 2,
		SheaveEff: 0.98, RopeDiameterM: 0.014, RopeMBFN: 150e3, DrumDiameterM: 0.35, Layers: 2,
		DrumInertiaKgM2: 4, GearRatio: 80, GearEff: 0.94, GearBackEff: 0.9, MotorPowerW: 11e3,
		MotorSpeedRPM: 1450, PeakTorqueRatio: 1.6, MotorInertiaKgM2: 0.05, BrakeTorqueNm: 150,
		Brakes: 1, BrakeDelayS: 0.3, HoistSpeedMS: 0.1, AccelMS2: 0.2}
	drum := base
	drum.BrakeOnDrum, drum.BrakeTorqueNm = true, 9000
	for name, h := range map[string]calc.Hoist{"motor-shaft brake": base, "drum brake": drum} {
		lim := calc.BrakeStopLimitKg(h)
		if !(lim > 0) {
			t.Fatalf("%s: limit %v", name, lim)
		}
		below, err := calc.BrakeStop(h.WithRatedLoad(lim*(1-1e-6)), math.NaN())
		if err != nil || below.Verdict == calc.Fail {
			t.Errorf("%s: just below the limit %.1f kg the brakes cannot stop (err %v)", name, lim, err)
		}
		above, err := calc.BrakeStop(h.WithRatedLoad(lim*(1+1e-6)), math.NaN())
		if err != nil || above.Verdict != calc.Fail {
			t.Errorf("%s: just above the limit %.1f kg the brakes still stop (err %v)", name, lim, err)
		}
	}
	locked := base
	locked.GearBackEff = 0
	lockedDrum := drum
	lockedDrum.GearBackEff = -0.2
	for name, h := range map[string]calc.Hoist{"motor-shaft brake": locked, "drum brake": lockedDrum} {
		if v := calc.BrakeStopLimitKg(h); !math.IsNaN(v) {
			t.Errorf("self-locking train, %s: limit %v, want NaN", name, v)
		}
		// BrakeStop never fails such a train: information whatever the load.
		for _, m := range []float64{0, 5000, 1e6} {
			if o, err := calc.BrakeStop(h.WithRatedLoad(m), math.NaN()); err != nil || o.Verdict != calc.Info {
				t.Errorf("self-locking train, %s, %g kg: verdict %v (err %v), want Info", name, m, o.Verdict, err)
			}
		}
	}
}

// TestTorqueLimitsKg checks the closed-form load limits of motor-accel-torque and
// gearbox-torque against the checks themselves (their utilisation just below and just
// above the limit), for a single-layer and a two-layer drum (the governing radius
// differs), both brake locations, and a brake whose stop torque alone overloads the
// gearbox (limit 0). Hoist data: an invented 5 t winch; inertias and ratings are
// ordinary values, not from any source.
func TestTorqueLimitsKg(t *testing.T) {
	base := calc.Hoist{G: calc.StandardGravity, RatedLoadKg: 5000, HookBlockKg: 120, Parts: 4, RopeEnds: 2,
		SheaveEff: 0.98, RopeDiameterM: 0.014, RopeMBFN: 150e3, DrumDiameterM: 0.35, Layers: 1,
		DrumInertiaKgM2: 4, GearRatio: 80, GearEff: 0.94, GearBackEff: 0.9, GearboxRatedTorqueNm: 9000,
		MotorPowerW: 11e3, MotorSpeedRPM: 1450, PeakTorqueRatio: 1.6, MotorInertiaKgM2: 0.05,
		BrakeTorqueNm: 90, Brakes: 1, BrakeDelayS: 0.3, HoistSpeedMS: 0.1, AccelMS2: 0.4}
	layered := base
	layered.Layers = 4
	drum := layered
	drum.BrakeOnDrum, drum.BrakeTorqueNm = true, 9000
	hoists := map[string]calc.Hoist{"one layer": base, "four layers": layered, "drum brake": drum}
	checks := []struct {
		name  string
		check func(calc.Hoist) (calc.Outcome, error)
		limit func(calc.Hoist) float64
	}{
		{"motor-accel-torque", calc.MotorAccelTorque, calc.MotorAccelTorqueLimitKg},
		{"gearbox-torque", gearbox1, gearboxLimit1},
	}
	for hn, h := range hoists {
		for _, c := range checks {
			lim := c.limit(h)
			if !(lim > 0) {
				t.Fatalf("%s / %s: limit %v", c.name, hn, lim)
			}
			below, err1 := c.check(h.WithRatedLoad(lim * (1 - 1e-6)))
			above, err2 := c.check(h.WithRatedLoad(lim * (1 + 1e-6)))
			if err1 != nil || err2 != nil {
				t.Fatalf("%s / %s: %v %v", c.name, hn, err1, err2)
			}
			if !(below.Utilisation <= 1) || !(above.Utilisation > 1) {
				t.Errorf("%s / %s: limit %.3f kg: utilisation %.9f below, %.9f above", c.name, hn, lim, below.Utilisation, above.Utilisation)
			}
		}
	}
	// A motor-shaft brake of 120 N m × i 80 / η_gb 0.9 = 10 667 N m on the drum shaft
	// exceeds the 9000 N m rating whatever the load.
	strong := base
	strong.BrakeTorqueNm = 120
	if v := calc.GearboxTorqueLimitKg(strong, 1); v != 0 {
		t.Errorf("stop torque above the rating: limit %v, want 0", v)
	}
	if o, _ := calc.GearboxTorque(strong.WithRatedLoad(0), 1); !(o.Utilisation > 1) {
		t.Errorf("stop torque above the rating: utilisation %v at no load, want > 1", o.Utilisation)
	}
	// No hook block and no inertia: the check refuses an empty hook ("nothing to move")
	// but runs at any load, and so must the limit (it once came out NaN here and a
	// failing gearbox dropped out of the rating).
	bare := base
	bare.HookBlockKg, bare.DrumInertiaKgM2, bare.MotorInertiaKgM2 = 0, 0, 0
	bare.BrakeOnDrum, bare.BrakeTorqueNm, bare.GearboxRatedTorqueNm = true, 20000, 1500
	lim := calc.GearboxTorqueLimitKg(bare, 1)
	o, err := calc.GearboxTorque(bare.WithRatedLoad(lim*(1+1e-6)), 1)
	if !(lim > 0) || err != nil || !(o.Utilisation > 1) {
		t.Errorf("no hook block, no inertia: limit %v, utilisation just above it %v (err %v)", lim, o.Utilisation, err)
	}
	bad := base
	bad.MotorPowerW = 0
	if v := calc.MotorAccelTorqueLimitKg(bad); !math.IsNaN(v) {
		t.Errorf("no motor power: limit %v, want NaN", v)
	}
}
