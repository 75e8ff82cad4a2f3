package outbuf

import (
	"bytes"
	"math"
	"math/rand/v2"
	"strconv"
	"testing"
)

// memoValues are numbers that a memo must tell apart: 0 and -0, values one bit apart,
// NaN and infinities, whole numbers and fractions in and out of AppendShortest's fast
// path; memoInput draws repeats of them and random numbers.
var memoValues = []float64{0, math.Copysign(0, -1), 1, -1, 1.5, math.Nextafter(1.5, 2), math.Nextafter(1.5, 1),
	0.1, math.Nextafter(0.1, 1), 1.0 / 3, -1.0 / 3, 0.5, 0.25, 1e-7, 2.5e20, 1e21, 123456789.25, 1e6, 999999.5,
	16257.708885941633, math.NaN(), math.Float64frombits(0x7FF8000000000001), math.Inf(1), math.Inf(-1),
	math.MaxFloat64, math.SmallestNonzeroFloat64}

func memoInput(rng *rand.Rand) float64 {
	if rng.IntN(4) == 0 {
		return randShortestInput(rng)
	}
	return memoValues[rng.IntN(len(memoValues))]
}

// TestNumMemo: through a memo, every number reads as strconv writes it, in each format,
// hoist after hoist (a Reset and a fresh buffer each, or one buffer that keeps growing),
// with hits, misses and slot collisions alike: more numbers in a hoist than the memo has
// slots.
func TestNumMemo(t *testing.T) {
	rng := rand.New(rand.NewPCG(31, 32))
	for _, format := range shortestFormats {
		var m NumMemo
		var got, want []byte
		for hoist := range 300 {
			if hoist%2 == 0 { // a fresh buffer, as Prepare has: the same places again
				got, want = got[:0], want[:0]
			}
			m.Reset()
			n := 1 + rng.IntN(150)
			if hoist%50 == 0 {
				n = 3 << numMemoBits
			}
			for range n {
				f := memoInput(rng)
				got = m.AppendShortest(append(got, ';'), f, format)
				want = strconv.AppendFloat(append(want, ';'), f, format, -1, 64)
			}
			if !bytes.Equal(got, want) {
				t.Fatalf("format %q, hoist %d: AppendShortest wrote\n%s\nwant\n%s", format, hoist, got, want)
			}
		}
	}
}

// TestNumMemoForgets: after a Reset the memo copies nothing from where numbers were
// written before, even when the buffer again holds bytes at those places and the
// generation count wraps around; a place past the end of the buffer is not copied.
func TestNumMemoForgets(t *testing.T) {
	// "0.25" at 7 in the first generation; after n Resets, other bytes there. The counts
	// are around the wrap of a 16-bit generation count, once and twice.
	for _, n := range []int{1, 2, 1<<16 - 2, 1<<16 - 1, 1 << 16, 1<<17 - 3, 1<<17 - 2, 1<<17 - 1} {
		var m NumMemo
		m.AppendShortest(m.AppendShortest([]byte("wxyz"), 1.5, 'g'), 0.25, 'g')
		for range n {
			m.Reset()
		}
		if got := string(m.AppendShortest([]byte("0123456789ab"), 0.25, 'g')); got != "0123456789ab0.25" {
			t.Fatalf("after %d resets: got %q, want 0123456789ab0.25", n, got)
		}
	}
	var m NumMemo
	m.Reset()
	m.AppendShortest([]byte("abcdef"), 0.75, 'g')                                  // "0.75" at 6
	if got := string(m.AppendShortest([]byte("ab"), 0.75, 'g')); got != "ab0.75" { // without a Reset: 6 is past the end
		t.Fatalf("got %q, want ab0.75", got)
	}
}
