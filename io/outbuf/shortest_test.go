package outbuf

import (
	"math"
	"math/rand/v2"
	"strconv"
	"testing"
)

// shortestFormats are the formats AppendShortest takes.
var shortestFormats = []byte{'g', 'e', 'f'}

// checkShortest fails when AppendShortest(f) differs from strconv in any format.
func checkShortest(t *testing.T, f float64) {
	t.Helper()
	var wb, gb [32]byte // on the stack: most numbers fit, so the loop allocates little
	for _, format := range shortestFormats {
		want := strconv.AppendFloat(append(wb[:0], 'x'), f, format, -1, 64)
		if got := AppendShortest(append(gb[:0], 'x'), f, format); string(got) != string(want) {
			t.Fatalf("AppendShortest(%b = %v, %q) = %s, strconv %s", f, f, format, got, want)
		}
	}
}

// edgeFloats are values at the ends and seams of the fast path.
var edgeFloats = []float64{0, math.Copysign(0, -1), 1, -1, 0.5, 0.1, 0.2, 0.3, 0.30000000000000004, 1e-3,
	math.Nextafter(1e-3, 0), math.Nextafter(1e-3, 1), 1e-4, 9.99e-4, 1e15, math.Nextafter(1e15, 0),
	math.Nextafter(1e15, 2e15), 999999999999999.9, 1e6, 999999.5, 1e6 + 0.5, 123456.7, 1e-5, 1.5e-9,
	5e-324, math.SmallestNonzeroFloat64, math.MaxFloat64, -math.MaxFloat64, 1 << 53, 1<<53 + 2,
	2.2250738585072014e-308, 1e21, 1e22, 1e23, 9.5, 0.95, 9.999999999999999e14, 1e16, 1e17,
	16257.708885941633, 1.2777814192843628e-05, math.NaN(), math.Inf(1), math.Inf(-1), 100, 1000.5,
	0.001, 0.00999, 0.0999, 9.999999999999998, 5.0000000000000001e-3}

// TestAppendShortestMatchesStrconv compares AppendShortest with strconv on edge values,
// every power of ten and of two in range with their neighbours, short decimals, and
// random numbers of every kind.
func TestAppendShortestMatchesStrconv(t *testing.T) {
	t.Parallel() // with the other long comparisons below: they share nothing
	for _, f := range edgeFloats {
		checkShortest(t, f)
		checkShortest(t, -f)
	}
	for e := -30; e <= 30; e++ {
		p := math.Pow(10, float64(e))
		for _, f := range []float64{p, math.Nextafter(p, 0), math.Nextafter(p, math.Inf(1)), 2 * p, 5 * p, 9.5 * p} {
			checkShortest(t, f)
		}
	}
	for e := -60; e <= 60; e++ {
		p := math.Ldexp(1, e)
		for _, f := range []float64{p, math.Nextafter(p, 0), math.Nextafter(p, math.Inf(1)), 3 * p} {
			checkShortest(t, f)
		}
	}
	rng := rand.New(rand.NewPCG(3, 4))
	n := 2_000_000
	if testing.Short() {
		n = 200_000
	}
	for range n {
		checkShortest(t, randShortestInput(rng))
	}
}

// TestAppendShortestWhole compares AppendShortest with strconv on whole numbers: every
// one below 200 000, those around each power of ten, and random ones of every length,
// with both signs.
func TestAppendShortestWhole(t *testing.T) {
	t.Parallel()
	for i := range 200_000 {
		checkShortest(t, float64(i))
		checkShortest(t, -float64(i))
	}
	for _, p := range pow10[:16] {
		for d := -2; d <= 2; d++ {
			checkShortest(t, float64(int64(p)+int64(d)))
			checkShortest(t, -float64(int64(p)+int64(d)))
		}
	}
	rng := rand.New(rand.NewPCG(13, 14))
	for range 200_000 {
		f := float64(rng.Int64N(int64(pow10[1+rng.IntN(16)])))
		checkShortest(t, f)
		checkShortest(t, -f)
	}
}

// randShortestInput is a number of one of the kinds results hold: random bits, any
// magnitude from 1e-5 to 1e17 with all digits, a decimal of 1 to 17 digits, or one
// of those nudged by a unit in the last place.
func randShortestInput(rng *rand.Rand) float64 {
	var f float64
	switch rng.IntN(4) {
	case 0:
		f = math.Float64frombits(rng.Uint64())
	case 1:
		f = math.Exp(rng.Float64()*(17+5)*math.Ln10 - 5*math.Ln10)
	case 2:
		digits := rng.IntN(17) + 1
		m := rng.Int64N(int64(math.Pow(10, float64(digits))))
		f, _ = strconv.ParseFloat(strconv.FormatInt(m, 10)+"e"+strconv.Itoa(rng.IntN(24)-12), 64)
	default:
		f = math.Nextafter(float64(rng.IntN(1_000_000))/math.Pow(10, float64(rng.IntN(8))), math.Inf(int(rng.IntN(2))*2-1))
	}
	if rng.IntN(2) == 0 {
		f = -f
	}
	return f
}

