package calc_test

import (
	"fmt"
	"math"
	"testing"

	"hoistfleet/calc"
)

// TestFigureBufSameFigures: every check gives the same figures whether they are kept in
// a FigureBuf or in a slice of their own, and the figures of earlier checks survive the
// later ones (and a new block) in the same buffer until Reset.
func TestFigureBufSameFigures(t *testing.T) {
	checks := []struct {
		name string
		run  func(h calc.Hoist) (calc.Outcome, error)
	}{
		{"rope-design-factor", func(h calc.Hoist) (calc.Outcome, error) { return calc.RopeDesignFactor(h, 5.6, false) }},
		{"drum-ratio", func(h calc.Hoist) (calc.Outcome, error) { return calc.DrumRatio(h, 18) }},
		{"sheave-ratio", func(h calc.Hoist) (calc.Outcome, error) { return calc.SheaveRatio(h, 20) }},
		{"drum-capacity", func(h calc.Hoist) (calc.Outcome, error) { return calc.DrumCapacity(h, 2) }},
		{"fleet-angle", func(h calc.Hoist) (calc.Outcome, error) { return calc.FleetAngle(h, 2, 0.5) }},
		{"motor-torque", calc.MotorTorque},
		{"motor-power", calc.MotorPower},
		{"hoist-speed", func(h calc.Hoist) (calc.Outcome, error) { return calc.HoistSpeed(h, 0.1) }},
		{"brake-holding", func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeHolding(h, calc.BrakeRule{Factor: 1.5}) }},
		{"brake-stop", func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeStop(h, 0) }},
		{"runaway", calc.Runaway},
		{"motor-accel-torque", calc.MotorAccelTorque},
		{"gearbox-torque", gearbox1},
		{"shaft-load", calc.ShaftLoad},
		{"load-test", func(h calc.Hoist) (calc.Outcome, error) {
			return calc.LoadTestNumbers(h.RatedLoadKg, 1.25*h.RatedLoadKg, 1.25, h.Figs)
		}},
		{"inspection-due", func(h calc.Hoist) (calc.Outcome, error) {
			return calc.InspectionDueNumbers(date(2025, 10, 31), date(2026, 12, 1), 12, h.Figs)
		}},
		{"design-life", func(h calc.Hoist) (calc.Outcome, error) {
			return calc.DesignLife(calc.LifeInput{OperatingHours: 2000, Km: 0.25, RecordFactor: 1.2, FullLoadDurationH: 1600, SkipRecord: true, Figs: h.Figs})
		}},
		{"overload-limiter", func(h calc.Hoist) (calc.Outcome, error) {
			return calc.OverloadLimiter(calc.LimiterInput{Fitted: true, RatedLoadKg: h.RatedLoadKg, RequiredFromKg: 1000,
				LastTest: date(2026, 5, 1), AsOf: date(2026, 12, 1), IntervalMonths: 12, SkipRecord: true, Figs: h.Figs})
		}},
		{"rope-wear", func(h calc.Hoist) (calc.Outcome, error) {
			return calc.RopeWear(calc.WearInput{NominalM: 0.016, MeasuredM: 0.0152, MaxReductionFraction: 0.075, BrokenWires: -1, SkipRecord: true, Figs: h.Figs})
		}},
		{"component-rating", func(h calc.Hoist) (calc.Outcome, error) {
			h.ComponentWLLKg = 6300
			return calc.ComponentRating(h)
		}},
		{"limit-devices", func(h calc.Hoist) (calc.Outcome, error) {
			return calc.LimitDevices(calc.LimitDeviceInput{UpperFitted: true, UpperRequired: true, LastTest: date(2026, 5, 1), AsOf: date(2026, 12, 1), IntervalMonths: 12, SkipRecord: true, Figs: h.Figs, LowerKnown: true})
		}},
		{"motor-duty", func(h calc.Hoist) (calc.Outcome, error) {
			return calc.MotorDuty(calc.MotorDutyInput{RatedDutyFactor: 0.4, RatedStarts: 240, RequiredDutyFactor: math.NaN(), RequiredStarts: math.NaN(),
				StartsPerHour: math.NaN(), CyclesPerHour: 30, StartsPerCycle: 2, SkipRecord: true, Figs: h.Figs})
		}},
		{"brake-energy", func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeEnergy(h, 20e3, 1) }},
	}
	var names []string
	for _, c := range checks {
		names = append(names, c.name)
	}
	coversEveryCheck(t, "TestFigureBufSameFigures", names)
	own := hoistA() // with the statics' fields too (invented for the test)
	own.Grooves, own.SheaveDiameterM, own.FleetAngleDeg = 40, 0.32, 1.2
	own.SkipRecord = true
	kept := own
	kept.Figs = new(calc.FigureBuf)
	for round := range 2 { // the second round reuses the buffer's memory
		kept.Figs.Reset()
		var got [][]calc.Figure
		var want []string
		for range 3 { // 3 × ~90 figures: more than one block
			for _, c := range checks {
				ow, err1 := c.run(own)
				kw, err2 := c.run(kept)
				if err1 != nil || err2 != nil {
					t.Fatalf("%s: %v, %v", c.name, err1, err2)
				}
				if a, b := fmt.Sprint(ow.Figures), fmt.Sprint(kw.Figures); a != b {
					t.Fatalf("round %d, %s: figures in a FigureBuf %s, own slice %s", round, c.name, b, a)
				}
				if len(kw.Figures) == 0 || cap(kw.Figures) != len(kw.Figures) {
					t.Fatalf("%s: %d figures with capacity %d: an append would run into the next check's", c.name, len(kw.Figures), cap(kw.Figures))
				}
				got, want = append(got, kw.Figures), append(want, fmt.Sprint(ow.Figures))
			}
		}
		for i := range got {
			if s := fmt.Sprint(got[i]); s != want[i] {
				t.Fatalf("round %d: figures of check %d overwritten by a later one: %s, want %s", round, i, s, want[i])
			}
		}
	}
}

// TestFigureBufNilIsOwnSlice: without a buffer each Outcome's figures are its own.
func TestFigureBufNilIsOwnSlice(t *testing.T) {
	h := hoistA()
	a, _ := calc.MotorTorque(h)
	b, _ := calc.MotorTorque(h)
	a.Figures[0].Value = math.Pi
	if b.Figures[0].Value == math.Pi {
		t.Error("two Outcomes without a FigureBuf share their figures")
	}
}
