package calc_test

import (
	"math"
	"strconv"
	"strings"
	"testing"
	"time"

	"hoistfleet/calc"
	"hoistfleet/calc/approx"
)

// inch is 0.0254 m exactly (NIST SP 811, appendix B; standards.md "Units").
const inch = 0.0254

func TestAsmeB302DiameterBand(t *testing.T) {
	// standards.md: ASME B30.2-2005 maximum reduction from nominal (seen): ≤ 5/16 in:
	// 1/64 in; ≤ 1/2 in: 1/32 in; ≤ 3/4 in: 3/64 in; ≤ 1-1/8 in: 1/16 in; ≤ 1-1/2 in:
	// 3/32 in. Each edge belongs to the band below it; just above, the next band applies.
	edges := []struct {
		upToIn, reductionIn float64
	}{
		{5.0 / 16, 1.0 / 64},
		{1.0 / 2, 1.0 / 32},
		{3.0 / 4, 3.0 / 64},
		{1 + 1.0/8, 1.0 / 16},
		{1 + 1.0/2, 3.0 / 32},
	}
	for i, e := range edges {
		got, ok := calc.AsmeB302DiameterBand(e.upToIn * inch)
		if !ok || !approxEqual(got, e.reductionIn*inch, 0, 1e-12) {
			t.Errorf("band at %v in = %v m (ok %v), want %v in = %v m", e.upToIn, got, ok, e.reductionIn, e.reductionIn*inch)
		}
		above := e.upToIn*inch + 1e-6 // 1 µm above the edge
		got, ok = calc.AsmeB302DiameterBand(above)
		if i+1 < len(edges) {
			if !ok || !approxEqual(got, edges[i+1].reductionIn*inch, 0, 1e-12) {
				t.Errorf("band just above %v in = %v m (ok %v), want %v in", e.upToIn, got, ok, edges[i+1].reductionIn)
			}
		} else if ok {
			t.Errorf("band above 1-1/2 in = %v, ok; want ok = false (outside the table)", got)
		}
	}
	tests := []struct {
		name   string
		d      float64
		wantIn float64
		wantOK bool
	}{
		// 12.7 mm written in millimetres is 1/2 in (NIST SP 811: 25.4 mm exactly): on the
		// edge despite the mm → m rounding.
		{"12.7 mm", 12.7 * 0.001, 1.0 / 32, true},
		// 8 mm = 0.315 in > 5/16 in = 0.3125 in: the 1/32 in band.
		{"8 mm", 0.008, 1.0 / 32, true},
		{"1/4 in", 0.25 * inch, 1.0 / 64, true},
		{"1 in", inch, 1.0 / 16, true},
		{"2 in", 2 * inch, 0, false},
		{"zero", 0, 0, false},
		{"negative", -0.01, 0, false},
		{"NaN", math.NaN(), 0, false},
	}
	for _, tt := range tests {
		got, ok := calc.AsmeB302DiameterBand(tt.d)
		if ok != tt.wantOK || (ok && !approxEqual(got, tt.wantIn*inch, 0, 1e-12)) {
			t.Errorf("%s: AsmeB302DiameterBand(%v) = %v, %v; want %v in, %v", tt.name, tt.d, got, ok, tt.wantIn, tt.wantOK)
		}
	}
}

func TestIso4309UniformDecrease(t *testing.T) {
	// standards.md: ISO 4309:2010 uniform decrease at discard, single layer: fibre core
	// 10 %, steel core 7.5 %, rotation resistant 5 % (memory, medium).
	for _, tt := range []struct {
		cat  string
		want float64
		ok   bool
	}{
		{"fibre core", 0.10, true},
		{"steel core", 0.075, true},
		{"Rotation Resistant ", 0.05, true},
		{"", 0, false},
		{"6x36 IWRC", 0, false},
	} {
		got, ok := calc.Iso4309UniformDecrease(tt.cat)
		if ok != tt.ok || !approxEqual(got, tt.want, 0, 1e-15) {
			t.Errorf("Iso4309UniformDecrease(%q) = %v, %v; want %v, %v", tt.cat, got, ok, tt.want, tt.ok)
		}
	}
}

