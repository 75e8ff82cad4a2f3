package calc_test

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"hoistfleet/calc"
)

// dynApproxEqual reports whether got and want agree within absTol or within relTol
// relative to the larger magnitude: |got − want| ≤ max(absTol, relTol·max(|got|, |want|))
// (the rule of gonum's scalar.EqualWithinAbsOrRel). Two NaNs agree; ±Inf agree with
// themselves only.
func dynApproxEqual(got, want, absTol, relTol float64) bool {
	if math.IsNaN(got) || math.IsNaN(want) {
		return math.IsNaN(got) && math.IsNaN(want)
	}
	if math.IsInf(got, 0) || math.IsInf(want, 0) {
		return got == want
	}
	d := math.Abs(got - want)
	return d <= absTol || d <= relTol*math.Max(math.Abs(got), math.Abs(want))
}

// NIST SP 811 (2008) appendix B conversion factors (standards.md "Units", exact unless
// noted; memory high).
const (
	usFt    = 0.3048               // ft → m, exact
	usIn    = 0.0254               // in → m, exact
	usLb    = 0.45359237           // lb (avoirdupois) → kg, exact
	usLbf   = 4.4482216152605      // lbf → N, exact
	usHp    = 745.69987158227022   // hp (550 ft·lbf/s) → W
	usLbFt2 = 0.0421401100938048   // lb·ft² → kg·m²
	usLbfFt = 1.3558179483314004   // lbf·ft → N·m
	usGft   = 32.17404856          // g_n in ft/s² (standards.md: derived, 9.80665/0.3048)
	usMin   = 60.0                 // min → s
	usTolUS = 1e-9                 // relative tolerance for SI vs US: the rounding of usGft (≈1.4e-10)
	gTextbk = 9.8                  // g used by both textbooks below
	gSI     = calc.StandardGravity // 9.80665 m/s², NIST SP 811
)

// hoistA is a realistic worked hoist in SI: 5 t on 4 parts of line, twin-grooved drum
// (e = 2, n_e = 2), 16 mm rope in two layers on a 400 mm drum, 11 kW 4-pole motor
// through a 112:1 gearbox, one 100 N m motor-shaft brake. The values are invented for
// the test; the hand calculation below each test is independent of the code.
func hoistA() calc.Hoist {
	return calc.Hoist{
		G: gSI, RatedLoadKg: 5000, HookBlockKg: 150, Parts: 4, RopeEnds: 2, SheaveEff: 0.98,
		RopeDiameterM: 0.016, RopeMBFN: 180e3, DrumDiameterM: 0.400, Layers: 2, Grooved: true,
		LiftHeightM: 12, DrumInertiaKgM2: 12, DrumMassKg: 400,
		GearRatio: 112, GearEff: 0.94, GearBackEff: 0.90, GearboxRatedTorqueNm: 14000,
		MotorPowerW: 11000, MotorSpeedRPM: 1450, PeakTorqueRatio: 1.6, MotorInertiaKgM2: 0.08,
		BrakeTorqueNm: 100, Brakes: 1, BrakeDelayS: 0.3,
		HoistSpeedMS: 8.0 / 60, AccelMS2: 0.3,
	}
}

// usB is hoist B's register data in US customary units.
type usB struct {
	ratedLb, blockLb          float64
	parts, ends, defl, layers int
	sheaveEff                 float64
	ropeIn, drumIn            float64
	mbfLbf, liftFt            float64
	drumLbFt2, drumLb         float64
	ratio, etaG, etaGB        float64
	gearboxLbfFt              float64
	hp, rpm, peak, motorLbFt2 float64
	brakeLbfFt                float64
	brakes                    int
	delayS                    float64
	hoistFtMin, lowerFtMin    float64
	accelFtS2                 float64
	brakeOnDrum               bool
}

// hoistBUS is a realistic worked hoist in US customary units: 10 000 lb on 4 parts, twin
// drum, one deflection sheave, 5/8 in rope in three layers on a 16 in drum, 20 hp 1750 rpm
// motor through 80:1, two 40 lbf·ft motor-shaft brakes (invented for the test).
func hoistBUS() usB {
	return usB{
		ratedLb: 10000, blockLb: 300, parts: 4, ends: 2, defl: 1, layers: 3, sheaveEff: 0.98,
		ropeIn: 0.625, drumIn: 16, mbfLbf: 41200, liftFt: 40, drumLbFt2: 300, drumLb: 600,
		ratio: 80, etaG: 0.93, etaGB: 0.88, gearboxLbfFt: 9000,
		hp: 20, rpm: 1750, peak: 1.8, motorLbFt2: 1.2, brakeLbfFt: 40, brakes: 2, delayS: 0.25,
		hoistFtMin: 45, lowerFtMin: 50, accelFtS2: 1,
	}
}

// si converts hoist B to calc.Hoist with the NIST SP 811 factors.
func (u usB) si() calc.Hoist {
	return calc.Hoist{
		G: gSI, RatedLoadKg: u.ratedLb * usLb, HookBlockKg: u.blockLb * usLb,
		Parts: u.parts, RopeEnds: u.ends, SheaveEff: u.sheaveEff, DeflectionSheaves: u.defl,
		RopeDiameterM: u.ropeIn * usIn, RopeMBFN: u.mbfLbf * usLbf,
		DrumDiameterM: u.drumIn * usIn, Layers: u.layers, Grooved: true, LiftHeightM: u.liftFt * usFt,
		DrumInertiaKgM2: u.drumLbFt2 * usLbFt2, DrumMassKg: u.drumLb * usLb,
		GearRatio: u.ratio, GearEff: u.etaG, GearBackEff: u.etaGB, GearboxRatedTorqueNm: u.gearboxLbfFt * usLbfFt,
		MotorPowerW: u.hp * usHp, MotorSpeedRPM: u.rpm, PeakTorqueRatio: u.peak,
		MotorInertiaKgM2: u.motorLbFt2 * usLbFt2,
		BrakeTorqueNm:    u.brakeLbfFt * usLbfFt, Brakes: u.brakes, BrakeDelayS: u.delayS, BrakeOnDrum: u.brakeOnDrum,
		HoistSpeedMS: u.hoistFtMin * usFt / usMin, LoweringSpeedMS: u.lowerFtMin * usFt / usMin,
		AccelMS2: u.accelFtS2 * usFt,
	}
}

// usTrain is hoist B worked in US customary units (ft, slug, lbf, s), independently of
// package calc: W in lbf is the weight of the lb mass at standard gravity, masses in
// slug = lb / g_n[ft/s²], inertias in slug·ft² = lb·ft² / g_n[ft/s²].
type usTrain struct {
	w, mass, id, jm, n, e, ne, etaR, etaRD, etaG, etaGB, etaL, i float64
	radii                                                        []float64
}

func (u usB) train() usTrain {
	t := usTrain{
		w: u.ratedLb + u.blockLb, mass: (u.ratedLb + u.blockLb) / usGft,
		id: u.drumLbFt2 / usGft, jm: u.motorLbFt2 / usGft,
		n: float64(u.parts), e: float64(u.ends), etaG: u.etaG, etaGB: u.etaGB, i: u.ratio,
	}
	t.ne = t.n / t.e
	// η_R = (1 − η_s^n_e) / (n_e (1 − η_s)), geometric series of part tensions
	// (standards.md "Reeving", memory high); k deflection sheaves add η_s^k.
	t.etaR = (1 - math.Pow(u.sheaveEff, t.ne)) / (t.ne * (1 - u.sheaveEff))
	t.etaRD = t.etaR * math.Pow(u.sheaveEff, float64(u.defl))
	t.etaL = t.etaRD * t.etaGB
	r1 := u.drumIn / 2 / 12
	t.radii = []float64{r1, r1 + float64(u.layers-1)*math.Sqrt(3)/2*u.ropeIn/12}
	return t
}

