package calc

import (
	"fmt"
	"math"
	"strings"
	"time"
)

// wearInch is the inch in metres, exactly (NIST SP 811, appendix B).
const wearInch = 0.0254

// asmeB302Bands is the ASME B30.2-2005 table of maximum allowable reduction of a running
// rope's diameter from nominal: up to and including the nominal diameter (in), the
// reduction (in) (standards.md, seen).
var asmeB302Bands = [...]struct{ upTo, reduction float64 }{
	{5.0 / 16, 1.0 / 64},
	{1.0 / 2, 1.0 / 32},
	{3.0 / 4, 3.0 / 64},
	{9.0 / 8, 1.0 / 16},
	{3.0 / 2, 3.0 / 32},
}

// AsmeB302DiameterBand returns the ASME B30.2-2005 maximum allowable reduction of a rope's
// diameter from its nominal diameter, in metres: nominal ≤ 5/16 in: 1/64 in; ≤ 1/2 in:
// 1/32 in; ≤ 3/4 in: 3/64 in; ≤ 1-1/8 in: 1/16 in; ≤ 1-1/2 in: 3/32 in, with
// in = 0.0254 m exactly (NIST SP 811). A diameter within one part in 10⁹ of a band edge
// counts as on it (the edge belongs to the smaller band), so that 8 mm-style conversions
// do not cross an edge by rounding. ok is false for a nominal ≤ 0 or above 1-1/2 in, which
// the table does not cover. Source: ASME B30.2-2005 (standards.md, seen); later editions
// use a flat 5 % (memory, low-medium). This is the published table, for tests; the rule
// table carries the same bands for use.
func AsmeB302DiameterBand(nominalM float64) (maxReductionM float64, ok bool) {
	if !(nominalM > 0) {
		return 0, false
	}
	in := nominalM / wearInch
	for _, b := range asmeB302Bands {
		if in <= b.upTo*(1+dutyLimitTol) {
			return b.reduction * wearInch, true
		}
	}
	return 0, false
}

// Iso4309UniformDecrease returns the ISO 4309:2010 uniform decrease in diameter at which a
// rope running on a single-layer drum is discarded, as a fraction of its reference
// diameter, by rope category: "fibre core" 0.10, "steel core" 0.075, "rotation resistant"
// 0.05 (the categories calc.RopeCategory returns; case and surrounding space ignored).
// ok is false for any other category. Source: ISO 4309:2010 (standards.md, memory
// medium); the percentages apply to the reference diameter of the new rope after bedding
// in, not to nominal (memory, medium-high).
func Iso4309UniformDecrease(category string) (fraction float64, ok bool) {
	switch strings.ToLower(strings.TrimSpace(category)) {
	case "fibre core":
		return 0.10, true
	case "steel core":
		return 0.075, true
	case "rotation resistant":
		return 0.05, true
	}
	return 0, false
}

// WearInput is what the rope-wear check needs. Lengths in metres.
type WearInput struct {
	NominalM   float64 // nominal rope diameter d [m], > 0
	ReferenceM float64 // reference diameter of the new rope after bedding in [m]; 0 = not given
	MeasuredM  float64 // smallest measured diameter at the last inspection [m]; 0 = not measured

	// MaxReductionM is an absolute discard limit on the reduction from nominal (the ASME
	// B30.2 bands) [m]; 0 = not used.
	MaxReductionM float64
	// MaxReductionFraction is a discard limit as a fraction of the reference diameter, or
	// of nominal when no reference is given (ISO 4309 percentages); 0 = not used.
	MaxReductionFraction float64

	// BrokenWires is the most broken wires found in one rope lay (< 0 = not counted);
	// MaxBrokenWires the discard count (≤ 0 = no criterion).
	BrokenWires, MaxBrokenWires int
	// StrandBrokenWires is the most broken wires found in one strand in one lay (< 0 = not
	// counted); MaxStrandBrokenWires its discard count (≤ 0 = no criterion).
	StrandBrokenWires, MaxStrandBrokenWires int

	// SkipRecord: do not build Outcome.Steps (the calculation record); same numbers.
	SkipRecord bool
	// Figs keeps the figures (see FigureBuf); nil: a slice of their own.
	Figs *FigureBuf

	// Fitted is the date the rope was installed and AsOf the run's date (zero = unknown);
	// they only give the rope's age.
	Fitted, AsOf time.Time
}

