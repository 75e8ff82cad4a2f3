package calc

// Dynamics of the hoisting train: the load, the drum and the motor-shaft rotor tied
// together by the rope's kinematic constraint (rope speed at the drum rim = n_e × hook
// speed; drum angular speed = n_e v / r; motor speed = i × drum speed). Each body obeys
// Newton's second law (m a = ΣF for the load, I α = ΣM for the drum and the rotor), and
// the losses follow design.md's loss model: every efficiency scales the force or torque
// passed through it in the direction the power flows. When the load drives (lowering,
// runaway, braking a descending load) power flows load → reeving (η_RD) → drum → gearbox
// back-driving (η_gb) → rotor and a motor-shaft brake; the rotor's own stored energy
// reaches a drum-mounted brake through the gearbox forward (η_g).
//
// This file holds the validation shared by the dynamics checks, Runaway and BrakeStop;
// dynamics_torque.go holds MotorAccelTorque, GearboxTorque and ShaftLoad.

import (
	"fmt"
	"math"
	"strconv"
)

// dynTrain is the validated data of the hoisting train, shared by the dynamics checks.
type dynTrain struct {
	g      float64    // acceleration of gravity [m/s²]
	m      float64    // m = m_L + m_H [kg]
	n, e   float64    // parts of line, rope ends on the drum
	ne     float64    // n_e = n / e
	etaR   float64    // η_R reeving efficiency
	etaRD  float64    // η_RD = η_R η_D
	etaG   float64    // η_g, forward
	etaGB  float64    // η_gb, back-driving (≤ 0: self-locking)
	etaL   float64    // η_l = η_RD η_gb
	i      float64    // gear ratio
	id, jm float64    // I_d drum inertia, J_m motor-shaft inertia [kg m²]
	radii  [2]float64 // r_1 and, with L > 1, r_L [m]
	nr     int        // radii in use: 1, or 2 with L > 1
	layers int        // L
}

// selfLocking reports whether the gear train cannot be back-driven (η_gb ≤ 0).
func (t dynTrain) selfLocking() bool { return t.etaGB <= 0 }

// radiusName names radius index k of t.radii for steps and notes.
func (t dynTrain) radiusName(k int) string {
	if k == 0 {
		return "r_1"
	}
	return "r_L"
}

// layerNumber is the layer of radius index k: 1, or L for the outer layer.
func (t dynTrain) layerNumber(k int) float64 {
	if k == 0 {
		return 1
	}
	return float64(t.layers)
}

// radiusWords says in words which layer radius index k is.
func (t dynTrain) radiusWords(k int) string {
	return t.radiusPhrase(k, "", radiusWordsOf)
}

// radiusPhrase is prefix + t.radiusWords(k). The notes that every hoist gets are built
// from a few prefixes and layer counts: those come ready made from table (each hoist's
// note was otherwise assembled anew, about 3 % of a bulk run); others are assembled.
func (t dynTrain) radiusPhrase(k int, prefix string, table *[phraseLayers]string) string {
	i := t.layers
	switch {
	case t.nr == 1:
		i = 0
	case k == 0:
		i = 1
	}
	if i < len(table) {
		return table[i]
	}
	return prefix + "outer layer " + strconv.Itoa(t.layers) + ", r_L"
}

// phraseLayers bounds the layer counts of the ready-made phrases: index 0 is a single
// layer, 1 the first layer of several, n ≥ 2 the outer layer of n.
const phraseLayers = 12

// Ready-made notes (radiusPhrase), built once from their prefixes; read only.
var (
	radiusWordsOf    = radiusPhrases("")
	accelGovernsAtOf = radiusPhrases(accelGovernsAt)
	stopGovernsAtOf  = radiusPhrases(stopGovernsAt)
)

const (
	accelGovernsAt = "accelerating the load governs, at the "
	stopGovernsAt  = "the emergency stop governs, at the "
)

func radiusPhrases(prefix string) *[phraseLayers]string {
	var p [phraseLayers]string
	p[0], p[1] = prefix+"single layer, r_1", prefix+"first layer, r_1"
	for n := 2; n < phraseLayers; n++ {
		p[n] = prefix + "outer layer " + strconv.Itoa(n) + ", r_L"
	}
	return &p
}

// dynFinite reports whether x is a finite number (not NaN, not ±Inf).
func dynFinite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

// dynNum formats a number for a Step's Numbers text: 6 significant digits.
func dynNum(x float64) string { return strconv.FormatFloat(x, 'g', 6, 64) }

