package calc_test

import (
	"testing"

	"hoistfleet/calc"
)

// TestMBFBandHoldsEveryPublishedRope: every rope of EN 12385-4's K table in the project's
// standards notes (K 0.293–0.359, seen) at every grade listed there (1770, 1960, 2160
// N/mm², seen) lies inside the plausibility band, so a real rope is never called a slip;
// the slips the band is for (×1000: N for kN; ×9.81: kgf) lie outside it.
func TestMBFBandHoldsEveryPublishedRope(t *testing.T) {
	lo, hi := calc.MBFPerD2Range()
	for _, k := range []float64{0.330, 0.356, 0.332, 0.359, 0.307, 0.332, 0.295, 0.319, 0.293} {
		for _, grade := range []float64{1770, 1960, 2160} {
			for _, dmm := range []float64{6, 11, 20, 40} {
				d := dmm / 1000
				mbf := calc.MBFFromGrade(d, grade, k)
				if f := calc.SlipFactor(mbf, lo*d*d, hi*d*d); f != 1 {
					t.Errorf("K %.3f, %g N/mm², %g mm: MBF %.1f kN called a slip (×%g)", k, grade, dmm, mbf/1000, f)
				}
			}
		}
	}
	// 20 mm 6×36 IWRC 1960: 279.1 kN (standards notes, computed). Written in N in a kN
	// column it reads 279 100 kN; in kgf, 28 460 "kN".
	d := 0.020
	if f := calc.SlipFactor(279.1e3*1000, lo*d*d, hi*d*d); f != 1000 {
		t.Errorf("279 100 kN on a 20 mm rope: slip factor %g, want 1000", f)
	}
	if f := calc.SlipFactor(28460e3, lo*d*d, hi*d*d); f != 100 {
		t.Errorf("28 460 kN on a 20 mm rope: slip factor %g, want 100 (the nearest power of ten)", f)
	}
	if f := calc.SlipFactor(279.1, lo*d*d, hi*d*d); f != 1000 {
		t.Errorf("279.1 N on a 20 mm rope (kN written in an N column): slip factor %g, want 1000", f)
	}
}
