package calc

import "math"

// BrakeStopLimitKg is the largest rated load the holding brakes can still decelerate
// while lowering, the load at which brake-stop's braking deceleration a_b reaches zero
// [kg]. It is the root of brake-stop's fail condition in closed form (design.md
// "Exact definitions", emergency stop):
//
//	motor-shaft brake: a_b = 0 ⇔ F_b / η_l = m g, F_b = N_b M_b i n_e / r, η_l = η_RD η_gb
//	drum brake:        a_b = 0 ⇔ F_b / η_RD = m g, F_b = N_b M_b n_e / r
//	m_L,j = F_b,j / (η g) − m_H on each layer j ∈ {1, L};  m_L = min_j m_L,j
//
// (the outer layer's in practice: F_b,j falls as 1/r_j). Neither the inertias nor the
// layer's lowering speed v_j = v r_j / r_1 enter: they set how far and how fast the load
// stops, not whether it can (design.md Revision 2, "Stop at every layer"). Special
// cases: NaN for a self-locking train (η_gb ≤ 0), whatever the brake's location: BrakeStop
// then reports information only (the gear holds the load), so the check sets no limit;
// NaN for inputs the dynamics checks refuse (the check itself reports those); a negative result means the brakes cannot stop even the hook
// block, and is returned as 0.
func BrakeStopLimitKg(h Hoist) float64 {
	t, err := dynTrainOf(h)
	if err != nil {
		return math.NaN()
	}
	if t.selfLocking() {
		return math.NaN() // BrakeStop: the gear holds the load, an information result
	}
	m := math.Inf(1)
	for _, r := range t.radii[:t.nr] {
		var fb, eta float64
		if h.BrakeOnDrum {
			fb, eta = float64(h.Brakes)*h.BrakeTorqueNm*t.ne/r, t.etaRD
		} else {
			fb, eta = float64(h.Brakes)*h.BrakeTorqueNm*t.i*t.ne/r, t.etaL
		}
		m = math.Min(m, fb/(eta*t.g)-h.HookBlockKg)
	}
	return math.Max(m, 0)
}

// MotorAccelTorqueLimitKg is the largest rated load the motor can still accelerate at the
// design acceleration within its peak torque: the root of motor-accel-torque's
// utilisation − 1 in closed form [kg]. At each evaluated radius r (r_1 and r_L) the
// torque is affine in the load (MotorAccelTorque):
//
//	T(m) = e m (g + a) r / (n η_RD) / (i η_g) + I_d α_d / (i η_g) + J_m i α_d,  α_d = a n_e / r
//
// so T(m) ≤ p M_r at every radius gives
//
//	m ≤ (p M_r − I_d α_d/(i η_g) − J_m i α_d) n η_RD i η_g / (e (g + a) r),  m_L = min over r − m_H.
//
// NaN for inputs the check refuses (it reports them); 0 when even the hook block cannot
// be accelerated within the peak torque.
func MotorAccelTorqueLimitKg(h Hoist) float64 {
	h.SkipRecord, h.SkipDetail = true, true
	if _, err := MotorAccelTorque(h); err != nil { // the check's own validation
		return math.NaN()
	}
	t, _ := dynTrainOf(h)
	a := h.AccelMS2
	peak := h.PeakTorqueRatio * h.MotorRatedTorqueNm()
	m := math.Inf(1)
	for _, r := range t.radii[:t.nr] {
		alpha := a * t.ne / r
		inertia := t.id*alpha/(t.i*t.etaG) + t.jm*t.i*alpha
		m = math.Min(m, (peak-inertia)*t.n*t.etaRD*t.i*t.etaG/(t.e*(t.g+a)*r))
	}
	return math.Max(m-h.HookBlockKg, 0)
}

// GearboxTorqueLimitKg is the largest rated load within the gearbox's ratings: the root
// of gearbox-torque's utilisation − 1 in closed form [kg]. The utilisation is
// max(T_acc(m)/C, T_stop/C_p) (GearboxTorque): T_stop does not depend on the rated load
// (a motor-shaft brake's torque, or a drum brake stopping the empty hook), and at each
// radius T_acc(m) = e m (g + a) r / (n η_RD) + I_d a n_e / r is affine in it, so
//
//	m ≤ (C − I_d a n_e / r) n η_RD / (e (g + a) r) at every radius,  m_L = min over r − m_H,
//
// with C the rated output torque and C_p the peak rating (or C × peakFactor); 0 when
// T_stop alone exceeds C_p or even the hook block cannot be accelerated within C. NaN for
// inputs the check refuses.
func GearboxTorqueLimitKg(h Hoist, peakFactor float64) float64 {
	// T_stop does not depend on the rated load: read it at the hoist's own load, where the
	// check runs (at no load a train with no hook block and no inertia has nothing to move
	// and the check refuses it).
	h.SkipRecord, h.SkipDetail = true, false
	o, err := GearboxTorque(h, peakFactor) // also the check's own validation
	if err != nil {
		return math.NaN()
	}
	c := h.GearboxRatedTorqueNm
	if stop := o.Figure("stop_drum_torque_nm"); stop > o.Figure("peak_torque_nm") {
		return 0
	}
	t, _ := dynTrainOf(h)
	a := h.AccelMS2
	m := math.Inf(1)
	for _, r := range t.radii[:t.nr] {
		m = math.Min(m, (c-t.id*a*t.ne/r)*t.n*t.etaRD/(t.e*(t.g+a)*r))
	}
	return math.Max(m-h.HookBlockKg, 0)
}
