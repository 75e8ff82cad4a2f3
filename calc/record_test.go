package calc_test

// Hoist.SkipRecord: the checks must compute exactly the same numbers, verdicts, notes,
// figures and errors whether or not they write the calculation record (Outcome.Steps),
// and must not write it when asked not to.

import (
	"math"
	"testing"
	"time"

	"hoistfleet/calc"
)

// recCheck is one check function with its rule values bound.
type recCheck struct {
	name string
	f    func(calc.Hoist) (calc.Outcome, error)
}

// recChecks are the 14 hoist checks with rule values from standards.md: Zp 4.5 for M5
// (ISO 4308-1, seen) and the static US basis with design factor 5 (29 CFR
// 1910.179(h)(2), law); h1 18, h2 20 for M5 (ISO 4308-1, memory medium); 2 dead wraps
// (29 CFR 1910.179(h)(2), law); fleet angle ≤ 2° grooved, avoid < 0.5° (Wire Rope Users
// Manual, seen); brake factor 1.25, 1.0 each of two (29 CFR 1910.179(f)(2), law); speed
// tolerance 10 % and stopping distance 0.5 m (common practice, no published source).
// The values only have to be valid inputs: the test compares the two modes.
func recChecks() []recCheck {
	return []recCheck{
		{"rope-design-factor iso", func(h calc.Hoist) (calc.Outcome, error) { return calc.RopeDesignFactor(h, 4.5, false) }},
		{"rope-design-factor static", func(h calc.Hoist) (calc.Outcome, error) { return calc.RopeDesignFactor(h, 5, true) }},
		{"drum-ratio", func(h calc.Hoist) (calc.Outcome, error) { return calc.DrumRatio(h, 18) }},
		{"sheave-ratio", func(h calc.Hoist) (calc.Outcome, error) { return calc.SheaveRatio(h, 20) }},
		{"drum-capacity", func(h calc.Hoist) (calc.Outcome, error) { return calc.DrumCapacity(h, 2) }},
		{"fleet-angle", func(h calc.Hoist) (calc.Outcome, error) { return calc.FleetAngle(h, 2, 0.5) }},
		{"motor-torque", calc.MotorTorque},
		{"motor-power", calc.MotorPower},
		{"hoist-speed", func(h calc.Hoist) (calc.Outcome, error) { return calc.HoistSpeed(h, 0.10) }},
		{"brake-holding", func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeHolding(h, calc.BrakeRule{Factor: 1.25}) }},
		{"brake-holding each", func(h calc.Hoist) (calc.Outcome, error) {
			return calc.BrakeHolding(h, calc.BrakeRule{Factor: 1.0, Each: true})
		}},
		{"motor-accel-torque", calc.MotorAccelTorque},
		{"gearbox-torque", gearbox1},
		{"brake-stop", func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeStop(h, 0.5) }},
		{"brake-stop no limit", func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeStop(h, 0) }},
		{"runaway", calc.Runaway},
		{"shaft-load", calc.ShaftLoad},
		{"component-rating", func(h calc.Hoist) (calc.Outcome, error) {
			h.ComponentWLLKg = 0.9 * h.RatedLoadKg // below the rated load: fails, with its note
			return calc.ComponentRating(h)
		}},
		{"brake-energy", func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeEnergy(h, 20e3, 1) }},
		{"brake-energy no rating", func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeEnergy(h, 0, 1) }},
	}
}