// dynTrainOf validates the inputs every dynamics check needs and returns them. Errors
// are *RangeError naming the schema key (templates/columns.csv).
func dynTrainOf(h Hoist) (dynTrain, error) {
	if !(h.G > 0) || !dynFinite(h.G) {
		return dynTrain{}, &RangeError{Field: "", Msg: fmt.Sprintf("acceleration of gravity must be > 0 (got %g)", h.G)}
	}
	if err := h.CheckReeving(); err != nil {
		return dynTrain{}, err
	}
	if !(h.RatedLoadKg >= 0) || !dynFinite(h.RatedLoadKg) {
		return dynTrain{}, &RangeError{Field: "rated_load", Msg: fmt.Sprintf("rated load must be ≥ 0 (got %g kg)", h.RatedLoadKg)}
	}
	if !(h.HookBlockKg >= 0) || !dynFinite(h.HookBlockKg) {
		return dynTrain{}, &RangeError{Field: "hook_block_mass", Msg: fmt.Sprintf("hook block mass must be ≥ 0 (got %g kg)", h.HookBlockKg)}
	}
	if !(h.DrumDiameterM > 0) || !dynFinite(h.DrumDiameterM) {
		return dynTrain{}, &RangeError{Field: "drum_diameter", Msg: fmt.Sprintf("drum pitch diameter must be > 0 (got %g m)", h.DrumDiameterM)}
	}
	if h.Layers < 1 {
		return dynTrain{}, &RangeError{Field: "rope_layers", Msg: fmt.Sprintf("rope layers must be ≥ 1 (got %d)", h.Layers)}
	}
	if h.Layers > 1 && (!(h.RopeDiameterM > 0) || !dynFinite(h.RopeDiameterM)) {
		return dynTrain{}, &RangeError{Field: "rope_diameter", Msg: fmt.Sprintf("rope diameter must be > 0 to place the outer layer (got %g m)", h.RopeDiameterM)}
	}
	if !(h.GearRatio > 0) || !dynFinite(h.GearRatio) {
		return dynTrain{}, &RangeError{Field: "gear_ratio", Msg: fmt.Sprintf("gear ratio must be > 0 (got %g)", h.GearRatio)}
	}
	if !(h.GearEff > 0 && h.GearEff <= 1) {
		return dynTrain{}, &RangeError{Field: "gear_efficiency", Msg: fmt.Sprintf("gear efficiency must be in (0, 1] (got %g)", h.GearEff)}
	}
	if !(h.GearBackEff >= -1 && h.GearBackEff <= 1) {
		return dynTrain{}, &RangeError{Field: "gear_backdrive_efficiency", Msg: fmt.Sprintf("gear back-drive efficiency must be in [−1, 1] (≤ 0 self-locking) (got %g)", h.GearBackEff)}
	}
	if !(h.DrumInertiaKgM2 >= 0) || !dynFinite(h.DrumInertiaKgM2) {
		return dynTrain{}, &RangeError{Field: "drum_inertia", Msg: fmt.Sprintf("drum inertia must be ≥ 0 (got %g kg m²)", h.DrumInertiaKgM2)}
	}
	if !(h.MotorInertiaKgM2 >= 0) || !dynFinite(h.MotorInertiaKgM2) {
		return dynTrain{}, &RangeError{Field: "motor_inertia", Msg: fmt.Sprintf("motor inertia must be ≥ 0 (got %g kg m²)", h.MotorInertiaKgM2)}
	}
	t := dynTrain{
		g:      h.G,
		m:      h.MassKg(),
		n:      float64(h.Parts),
		e:      float64(h.RopeEnds),
		ne:     h.PartsPerEnd(),
		etaR:   h.ReevingEff(),
		etaRD:  h.RopeSystemEff(),
		etaG:   h.GearEff,
		etaGB:  h.GearBackEff,
		i:      h.GearRatio,
		id:     h.DrumInertiaKgM2,
		jm:     h.MotorInertiaKgM2,
		layers: h.Layers,
	}
	t.radii, t.nr = h.radii()
	t.etaL = t.etaRD * t.etaGB
	if t.m == 0 && t.id == 0 && t.jm == 0 {
		return dynTrain{}, &RangeError{Field: "rated_load", Msg: "rated load and hook block mass are both 0 and the train has no inertia: nothing to move"}
	}
	return t, nil
}

// runawayMass is the runaway equivalent mass at the hook, m_eq = m + (n_e/r)² (I_d/η_RD +
// i² J_m/η_l) [kg]; valid only when the train can be back-driven (η_gb > 0).
func (t dynTrain) runawayMass(r float64) float64 {
	k := t.ne / r
	return t.m + k*k*(t.id/t.etaRD+t.i*t.i*t.jm/t.etaL)
}

// runawayAccel is a_ff = m g / m_eq [m/s²], 0 for a self-locking train.
func (t dynTrain) runawayAccel(r float64) float64 {
	if t.selfLocking() {
		return 0
	}
	return t.m * t.g / t.runawayMass(r)
}

