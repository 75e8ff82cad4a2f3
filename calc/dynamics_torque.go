package calc

import (
	"fmt"
	"math"
)

// MotorAccelTorque computes the check `motor-accel-torque`: the torque at the motor shaft
// to accelerate the rated load upwards at the design acceleration a, against the torque
// the motor can give to accelerate, p M_r.
//
// Formula (design.md "Exact definitions"):
//
//	α_d = a n_e / r                                   drum angular acceleration [rad/s²]
//	T_L = e m (g + a) r / (n η_RD) / (i η_g)          load torque at the motor [N m]
//	T_D = I_d α_d / (i η_g)                           drum inertia torque at the motor [N m]
//	T_R = J_m i α_d                                   rotor inertia torque [N m]
//	Demand = T_L + T_D + T_R,   Capacity = p M_r,  M_r = P / ω_m,  ω_m = 2π N / 60
//
// Symbols: e rope ends on the drum; m = m_L + m_H [kg]; g gravity [m/s²]; a design
// acceleration [m/s²]; r drum pitch radius [m]; n parts of line, n_e = n/e; η_RD reeving
// × deflection-sheave efficiency; i gear ratio; η_g forward gear efficiency; I_d drum
// inertia, J_m motor-shaft inertia [kg m²]; p peak torque ratio; P rated power [W]; N
// rated speed [rev/min].
//
// Source: Newton's second law for the load (e F_dyn n_e = m (g + a)/η_RD at the drum),
// for the drum (I_d α_d) and the rotor (J_m α_m, α_m = i α_d), tied by the rope's
// kinematic constraint (rim acceleration = rope acceleration = n_e a); torques carried
// through the gearbox forward divide by η_g (design.md loss model). With a = 0 the demand
// is the steady hoisting torque e F r/(i η_g), F = m g/(n η_RD) (check motor-torque).
//
// Evaluated at r_1 and r_L; the larger demand is reported (the load torque grows with r,
// the inertia torques fall as 1/r). Valid ranges: a ≥ 0, P > 0, N > 0, p > 0, plus the
// train's (see Runaway). Figures (at the governing radius): drum_angular_acceleration_rad_s2,
// load_torque_nm, drum_inertia_torque_nm, rotor_inertia_torque_nm, peak_torque_nm.
func MotorAccelTorque(h Hoist) (Outcome, error) {
	t, err := dynTrainOf(h)
	if err != nil {
		return Outcome{}, fmt.Errorf("calc.MotorAccelTorque: %w", err)
	}
	if err := dynAccelInput(h); err != nil {
		return Outcome{}, fmt.Errorf("calc.MotorAccelTorque: %w", err)
	}
	switch {
	case !(h.MotorPowerW > 0) || !dynFinite(h.MotorPowerW):
		return Outcome{}, fmt.Errorf("calc.MotorAccelTorque: %w", &RangeError{Field: "motor_power", Msg: fmt.Sprintf("motor power must be > 0 (got %g W)", h.MotorPowerW)})
	case !(h.MotorSpeedRPM > 0) || !dynFinite(h.MotorSpeedRPM):
		return Outcome{}, fmt.Errorf("calc.MotorAccelTorque: %w", &RangeError{Field: "motor_speed", Msg: fmt.Sprintf("motor speed must be > 0 (got %g rpm)", h.MotorSpeedRPM)})
	case !(h.PeakTorqueRatio > 0) || !dynFinite(h.PeakTorqueRatio):
		return Outcome{}, fmt.Errorf("calc.MotorAccelTorque: %w", &RangeError{Field: "motor_peak_torque", Msg: fmt.Sprintf("peak torque ratio must be > 0 (got %g)", h.PeakTorqueRatio)})
	}
	a := h.AccelMS2
	wm := h.MotorAngularSpeed()
	mr := h.MotorRatedTorqueNm()
	peak := h.PeakTorqueRatio * mr

	rec := !h.SkipRecord && !h.SkipDetail
	out := Outcome{Unit: "N m", Verdict: ByUtilisation}
	if rec {
		out.Steps = append(out.Steps,
			Step{Symbol: "m", Formula: "m_L + m_H", Numbers: dynNum(h.RatedLoadKg) + " + " + dynNum(h.HookBlockKg), Value: t.m, Unit: "kg"},
			Step{Symbol: "η_RD", Formula: "η_R η_s^k", Numbers: dynNum(t.etaR) + " × " + dynNum(t.etaRD/t.etaR), Value: t.etaRD, Unit: "1"},
		)
	}
	type at struct{ alpha, tl, td, tr, total float64 }
	var res [2]at
	best := 0
	for k, r := range t.radii[:t.nr] {
		x := at{}
		x.alpha = a * t.ne / r
		x.tl = t.e * t.m * (t.g + a) * r / (t.n * t.etaRD) / (t.i * t.etaG)
		x.td = t.id * x.alpha / (t.i * t.etaG)
		x.tr = t.jm * t.i * x.alpha
		x.total = x.tl + x.td + x.tr
		res[k] = x
		if rec {
			tag := " (" + t.radiusName(k) + ")"
			out.Steps = append(out.Steps,
				Step{Symbol: "α_d" + tag, Formula: "a n_e / r", Numbers: fmt.Sprintf("%s × %s / %s", dynNum(a), dynNum(t.ne), dynNum(r)), Value: x.alpha, Unit: "rad/s2"},
				Step{Symbol: "T_L" + tag, Formula: "e m (g + a) r / (n η_RD) / (i η_g)",
					Numbers: fmt.Sprintf("%s × %s × (%s + %s) × %s / (%s × %s) / (%s × %s)", dynNum(t.e), dynNum(t.m), dynNum(t.g), dynNum(a), dynNum(r), dynNum(t.n), dynNum(t.etaRD), dynNum(t.i), dynNum(t.etaG)),
					Value:   x.tl, Unit: "N m"},
				Step{Symbol: "T_D" + tag, Formula: "I_d α_d / (i η_g)", Numbers: fmt.Sprintf("%s × %s / (%s × %s)", dynNum(t.id), dynNum(x.alpha), dynNum(t.i), dynNum(t.etaG)), Value: x.td, Unit: "N m"},
				Step{Symbol: "T_R" + tag, Formula: "J_m i α_d", Numbers: fmt.Sprintf("%s × %s × %s", dynNum(t.jm), dynNum(t.i), dynNum(x.alpha)), Value: x.tr, Unit: "N m"},
				Step{Symbol: "T" + tag, Formula: "T_L + T_D + T_R", Numbers: fmt.Sprintf("%s + %s + %s", dynNum(x.tl), dynNum(x.td), dynNum(x.tr)), Value: x.total, Unit: "N m"},
			)
		}
		if x.total > res[best].total {
			best = k
		}
	}
	if rec {
		out.Steps = append(out.Steps,
			Step{Symbol: "ω_m", Formula: "2π N / 60", Numbers: fmt.Sprintf("2π × %s / 60", dynNum(h.MotorSpeedRPM)), Value: wm, Unit: "rad/s"},
			Step{Symbol: "M_r", Formula: "P / ω_m", Numbers: dynNum(h.MotorPowerW) + " / " + dynNum(wm), Value: mr, Unit: "N m"},
			Step{Symbol: "M_peak", Formula: "p M_r", Numbers: dynNum(h.PeakTorqueRatio) + " × " + dynNum(mr), Value: peak, Unit: "N m"},
		)
	}
	g := res[best]
	out.Demand = g.total
	out.Capacity = peak
	out.Utilisation = g.total / peak
	if h.SkipDetail {
		return out, nil
	}
	out.Figures = h.Figs.take([]Figure{
		{Name: "drum_angular_acceleration_rad_s2", Value: g.alpha, Unit: "rad/s2"},
		{Name: "load_torque_nm", Value: g.tl, Unit: "N m"},
		{Name: "drum_inertia_torque_nm", Value: g.td, Unit: "N m"},
		{Name: "rotor_inertia_torque_nm", Value: g.tr, Unit: "N m"},
		{Name: "peak_torque_nm", Value: peak, Unit: "N m"},
	})
	out.Note = "accelerating at " + dynNum(a) + " m/s², evaluated at the " + t.radiusWords(best) + " (larger torque)"
	return out, nil
}