// ---------------------------------------------------------------------------------
// Runaway

func TestRunawayTextbook(t *testing.T) {
	// Cord wound on a drum, block released, unit efficiencies, J_m = 0, n = e = 1, i = 1:
	// a = m g / (m + I/r²), α = a/r, T = m (g − a).
	tests := []struct {
		name                 string
		blockKg, inertia, r1 float64
		rL                   float64 // 0: one layer
		wantA, wantAlpha     float64
		wantT                float64 // NaN: not printed by the source
		relTol               float64
	}{
		// Halliday, Resnick & Walker, Fundamentals of Physics, ch. 10 sample problem: disk
		// M = 2.5 kg, R = 0.20 m, I = ½ M R² = 0.05 kg m², block 1.2 kg, g = 9.8:
		// a = 4.8 m/s², α = 24 rad/s², T = 6.0 N (standards.md, memory medium-high,
		// arithmetic exact).
		{"Halliday disk", 1.2, 0.5 * 2.5 * 0.20 * 0.20, 0.20, 0, 4.8, 24, 6.0, 1e-12},
		// Young & Freedman, University Physics 13th ed., problem 10.71: I = 0.00225 kg m²,
		// block 1.50 kg, g = 9.80; a = 2.88 m/s² on r = 2.50 cm (standards.md, computed;
		// printed to 3 figures, hence the tolerance).
		{"Young-Freedman small disk", 1.50, 0.00225, 0.025, 0, 2.88, 2.88 / 0.025, math.NaN(), 2e-3},
		// Same problem, a = 6.13 m/s² on r = 5.00 cm.
		{"Young-Freedman large disk", 1.50, 0.00225, 0.050, 0, 6.13, 6.13 / 0.050, math.NaN(), 2e-3},
		// The two welded disks as two rope layers (r_1 = 2.5 cm, r_L = 5.0 cm): runaway is
		// reported at the radius giving the larger acceleration, the large disk's 6.13 m/s²
		// (design.md "Radius"; Young & Freedman 10.71 as above).
		{"Young-Freedman as two layers", 1.50, 0.00225, 0.025, 0.050, 6.13, 6.13 / 0.050, math.NaN(), 2e-3},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			h := calc.Hoist{
				G: gTextbk, RatedLoadKg: tt.blockKg, Parts: 1, RopeEnds: 1, SheaveEff: 1,
				DrumDiameterM: 2 * tt.r1, Layers: 1, DrumInertiaKgM2: tt.inertia,
				GearRatio: 1, GearEff: 1, GearBackEff: 1, HoistSpeedMS: 1,
			}
			if tt.rL > 0 {
				h.Layers = 2
				h.RopeDiameterM = (tt.rL - tt.r1) * 2 / math.Sqrt(3) // r_L = r_1 + (√3/2) d
			}
			o, err := calc.Runaway(h)
			if err != nil {
				t.Fatalf("Runaway: %v", err)
			}
			if o.Verdict != calc.Info {
				t.Errorf("Verdict = %v, want Info", o.Verdict)
			}
			check := func(name string, want float64) {
				t.Helper()
				if got := o.Figure(name); !dynApproxEqual(got, want, 0, tt.relTol) {
					t.Errorf("%s = %.6g, want %.6g", name, got, want)
				}
			}
			check("acceleration_m_s2", tt.wantA)
			check("drum_angular_acceleration_rad_s2", tt.wantAlpha)
			if !math.IsNaN(tt.wantT) {
				check("rope_tension_n", tt.wantT)
			}
			// Equivalent mass of a drum and block: m + I/r² (textbook identity).
			r := tt.r1
			if tt.rL > 0 {
				r = tt.rL
			}
			check("equivalent_mass_kg", tt.blockKg+tt.inertia/(r*r))
		})
	}
}

func TestRunawayLimits(t *testing.T) {
	// Physical limiting cases (standards.md "Invariants worth testing").
	effs := []struct{ etaS, etaG, etaGB float64 }{{1, 1, 1}, {0.96, 0.94, 0.7}, {0.9, 0.5, 0.1}}
	for _, e := range effs {
		name := fmt.Sprintf("ηs=%g ηgb=%g", e.etaS, e.etaGB)
		h := hoistA()
		h.SheaveEff, h.GearEff, h.GearBackEff = e.etaS, e.etaG, e.etaGB
		// Zero inertia: free fall, a = g whatever the efficiencies (losses scale forces
		// passed through, and no force is passed when nothing is driven).
		h.DrumInertiaKgM2, h.MotorInertiaKgM2 = 0, 0
		o, err := calc.Runaway(h)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if got := o.Figure("acceleration_m_s2"); !dynApproxEqual(got, gSI, 0, 1e-12) {
			t.Errorf("%s zero inertia: a = %g, want g = %g", name, got, gSI)
		}
		// Free fall: rope slack, tension 0 (Newton's second law m a = m g − n T).
		if got := o.Figure("rope_tension_n"); !dynApproxEqual(got, 0, 1e-9, 0) {
			t.Errorf("%s zero inertia: tension = %g, want 0", name, got)
		}
		// Falling H from rest in free fall: v = √(2 g H) (kinematics).
		if got := o.Figure("fall_speed_m_s"); !dynApproxEqual(got, math.Sqrt(2*gSI*h.LiftHeightM), 0, 1e-12) {
			t.Errorf("%s zero inertia: fall speed = %g", name, got)
		}
		// Huge inertia: a → 0, and a falls monotonically as the inertia grows.
		prev := math.Inf(1)
		for _, id := range []float64{1, 100, 1e4, 1e6, 1e12} {
			h.DrumInertiaKgM2 = id
			o, err := calc.Runaway(h)
			if err != nil {
				t.Fatalf("%s: %v", name, err)
			}
			a := o.Figure("acceleration_m_s2")
			if !(a < prev) {
				t.Errorf("%s: a = %g at I_d = %g is not below %g", name, a, id, prev)
			}
			prev = a
		}
		if prev > 1e-6 {
			t.Errorf("%s: a = %g at I_d = 1e12 kg m², want → 0", name, prev)
		}
	}

	// Self-locking gear train (η_gb ≤ 0): no runaway (design.md).
	for _, gb := range []float64{0, -0.4} {
		h := hoistA()
		h.GearBackEff = gb
		o, err := calc.Runaway(h)
		if err != nil {
			t.Fatalf("η_gb=%g: %v", gb, err)
		}
		m := h.MassKg()
		if a := o.Figure("acceleration_m_s2"); a != 0 {
			t.Errorf("η_gb=%g: a = %g, want 0", gb, a)
		}
		// At rest the parts share the weight: T = m g / n (statics).
		if got := o.Figure("rope_tension_n"); !dynApproxEqual(got, m*gSI/4, 0, 1e-12) {
			t.Errorf("η_gb=%g: tension = %g, want m g/n = %g", gb, got, m*gSI/4)
		}
		if got := o.Figure("time_to_rated_speed_s"); !math.IsInf(got, 1) {
			t.Errorf("η_gb=%g: time to rated speed = %g, want +Inf", gb, got)
		}
		if got := o.Figure("fall_energy_j"); got != 0 {
			t.Errorf("η_gb=%g: fall energy = %g, want 0", gb, got)
		}
	}
}