func TestRopeWear(t *testing.T) {
	mm := 0.001
	b302Half, _ := calc.AsmeB302DiameterBand(0.5 * inch) // 1/32 in (standards.md, seen)
	tests := []struct {
		name      string
		in        calc.WearInput
		demand    float64 // reduction [m], or broken wires
		capacity  float64 // limit [m], or allowed wires
		unit      string
		u         float64
		uDia, uBW float64
		base      float64
		noteHas   string
	}{
		// ISO 4309 fibre core 10 % from the reference diameter (standards.md, memory
		// medium): reference 16.5 mm, measured 14.85 mm: 1.65 mm = 10 % of 16.5 → u = 1.
		// From nominal 16 mm it would be only 1.15 mm (u 0.72): the base matters.
		{"ISO fibre core at discard from reference", calc.WearInput{NominalM: 16 * mm, ReferenceM: 16.5 * mm, MeasuredM: 14.85 * mm, MaxReductionFraction: 0.10, BrokenWires: -1},
			1.65 * mm, 1.65 * mm, "m", 1, 1, math.NaN(), 16.5 * mm, ""},
		// Steel core 7.5 %: reference 20.6 mm, measured 19.982 mm: 0.618 mm of a
		// 1.545 mm limit → u = 0.4 (by hand).
		{"ISO steel core", calc.WearInput{NominalM: 20 * mm, ReferenceM: 20.6 * mm, MeasuredM: 19.982 * mm, MaxReductionFraction: 0.075, BrokenWires: -1},
			0.618 * mm, 1.545 * mm, "m", 0.4, 0.4, math.NaN(), 20.6 * mm, ""},
		// No reference: falls back to nominal and says so. 16 mm, 5 % rotation
		// resistant: limit 0.8 mm; measured 15.6 mm → 0.4 mm, u = 0.5.
		{"fallback to nominal", calc.WearInput{NominalM: 16 * mm, MeasuredM: 15.6 * mm, MaxReductionFraction: 0.05, BrokenWires: -1},
			0.4 * mm, 0.8 * mm, "m", 0.5, 0.5, math.NaN(), 16 * mm, "from nominal"},
		// Measured above nominal: no reduction (design.md).
		{"above nominal, B30.2", calc.WearInput{NominalM: 0.5 * inch, MeasuredM: 0.52 * inch, MaxReductionM: b302Half, BrokenWires: -1},
			0, b302Half, "m", 0, 0, math.NaN(), 0.5 * inch, "no reduction"},
		// Above nominal but below the reference: ISO 4309 counts the decrease from the
		// reference: 16.5 − 16.2 = 0.3 mm of 1.65 mm → u = 0.1818…
		{"above nominal, below reference", calc.WearInput{NominalM: 16 * mm, ReferenceM: 16.5 * mm, MeasuredM: 16.2 * mm, MaxReductionFraction: 0.10, BrokenWires: -1},
			0.3 * mm, 1.65 * mm, "m", 0.3 / 1.65, 0.3 / 1.65, math.NaN(), 16.5 * mm, ""},
		// B30.2 half-inch rope worn 1/64 in: half of the 1/32 in band.
		{"B30.2 half band", calc.WearInput{NominalM: 0.5 * inch, MeasuredM: (0.5 - 1.0/64) * inch, MaxReductionM: b302Half, BrokenWires: -1},
			inch / 64, inch / 32, "m", 0.5, 0.5, math.NaN(), 0.5 * inch, ""},
		// Both limits: the ISO 10 % of 16.5 mm = 1.65 mm and an absolute 0.79375 mm
		// (1/32 in) from nominal 16 mm. Measured 15.5 mm: absolute 0.5/0.79375 = 0.63,
		// ISO 1.0/1.65 = 0.606: the absolute band governs.
		{"both limits, absolute governs", calc.WearInput{NominalM: 16 * mm, ReferenceM: 16.5 * mm, MeasuredM: 15.5 * mm, MaxReductionM: inch / 32, MaxReductionFraction: 0.10, BrokenWires: -1},
			0.5 * mm, inch / 32, "m", 0.5 * mm / (inch / 32), 0.5 * mm / (inch / 32), math.NaN(), 16 * mm, ""},
		// Broken wires against the B30.2 / B30.16 12 in one lay (standards.md, seen):
		// 9 of 12 = 0.75 outweighs a diameter at 0.5 of its band.
		{"broken wires govern", calc.WearInput{NominalM: 0.5 * inch, MeasuredM: (0.5 - 1.0/64) * inch, MaxReductionM: b302Half, BrokenWires: 9, MaxBrokenWires: 12},
			// When broken wires govern, demand and capacity are the counts (9 of 12) so that
			// utilisation = demand / capacity still holds.
			9, 12, "1", 0.75, 0.5, 0.75, 0.5 * inch, "broken wires in one lay govern (9 of 12)"},
		// Diameter governs over 3 of 12 broken wires.
		{"diameter governs", calc.WearInput{NominalM: 0.5 * inch, MeasuredM: (0.5 - 1.0/64) * inch, MaxReductionM: b302Half, BrokenWires: 3, MaxBrokenWires: 12},
			inch / 64, inch / 32, "m", 0.5, 0.5, 0.25, 0.5 * inch, ""},
		// Broken wires only (no measurement): B30.7 6 in one lay (standards.md, seen),
		// 7 found → u = 7/6, discard.
		{"broken wires only", calc.WearInput{NominalM: 12 * mm, BrokenWires: 7, MaxBrokenWires: 6},
			7, 6, "1", 7.0 / 6, math.NaN(), 7.0 / 6, math.NaN(), "no measured diameter"},
	}
	for _, tt := range tests {
		o, err := calc.RopeWear(tt.in)
		if err != nil {
			t.Errorf("%s: %v", tt.name, err)
			continue
		}
		for _, c := range []struct {
			what      string
			got, want float64
		}{
			{"demand", o.Demand, tt.demand},
			{"capacity", o.Capacity, tt.capacity},
			{"utilisation", o.Utilisation, tt.u},
			{"diameter_utilisation", o.Figure("diameter_utilisation"), tt.uDia},
			{"broken_wires_utilisation", o.Figure("broken_wires_utilisation"), tt.uBW},
			{"base_diameter_m", o.Figure("base_diameter_m"), tt.base},
		} {
			if !approxEqual(c.got, c.want, 1e-12, 1e-9) {
				t.Errorf("%s: %s = %v, want %v", tt.name, c.what, c.got, c.want)
			}
		}
		if tt.unit == "m" {
			// reduction_m is the governing reduction; the fraction is it over its base;
			// the discard diameter is the base less the limit.
			if !approxEqual(o.Figure("reduction_m"), tt.demand, 1e-12, 1e-9) ||
				!approxEqual(o.Figure("reduction_fraction"), tt.demand/tt.base, 1e-12, 1e-9) ||
				!approxEqual(o.Figure("discard_diameter_m"), tt.base-tt.capacity, 1e-12, 1e-9) {
				t.Errorf("%s: reduction %v, fraction %v, discard diameter %v", tt.name, o.Figure("reduction_m"), o.Figure("reduction_fraction"), o.Figure("discard_diameter_m"))
			}
		}
		if o.Unit != tt.unit || !strings.Contains(o.Note, tt.noteHas) {
			t.Errorf("%s: unit %q note %q (want unit %q, note containing %q)", tt.name, o.Unit, o.Note, tt.unit, tt.noteHas)
		}
		if !math.IsNaN(o.Figure("rope_age_years")) {
			t.Errorf("%s: rope age %v without dates, want NaN", tt.name, o.Figure("rope_age_years"))
		}
	}
}

