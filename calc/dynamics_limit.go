package calc

import "math"

// BrakeStopLimitKg is the largest rated load the holding brakes can still decelerate
// while lowering, the load at which brake-stop's braking deceleration a_b reaches zero
// [kg]. It is the root of brake-stop's fail condition in closed form (design.md
// "Exact definitions", emergency stop):
//
//	motor-shaft brake: a_b = 0 ⇔ F_b / η_l = m g, F_b = N_b M_b i n_e / r, η_l = η_RD η_gb
//	drum brake:        a_b = 0 ⇔ F_b / η_RD = m g, F_b = N_b M_b n_e / r
//	m_L = F_b / (η g) − m_H, at the largest radius (r_L), where F_b is smallest.
//
// Inertias do not enter: they set how fast the load stops, not whether it can. Special
// cases: NaN for a self-locking train with a motor-shaft brake (η_gb ≤ 0: the stop does
// not depend on the brake alone) and for inputs the dynamics checks refuse (the check
// itself reports those); a negative result means the brakes cannot stop even the hook
// block, and is returned as 0.
func BrakeStopLimitKg(h Hoist) float64 {
	t, err := dynTrainOf(h)
	if err != nil {
		return math.NaN()
	}
	r := t.radii[t.nr-1]
	var fb, eta float64
	if h.BrakeOnDrum {
		fb, eta = float64(h.Brakes)*h.BrakeTorqueNm*t.ne/r, t.etaRD
	} else {
		if t.selfLocking() {
			return math.NaN()
		}
		fb, eta = float64(h.Brakes)*h.BrakeTorqueNm*t.i*t.ne/r, t.etaL
	}
	m := fb/(eta*t.g) - h.HookBlockKg
	return math.Max(m, 0)
}