// recHoists are realistic hoists chosen to reach every branch that writes steps or
// notes: one or several layers (outer layer governing), one or two rope ends, deflection
// sheaves, motor-shaft or drum brake, back-drivable or self-locking gear, brakes that
// cannot stop the load, missing optional data (no MBF, grooves, lift height, drum mass:
// errors and NaN figures).
func recHoists() map[string]calc.Hoist {
	// 5 t on 2 parts, one rope end, one layer, motor-shaft brake (the statics tests'
	// hand-calculated hoist, with the dynamics data added).
	single := calc.Hoist{
		G: 9.81, RatedLoadKg: 5000, Parts: 2, RopeEnds: 1, SheaveEff: 0.98,
		RopeDiameterM: 0.020, RopeMBFN: 279104,
		DrumDiameterM: 0.400, Layers: 1, Grooves: 30, Grooved: true, LiftHeightM: 10,
		SheaveDiameterM: 0.355, FleetAngleDeg: 1.0,
		DrumInertiaKgM2: 8, DrumMassKg: 350,
		GearRatio: 40, GearEff: 0.94, GearBackEff: 0.94, GearboxRatedTorqueNm: 6000,
		MotorPowerW: 22000, MotorSpeedRPM: 1460, PeakTorqueRatio: 1.6, MotorInertiaKgM2: 0.12,
		BrakeTorqueNm: 200, Brakes: 1, BrakeDelayS: 0.2,
		HoistSpeedMS: 0.4, AccelMS2: 0.2,
	}
	// 5 t on 4 parts, two rope ends, two layers on a plain drum, a deflection sheave,
	// drum brake, its own lowering speed, fleet angle below the minimum.
	twin := calc.Hoist{
		G: calc.StandardGravity, RatedLoadKg: 5000, HookBlockKg: 150, Parts: 4, RopeEnds: 2,
		SheaveEff: 0.98, DeflectionSheaves: 1,
		RopeDiameterM: 0.016, RopeMBFN: 180e3,
		DrumDiameterM: 0.400, Layers: 2, Grooves: 14, LiftHeightM: 12,
		SheaveDiameterM: 0.315, FleetAngleDeg: 0.3,
		DrumInertiaKgM2: 12, DrumMassKg: 400,
		GearRatio: 112, GearEff: 0.94, GearBackEff: 0.90, GearboxRatedTorqueNm: 14000,
		MotorPowerW: 11000, MotorSpeedRPM: 1450, PeakTorqueRatio: 1.6, MotorInertiaKgM2: 0.08,
		BrakeTorqueNm: 1500, BrakeOnDrum: true, Brakes: 2, BrakeDelayS: 0.3,
		HoistSpeedMS: 8.0 / 60, LoweringSpeedMS: 10.0 / 60, AccelMS2: 0.3,
	}
	// 2 t worm-geared winch: self-locking gear, three layers, two motor-shaft brakes;
	// no MBF, grooves, lift height or drum mass in the register.
	worm := calc.Hoist{
		G: calc.StandardGravity, RatedLoadKg: 2000, HookBlockKg: 40, Parts: 1, RopeEnds: 1, SheaveEff: 1,
		RopeDiameterM: 0.012,
		DrumDiameterM: 0.250, Layers: 3, FleetAngleDeg: 1.5, DrumInertiaKgM2: 1.5,
		GearRatio: 50, GearEff: 0.6, GearBackEff: -0.2, GearboxRatedTorqueNm: 3000,
		MotorPowerW: 7500, MotorSpeedRPM: 1440, PeakTorqueRatio: 2, MotorInertiaKgM2: 0.03,
		BrakeTorqueNm: 40, Brakes: 2, BrakeDelayS: 0.15,
		HoistSpeedMS: 0.3, AccelMS2: 0.25,
	}
	// The twin hoist with a motor-shaft brake far too weak to stop the load (brake-stop
	// fails), and an overload so that the outer layer governs every torque.
	weak := twin
	weak.RatedLoadKg = 8000
	weak.BrakeOnDrum = false
	weak.Brakes = 1
	weak.BrakeTorqueNm = 20
	weak.FleetAngleDeg = 2.5
	weak.Grooved = true
	// The twin hoist with a drum brake too weak to stop the load.
	weakDrum := twin
	weakDrum.BrakeTorqueNm = 100
	weakDrum.Brakes = 1
	return map[string]calc.Hoist{"single": single, "twin": twin, "worm": worm, "weak": weak, "weak drum": weakDrum}
}

// recSame reports whether a and b are the same number: equal, or both NaN.
func recSame(a, b float64) bool { return a == b || (math.IsNaN(a) && math.IsNaN(b)) }

