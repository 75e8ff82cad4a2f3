// Package calc holds the engineering calculations of hoistfleet: pure functions of one
// hoist's data in SI units (kg, m, s, N, N m, W, rad) and the limits of the rules in
// force. Nothing here reads files, prints or knows about spreadsheets.
//
// Each check function returns an Outcome: demand, capacity, utilisation
// (demand / capacity), the figures it computed and the steps of its calculation (formula,
// numbers substituted, result) so that a calculation record can be printed from it.
//
// Symbols follow the product design: m_L rated load, m_H hook block mass, m = m_L + m_H,
// W = m g; n parts of line, e rope ends on the drum, n_e = n/e; η_s sheave efficiency,
// k deflection sheaves, η_R reeving efficiency, η_D = η_s^k, η_RD = η_R η_D; d rope
// diameter; D drum pitch diameter; L rope layers; r_1 = D/2, r_L = D/2 + (L−1)(√3/2)d;
// i gear ratio (motor speed / drum speed); η_g, η_gb gear efficiency forward and
// back-driving; P, N motor rated power and speed, ω_m = 2πN/60, M_r = P/ω_m; p peak
// torque ratio; J_m motor-shaft inertia; I_d drum inertia; v hoist speed; a design
// acceleration; M_b one brake's torque, N_b brakes, t_s brake delay; f_b brake factor.
package calc

import (
	"fmt"
	"math"
)

// StandardGravity is g_n, the standard acceleration of gravity, 9.80665 m/s² exactly
// (NIST SP 811, appendix B). Every function takes g from Hoist.G so that textbook checks
// can use 9.8 or 9.81.
const StandardGravity = 9.80665

// Hoist is one hoist's data in SI units. A zero value in an optional field means "not
// given" only where the field's comment says so; the caller (package fleet) decides which
// checks can run from which fields are present, and applies defaults before calling.
type Hoist struct {
	G float64 // acceleration of gravity [m/s²]

	// SkipRecord asks the checks not to build Outcome.Steps, the calculation record: the
	// numbers are the same, only the text is not made. Root-finding and bulk runs set it;
	// the calculation record (explain) leaves it false.
	SkipRecord bool
	// SkipDetail asks for the numbers only: Demand, Capacity, Utilisation and Verdict,
	// without Steps, Figures or Note (the dynamics checks honour it; the others may still
	// build figures). The rated-load search sets it: it evaluates a check many times and
	// reads nothing else. The numbers are the same.
	SkipDetail bool
	// Figs keeps the Outcome's figures (see FigureBuf); nil: a slice of their own. Bulk
	// runs give each hoist one; the figures are the same either way.
	Figs *FigureBuf

	RatedLoadKg       float64 // m_L, rated load on the hook [kg]
	HookBlockKg       float64 // m_H, reeved bottom block and hook [kg]
	Parts             int     // n, parts of line carrying the hook block
	RopeEnds          int     // e, rope ends on the drum (1 or 2)
	SheaveEff         float64 // η_s, efficiency per sheave [1]
	DeflectionSheaves int     // k, deflection sheaves in one rope end's path [1]

	RopeDiameterM float64 // d, nominal rope diameter [m]
	RopeMBFN      float64 // minimum breaking force [N]

	DrumDiameterM   float64 // D, drum pitch diameter, first layer [m]
	Layers          int     // L, rope layers at full hoist (≥ 1)
	Grooves         float64 // usable grooves per rope end (0 = not given)
	Grooved         bool    // drum grooved (true) or plain
	LiftHeightM     float64 // H, hook travel [m]
	SheaveDiameterM float64 // smallest running-sheave pitch diameter [m]
	FleetAngleDeg   float64 // largest fleet angle [deg]

	DrumInertiaKgM2 float64 // I_d, drum and its gear wheel about the drum axis [kg m²]
	DrumMassKg      float64 // drum mass for the shaft load [kg]

	GearRatio            float64 // i, motor speed / drum speed [1]
	GearEff              float64 // η_g, forward (hoisting) efficiency [1]
	GearBackEff          float64 // η_gb, back-driving efficiency [1]; ≤ 0 self-locking
	GearboxRatedTorqueNm float64 // rated output (drum-shaft) torque of the gear unit [N m]
	GearboxPeakTorqueNm  float64 // momentary (peak) output torque of the gear unit [N m] (0 = not given)

	MotorPowerW      float64 // P, rated power [W]
	MotorSpeedRPM    float64 // N, rated (full-load) speed [rev/min]
	PeakTorqueRatio  float64 // p, peak torque / rated torque [1] (1.6 for 160 %)
	MotorInertiaKgM2 float64 // J_m, rotor + brake disc + coupling on the motor shaft [kg m²]

	BrakeTorqueNm float64 // M_b, rated torque of one holding brake [N m]
	BrakeOnDrum   bool    // brake acts on the drum (true) or the motor shaft (false)
	Brakes        int     // N_b, number of holding brakes
	BrakeDelayS   float64 // t_s, time from power loss to full brake torque [s]

	ComponentWLLKg float64 // lowest rating of hook, block, trolley or structure [kg] (0 = not given)

	HoistSpeedMS    float64 // v, rated hoisting speed at the first layer [m/s]
	LoweringSpeedMS float64 // rated lowering speed [m/s] (0 = same as hoisting)
	AccelMS2        float64 // a, design hoisting acceleration [m/s²]
}

