package calc_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"hoistfleet/calc"
)

// approxEqual (got, want, absTol, relTol) is the package's shared tolerance helper,
// declared once for all calc_test files in duty_test.go.

// NIST SP 811 (appendix B) conversion factors, exact unless noted (standards.md "Units").
const (
	nistFt    = 0.3048             // m
	nistIn    = 0.0254             // m
	nistLb    = 0.45359237         // kg
	nistLbf   = 4.4482216152605    // N
	nistHp    = 745.69987158227022 // W (550 ft·lbf/s)
	nistLbfFt = 1.3558179483314004 // N m (computed from ft and lbf)
	gn        = 9.80665            // m/s², standard gravity
)

func TestMBFFromGrade(t *testing.T) {
	tests := []struct {
		name         string
		dMM, grade   float64
		construction string
		wantKN       float64
		tolKN        float64
		src          string
	}{
		// standards.md "Wire rope": EN 12385-4, 20 mm 6×36 IWRC 1960 → 279.1 kN (computed;
		// tables list 279 kN, memory medium).
		{"20mm 6x36 IWRC 1960", 20, 1960, "6x36 IWRC", 279.1, 0.05, "EN 12385-4 via standards.md, computed"},
		{"20mm 6x36WS-IWRC 1960 tables", 20, 1960, "6x36WS-IWRC", 279, 0.5, "EN 12385-4 tables 279 kN, standards.md memory medium"},
		// By hand from F_min = d² R K / 1000 (EN 12385-4, standards.md seen), K from the same list:
		// 16² × 1770 × 0.330 / 1000 = 256 × 584.1 / 1000 = 149.5296 kN.
		{"16mm 6x19 FC 1770", 16, 1770, "6×19 FC", 149.5296, 1e-6, "EN 12385-4 K 0.330 (seen), hand arithmetic"},
		// 12² × 2160 × 0.359 / 1000 = 144 × 775.44 / 1000 = 111.66336 kN.
		{"12mm 6x7 IWRC 2160", 12, 2160, "6x7 IWRC", 111.66336, 1e-6, "EN 12385-4 K 0.359 (seen), hand arithmetic"},
		// 24² × 1960 × 0.293 / 1000 = 576 × 574.28 / 1000 = 330.78528 kN.
		{"24mm 8x36 fibre core 1960", 24, 1960, "8x36 fibre core", 330.78528, 1e-6, "EN 12385-4 K 0.293 (seen), hand arithmetic"},
		// 10² × 1770 × 0.319 / 1000 = 100 × 564.63 / 1000 = 56.463 kN.
		{"10mm 6x37M IWRC 1770", 10, 1770, "6x37M IWRC", 56.463, 1e-6, "EN 12385-4 K 0.319 (seen), hand arithmetic"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			k, _, ok := calc.RopeK(tt.construction)
			if !ok {
				t.Fatalf("RopeK(%q) not recognised", tt.construction)
			}
			got := calc.MBFFromGrade(tt.dMM/1000, tt.grade, k) / 1000
			if !approxEqual(got, tt.wantKN, tt.tolKN, 0) {
				t.Errorf("MBF = %.6f kN, want %.6f kN ± %g (%s)", got, tt.wantKN, tt.tolKN, tt.src)
			}
		})
	}

	// The formula is quadratic in d and linear in R and K (EN 12385-4): doubling d
	// quadruples the force.
	a := calc.MBFFromGrade(0.010, 1960, 0.356)
	b := calc.MBFFromGrade(0.020, 1960, 0.356)
	if !approxEqual(b/a, 4, 0, 1e-12) {
		t.Errorf("MBF(20 mm)/MBF(10 mm) = %g, want 4", b/a)
	}

	for _, bad := range [][3]float64{{0, 1960, 0.356}, {0.02, 0, 0.356}, {0.02, 1960, -1}, {math.NaN(), 1960, 0.356}, {math.Inf(1), 1960, 0.356}} {
		if got := calc.MBFFromGrade(bad[0], bad[1], bad[2]); !math.IsNaN(got) {
			t.Errorf("MBFFromGrade(%v) = %g, want NaN", bad, got)
		}
	}
}

