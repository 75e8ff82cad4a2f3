package calc

import (
	"fmt"
	"math"
)

// The static checks: drum and sheave ratios, drum capacity, fleet angle, the motor in
// steady hoisting, the declared hoisting speed and the holding brake. Symbols are those
// of the package documentation and of design.md "Exact definitions".

// DrumRatio checks the ratio of drum pitch diameter to rope diameter (check
// drum-ratio).
//
// Formula: capacity D/d; demand h1; utilisation h1 / (D/d). Unit "1".
//
// Symbols: D drum pitch diameter at the first layer [m] (> 0); d nominal rope diameter
// [m] (> 0); h1 minimum drum coefficient for the duty group from the rules [1] (> 0).
// The ratio does not depend on the load.
//
// Source: ISO 4308-1 minimum D/d coefficient h1 for drums (standards.md: memory,
// medium), or the rule table in force.
func DrumRatio(h Hoist, h1 float64) (Outcome, error) {
	return stDiameterRatio(h, h1, h.DrumDiameterM, "drum_diameter", "drum pitch diameter", "D", "h1", "drum_ratio")
}

// SheaveRatio checks the ratio of the smallest running-sheave pitch diameter to rope
// diameter (check sheave-ratio).
//
// Formula: capacity D_s/d; demand h2; utilisation h2 / (D_s/d). Unit "1".
//
// Symbols: D_s smallest running-sheave pitch diameter [m] (> 0; a hoist with no running
// sheave, n_e = 1 and no deflection sheave, has nothing to check and the caller should
// not call this); d nominal rope diameter [m] (> 0); h2 minimum sheave coefficient for
// the duty group [1] (> 0). Load-independent.
//
// Source: ISO 4308-1 minimum D/d coefficient h2 for sheaves (standards.md: memory,
// medium, h2 least certain), or the rule table in force.
func SheaveRatio(h Hoist, h2 float64) (Outcome, error) {
	return stDiameterRatio(h, h2, h.SheaveDiameterM, "sheave_diameter", "sheave pitch diameter", "D_s", "h2", "sheave_ratio")
}

func stDiameterRatio(h Hoist, required, dia float64, field, what, sym, reqSym, figure string) (Outcome, error) {
	if err := stPositive(field, what, "m", dia); err != nil {
		return Outcome{}, err
	}
	if err := stPositive("rope_diameter", "rope diameter", "m", h.RopeDiameterM); err != nil {
		return Outcome{}, err
	}
	if err := stRule(reqSym, required); err != nil {
		return Outcome{}, err
	}
	ratio := dia / h.RopeDiameterM
	u := required / ratio
	o := Outcome{
		Demand:      required,
		Capacity:    ratio,
		Unit:        "1",
		Utilisation: u,
		Verdict:     ByUtilisation,
		Figures: h.Figs.take([]Figure{
			{Name: figure, Value: ratio, Unit: "1"},
			{Name: "required_ratio", Value: required, Unit: "1"},
		}),
	}
	if !h.SkipRecord {
		o.Steps = []Step{
			stStep(sym+"/d", sym+" / d", "%s / %s", ratio, "1", dia, h.RopeDiameterM),
			stStep("u", reqSym+" / ("+sym+"/d)", "%s / %s", u, "1", required, ratio),
		}
	}
	return o, nil
}

