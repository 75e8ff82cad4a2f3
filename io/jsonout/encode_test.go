package jsonout

import (
	"bytes"
	"encoding/json"
	"math"
	"math/rand/v2"
	"testing"

	"hoistfleet/io/sinktest"
)

// jsonString is s as encoding/json writes it with SetEscapeHTML(false): the form the
// hand-written encoder reproduces.
func jsonString(t *testing.T, s string) string {
	t.Helper()
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(s); err != nil {
		t.Fatal(err)
	}
	return string(bytes.TrimSuffix(buf.Bytes(), []byte("\n")))
}

func checkString(t *testing.T, s string) {
	t.Helper()
	want := jsonString(t, s)
	got := appendString([]byte("x"), s)
	if string(got[1:]) != want {
		t.Fatalf("appendString(%q) = %s, encoding/json %s", s, got[1:], want)
	}
	if !json.Valid(got[1:]) {
		t.Fatalf("appendString(%q) = %s: not JSON", s, got[1:])
	}
}

// TestAppendStringRandom compares with encoding/json on texts made of the characters
// that matter (quotes, backslashes, control characters, <>&, U+2028/2029, invalid UTF-8)
// and on random bytes.
func TestAppendStringRandom(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	n := 100_000
	if testing.Short() {
		n = 10_000
	}
	for c := range 256 { // every single byte
		checkString(t, string(rune(c)))
		checkString(t, string([]byte{byte(c)}))
	}
	for range n {
		s := sinktest.RandText(rng)
		if rng.IntN(3) == 0 {
			b := make([]byte, rng.IntN(12))
			for i := range b {
				b[i] = byte(rng.UintN(256))
			}
			s += string(b)
		}
		checkString(t, s)
	}
}

func FuzzAppendString(f *testing.F) {
	for _, p := range sinktest.TextPieces {
		f.Add(p)
		f.Add("a" + p + "b" + p)
	}
	f.Fuzz(checkString)
}

// TestAppendNumberRandom compares AppendNumber, and the number cache, with encoding/json
// on edge values and random ones (random bits cover subnormals and the extremes).
func TestAppendNumberRandom(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	vals := append([]float64{}, sinktest.EdgeFloats...)
	vals = append(vals, 1e15, 1e15-1, -1e15+1, 1e15+2, 999999999999999.9, 5e-324, 1e-6, math.Nextafter(1e-6, 0), math.Nextafter(1e21, 0), -1e21, 1e-7)
	for range 200_000 {
		vals = append(vals, sinktest.RandFloat(rng))
	}
	var c numCache
	for pass := range 2 { // the second pass reads most numbers from the cache
		for _, f := range vals {
			if math.IsNaN(f) || math.IsInf(f, 0) {
				if got := string(c.appendNumber(nil, f)); got != "null" {
					t.Fatalf("numCache.appendNumber(%v) = %s, want null", f, got)
				}
				continue
			}
			want, err := json.Marshal(f)
			if err != nil {
				t.Fatal(err)
			}
			if got := AppendNumber(nil, f); string(got) != string(want) {
				t.Fatalf("AppendNumber(%b) = %s, encoding/json %s", f, got, want)
			}
			if got := c.appendNumber([]byte("x"), f); string(got) != "x"+string(want) {
				t.Fatalf("pass %d: numCache.appendNumber(%b) = %s, want x%s", pass, f, got, want)
			}
		}
	}
}