// TestRunawayEnergyBalance checks the runaway against the work-energy theorem: after
// falling a height s from rest, work of gravity m g s = kinetic energy of load, drum
// and rotor + work lost in the reeving and the gearbox. The losses come from design.md's
// loss model (each efficiency scales the power passing through it in the direction of
// flow): the reeving passes η_RD of the load's net power m (g − a) v, losing
// (1 − η_RD) m (g − a) s; the gearbox passes η_gb of its input to the rotor, losing
// (1/η_gb − 1) × the rotor's kinetic energy. With unit efficiencies the balance is exact
// mechanics (Halliday ch. 10, rolling and unwinding energy).
func TestRunawayEnergyBalance(t *testing.T) {
	tests := []struct {
		name string
		h    calc.Hoist
	}{
		{"hoist A, one layer", func() calc.Hoist { h := hoistA(); h.Layers = 1; return h }()},
		{"hoist A lossless", func() calc.Hoist {
			h := hoistA()
			h.Layers, h.SheaveEff, h.GearEff, h.GearBackEff = 1, 1, 1, 1
			return h
		}()},
		{"hoist B, one layer", func() calc.Hoist { h := hoistBUS().si(); h.Layers = 1; return h }()},
		{"heavy losses", func() calc.Hoist {
			h := hoistA()
			h.Layers, h.Parts, h.RopeEnds, h.SheaveEff, h.DeflectionSheaves, h.GearBackEff = 1, 6, 1, 0.9, 2, 0.35
			return h
		}()},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			h := tt.h
			o, err := calc.Runaway(h)
			if err != nil {
				t.Fatal(err)
			}
			s := h.LiftHeightM
			v := o.Figure("fall_speed_m_s")
			a := o.Figure("acceleration_m_s2")
			m := h.MassKg()
			ne := float64(h.Parts / h.RopeEnds)
			r := h.DrumDiameterM / 2
			wd := ne * v / r       // drum angular speed: kinematic constraint
			wm := h.GearRatio * wd // motor speed
			etaR := (1 - math.Pow(h.SheaveEff, ne)) / (ne * (1 - h.SheaveEff))
			if h.SheaveEff == 1 || ne == 1 {
				etaR = 1
			}
			etaRD := etaR * math.Pow(h.SheaveEff, float64(h.DeflectionSheaves))
			keLoad := 0.5 * m * v * v
			keDrum := 0.5 * h.DrumInertiaKgM2 * wd * wd
			keRotor := 0.5 * h.MotorInertiaKgM2 * wm * wm
			lossRope := (1 - etaRD) * m * (gSI - a) * s
			lossGear := (1/h.GearBackEff - 1) * keRotor
			work := m * gSI * s
			if got := keLoad + keDrum + keRotor + lossRope + lossGear; !dynApproxEqual(got, work, 0, 1e-10) {
				t.Errorf("KE + losses = %.10g J, work of gravity = %.10g J", got, work)
			}
			// The load's kinetic energy is the fall_energy_j figure.
			if got := o.Figure("fall_energy_j"); !dynApproxEqual(got, keLoad, 0, 1e-12) {
				t.Errorf("fall_energy_j = %g, want ½ m v² = %g", got, keLoad)
			}
			// Newton's second law for the load: m a = m g − n T.
			if got := m*gSI - float64(h.Parts)*o.Figure("rope_tension_n"); !dynApproxEqual(got, m*a, 0, 1e-10) {
				t.Errorf("m g − n T = %g, want m a = %g", got, m*a)
			}
			// Time to the rated lowering speed at constant acceleration: t = v/a (one layer).
			if got := o.Figure("time_to_rated_speed_s"); !dynApproxEqual(got*a, h.LoweringSpeed(), 0, 1e-12) {
				t.Errorf("time to rated speed %g × a %g ≠ v %g", got, a, h.LoweringSpeed())
			}
		})
	}
}

func TestRunawayWorkedHoists(t *testing.T) {
	// Hoist A by hand (computed: python3, body equations; r_L = 0.2 + (√3/2)(0.016)
	// = 0.2138564 m governs, η_R = (1 − 0.98²)/(2 × 0.02) = 0.99):
	// m_eq = 5150 + (2/0.2138564)² (12/0.99 + 112² × 0.08/(0.99 × 0.9)) = 104 716.4 kg,
	// a_ff = 5150 × 9.80665 / m_eq = 0.4822956 m/s².
	o, err := calc.Runaway(hoistA())
	if err != nil {
		t.Fatal(err)
	}
	r := 0.2 + math.Sqrt(3)/2*0.016
	want := 0.4822955520977962 // hand calculation above (computed)
	if got := o.Figure("acceleration_m_s2"); !dynApproxEqual(got, want, 0, 1e-9) {
		t.Errorf("hoist A a_ff = %.10g, want %.10g", got, want)
	}
	if got := o.Figure("drum_angular_acceleration_rad_s2"); !dynApproxEqual(got, want*2/r, 0, 1e-9) {
		t.Errorf("hoist A α_d = %g, want %g", got, want*2/r)
	}
	if got := o.Figure("rope_tension_n"); !dynApproxEqual(got, 5150*(gSI-want)/4, 0, 1e-9) {
		t.Errorf("hoist A rope tension = %g, want %g", got, 5150*(gSI-want)/4)
	}
	// The rotor after the load has fallen the lift height (by hand, python3): v_H =
	// √(2 × 0.4822956 × 12) = 3.402219 m/s; drum ω = n_e v_H / r_L = 2 × 3.402219 /
	// 0.2138564 = 31.818 rad/s; rotor = 112 × 31.818 = 3563.59 rad/s = 34 029.8 rev/min,
	// 23.47 × the rated 1450 rev/min. Time to the rated lowering speed on the outer layer:
	// v_L / a_ff = (8/60 × 0.2138564/0.2) / 0.4822956 = 0.2956091 s.
	for name, w := range map[string]float64{
		"rotor_speed_after_fall_rpm": 34029.79906241023, // hand calculation above (computed)
		"rotor_overspeed_ratio":      23.468826939593264,
		"time_to_rated_speed_s":      0.29560906589380676,
	} {
		if got := o.Figure(name); !dynApproxEqual(got, w, 0, 1e-9) {
			t.Errorf("hoist A %s = %.10g, want %.10g", name, got, w)
		}
	}
	// Self-locking (no runaway) or no lift height: no rotor figures (design.md: null).
	lock := hoistA()
	lock.GearBackEff = -0.1
	noH := hoistA()
	noH.LiftHeightM = 0
	for name, h := range map[string]calc.Hoist{"self-locking": lock, "no lift height": noH} {
		o, err := calc.Runaway(h)
		if err != nil {
			t.Fatal(err)
		}
		for _, f := range []string{"rotor_speed_after_fall_rpm", "rotor_overspeed_ratio"} {
			if got := o.Figure(f); !math.IsNaN(got) {
				t.Errorf("%s: %s = %g, want NaN (null)", name, f, got)
			}
		}
	}

	// Hoist B in US customary units (ft, slug, lbf), converted with NIST SP 811.
	u := hoistBUS()
	ut := u.train()
	best := 0.0
	for _, r := range ut.radii {
		k := ut.ne / r
		meq := ut.mass + k*k*(ut.id/ut.etaRD+ut.i*ut.i*ut.jm/ut.etaL) // slug
		best = math.Max(best, ut.w/meq)                               // lbf / slug = ft/s²
	}
	o, err = calc.Runaway(u.si())
	if err != nil {
		t.Fatal(err)
	}
	if got, want := o.Figure("acceleration_m_s2"), best*usFt; !dynApproxEqual(got, want, 0, usTolUS) {
		t.Errorf("hoist B a_ff = %.10g m/s², US hand calc %.10g", got, want)
	}
	fallFtS := math.Sqrt(2 * best * u.liftFt)
	if got, want := o.Figure("fall_speed_m_s"), fallFtS*usFt; !dynApproxEqual(got, want, 0, usTolUS) {
		t.Errorf("hoist B fall speed = %g m/s, US %g", got, want)
	}
	// Energy in ft·lbf: ½ (W/g) v²; 1 ft·lbf = usFt × usLbf J.
	if got, want := o.Figure("fall_energy_j"), 0.5*ut.mass*fallFtS*fallFtS*usFt*usLbf; !dynApproxEqual(got, want, 0, usTolUS) {
		t.Errorf("hoist B fall energy = %g J, US %g", got, want)
	}
}