// DrumCapacity checks that the rope wound per rope end fits the drum's grooves and
// layers (check drum-capacity).
//
// Formulas (lengths per rope end, in m):
//
//	demand    L_req = H n_e + w_min π D                       (dead wraps on the first layer)
//	capacity  C     = G π D + Σ_{j=2..L} G π D_j,  D_j = D + (j − 1) √3 d
//	utilisation u   = L_req / C
//
// D_j = 2 r_j is the pitch diameter of layer j with each layer nested in the valleys of
// the one below (r_j = D/2 + (j − 1)(√3/2) d, the height of an equilateral triangle of
// side d per layer; ideal nesting, textbook geometry).
//
// Figures: rope_per_end_m (L_req), lift_rope_m (H n_e), drum_capacity_m (C),
// wraps_left_at_lowest_hook (the capacity left over at the lowest hook, expressed in
// turns filling the first layer first: on a single layer G − H n_e/(π D); it is at least
// w_min exactly when u ≤ 1), layers_needed (the fewest layers that hold L_req; NaN with a
// Note when the rope diameter is not given and the rope does not fit on one layer).
//
// Symbols: H lift height [m] (≥ 0); n_e parts per rope end; w_min minimum dead wraps at
// the lowest hook [turns] (≥ 0) from the rules; D drum pitch diameter [m] (> 0); G usable
// grooves per rope end [turns] (> 0); L rope layers (≥ 1); d rope diameter [m] (> 0 when
// L > 1). The check does not depend on the load.
//
// Source: at least two wraps on the drum at the lowest hook position, 29 CFR
// 1910.179(h)(2) (standards.md: law) and ASME B30.2 (seen); winches ASME B30.7-2016
// (seen). Layer geometry: textbook identity.
func DrumCapacity(h Hoist, minDeadWraps float64) (Outcome, error) {
	if err := h.CheckReeving(); err != nil {
		return Outcome{}, err
	}
	if err := stCheckDrum(h); err != nil {
		return Outcome{}, err
	}
	if err := stPositive("drum_grooves", "usable drum grooves per rope end", "", h.Grooves); err != nil {
		return Outcome{}, err
	}
	if err := stNonNegative("lift_height", "lift height", "m", h.LiftHeightM); err != nil {
		return Outcome{}, err
	}
	if !(stFinite(minDeadWraps) && minDeadWraps >= 0) {
		return Outcome{}, &RangeError{Field: "", Msg: fmt.Sprintf("rule value minimum dead wraps must be zero or more (got %s): check the rule table", stGot(minDeadWraps))}
	}

	rec := !h.SkipRecord && !h.SkipDetail
	ne := h.PartsPerEnd()
	d := h.DrumDiameterM
	g := h.Grooves
	turn1 := math.Pi * d
	lift := h.LiftHeightM * ne
	dead := minDeadWraps * turn1
	demand := lift + dead

	var steps []Step
	if rec {
		steps = []Step{
			stStep("n_e", "n / e", "%s / %s", ne, "1", float64(h.Parts), float64(h.RopeEnds)),
			stStep("πD", "π D", "π × %s", turn1, "m", d),
			stStep("L_lift", "H n_e", "%s × %s", lift, "m", h.LiftHeightM, ne),
			stStep("L_dead", "w_min π D", "%s × %s", dead, "m", minDeadWraps, turn1),
			stStep("L_req", "H n_e + w_min π D", "%s + %s", demand, "m", lift, dead),
			stStep("C_1", "G π D", "%s × %s", g*turn1, "m", g, turn1),
		}
	}
	capacity := g * turn1
	layerCap := []float64{g * turn1}
	layerDia := []float64{d}
	for j := 2; j <= h.Layers; j++ {
		dj := d + float64(j-1)*math.Sqrt(3)*h.RopeDiameterM
		cj := g * math.Pi * dj
		capacity += cj
		layerCap = append(layerCap, cj)
		layerDia = append(layerDia, dj)
		if rec {
			steps = append(steps,
				stStep(fmt.Sprintf("D_%d", j), "D + (j − 1) √3 d", "%s + (%s − 1) × 1.73205 × %s", dj, "m", d, float64(j), h.RopeDiameterM),
				stStep(fmt.Sprintf("C_%d", j), "G π D_j", "%s × π × %s", cj, "m", g, dj),
			)
		}
	}
	if rec && h.Layers > 1 {
		steps = append(steps, Step{Symbol: "C", Formula: "Σ C_j", Numbers: stSumText(layerCap), Value: capacity, Unit: "m"})
	}
	u := demand / capacity
	if rec {
		steps = append(steps, stStep("u", "L_req / C", "%s / %s", u, "1", demand, capacity))
	}

	// Turns left at the lowest hook: the length the drum can still hold, laid from the
	// first layer outwards.
	left := capacity - lift
	wraps := 0.0
	if left <= layerCap[0] || h.Layers == 1 {
		wraps = left / turn1
	} else {
		rem := left
		for j, cj := range layerCap {
			if rem <= cj {
				wraps += rem / (math.Pi * layerDia[j])
				break
			}
			wraps += g
			rem -= cj
		}
	}
	if rec {
		steps = append(steps, Step{
			Symbol:  "w_left",
			Formula: "(C − H n_e) in turns, first layer first",
			Numbers: fmt.Sprintf("(%s − %s) m laid from layer 1", stNum(capacity), stNum(lift)),
			Value:   wraps,
			Unit:    "turns",
		})
	}

	note := ""
	needed, ok := stLayersNeeded(demand, g, d, h.RopeDiameterM)
	switch {
	case !ok && math.IsNaN(needed):
		note = "layers needed not computed: the rope does not fit on one layer and the rope diameter is not given"
	case !ok:
		note = "the rope does not fit on the drum in any reasonable number of layers"
	case needed > float64(h.Layers):
		note = fmt.Sprintf("the rope needs %d layers; the register gives %d", int(needed), h.Layers)
	}
	if u > 1 && note == "" {
		note = fmt.Sprintf("fewer than %s dead wraps left at the lowest hook", stNum(minDeadWraps))
	}
	return Outcome{
		Demand:      demand,
		Capacity:    capacity,
		Unit:        "m",
		Utilisation: u,
		Verdict:     ByUtilisation,
		Note:        note,
		Figures: h.Figs.take([]Figure{
			{Name: "rope_per_end_m", Value: demand, Unit: "m"},
			{Name: "lift_rope_m", Value: lift, Unit: "m"},
			{Name: "drum_capacity_m", Value: capacity, Unit: "m"},
			{Name: "wraps_left_at_lowest_hook", Value: wraps, Unit: "1"},
			{Name: "min_dead_wraps", Value: minDeadWraps, Unit: "1"},
			{Name: "layers_needed", Value: needed, Unit: "1"},
		}),
		Steps: steps,
	}, nil
}

