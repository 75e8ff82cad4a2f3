package calc_test

import (
	"math"
	"strings"
	"testing"

	"hoistfleet/calc"
)

// brakeWorkByIntegration integrates the emergency stop on the drum radius r with small
// steps, body by body (Newton's second law for the load, the drum and the rotor; the
// rope passes η_RD of the load's power to the drum, the gearbox η_gb of the drum's power
// to the rotor when the drum drives it and η_g the other way: design.md's loss model),
// and returns the speed when the brakes set, the braking distance and the friction work
// the brakes take, W_b = ∫ M_b ω dt over the braking phase (ω the speed of the shaft the
// brakes act on). Trapezoidal sums with explicit Euler steps of dt.
func brakeWorkByIntegration(h calc.Hoist, r, dt float64) (v1, s2, wb float64) {
	m, g := h.MassKg(), h.G
	ne := float64(h.Parts) / float64(h.RopeEnds)
	etaR := 1.0
	if ne > 1 && h.SheaveEff < 1 {
		etaR = (1 - math.Pow(h.SheaveEff, ne)) / (ne * (1 - h.SheaveEff))
	}
	etaRD := etaR * math.Pow(h.SheaveEff, float64(h.DeflectionSheaves))
	i, jm, id := h.GearRatio, h.MotorInertiaKgM2, h.DrumInertiaKgM2
	k := ne / r // drum speed per unit hook speed [rad/m]
	mb := float64(h.Brakes) * h.BrakeTorqueNm
	// acc is the load's acceleration, downwards positive, with the brake torque on the
	// rotor (motor-shaft brake) or on the drum.
	acc := func(braking bool) float64 {
		mm, md := 0.0, 0.0
		if braking && h.BrakeOnDrum {
			md = mb
		} else if braking {
			mm = mb
		}
		// drum: I_d k a = η_RD m (g − a) r / n_e − T_g − md; rotor: J_m i k a = T_r − mm;
		// the drum drives the rotor (T_r ≥ 0): T_r = η_gb T_g / i; else T_g = η_g i T_r.
		lo := etaRD * m * r / ne
		a := (lo*g - i*mm/h.GearBackEff - md) / (lo + id*k + i*i*jm*k/h.GearBackEff)
		if jm*i*k*a+mm < 0 {
			a = (lo*g - h.GearEff*i*mm - md) / (lo + id*k + h.GearEff*i*i*jm*k)
		}
		return a
	}
	v := h.LoweringSpeed() * r / (h.DrumDiameterM / 2)
	for t := 0.0; t < h.BrakeDelayS; t += dt {
		step := math.Min(dt, h.BrakeDelayS-t)
		v += acc(false) * step
	}
	v1 = v
	shaft := k * i // brake shaft speed per unit hook speed
	if h.BrakeOnDrum {
		shaft = k
	}
	a := acc(true)
	for v > 0 {
		vn := v + a*dt
		if vn < 0 { // the last part step to rest
			f := -v / a
			s2 += 0.5 * v * f
			wb += mb * shaft * 0.5 * v * f
			break
		}
		s2 += 0.5 * (v + vn) * dt
		wb += mb * shaft * 0.5 * (v + vn) * dt
		v = vn
	}
	return v1, s2, wb
}

