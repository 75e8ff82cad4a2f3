package register

import (
	"math"
	"strconv"
	"testing"
)

// TestRangeBoundsMatchCheckRange: prepare's bounds pass exactly the SI values checkRange
// passes, at and next to each bound of every column (default and other units).
func TestRangeBoundsMatchCheckRange(t *testing.T) {
	specs := diffSpecs(t)
	checked := 0
	for i := range specs {
		s := &specs[i]
		if !s.known {
			continue
		}
		for _, b := range []float64{s.lo, s.hi, s.minSI, s.maxSI, 0} {
			for _, x := range []float64{b, math.Nextafter(b, math.Inf(-1)), math.Nextafter(b, math.Inf(1))} {
				if math.IsInf(x, 0) {
					continue
				}
				in := x >= s.lo && x <= s.hi
				if want := s.checkRange(x) == ""; in != want {
					t.Errorf("column %q: %v within [%v, %v] is %v, checkRange says %v", s.col.Key, x, s.lo, s.hi, in, want)
				}
				checked++
			}
		}
	}
	if checked < 100 {
		t.Fatalf("only %d values checked", checked)
	}
}

// TestNumberCellsAtBoundsMatchReference: cells written at, just inside and just outside
// each column's range, in the column's own unit, convert exactly as the reference does
// (the common number path decides the range with prepare's bounds).
func TestNumberCellsAtBoundsMatchReference(t *testing.T) {
	specs := diffSpecs(t)
	for i := range specs {
		s := &specs[i]
		if !s.known || (s.kind != kindNumber && s.kind != kindInteger) {
			continue
		}
		for _, b := range []float64{s.minSI, s.maxSI, s.lo, s.hi} {
			if math.IsInf(b, 0) || math.IsNaN(b) {
				continue
			}
			x := b / s.factor
			for _, v := range []float64{x, math.Nextafter(x, math.Inf(-1)), math.Nextafter(x, math.Inf(1)), x * (1 + 2e-9), x * (1 - 2e-9)} {
				for _, d := range diffDialects {
					sameCell(t, s, strconv.FormatFloat(v, 'g', -1, 64), d)
					sameCell(t, s, strconv.FormatFloat(v, 'g', 6, 64), d)
				}
			}
		}
	}
}