// ---------------------------------------------------------------------------------
// Emergency stop

// simulateStop integrates the load + drum + rotor equations of motion with explicit
// small time steps, independently of BrakeStop's closed form. Each body obeys Newton's
// second law; the rope passes η_RD of the load's power to the drum; the gearbox passes
// η_gb of the drum's power to the rotor when the drum drives it, and η_g of the rotor's
// power to the drum when the rotor drives (design.md loss model). The brake torque
// N_b M_b switches on at t_s on the motor shaft or on the drum. Returns the stopping
// distance and time, or NaN when the load is not stopped within 60 s.
func simulateStop(h calc.Hoist, r float64, dt float64) (dist, tStop float64) {
	m, g := h.MassKg(), h.G
	ne := float64(h.Parts / h.RopeEnds)
	etaR := 1.0
	if ne > 1 && h.SheaveEff < 1 {
		etaR = (1 - math.Pow(h.SheaveEff, ne)) / (ne * (1 - h.SheaveEff))
	}
	etaRD := etaR * math.Pow(h.SheaveEff, float64(h.DeflectionSheaves))
	i, jm, id := h.GearRatio, h.MotorInertiaKgM2, h.DrumInertiaKgM2
	k := ne / r // drum angular acceleration per unit load acceleration
	mbTotal := float64(h.Brakes) * h.BrakeTorqueNm
	// accel returns the load's acceleration (downwards positive) with brake torques
	// mm on the rotor and md on the drum.
	//   load:  rope force on the drum (all ends) η_RD m (g − a) / n_e
	//   drum:  I_d k a = η_RD m (g − a) r / n_e − T_g − md
	//   rotor: J_m i k a = T_r − mm
	//   gear:  T_g = i T_r / η_gb when the drum drives (T_r ≥ 0), T_g = η_g i T_r otherwise.
	accel := func(mm, md float64) float64 {
		lhs := etaRD * m * r / ne
		a := (lhs*g - i*mm/h.GearBackEff - md) / (lhs + id*k + i*i*jm*k/h.GearBackEff)
		if jm*i*k*a+mm >= 0 {
			return a
		}
		return (lhs*g - h.GearEff*i*mm - md) / (lhs + id*k + h.GearEff*i*i*jm*k)
	}
	// The motor turns at the same speed on every layer: the drum's angular speed is the
	// same, so the rope (and hook) speed scales with the layer radius (kinematics).
	v := h.LoweringSpeed() * r / (h.DrumDiameterM / 2)
	var x, tm float64
	for tm < 60 {
		var mm, md float64
		if tm >= h.BrakeDelayS {
			if h.BrakeOnDrum {
				md = mbTotal
			} else {
				mm = mbTotal
			}
		}
		a := accel(mm, md)
		if v+a*dt <= 0 {
			// last partial step to rest
			f := -v / a
			return x + v*f + 0.5*a*f*f, tm + f
		}
		x += v * dt
		v += a * dt
		tm += dt
	}
	return math.NaN(), math.NaN()
}

func TestBrakeStopAgainstIntegration(t *testing.T) {
	drum := func(h calc.Hoist, mb float64) calc.Hoist {
		h.BrakeOnDrum, h.BrakeTorqueNm = true, mb
		return h
	}
	tests := []struct {
		name string
		h    calc.Hoist
	}{
		{"hoist A, motor brake", hoistA()},
		{"hoist A, drum brake", drum(hoistA(), 8000)},
		{"hoist A, heavy rotor, motor brake", func() calc.Hoist { h := hoistA(); h.MotorInertiaKgM2 = 0.5; h.BrakeTorqueNm = 150; return h }()},
		{"hoist A, heavy rotor, drum brake", func() calc.Hoist { h := drum(hoistA(), 9000); h.MotorInertiaKgM2 = 0.5; return h }()},
		{"hoist B, motor brakes", hoistBUS().si()},
		{"hoist B, drum brakes", drum(hoistBUS().si(), 2*3500*usLbfFt/2)},
		{"no delay, lossless", func() calc.Hoist {
			h := hoistA()
			h.BrakeDelayS, h.SheaveEff, h.GearEff, h.GearBackEff = 0, 1, 1, 1
			return h
		}()},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			o, err := calc.BrakeStop(tt.h, 0)
			if err != nil {
				t.Fatal(err)
			}
			if o.Verdict != calc.Info {
				t.Errorf("no distance limit: Verdict = %v, want Info", o.Verdict)
			}
			// The longer stop over the layer radii (design.md "Radius"), each layer started
			// from its own lowering speed v_j = v r_j / r_1 (Revision 2).
			wantS, wantT, wantV, wantLayer := math.Inf(-1), 0.0, 0.0, 0
			radii := tt.h.Radii()
			for k, r := range radii {
				s, ts := simulateStop(tt.h, r, 1e-5)
				if math.IsNaN(s) {
					t.Fatalf("integration at r = %g did not stop", r)
				}
				if s > wantS {
					wantS, wantT, wantV, wantLayer = s, ts, tt.h.LoweringSpeed()*r/radii[0], 1
					if k > 0 {
						wantLayer = tt.h.Layers
					}
				}
			}
			if got := o.Figure("stop_layer"); got != float64(wantLayer) {
				t.Errorf("stop_layer = %g, integration's longer stop is on layer %d", got, wantLayer)
			}
			if got := o.Figure("initial_speed_m_s"); !dynApproxEqual(got, wantV, 0, 1e-12) {
				t.Errorf("initial_speed_m_s = %g, want v r_j / r_1 = %g", got, wantV)
			}
			// Tolerance 0.5 %: explicit Euler with dt = 1e-5 s (the brief's agreement).
			if got := o.Figure("distance_m"); !dynApproxEqual(got, wantS, 0, 0.005) {
				t.Errorf("distance = %.6g m, integration %.6g m", got, wantS)
			}
			if got := o.Figure("time_s"); !dynApproxEqual(got, wantT, 0, 0.005) {
				t.Errorf("time = %.6g s, integration %.6g s", got, wantT)
			}
			if got := o.Demand; !dynApproxEqual(got, o.Figure("distance_m"), 0, 1e-15) {
				t.Errorf("Demand %g ≠ distance_m", got)
			}
		})
	}
}