// stLayersNeeded is the fewest layers of g turns whose capacity holds length. With no
// rope diameter (rd ≤ 0) it can answer only when one layer suffices. It gives up after
// 1000 layers (ok false, +Inf).
func stLayersNeeded(length, g, d, rd float64) (float64, bool) {
	if length <= g*math.Pi*d {
		return 1, true
	}
	if !(rd > 0) {
		return math.NaN(), false
	}
	sum := 0.0
	for j := 1; j <= 1000; j++ {
		sum += g * math.Pi * (d + float64(j-1)*math.Sqrt(3)*rd)
		if sum >= length {
			return float64(j), true
		}
	}
	return math.Inf(1), false
}

func stSumText(xs []float64) string {
	s := ""
	for i, x := range xs {
		if i > 0 {
			s += " + "
		}
		s += stNum(x)
	}
	return s
}

// FleetAngle checks the largest fleet angle of the rope against the limit for the drum
// (check fleet-angle).
//
// Formula: demand θ, capacity θ_max, utilisation θ / θ_max. Unit "deg".
//
// Symbols: θ largest fleet angle [deg] (0 ≤ θ < 90); θ_max limit for this drum [deg]
// (> 0): the caller passes the grooved or the plain-drum limit as the rules give them;
// θ_min the angle below which the rope may not spool back across a plain drum or may
// climb the previous wrap [deg] (0 ≤ θ_min < θ_max; 0 for none).
//
// Special case: θ < θ_min gives Verdict Marginal (never Fail): a too small fleet angle
// is a spooling concern, not an overload. Load-independent.
//
// Source: Wire Rope Users Manual, ≤ 1.5° smooth drum, ≤ 2° grooved drum, avoid < 0.5°
// (standards.md "Fleet angle", seen); other guidance allows more (not used by default).
func FleetAngle(h Hoist, maxDeg, minDeg float64) (Outcome, error) {
	if !(stFinite(h.FleetAngleDeg) && h.FleetAngleDeg >= 0 && h.FleetAngleDeg < 90) {
		return Outcome{}, &RangeError{Field: "fleet_angle", Msg: fmt.Sprintf("fleet angle must be in [0, 90) deg (got %s)", stGot(h.FleetAngleDeg))}
	}
	if !(stFinite(maxDeg) && maxDeg > 0 && maxDeg < 90) {
		return Outcome{}, &RangeError{Field: "", Msg: fmt.Sprintf("rule value maximum fleet angle must be in (0, 90) deg (got %s): check the rule table", stGot(maxDeg))}
	}
	if !(stFinite(minDeg) && minDeg >= 0 && minDeg < maxDeg) {
		return Outcome{}, &RangeError{Field: "", Msg: fmt.Sprintf("rule value minimum fleet angle must be in [0, %s) deg (got %s): check the rule table", stNum(maxDeg), stGot(minDeg))}
	}
	theta := h.FleetAngleDeg
	u := theta / maxDeg
	o := Outcome{
		Demand:      theta,
		Capacity:    maxDeg,
		Unit:        "deg",
		Utilisation: u,
		Verdict:     ByUtilisation,
		Figures: h.Figs.take([]Figure{
			{Name: "fleet_angle_deg", Value: theta, Unit: "deg"},
			{Name: "max_fleet_angle_deg", Value: maxDeg, Unit: "deg"},
			{Name: "min_fleet_angle_deg", Value: minDeg, Unit: "deg"},
		}),
	}
	if !h.SkipRecord {
		drum := "plain"
		if h.Grooved {
			drum = "grooved"
		}
		o.Steps = []Step{
			{Symbol: "θ_max", Formula: "limit for a " + drum + " drum (rules)", Numbers: stNum(maxDeg), Value: maxDeg, Unit: "deg"},
			stStep("u", "θ / θ_max", "%s / %s", u, "1", theta, maxDeg),
		}
	}
	if theta < minDeg {
		o.Verdict = Marginal
		o.Note = fmt.Sprintf("fleet angle %s° is below the %s° minimum: the rope may not spool evenly (marginal, never fail)", stNum(theta), stNum(minDeg))
	}
	return o, nil
}

