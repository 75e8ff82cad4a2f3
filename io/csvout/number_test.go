package csvout

import (
	"math"
	"math/rand/v2"
	"strconv"
	"testing"

	"hoistfleet/io/outbuf"
	"hoistfleet/io/sinktest"
)

// TestAppendGMatchesStrconv: appendG (outbuf.AppendShortest) writes what
// strconv.AppendFloat(f, 'g', -1, 64) writes, for edge values and random ones, after
// what is already in the buffer; appendNum writes nothing for NaN and infinities.
func TestAppendGMatchesStrconv(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	vals := append([]float64{}, sinktest.EdgeFloats...)
	vals = append(vals, 999999.5, -0.5, 5e-324, -5e-324, 1e-323, 123456.0000000001, 0.000001, -1e21, math.Nextafter(1e6, 0), math.Nextafter(-1e6, 0))
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
		want := strconv.FormatFloat(f, 'g', -1, 64)
		if got := string(appendG(nil, f)); got != want {
			t.Fatalf("appendG(%b) = %s, strconv %s", f, got, want)
		}
		if got := string(appendNum([]byte("x"), f)); got != "x"+want {
			t.Fatalf("appendNum(%b) = %s, want x%s", f, got, want)
		}
	}
}

// BenchmarkAppendNum formats the numbers of real results: as the reference writer does
// (strconv), with outbuf.AppendShortest, and through outbuf.NumCache.
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
