package approx

import (
	"math"
	"testing"
)

func TestEqual(t *testing.T) {
	inf, nan := math.Inf(1), math.NaN()
	for _, tc := range []struct {
		got, want, abs, rel float64
		equal               bool
	}{
		{1, 1, 0, 0, true},
		{inf, inf, 0, 0, true},
		{-inf, inf, 1, 1, false},
		{inf, 5, 0, 1, false}, // not |∞ − 5| ≤ 1·∞
		{nan, nan, 0, 0, true},
		{nan, 1, 1, 1, false},
		{1, nan, 1, 1, false},
		{1e-10, 0, 1e-9, 0, true},    // absolute
		{1e-8, 0, 1e-9, 0.5, false},  // relative to max(|got|, |want|) = 1e-8: 0.5e-8 < 1e-8
		{100, 101, 0, 0.01, true},    // 1 ≤ 0.01 × 101
		{100, 101.5, 0, 0.01, false}, // 1.5 > 1.015
		{-100, -101, 0, 0.01, true},  // magnitudes
		{1, -1, 0, 1, false},         // 2 > 1
		{0.1 + 0.2, 0.3, 0, 1e-15, true},
	} {
		if got := Equal(tc.got, tc.want, tc.abs, tc.rel); got != tc.equal {
			t.Errorf("Equal(%v, %v, %v, %v) = %v, want %v", tc.got, tc.want, tc.abs, tc.rel, got, tc.equal)
		}
	}
}

type recorder struct {
	testing.TB
	failed bool
	msg    string
}

func (r *recorder) Helper() {}
func (r *recorder) Errorf(format string, args ...any) {
	r.failed = true
	r.msg = format
}

func TestCheck(t *testing.T) {
	r := &recorder{TB: t}
	Check(r, "x", 1, 1.05, 0, 0.1)
	if r.failed {
		t.Errorf("Check failed within the tolerance")
	}
	Check(r, "x", 1, 1.5, 0, 0.1)
	if !r.failed {
		t.Errorf("Check passed outside the tolerance")
	}
}