// MotorTorque checks the motor's torque in steady hoisting of the rated load (check
// motor-torque).
//
// Formulas:
//
//	F      = W / (n η_RD)                 hoisting tension per rope end [N]
//	M(r)   = e F r / (i η_g)              motor-shaft torque with the rope at radius r [N m]
//	demand = max(M(r_1), M(r_L));  capacity M_r = P / ω_m, ω_m = 2πN/60;  unit "N m"
//
// e F r is the drum torque of the e rope ends. Symbols as in the package documentation:
// W = (m_L + m_H) g [N]; n parts (≥ 1), e ends (1 or 2), η_RD = η_R η_s^k; r_1 = D/2,
// r_L = D/2 + (L − 1)(√3/2) d [m]; i gear ratio (> 0); η_g gear efficiency (0, 1];
// P rated power [W] (> 0); N rated speed [rev/min] (> 0). Demand is affine in the rated
// load; zero load with no hook block gives zero demand (evaluated at r_1).
//
// Source: statics of the reeving, drum and gear train (textbook identity); reeving
// efficiency per standards.md "Reeving" (memory, high); design.md "Exact definitions".
func MotorTorque(h Hoist) (Outcome, error) {
	if err := stCheckHoisting(h); err != nil {
		return Outcome{}, err
	}
	if err := stCheckMotor(h); err != nil {
		return Outcome{}, err
	}
	rec := !h.SkipRecord && !h.SkipDetail
	f, etaR, _, steps := stTension(h)
	steps = append(steps, stRadiusSteps(h)...)
	e := float64(h.RopeEnds)
	i, etaG := h.GearRatio, h.GearEff
	best, bestIdx, bestR := -1.0, 0, 0.0
	radii, nr := h.radii()
	for k, r := range radii[:nr] {
		lbl := stRadiusLabel(k)
		md := e * f * r
		mm := md / (i * etaG)
		if rec {
			steps = append(steps,
				stStep("M_d("+lbl+")", "e F "+lbl, "%s × %s × %s", md, "N m", e, f, r),
				stStep("M("+lbl+")", "M_d("+lbl+") / (i η_g)", "%s / (%s × %s)", mm, "N m", md, i, etaG),
			)
		}
		if mm > best {
			best, bestIdx, bestR = mm, k, r
		}
	}
	omega := h.MotorAngularSpeed()
	mr := h.MotorRatedTorqueNm()
	u := best / mr
	if rec {
		steps = append(steps,
			stStep("ω_m", "2π N / 60", "2π × %s / 60", omega, "rad/s", h.MotorSpeedRPM),
			stStep("M_r", "P / ω_m", "%s / %s", mr, "N m", h.MotorPowerW, omega),
			stStep("u", "M / M_r", "%s / %s", u, "1", best, mr),
		)
	}
	if h.SkipDetail {
		return Outcome{Demand: best, Capacity: mr, Unit: "N m", Utilisation: u, Verdict: ByUtilisation}, nil
	}
	o := Outcome{
		Demand:      best,
		Capacity:    mr,
		Unit:        "N m",
		Utilisation: u,
		Verdict:     ByUtilisation,
		Figures: h.Figs.take([]Figure{
			{Name: "rope_tension_n", Value: f, Unit: "N"},
			{Name: "reeving_efficiency", Value: etaR, Unit: "1"},
			{Name: "drum_torque_nm", Value: e * f * bestR, Unit: "N m"},
			{Name: "motor_torque_nm", Value: best, Unit: "N m"},
			{Name: "rated_torque_nm", Value: mr, Unit: "N m"},
			{Name: "radius_m", Value: bestR, Unit: "m"},
		}),
		Steps: steps,
	}
	if bestIdx > 0 {
		o.Note = stOuterNote(h)
	}
	return o, nil
}

