package calc

import (
	"fmt"
	"math"
)

// BrakeEnergy computes the check `brake-energy`: the energy the holding brakes take in one
// emergency stop of the rated load lowering at the rated lowering speed (BrakeStop's stop,
// on the layer of the longer stop), against the brakes' permitted friction work per stop
// where the register gives it.
//
//	E = ½ m_eq,j v_1j² + m g s_2,j                                              [J]
//	utilisation = f · E / (N_b W_perm)
//
// with, on layer j (BrakeStop's quantities, not worked out again): m_eq,j the equivalent
// mass of the braking phase (motor-shaft brake: the runaway m_eq; drum brake: m_eq,d)
// [kg], v_1j the speed when the brakes have set [m/s], s_2,j the braking distance [m], m
// the rated load plus hook block [kg]; W_perm one brake's permitted friction work per stop
// [J] (its data sheet), N_b the number of brakes (each takes E / N_b: equal brakes set
// together), f the rule's factor. E is the kinetic energy at brake set plus the work of
// gravity while braking, the losses of reeving and gearbox ignored: it is an upper bound
// of the brakes' friction work (with the loss model of design.md the brake takes
// η_l E on the motor shaft, η_RD E on the drum), exact with unit efficiencies.
//
// The requirement: holding brakes on hoists "shall have ample thermal capacity for the
// frequency of operation required by the service" (29 CFR 1910.179(f)(2)(ii); Cal. Code
// Regs. tit. 8 §4898(d), law, read). The law gives no number: judging one stop against the
// brakes' rated friction work per stop is ours (rule brake_energy.factor, common practice). One stop's energy is the least of what that asks; the
// heat of repeated stops over an hour is not checked here.
//
// Verdict: Info without W_perm (E is still a figure); Fail when the brakes cannot stop
// the load (no finite energy; BrakeStop fails too); Info for a self-locking train (E then
// comes from BrakeStop's upper bound, or does not exist when the gear holds the load).
// Figures: energy_j, kinetic_energy_j, gravity_work_j, energy_per_brake_j,
// friction_work_j (W_b = F_b s_2: the brakes' own friction work through the angle they
// slip, with F_b the brake force at the hook; η E under design.md's loss model, E with
// unit efficiencies), permitted_work_j, stop_layer. Valid ranges: as BrakeStop, plus W_perm > 0 or not given
// (NaN or ≤ 0), f > 0.
func BrakeEnergy(h Hoist, permittedJ, factor float64) (Outcome, error) {
	if !(factor > 0) || math.IsInf(factor, 0) {
		return Outcome{}, fmt.Errorf("calc.BrakeEnergy: %w", &RangeError{Msg: fmt.Sprintf("brake energy factor must be > 0 (got %g)", factor)})
	}
	if math.IsInf(permittedJ, 0) {
		return Outcome{}, fmt.Errorf("calc.BrakeEnergy: %w", &RangeError{Field: "brake_friction_work", Msg: "permitted friction work must be finite"})
	}
	if !(permittedJ > 0) {
		permittedJ = math.NaN()
	}
	rec := !h.SkipRecord // SkipDetail returns before the record
	sr, err := brakeStopRun("calc.BrakeEnergy", h, false)
	if err != nil {
		return Outcome{}, err
	}
	x := sr.res[sr.best]
	nb := float64(h.Brakes)
	ek := 0.5 * x.meq * x.v1 * x.v1
	wg := sr.t.m * sr.t.g * x.s2
	e := ek + wg // NaN when the brakes cannot stop
	// The brakes' own friction work: their torque through the angle they slip, F_b s_2
	// at the hook (F_b = N_b M_b i n_e / r, or N_b M_b n_e / r on the drum: the brake
	// torque reflected by the kinematics alone). E bounds it from above by the losses.
	wb := x.fb * x.s2
	capacity := nb * permittedJ
	out := Outcome{Demand: e, Capacity: capacity, Unit: "J", Utilisation: factor * e / capacity, Verdict: ByUtilisation}
	switch {
	case sr.lock, x.canStop && math.IsNaN(permittedJ):
		out.Verdict = Info
	case !x.canStop:
		out.Verdict = Fail
	}
	if h.SkipDetail { // the rating search: the verdict and numbers only, no text
		return out, nil
	}
	where := sr.t.radiusWords(sr.best)
	switch {
	case sr.lock:
		if x.canStop {
			out.Note = "self-locking gear train: the energy is of BrakeStop's upper bound (" + sr.brakeWhere + " brake alone, lossless back-driving), at the " + where
		} else {
			out.Note = "self-locking gear train: the gear, not the brake, holds the load; no braking energy"
		}
	case !x.canStop:
		out.Note = "the brakes cannot stop the lowering load: its energy grows without bound (see brake-stop)"
	case math.IsNaN(permittedJ):
		out.Note = "one emergency stop puts up to " + dynNum(e/1000) + " kJ into the brakes (losses ignored: an upper bound; " + sr.brakeWhere + " brake, " + where + "); the register gives no permitted friction work to compare"
	default:
		out.Note = "one emergency stop puts up to " + dynNum(e/1000/nb) + " kJ into each brake (losses ignored: an upper bound) against the " + dynNum(permittedJ/1000) + " kJ it may take (" + sr.brakeWhere + " brake, " + where + ")"
	}
	out.Figures = h.Figs.take([]Figure{
		{Name: "energy_j", Value: e, Unit: "J"},
		{Name: "kinetic_energy_j", Value: ek, Unit: "J"},
		{Name: "gravity_work_j", Value: wg, Unit: "J"},
		{Name: "energy_per_brake_j", Value: e / nb, Unit: "J"},
		{Name: "friction_work_j", Value: wb, Unit: "J"},
		{Name: "permitted_work_j", Value: permittedJ, Unit: "J"},
		{Name: "stop_layer", Value: sr.t.layerNumber(sr.best), Unit: "1"},
	})
	if rec {
		tag := " (" + sr.t.radiusName(sr.best) + ")"
		out.Steps = []Step{
			{Symbol: "m_eq" + tag, Formula: "equivalent mass of the braking phase (brake-stop)", Numbers: "as in brake-stop", Value: x.meq, Unit: "kg"},
			{Symbol: "v_1" + tag, Formula: "speed when the brakes have set (brake-stop)", Numbers: "as in brake-stop", Value: x.v1, Unit: "m/s"},
			{Symbol: "s_2" + tag, Formula: "braking distance (brake-stop)", Numbers: "as in brake-stop", Value: x.s2, Unit: "m"},
			{Symbol: "E_k", Formula: "½ m_eq v_1²", Numbers: fmt.Sprintf("0.5 × %s × %s²", dynNum(x.meq), dynNum(x.v1)), Value: ek, Unit: "J"},
			{Symbol: "W_g", Formula: "m g s_2", Numbers: fmt.Sprintf("%s × %s × %s", dynNum(sr.t.m), dynNum(sr.t.g), dynNum(x.s2)), Value: wg, Unit: "J"},
			{Symbol: "E", Formula: "E_k + W_g (losses ignored: an upper bound)", Numbers: dynNum(ek) + " + " + dynNum(wg), Value: e, Unit: "J"},
			{Symbol: "W_b" + tag, Formula: "F_b s_2 (the brakes' own friction work, losses included; E ≥ W_b)", Numbers: dynNum(x.fb) + " × " + dynNum(x.s2), Value: wb, Unit: "J"},
		}
		if !math.IsNaN(permittedJ) {
			out.Steps = append(out.Steps, Step{Symbol: "u", Formula: "f E / (N_b W_perm)", Numbers: fmt.Sprintf("%s × %s / (%s × %s)", dynNum(factor), dynNum(e), dynNum(nb), dynNum(permittedJ)), Value: out.Utilisation, Unit: "1"})
		}
		out.Steps = append(out.Steps, Step{Symbol: "requirement", Formula: "holding brakes of ample thermal capacity for the frequency of operation required by the service",
			Numbers: "29 CFR 1910.179(f)(2)(ii); Cal. Code Regs. tit. 8 §4898(d) [law]; one stop against the rated friction work per stop is hoistfleet's reading [common practice]", Value: math.NaN(), Unit: ""})
	}
	return out, nil
}