// Runaway computes the check `runaway` (always Verdict Info): what happens to the rated
// load when the brake is released and the motor unpowered, so that the load drives the
// drum, the gearbox (back-driving) and the rotor.
//
// Formulas (design.md "Exact definitions", Runaway):
//
//	m_eq  = m + (n_e/r)² (I_d/η_RD + i² J_m/η_l),  η_l = η_RD η_gb        [kg]
//	a_ff  = m g / m_eq                       (0 when self-locking)       [m/s²]
//	T     = m (g − a_ff) / n                 mean rope tension per part   [N]
//	α_d   = a_ff n_e / r                     drum angular acceleration    [rad/s²]
//	t_v   = v_j / a_ff,  v_j = v r / r_1     time to reach the rated lowering speed
//	                                         on the layer of radius r     [s]
//	v_H   = √(2 a_ff H)                      speed after falling H        [m/s]
//	E_H   = ½ m v_H² = m a_ff H              load's kinetic energy then   [J]
//	N_H   = v_H i n_e / r · 60/(2π)          rotor speed after falling H  [rev/min]
//	N_H / N                                  rotor overspeed ratio        [1]
//
// Symbols: m = m_L + m_H load on the hook [kg]; g gravity [m/s²]; n parts of line; n_e
// = n/e parts per rope end; r drum pitch radius [m]; I_d drum inertia, J_m motor-shaft
// inertia [kg m²]; i gear ratio; η_RD reeving × deflection-sheave efficiency; η_gb gear
// back-driving efficiency; v the rated lowering speed on the first layer
// (h.LoweringSpeed(): the hoisting speed where none is given) [m/s], v_j its value on the
// layer of radius r (the motor turns at the same speed on every layer; design.md
// Revision 2); H lift height [m]; N the motor's rated speed [rev/min].
//
// The rotor speed is the hazard of a runaway: the load's fall speed reaches the motor
// multiplied by the drive's speed ratio i n_e / r (rope kinematics: drum ω = n_e v / r,
// rotor = i × drum), so a fall of a few m/s on a hoist geared 80:1 spins the rotor at
// tens of thousands of rev/min, many times its rated speed.
//
// Derivation (Newton's second law for each body, kinematic constraint α_d = a n_e/r,
// design.md loss model): load m a = m g − n T; the rope system delivers η_RD of the
// load's power to the drum, so the drum-side rope force is η_RD m (g − a)/n_e; drum
// I_d α_d = η_RD m (g − a) r/n_e − T_in; gearbox back-driving passes η_gb T_in/i to the
// rotor, J_m i α_d = η_gb T_in / i. Eliminating T_in gives m (g − a) = (m_eq − m) a.
// With zero inertia a_ff = g whatever the efficiencies; with unit efficiencies and J_m =
// 0 it is the textbook drum-and-block a = m g/(m + I/r²).
//
// Evaluated at r_1 and r_L; reported at the radius giving the larger acceleration (the
// outer layer: the reflected inertia falls as 1/r²). Special cases: a self-locking train
// (η_gb ≤ 0) has no runaway: a_ff = 0, T = m g/n, equivalent mass NaN (not defined),
// time to rated speed +Inf, fall speed and energy 0, rotor speed and overspeed ratio NaN
// (design.md: null when self-locking). Without a lift height (H ≤ 0) the fall figures
// and the rotor speed are NaN; without a rated motor speed (N ≤ 0) the overspeed ratio
// is NaN. Valid ranges: m ≥ 0, r > 0, i > 0, I_d, J_m ≥ 0, η in (0, 1], η_gb in [−1, 1],
// v > 0.
//
// Figures: acceleration_m_s2, drum_angular_acceleration_rad_s2, rope_tension_n,
// time_to_rated_speed_s, fall_speed_m_s, fall_energy_j, equivalent_mass_kg,
// rotor_speed_after_fall_rpm, rotor_overspeed_ratio.
func Runaway(h Hoist) (Outcome, error) {
	t, err := dynTrainOf(h)
	if err != nil {
		return Outcome{}, fmt.Errorf("calc.Runaway: %w", err)
	}
	if !(h.LoweringSpeedMS >= 0) || math.IsInf(h.LoweringSpeedMS, 0) {
		return Outcome{}, fmt.Errorf("calc.Runaway: %w", &RangeError{Field: "lowering_speed", Msg: fmt.Sprintf("lowering speed must be ≥ 0 (got %g m/s)", h.LoweringSpeedMS)})
	}
	v := h.LoweringSpeed()
	if !(v > 0) || !dynFinite(v) {
		return Outcome{}, fmt.Errorf("calc.Runaway: %w", &RangeError{Field: "hoist_speed", Msg: fmt.Sprintf("rated lowering (or hoisting) speed must be > 0 (got %g m/s)", v)})
	}
	if !(h.MotorSpeedRPM >= 0) || math.IsInf(h.MotorSpeedRPM, 0) {
		return Outcome{}, fmt.Errorf("calc.Runaway: %w", &RangeError{Field: "motor_speed", Msg: fmt.Sprintf("motor speed must be ≥ 0 (got %g rpm)", h.MotorSpeedRPM)})
	}
	if !(h.LiftHeightM >= 0) || math.IsInf(h.LiftHeightM, 0) {
		return Outcome{}, fmt.Errorf("calc.Runaway: %w", &RangeError{Field: "lift_height", Msg: fmt.Sprintf("lift height must be ≥ 0 (got %g m)", h.LiftHeightM)})
	}

	rec := !h.SkipRecord
	out := Outcome{
		Demand: math.NaN(), Capacity: math.NaN(), Utilisation: math.NaN(),
		Unit: "m/s2", Verdict: Info,
	}
	if rec {
		out.Steps = append(out.Steps,
			Step{Symbol: "m", Formula: "m_L + m_H", Numbers: dynNum(h.RatedLoadKg) + " + " + dynNum(h.HookBlockKg), Value: t.m, Unit: "kg"},
			Step{Symbol: "η_l", Formula: "η_RD η_gb", Numbers: dynNum(t.etaRD) + " × " + dynNum(t.etaGB), Value: t.etaL, Unit: "1"},
		)
	}

	best := 0
	var accels [2]float64
	for k, r := range t.radii[:t.nr] {
		accels[k] = t.runawayAccel(r)
		if t.selfLocking() {
			if rec {
				out.Steps = append(out.Steps, Step{Symbol: "a_ff (" + t.radiusName(k) + ")", Formula: "0: self-locking (η_gb ≤ 0)",
					Numbers: "η_gb = " + dynNum(t.etaGB) + " ≤ 0", Value: 0, Unit: "m/s2"})
			}
			continue
		}
		if rec {
			tag := " (" + t.radiusName(k) + ")"
			meq := t.runawayMass(r)
			out.Steps = append(out.Steps,
				Step{Symbol: "m_eq" + tag, Formula: "m + (n_e/r)² (I_d/η_RD + i² J_m/η_l)",
					Numbers: fmt.Sprintf("%s + (%s/%s)² (%s/%s + %s² × %s/%s)", dynNum(t.m), dynNum(t.ne), dynNum(r),
						dynNum(t.id), dynNum(t.etaRD), dynNum(t.i), dynNum(t.jm), dynNum(t.etaL)),
					Value: meq, Unit: "kg"},
				Step{Symbol: "a_ff" + tag, Formula: "m g / m_eq",
					Numbers: fmt.Sprintf("%s × %s / %s", dynNum(t.m), dynNum(t.g), dynNum(meq)), Value: accels[k], Unit: "m/s2"},
			)
		}
		if accels[k] > accels[best] {
			best = k
		}
	}

	r := t.radii[best]
	a := accels[best]
	alpha := a * t.ne / r
	tension := t.m * (t.g - a) / t.n
	meq := math.NaN()
	timeV := math.Inf(1)
	vj := v * r / t.radii[0] // the rated lowering speed on this layer
	if !t.selfLocking() {
		meq = t.runawayMass(r)
		timeV = vj / a
	}
	fallV, fallE := math.NaN(), math.NaN()
	rotorRPM, overspeed := math.NaN(), math.NaN()
	H := h.LiftHeightM
	if H > 0 {
		fallV = math.Sqrt(2 * a * H)
		fallE = 0.5 * t.m * fallV * fallV
		if !t.selfLocking() {
			rotorRPM = fallV * t.i * t.ne / r * 60 / (2 * math.Pi)
			if h.MotorSpeedRPM > 0 {
				overspeed = rotorRPM / h.MotorSpeedRPM
			}
		}
	}
	if rec {
		out.Steps = append(out.Steps,
			Step{Symbol: "α_d", Formula: "a_ff n_e / r", Numbers: fmt.Sprintf("%s × %s / %s", dynNum(a), dynNum(t.ne), dynNum(r)), Value: alpha, Unit: "rad/s2"},
			Step{Symbol: "T", Formula: "m (g − a_ff) / n", Numbers: fmt.Sprintf("%s × (%s − %s) / %s", dynNum(t.m), dynNum(t.g), dynNum(a), dynNum(t.n)), Value: tension, Unit: "N"},
			Step{Symbol: "v_j", Formula: "v r / r_1 (rated lowering speed on this layer)", Numbers: fmt.Sprintf("%s × %s / %s", dynNum(v), dynNum(r), dynNum(t.radii[0])), Value: vj, Unit: "m/s"},
			Step{Symbol: "t_v", Formula: "v_j / a_ff", Numbers: fmt.Sprintf("%s / %s", dynNum(vj), dynNum(a)), Value: timeV, Unit: "s"},
		)
	}
	if rec && H > 0 {
		out.Steps = append(out.Steps,
			Step{Symbol: "v_H", Formula: "√(2 a_ff H)", Numbers: fmt.Sprintf("√(2 × %s × %s)", dynNum(a), dynNum(H)), Value: fallV, Unit: "m/s"},
			Step{Symbol: "E_H", Formula: "½ m v_H²", Numbers: fmt.Sprintf("0.5 × %s × %s²", dynNum(t.m), dynNum(fallV)), Value: fallE, Unit: "J"},
		)
		if !t.selfLocking() {
			out.Steps = append(out.Steps,
				Step{Symbol: "N_H", Formula: "v_H i n_e / r · 60/(2π)", Numbers: fmt.Sprintf("%s × %s × %s / %s × 60/(2π)", dynNum(fallV), dynNum(t.i), dynNum(t.ne), dynNum(r)), Value: rotorRPM, Unit: "rpm"})
			if h.MotorSpeedRPM > 0 {
				out.Steps = append(out.Steps,
					Step{Symbol: "N_H/N", Formula: "rotor speed after the fall / rated motor speed", Numbers: dynNum(rotorRPM) + " / " + dynNum(h.MotorSpeedRPM), Value: overspeed, Unit: "1"})
			}
		}
	}
	out.Figures = h.Figs.take([]Figure{
		{Name: "acceleration_m_s2", Value: a, Unit: "m/s2"},
		{Name: "drum_angular_acceleration_rad_s2", Value: alpha, Unit: "rad/s2"},
		{Name: "rope_tension_n", Value: tension, Unit: "N"},
		{Name: "time_to_rated_speed_s", Value: timeV, Unit: "s"},
		{Name: "fall_speed_m_s", Value: fallV, Unit: "m/s"},
		{Name: "fall_energy_j", Value: fallE, Unit: "J"},
		{Name: "equivalent_mass_kg", Value: meq, Unit: "kg"},
		{Name: "rotor_speed_after_fall_rpm", Value: rotorRPM, Unit: "rpm"},
		{Name: "rotor_overspeed_ratio", Value: overspeed, Unit: "1"},
	})
	switch {
	case t.selfLocking():
		out.Note = "self-locking gear train (η_gb = " + dynNum(t.etaGB) + " ≤ 0): the load cannot drive the train, no runaway"
	default:
		out.Note = "runaway evaluated at the " + t.radiusWords(best) + " (larger acceleration); η_RD = " + dynNum(t.etaRD) +
			", η_gb = " + dynNum(t.etaGB) + "; time to reach the rated lowering speed on that layer"
	}
	if H <= 0 {
		out.Note += "; no lift height: fall speed and energy not computed"
	}
	return out, nil
}