// WithRatedLoad returns a copy of h with the rated load replaced: the re-rating and the
// maximum-rated-load search evaluate the same hoist at other loads.
func (h Hoist) WithRatedLoad(kg float64) Hoist { h.RatedLoadKg = kg; return h }

// MassKg is m = m_L + m_H [kg].
func (h Hoist) MassKg() float64 { return h.RatedLoadKg + h.HookBlockKg }

// WeightN is W = m g [N].
func (h Hoist) WeightN() float64 { return h.MassKg() * h.G }

// PartsPerEnd is n_e = n / e. Callers must have checked CheckReeving first.
func (h Hoist) PartsPerEnd() float64 { return float64(h.Parts) / float64(h.RopeEnds) }

// CheckReeving reports a RangeError when the reeving is impossible: n < 1, e not 1 or 2,
// n not divisible by e, η_s outside (0, 1], k < 0.
func (h Hoist) CheckReeving() error {
	switch {
	case h.Parts < 1:
		return &RangeError{Field: "parts_of_line", Msg: fmt.Sprintf("parts of line must be ≥ 1 (got %d)", h.Parts)}
	case h.RopeEnds != 1 && h.RopeEnds != 2:
		return &RangeError{Field: "rope_ends", Msg: fmt.Sprintf("rope ends on drum must be 1 or 2 (got %d)", h.RopeEnds)}
	case h.Parts%h.RopeEnds != 0:
		return &RangeError{Field: "parts_of_line", Msg: fmt.Sprintf("%d parts of line cannot be shared by %d rope ends", h.Parts, h.RopeEnds)}
	case !(h.SheaveEff > 0 && h.SheaveEff <= 1):
		return &RangeError{Field: "sheave_efficiency", Msg: fmt.Sprintf("sheave efficiency must be in (0, 1] (got %g)", h.SheaveEff)}
	case h.DeflectionSheaves < 0:
		return &RangeError{Field: "deflection_sheaves", Msg: fmt.Sprintf("deflection sheaves must be ≥ 0 (got %d)", h.DeflectionSheaves)}
	}
	return nil
}

// ReevingEfficiency is η_R = (1 − η_s^n_e) / (n_e (1 − η_s)), the mean part tension over
// the tension at the drum for n_e parts per rope end reeved over sheaves of efficiency
// η_s (geometric series of part tensions; standards.md "Reeving", memory high). It is 1
// for n_e = 1 or η_s = 1. ne ≥ 1, 0 < η_s ≤ 1.
func ReevingEfficiency(etaS float64, ne int) float64 {
	if ne <= 1 || etaS == 1 {
		return 1
	}
	return (1 - math.Pow(etaS, float64(ne))) / (float64(ne) * (1 - etaS))
}

// ReevingEff is η_R for this hoist's n_e and η_s.
func (h Hoist) ReevingEff() float64 {
	return ReevingEfficiency(h.SheaveEff, h.Parts/h.RopeEnds)
}

// DeflectionEff is η_D = η_s^k.
func (h Hoist) DeflectionEff() float64 {
	return math.Pow(h.SheaveEff, float64(h.DeflectionSheaves))
}

// RopeSystemEff is η_RD = η_R η_D.
func (h Hoist) RopeSystemEff() float64 { return h.ReevingEff() * h.DeflectionEff() }