// dynAccelInput validates the design acceleration a ≥ 0.
func dynAccelInput(h Hoist) error {
	if !(h.AccelMS2 >= 0) || !dynFinite(h.AccelMS2) {
		return &RangeError{Field: "acceleration", Msg: fmt.Sprintf("design acceleration must be ≥ 0 (got %g m/s²)", h.AccelMS2)}
	}
	return nil
}

// GearboxTorque computes the check `gearbox-torque`: the torques on the gear unit's
// output (drum) shaft against its ratings (design.md Revision 2, "Gearbox"): the steady
// and accelerating torque against the rated output torque C = h.GearboxRatedTorqueNm,
// the emergency stop's momentary torque against the peak (momentary) rating C_p =
// h.GearboxPeakTorqueNm, or, where the register gives none, C × peakFactor (rule
// gearbox.peak_factor; 1.0 is the conservative reading, common practice). The Note says
// which peak rating was used.
//
// Formulas (design.md "Exact definitions"; drum-brake case our reading, below):
//
//	accelerating the load:  T_acc = e m (g + a) r / (n η_RD) + I_d a n_e / r
//	emergency stop, motor-shaft brake: T_stop = N_b M_b i / η_gb
//	emergency stop, drum brake:        T_stop = η_g i² J_m α_b,  α_b = a_b n_e / r,
//	                                   a_b = (F_b/η_RD − m_H g)/m_eq,d as in BrakeStop,
//	                                   with the empty hook (m = m_H)
//	u = max(T_acc / C, T_stop / C_p); Demand and Capacity those of the larger term
//
// Symbols as in MotorAccelTorque and BrakeStop. Sources: Newton's second law for the load
// and the drum (T_acc is the drum-shaft torque that accelerates both: the drum inertia
// I_d includes the gear wheel on the drum shaft); design.md loss model.
//
// Motor-shaft brake: the brake torque N_b M_b on the rotor reaches the drum shaft
// multiplied by i and, power flowing from the drum to the brake through the back-driven
// gearbox, divided by η_gb. The rotor's own deceleration torque relieves the gearbox, so
// this is an upper bound (design.md). Drum brake: the brake stops the drum directly and
// the gearbox output carries only the torque that decelerates the rotor, passed forward
// from the rotor to the drum: η_g i² J_m α_b, at the braking deceleration of BrakeStop
// (its larger value over the radii) with the empty hook: the brake acts whatever the hook
// carries, and the lighter the load the harder it stops and the more torque the rotor
// puts through the gearbox, so the empty hook is the worst case. A drum brake that cannot stop the load (a_b ≤ 0 at
// every radius: see brake-stop) gives no stop torque (NaN, said in the Note).
//
// Self-locking train (η_gb ≤ 0) with a motor-shaft brake: the gear locks on power loss
// and the torque it then takes depends on the train's elasticity, which this rigid-body
// model cannot give: the stop torque is NaN (said in the Note) and the demand is T_acc.
//
// Evaluated at r_1 and r_L, the larger torque is reported. Valid ranges: rated torque >
// 0, peak torque ≥ 0 (0: not given), peakFactor > 0, a ≥ 0, M_b ≥ 0, N_b ≥ 1, plus the
// train's. Figures: accel_drum_torque_nm, stop_drum_torque_nm, rated_torque_nm,
// peak_torque_nm (C_p).
func GearboxTorque(h Hoist, peakFactor float64) (Outcome, error) {
	t, err := dynTrainOf(h)
	if err != nil {
		return Outcome{}, fmt.Errorf("calc.GearboxTorque: %w", err)
	}
	if err := dynAccelInput(h); err != nil {
		return Outcome{}, fmt.Errorf("calc.GearboxTorque: %w", err)
	}
	if err := dynBrakeInputs(h); err != nil {
		return Outcome{}, fmt.Errorf("calc.GearboxTorque: %w", err)
	}
	if !(h.GearboxRatedTorqueNm > 0) || !dynFinite(h.GearboxRatedTorqueNm) {
		return Outcome{}, fmt.Errorf("calc.GearboxTorque: %w", &RangeError{Field: "gearbox_rated_torque", Msg: fmt.Sprintf("gearbox rated output torque must be > 0 (got %g N m)", h.GearboxRatedTorqueNm)})
	}
	if !(h.GearboxPeakTorqueNm >= 0) || !dynFinite(h.GearboxPeakTorqueNm) {
		return Outcome{}, fmt.Errorf("calc.GearboxTorque: %w", &RangeError{Field: "gearbox_peak_torque", Msg: fmt.Sprintf("gearbox peak output torque must be ≥ 0 (got %g N m)", h.GearboxPeakTorqueNm)})
	}
	if !(peakFactor > 0) || !dynFinite(peakFactor) {
		return Outcome{}, fmt.Errorf("calc.GearboxTorque: %w", &RangeError{Field: "", Msg: fmt.Sprintf("rule value gearbox.peak_factor must be > 0 (got %g): check the rule table", peakFactor)})
	}
	peakCap := h.GearboxRatedTorqueNm * peakFactor
	if h.GearboxPeakTorqueNm > 0 {
		peakCap = h.GearboxPeakTorqueNm
	}
	a := h.AccelMS2
	nb := float64(h.Brakes)
	mb := h.BrakeTorqueNm
	rec := !h.SkipRecord && !h.SkipDetail
	out := Outcome{Unit: "N m", Verdict: ByUtilisation, Capacity: h.GearboxRatedTorqueNm}
	if rec {
		out.Steps = append(out.Steps, Step{Symbol: "m", Formula: "m_L + m_H", Numbers: dynNum(h.RatedLoadKg) + " + " + dynNum(h.HookBlockKg), Value: t.m, Unit: "kg"})
	}

	acc, accK := math.Inf(-1), 0
	for k, r := range t.radii[:t.nr] {
		v := t.e*t.m*(t.g+a)*r/(t.n*t.etaRD) + t.id*a*t.ne/r
		if rec {
			out.Steps = append(out.Steps, Step{Symbol: "T_acc (" + t.radiusName(k) + ")", Formula: "e m (g + a) r / (n η_RD) + I_d a n_e / r",
				Numbers: fmt.Sprintf("%s × %s × (%s + %s) × %s / (%s × %s) + %s × %s × %s / %s", dynNum(t.e), dynNum(t.m), dynNum(t.g), dynNum(a), dynNum(r), dynNum(t.n), dynNum(t.etaRD), dynNum(t.id), dynNum(a), dynNum(t.ne), dynNum(r)),
				Value:   v, Unit: "N m"})
		}
		if v > acc {
			acc, accK = v, k
		}
	}

	stop, stopK := math.NaN(), -1
	stopWhy := ""
	switch {
	case !h.BrakeOnDrum && t.selfLocking():
		if h.SkipDetail {
			break
		}
		stopWhy = fmt.Sprintf("self-locking gear train (η_gb = %s): the stop torque depends on the train's elasticity and is not computed", dynNum(t.etaGB))
		if rec {
			out.Steps = append(out.Steps, Step{Symbol: "T_stop", Formula: "not computed: self-locking gear locks on power loss", Numbers: "η_gb = " + dynNum(t.etaGB) + " ≤ 0", Value: math.NaN(), Unit: "N m"})
		}
	case !h.BrakeOnDrum:
		stop = nb * mb * t.i / t.etaGB
		if rec {
			out.Steps = append(out.Steps, Step{Symbol: "T_stop", Formula: "N_b M_b i / η_gb (motor-shaft brake, upper bound)",
				Numbers: fmt.Sprintf("%s × %s × %s / %s", dynNum(nb), dynNum(mb), dynNum(t.i), dynNum(t.etaGB)), Value: stop, Unit: "N m"})
		}
	default:
		for k, r := range t.radii[:t.nr] {
			tag := ""
			if rec {
				tag = " (" + t.radiusName(k) + ")"
			}
			kk := t.ne / r
			fb := nb * mb * kk
			mStop := h.HookBlockKg // the empty hook: the worst case for the gearbox (doc above)
			meq := mStop + kk*kk*(t.id+t.etaG*t.i*t.i*t.jm)/t.etaRD
			ab := 0.0
			if meq > 0 {
				ab = (fb/t.etaRD - mStop*t.g) / meq
			}
			if rec {
				out.Steps = append(out.Steps, Step{Symbol: "a_b,0" + tag, Formula: "(N_b M_b n_e / r / η_RD − m_H g) / (m_H + (n_e/r)² (I_d + η_g i² J_m)/η_RD), empty hook",
					Numbers: fmt.Sprintf("(%s × %s × %s / %s / %s − %s × %s) / %s", dynNum(nb), dynNum(mb), dynNum(t.ne), dynNum(r), dynNum(t.etaRD), dynNum(mStop), dynNum(t.g), dynNum(meq)), Value: ab, Unit: "m/s2"})
			}
			if !(ab > 0) {
				continue
			}
			v := t.etaG * t.i * t.i * t.jm * ab * kk
			if rec {
				out.Steps = append(out.Steps, Step{Symbol: "T_stop" + tag, Formula: "η_g i² J_m a_b n_e / r (drum brake: rotor deceleration torque)",
					Numbers: fmt.Sprintf("%s × %s² × %s × %s × %s / %s", dynNum(t.etaG), dynNum(t.i), dynNum(t.jm), dynNum(ab), dynNum(t.ne), dynNum(r)), Value: v, Unit: "N m"})
			}
			if stopK < 0 || v > stop {
				stop, stopK = v, k
			}
		}
		if stopK < 0 {
			stopWhy = "the drum brake cannot stop the load (see brake-stop): no stop torque"
		}
	}

	out.Demand = acc
	uAcc, uStop := acc/out.Capacity, stop/peakCap // uStop NaN without a stop torque
	stopGoverns := uStop > uAcc
	if h.SkipDetail { // the demand below, without the notes
		if stopGoverns {
			out.Demand, out.Capacity = stop, peakCap
		}
		out.Utilisation = out.Demand / out.Capacity
		return out, nil
	}
	peakFrom := gearboxPeakFrom(h, peakFactor)
	if rec {
		out.Steps = append(out.Steps,
			Step{Symbol: "C_p", Formula: peakFrom, Numbers: dynNum(peakCap), Value: peakCap, Unit: "N m"},
			Step{Symbol: "u_acc", Formula: "T_acc / C (rated output torque)", Numbers: dynNum(acc) + " / " + dynNum(out.Capacity), Value: uAcc, Unit: "1"})
		if !math.IsNaN(uStop) {
			out.Steps = append(out.Steps, Step{Symbol: "u_stop", Formula: "T_stop / C_p (momentary peak)", Numbers: dynNum(stop) + " / " + dynNum(peakCap), Value: uStop, Unit: "1"})
		}
	}
	which := t.radiusPhrase(accK, accelGovernsAt, accelGovernsAtOf)
	if stopGoverns {
		out.Demand, out.Capacity = stop, peakCap
		switch {
		case !h.BrakeOnDrum: // stopK < 0: one stop torque, not by radius
			which = "the emergency stop governs (motor-shaft brake torque through the back-driven gearbox, an upper bound)"
		case stopK >= 0:
			which = t.radiusPhrase(stopK, stopGovernsAt, stopGovernsAtOf)
		default:
			which = "the emergency stop governs"
		}
	}
	out.Utilisation = out.Demand / out.Capacity
	out.Note = which + "; stop torque against the " + peakFrom // one concatenation
	if stopWhy != "" {
		out.Note += "; " + stopWhy
	}
	out.Figures = h.Figs.take([]Figure{
		{Name: "accel_drum_torque_nm", Value: acc, Unit: "N m"},
		{Name: "stop_drum_torque_nm", Value: stop, Unit: "N m"},
		{Name: "rated_torque_nm", Value: h.GearboxRatedTorqueNm, Unit: "N m"},
		{Name: "peak_torque_nm", Value: peakCap, Unit: "N m"},
	})
	return out, nil
}

