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
	if v := calc.BrakeStopLimitKg(locked); !math.IsNaN(v) {
		t.Errorf("self-locking train: limit %v, want NaN", v)
	}
}
