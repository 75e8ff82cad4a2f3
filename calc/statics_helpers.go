package calc

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// This file holds the small helpers the static checks share: input validation that
// returns a *RangeError naming the schema key, the text of numbers in calculation steps,
// and the rope-tension steps used by several checks. Names carry an "st" prefix so that
// they cannot collide with helpers of the other calc files.

// stNum writes a number for a calculation step: six significant digits, no exponent
// between 1e-4 and 1e9, trailing zeros trimmed ("0.98", "9806.65", "24772.7").
func stNum(x float64) string {
	switch {
	case math.IsNaN(x):
		return "NaN"
	case math.IsInf(x, 1):
		return "∞"
	case math.IsInf(x, -1):
		return "−∞"
	case x == 0:
		return "0"
	}
	ax := math.Abs(x)
	if ax < 1e-4 || ax >= 1e9 {
		return strconv.FormatFloat(x, 'g', 6, 64)
	}
	dec := 5 - int(math.Floor(math.Log10(ax)))
	if dec < 0 {
		dec = 0
	}
	s := strconv.FormatFloat(x, 'f', dec, 64)
	if strings.Contains(s, ".") {
		s = strings.TrimRight(s, "0")
		s = strings.TrimSuffix(s, ".")
	}
	if s == "-0" {
		s = "0"
	}
	return s
}

// stNums formats several numbers for fmt.Sprintf-style substitution.
func stNums(xs ...float64) []any {
	out := make([]any, len(xs))
	for i, x := range xs {
		out[i] = stNum(x)
	}
	return out
}

// stStep builds a Step whose Numbers text is the format with the numbers substituted.
func stStep(symbol, formula, numbersFormat string, value float64, unit string, nums ...float64) Step {
	return Step{
		Symbol:  symbol,
		Formula: formula,
		Numbers: fmt.Sprintf(numbersFormat, stNums(nums...)...),
		Value:   value,
		Unit:    unit,
	}
}

func stFinite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

// stPositive reports a RangeError unless x is finite and > 0.
func stPositive(field, what, unit string, x float64) error {
	if stFinite(x) && x > 0 {
		return nil
	}
	return &RangeError{Field: field, Msg: fmt.Sprintf("%s must be a positive number%s (got %s)", what, stUnitSuffix(unit), stGot(x))}
}

// stNonNegative reports a RangeError unless x is finite and ≥ 0.
func stNonNegative(field, what, unit string, x float64) error {
	if stFinite(x) && x >= 0 {
		return nil
	}
	return &RangeError{Field: field, Msg: fmt.Sprintf("%s must be zero or more%s (got %s)", what, stUnitSuffix(unit), stGot(x))}
}

// stEfficiency reports a RangeError unless 0 < x ≤ 1.
func stEfficiency(field, what string, x float64) error {
	if x > 0 && x <= 1 {
		return nil
	}
	return &RangeError{Field: field, Msg: fmt.Sprintf("%s must be in (0, 1] (got %s)", what, stGot(x))}
}

func stUnitSuffix(unit string) string {
	if unit == "" || unit == "1" {
		return ""
	}
	return " [" + unit + "]"
}

func stGot(x float64) string {
	if math.IsNaN(x) {
		return "no number"
	}
	return stNum(x)
}

// stCheckLoad validates g, the rated load and the hook block mass.
func stCheckLoad(h Hoist) error {
	if !(stFinite(h.G) && h.G > 0) {
		return &RangeError{Field: "", Msg: fmt.Sprintf("acceleration of gravity must be > 0 m/s² (got %s)", stGot(h.G))}
	}
	if err := stNonNegative("rated_load", "rated load", "kg", h.RatedLoadKg); err != nil {
		return err
	}
	return stNonNegative("hook_block_mass", "hook block mass", "kg", h.HookBlockKg)
}

// stCheckDrum validates the drum pitch diameter, the number of layers and, when there is
// more than one layer, the rope diameter that sets the outer-layer radius.
func stCheckDrum(h Hoist) error {
	if err := stPositive("drum_diameter", "drum pitch diameter", "m", h.DrumDiameterM); err != nil {
		return err
	}
	if h.Layers < 1 {
		return &RangeError{Field: "rope_layers", Msg: fmt.Sprintf("rope layers on the drum must be ≥ 1 (got %d)", h.Layers)}
	}
	if h.Layers > 1 {
		if err := stPositive("rope_diameter", "rope diameter (needed for the outer-layer radius)", "m", h.RopeDiameterM); err != nil {
			return err
		}
	}
	return nil
}