func TestBrakeStopWorkedHoists(t *testing.T) {
	// Hoist A by hand (computed: python3, body equations; r_L = 0.2138564 m gives the
	// longer stop). The motor turns at the same speed on every layer, so the load lowers
	// at v_L = v r_L / r_1 = 0.1333333 × 0.2138564 / 0.2 = 0.1425709 m/s there (design.md
	// Revision 2): a_ff = 0.4822956, F_b = 100 × 112 × 2 / r_L = 104 743.2 N,
	// a_b = (F_b/(0.99 × 0.9) − 5150 × 9.80665) / 104 716.4 = 0.6403261 m/s²,
	// v_1 = 0.1425709 + 0.4822956 × 0.3 = 0.2872596 m/s, s_1 = 0.0644746 m,
	// s = s_1 + v_1²/(2 a_b) = 0.1289090 m, t = 0.3 + v_1/a_b = 0.7486146 s. On the first
	// layer (v = 0.1333333, a_ff = 0.4244389, a_b = 0.6319591) the stop is 0.1128582 m.
	// T_peak = max over layers of 5150 (9.80665 + a_b,j)/(4 × 0.99) = 13 586.35 N (r_L),
	// Z = 180 000 / T_peak = 13.2486.
	o, err := calc.BrakeStop(hoistA(), 0.5)
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]float64{
		"distance_m":             0.12890900283637227, // hand calculation above (computed)
		"time_s":                 0.7486145700017841,
		"deceleration_m_s2":      0.64032606713724,
		"peak_rope_tension_n":    13586.34513781737,
		"peak_design_factor":     13.248596158430638,
		"speed_at_brake_set_m_s": 0.28725960326970634,
		"runaway_distance_m":     0.06447458113651106,
		"stop_layer":             2, // L = 2
		"initial_speed_m_s":      0.14257093764036735,
	}
	for name, w := range want {
		if got := o.Figure(name); !dynApproxEqual(got, w, 0, 1e-9) {
			t.Errorf("hoist A %s = %.10g, want %.10g", name, got, w)
		}
	}
	if o.Verdict != calc.ByUtilisation || !dynApproxEqual(o.Capacity, 0.5, 0, 0) ||
		!dynApproxEqual(o.Utilisation, 0.12890900283637227/0.5, 0, 1e-9) {
		t.Errorf("limit 0.5 m: Verdict %v, capacity %g, utilisation %g", o.Verdict, o.Capacity, o.Utilisation)
	}

	// Hoist B in US customary units (ft, slug, lbf), motor-shaft brakes.
	u := hoistBUS()
	ut := u.train()
	var sFt, abFt, peakFt float64
	for _, r := range ut.radii {
		v := u.lowerFtMin / 60 * r / ut.radii[0] // same motor speed on every layer
		k := ut.ne / r
		meq := ut.mass + k*k*(ut.id/ut.etaRD+ut.i*ut.i*ut.jm/ut.etaL)
		aff := ut.w / meq
		fb := float64(u.brakes) * u.brakeLbfFt * ut.i * k // lbf
		ab := (fb/ut.etaL - ut.w) / meq
		v1 := v + aff*u.delayS
		s := v*u.delayS + 0.5*aff*u.delayS*u.delayS + v1*v1/(2*ab)
		if s > sFt {
			sFt, abFt = s, ab
		}
		peakFt = math.Max(peakFt, ut.w*(1+ab/usGft)/(ut.n*ut.etaR)) // lbf, the largest over the layers
	}
	o, err = calc.BrakeStop(u.si(), math.NaN())
	if err != nil {
		t.Fatal(err)
	}
	if got, want := o.Figure("distance_m"), sFt*usFt; !dynApproxEqual(got, want, 0, usTolUS) {
		t.Errorf("hoist B distance = %.10g m, US hand calc %.10g m", got, want)
	}
	if got, want := o.Figure("deceleration_m_s2"), abFt*usFt; !dynApproxEqual(got, want, 0, usTolUS) {
		t.Errorf("hoist B a_b = %.10g m/s², US %.10g", got, want)
	}
	// Peak tension in lbf: max over the layers of W (1 + a_b/g) / (n η_R).
	if got, want := o.Figure("peak_rope_tension_n"), peakFt*usLbf; !dynApproxEqual(got, want, 0, usTolUS) {
		t.Errorf("hoist B peak tension = %.10g N, US %.10g", got, want)
	}
	if !math.IsNaN(o.Capacity) || o.Verdict != calc.Info {
		t.Errorf("NaN limit: capacity %g, verdict %v; want NaN, Info", o.Capacity, o.Verdict)
	}
}

func TestBrakeStopCannotStop(t *testing.T) {
	// Brake torque below the load's: F_b/η < m g, the load keeps accelerating (Newton's
	// second law): Verdict Fail, distance null.
	motor := hoistA()
	motor.BrakeTorqueNm = 30 // 30 × 112 × 2/0.2 / 0.891 = 37 710 N < m g = 50 504 N
	drum := hoistA()
	drum.BrakeOnDrum, drum.BrakeTorqueNm = true, 4000 // 4000 × 2/0.2/0.99 = 40 404 N < m g
	outer := hoistA()
	// 41 N m: 41 × 112 × 2/r/0.891 = 51 530 N > m g at r_1 = 0.2 m, 48 190 N < m g at
	// r_L = 0.2139 m: only the outer layer cannot stop, and it must be the one reported.
	outer.BrakeTorqueNm = 41
	for name, h := range map[string]calc.Hoist{"motor": motor, "drum": drum, "outer layer only": outer} {
		o, err := calc.BrakeStop(h, 1)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if o.Verdict != calc.Fail {
			t.Errorf("%s: Verdict = %v, want Fail", name, o.Verdict)
		}
		for _, f := range []string{"distance_m", "time_s"} {
			if got := o.Figure(f); !math.IsNaN(got) {
				t.Errorf("%s: %s = %g, want NaN", name, f, got)
			}
		}
		if !math.IsNaN(o.Demand) {
			t.Errorf("%s: Demand = %g, want NaN", name, o.Demand)
		}
		if a := o.Figure("deceleration_m_s2"); !(a <= 0) {
			t.Errorf("%s: deceleration = %g, want ≤ 0", name, a)
		}
		// The independent integration agrees that the load is not stopped.
		r := h.Radii()[len(h.Radii())-1]
		if s, _ := simulateStop(h, r, 1e-3); !math.IsNaN(s) {
			t.Errorf("%s: integration stopped the load in %g m", name, s)
		}
	}
}

func TestBrakeStopSelfLocking(t *testing.T) {
	for _, onDrum := range []bool{false, true} {
		h := hoistA()
		h.GearBackEff = -0.2
		h.BrakeOnDrum = onDrum
		if onDrum {
			h.BrakeTorqueNm = 8000
		}
		o, err := calc.BrakeStop(h, 0.01)
		if err != nil {
			t.Fatal(err)
		}
		if o.Verdict != calc.Info {
			t.Errorf("drum=%v: Verdict = %v, want Info (self-locking)", onDrum, o.Verdict)
		}
		// The outer layer's lowering speed v_L = v r_L / r_1 (same motor speed on every layer).
		v := h.HoistSpeedMS * h.OuterLayerRadiusM() / h.FirstLayerRadiusM()
		// No runaway: the speed at brake set is the lowering speed, s_1 = v t_s.
		if got := o.Figure("speed_at_brake_set_m_s"); !dynApproxEqual(got, v, 0, 1e-15) {
			t.Errorf("drum=%v: speed at brake set %g, want %g", onDrum, got, v)
		}
		if got := o.Figure("runaway_distance_m"); !dynApproxEqual(got, v*h.BrakeDelayS, 0, 1e-15) {
			t.Errorf("drum=%v: runaway distance %g, want v t_s = %g", onDrum, got, v*h.BrakeDelayS)
		}
		// Upper bound is at least the distance at constant speed over the delay.
		if s := o.Figure("distance_m"); !(s > v*h.BrakeDelayS) {
			t.Errorf("drum=%v: distance %g not above v t_s", onDrum, s)
		}
	}
}