// stCheckHoisting validates what the hoisting-torque checks share: load, reeving, drum
// geometry and gear train.
func stCheckHoisting(h Hoist) error {
	if err := stCheckLoad(h); err != nil {
		return err
	}
	if err := h.CheckReeving(); err != nil {
		return err
	}
	if err := stCheckDrum(h); err != nil {
		return err
	}
	return stCheckGear(h)
}

// MotorPower checks the power needed to hoist the rated load at rated speed (check
// motor-power).
//
// Formulas:
//
//	η_h    = η_RD η_g                      hoisting efficiency [1]
//	P(r)   = W v (r / r_1) / η_h           power with the rope at radius r [W]
//	demand = max(P(r_1), P(r_L));  capacity P (rated);  unit "W"
//
// The rated speed v is the first-layer speed; at a constant motor speed the rope (and
// hook) speed rises in proportion to the radius on outer layers. Symbols as in
// MotorTorque; v rated hoist speed [m/s] (> 0). With η_h = 1 and one layer it is the
// textbook steady hoisting power P = m g v / η.
//
// Source: steady hoisting power P = m g v / η (standards.md, textbook identity);
// design.md "Exact definitions".
func MotorPower(h Hoist) (Outcome, error) {
	if err := stCheckHoisting(h); err != nil {
		return Outcome{}, err
	}
	if err := stPositive("motor_power", "motor rated power", "W", h.MotorPowerW); err != nil {
		return Outcome{}, err
	}
	if err := stPositive("hoist_speed", "rated hoist speed", "m/s", h.HoistSpeedMS); err != nil {
		return Outcome{}, err
	}
	w := h.WeightN()
	v := h.HoistSpeedMS
	etaRD := h.RopeSystemEff()
	etaH := etaRD * h.GearEff
	rec := !h.SkipRecord && !h.SkipDetail
	var steps []Step
	if rec {
		steps = []Step{
			stStep("m", "m_L + m_H", "%s + %s", h.MassKg(), "kg", h.RatedLoadKg, h.HookBlockKg),
			stStep("W", "m g", "%s × %s", w, "N", h.MassKg(), h.G),
			stStep("η_RD", "η_R η_s^k", "%s × %s^%s", etaRD, "1", h.ReevingEff(), h.SheaveEff, float64(h.DeflectionSheaves)),
			stStep("η_h", "η_RD η_g", "%s × %s", etaH, "1", etaRD, h.GearEff),
		}
		steps = append(steps, stRadiusSteps(h)...)
	}
	r1 := h.FirstLayerRadiusM()
	best, bestIdx, bestV := -1.0, 0, 0.0
	radii, nr := h.radii()
	for k, r := range radii[:nr] {
		lbl := stRadiusLabel(k)
		vr := v * r / r1
		p := w * vr / etaH
		if rec && k > 0 {
			steps = append(steps, stStep("v("+lbl+")", "v "+lbl+" / r_1", "%s × %s / %s", vr, "m/s", v, r, r1))
		}
		if rec {
			steps = append(steps, stStep("P("+lbl+")", "W v ("+lbl+"/r_1) / η_h", "%s × %s / %s", p, "W", w, vr, etaH))
		}
		if p > best {
			best, bestIdx, bestV = p, k, vr
		}
	}
	u := best / h.MotorPowerW
	if rec {
		steps = append(steps, stStep("u", "P_req / P", "%s / %s", u, "1", best, h.MotorPowerW))
	}
	if h.SkipDetail {
		return Outcome{Demand: best, Capacity: h.MotorPowerW, Unit: "W", Utilisation: u, Verdict: ByUtilisation}, nil
	}
	o := Outcome{
		Demand:      best,
		Capacity:    h.MotorPowerW,
		Unit:        "W",
		Utilisation: u,
		Verdict:     ByUtilisation,
		Figures: h.Figs.take([]Figure{
			{Name: "required_power_w", Value: best, Unit: "W"},
			{Name: "rated_power_w", Value: h.MotorPowerW, Unit: "W"},
			{Name: "hoisting_efficiency", Value: etaH, Unit: "1"},
			{Name: "hook_speed_m_s", Value: bestV, Unit: "m/s"},
		}),
		Steps: steps,
	}
	if bestIdx > 0 {
		o.Note = stOuterNote(h)
	}
	return o, nil
}