func TestRopeK(t *testing.T) {
	// K values: EN 12385-4 as listed in standards.md "Wire rope" (seen).
	tests := []struct {
		in    string
		wantK float64
		canon string
		ok    bool
	}{
		{"6x36 IWRC", 0.356, "6×36 class IWRC", true},
		{"6×19 FC", 0.330, "6×19 class FC", true},
		{"6x36WS-IWRC", 0.356, "6×36 class IWRC", true},
		{"6X36WS IWRC 1960 sZ bright", 0.356, "6×36 class IWRC", true},
		{"6 x 36 WS - IWRC", 0.356, "6×36 class IWRC", true},
		{"8x36 fibre core", 0.293, "8×36 class FC", true},
		{"8x36WS IWRC", 0.356, "8×36 class IWRC", true},
		{"6x19 fiber core", 0.330, "6×19 class FC", true},
		{"6x19S-NFC", 0.330, "6×19 class FC", true},
		{"6x26WS steel core", 0.356, "6×19 class IWRC", true},
		{"6x41WS IWRC RHOL", 0.356, "6×36 class IWRC", true},
		{"6x7 FC", 0.332, "6×7 FC", true},
		{"6x7 IWRC", 0.359, "6×7 IWRC", true},
		{"6x19M FC", 0.307, "6×19M FC", true},
		{"6x19M IWRC", 0.332, "6×19M IWRC", true},
		{"6x37M fc", 0.295, "6×37M FC", true},
		{"6x37M-IWRC", 0.319, "6×37M IWRC", true},
		{"6x36wsiwrc", 0.356, "6×36 class IWRC", true},
		// Not in standards.md, or not enough to tell: the caller must ask for the MBF.
		{"6x36", 0, "", false},                          // no core
		{"6x37 IWRC", 0, "", false},                     // bare 6×37: US class or EN 6×37M
		{"6xK36WS IWRC", 0, "", false},                  // compacted strands
		{"6x36 IWRC compacted", 0, "", false},           // unknown word
		{"35(W)x7", 0, "", false},                       // rotation resistant
		{"19x7 rotation resistant", 0, "", false},       //
		{"8x19 IWRC", 0, "", false},                     // 8×19 K not given
		{"6x7 WSC", 0, "", false},                       // wire strand core K not given
		{"6x36 IWRC FC", 0, "", false},                  // two cores
		{"6x36 IWRC 6x19 IWRC", 0, "", false},           // two constructions
		{"", 0, "", false},                              //
		{"steel wire rope", 0, "", false},               //
		{"6x36 plastic impregnated IWRC", 0, "", false}, // unknown words
	}
	for _, tt := range tests {
		k, canon, ok := calc.RopeK(tt.in)
		if ok != tt.ok || !approxEqual(k, tt.wantK, 0, 0) || canon != tt.canon {
			t.Errorf("RopeK(%q) = %v, %q, %v; want %v, %q, %v", tt.in, k, canon, ok, tt.wantK, tt.canon, tt.ok)
		}
	}
}

func TestRopeCategory(t *testing.T) {
	// Categories of the ISO 4309 diameter discard limits (standards.md: memory, medium).
	tests := []struct{ in, want string }{
		{"6x36 IWRC", "steel core"},
		{"6x36WS-IWRC", "steel core"},
		{"6x7 WSC", "steel core"},
		{"6xK36WS steel core", "steel core"},
		{"6x19 FC", "fibre core"},
		{"8x36 fibre core", "fibre core"},
		{"6x24 fiber core", "fibre core"},
		{"18x7", "rotation resistant"},
		{"19x7 FC", "rotation resistant"},
		{"34x7 IWRC", "rotation resistant"},
		{"35(W)x7", "rotation resistant"},
		{"35WxK7", "rotation resistant"},
		{"4x39 rotation-resistant", "rotation resistant"},
		{"non-rotating", "rotation resistant"},
		{"6x36", ""},
		{"", ""},
		{"6x36 IWRC FC", ""},
	}
	for _, tt := range tests {
		if got := calc.RopeCategory(tt.in); got != tt.want {
			t.Errorf("RopeCategory(%q) = %q, want %q", tt.in, got, tt.want)
		}
	}
}

// ropeHoist is a plain hoist for the rope checks: 5 t on 2 parts, one rope end, rolling
// bearing sheaves (η_s 0.98, standards.md "Reeving": seen), g = 9.81.
func ropeHoist() calc.Hoist {
	return calc.Hoist{
		G: 9.81, RatedLoadKg: 5000, Parts: 2, RopeEnds: 1, SheaveEff: 0.98,
		RopeDiameterM: 0.020, RopeMBFN: 279104, DrumDiameterM: 0.4, Layers: 1,
	}
}