func TestBrakeStopLimitingCase(t *testing.T) {
	// No delay, no inertia, unit efficiencies, one part: a block braked by a constant
	// force F_b = M_b/r decelerates at (F_b − m g)/m and stops in v²/(2 a) (kinematics).
	h := calc.Hoist{
		G: gTextbk, RatedLoadKg: 100, Parts: 1, RopeEnds: 1, SheaveEff: 1, DrumDiameterM: 0.5, Layers: 1,
		GearRatio: 1, GearEff: 1, GearBackEff: 1, BrakeTorqueNm: 300, Brakes: 1, BrakeOnDrum: true,
		HoistSpeedMS: 2, RopeMBFN: 50e3,
	}
	o, err := calc.BrakeStop(h, 0)
	if err != nil {
		t.Fatal(err)
	}
	a := (300/0.25 - 100*9.8) / 100 // 2.2 m/s²
	if got := o.Figure("deceleration_m_s2"); !dynApproxEqual(got, a, 0, 1e-12) {
		t.Errorf("deceleration = %g, want %g", got, a)
	}
	if got := o.Figure("distance_m"); !dynApproxEqual(got, 4/(2*a), 0, 1e-12) {
		t.Errorf("distance = %g, want %g", got, 4/(2*a))
	}
	// The rope carries the braking force: T = F_b = 1200 N (Newton, block).
	if got := o.Figure("peak_rope_tension_n"); !dynApproxEqual(got, 1200, 0, 1e-12) {
		t.Errorf("peak tension = %g, want 1200 N", got)
	}
	if got := o.Figure("peak_design_factor"); !dynApproxEqual(got, 50e3/1200, 0, 1e-12) {
		t.Errorf("peak design factor = %g", got)
	}
	// Unknown MBF: no design factor.
	h.RopeMBFN = 0
	o, _ = calc.BrakeStop(h, 0)
	if got := o.Figure("peak_design_factor"); !math.IsNaN(got) {
		t.Errorf("MBF 0: peak design factor = %g, want NaN", got)
	}
}

// ---------------------------------------------------------------------------------
// Motor and gearbox torques, shaft load

func TestMotorAccelTorqueByHand(t *testing.T) {
	// Hoist A by hand (computed: python3 arithmetic of the body equations, r_L governs):
	// ω_m = 2π 1450/60 = 151.8436 rad/s, M_r = 11 000/ω_m = 72.44294 N m, p M_r = 115.9087;
	// r_L = 0.2138564 m, α_d = 0.3 × 2/r_L = 2.805621 rad/s²;
	// load: e m (g + a) r/(n η_RD)/(i η_g) = 2 × 5150 × 10.10665 × r_L/(4 × 0.99)/(112 × 0.94) = 53.39808;
	// drum: 12 α_d/(112 × 0.94) = 0.3197896; rotor: 0.08 × 112 × α_d = 25.13836; total 78.85623.
	// At r_1: 49.93826 + 0.3419453 + 26.88 = 77.16020 < 78.85623.
	o, err := calc.MotorAccelTorque(hoistA())
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]float64{
		"drum_angular_acceleration_rad_s2": 2.8056208833317267, // hand calculation (computed)
		"load_torque_nm":                   53.398081447673,
		"drum_inertia_torque_nm":           0.319789614361519,
		"rotor_inertia_torque_nm":          25.13836311465227,
		"peak_torque_nm":                   115.90870338278724,
	}
	for name, w := range want {
		if got := o.Figure(name); !dynApproxEqual(got, w, 0, 1e-9) {
			t.Errorf("%s = %.10g, want %.10g", name, got, w)
		}
	}
	if !dynApproxEqual(o.Demand, 78.8562341766868, 0, 1e-9) || !dynApproxEqual(o.Capacity, 115.90870338278724, 0, 1e-9) {
		t.Errorf("demand %g capacity %g, want 78.85623, 115.9087", o.Demand, o.Capacity)
	}
	if !dynApproxEqual(o.Utilisation, 78.8562341766868/115.90870338278724, 0, 1e-9) || o.Verdict != calc.ByUtilisation {
		t.Errorf("utilisation %g verdict %v", o.Utilisation, o.Verdict)
	}

	// a = 0: the steady hoisting torque of motor-torque, e F r/(i η_g), F = m g/(n η_RD)
	// (design.md motor-torque), at the outer layer where it is largest.
	h := hoistA()
	h.AccelMS2 = 0
	o, err = calc.MotorAccelTorque(h)
	if err != nil {
		t.Fatal(err)
	}
	r := 0.2 + math.Sqrt(3)/2*0.016
	f := 5150 * gSI / (4 * 0.99)
	if want := 2 * f * r / (112 * 0.94); !dynApproxEqual(o.Demand, want, 0, 1e-12) {
		t.Errorf("a = 0: demand %.10g, want e F r/(i η_g) = %.10g", o.Demand, want)
	}

	// Hoist B in US customary units: torques in lbf·ft, inertias in slug·ft².
	u := hoistBUS()
	ut := u.train()
	var tUS float64
	for _, r := range ut.radii {
		alpha := u.accelFtS2 * ut.ne / r
		load := ut.e * ut.w * (1 + u.accelFtS2/usGft) * r / (ut.n * ut.etaRD) / (ut.i * ut.etaG)
		tUS = math.Max(tUS, load+ut.id*alpha/(ut.i*ut.etaG)+ut.jm*ut.i*alpha)
	}
	mrUS := u.hp * 550 / (2 * math.Pi * u.rpm / 60) // 550 ft·lbf/s per hp
	o, err = calc.MotorAccelTorque(u.si())
	if err != nil {
		t.Fatal(err)
	}
	if want := tUS * usLbfFt; !dynApproxEqual(o.Demand, want, 0, usTolUS) {
		t.Errorf("hoist B demand %.10g N m, US hand calc %.10g", o.Demand, want)
	}
	if want := u.peak * mrUS * usLbfFt; !dynApproxEqual(o.Capacity, want, 0, usTolUS) {
		t.Errorf("hoist B capacity %.10g N m, US hand calc %.10g", o.Capacity, want)
	}
}

// TestGearboxPeakRating (design.md Revision 2, "Gearbox"): the emergency stop's torque
// is a momentary peak, judged against the gear unit's peak rating where the register
// gives one, else against the rated torque × gearbox.peak_factor; the accelerating
// torque always against the rated torque. Hoist A by hand (TestGearboxTorque): T_acc =
// 5655.417 N m, T_stop = 100 × 112 / 0.9 = 12 444.44 N m, rated 14 000 N m.
func TestGearboxPeakRating(t *testing.T) {
	for _, tc := range []struct {
		name           string
		rated, peak, f float64
		u              float64 // max(T_acc / rated, T_stop / peak rating), by hand
		stop           bool    // the stop term governs
	}{
		{"no peak rating, factor 1", 14000, 0, 1, 12444.444444444443 / 14000, true},
		{"no peak rating, factor 1.5", 14000, 0, 1.5, 12444.444444444443 / 21000, true},
		{"peak rating 20 000 N m", 14000, 20000, 1, 0.6222222222222221, true},
		{"peak rating 40 000 N m: acceleration governs", 14000, 40000, 1, 0.40395839038650005, false},
		{"rated 10 000 N m, no peak: the stop exceeds it", 10000, 0, 1, 1.2444444444444443, true},
	} {
		h := hoistA()
		h.GearboxRatedTorqueNm, h.GearboxPeakTorqueNm = tc.rated, tc.peak
		o, err := calc.GearboxTorque(h, tc.f)
		if err != nil {
			t.Fatal(err)
		}
		if !dynApproxEqual(o.Utilisation, tc.u, 0, 1e-9) {
			t.Errorf("%s: u = %.10g, want %.10g", tc.name, o.Utilisation, tc.u)
		}
		wantCap := tc.rated
		if tc.stop {
			wantCap = tc.peak
			if tc.peak == 0 {
				wantCap = tc.rated * tc.f
			}
		}
		if !dynApproxEqual(o.Capacity, wantCap, 0, 1e-12) {
			t.Errorf("%s: capacity %g, want %g", tc.name, o.Capacity, wantCap)
		}
		if from := "peak (momentary) rating from the register"; (tc.peak > 0) != strings.Contains(o.Note, from) {
			t.Errorf("%s: note %q does not say which peak rating was used", tc.name, o.Note)
		}
		// The stop torque alone above the peak rating: no load is within the gearbox.
		if lim := calc.GearboxTorqueLimitKg(h, tc.f); (tc.u > 1) != (lim == 0) {
			t.Errorf("%s: limit %g kg", tc.name, lim)
		}
	}
}