// TestAppendShortestExhaustive compares every float64 in stretches of consecutive bit
// patterns, across magnitudes and at the ends of the fast path's range.
func TestAppendShortestExhaustive(t *testing.T) {
	t.Parallel()
	n := 100_000
	if testing.Short() {
		n = 10_000
	}
	for _, start := range []float64{1e-3, 0.0123, 0.1, 1, 9.99, 1234.5678, 65536, 999999, 1e6, 4.5e9, 1e14, math.Nextafter(1e15, 0)} {
		b := math.Float64bits(start) - uint64(n/2)
		for i := range uint64(n) {
			checkShortest(t, math.Float64frombits(b+i))
		}
	}
}

// FuzzAppendShortest compares AppendShortest with strconv on any bit pattern.
func FuzzAppendShortest(f *testing.F) {
	for _, v := range edgeFloats {
		f.Add(math.Float64bits(v))
	}
	f.Fuzz(func(t *testing.T, b uint64) {
		checkShortest(t, math.Float64frombits(b))
		// The fuzzer's bit patterns are mostly far outside the fast path's range:
		// also try the pattern's mantissa at a magnitude inside it.
		m := b & (1<<52 - 1)
		e := 1023 - 10 + b>>52%60 // 2^-10 to 2^49
		checkShortest(t, math.Float64frombits(e<<52|m))
	})
}

// BenchmarkAppendShortest formats random numbers of result-like magnitudes.
func BenchmarkAppendShortest(b *testing.B) {
	rng := rand.New(rand.NewPCG(5, 6))
	vals := make([]float64, 4096)
	for i := range vals {
		vals[i] = math.Exp(rng.Float64()*8*math.Ln10 - 2*math.Ln10)
	}
	buf := make([]byte, 0, 32)
	b.Run("strconv", func(b *testing.B) {
		for i := 0; b.Loop(); i++ {
			buf = strconv.AppendFloat(buf[:0], vals[i%len(vals)], 'g', -1, 64)
		}
	})
	b.Run("shortest", func(b *testing.B) {
		for i := 0; b.Loop(); i++ {
			buf = AppendShortest(buf[:0], vals[i%len(vals)], 'g')
		}
	})
}

// TestEncode8 compares encode8 with an odometer of ASCII digits, for every x < 1e8
// (every 97th in -short mode). The odometer is the eight digits as encode8 lays them
// out, the first in the low byte, held in a uint64: the loop touches no memory, so it
// runs as fast under -race as without it.
func TestEncode8(t *testing.T) {
	step := uint32(1)
	if testing.Short() {
		step = 97
	}
	want := uint64(0x3030_3030_3030_3030) // "00000000"
	for x := uint32(0); x < 1e8; x++ {
		if x%step == 0 {
			if got := encode8(x); got != want {
				var g, w [8]byte
				le.PutUint64(g[:], got)
				le.PutUint64(w[:], want)
				t.Fatalf("encode8(%d) = %q, want %q", x, g[:], w[:])
			}
		}
		for shift := 56; shift >= 0; shift -= 8 { // add one: the last digit is the high byte
			if want>>shift&0xFF < '9' {
				want += 1 << shift
				break
			}
			want -= ('9' - '0') << shift // 9 → 0, carry into the digit before
		}
	}
}

// TestDigitCount compares digitCount with the length of strconv's digits at every
// power of ten, its neighbours and random numbers.
func TestDigitCount(t *testing.T) {
	vals := []uint64{1, 9, math.MaxUint64}
	for _, p := range pow10[1:] {
		vals = append(vals, p-1, p, p+1)
	}
	rng := rand.New(rand.NewPCG(7, 8))
	for range 100_000 {
		vals = append(vals, rng.Uint64()>>rng.IntN(64)|1)
	}
	for _, q := range vals {
		if got, want := digitCount(q), len(strconv.FormatUint(q, 10)); got != want {
			t.Fatalf("digitCount(%d) = %d, want %d", q, got, want)
		}
	}
}

// TestShortestDecimalDecides: the fast path, not strconv, writes nearly every number in
// its range (otherwise the comparisons above would only test strconv against itself),
// and counts the digits it finds right.
func TestShortestDecimalDecides(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 10))
	const n = 100_000
	decided := 0
	for range n {
		f := math.Exp(rng.Float64()*18*math.Ln10 - 3*math.Ln10) // 1e-3 to 1e15
		if q, _, n, ok := shortestDecimal(f); ok {
			decided++
			if want := len(strconv.FormatUint(q, 10)); n != want {
				t.Fatalf("shortestDecimal(%v) = %d with n = %d, want %d", f, q, n, want)
			}
		}
	}
	if decided < n*99/100 {
		t.Fatalf("the fast path decided %d of %d numbers in its range", decided, n)
	}
}