// TestRopeWearDiscardDiameter: a half-inch rope under B30.2 is discarded at
// 1/2 − 1/32 = 15/32 in = 11.90625 mm (standards.md band, seen; NIST SP 811 inch).
func TestRopeWearDiscardDiameter(t *testing.T) {
	lim, _ := calc.AsmeB302DiameterBand(12.7e-3)
	o, err := calc.RopeWear(calc.WearInput{NominalM: 12.7e-3, MeasuredM: 12.5e-3, MaxReductionM: lim, BrokenWires: -1})
	if err != nil {
		t.Fatal(err)
	}
	if got := o.Figure("discard_diameter_m"); !approxEqual(got, 11.90625e-3, 1e-12, 0) {
		t.Errorf("discard diameter %v m, want 0.01190625 m", got)
	}
	// Measured exactly at the discard diameter: utilisation 1.
	o, _ = calc.RopeWear(calc.WearInput{NominalM: 12.7e-3, MeasuredM: 11.90625e-3, MaxReductionM: lim, BrokenWires: -1})
	if !approxEqual(o.Utilisation, 1, 1e-9, 0) {
		t.Errorf("at the discard diameter u = %v, want 1", o.Utilisation)
	}
}

func TestRopeWearAge(t *testing.T) {
	base := calc.WearInput{NominalM: 0.016, MeasuredM: 0.0158, MaxReductionFraction: 0.1, BrokenWires: -1}
	tests := []struct {
		name    string
		fitted  time.Time
		asOf    time.Time
		years   float64
		noteHas string
	}{
		// 2020-03-01 to 2025-03-01 is 1 826 days (one leap day, 2024-02-29; by hand), and
		// a mean Gregorian year is 365.2425 d: 4.9994 years.
		{"five years", date(2020, 3, 1), date(2025, 3, 1), 1826 / 365.2425, ""},
		{"fitted today", date(2025, 3, 1), date(2025, 3, 1), 0, ""},
		{"fitted after as-of", date(2025, 3, 2), date(2025, 3, 1), math.NaN(), "after the as-of"},
	}
	for _, tt := range tests {
		in := base
		in.Fitted, in.AsOf = tt.fitted, tt.asOf
		o, err := calc.RopeWear(in)
		if err != nil {
			t.Errorf("%s: %v", tt.name, err)
			continue
		}
		if got := o.Figure("rope_age_years"); !approxEqual(got, tt.years, 1e-12, 1e-12) || !strings.Contains(o.Note, tt.noteHas) {
			t.Errorf("%s: age %v (note %q), want %v", tt.name, got, o.Note, tt.years)
		}
	}
}