func TestSkipRecordSameResults(t *testing.T) {
	ran := map[string]int{}
	for hn, h := range recHoists() {
		for _, c := range recChecks() {
			h.SkipRecord = false
			full, errFull := c.f(h)
			h.SkipRecord = true
			bare, errBare := c.f(h)
			where := c.name + " / " + hn
			if (errFull == nil) != (errBare == nil) || (errFull != nil && errFull.Error() != errBare.Error()) {
				t.Errorf("%s: error %v with the record, %v without", where, errFull, errBare)
				continue
			}
			if errFull != nil {
				continue
			}
			ran[c.name]++
			if len(full.Steps) == 0 {
				t.Errorf("%s: no steps with SkipRecord false", where)
			}
			if bare.Steps != nil {
				t.Errorf("%s: %d steps with SkipRecord true, want nil", where, len(bare.Steps))
			}
			for _, x := range []struct {
				what       string
				full, bare float64
			}{
				{"Demand", full.Demand, bare.Demand},
				{"Capacity", full.Capacity, bare.Capacity},
				{"Utilisation", full.Utilisation, bare.Utilisation},
			} {
				if !recSame(x.full, x.bare) {
					t.Errorf("%s: %s = %v with the record, %v without", where, x.what, x.full, x.bare)
				}
			}
			if full.Unit != bare.Unit || full.Verdict != bare.Verdict || full.Note != bare.Note {
				t.Errorf("%s: unit/verdict/note differ:\n record %q %v %q\n   bare %q %v %q",
					where, full.Unit, full.Verdict, full.Note, bare.Unit, bare.Verdict, bare.Note)
			}
			if len(full.Figures) != len(bare.Figures) {
				t.Errorf("%s: %d figures with the record, %d without", where, len(full.Figures), len(bare.Figures))
				continue
			}
			for i, f := range full.Figures {
				b := bare.Figures[i]
				if f.Name != b.Name || f.Unit != b.Unit || f.Text != b.Text || !recSame(f.Value, b.Value) {
					t.Errorf("%s: figure %d = %+v with the record, %+v without", where, i, f, b)
				}
			}
		}
	}
	// Every check must have run without error on at least one hoist, or the comparison
	// above proves nothing for it.
	for _, c := range recChecks() {
		if ran[c.name] == 0 {
			t.Errorf("%s: failed on every test hoist", c.name)
		}
	}
}

// TestSkipRecordBranches makes sure the test hoists reach the branches they are meant to
// (verdicts and notes that only some hoists produce), so that the comparison covers them.
func TestSkipRecordBranches(t *testing.T) {
	hs := recHoists()
	for _, tt := range []struct {
		hoist   string
		check   func(calc.Hoist) (calc.Outcome, error)
		verdict calc.Verdict
	}{
		{"weak", func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeStop(h, 0.5) }, calc.Fail},
		{"weak drum", func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeStop(h, 0.5) }, calc.Fail},
		{"worm", func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeStop(h, 0.5) }, calc.Info},
		{"twin", func(h calc.Hoist) (calc.Outcome, error) { return calc.FleetAngle(h, 2, 0.5) }, calc.Marginal},
	} {
		h := hs[tt.hoist]
		h.SkipRecord = true
		o, err := tt.check(h)
		if err != nil {
			t.Fatalf("%s: %v", tt.hoist, err)
		}
		if o.Verdict != tt.verdict {
			t.Errorf("%s: Verdict = %v, want %v", tt.hoist, o.Verdict, tt.verdict)
		}
	}
	// The outer layer governs the motor torque of the overloaded two-layer hoist: the
	// load torque grows with r (r_L > r_1), so the Note says so.
	o, err := calc.MotorTorque(hs["weak"])
	if err != nil {
		t.Fatal(err)
	}
	if o.Note == "" {
		t.Errorf("weak: motor-torque Note empty, want the outer-layer note")
	}
}

// TestSkipRecordAllocates checks that skipping the record saves allocations in every
// check: the record's text is not formatted.
func TestSkipRecordAllocates(t *testing.T) {
	if testing.Short() {
		t.Skip("allocation counts")
	}
	for hn, h := range recHoists() {
		for _, c := range recChecks() {
			h.SkipRecord = false
			if _, err := c.f(h); err != nil {
				continue
			}
			full := testing.AllocsPerRun(20, func() { _, _ = c.f(h) })
			h.SkipRecord = true
			bare := testing.AllocsPerRun(20, func() { _, _ = c.f(h) })
			if !(bare < full) {
				t.Errorf("%s / %s: %v allocations without the record, %v with it", c.name, hn, bare, full)
			}
		}
	}
}

// benchChecks runs the 14 checks once on h.
func benchChecks(b *testing.B, h calc.Hoist) {
	b.Helper()
	fs := []func(calc.Hoist) (calc.Outcome, error){
		func(h calc.Hoist) (calc.Outcome, error) { return calc.RopeDesignFactor(h, 4.5, false) },
		func(h calc.Hoist) (calc.Outcome, error) { return calc.DrumRatio(h, 18) },
		func(h calc.Hoist) (calc.Outcome, error) { return calc.SheaveRatio(h, 20) },
		func(h calc.Hoist) (calc.Outcome, error) { return calc.DrumCapacity(h, 2) },
		func(h calc.Hoist) (calc.Outcome, error) { return calc.FleetAngle(h, 2, 0.5) },
		calc.MotorTorque,
		calc.MotorPower,
		func(h calc.Hoist) (calc.Outcome, error) { return calc.HoistSpeed(h, 0.10) },
		func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeHolding(h, calc.BrakeRule{Factor: 1.25}) },
		calc.MotorAccelTorque,
		gearbox1,
		func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeStop(h, 0.5) },
		calc.Runaway,
		calc.ShaftLoad,
	}
	for _, f := range fs {
		if _, err := f(h); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		for _, f := range fs {
			_, _ = f(h)
		}
	}
}

