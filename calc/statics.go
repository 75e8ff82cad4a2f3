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
	// The power needs the load, the reeving, the drum's radii and the gear efficiency;
	// not the gear ratio, which the power does not depend on.
	if err := stCheckLoad(h); err != nil {
		return Outcome{}, err
	}
	if err := h.CheckReeving(); err != nil {
		return Outcome{}, err
	}
	if err := stCheckDrum(h); err != nil {
		return Outcome{}, err
	}
	if err := stEfficiency("gear_efficiency", "gear efficiency", h.GearEff); err != nil {
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

// BrakeRule is the holding-brake rule in force for one hoist (rule ids brake.*).
type BrakeRule struct {
	// Factor f_b (> 0) multiplies the static torque T_s when Static, the hoisting torque
	// T_h otherwise (rule brake.basis).
	Factor float64
	Static bool
	// Each: the factor applies to each brake alone (capacity M_b), else to all together
	// (N_b M_b) (rule brake.each).
	Each bool
	// EachFactor f_each (rule brake.each_factor): with N_b ≥ 2, each brake alone must
	// also hold f_each T_h; 0 for no such rule.
	EachFactor float64
	// ControlBrakingCite, when set, says the rules require a control braking means that
	// the register says the hoist lacks (rule brake.needs_control_braking): the check
	// fails unless the gear train is self-locking (η_gb ≤ 0). The text is the citation.
	ControlBrakingCite string
	// MinBrakes (rule brake.min_brakes, 0 for none): fewer holding brakes fail the check,
	// citing MinBrakesCite.
	MinBrakes     int
	MinBrakesCite string
}

// BrakeHolding checks the holding brakes against the rated-load torque at the point
// where they act (check brake-holding; design.md Revision 2, "Holding brake").
//
// Formulas:
//
//	T_h(r) = e W r / (n η_RD) / (i η_g)   hoisting torque, losses included, motor-shaft brake
//	T_s(r) = e W r / n / i                static torque, no losses, motor-shaft brake
//	(drum brake: without / (i η_g) and / i)
//	u_all  = f_b T_basis / (N_b M_b),  or f_b T_basis / M_b where the rule says each
//	u_each = f_each T_h / M_b          with N_b ≥ 2 (each brake alone)
//	u = max(u_all, u_each), at the larger radius (r_L: the torques grow with r)
//
// Demand and Capacity are those of the governing term (f_b T_basis against N_b M_b or
// M_b; f_each T_h against M_b), unit "N m". Symbols as in MotorTorque, plus f_b brake
// factor [1] (> 0), f_each each-brake factor [1] (≥ 0), M_b one brake's rated torque
// [N m] (> 0), N_b number of brakes (≥ 1). The gear ratio and efficiency are needed only
// for a motor-shaft brake. Both torques grow in proportion to W, so u is affine in the
// rated load (the rating search's closed form holds).
//
// Fails outright, whatever the utilisation: a hoist the rules require to have a
// control braking means that has none and whose gear train is not self-locking
// (29 CFR 1910.179(f)(1)(ii); Cal. Code Regs. tit. 8 §4898(b): law, read), and fewer
// holding brakes than the rules require (hot metal with power control braking: two,
// Cal. Code Regs. tit. 8 §4898(h): law, read).
//
// Figures: full_load_hoisting_torque_nm (T_h), static_torque_nm (T_s), brake_factor,
// brake_capacity_nm (N_b M_b), required_brake_torque_nm (f_b T_basis), radius_m, and
// each_brake_utilisation (u_each) with two or more brakes.
//
// Sources: 29 CFR 1910.179(f)(2) and Cal. Code Regs. tit. 8 §4898(c) (law, read): at
// least 125 % of the full-load hoisting torque at the point where the brake is applied,
// 100 % with mechanical control braking, 100 % each when two holding brakes are fitted;
// 2006/42/EC Annex I 4.1.2.3 static test coefficient 1.25 (memory, high) on T_s; EN
// 14492-2 1.6 (memory, low: a review limit) on T_h. The factors are rule values.
func BrakeHolding(h Hoist, rule BrakeRule) (Outcome, error) {
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
	if err := stRule("brake factor", rule.Factor); err != nil {
		return Outcome{}, err
	}
	if !(rule.EachFactor >= 0) || math.IsInf(rule.EachFactor, 0) {
		return Outcome{}, &RangeError{Field: "", Msg: fmt.Sprintf("rule value each-brake factor must be ≥ 0 (got %s): check the rule table", stGot(rule.EachFactor))}
	}

	rec := !h.SkipRecord && !h.SkipDetail
	f, _, _, steps := stTension(h)
	steps = append(steps, stRadiusSteps(h)...)
	if !rec {
		steps = nil
	}
	e := float64(h.RopeEnds)
	n := float64(h.Parts)
	w := h.WeightN()
	th, ts, bestIdx, bestR := -1.0, 0.0, 0, 0.0
	radii, nr := h.radii()
	for k, r := range radii[:nr] {
		lbl := stRadiusLabel(k)
		mh, ms := e*f*r, e*w*r/n
		if !h.BrakeOnDrum {
			mh, ms = mh/(h.GearRatio*h.GearEff), ms/h.GearRatio
		}
		switch {
		case rec && h.BrakeOnDrum:
			steps = append(steps,
				stStep("T_h("+lbl+")", "e F "+lbl+" (hoisting torque at the drum)", "%s × %s × %s", mh, "N m", e, f, r),
				stStep("T_s("+lbl+")", "e W "+lbl+" / n (static torque at the drum)", "%s × %s × %s / %s", ms, "N m", e, w, r, n))
		case rec:
			steps = append(steps,
				stStep("T_h("+lbl+")", "e F "+lbl+" / (i η_g)", "%s × %s × %s / (%s × %s)", mh, "N m", e, f, r, h.GearRatio, h.GearEff),
				stStep("T_s("+lbl+")", "e W "+lbl+" / (n i)", "%s × %s × %s / (%s × %s)", ms, "N m", e, w, r, n, h.GearRatio))
		}
		if mh > th {
			th, ts, bestIdx, bestR = mh, ms, k, r
		}
	}
	basis, basisSym := th, "T_h"
	if rule.Static {
		basis, basisSym = ts, "T_s"
	}
	demand := rule.Factor * basis
	capacity := float64(h.Brakes) * h.BrakeTorqueNm
	if rule.Each {
		capacity = h.BrakeTorqueNm
	}
	u := demand / capacity
	uEach := math.NaN()
	if h.Brakes >= 2 && rule.EachFactor > 0 {
		uEach = rule.EachFactor * th / h.BrakeTorqueNm
	}
	if rec {
		steps = append(steps, stStep("M_req", "f_b "+basisSym, "%s × %s", demand, "N m", rule.Factor, basis))
		if rule.Each {
			steps = append(steps, stStep("M_cap", "M_b (each brake alone)", "%s", capacity, "N m", h.BrakeTorqueNm))
		} else {
			steps = append(steps, stStep("M_cap", "N_b M_b", "%s × %s", capacity, "N m", float64(h.Brakes), h.BrakeTorqueNm))
		}
		steps = append(steps, stStep("u_all", "M_req / M_cap", "%s / %s", u, "1", demand, capacity))
		if !math.IsNaN(uEach) {
			steps = append(steps, stStep("u_each", "f_each T_h / M_b (each brake alone)", "%s × %s / %s", uEach, "1", rule.EachFactor, th, h.BrakeTorqueNm))
		}
	}
	util := u
	eachGoverns := !math.IsNaN(uEach) && uEach > u
	if eachGoverns {
		util, demand, capacity = uEach, rule.EachFactor*th, h.BrakeTorqueNm
	}
	if rec && !math.IsNaN(uEach) {
		steps = append(steps, stStep("u", "max(u_all, u_each)", "max(%s, %s)", util, "1", u, uEach))
	}

	verdict := ByUtilisation
	var fails []string
	if rule.ControlBrakingCite != "" && h.GearBackEff > 0 {
		verdict = Fail
		fails = append(fails, "no control braking means, and the gear train is not self-locking: every hoisting unit except a self-locking worm-geared one needs one besides the holding brake ("+rule.ControlBrakingCite+")")
	}
	if rule.MinBrakes > 0 && h.Brakes < rule.MinBrakes {
		verdict = Fail
		fails = append(fails, fmt.Sprintf("%d holding brake(s), the rules require at least %d (%s)", h.Brakes, rule.MinBrakes, rule.MinBrakesCite))
	}
	if h.SkipDetail {
		return Outcome{Demand: demand, Capacity: capacity, Unit: "N m", Utilisation: util, Verdict: verdict}, nil
	}
	note := brakeNotes[0]
	switch {
	case h.BrakeOnDrum && rule.Static:
		note = brakeNotes[3]
	case h.BrakeOnDrum:
		note = brakeNotes[2]
	case rule.Static:
		note = brakeNotes[1]
	}
	switch {
	case eachGoverns:
		note += "; each brake alone must hold f_each T_h, which governs"
	case rule.Each && h.Brakes > 1:
		note += "; each brake alone must hold"
	}
	if bestIdx > 0 {
		note += "; " + stOuterNote(h)
	}
	for _, f := range fails {
		note += "; FAIL: " + f
	}
	return Outcome{
		Demand:      demand,
		Capacity:    capacity,
		Unit:        "N m",
		Utilisation: util,
		Verdict:     verdict,
		Note:        note,
		Figures:     h.Figs.take(brakeFigures(th, ts, rule.Factor, float64(h.Brakes)*h.BrakeTorqueNm, rule.Factor*basis, uEach, bestR)),
		Steps:       steps,
	}, nil
}

// brakeNotes are the notes every BrakeHolding result starts with (made once).
var brakeNotes = [4]string{
	"brake on the motor shaft; factor on the hoisting torque T_h (losses included)",
	"brake on the motor shaft; factor on the static torque T_s (no losses)",
	"brake on the drum; factor on the hoisting torque T_h (losses included)",
	"brake on the drum; factor on the static torque T_s (no losses)",
}

// brakeFigures are BrakeHolding's figures; each_brake_utilisation only where the
// each-brake rule applies (two or more brakes).
func brakeFigures(th, ts, factor, capacity, required, uEach, r float64) []Figure {
	fs := []Figure{
		{Name: "full_load_hoisting_torque_nm", Value: th, Unit: "N m"},
		{Name: "static_torque_nm", Value: ts, Unit: "N m"},
		{Name: "brake_factor", Value: factor, Unit: "1"},
		{Name: "brake_capacity_nm", Value: capacity, Unit: "N m"},
		{Name: "required_brake_torque_nm", Value: required, Unit: "N m"},
		{Name: "radius_m", Value: r, Unit: "m"},
	}
	if !math.IsNaN(uEach) {
		fs = append(fs, Figure{Name: "each_brake_utilisation", Value: uEach, Unit: "1"})
	}
	return fs
}