func TestRopeWearErrors(t *testing.T) {
	ok := calc.WearInput{NominalM: 0.016, MeasuredM: 0.0155, MaxReductionFraction: 0.1, BrokenWires: -1}
	tests := []struct {
		name  string
		mod   func(*calc.WearInput)
		field string
	}{
		{"no nominal", func(in *calc.WearInput) { in.NominalM = 0 }, "rope_diameter"},
		{"negative measured", func(in *calc.WearInput) { in.MeasuredM = -0.01 }, "rope_measured_diameter"},
		// A 25.4× unit slip (a diameter in inches read as millimetres, or the reverse).
		{"measured far above nominal", func(in *calc.WearInput) { in.MeasuredM = 0.016 * 25.4 }, "rope_measured_diameter"},
		{"reference far from nominal", func(in *calc.WearInput) { in.ReferenceM = 0.010 }, "rope_reference_diameter"},
		{"fraction 1", func(in *calc.WearInput) { in.MaxReductionFraction = 1 }, ""},
		{"negative band", func(in *calc.WearInput) { in.MaxReductionM = -1e-3 }, ""},
		{"no criterion", func(in *calc.WearInput) { in.MaxReductionFraction = 0 }, ""},
		{"nothing measured", func(in *calc.WearInput) { in.MeasuredM = 0 }, "rope_measured_diameter"},
		{"broken wires without a limit", func(in *calc.WearInput) { in.MeasuredM = 0; in.BrokenWires = 3 }, "rope_measured_diameter"},
	}
	for _, tt := range tests {
		in := ok
		tt.mod(&in)
		_, err := calc.RopeWear(in)
		if err == nil {
			t.Errorf("%s: no error", tt.name)
			continue
		}
		if f := rangeField(t, err); f != tt.field {
			t.Errorf("%s: field %q, want %q (%v)", tt.name, f, tt.field, err)
		}
	}
}

// TestRopeWearMonotonic: a thinner rope is never in better condition (invariant).
func TestRopeWearMonotonic(t *testing.T) {
	prev := -1.0
	for d := 0.0170; d >= 0.0140; d -= 0.0001 {
		o, err := calc.RopeWear(calc.WearInput{NominalM: 0.016, ReferenceM: 0.0165, MeasuredM: d, MaxReductionM: 0.8e-3, MaxReductionFraction: 0.075, BrokenWires: -1})
		if err != nil {
			t.Fatal(err)
		}
		if o.Utilisation < prev {
			t.Fatalf("utilisation fell from %v to %v as the diameter fell to %v", prev, o.Utilisation, d)
		}
		prev = o.Utilisation
	}
}

// TestIso4309WithRopeCategory ties the ISO 4309 percentages to calc.RopeCategory, whose
// categories name the table's rows (standards.md: 10 % fibre core, 7.5 % steel core, 5 %
// rotation resistant, memory medium).
func TestIso4309WithRopeCategory(t *testing.T) {
	for _, tt := range []struct {
		construction string
		want         float64
	}{
		{"6x36 IWRC", 0.075},
		{"6x19 FC", 0.10},
		{"35x7", 0.05},
	} {
		cat := calc.RopeCategory(tt.construction)
		got, ok := calc.Iso4309UniformDecrease(cat)
		if !ok || !approxEqual(got, tt.want, 0, 1e-15) {
			t.Errorf("%s (%q): %v, %v; want %v", tt.construction, cat, got, ok, tt.want)
		}
	}
}