// BenchmarkChecksRecord runs the 14 checks on the two-layer hoist with the record.
func BenchmarkChecksRecord(b *testing.B) { benchChecks(b, recHoists()["twin"]) }

// BenchmarkChecksSkipRecord runs the same checks with SkipRecord set.
func BenchmarkChecksSkipRecord(b *testing.B) {
	h := recHoists()["twin"]
	h.SkipRecord = true
	benchChecks(b, h)
}

// TestSkipDetailSameNumbers: with Hoist.SkipDetail (the rated-load search) every check
// gives the same Demand, Capacity, Utilisation, Verdict and error as the full outcome, at
// the test hoists' rated loads and at loads from empty to four times rated, where verdicts
// change (brakes that can no longer stop, an overloaded drive).
func TestSkipDetailSameNumbers(t *testing.T) {
	for hn, h0 := range recHoists() {
		for _, c := range recChecks() {
			for _, f := range []float64{0, 0.5, 1, 1.7, 4} {
				h := h0.WithRatedLoad(f * h0.RatedLoadKg)
				h.SkipRecord = true
				full, errFull := c.f(h)
				h.SkipDetail = true
				bare, errBare := c.f(h)
				where := c.name + " / " + hn
				if (errFull == nil) != (errBare == nil) || (errFull != nil && errFull.Error() != errBare.Error()) {
					t.Errorf("%s × %g: error %v in full, %v numbers only", where, f, errFull, errBare)
					continue
				}
				if errFull != nil {
					continue
				}
				if !recSame(full.Demand, bare.Demand) || !recSame(full.Capacity, bare.Capacity) ||
					!recSame(full.Utilisation, bare.Utilisation) || full.Verdict != bare.Verdict {
					t.Errorf("%s × %g: full %v/%v/%v/%v, numbers only %v/%v/%v/%v", where, f,
						full.Demand, full.Capacity, full.Utilisation, full.Verdict,
						bare.Demand, bare.Capacity, bare.Utilisation, bare.Verdict)
				}
			}
		}
	}
}