// dynStopAt is the emergency stop evaluated at one drum radius.
type dynStopAt struct {
	r          float64
	v0         float64 // v_j, the lowering speed on this layer [m/s]
	fb         float64 // brake force reflected to the hook F_b [N]
	meq        float64 // equivalent mass of the braking phase [kg]
	aff        float64 // acceleration during the delay [m/s²]
	ab         float64 // deceleration once the brake has set [m/s²]
	v1, s1     float64 // speed at brake set [m/s], distance during the delay [m]
	s2         float64 // braking distance [m]
	s, time    float64 // stopping distance [m] and time [s]; NaN when it cannot stop
	canStop    bool
	peakT, dfc float64 // peak dead-end part tension [N] and its design factor
}

// stopRun is the emergency stop worked out on every layer: BrakeStop's dynamics, which
// BrakeEnergy reads too.
type stopRun struct {
	t          dynTrain
	res        [2]dynStopAt
	best       int // the layer of the longer stop, or the first whose brakes cannot stop
	peak       int // the layer of the largest rope tension
	lock       bool
	ts, v      float64
	brakeWhere string // "motor-shaft" or "drum"
	steps      []Step // the record so far (rec)
}

// brakeStopRun validates the inputs of the emergency stop and works it out on each layer
// (BrakeStop's formulas); op names the calling check in errors. With rec it records the
// steps.
func brakeStopRun(op string, h Hoist, rec bool) (stopRun, error) {
	t, err := dynTrainOf(h)
	if err != nil {
		return stopRun{}, fmt.Errorf(op+": %w", err)
	}
	if err := dynBrakeInputs(h); err != nil {
		return stopRun{}, fmt.Errorf(op+": %w", err)
	}
	if !(h.LoweringSpeedMS >= 0) || math.IsInf(h.LoweringSpeedMS, 0) {
		return stopRun{}, fmt.Errorf(op+": %w", &RangeError{Field: "lowering_speed", Msg: fmt.Sprintf("lowering speed must be ≥ 0 (got %g m/s)", h.LoweringSpeedMS)})
	}
	v := h.LoweringSpeed()
	if !(v > 0) || !dynFinite(v) {
		return stopRun{}, fmt.Errorf(op+": %w", &RangeError{Field: "hoist_speed", Msg: fmt.Sprintf("lowering (or hoisting) speed must be > 0 (got %g m/s)", v)})
	}
	if !(h.BrakeDelayS >= 0) || !dynFinite(h.BrakeDelayS) {
		return stopRun{}, fmt.Errorf(op+": %w", &RangeError{Field: "brake_delay", Msg: fmt.Sprintf("brake delay must be ≥ 0 (got %g s)", h.BrakeDelayS)})
	}
	if !(h.RopeMBFN >= 0) || math.IsInf(h.RopeMBFN, 0) {
		return stopRun{}, fmt.Errorf(op+": %w", &RangeError{Field: "rope_mbf", Msg: fmt.Sprintf("rope minimum breaking force must be ≥ 0 (got %g N)", h.RopeMBFN)})
	}
	ts := h.BrakeDelayS
	nb := float64(h.Brakes)
	mb := h.BrakeTorqueNm
	lock := t.selfLocking()

	var out Outcome // its Steps only
	brakeWhere := "motor-shaft"
	if h.BrakeOnDrum {
		brakeWhere = "drum"
	}
	if rec {
		out.Steps = append(out.Steps,
			Step{Symbol: "m", Formula: "m_L + m_H", Numbers: dynNum(h.RatedLoadKg) + " + " + dynNum(h.HookBlockKg), Value: t.m, Unit: "kg"},
			Step{Symbol: "v", Formula: "rated lowering speed (hoisting speed where none is given)", Numbers: dynNum(v), Value: v, Unit: "m/s"},
		)
	}
	// bound is the train used for the braking phase: a self-locking train is bounded by
	// a lossless back-driving gearbox (see the doc comment).
	bt := t
	if lock {
		bt.etaGB = 1
		bt.etaL = bt.etaRD
	}
	if rec && !h.BrakeOnDrum {
		if lock {
			out.Steps = append(out.Steps, Step{Symbol: "η_l(η_gb=1)", Formula: "η_RD (bound: lossless back-driving)", Numbers: dynNum(bt.etaRD), Value: bt.etaL, Unit: "1"})
		} else {
			out.Steps = append(out.Steps, Step{Symbol: "η_l", Formula: "η_RD η_gb", Numbers: dynNum(bt.etaRD) + " × " + dynNum(bt.etaGB), Value: bt.etaL, Unit: "1"})
		}
	}

	var res [2]dynStopAt
	r1 := t.radii[0]
	for k, r := range t.radii[:t.nr] {
		tag := ""
		if rec {
			tag = " (" + t.radiusName(k) + ")"
		}
		// The motor turns at the same speed on every layer, so the load lowers at
		// v_j = v r_j / r_1 (design.md Revision 2, "Stop at every layer").
		vj := v * r / r1
		x := dynStopAt{r: r, v0: vj}
		if rec && k > 0 {
			out.Steps = append(out.Steps, Step{Symbol: "v_j" + tag, Formula: "v r_L / r_1 (same motor speed on every layer)",
				Numbers: fmt.Sprintf("%s × %s / %s", dynNum(v), dynNum(r), dynNum(r1)), Value: vj, Unit: "m/s"})
		}
		kk := t.ne / r
		x.aff = t.runawayAccel(r)
		switch {
		case rec && lock:
			out.Steps = append(out.Steps, Step{Symbol: "a_ff" + tag, Formula: "0: self-locking, no runaway", Numbers: "η_gb = " + dynNum(t.etaGB) + " ≤ 0", Value: 0, Unit: "m/s2"})
		case rec:
			out.Steps = append(out.Steps,
				Step{Symbol: "m_eq" + tag, Formula: "m + (n_e/r)² (I_d/η_RD + i² J_m/η_l)",
					Numbers: fmt.Sprintf("%s + (%s/%s)² (%s/%s + %s² × %s/%s)", dynNum(t.m), dynNum(t.ne), dynNum(r), dynNum(t.id), dynNum(t.etaRD), dynNum(t.i), dynNum(t.jm), dynNum(t.etaL)),
					Value:   t.runawayMass(r), Unit: "kg"},
				Step{Symbol: "a_ff" + tag, Formula: "m g / m_eq", Numbers: fmt.Sprintf("%s × %s / %s", dynNum(t.m), dynNum(t.g), dynNum(t.runawayMass(r))), Value: x.aff, Unit: "m/s2"})
		}
		if h.BrakeOnDrum {
			x.fb = nb * mb * kk
			x.meq = t.m + kk*kk*(t.id+t.etaG*t.i*t.i*t.jm)/t.etaRD
			x.ab = (x.fb/t.etaRD - t.m*t.g) / x.meq
			if rec {
				out.Steps = append(out.Steps,
					Step{Symbol: "F_b" + tag, Formula: "N_b M_b n_e / r", Numbers: fmt.Sprintf("%s × %s × %s / %s", dynNum(nb), dynNum(mb), dynNum(t.ne), dynNum(r)), Value: x.fb, Unit: "N"},
					Step{Symbol: "m_eq,d" + tag, Formula: "m + (n_e/r)² (I_d + η_g i² J_m) / η_RD",
						Numbers: fmt.Sprintf("%s + (%s/%s)² (%s + %s × %s² × %s) / %s", dynNum(t.m), dynNum(t.ne), dynNum(r), dynNum(t.id), dynNum(t.etaG), dynNum(t.i), dynNum(t.jm), dynNum(t.etaRD)),
						Value:   x.meq, Unit: "kg"},
					Step{Symbol: "a_b" + tag, Formula: "(F_b/η_RD − m g) / m_eq,d",
						Numbers: fmt.Sprintf("(%s/%s − %s × %s) / %s", dynNum(x.fb), dynNum(t.etaRD), dynNum(t.m), dynNum(t.g), dynNum(x.meq)), Value: x.ab, Unit: "m/s2"})
			}
		} else {
			x.fb = nb * mb * t.i * kk
			x.meq = bt.runawayMass(r)
			x.ab = (x.fb/bt.etaL - t.m*t.g) / x.meq
			if rec {
				meqName, etaLName := "m_eq", "η_l"
				if lock {
					meqName, etaLName = "m_eq(η_gb=1)", "η_l(η_gb=1)"
					out.Steps = append(out.Steps, Step{Symbol: meqName + tag, Formula: "m + (n_e/r)² (I_d + i² J_m)/η_RD  (bound: lossless back-driving)",
						Numbers: fmt.Sprintf("%s + (%s/%s)² (%s + %s² × %s)/%s", dynNum(t.m), dynNum(t.ne), dynNum(r), dynNum(t.id), dynNum(t.i), dynNum(t.jm), dynNum(t.etaRD)), Value: x.meq, Unit: "kg"})
				}
				out.Steps = append(out.Steps,
					Step{Symbol: "F_b" + tag, Formula: "N_b M_b i n_e / r", Numbers: fmt.Sprintf("%s × %s × %s × %s / %s", dynNum(nb), dynNum(mb), dynNum(t.i), dynNum(t.ne), dynNum(r)), Value: x.fb, Unit: "N"},
					Step{Symbol: "a_b" + tag, Formula: "(F_b/" + etaLName + " − m g) / " + meqName,
						Numbers: fmt.Sprintf("(%s/%s − %s × %s) / %s", dynNum(x.fb), dynNum(bt.etaL), dynNum(t.m), dynNum(t.g), dynNum(x.meq)), Value: x.ab, Unit: "m/s2"})
			}
		}
		x.v1 = vj + x.aff*ts
		x.s1 = vj*ts + 0.5*x.aff*ts*ts
		if rec {
			out.Steps = append(out.Steps,
				Step{Symbol: "v_1" + tag, Formula: "v_j + a_ff t_s", Numbers: fmt.Sprintf("%s + %s × %s", dynNum(vj), dynNum(x.aff), dynNum(ts)), Value: x.v1, Unit: "m/s"},
				Step{Symbol: "s_1" + tag, Formula: "v_j t_s + ½ a_ff t_s²", Numbers: fmt.Sprintf("%s × %s + 0.5 × %s × %s²", dynNum(vj), dynNum(ts), dynNum(x.aff), dynNum(ts)), Value: x.s1, Unit: "m"})
		}
		x.canStop = x.ab > 0
		x.s2, x.s, x.time = math.NaN(), math.NaN(), math.NaN()
		if x.canStop {
			x.s2 = x.v1 * x.v1 / (2 * x.ab)
			x.s = x.s1 + x.s2
			x.time = ts + x.v1/x.ab
		}
		switch {
		case rec && x.canStop:
			out.Steps = append(out.Steps,
				Step{Symbol: "s_2" + tag, Formula: "v_1² / (2 a_b)", Numbers: fmt.Sprintf("%s² / (2 × %s)", dynNum(x.v1), dynNum(x.ab)), Value: x.s2, Unit: "m"},
				Step{Symbol: "s" + tag, Formula: "s_1 + s_2", Numbers: dynNum(x.s1) + " + " + dynNum(x.s2), Value: x.s, Unit: "m"},
				Step{Symbol: "t" + tag, Formula: "t_s + v_1 / a_b", Numbers: fmt.Sprintf("%s + %s / %s", dynNum(ts), dynNum(x.v1), dynNum(x.ab)), Value: x.time, Unit: "s"})
		case rec:
			out.Steps = append(out.Steps, Step{Symbol: "s" + tag, Formula: "none: a_b ≤ 0, the brakes cannot decelerate the load", Numbers: "a_b = " + dynNum(x.ab) + " ≤ 0", Value: math.NaN(), Unit: "m"})
		}
		x.peakT = t.m * (t.g + x.ab) / (t.n * t.etaR)
		x.dfc = math.NaN()
		if h.RopeMBFN > 0 {
			x.dfc = h.RopeMBFN / x.peakT
		}
		res[k] = x
	}

	// Governing radius: the first one where the brakes cannot stop, else the longest stop.
	best := -1
	for k, x := range res[:t.nr] {
		if !x.canStop {
			best = k
			break
		}
		if best < 0 || x.s > res[best].s {
			best = k
		}
	}
	// The peak rope tension is the largest over the layers (the hardest stop), not the
	// one of the longest stop (design.md Revision 2).
	peak := 0
	for k, x := range res[:t.nr] {
		if x.peakT > res[peak].peakT {
			peak = k
		}
	}
	return stopRun{t: t, res: res, best: best, peak: peak, lock: lock, ts: ts, v: v, brakeWhere: brakeWhere, steps: out.Steps}, nil
}