// TestRopeWearStrand: ASME B30.2 / B30.16 running ropes are removed at 12 randomly
// distributed broken wires in one lay or 4 broken wires in one strand in one lay
// (standards.md, seen; the rule rows rope_wear.broken_wires_lay and _strand). Counts by
// hand: 5 in the lay (5/12 = 0.417) with 3 in one strand (3/4 = 0.75): the strand governs
// at 0.75; 5 in one strand (1.25) fails though the lay count (6/12) passes; the lay governs
// when its share is larger (11/12 against 1/4).
func TestRopeWearStrand(t *testing.T) {
	mm := 0.001
	for _, tc := range []struct {
		name            string
		lay, strand     int
		u, demand, capa float64
		where           string
	}{
		{"strand governs", 5, 3, 0.75, 3, 4, "in one strand in one lay"},
		{"strand alone at discard", 6, 5, 1.25, 5, 4, "in one strand in one lay"},
		{"lay governs", 11, 1, 11.0 / 12, 11, 12, "in one lay"},
	} {
		in := calc.WearInput{NominalM: 16 * mm, BrokenWires: tc.lay, MaxBrokenWires: 12, StrandBrokenWires: tc.strand, MaxStrandBrokenWires: 4}
		o, err := calc.RopeWear(in)
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		if !approx.Equal(o.Utilisation, tc.u, 1e-12, 1e-12) || o.Demand != tc.demand || o.Capacity != tc.capa || o.Unit != "1" {
			t.Errorf("%s: u %g demand %g capacity %g %s, want %g, %g, %g", tc.name, o.Utilisation, o.Demand, o.Capacity, o.Unit, tc.u, tc.demand, tc.capa)
		}
		if !strings.Contains(o.Note, "broken wires "+tc.where+" govern") {
			t.Errorf("%s: note %q does not say the count %s governs", tc.name, o.Note, tc.where)
		}
		if got := o.Figure("broken_wires_utilisation"); got != float64(tc.lay)/12 {
			t.Errorf("%s: lay utilisation figure %g, want %g (the lay count alone)", tc.name, got, float64(tc.lay)/12)
		}
		if got := o.Figure("strand_broken_wires_utilisation"); got != float64(tc.strand)/4 {
			t.Errorf("%s: strand utilisation figure %g, want %g", tc.name, got, float64(tc.strand)/4)
		}
		// With a measured diameter well inside its limit, the broken wires still govern.
		in.MeasuredM, in.MaxReductionFraction = 15.9*mm, 0.10
		if o2, _ := calc.RopeWear(in); !approx.Equal(o2.Utilisation, tc.u, 1e-12, 1e-12) || !strings.Contains(o2.Note, "("+strconv.Itoa(int(tc.demand))+" of ") {
			t.Errorf("%s with a diameter: u %g note %q", tc.name, o2.Utilisation, o2.Note)
		}
	}
	// At the discard count the rope is removed (ASME B30.2: "twelve … in one lay or four
	// … in one strand in one lay"): u = 1 fails outright, whatever the marginal band.
	for _, in := range []calc.WearInput{
		{NominalM: 16 * mm, BrokenWires: 12, MaxBrokenWires: 12, StrandBrokenWires: -1},
		{NominalM: 16 * mm, BrokenWires: -1, StrandBrokenWires: 4, MaxStrandBrokenWires: 4},
		{NominalM: 16 * mm, MeasuredM: 15.9 * mm, MaxReductionFraction: 0.10, BrokenWires: 6, MaxBrokenWires: 12, StrandBrokenWires: 4, MaxStrandBrokenWires: 4},
	} {
		o, err := calc.RopeWear(in)
		if err != nil || o.Utilisation != 1 || o.Verdict != calc.Fail || !strings.Contains(o.Note, "the discard count is reached") {
			t.Errorf("%+v: %v, u %g, verdict %v, note %q; want u 1, fail", in, err, o.Utilisation, o.Verdict, o.Note)
		}
	}
	// One below the count is judged by the utilisation (11/12 ≈ 0.917: marginal in a 10 % band).
	if o, _ := calc.RopeWear(calc.WearInput{NominalM: 16 * mm, BrokenWires: 11, MaxBrokenWires: 12, StrandBrokenWires: -1}); o.Verdict != calc.ByUtilisation {
		t.Errorf("11 of 12: verdict %v, want by utilisation", o.Verdict)
	}
	// More in one strand than in the whole lay (which includes them) is a register slip.
	if _, err := calc.RopeWear(calc.WearInput{NominalM: 16 * mm, BrokenWires: 1, MaxBrokenWires: 12, StrandBrokenWires: 5, MaxStrandBrokenWires: 4}); err == nil || !strings.Contains(err.Error(), "more than the 1 counted in the whole lay") {
		t.Errorf("strand 5 > lay 1: %v", err)
	}
	// The strand count alone is a criterion.
	if o, err := calc.RopeWear(calc.WearInput{NominalM: 16 * mm, BrokenWires: -1, StrandBrokenWires: 2, MaxStrandBrokenWires: 4}); err != nil || o.Utilisation != 0.5 {
		t.Errorf("strand count alone: %v, u %g, want 0.5", err, o.Utilisation)
	}
}