func TestReevingEfficiency(t *testing.T) {
	// η_R = (1 − η^n)/(n (1 − η)) for η = 0.98 (standards.md "Reeving", memory high),
	// evaluated by hand: n=2 0.0396/0.04; n=3 0.058808/0.06; n=4 0.07763184/0.08; …
	want := map[int]float64{1: 1, 2: 0.99, 3: 0.980133333, 4: 0.970398, 5: 0.960792032, 6: 0.9513134928, 8: 0.93273111}
	for ne, w := range want {
		for _, e := range []int{1, 2} {
			h := ropeHoist()
			h.Parts, h.RopeEnds = ne*e, e
			o, err := calc.RopeDesignFactor(h, 5, false)
			if err != nil {
				t.Fatal(err)
			}
			got := o.Figure("reeving_efficiency")
			if !approxEqual(got, w, 1e-8, 0) {
				t.Errorf("n_e=%d e=%d: η_R = %.10f, want %.10f (hand arithmetic)", ne, e, got, w)
			}
			// Independent model: the n_e part tensions fall by η from the hauling part,
			// F, Fη, …, Fη^(n_e−1); their mean over F is η_R (geometric series).
			sum := 0.0
			for j := 0; j < ne; j++ {
				sum += math.Pow(0.98, float64(j))
			}
			if !approxEqual(got, sum/float64(ne), 1e-12, 0) {
				t.Errorf("n_e=%d: η_R = %.12f, part-tension mean %.12f", ne, got, sum/float64(ne))
			}
		}
	}
}

func TestRopeTensionWRUMLeadLine(t *testing.T) {
	// Wire Rope Users Manual lead-line factor (standards.md "Reeving", seen): 4 parts,
	// plain bearings K = 1.09, S = 4 rotating sheaves → 0.309; two more lead sheaves
	// (S = 6) → 0.367, 6000 lb → 2202 lb; unrounded 0.36673 → 2200.4 lb (computed).
	// Our model: η_s = 1/K, n_e = N = 4, k = S − N + 1 = 3 deflection sheaves.
	h := calc.Hoist{
		G: gn, RatedLoadKg: 6000 * nistLb, Parts: 4, RopeEnds: 1, SheaveEff: 1 / 1.09,
		DeflectionSheaves: 3, RopeMBFN: 1e6,
	}
	o, err := calc.RopeDesignFactor(h, 5, false)
	if err != nil {
		t.Fatal(err)
	}
	pullLb := o.Figure("rope_tension_n") / nistLbf // lb mass × g_n = lbf (NIST SP 811)
	if !approxEqual(pullLb, 2200.4, 0.05, 0) {
		t.Errorf("lead-line pull = %.3f lbf, want 2200.4 (WRUM factor 0.36673, standards.md computed)", pullLb)
	}
	if !approxEqual(pullLb, 2202, 2, 0) {
		t.Errorf("lead-line pull = %.3f lbf, want ≈ 2202 (WRUM rounded factor 0.367, seen)", pullLb)
	}
	if f := pullLb / 6000; !approxEqual(f, 0.36673, 5e-6, 0) {
		t.Errorf("lead-line factor = %.6f, want 0.36673", f)
	}
	// Without the two lead sheaves (S = 4, k = 1): 0.309 (seen).
	h.DeflectionSheaves = 1
	o, _ = calc.RopeDesignFactor(h, 5, false)
	if f := o.Figure("rope_tension_n") / nistLbf / 6000; !approxEqual(f, 0.309, 5e-4, 0) {
		t.Errorf("lead-line factor S=4 = %.6f, want 0.309", f)
	}
}

func TestRopeTensionWRUMIdentity(t *testing.T) {
	// Identity (standards.md "Reeving", computed): F/W = 1/(N η_R η^k) with η = 1/K and
	// k = S − N + 1 equals the WRUM factor K^S (K − 1)/(K^N − 1), for anti-friction
	// (1.04) and plain (1.09) bearings.
	for _, K := range []float64{1.04, 1.09} {
		for N := 1; N <= 10; N++ {
			for S := N - 1; S <= N+4; S++ {
				h := calc.Hoist{G: 10, RatedLoadKg: 1000, Parts: N, RopeEnds: 1, SheaveEff: 1 / K,
					DeflectionSheaves: S - N + 1, RopeMBFN: 1e6}
				o, err := calc.RopeDesignFactor(h, 5, false)
				if err != nil {
					t.Fatal(err)
				}
				got := o.Figure("rope_tension_n") / h.WeightN()
				want := math.Pow(K, float64(S)) * (K - 1) / (math.Pow(K, float64(N)) - 1)
				if !approxEqual(got, want, 0, 1e-12) {
					t.Errorf("K=%g N=%d S=%d: F/W = %.12f, WRUM %.12f", K, N, S, got, want)
				}
			}
		}
	}
}