// stCheckGear validates the gear ratio and the forward gear efficiency.
func stCheckGear(h Hoist) error {
	if err := stPositive("gear_ratio", "gear ratio", "", h.GearRatio); err != nil {
		return err
	}
	return stEfficiency("gear_efficiency", "gear efficiency", h.GearEff)
}

// stCheckMotor validates the motor's rated power and speed.
func stCheckMotor(h Hoist) error {
	if err := stPositive("motor_power", "motor rated power", "W", h.MotorPowerW); err != nil {
		return err
	}
	return stPositive("motor_speed", "motor rated speed", "rev/min", h.MotorSpeedRPM)
}

// stRule validates a limit taken from the rule table (no schema key).
func stRule(what string, x float64) error {
	if stFinite(x) && x > 0 {
		return nil
	}
	return &RangeError{Field: "", Msg: fmt.Sprintf("rule value %s must be a positive number (got %s): check the rule table", what, stGot(x))}
}

// stTension computes the hoisting tension at the drum per rope end,
// F = W / (n η_R η_D), with the steps that lead to it (nil when h.SkipRecord). h must
// have passed stCheckLoad and CheckReeving.
func stTension(h Hoist) (f float64, etaR, etaD float64, steps []Step) {
	m := h.MassKg()
	w := h.WeightN()
	ne := h.Parts / h.RopeEnds
	etaS := h.SheaveEff
	etaR = h.ReevingEff()
	etaD = h.DeflectionEff()
	etaRD := etaR * etaD
	n := float64(h.Parts)
	f = w / (n * etaRD)
	if h.SkipRecord {
		return f, etaR, etaD, nil
	}

	steps = append(steps,
		stStep("m", "m_L + m_H", "%s + %s", m, "kg", h.RatedLoadKg, h.HookBlockKg),
		stStep("W", "m g", "%s × %s", w, "N", m, h.G),
		stStep("n_e", "n / e", "%s / %s", float64(ne), "1", n, float64(h.RopeEnds)),
	)
	if ne <= 1 || etaS == 1 {
		steps = append(steps, stStep("η_R", "(1 − η_s^n_e) / (n_e (1 − η_s))", "1 (n_e = %s, η_s = %s)", etaR, "1", float64(ne), etaS))
	} else {
		steps = append(steps, stStep("η_R", "(1 − η_s^n_e) / (n_e (1 − η_s))", "(1 − %s^%s) / (%s (1 − %s))", etaR, "1",
			etaS, float64(ne), float64(ne), etaS))
	}
	steps = append(steps,
		stStep("η_D", "η_s^k", "%s^%s", etaD, "1", etaS, float64(h.DeflectionSheaves)),
		stStep("η_RD", "η_R η_D", "%s × %s", etaRD, "1", etaR, etaD),
		stStep("F", "W / (n η_RD)", "%s / (%s × %s)", f, "N", w, n, etaRD),
	)
	return f, etaR, etaD, steps
}

// stRadiusLabel names a radius for steps and notes: r_1 for the first layer, r_L for
// the outer one.
func stRadiusLabel(i int) string {
	if i == 0 {
		return "r_1"
	}
	return "r_L"
}

// stRadiusSteps returns the steps that give r_1 and, with more than one layer, r_L
// (nil when h.SkipRecord).
func stRadiusSteps(h Hoist) []Step {
	if h.SkipRecord {
		return nil
	}
	steps := []Step{stStep("r_1", "D / 2", "%s / 2", h.FirstLayerRadiusM(), "m", h.DrumDiameterM)}
	if h.Layers > 1 {
		steps = append(steps, stStep("r_L", "D/2 + (L − 1)(√3/2) d", "%s/2 + (%s − 1) × 0.866025 × %s",
			h.OuterLayerRadiusM(), "m", h.DrumDiameterM, float64(h.Layers), h.RopeDiameterM))
	}
	return steps
}

// stOuterNote is the Note of a check whose demand is largest on the outer layer.
func stOuterNote(h Hoist) string {
	return "outer layer governs: evaluated at r_L = " + stNum(h.OuterLayerRadiusM()) + " m (layer " + strconv.Itoa(h.Layers) +
		", ideal nesting) against r_1 = " + stNum(h.FirstLayerRadiusM()) + " m"
}

// stUtilisation is demand / capacity with the limits spelled out: 0/0 is 0 (nothing
// asked of nothing), d/0 with d > 0 is +Inf.
func stUtilisation(demand, capacity float64) float64 {
	if demand == 0 {
		return 0
	}
	if capacity == 0 {
		return math.Inf(1)
	}
	return demand / capacity
}
