package register

import (
	"bytes"
	"context"
	"encoding/csv"
	"errors"
	"io"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"
	"unicode/utf8"

	"hoistfleet/fleet"
)

// The differential tests of the CSV row path: records against encoding/csv, and the
// whole reader (NewCSV, Next) against the reference reader of reference_reader_test.go.

// recordInputs are CSV texts that exercise every branch of the record parser.
var recordInputs = []string{
	"", "\n", "\n\n\n", "a", "a\n", "a,b\nc,d\n", "a,b\r\nc,d\r\n", "a,b\rc\n", "a,b\r", "a,b\r\r\n", "a,\n,b\n,\n",
	"a;b\n1;2\n", "a\n\n\nb\n  \nc", "\r\n\r\na\r\n",
	`"a","b"` + "\n" + `"c""d",e` + "\n", `"a,b",c` + "\n", `"multi` + "\n" + `line",x` + "\n" + "y,z\n",
	`"multi` + "\r\n" + `line` + "\r\n\r\n" + `end",x` + "\r\n",
	`"a"` + "\n", `"a"`, `""` + "\n", `"",""` + "\n", `a,""` + "\n", `a,"b"` + "\r", `"a" ,b` + "\n",
	`a"b,c` + "\n" + "d,e\n", `a,b"c` + "\nd,e\n", `a,"b"c,d` + "\ne,f\n", `"open,x` + "\n" + "y,z\n",
	`"open` + "\n", `"open`, `a,"open` + "\n\n\n", `"x"` + "\n\"", "a,b\n\"c\nd\"\ne\n",
	"caf\xe9,na\xefve\n\"\xe9\",x\n", "\"\xc3\",\"\xa9\"\n\xc3,\xa9\n", "h\xc3\xa9,b\n",
	"a,b,c\n\"1\",2,\"3\"\n4,\"5\"\"\",6\n", ",,,\n,,,\n", "x\n\"\"\"\",\"\"\n",
	"a,b\n" + strings.Repeat("x", 70000) + ",y\n" + `"` + strings.Repeat("q", 70000) + "\n" + `z",w` + "\n",
	strings.Repeat("c,", 40000) + "\n1,2\n",
}

// sameRecords reads text with records and with encoding/csv configured as the reader
// configured it, and compares every record, error and line number.
func sameRecords(t *testing.T, text []byte) {
	t.Helper()
	a, sep, _, err := csvStream(bytes.NewReader(text))
	if err != nil {
		return
	}
	b, _, _, _ := csvStream(bytes.NewReader(text))
	got := newRecords(a, byte(sep))
	want := csv.NewReader(b)
	want.Comma, want.FieldsPerRecord, want.ReuseRecord = sep, -1, true
	for n := 0; ; n++ {
		rec, err := got.read()
		wrec, werr := want.Read()
		if !reflect.DeepEqual(err, werr) {
			t.Fatalf("%q record %d: error %v, encoding/csv %v", text, n, err, werr)
		}
		if !reflect.DeepEqual(rec, wrec) && !(len(rec) == 0 && len(wrec) == 0) {
			t.Fatalf("%q record %d: %q, encoding/csv %q", text, n, rec, wrec)
		}
		if err == io.EOF {
			return
		}
		for _, i := range []int{0, len(rec) - 1} {
			if i < 0 || err != nil {
				continue
			}
			if wl, _ := want.FieldPos(i); got.fieldLine(i) != wl {
				t.Fatalf("%q record %d field %d: line %d, encoding/csv %d", text, n, i, got.fieldLine(i), wl)
			}
		}
		var pe *csv.ParseError
		if err != nil && !errors.As(err, &pe) {
			return
		}
		valid := true
		for _, f := range rec {
			valid = valid && utf8.ValidString(f)
		}
		if got.valid && !valid {
			t.Fatalf("%q record %d: %q said valid UTF-8", text, n, rec)
		}
	}
}

func TestRecordsMatchEncodingCSV(t *testing.T) {
	for _, in := range recordInputs {
		sameRecords(t, []byte(in))
		sameRecords(t, []byte(strings.ReplaceAll(in, ",", ";")))
	}
}

func FuzzRecordsMatchEncodingCSV(f *testing.F) {
	for _, in := range recordInputs {
		if len(in) < 1000 {
			f.Add([]byte(in))
		}
	}
	f.Fuzz(func(t *testing.T, b []byte) { sameRecords(t, b) })
}

// sameAssets reads a CSV register with the reader and with the reference reader and
// compares the header and every Asset, field by field. It returns the rows read under
// the header: hoists and rows left out.
func sameAssets(t *testing.T, name string, data []byte) int {
	t.Helper()
	r, err := NewCSV(bytes.NewReader(data), name)
	ref, rerr := refNewCSV(bytes.NewReader(data), name)
	if (err == nil) != (rerr == nil) || (err != nil && err.Error() != rerr.Error()) {
		t.Fatalf("%s: NewCSV error %v, reference %v", name, err, rerr)
	}
	if err != nil {
		return 0
	}
	if !reflect.DeepEqual(r.Header(), ref.Header()) {
		t.Fatalf("%s: header\n%+v\nreference\n%+v", name, r.Header(), ref.Header())
	}
	ctx := context.Background()
	for n := 0; ; n++ {
		a, err := r.Next(ctx)
		w, werr := ref.refNext(ctx)
		if (err == nil) != (werr == nil) || (err != nil && err.Error() != werr.Error()) {
			t.Fatalf("%s asset %d: error %v, reference %v", name, n, err, werr)
		}
		if err != nil {
			return n + r.RowsLeftOut() - 1 // the rows under a one-row header
		}
		if !assetsEqual(a, w) {
			var got, want strings.Builder
			dumpAsset(&got, a)
			dumpAsset(&want, w)
			t.Fatalf("%s asset %d differs:\n%s\nreference\n%s", name, n, got.String(), want.String())
		}
	}
}