// gearboxPeakFrom says in words where the gear unit's momentary (peak) output rating
// C_p comes from: the register's peak torque, or the rated torque × peakFactor.
func gearboxPeakFrom(h Hoist, peakFactor float64) string {
	switch {
	case h.GearboxPeakTorqueNm > 0:
		return "gear unit's peak (momentary) rating from the register"
	case peakFactor == 1:
		return "rated torque × gearbox.peak_factor 1 (no peak rating in the register)"
	}
	return "rated torque × gearbox.peak_factor " + dynNum(peakFactor) + " (no peak rating in the register)"
}

// ShaftLoad computes the check `shaft-load` (Verdict Info): the radial load on the drum
// shaft bearings, for their own check.
//
// Formula: F = m g / (n η_RD) hoisting tension per rope end at the drum (design.md
// "Exact definitions", rope-design-factor); rope pull e F; drum weight G_d = m_d g;
// total = G_d + e F [N].
//
// The two are added as if colinear (ropes leaving the drum vertically downwards), the
// largest their sum can be; the real resultant depends on the rope's direction, which
// the register does not give. F does not depend on the layer radius. Symbols: m = m_L +
// m_H [kg]; g gravity [m/s²]; n parts of line; e rope ends on the drum; η_RD reeving ×
// deflection-sheave efficiency; m_d drum mass [kg] (0 = not given: rope pull only, said in
// the Note). Demand, Capacity and Utilisation are NaN (no limit). Figures: drum_weight_n,
// rope_pull_n, total_n.
func ShaftLoad(h Hoist) (Outcome, error) {
	if !(h.G > 0) || !dynFinite(h.G) {
		return Outcome{}, fmt.Errorf("calc.ShaftLoad: %w", &RangeError{Field: "", Msg: fmt.Sprintf("acceleration of gravity must be > 0 (got %g)", h.G)})
	}
	if err := h.CheckReeving(); err != nil {
		return Outcome{}, fmt.Errorf("calc.ShaftLoad: %w", err)
	}
	switch {
	case !(h.RatedLoadKg >= 0) || !dynFinite(h.RatedLoadKg):
		return Outcome{}, fmt.Errorf("calc.ShaftLoad: %w", &RangeError{Field: "rated_load", Msg: fmt.Sprintf("rated load must be ≥ 0 (got %g kg)", h.RatedLoadKg)})
	case !(h.HookBlockKg >= 0) || !dynFinite(h.HookBlockKg):
		return Outcome{}, fmt.Errorf("calc.ShaftLoad: %w", &RangeError{Field: "hook_block_mass", Msg: fmt.Sprintf("hook block mass must be ≥ 0 (got %g kg)", h.HookBlockKg)})
	case !(h.DrumMassKg >= 0) || !dynFinite(h.DrumMassKg):
		return Outcome{}, fmt.Errorf("calc.ShaftLoad: %w", &RangeError{Field: "drum_mass", Msg: fmt.Sprintf("drum mass must be ≥ 0 (got %g kg)", h.DrumMassKg)})
	}
	m := h.MassKg()
	n := float64(h.Parts)
	e := float64(h.RopeEnds)
	etaRD := h.RopeSystemEff()
	f := m * h.G / (n * etaRD)
	pull := e * f
	gd := h.DrumMassKg * h.G
	out := Outcome{Demand: math.NaN(), Capacity: math.NaN(), Utilisation: math.NaN(), Unit: "N", Verdict: Info}
	if !h.SkipRecord {
		out.Steps = []Step{
			{Symbol: "m", Formula: "m_L + m_H", Numbers: dynNum(h.RatedLoadKg) + " + " + dynNum(h.HookBlockKg), Value: m, Unit: "kg"},
			{Symbol: "F", Formula: "m g / (n η_RD)", Numbers: fmt.Sprintf("%s × %s / (%s × %s)", dynNum(m), dynNum(h.G), dynNum(n), dynNum(etaRD)), Value: f, Unit: "N"},
			{Symbol: "F_rope", Formula: "e F", Numbers: dynNum(e) + " × " + dynNum(f), Value: pull, Unit: "N"},
			{Symbol: "G_d", Formula: "m_d g", Numbers: dynNum(h.DrumMassKg) + " × " + dynNum(h.G), Value: gd, Unit: "N"},
			{Symbol: "F_shaft", Formula: "G_d + e F (colinear: upper bound)", Numbers: dynNum(gd) + " + " + dynNum(pull), Value: gd + pull, Unit: "N"},
		}
	}
	out.Figures = h.Figs.take([]Figure{
		{Name: "drum_weight_n", Value: gd, Unit: "N"},
		{Name: "rope_pull_n", Value: pull, Unit: "N"},
		{Name: "total_n", Value: gd + pull, Unit: "N"},
	})
	out.Note = "drum weight and rope pull added as if colinear (largest resultant); independent of the layer"
	if h.DrumMassKg == 0 {
		out.Note += "; drum mass not given: rope pull only"
	}
	return out, nil
}