func TestGearboxTorque(t *testing.T) {
	// Hoist A by hand (computed): accelerating at r_L: e m (g + a) r/(n η_RD) + I_d a n_e/r
	// = 5655.417 N m; emergency stop with the motor brake N_b M_b i/η_gb = 100 × 112/0.9
	// = 12 444.44 N m governs.
	o, err := calc.GearboxTorque(hoistA(), 1)
	if err != nil {
		t.Fatal(err)
	}
	if got := o.Figure("accel_drum_torque_nm"); !dynApproxEqual(got, 5655.417465411001, 0, 1e-9) {
		t.Errorf("accel torque %g, want 5655.417", got)
	}
	if got := o.Figure("stop_drum_torque_nm"); !dynApproxEqual(got, 12444.444444444443, 0, 1e-12) {
		t.Errorf("stop torque %g, want 12444.44", got)
	}
	if !dynApproxEqual(o.Demand, 12444.444444444443, 0, 1e-12) || !dynApproxEqual(o.Utilisation, 12444.444444444443/14000, 0, 1e-12) {
		t.Errorf("demand %g utilisation %g", o.Demand, o.Utilisation)
	}

	// Drum brake 8000 N m: gearbox carries the rotor's deceleration torque
	// η_g i² J_m a_b n_e/r in a stop with the empty hook (m = m_H = 150 kg, the worst case:
	// the lighter the load, the harder the stop), larger at r_1.
	h := hoistA()
	h.BrakeOnDrum, h.BrakeTorqueNm = true, 8000
	o, err = calc.GearboxTorque(h, 1)
	if err != nil {
		t.Fatal(err)
	}
	var want float64
	for _, r := range []float64{0.2, 0.2 + math.Sqrt(3)/2*0.016} {
		k := 2 / r
		ab := (8000*k/0.99 - 150*gSI) / (150 + k*k*(12+0.94*112*112*0.08)/0.99)
		want = math.Max(want, 0.94*112*112*0.08*ab*k)
	}
	if got := o.Figure("stop_drum_torque_nm"); !dynApproxEqual(got, want, 0, 1e-12) {
		t.Errorf("drum brake stop torque %g, want %g", got, want)
	}
	if !dynApproxEqual(o.Demand, math.Max(want, 5655.417465411001), 0, 1e-9) {
		t.Errorf("drum brake: demand %g, want the larger of the stop torque %g and the accel torque 5655.417", o.Demand, want)
	}

	// Self-locking with a motor brake: no stop torque, demand is the accelerating torque.
	h = hoistA()
	h.GearBackEff = 0
	o, err = calc.GearboxTorque(h, 1)
	if err != nil {
		t.Fatal(err)
	}
	if got := o.Figure("stop_drum_torque_nm"); !math.IsNaN(got) || !dynApproxEqual(o.Demand, 5655.417465411001, 0, 1e-9) {
		t.Errorf("self-locking: stop torque %g demand %g", got, o.Demand)
	}

	// Hoist B in US customary units (lbf·ft).
	u := hoistBUS()
	ut := u.train()
	var acc float64
	for _, r := range ut.radii {
		acc = math.Max(acc, ut.e*ut.w*(1+u.accelFtS2/usGft)*r/(ut.n*ut.etaRD)+ut.id*u.accelFtS2*ut.ne/r)
	}
	stop := float64(u.brakes) * u.brakeLbfFt * ut.i / ut.etaGB
	o, err = calc.GearboxTorque(u.si(), 1)
	if err != nil {
		t.Fatal(err)
	}
	if got := o.Figure("accel_drum_torque_nm"); !dynApproxEqual(got, acc*usLbfFt, 0, usTolUS) {
		t.Errorf("hoist B accel torque %g, US %g", got, acc*usLbfFt)
	}
	if !dynApproxEqual(o.Demand, math.Max(acc, stop)*usLbfFt, 0, usTolUS) {
		t.Errorf("hoist B demand %g, US %g", o.Demand, math.Max(acc, stop)*usLbfFt)
	}
}

func TestShaftLoad(t *testing.T) {
	// Hoist A by hand: drum 400 kg × 9.80665 = 3922.66 N; rope pull e F = 2 × 5150 ×
	// 9.80665/(4 × 0.99) = 25 507.20 N; total 29 429.86 N (computed).
	o, err := calc.ShaftLoad(hoistA())
	if err != nil {
		t.Fatal(err)
	}
	for name, w := range map[string]float64{"drum_weight_n": 3922.66, "rope_pull_n": 25507.195707070707, "total_n": 29429.855707070707} {
		if got := o.Figure(name); !dynApproxEqual(got, w, 0, 1e-12) {
			t.Errorf("%s = %.10g, want %.10g", name, got, w)
		}
	}
	if o.Verdict != calc.Info || !math.IsNaN(o.Demand) {
		t.Errorf("verdict %v demand %g, want Info, NaN", o.Verdict, o.Demand)
	}
	// Hoist B in lbf: 600 lbf + e W/(n η_RD).
	u := hoistBUS()
	ut := u.train()
	o, err = calc.ShaftLoad(u.si())
	if err != nil {
		t.Fatal(err)
	}
	if got, want := o.Figure("total_n"), (u.drumLb+ut.e*ut.w/(ut.n*ut.etaRD))*usLbf; !dynApproxEqual(got, want, 0, usTolUS) {
		t.Errorf("hoist B shaft load %g N, US %g", got, want)
	}
}

// ---------------------------------------------------------------------------------
// Validation and records