// FirstLayerRadiusM is r_1 = D/2 [m].
func (h Hoist) FirstLayerRadiusM() float64 { return h.DrumDiameterM / 2 }

// OuterLayerRadiusM is r_L = D/2 + (L − 1)(√3/2) d [m], the pitch radius of the outermost
// layer with ideal nesting of each layer in the grooves of the one below. L < 1 counts as 1.
func (h Hoist) OuterLayerRadiusM() float64 {
	l := h.Layers
	if l < 1 {
		l = 1
	}
	return h.DrumDiameterM/2 + float64(l-1)*math.Sqrt(3)/2*h.RopeDiameterM
}

// Radii returns the radii at which torques are evaluated: r_1 and, when L > 1, r_L.
func (h Hoist) Radii() []float64 {
	r, n := h.radii()
	return append([]float64(nil), r[:n]...)
}

// radii is Radii without an allocation: the radii and how many there are (1 or 2).
func (h Hoist) radii() ([2]float64, int) {
	if h.Layers > 1 {
		return [2]float64{h.FirstLayerRadiusM(), h.OuterLayerRadiusM()}, 2
	}
	return [2]float64{h.FirstLayerRadiusM()}, 1
}

// MotorAngularSpeed is ω_m = 2πN/60 [rad/s].
func (h Hoist) MotorAngularSpeed() float64 { return 2 * math.Pi * h.MotorSpeedRPM / 60 }

// MotorRatedTorqueNm is M_r = P / ω_m [N m].
func (h Hoist) MotorRatedTorqueNm() float64 { return h.MotorPowerW / h.MotorAngularSpeed() }

// LoweringSpeed is the lowering speed, or the hoisting speed where none is given [m/s].
func (h Hoist) LoweringSpeed() float64 {
	if h.LoweringSpeedMS > 0 {
		return h.LoweringSpeedMS
	}
	return h.HoistSpeedMS
}

// Verdict tells the caller how to turn an Outcome into a status.
type Verdict int

const (
	// ByUtilisation: pass / marginal / fail from the utilisation and the marginal band.
	ByUtilisation Verdict = iota
	// Info: a hazard figure with no limit; never counts towards the hoist's status.
	Info
	// Fail: fail outright whatever the utilisation (e.g. brakes cannot stop the load).
	Fail
	// Marginal: marginal whatever the utilisation (e.g. fleet angle below the minimum).
	Marginal
	// WithoutBand: pass up to utilisation 1, fail above, no marginal band: a minimum
	// rating that is met is met however closely (a motor rated exactly for its group).
	WithoutBand
)

// Figure is one named result of a check, in SI unless Unit says otherwise. Names are
// stable snake_case (they are JSON keys). A figure that is not a number (a date, say)
// has Text set ("2027-03-01", ISO 8601) and Value NaN.
type Figure struct {
	Name  string
	Value float64
	Unit  string
	Text  string
}

// Step is one line of a calculation record: Symbol = Formula = Numbers = Value Unit.
// Numbers is the formula with the values substituted, as text.
type Step struct {
	Symbol  string
	Formula string
	Numbers string
	Value   float64
	Unit    string
}

// Outcome is what a check computes. Utilisation is Demand / Capacity unless the check's
// doc says otherwise. NaN marks a figure that does not exist (e.g. a stopping distance
// when the brakes cannot stop).
type Outcome struct {
	Demand      float64
	Capacity    float64
	Unit        string // unit of Demand and Capacity ("1" for a ratio)
	Utilisation float64
	Verdict     Verdict
	Note        string // one line for the reader, e.g. "evaluated at the outer layer"
	Figures     []Figure
	Steps       []Step
}

// Figure returns the named figure's value, or NaN.
func (o Outcome) Figure(name string) float64 { return FigureValue(o.Figures, name) }

// FigureValue returns the value of the figure called name in fs, or NaN.
func FigureValue(fs []Figure, name string) float64 {
	for _, f := range fs {
		if f.Name == name {
			return f.Value
		}
	}
	return math.NaN()
}

// RangeError reports input outside the validity of a formula. Field is the schema key
// of the offending input where there is one.
type RangeError struct {
	Field string
	Msg   string
}

func (e *RangeError) Error() string { return e.Msg }