// RopeWear is the rope-wear check: the rope's condition against the discard criteria of
// the rules in force.
//
// Diameter (when MeasuredM is given): each limit in force gives a reduction and a limit,
//
//	absolute (MaxReductionM):        reduction = max(0, d_nom − d_meas),  limit = MaxReductionM
//	fraction (MaxReductionFraction): reduction = max(0, d_ref − d_meas),  limit = fraction · d_ref
//
// with d_ref the reference diameter, or the nominal diameter when none is given (said in
// Note: ISO 4309 measures the decrease from the reference diameter, which a new rope
// exceeds nominal by its manufacturing tolerance). A measured diameter above the base
// diameter is no reduction. The governing diameter criterion is the one with the larger
// reduction / limit; its reduction and limit are the Outcome's demand and capacity [m].
//
// Broken wires (when BrokenWires ≥ 0 and MaxBrokenWires > 0): u_lay = broken in one lay /
// its discard count; in one strand (StrandBrokenWires ≥ 0 and MaxStrandBrokenWires > 0):
// u_strand = broken in one strand in one lay / its discard count (ASME B30.2 and B30.16
// running ropes: 12 in one lay or 4 in one strand in one lay, whichever is reached first);
// u_bw = max(u_lay, u_strand). A count at its discard count fails (Verdict Fail): the rope
// is removed when the count is reached, not only when it is exceeded.
//
//	utilisation = max(diameter utilisation, u_bw)
//
// With broken wires governing, demand and capacity are the governing count and its discard
// count, unit "1", so that utilisation = demand / capacity; with broken wires only (no
// measurement or no diameter limit) likewise. Discard limits come from the caller's rules (ASME B30.2-2005 bands:
// AsmeB302DiameterBand; ISO 4309:2010 percentages: Iso4309UniformDecrease; broken wires
// B30.2 / B30.16 12 per lay, B30.7 6; standards.md).
//
// Figures: reduction_m, reduction_fraction (reduction / its base diameter), base_diameter_m,
// discard_diameter_m (the measured diameter at which the governing limit is reached),
// diameter_utilisation, broken_wires_utilisation (u_lay), strand_broken_wires_utilisation
// (u_strand), rope_age_years (days / 365.2425; NaN
// when a date is missing or the rope was fitted after AsOf). NaN marks a figure that was
// not evaluated.
//
// It returns a *RangeError for a nominal diameter ≤ 0, a negative input, a reduction
// fraction ≥ 1, a reference diameter or a measured diameter more than 25 % above nominal
// (a unit slip, not a rope), or when no criterion can be evaluated.
func RopeWear(in WearInput) (Outcome, error) {
	if err := in.validate(); err != nil {
		return Outcome{}, err
	}
	var notes []string
	uD, uBW := math.NaN(), math.NaN()
	red, frac, base, discard := math.NaN(), math.NaN(), math.NaN(), math.NaN()
	var demand, capacity float64
	unit := "m"
	var steps []Step
	rec := !in.SkipRecord

	hasDia := in.MeasuredM > 0 && (in.MaxReductionM > 0 || in.MaxReductionFraction > 0)
	hasLay := in.BrokenWires >= 0 && in.MaxBrokenWires > 0
	hasStrand := in.StrandBrokenWires >= 0 && in.MaxStrandBrokenWires > 0
	hasBW := hasLay || hasStrand
	uLay, uStrand := math.NaN(), math.NaN()

	if hasDia {
		dm := in.MeasuredM
		if in.MaxReductionM > 0 {
			r := math.Max(0, in.NominalM-dm)
			u := r / in.MaxReductionM
			if rec {
				steps = append(steps,
					Step{Symbol: "Δd_nom", Formula: "max(0, d_nom − d_meas)", Numbers: fmt.Sprintf("max(0, %s − %s)", wearMM(in.NominalM), wearMM(dm)), Value: r, Unit: "m"},
					Step{Symbol: "u_abs", Formula: "Δd_nom / limit", Numbers: fmt.Sprintf("%s / %s", wearMM(r), wearMM(in.MaxReductionM)), Value: u, Unit: "1"})
			}
			uD, red, base, demand, capacity = u, r, in.NominalM, r, in.MaxReductionM
		}
		if in.MaxReductionFraction > 0 {
			b := in.ReferenceM
			if b <= 0 {
				b = in.NominalM
				notes = append(notes, "no reference diameter: the percentage decrease is taken from nominal (ISO 4309 measures it from the reference diameter)")
			}
			r := math.Max(0, b-dm)
			lim := in.MaxReductionFraction * b
			u := r / lim
			if rec {
				steps = append(steps,
					Step{Symbol: "Δd_ref", Formula: "max(0, d_ref − d_meas)", Numbers: fmt.Sprintf("max(0, %s − %s)", wearMM(b), wearMM(dm)), Value: r, Unit: "m"},
					Step{Symbol: "limit", Formula: "fraction · d_ref", Numbers: fmt.Sprintf("%s · %s", dutyNum(in.MaxReductionFraction), wearMM(b)), Value: lim, Unit: "m"},
					Step{Symbol: "u_frac", Formula: "Δd_ref / limit", Numbers: fmt.Sprintf("%s / %s", wearMM(r), wearMM(lim)), Value: u, Unit: "1"})
			}
			if math.IsNaN(uD) || u > uD {
				uD, red, base, demand, capacity = u, r, b, r, lim
			}
		}
		frac = red / base
		discard = base - capacity
		if in.MeasuredM > base {
			notes = append(notes, "measured diameter above the base diameter: no reduction")
		}
	} else if in.MeasuredM > 0 {
		notes = append(notes, "no diameter discard limit in the rules: diameter not assessed")
	} else {
		notes = append(notes, "no measured diameter: diameter not assessed")
	}

	// The governing broken-wire count and its discard count, and where they were counted.
	var bwN, bwMax int
	bwWhere := ""
	if (in.BrokenWires > 0 && in.MaxBrokenWires <= 0) || (in.StrandBrokenWires > 0 && in.MaxStrandBrokenWires <= 0) {
		notes = append(notes, "broken wires counted per lay or per strand not assessed: the rules give no such count for this rope")
	}
	if hasLay {
		uLay = float64(in.BrokenWires) / float64(in.MaxBrokenWires)
		uBW, bwN, bwMax, bwWhere = uLay, in.BrokenWires, in.MaxBrokenWires, "in one lay"
		if rec {
			steps = append(steps, Step{Symbol: "u_lay", Formula: "broken wires in one lay / discard count", Numbers: fmt.Sprintf("%d / %d", in.BrokenWires, in.MaxBrokenWires), Value: uLay, Unit: "1"})
		}
	}
	if hasStrand {
		uStrand = float64(in.StrandBrokenWires) / float64(in.MaxStrandBrokenWires)
		if rec {
			steps = append(steps, Step{Symbol: "u_strand", Formula: "broken wires in one strand in one lay / discard count", Numbers: fmt.Sprintf("%d / %d", in.StrandBrokenWires, in.MaxStrandBrokenWires), Value: uStrand, Unit: "1"})
		}
		if math.IsNaN(uBW) || uStrand > uBW {
			uBW, bwN, bwMax, bwWhere = uStrand, in.StrandBrokenWires, in.MaxStrandBrokenWires, "in one strand in one lay"
		}
	}

	var u float64
	bwGovern := false
	switch {
	case hasDia && hasBW:
		u = math.Max(uD, uBW)
		bwGovern = uBW > uD
	case hasDia:
		u = uD
	default: // broken wires only
		u, bwGovern = uBW, true
	}
	verdict := ByUtilisation
	if bwGovern {
		// Report what governs, so that utilisation = demand / capacity.
		demand, capacity, unit = float64(bwN), float64(bwMax), "1"
		note := fmt.Sprintf("broken wires %s govern (%d of %d)", bwWhere, bwN, bwMax)
		if bwN >= bwMax {
			// The rope is removed when the count is reached (ASME B30.2 / B30.16: "twelve
			// … in one lay or four … in one strand"), not only when it is exceeded.
			verdict = Fail
			note += ": the discard count is reached"
		}
		notes = append(notes, note)
	}

	age := math.NaN()
	if !in.Fitted.IsZero() && !in.AsOf.IsZero() {
		f, a := lifeDay(in.Fitted), lifeDay(in.AsOf)
		if days := lifeDaysBetween(f, a); days >= 0 {
			age = float64(days) / 365.2425
		} else {
			notes = append(notes, fmt.Sprintf("rope fitted %s, after the as-of date %s: age unknown", lifeISO(f), lifeISO(a)))
		}
	}

	return Outcome{
		Demand:      demand,
		Capacity:    capacity,
		Unit:        unit,
		Utilisation: u,
		Verdict:     verdict,
		Note:        strings.Join(notes, "; "),
		Figures: in.Figs.take([]Figure{
			{Name: "reduction_m", Value: red, Unit: "m"},
			{Name: "reduction_fraction", Value: frac, Unit: "1"},
			{Name: "base_diameter_m", Value: base, Unit: "m"},
			{Name: "discard_diameter_m", Value: discard, Unit: "m"},
			{Name: "diameter_utilisation", Value: uD, Unit: "1"},
			{Name: "broken_wires_utilisation", Value: uLay, Unit: "1"},
			{Name: "strand_broken_wires_utilisation", Value: uStrand, Unit: "1"},
			{Name: "rope_age_years", Value: age, Unit: "a"},
		}),
		Steps: steps,
	}, nil
}

