package csvout

import (
	"encoding/csv"
	"math/rand/v2"
	"strings"
	"testing"
	"unicode/utf8"

	"hoistfleet/io/sinktest"
)

// checkField writes s as the second field of a record (the first is x, or y when x is
// the separator) with separator comma and reads the record back with encoding/csv: the
// field must read back as s, with the formula guard's apostrophe in front when s starts
// with = + - @ tab or CR. encoding/csv reads CR LF inside a quoted field as LF.
func checkField(t *testing.T, s string, comma rune) {
	t.Helper()
	fc := newFieldCoder(comma)
	first := "x"
	if comma == 'x' {
		first = "y"
	}
	rec := append([]byte(first), string(comma)...)
	rec = appendText(&fc, rec, s)
	rec = append(rec, '\n')
	r := csv.NewReader(strings.NewReader(string(rec)))
	r.Comma = comma
	fields, err := r.Read()
	if err != nil {
		t.Fatalf("field %q, separator %q: %q does not read back: %v", s, comma, rec, err)
	}
	want := strings.ReplaceAll(s, "\r\n", "\n")
	if NeedsGuard(s) {
		want = "'" + want
	}
	if len(fields) != 2 || fields[1] != want {
		t.Fatalf("field %q, separator %q: wrote %q, read back %q, want [%s %q]", s, comma, rec, fields, first, want)
	}
	// the same bytes from []byte input, and the same decision as the reference writer
	if got := string(appendText(&fc, nil, []byte(s))); got != string(rec[len(first)+len(string(comma)):len(rec)-1]) {
		t.Fatalf("field %q: string and []byte encodings differ", s)
	}
	ref := &refWriter{opts: Options{Comma: comma}}
	if got, want := string(appendText(&fc, nil, s)), string(ref.appendText(nil, s)); got != want {
		t.Fatalf("field %q, separator %q: %q, previous writer %q", s, comma, got, want)
	}
}

// readableCommas are separators encoding/csv can read back (it refuses U+FFFD).
var readableCommas = []rune{',', ';', '\t', ' ', '.', '0', 'e', '=', '-', 'a', '/', '|', 'é', '€', '≥', '\U0001F600'}

func TestFieldRoundTripRandom(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	n := 100_000
	if testing.Short() {
		n = 10_000
	}
	for range n {
		s := sinktest.RandText(rng)
		if rng.IntN(4) == 0 { // random bytes too
			b := make([]byte, rng.IntN(12))
			for i := range b {
				b[i] = byte(rng.UintN(256))
			}
			s += string(b)
		}
		checkField(t, s, readableCommas[rng.IntN(len(readableCommas))])
	}
}

func FuzzField(f *testing.F) {
	for i, p := range sinktest.TextPieces {
		f.Add(p, readableCommas[i%len(readableCommas)])
		f.Add(p+"x"+p, ',')
		f.Add(" "+p, ';')
	}
	f.Fuzz(func(t *testing.T, s string, comma rune) {
		if comma == 0 || comma == '"' || comma == '\r' || comma == '\n' || comma == '\'' || comma == utf8.RuneError || !utf8.ValidRune(comma) {
			t.Skip()
		}
		checkField(t, s, comma)
	})
}

// TestHasSpecialRuneError: with U+FFFD as separator, invalid UTF-8 counts as one, as it
// does when the field is ranged over rune by rune.
func TestHasSpecialRuneError(t *testing.T) {
	fc := newFieldCoder(utf8.RuneError)
	for _, tc := range []struct {
		s    string
		want bool
	}{{"abc", false}, {"a\uFFFDb", true}, {"a\xffb", true}, {"\xe2\x82", true}, {"€", false}, {"a\"", true}} {
		if got := hasSpecial(&fc, tc.s); got != tc.want {
			t.Errorf("hasSpecial(%q) = %v, want %v", tc.s, got, tc.want)
		}
	}
}

// TestMemosRandom: through a memo (with its textCache) and a freeMemo, every text is
// encoded as appendText encodes it, over random sequences from a few values, so that
// every remembered entry is hit, moved to the front and evicted, in one place and in
// several, with a separator that forces quoting.
func TestMemosRandom(t *testing.T) {
	values := []string{"", "drum.h1 = 16 (M4)", "drum.h1 = 18 (M5)", "a,b", "q\"uote", "=1", " x", "drum.h1 = 20 (M6)", "é"}
	rng := rand.New(rand.NewPCG(21, 22))
	for _, comma := range []rune{',', ';', '\t', 'é'} {
		fc := newFieldCoder(comma)
		var tc textCache
		memos := make([]memo, 3)
		frees := make([]freeMemo, 3)
		for i := range 20_000 {
			// A fresh copy half the time: equal texts need not share their bytes.
			s := values[rng.IntN(1+rng.IntN(len(values)))]
			if rng.IntN(2) == 0 {
				s = strings.Clone(s)
			}
			p := rng.IntN(len(memos))
			want := string(appendText(&fc, []byte("x"), s))
			if got := string(tc.appendText(&fc, &memos[p], []byte("x"), s)); got != want {
				t.Fatalf("comma %q, step %d: memo wrote %q for %q, want %q", comma, i, got, s, want)
			}
			if got := string(frees[p].appendText(&fc, []byte("x"), s)); got != want {
				t.Fatalf("comma %q, step %d: freeMemo wrote %q for %q, want %q", comma, i, got, s, want)
			}
		}
	}
}