// BrakeStop computes the check `brake-stop`: the rated load lowering at the rated lowering
// speed v (h.LoweringSpeed(): the lowering speed, or the hoisting speed where none is
// given), power is lost, and the holding brakes reach full torque after the delay t_s.
// The load first runs away freely, then decelerates under the brakes.
//
// Formulas (design.md "Exact definitions", Emergency stop):
//
//	v_j = v r_j / r_1                                                  lowering speed on layer j
//	a_ff = m g / m_eq, m_eq = m + (n_e/r)² (I_d/η_RD + i² J_m/η_l)     runaway phase
//	v_1 = v_j + a_ff t_s,  s_1 = v_j t_s + ½ a_ff t_s²                 during the delay
//	motor-shaft brake: F_b = N_b M_b i n_e / r,  a_b = (F_b/η_l − m g) / m_eq
//	drum brake:        F_b = N_b M_b n_e / r,    a_b = (F_b/η_RD − m g) / m_eq,d,
//	                   m_eq,d = m + (n_e/r)² (I_d + η_g i² J_m) / η_RD
//	s_2 = v_1² / (2 a_b),  s = s_1 + s_2,  t = t_s + v_1 / a_b
//	T_peak = max_j m (g + a_b,j) / (n η_R)  (dead-end part),  Z_peak = MBF / T_peak
//
// Symbols as in Runaway, plus M_b one brake's rated torque [N m], N_b number of brakes,
// t_s brake delay [s], η_g forward gear efficiency, MBF rope minimum breaking force [N].
//
// Why F_b is divided by η_l (motor-shaft brake): while braking a descending load the power
// flows from the load, through the reeving and the back-driven gearbox, into the brake.
// The losses sit between the load and the brake and absorb part of the load's power, so
// the brake only has to absorb η_l of it: the force the brake can hold at the hook is
// F_b/η_l, larger than F_b. The same rule puts η_RD under a drum brake's force, while the
// rotor's stored energy reaches a drum brake through the gearbox forward (× η_g in
// m_eq,d). Newton's second law for load, drum and rotor with the brake torque on the
// rotor (or the drum) gives the a_b above; the rotor's deceleration torque never exceeds
// the brake torque, so the power flow does not reverse in the gearbox during the stop.
//
// Evaluated at r_1 and r_L (design.md Revision 2, "Stop at every layer"): the motor turns
// at the same speed on every layer, so on layer j the load lowers at v_j = v r_j / r_1
// (the rope speed at the drum rim is ω_d r_j). The layer giving the longer stop is
// reported (figures stop_layer = 1 or L and initial_speed_m_s = v_j), or the one where
// the brakes cannot stop the load; the peak rope tension is the largest over the layers
// (the hardest stop). Demand = s [m], Capacity = maxDistanceM (NaN
// when maxDistanceM ≤ 0 or NaN: no limit, Verdict Info). a_b ≤ 0: the brakes cannot
// decelerate the load: Verdict Fail, distance and time NaN.
//
// Self-locking train (η_gb ≤ 0): the load cannot drive the gearbox, so there is no
// runaway phase and, with the power off, the gear friction itself stops the load (a
// motor-shaft brake then only has to hold the rotor). Stopping is then reported as an
// upper bound, Verdict Info: no speed is gained during the delay (a_ff = 0, s_1 = v t_s;
// the real train decelerates at once), and the braking phase counts the brakes alone
// with the gearbox treated as lossless in back-driving (η_gb = 1 in η_l and m_eq); the
// drum-brake phase is as above. If even that bound finds a_b ≤ 0 the distance is NaN
// (the gear, not the brake, holds the load), still Info. The peak rope tension and its
// design factor are then NOT bounds: a locking gear stops the load harder than the brake.
//
// Valid ranges: as Runaway, plus M_b ≥ 0, N_b ≥ 1, t_s ≥ 0, v > 0, MBF ≥ 0 (0 = not
// given: Z_peak NaN). Figures: distance_m, time_s, deceleration_m_s2,
// peak_rope_tension_n, peak_design_factor, speed_at_brake_set_m_s, runaway_distance_m
// (= s_1, the distance travelled between power loss and full brake torque), stop_layer,
// initial_speed_m_s.
func BrakeStop(h Hoist, maxDistanceM float64) (Outcome, error) {
	limit := maxDistanceM
	if !(limit > 0) || math.IsInf(limit, 1) {
		limit = math.NaN()
	}
	rec := !h.SkipRecord && !h.SkipDetail
	sr, err := brakeStopRun("calc.BrakeStop", h, rec)
	if err != nil {
		return Outcome{}, err
	}
	t, res, best, peak, lock, brakeWhere := sr.t, sr.res, sr.best, sr.peak, sr.lock, sr.brakeWhere
	g := res[best]
	out := Outcome{Capacity: limit, Unit: "m", Steps: sr.steps}
	peakT, peakZ := res[peak].peakT, res[peak].dfc
	if rec {
		tag := " (" + t.radiusName(peak) + ")"
		out.Steps = append(out.Steps, Step{Symbol: "T_peak" + tag, Formula: "max_j m (g + a_b,j) / (n η_R)",
			Numbers: fmt.Sprintf("%s × (%s + %s) / (%s × %s)", dynNum(t.m), dynNum(t.g), dynNum(res[peak].ab), dynNum(t.n), dynNum(t.etaR)), Value: peakT, Unit: "N"})
		if h.RopeMBFN > 0 {
			out.Steps = append(out.Steps, Step{Symbol: "Z_peak" + tag, Formula: "MBF / T_peak", Numbers: dynNum(h.RopeMBFN) + " / " + dynNum(peakT), Value: peakZ, Unit: "1"})
		}
	}
	out.Demand = g.s
	out.Utilisation = g.s / limit
	if h.SkipDetail { // the verdicts of the switch below, without the notes
		switch {
		case lock, g.canStop && math.IsNaN(limit):
			out.Verdict = Info
		case !g.canStop:
			out.Verdict = Fail
		default:
			out.Verdict = ByUtilisation
		}
		return out, nil
	}
	out.Figures = h.Figs.take([]Figure{
		{Name: "distance_m", Value: g.s, Unit: "m"},
		{Name: "time_s", Value: g.time, Unit: "s"},
		{Name: "deceleration_m_s2", Value: g.ab, Unit: "m/s2"},
		{Name: "peak_rope_tension_n", Value: peakT, Unit: "N"},
		{Name: "peak_design_factor", Value: peakZ, Unit: "1"},
		{Name: "speed_at_brake_set_m_s", Value: g.v1, Unit: "m/s"},
		{Name: "runaway_distance_m", Value: g.s1, Unit: "m"},
		{Name: "stop_layer", Value: t.layerNumber(best), Unit: "1"},
		{Name: "initial_speed_m_s", Value: g.v0, Unit: "m/s"},
	})

	where := t.radiusWords(best)
	switch {
	case lock:
		out.Verdict = Info
		if g.canStop {
			out.Note = fmt.Sprintf("self-locking gear train (η_gb = %s): no runaway; the stop shown is an upper bound (no speed gained during the delay, %s brake alone with lossless back-driving), at the %s; the peak rope tension is not a bound (a locking gear stops harder)", dynNum(t.etaGB), brakeWhere, where)
		} else {
			out.Note = fmt.Sprintf("self-locking gear train (η_gb = %s): the gear holds the load; the %s brake alone could not (a_b = %s m/s² at the %s)", dynNum(t.etaGB), brakeWhere, dynNum(g.ab), where)
		}
	case !g.canStop:
		out.Verdict = Fail
		out.Note = "the " + brakeWhere + " brake cannot decelerate the load: a_b = " + dynNum(g.ab) + " m/s² ≤ 0 at the " + where
	case math.IsNaN(limit):
		out.Verdict = Info
		out.Note = brakeWhere + " brake, stop evaluated at the " + where + " (longer stop); the rules set no distance limit"
	default:
		out.Verdict = ByUtilisation
		out.Note = brakeWhere + " brake, stop evaluated at the " + where + " (longer stop)"
	}
	if h.RopeMBFN <= 0 {
		out.Note += "; rope MBF not given: peak design factor not computed"
	}
	return out, nil
}

// dynBrakeInputs validates the brake data: M_b ≥ 0, N_b ≥ 1.
func dynBrakeInputs(h Hoist) error {
	if !(h.BrakeTorqueNm >= 0) || !dynFinite(h.BrakeTorqueNm) {
		return &RangeError{Field: "brake_torque", Msg: fmt.Sprintf("brake torque must be ≥ 0 (got %g N m)", h.BrakeTorqueNm)}
	}
	if h.Brakes < 1 {
		return &RangeError{Field: "brakes", Msg: fmt.Sprintf("number of brakes must be ≥ 1 (got %d)", h.Brakes)}
	}
	return nil
}