func TestRopeDesignFactor(t *testing.T) {
	// Hand case: W = 5000 × 9.81 = 49050 N, η_R = 0.99, F = 49050/(2 × 0.99) =
	// 24772.727 N; MBF 279.104 kN (EN 12385-4 20 mm 6×36 IWRC 1960, standards.md computed);
	// Z_act = 279104 / 24772.727 = 11.26658; against Zp 4.5 (M5, ISO 4308-1, standards.md
	// seen): u = 4.5 × 24772.727 / 279104 = 0.399411.
	o, err := calc.RopeDesignFactor(ropeHoist(), 4.5, false)
	if err != nil {
		t.Fatal(err)
	}
	checks := []struct {
		name      string
		got, want float64
	}{
		{"rope_tension_n", o.Figure("rope_tension_n"), 24772.727},
		{"static_tension_n", o.Figure("static_tension_n"), 24525},
		{"design_factor", o.Figure("design_factor"), 11.26658},
		{"capacity", o.Capacity, 11.26658},
		{"demand", o.Demand, 4.5},
		{"utilisation", o.Utilisation, 0.399411},
		{"reeving_efficiency", o.Figure("reeving_efficiency"), 0.99},
		{"deflection_efficiency", o.Figure("deflection_efficiency"), 1},
	}
	for _, c := range checks {
		if !approxEqual(c.got, c.want, 0, 2e-6) {
			t.Errorf("%s = %.7g, want %.7g (hand calc)", c.name, c.got, c.want)
		}
	}
	if o.Unit != "1" || o.Verdict != calc.ByUtilisation {
		t.Errorf("unit %q verdict %v", o.Unit, o.Verdict)
	}
	// The step record shows the reeving formula with its numbers (brief's example).
	found := false
	for _, s := range o.Steps {
		if s.Symbol == "η_R" && s.Numbers == "(1 − 0.98^2) / (2 (1 − 0.98))" {
			found = true
		}
	}
	if !found {
		t.Errorf("no η_R step with numbers substituted; steps: %+v", o.Steps)
	}
}

func TestRopeDesignFactorStaticBasis29CFR(t *testing.T) {
	// 29 CFR 1910.179(h)(2) (standards.md: law): rated load plus load block divided by the
	// parts of line must not exceed 20 % of the rope's breaking strength, i.e. design
	// factor 5 on the static basis W/n. A rope with MBF exactly 5 W/n is at the limit.
	for _, parts := range []int{1, 2, 4, 6, 8} {
		h := calc.Hoist{G: gn, RatedLoadKg: 10000 * nistLb, HookBlockKg: 250 * nistLb, Parts: parts, RopeEnds: 1,
			SheaveEff: 0.98, DeflectionSheaves: 1}
		wOverN := h.WeightN() / float64(parts)
		h.RopeMBFN = 5 * wOverN
		o, err := calc.RopeDesignFactor(h, 5, true)
		if err != nil {
			t.Fatal(err)
		}
		if !approxEqual(o.Utilisation, 1, 0, 1e-12) || !approxEqual(o.Capacity, 5, 0, 1e-12) {
			t.Errorf("n=%d static basis: u = %.15g, Z_act = %.15g; want 1 and 5 (29 CFR 1910.179(h)(2))", parts, o.Utilisation, o.Capacity)
		}
		// 20 % of breaking strength in pounds: (10000 + 250) lb / n ≤ 0.2 MBF.
		if lbPerPart := (10000.0 + 250) / float64(parts); !approxEqual(o.Figure("static_tension_n")/nistLbf, lbPerPart, 1e-9, 0) {
			t.Errorf("n=%d static tension %.6f lbf, want %.6f", parts, o.Figure("static_tension_n")/nistLbf, lbPerPart)
		}
		// The ISO basis adds the reeving and deflection losses: F = W/(n η_RD) > W/n, so
		// the same rope exceeds the limit by exactly 1/η_RD.
		iso, err := calc.RopeDesignFactor(h, 5, false)
		if err != nil {
			t.Fatal(err)
		}
		etaRD := calc.ReevingEfficiency(0.98, parts) * 0.98
		if !approxEqual(iso.Utilisation, 1/etaRD, 0, 1e-12) {
			t.Errorf("n=%d ISO basis: u = %.12f, want 1/η_RD = %.12f", parts, iso.Utilisation, 1/etaRD)
		}
		// rope_tension_n is F on both bases (design.md).
		if !approxEqual(o.Figure("rope_tension_n"), iso.Figure("rope_tension_n"), 0, 0) {
			t.Errorf("rope_tension_n differs between bases")
		}
	}
}