// HoistSpeed checks that the declared rated hoisting speed agrees with the drive train
// (check hoist-speed; a data-consistency check, load-independent).
//
// Formulas:
//
//	v_calc = ω_m r_1 / (i n_e),  ω_m = 2πN/60     hook speed on the first layer [m/s]
//	demand |v_calc − v| / v;  capacity the tolerance;  unit "1"
//
// Symbols: N rated motor speed [rev/min] (> 0); r_1 = D/2 [m] (> 0); i gear ratio (> 0);
// n_e = n/e parts per rope end; v declared rated hoist speed [m/s] (> 0); tolerance the
// accepted relative deviation [1] (> 0, 0.10 by default). Figures: calculated_speed_m_s,
// declared_speed_m_s, speed_deviation (signed, (v_calc − v)/v).
//
// Source: kinematics of drum and reeving (textbook identity); tolerance: common practice,
// no published source (standards.md).
func HoistSpeed(h Hoist, tolerance float64) (Outcome, error) {
	if err := h.CheckReeving(); err != nil {
		return Outcome{}, err
	}
	if err := stPositive("drum_diameter", "drum pitch diameter", "m", h.DrumDiameterM); err != nil {
		return Outcome{}, err
	}
	if err := stPositive("gear_ratio", "gear ratio", "", h.GearRatio); err != nil {
		return Outcome{}, err
	}
	if err := stPositive("motor_speed", "motor rated speed", "rev/min", h.MotorSpeedRPM); err != nil {
		return Outcome{}, err
	}
	if err := stPositive("hoist_speed", "rated hoist speed", "m/s", h.HoistSpeedMS); err != nil {
		return Outcome{}, err
	}
	if err := stRule("hoist-speed tolerance", tolerance); err != nil {
		return Outcome{}, err
	}
	omega := h.MotorAngularSpeed()
	r1 := h.FirstLayerRadiusM()
	ne := h.PartsPerEnd()
	vc := omega * r1 / (h.GearRatio * ne)
	v := h.HoistSpeedMS
	dev := (vc - v) / v
	demand := math.Abs(dev)
	u := demand / tolerance
	o := Outcome{
		Demand:      demand,
		Capacity:    tolerance,
		Unit:        "1",
		Utilisation: u,
		Verdict:     ByUtilisation,
		Figures: h.Figs.take([]Figure{
			{Name: "calculated_speed_m_s", Value: vc, Unit: "m/s"},
			{Name: "declared_speed_m_s", Value: v, Unit: "m/s"},
			{Name: "speed_deviation", Value: dev, Unit: "1"},
		}),
	}
	if !h.SkipRecord {
		o.Steps = []Step{
			stStep("ω_m", "2π N / 60", "2π × %s / 60", omega, "rad/s", h.MotorSpeedRPM),
			stStep("r_1", "D / 2", "%s / 2", r1, "m", h.DrumDiameterM),
			stStep("n_e", "n / e", "%s / %s", ne, "1", float64(h.Parts), float64(h.RopeEnds)),
			stStep("v_calc", "ω_m r_1 / (i n_e)", "%s × %s / (%s × %s)", vc, "m/s", omega, r1, h.GearRatio, ne),
			stStep("Δ", "|v_calc − v| / v", "|%s − %s| / %s", demand, "1", vc, v, v),
			stStep("u", "Δ / tolerance", "%s / %s", u, "1", demand, tolerance),
		}
	}
	if h.Layers > 1 {
		o.Note = "speeds are compared on the first layer"
	}
	return o, nil
}