// assetsEqual is reflect.DeepEqual(a, b), faster under -race: the Values and Cells
// (most of an Asset) element by element, == first (deepEqual), then the rest of the
// struct.
func assetsEqual(a, b *fleet.Asset) bool {
	if a == nil || b == nil {
		return a == b
	}
	if !slicesEqual(a.Values, b.Values) || !slicesEqual(a.Cells, b.Cells) {
		return false
	}
	ra, rb := *a, *b
	ra.Values, rb.Values, ra.Cells, rb.Cells = nil, nil, nil, nil
	return reflect.DeepEqual(ra, rb)
}

// slicesEqual is reflect.DeepEqual for two slices: both nil or neither, the same length,
// the elements deeply equal.
func slicesEqual[T comparable](a, b []T) bool {
	if (a == nil) != (b == nil) || len(a) != len(b) {
		return false
	}
	for i := range a {
		if !deepEqual(a[i], b[i]) {
			return false
		}
	}
	return true
}

// TestReaderMatchesReference: the golden registers, generated registers in both dialects
// and mutilated copies of them read exactly as the reference reader read them. The
// inputs are made first (the mutations draw from one random sequence), then compared in
// three groups in parallel.
func TestReaderMatchesReference(t *testing.T) {
	golden := goldenInputs(t)
	header, rows := generatedRegister(7, 300)
	rng := rand.New(rand.NewPCG(7, 11))
	generated, mutated := map[byte][]byte{}, map[byte][][]byte{}
	for _, sep := range []byte{',', ';'} {
		generated[sep] = generatedCSV(header, rows, sep)
		short := generatedCSV(header, rows[:40], sep)
		for range 100 {
			mutated[sep] = append(mutated[sep], mutateCSV(rng, short))
		}
	}
	t.Run("golden", func(t *testing.T) {
		t.Parallel()
		for name, in := range golden {
			if !in.xlsx {
				sameAssets(t, name, in.data)
			}
		}
	})
	for _, sep := range []byte{',', ';'} {
		t.Run("generated "+string(sep), func(t *testing.T) {
			t.Parallel()
			if n := sameAssets(t, "gen.csv", generated[sep]); n < len(rows) {
				t.Fatalf("%d assets for %d rows", n, len(rows))
			}
			for _, m := range mutated[sep] {
				sameAssets(t, "mutated.csv", m)
			}
		})
	}
}

// mutateCSV damages a register in the ways files get damaged: quotes, separators and
// line breaks inserted or deleted, blank lines, CRLF, bytes that are not UTF-8, cut ends.
func mutateCSV(rng *rand.Rand, data []byte) []byte {
	b := append([]byte(nil), data...)
	for range 1 + rng.IntN(6) {
		i := rng.IntN(len(b) + 1)
		ins := []string{`"`, `""`, ",", ";", "\n", "\r\n", "\r", "\n\n", " ", "\xe9", "\xc3", "é", "\x00"}[rng.IntN(13)]
		switch rng.IntN(4) {
		case 0, 1:
			b = append(b[:i], append([]byte(ins), b[i:]...)...)
		case 2:
			if i < len(b) {
				b = append(b[:i], b[min(len(b), i+1+rng.IntN(8)):]...)
			}
		default:
			b = b[:max(i, len(b)*3/4)]
		}
	}
	return b
}

// FuzzReaderMatchesReference: any CSV file reads exactly as the reference reader read it.
func FuzzReaderMatchesReference(f *testing.F) {
	header, rows := generatedRegister(3, 4)
	f.Add(generatedCSV(header, rows, ','))
	f.Add(generatedCSV(header, rows, ';'))
	for _, in := range recordInputs {
		if len(in) < 1000 {
			f.Add([]byte("Asset ID,Rated load [t],Site\n" + in))
		}
	}
	f.Fuzz(func(t *testing.T, b []byte) { sameAssets(t, "f.csv", b) })
}

// TestAssetsNotShared: the Assets the reader returns share no memory the reader writes
// again, since they are kept by other goroutines until written.
func TestAssetsNotShared(t *testing.T) {
	header, rows := generatedRegister(5, 50)
	r, err := NewCSV(bytes.NewReader(generatedCSV(header, rows, ',')), "g.csv")
	if err != nil {
		t.Fatal(err)
	}
	var all []*fleet.Asset
	var dumps []string
	for {
		a, err := r.Next(context.Background())
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatal(err)
		}
		var b strings.Builder
		dumpAsset(&b, a)
		all, dumps = append(all, a), append(dumps, b.String())
	}
	for i, a := range all {
		var b strings.Builder
		dumpAsset(&b, a)
		if b.String() != dumps[i] {
			t.Fatalf("asset %d changed after later rows were read:\n%s\nwas\n%s", i, b.String(), dumps[i])
		}
		if cap(a.Values) != len(a.Values) && a.Values != nil || cap(a.Cells) != len(a.Cells) {
			t.Fatalf("asset %d: Values or Cells have spare capacity an append could share", i)
		}
	}
}