func TestDynamicsRangeErrors(t *testing.T) {
	type fn func(calc.Hoist) (calc.Outcome, error)
	stop := func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeStop(h, 0) }
	tests := []struct {
		name  string
		f     fn
		edit  func(*calc.Hoist)
		field string
	}{
		{"parts 0", calc.Runaway, func(h *calc.Hoist) { h.Parts = 0 }, "parts_of_line"},
		{"3 parts on 2 ends", stop, func(h *calc.Hoist) { h.Parts = 3 }, "parts_of_line"},
		{"gear ratio 0", calc.MotorAccelTorque, func(h *calc.Hoist) { h.GearRatio = 0 }, "gear_ratio"},
		{"gear eff 1.2", gearbox1, func(h *calc.Hoist) { h.GearEff = 1.2 }, "gear_efficiency"},
		{"back-drive NaN", calc.Runaway, func(h *calc.Hoist) { h.GearBackEff = math.NaN() }, "gear_backdrive_efficiency"},
		{"drum inertia < 0", calc.Runaway, func(h *calc.Hoist) { h.DrumInertiaKgM2 = -1 }, "drum_inertia"},
		{"motor inertia NaN", stop, func(h *calc.Hoist) { h.MotorInertiaKgM2 = math.NaN() }, "motor_inertia"},
		{"drum diameter 0", calc.MotorAccelTorque, func(h *calc.Hoist) { h.DrumDiameterM = 0 }, "drum_diameter"},
		{"layers 0", calc.Runaway, func(h *calc.Hoist) { h.Layers = 0 }, "rope_layers"},
		{"no rope diameter, 2 layers", calc.Runaway, func(h *calc.Hoist) { h.RopeDiameterM = 0 }, "rope_diameter"},
		{"rated load < 0", gearbox1, func(h *calc.Hoist) { h.RatedLoadKg = -5 }, "rated_load"},
		{"brakes 0", stop, func(h *calc.Hoist) { h.Brakes = 0 }, "brakes"},
		{"brake torque < 0", gearbox1, func(h *calc.Hoist) { h.BrakeTorqueNm = -1 }, "brake_torque"},
		{"brake delay < 0", stop, func(h *calc.Hoist) { h.BrakeDelayS = -0.1 }, "brake_delay"},
		{"lowering speed < 0", stop, func(h *calc.Hoist) { h.LoweringSpeedMS = -1 }, "lowering_speed"},
		{"no speed", stop, func(h *calc.Hoist) { h.HoistSpeedMS = 0 }, "hoist_speed"},
		{"no hoist speed", calc.Runaway, func(h *calc.Hoist) { h.HoistSpeedMS = 0 }, "hoist_speed"},
		{"gearbox rating 0", gearbox1, func(h *calc.Hoist) { h.GearboxRatedTorqueNm = 0 }, "gearbox_rated_torque"},
		{"peak ratio 0", calc.MotorAccelTorque, func(h *calc.Hoist) { h.PeakTorqueRatio = 0 }, "motor_peak_torque"},
		{"motor power 0", calc.MotorAccelTorque, func(h *calc.Hoist) { h.MotorPowerW = 0 }, "motor_power"},
		{"accel < 0", calc.MotorAccelTorque, func(h *calc.Hoist) { h.AccelMS2 = -0.1 }, "acceleration"},
		{"drum mass < 0", calc.ShaftLoad, func(h *calc.Hoist) { h.DrumMassKg = -1 }, "drum_mass"},
		{"MBF < 0", stop, func(h *calc.Hoist) { h.RopeMBFN = -1 }, "rope_mbf"},
		{"nothing to move", calc.Runaway, func(h *calc.Hoist) {
			h.RatedLoadKg, h.HookBlockKg, h.DrumInertiaKgM2, h.MotorInertiaKgM2 = 0, 0, 0, 0
		}, "rated_load"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			h := hoistA()
			tt.edit(&h)
			_, err := tt.f(h)
			var re *calc.RangeError
			if !errors.As(err, &re) {
				t.Fatalf("error %v, want *calc.RangeError", err)
			}
			if re.Field != tt.field {
				t.Errorf("Field = %q, want %q (%v)", re.Field, tt.field, err)
			}
		})
	}
}

// TestDynamicsRecords checks that every outcome carries a calculation record whose
// steps are numbers (no silent NaN) with formula and substituted numbers, a note, and
// the contract figures.
func TestDynamicsRecords(t *testing.T) {
	type fn func(calc.Hoist) (calc.Outcome, error)
	stop := func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeStop(h, 1) }
	checks := []struct {
		name    string
		f       fn
		figures []string
	}{
		{"motor-accel-torque", calc.MotorAccelTorque, []string{"drum_angular_acceleration_rad_s2", "load_torque_nm", "drum_inertia_torque_nm", "rotor_inertia_torque_nm", "peak_torque_nm"}},
		{"gearbox-torque", gearbox1, []string{"accel_drum_torque_nm", "stop_drum_torque_nm", "rated_torque_nm", "peak_torque_nm"}},
		{"brake-stop", stop, []string{"distance_m", "time_s", "deceleration_m_s2", "peak_rope_tension_n", "peak_design_factor", "speed_at_brake_set_m_s", "runaway_distance_m", "stop_layer", "initial_speed_m_s"}},
		{"runaway", calc.Runaway, []string{"acceleration_m_s2", "drum_angular_acceleration_rad_s2", "rope_tension_n", "time_to_rated_speed_s", "fall_speed_m_s", "fall_energy_j", "equivalent_mass_kg", "rotor_speed_after_fall_rpm", "rotor_overspeed_ratio"}},
		{"shaft-load", calc.ShaftLoad, []string{"drum_weight_n", "rope_pull_n", "total_n"}},
	}
	for _, c := range checks {
		for hn, h := range map[string]calc.Hoist{"A": hoistA(), "B": hoistBUS().si()} {
			o, err := c.f(h)
			if err != nil {
				t.Fatalf("%s %s: %v", c.name, hn, err)
			}
			if o.Note == "" || len(o.Steps) == 0 {
				t.Errorf("%s %s: empty note or steps", c.name, hn)
			}
			for _, s := range o.Steps {
				if s.Symbol == "" || s.Formula == "" || s.Numbers == "" || math.IsNaN(s.Value) {
					t.Errorf("%s %s: incomplete step %+v", c.name, hn, s)
				}
			}
			if len(o.Figures) != len(c.figures) {
				t.Errorf("%s %s: %d figures, want %d", c.name, hn, len(o.Figures), len(c.figures))
			}
			for _, f := range c.figures {
				if v := o.Figure(f); math.IsNaN(v) || math.IsInf(v, 0) {
					t.Errorf("%s %s: figure %s = %g", c.name, hn, f, v)
				}
			}
		}
	}
}

// ExampleRunaway reproduces the drum-and-block sample problem of Halliday, Resnick &
// Walker, Fundamentals of Physics, ch. 10: a 1.2 kg block on a cord wound on a 2.5 kg
// uniform disk of radius 0.20 m (I = ½ M R²), g = 9.8 m/s².
func ExampleRunaway() {
	h := calc.Hoist{
		G: 9.8, RatedLoadKg: 1.2, Parts: 1, RopeEnds: 1, SheaveEff: 1,
		DrumDiameterM: 0.40, Layers: 1, DrumInertiaKgM2: 0.5 * 2.5 * 0.20 * 0.20,
		GearRatio: 1, GearEff: 1, GearBackEff: 1, HoistSpeedMS: 1,
	}
	o, err := calc.Runaway(h)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("a = %.1f m/s², α = %.0f rad/s², T = %.1f N\n",
		o.Figure("acceleration_m_s2"), o.Figure("drum_angular_acceleration_rad_s2"), o.Figure("rope_tension_n"))
	// Output:
	// a = 4.8 m/s², α = 24 rad/s², T = 6.0 N
}

// gearbox1 and gearboxLimit1 are GearboxTorque and GearboxTorqueLimitKg with the peak
// factor 1.0 (both profiles' gearbox.peak_factor: the stop torque against the rated
// torque where the register gives no peak rating).
func gearbox1(h calc.Hoist) (calc.Outcome, error) { return calc.GearboxTorque(h, 1) }

func gearboxLimit1(h calc.Hoist) float64 { return calc.GearboxTorqueLimitKg(h, 1) }