// BrakeHolding checks the holding brakes against the rated-load hoisting torque at the
// point where they act (check brake-holding).
//
// Formulas:
//
//	M_h(r) = e W r / (n η_RD) / (i η_g)     full-load hoisting torque, brake on the motor shaft
//	M_h(r) = e W r / (n η_RD)               full-load hoisting torque, brake on the drum
//	demand = f_b max(M_h(r_1), M_h(r_L))   [N m]
//	capacity = N_b M_b, or M_b when each brake alone must hold;  unit "N m"
//
// "Full-load hoisting torque" is read as the torque the drive delivers to hoist the
// rated load at the brake's shaft, losses included (the larger, conservative reading).
// Symbols as in MotorTorque, plus f_b brake factor from the rules [1] (> 0; 1.25, or 1.0
// with mechanical control braking or with two brakes each holding alone), M_b one
// brake's rated torque [N m] (> 0), N_b number of brakes (≥ 1). The gear ratio and
// efficiency are needed only for a motor-shaft brake. Figures:
// full_load_hoisting_torque_nm (at the governing radius, without f_b), brake_factor,
// brake_capacity_nm, radius_m.
//
// Source: 29 CFR 1910.179(f)(2) (standards.md: law): at least 125 % of the rated-load
// hoisting torque at the point of application, 100 % with mechanical control braking,
// 100 % each when two holding brakes are fitted; ASME B30.2 the same (memory, medium).
func BrakeHolding(h Hoist, factor float64, each bool) (Outcome, error) {
	if err := stCheckLoad(h); err != nil {
		return Outcome{}, err
	}
	if err := h.CheckReeving(); err != nil {
		return Outcome{}, err
	}
	if err := stCheckDrum(h); err != nil {
		return Outcome{}, err
	}
	if !h.BrakeOnDrum {
		if err := stCheckGear(h); err != nil {
			return Outcome{}, err
		}
	}
	if err := stPositive("brake_torque", "brake rated torque", "N m", h.BrakeTorqueNm); err != nil {
		return Outcome{}, err
	}
	if h.Brakes < 1 {
		return Outcome{}, &RangeError{Field: "brakes", Msg: fmt.Sprintf("number of holding brakes must be ≥ 1 (got %d)", h.Brakes)}
	}
	if err := stRule("brake factor", factor); err != nil {
		return Outcome{}, err
	}

	rec := !h.SkipRecord && !h.SkipDetail
	f, _, _, steps := stTension(h)
	steps = append(steps, stRadiusSteps(h)...)
	e := float64(h.RopeEnds)
	best, bestIdx, bestR := -1.0, 0, 0.0
	radii, nr := h.radii()
	for k, r := range radii[:nr] {
		lbl := stRadiusLabel(k)
		md := e * f * r
		mh := md
		if !h.BrakeOnDrum {
			mh = md / (h.GearRatio * h.GearEff)
		}
		switch {
		case rec && h.BrakeOnDrum:
			steps = append(steps, stStep("M_h("+lbl+")", "e F "+lbl, "%s × %s × %s", md, "N m", e, f, r))
		case rec:
			steps = append(steps,
				stStep("M_d("+lbl+")", "e F "+lbl, "%s × %s × %s", md, "N m", e, f, r),
				stStep("M_h("+lbl+")", "M_d("+lbl+") / (i η_g)", "%s / (%s × %s)", mh, "N m", md, h.GearRatio, h.GearEff),
			)
		}
		if mh > best {
			best, bestIdx, bestR = mh, k, r
		}
	}
	demand := factor * best
	capacity := float64(h.Brakes) * h.BrakeTorqueNm
	if each {
		capacity = h.BrakeTorqueNm
	}
	u := demand / capacity
	if rec {
		steps = append(steps, stStep("M_req", "f_b M_h", "%s × %s", demand, "N m", factor, best))
		if each {
			steps = append(steps, stStep("M_cap", "M_b (each brake alone)", "%s", capacity, "N m", h.BrakeTorqueNm))
		} else {
			steps = append(steps, stStep("M_cap", "N_b M_b", "%s × %s", capacity, "N m", float64(h.Brakes), h.BrakeTorqueNm))
		}
		steps = append(steps, stStep("u", "M_req / M_cap", "%s / %s", u, "1", demand, capacity))
	}

	where := "motor shaft"
	if h.BrakeOnDrum {
		where = "drum"
	}
	if h.SkipDetail {
		return Outcome{Demand: demand, Capacity: capacity, Unit: "N m", Utilisation: u, Verdict: ByUtilisation}, nil
	}
	note := "brake on the " + where
	if each && h.Brakes > 1 {
		note += "; each brake alone must hold"
	}
	if bestIdx > 0 {
		note += "; " + stOuterNote(h)
	}
	return Outcome{
		Demand:      demand,
		Capacity:    capacity,
		Unit:        "N m",
		Utilisation: u,
		Verdict:     ByUtilisation,
		Note:        note,
		Figures: h.Figs.take([]Figure{
			{Name: "full_load_hoisting_torque_nm", Value: best, Unit: "N m"},
			{Name: "brake_factor", Value: factor, Unit: "1"},
			{Name: "brake_capacity_nm", Value: capacity, Unit: "N m"},
			{Name: "required_brake_torque_nm", Value: demand, Unit: "N m"},
			{Name: "radius_m", Value: bestR, Unit: "m"},
		}),
		Steps: steps,
	}, nil
}
