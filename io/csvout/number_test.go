package csvout

import (
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"

	"hoistfleet/io/outbuf"
	"hoistfleet/io/sinktest"
)

// TestAppendGSixDigits: appendG writes at most six significant digits, and the number
// read back is within half a unit of the sixth digit of the exact value (correct
// rounding); a value with six digits or fewer is written exactly. appendNum writes
// nothing for NaN and infinities, and appends after what is in the buffer.
func TestAppendGSixDigits(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	vals := append([]float64{}, sinktest.EdgeFloats...)
	vals = append(vals, 999999.5, 9.999995, 0.30000000000000004, -0.5, 1e-300, 123456.0000000001, 0.000001, -1e21, math.Nextafter(1e6, 0), math.Nextafter(-1e6, 0))
	for range 200_000 {
		vals = append(vals, sinktest.RandFloat(rng))
	}
	for _, f := range vals {
		if math.IsNaN(f) || math.IsInf(f, 0) {
			if got := appendNum([]byte("x"), f); string(got) != "x" {
				t.Fatalf("appendNum(%v) = %q, want nothing", f, got)
			}
			continue
		}
		s := string(appendG(nil, f))
		if got := string(appendNum([]byte("x"), f)); got != "x"+s {
			t.Fatalf("appendNum(%b) = %s, want x%s", f, got, s)
		}
		mant := strings.TrimLeft(strings.Map(func(r rune) rune {
			if r >= '0' && r <= '9' {
				return r
			}
			return -1
		}, strings.SplitN(s, "e", 2)[0]), "0")
		if len(strings.TrimRight(mant, "0")) > Digits {
			t.Fatalf("appendG(%v) = %s: more than %d significant digits", f, s, Digits)
		}
		got, err := strconv.ParseFloat(s, 64)
		if err != nil {
			t.Fatalf("appendG(%v) = %s: %v", f, s, err)
		}
		if f == 0 || math.Abs(f) < 1e-290 { // subnormal-range values: exponent arithmetic below loses meaning
			continue
		}
		half := 0.5 * math.Pow(10, math.Floor(math.Log10(math.Abs(f)))-(Digits-1))
		if d := math.Abs(got - f); d > half*(1+1e-9) {
			t.Fatalf("appendG(%v) = %s: off by %g, more than half a unit in the sixth digit (%g)", f, s, d, half)
		}
		if short := strconv.FormatFloat(f, 'g', -1, 64); len(strings.TrimLeft(strings.Split(strings.ReplaceAll(strings.TrimPrefix(short, "-"), ".", ""), "e")[0], "0")) <= Digits && got != f {
			t.Fatalf("appendG(%v) = %s: a value of six digits or fewer must be exact", f, s)
		}
	}
}

// BenchmarkAppendNum formats the numbers of real results: as the reference writer did
// (strconv, shortest round trip), to six digits (appendNum), and through outbuf.NumCache.
func BenchmarkAppendNum(b *testing.B) {
	_, rs := sinktest.BenchResults(b)
	var vals []float64
	for _, r := range rs {
		for _, c := range r.Checks {
			vals = append(vals, c.Demand, c.Capacity, c.Utilisation, c.Margin, c.LimitRatedLoadKg)
			for _, f := range c.Figures {
				vals = append(vals, f.Value)
			}
		}
	}
	buf := make([]byte, 0, 64)
	b.Run("strconv", func(b *testing.B) {
		for b.Loop() {
			for _, f := range vals {
				buf = refAppendNum(buf[:0], f)
			}
		}
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*len(vals)), "ns/number")
	})
	b.Run("shortest", func(b *testing.B) {
		for b.Loop() {
			for _, f := range vals {
				buf = appendNum(buf[:0], f)
			}
		}
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*len(vals)), "ns/number")
	})
	b.Run("cache", func(b *testing.B) {
		c := new(outbuf.NumCache)
		for b.Loop() {
			for _, f := range vals {
				if !math.IsNaN(f) && !math.IsInf(f, 0) {
					buf = c.Append(buf[:0], f, appendG)
				}
			}
		}
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*len(vals)), "ns/number")
	})
}