// TestSkipRecordLifeChecks: design-life, rope-wear and inspection-due give the same
// numbers, figures and notes without their calculation record, and no record. Inputs:
// FEM 9.755 class M5 D = 6300 h (standards.md, seen) with X 1.2 (memory, low); ISO 4309
// 7.5 % diameter decrease (seen) and the ASME B30.2 1/32 in band (seen); a 12-month
// interval (29 CFR 1910.179(j)(2), law). load-test likewise.
func TestSkipRecordLifeChecks(t *testing.T) {
	day := func(y, m, d int) time.Time { return time.Date(y, time.Month(m), d, 0, 0, 0, 0, time.UTC) }
	type check struct {
		name string
		f    func(skip bool) (calc.Outcome, error)
	}
	life := calc.LifeInput{OperatingHours: 4000, Km: 0.5, RecordFactor: 1.2, FullLoadDurationH: 6300,
		Commissioned: day(2016, 3, 1), AsOf: day(2026, 12, 1)}
	wearISO := calc.WearInput{NominalM: 0.020, ReferenceM: 0.0205, MeasuredM: 0.0191, MaxReductionFraction: 0.075,
		BrokenWires: 3, MaxBrokenWires: 6, Fitted: day(2022, 5, 1), AsOf: day(2026, 12, 1)}
	wearUS := calc.WearInput{NominalM: 0.01905, MeasuredM: 0.0185, MaxReductionM: 0.0254 / 32, BrokenWires: -1}
	checks := []check{
		{"design-life", func(skip bool) (calc.Outcome, error) { in := life; in.SkipRecord = skip; return calc.DesignLife(in) }},
		{"rope-wear iso", func(skip bool) (calc.Outcome, error) { in := wearISO; in.SkipRecord = skip; return calc.RopeWear(in) }},
		{"rope-wear us", func(skip bool) (calc.Outcome, error) { in := wearUS; in.SkipRecord = skip; return calc.RopeWear(in) }},
		{"inspection-due", func(skip bool) (calc.Outcome, error) {
			if skip {
				return calc.InspectionDueNumbers(day(2025, 10, 31), day(2026, 12, 1), 12, nil)
			}
			return calc.InspectionDue(day(2025, 10, 31), day(2026, 12, 1), 12)
		}},
		// 5 t rated, last tested statically with 6 t: 6000 / 1.25 = 4800 kg covered, so it
		// fails with a note (2006/42/EC static coefficient 1.25, law, memory high).
		{"overload-limiter", func(skip bool) (calc.Outcome, error) {
			return calc.OverloadLimiter(calc.LimiterInput{Fitted: true, RatedLoadKg: 5000, RequiredFromKg: 1000,
				LastTest: day(2026, 2, 1), AsOf: day(2026, 12, 1), IntervalMonths: 12, SkipRecord: skip})
		}},
		// Set at 120 % against the 110 % review limit (EN 14492-2, memory, low), and judged
		// on the setting alone as the fleet's review does.
		{"overload-limiter setting", func(skip bool) (calc.Outcome, error) {
			return calc.OverloadLimiter(calc.LimiterInput{Fitted: true, RatedLoadKg: 5000, RequiredFromKg: 1000,
				LastTest: day(2026, 2, 1), AsOf: day(2026, 12, 1), IntervalMonths: 12, Setting: 1.2, MaxSetting: 1.1, SkipRecord: skip})
		}},
		{"overload-limiter setting only", func(skip bool) (calc.Outcome, error) {
			return calc.OverloadLimiter(calc.LimiterInput{Fitted: true, RatedLoadKg: 5000, Setting: 1.2, MaxSetting: 1.1, SettingOnly: true, SkipRecord: skip})
		}},
		{"limit-devices", func(skip bool) (calc.Outcome, error) {
			return calc.LimitDevices(calc.LimitDeviceInput{UpperFitted: true, UpperRequired: true, LastTest: day(2025, 10, 1), AsOf: day(2026, 12, 1), IntervalMonths: 12, SkipRecord: skip})
		}},
		{"limit-devices missing", func(skip bool) (calc.Outcome, error) {
			return calc.LimitDevices(calc.LimitDeviceInput{UpperRequired: true, SkipRecord: skip})
		}},
		// FEM 9.683 2m: 40 % ED, 240 starts an hour (memory, low); 150 cycles an hour at two
		// starts each.
		{"motor-duty", func(skip bool) (calc.Outcome, error) {
			return calc.MotorDuty(calc.MotorDutyInput{RatedDutyFactor: 0.25, RatedStarts: 240, RequiredDutyFactor: 0.4, RequiredStarts: 240,
				StartsPerHour: math.NaN(), CyclesPerHour: 150, StartsPerCycle: 2, SkipRecord: skip})
		}},
		{"design-life overhaul", func(skip bool) (calc.Outcome, error) {
			in := life
			in.Overhaul, in.HoursAtOverhaul, in.SkipRecord = day(2024, 3, 1), 3000, skip
			return calc.DesignLife(in)
		}},
		{"load-test", func(skip bool) (calc.Outcome, error) {
			if skip {
				return calc.LoadTestNumbers(5000, 6000, 1.25, nil)
			}
			return calc.LoadTest(5000, 6000, 1.25)
		}},
	}
	// With the hoist checks of recChecks, these cover every check.
	var names []string
	for _, c := range recChecks() {
		names = append(names, c.name)
	}
	for _, c := range checks {
		names = append(names, c.name)
	}
	coversEveryCheck(t, "recChecks and TestSkipRecordLifeChecks", names)
	for _, c := range checks {
		full, err1 := c.f(false)
		bare, err2 := c.f(true)
		if err1 != nil || err2 != nil {
			t.Fatalf("%s: %v / %v", c.name, err1, err2)
		}
		if len(full.Steps) == 0 || bare.Steps != nil {
			t.Errorf("%s: %d steps with the record, %d without", c.name, len(full.Steps), len(bare.Steps))
		}
		if !recSame(full.Demand, bare.Demand) || !recSame(full.Capacity, bare.Capacity) || !recSame(full.Utilisation, bare.Utilisation) ||
			full.Verdict != bare.Verdict || full.Note != bare.Note || full.Unit != bare.Unit || len(full.Figures) != len(bare.Figures) {
			t.Errorf("%s: outcomes differ:\n%+v\n%+v", c.name, full, bare)
			continue
		}
		for i, f := range full.Figures {
			if b := bare.Figures[i]; f.Name != b.Name || f.Text != b.Text || !recSame(f.Value, b.Value) {
				t.Errorf("%s: figure %d %+v vs %+v", c.name, i, f, b)
			}
		}
	}
}