// TestBrakeEnergyBalance: the energy the brakes take in one emergency stop against a
// small-step integration of the stop (brakeWorkByIntegration, in this test), within
// 0.5 % (the agreement BrakeStop's distance keeps with its own integration at this
// step). Energy balance over the braking phase: with unit efficiencies the brakes' work
// equals the kinetic energy of load, drum and rotor at brake set plus the work of gravity
// while braking (exact: nothing else takes energy); with losses the brakes take η of E
// (η_l = η_RD η_gb for a motor-shaft brake, η_RD for a drum brake: design.md's loss model
// puts those losses between the load and the brake), so E is an upper bound of their work.
func TestBrakeEnergyBalance(t *testing.T) {
	lossless := func(h calc.Hoist) calc.Hoist {
		h.SheaveEff, h.GearEff, h.GearBackEff = 1, 1, 1
		return h
	}
	onDrum := func(h calc.Hoist, mb float64) calc.Hoist {
		h.BrakeOnDrum, h.BrakeTorqueNm = true, mb
		return h
	}
	tests := []struct {
		name string
		h    calc.Hoist
	}{
		{"hoist A, motor brake", hoistA()},
		{"hoist A, drum brake", onDrum(hoistA(), 8000)},
		{"hoist A lossless, motor brake", lossless(hoistA())},
		{"hoist A lossless, drum brake", lossless(onDrum(hoistA(), 8000))},
		{"hoist B, two motor brakes", hoistBUS().si()},
	}
	const dt = 1e-5
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			h := tt.h
			stop, err := calc.BrakeStop(h, 0)
			if err != nil {
				t.Fatal(err)
			}
			o, err := calc.BrakeEnergy(h, 0, 1)
			if err != nil {
				t.Fatal(err)
			}
			if o.Verdict != calc.Info {
				t.Errorf("no permitted work given: verdict %v, want Info", o.Verdict)
			}
			// The layer of the longer stop, as brake-stop reports it.
			r := h.Radii()[0]
			if stop.Figure("stop_layer") > 1 {
				r = h.Radii()[1]
			}
			if got := o.Figure("stop_layer"); got != stop.Figure("stop_layer") {
				t.Errorf("stop_layer %g, brake-stop's %g", got, stop.Figure("stop_layer"))
			}
			v1, s2, wb := brakeWorkByIntegration(h, r, dt)
			if !dynApproxEqual(v1, stop.Figure("speed_at_brake_set_m_s"), 0, 0.005) {
				t.Errorf("speed at brake set: integration %g, brake-stop %g", v1, stop.Figure("speed_at_brake_set_m_s"))
			}
			ne := float64(h.Parts) / float64(h.RopeEnds)
			etaR := calc.ReevingEfficiency(h.SheaveEff, int(ne))
			etaRD := etaR * math.Pow(h.SheaveEff, float64(h.DeflectionSheaves)) // η_D = η_s^k
			eta := etaRD * h.GearBackEff                                        // η_l
			if h.BrakeOnDrum {
				eta = etaRD
			}
			e := o.Demand
			if !dynApproxEqual(e*eta, wb, 0, 0.005) {
				t.Errorf("η E = %.6g J, brakes' work by integration %.6g J", e*eta, wb)
			}
			// F_b s_2, the brake force at the hook through the braking distance, is the
			// brakes' own work: the integration's ∫ M_b ω dt (kinematics, no loss model).
			if got := o.Figure("friction_work_j"); !dynApproxEqual(got, wb, 0, 0.005) || got > e*(1+1e-12) {
				t.Errorf("friction_work_j %.6g J, integrated brake work %.6g J (E %.6g J must bound it)", got, wb, e)
			}
			if e < wb*(1-0.005) {
				t.Errorf("E = %.6g J is below the integrated brake work %.6g J: not an upper bound", e, wb)
			}
			if eta == 1 {
				// Exact energy balance: kinetic energy of all bodies at brake set plus the
				// work of gravity while braking = the brakes' work.
				k := ne / r
				kin := 0.5 * (h.MassKg() + k*k*(h.DrumInertiaKgM2+h.GearRatio*h.GearRatio*h.MotorInertiaKgM2)) * v1 * v1
				if !dynApproxEqual(kin+h.MassKg()*h.G*s2, wb, 0, 0.005) {
					t.Errorf("energy balance: kinetic %.6g + gravity %.6g J ≠ brake work %.6g J", kin, h.MassKg()*h.G*s2, wb)
				}
			}
			if sum := o.Figure("kinetic_energy_j") + o.Figure("gravity_work_j"); !dynApproxEqual(sum, e, 0, 1e-12) {
				t.Errorf("E_k + W_g = %g, E = %g", sum, e)
			}
		})
	}
}

// TestBrakeEnergyLimit: the permitted friction work per stop at and beside the energy,
// shared by the brakes (hoist B has two: each takes E / 2).
func TestBrakeEnergyLimit(t *testing.T) {
	h := hoistBUS().si()
	o, err := calc.BrakeEnergy(h, 0, 1)
	if err != nil {
		t.Fatal(err)
	}
	e := o.Demand
	if got := o.Figure("energy_per_brake_j"); !dynApproxEqual(got, e/2, 0, 1e-15) {
		t.Errorf("energy per brake %g, want E/2 = %g", got, e/2)
	}
	for _, c := range []struct {
		perBrake float64
		fails    bool
	}{{e / 2, false}, {e / 2 * 1.001, false}, {e / 2 * 0.999, true}} {
		o, err := calc.BrakeEnergy(h, c.perBrake, 1)
		if err != nil {
			t.Fatal(err)
		}
		if o.Verdict != calc.ByUtilisation || (o.Utilisation > 1+1e-9) != c.fails {
			t.Errorf("W_perm %g J: verdict %v u %g, want fail %v", c.perBrake, o.Verdict, o.Utilisation, c.fails)
		}
	}
	// Brakes that cannot stop the load: no finite energy, a fail.
	weak := h
	weak.BrakeTorqueNm = 1
	if o, err := calc.BrakeEnergy(weak, 1e6, 1); err != nil || o.Verdict != calc.Fail || !math.IsNaN(o.Demand) {
		t.Errorf("brakes that cannot stop: %v %v demand %g", err, o.Verdict, o.Demand)
	}
	// The record cites the law's "ample thermal capacity".
	found := false
	for _, s := range o.Steps {
		if strings.Contains(s.Numbers, "29 CFR 1910.179(f)") && strings.Contains(s.Numbers, "§4898(d)") {
			found = true
		}
	}
	if !found {
		t.Error("the record does not cite 29 CFR 1910.179(f) and Cal. Code Regs. tit. 8 §4898(d)")
	}
}