func (in WearInput) validate() error {
	finite := func(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
	switch {
	case !(in.NominalM > 0) || !finite(in.NominalM):
		return &RangeError{Field: "rope_diameter", Msg: fmt.Sprintf("nominal rope diameter must be > 0 (got %s m)", dutyNum(in.NominalM))}
	case !(in.ReferenceM >= 0) || !finite(in.ReferenceM):
		return &RangeError{Field: "rope_reference_diameter", Msg: fmt.Sprintf("reference diameter must be ≥ 0 (got %s m)", dutyNum(in.ReferenceM))}
	case in.ReferenceM > 1.25*in.NominalM || (in.ReferenceM > 0 && in.ReferenceM < 0.75*in.NominalM):
		return &RangeError{Field: "rope_reference_diameter", Msg: fmt.Sprintf("reference diameter %s is not within 25 %% of nominal %s", wearMM(in.ReferenceM), wearMM(in.NominalM))}
	case !(in.MeasuredM >= 0) || !finite(in.MeasuredM):
		return &RangeError{Field: "rope_measured_diameter", Msg: fmt.Sprintf("measured diameter must be ≥ 0 (got %s m)", dutyNum(in.MeasuredM))}
	case in.MeasuredM > 1.25*in.NominalM:
		return &RangeError{Field: "rope_measured_diameter", Msg: fmt.Sprintf("measured diameter %s is more than 25 %% above nominal %s", wearMM(in.MeasuredM), wearMM(in.NominalM))}
	case !(in.MaxReductionM >= 0) || !finite(in.MaxReductionM):
		return &RangeError{Msg: fmt.Sprintf("diameter reduction limit must be ≥ 0 (got %s m)", dutyNum(in.MaxReductionM))}
	case !(in.MaxReductionFraction >= 0 && in.MaxReductionFraction < 1):
		return &RangeError{Msg: fmt.Sprintf("diameter reduction fraction must be in [0, 1) (got %s)", dutyNum(in.MaxReductionFraction))}
	}
	if in.BrokenWires >= 0 && in.StrandBrokenWires > in.BrokenWires {
		return &RangeError{Field: "rope_broken_wires_strand", Msg: fmt.Sprintf("%d broken wires in one strand, more than the %d counted in the whole lay (which includes them): check the counts", in.StrandBrokenWires, in.BrokenWires)}
	}
	hasDia := in.MeasuredM > 0 && (in.MaxReductionM > 0 || in.MaxReductionFraction > 0)
	hasBW := in.BrokenWires >= 0 && in.MaxBrokenWires > 0 || in.StrandBrokenWires >= 0 && in.MaxStrandBrokenWires > 0
	if !hasDia && !hasBW {
		switch {
		case in.BrokenWires > 0 || in.StrandBrokenWires > 0:
			return &RangeError{Field: "rope_measured_diameter", Msg: "the rules in force give no discard count for broken wires counted per lay or per strand on this rope (rotation-resistant rope is judged per 6 and 30 rope diameters), and no diameter was measured: measure the diameter"}
		case in.MeasuredM > 0:
			return &RangeError{Msg: "no discard criterion in the rules for the rope's diameter or broken wires"}
		default:
			return &RangeError{Field: "rope_measured_diameter", Msg: "no measured diameter or broken-wire count to assess the rope by"}
		}
	}
	return nil
}

// wearMM formats a length given in metres as millimetres for the record.
func wearMM(m float64) string { return dutyNum(m*1000) + " mm" }