func TestRopeDesignFactorAffineInLoad(t *testing.T) {
	// Rope tension and utilisation are linear in m = m_L + m_H (statics), hence affine
	// in the rated load; with no load the design factor is infinite and u = 0.
	h := ropeHoist()
	h.HookBlockKg = 120
	u := func(kg float64) (float64, float64) {
		o, err := calc.RopeDesignFactor(h.WithRatedLoad(kg), 4.5, false)
		if err != nil {
			t.Fatal(err)
		}
		return o.Utilisation, o.Figure("rope_tension_n")
	}
	u1, f1 := u(1000)
	u2, f2 := u(2000)
	u3, f3 := u(3000)
	u0, f0 := u(0)
	if !approxEqual(u3-u2, u2-u1, 0, 1e-12) || !approxEqual(f3-f2, f2-f1, 0, 1e-12) {
		t.Errorf("not affine: u %g %g %g, F %g %g %g", u1, u2, u3, f1, f2, f3)
	}
	// Intercept: the hook block alone, F_0 = 120 g/(n η_R).
	if !approxEqual(f0, 120*9.81/(2*0.99), 0, 1e-12) || !approxEqual(u0, u1-(u2-u1), 0, 1e-9) {
		t.Errorf("intercept F = %g, u = %g", f0, u0)
	}
	h.HookBlockKg = 0
	o, err := calc.RopeDesignFactor(h.WithRatedLoad(0), 4.5, false)
	if err != nil {
		t.Fatal(err)
	}
	if o.Utilisation != 0 || !math.IsInf(o.Capacity, 1) || o.Note == "" {
		t.Errorf("zero load: u = %g, capacity = %g, note %q; want 0, +Inf and a note", o.Utilisation, o.Capacity, o.Note)
	}
}

func TestRopeDesignFactorErrors(t *testing.T) {
	tests := []struct {
		name  string
		mod   func(*calc.Hoist)
		z     float64
		field string
	}{
		{"no parts", func(h *calc.Hoist) { h.Parts = 0 }, 5, "parts_of_line"},
		{"odd parts twin drum", func(h *calc.Hoist) { h.Parts, h.RopeEnds = 3, 2 }, 5, "parts_of_line"},
		{"three ends", func(h *calc.Hoist) { h.RopeEnds = 3 }, 5, "rope_ends"},
		{"sheave eff > 1", func(h *calc.Hoist) { h.SheaveEff = 1.02 }, 5, "sheave_efficiency"},
		{"negative deflection", func(h *calc.Hoist) { h.DeflectionSheaves = -1 }, 5, "deflection_sheaves"},
		{"no MBF", func(h *calc.Hoist) { h.RopeMBFN = 0 }, 5, "rope_mbf"},
		{"NaN MBF", func(h *calc.Hoist) { h.RopeMBFN = math.NaN() }, 5, "rope_mbf"},
		{"negative load", func(h *calc.Hoist) { h.RatedLoadKg = -1 }, 5, "rated_load"},
		{"negative block", func(h *calc.Hoist) { h.HookBlockKg = -1 }, 5, "hook_block_mass"},
		{"no gravity", func(h *calc.Hoist) { h.G = 0 }, 5, ""},
		{"zero Z", func(h *calc.Hoist) {}, 0, ""},
		{"NaN Z", func(h *calc.Hoist) {}, math.NaN(), ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			h := ropeHoist()
			tt.mod(&h)
			_, err := calc.RopeDesignFactor(h, tt.z, false)
			checkRangeError(t, err, tt.field)
		})
	}
}

// checkRangeError asserts err is a *calc.RangeError for field with a readable message.
func checkRangeError(t *testing.T, err error, field string) {
	t.Helper()
	var re *calc.RangeError
	if !errors.As(err, &re) {
		t.Fatalf("error = %v, want *calc.RangeError", err)
	}
	if re.Field != field {
		t.Errorf("Field = %q, want %q (%s)", re.Field, field, re.Msg)
	}
	if re.Msg == "" || strings.Contains(re.Msg, "%!") {
		t.Errorf("bad message %q", re.Msg)
	}
}
