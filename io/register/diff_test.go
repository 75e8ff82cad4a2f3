package register

import (
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"strconv"
	"strings"
	"testing"

	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
)

// cellCorpus is the cells the differential tests try in every column: good values in each
// kind and the kinds of bad input registers hold.
var cellCorpus = []string{
	"", " ", "\t", "0", "-0", "+0", "00", "007", "7", " 7 ", "12.5", "12,5", "-12.5", "+12.5", ".5", "5.", "-.5",
	"1e3", "1E3", "1e-3", "1e+3", "1e", "1e+", "3.5e", "1.e3", "0.e1", "0e1", "1e400", "-1e400", "1e-400", "4.9e-324",
	"1.7976931348623157e308", "123456789012345678901234567890", "0.1", "0.0001", "1.250", "1,250", "1,250.5", "1.250,5",
	"1.234.567", "1,234,567", "12,5,0", "12.5.0", "1 250", "1\u00a0250", "1'250", "1_000", "0x1p3", "0x10", "NaN", "nan",
	"Inf", "+Inf", "-inf", "Infinity", "12.5 t", "12.5t", "12,5 kg", ".5m", "5 %", "95%", "95 %", "-5%", "%", "1e3%",
	"12,5%", "#DIV/0!", "#N/A", "#VALUE!", "twelve", "½", "١٢", "１２", "12\u200b", "2023-05-17", "2024-02-29",
	"2023-02-29", "2023-02-30", "2023-13-01", "2023-00-10", "2023-01-00", "2023-6-30", "20230630", "31/12/2023",
	" 2023-06-30 ", "2023-06-30T10:00:00Z", "2023-06-30T10:00:00", "2023-06-30T10:00Z", "2023-06-30T10:00",
	"2023-06-30 10:00:00", "2023-06-30 10:00", "2023-06-30 10:00:00+02:00", "2023-06-30T10:00:00.123+02:00",
	"2023-06-30T25:00", "2023-06-30x", "2023-06-30T", "0000-01-01", "9999-12-31", "+2023-06-30", "2023-06-3a",
	"45292", "45292.5", "45292.99999999", "1", "0.5", "2958465", "2958466", "60", "61", "3000000", "-1",
	"yes", "no", "Yes", "YES", "y", "N", "true", "FALSE", "1", "maybe", " yes ", "oui",
	"M5", "m5", "ISO M5", "iso4301 M5", "FEM 1Am", "fem9511-1Am", "1Am", "1am", "2m", "L1", "l2", "L 3", "L-4", "L5",
	"iso", "fem", "ISO", "M 5", "M5!", "Ünknown", "x,y", `say "hi"`, "Travée côté façade", "line\nbreak",
}

// diffSpecs builds the column specs of a header naming every schema column (in its
// default unit and in other units), plus columns whose header is unusable.
func diffSpecs(t testing.TB) []colSpec {
	t.Helper()
	var titles []string
	for _, c := range schema.Columns() {
		titles = append(titles, c.HeaderWithUnit(""))
	}
	// Same quantities in other units, and header problems, in a second header (a
	// header may name a column once).
	alt := []string{"Rated load [lb]", "Rope diameter (in)", "Sheave efficiency [%]", "Test load [ton]",
		"Drum inertia [kgf m2]", "Motor inertia GD2 [kgf m2]", "Hoisting speed [ft/min]", "Rope grade [psi]", "Site [m]", "Notes"}
	var specs []colSpec
	for _, h := range [][]string{titles, alt} {
		r := &Reader{sheet: "R"}
		if err := r.buildHeader("f", h, 1); err != nil {
			t.Fatal(err)
		}
		specs = append(specs, r.specs...)
	}
	return specs
}

var diffDialects = []dialect{{}, {decimalComma: true}, {xlsx: true}, {xlsx: true, date1904: true}}

// sameCell compares the current conversion of one cell with the reference's.
func sameCell(t *testing.T, s *colSpec, raw string, d dialect) {
	t.Helper()
	ref := fleet.CellRef{Sheet: "R", Row: 7, Col: 3}
	v, c := s.parse(raw, d, ref, "H-1")
	wv, wc := s.refParse(raw, d, ref, "H-1")
	if !deepEqual(c, wc) {
		t.Fatalf("column %q %+v cell %q: Cell %+v, reference %+v", s.col.Key, d, raw, c, wc)
	}
	if !deepEqual(v, wv) {
		t.Fatalf("column %q %+v cell %q: Value\n %s\nreference\n %s", s.col.Key, d, raw, showValue(v), showValue(wv))
	}
	if (v.Err == nil) != (wv.Err == nil) || (v.Err != nil && dumpErr(v.Err) != dumpErr(wv.Err)) {
		t.Fatalf("column %q cell %q: error %v, reference %v", s.col.Key, raw, v.Err, wv.Err)
	}
}

// deepEqual is reflect.DeepEqual, trying == first: what == finds equal is deeply
// equal, and it is much faster under -race.
func deepEqual[T comparable](a, b T) bool { return a == b || reflect.DeepEqual(a, b) }

func showValue(v fleet.Value) string {
	s := fmt.Sprintf("state=%d num=%s text=%q date=%v raw=%q cell=%+v", v.State, bits(v.Num), v.Text, v.Date, v.Raw, v.Cell)
	if v.Err != nil {
		s += " err=" + dumpErr(v.Err)
	}
	return s
}

// TestCellConversionMatchesReference: every column × every corpus cell × every dialect
// converts exactly as the reference (reference_test.go: commit f7400a6's conversion,
// without the speed-ups) does. The dialects run in parallel, each with its own columns.
func TestCellConversionMatchesReference(t *testing.T) {
	var cells []string
	for _, c := range cellCorpus {
		cells = append(cells, c, " "+c, c+" ", strings.ToUpper(c))
	}
	for _, d := range diffDialects {
		t.Run(fmt.Sprintf("%+v", d), func(t *testing.T) {
			t.Parallel()
			specs := diffSpecs(t)
			for i := range specs {
				for _, c := range cells {
					sameCell(t, &specs[i], c, d)
				}
			}
		})
	}
}

// TestNumberHelpersMatchReference compares the number and date helpers directly.
func TestNumberHelpersMatchReference(t *testing.T) {
	for _, c := range cellCorpus {
		for _, s := range []string{c, strings.TrimSpace(c)} {
			sameHelpers(t, s)
		}
	}
}

func sameHelpers(t *testing.T, s string) {
	t.Helper()
	if got, want := isPlainNumber(s), refIsPlainNumber(s); got != want {
		t.Fatalf("isPlainNumber(%q) = %v, reference %v", s, got, want)
	}
	if got, want := numberSyntax(s), refNumberSyntax(s); got != want {
		t.Fatalf("numberSyntax(%q) = %v, reference %v", s, got, want)
	}
	for _, d := range diffDialects {
		x, h, ok := parseNumber(s, d)
		wx, wh, wok := refParseNumber(s, d)
		if bits(x) != bits(wx) || h != wh || ok != wok {
			t.Fatalf("parseNumber(%q, %+v) = %v %q %v, reference %v %q %v", s, d, x, h, ok, wx, wh, wok)
		}
		tm, msg := parseDate(s, d)
		wtm, wmsg := refParseDate(s, d)
		if !reflect.DeepEqual(tm, wtm) || msg != wmsg {
			t.Fatalf("parseDate(%q, %+v) = %v %q, reference %v %q", s, d, tm, msg, wtm, wmsg)
		}
	}
}

// FuzzCellMatchesReference: any cell, in any column and dialect, converts exactly as the
// reference does.
func FuzzCellMatchesReference(f *testing.F) {
	for i, c := range cellCorpus {
		f.Add(c, uint8(i), uint8(i%4))
	}
	specs := diffSpecs(f)
	f.Fuzz(func(t *testing.T, raw string, pick, dial uint8) {
		sameHelpers(t, raw)
		sameCell(t, &specs[int(pick)%len(specs)], raw, diffDialects[int(dial)%len(diffDialects)])
	})
}

// TestScanNumberMatchesStrconv: scanNumber's value is strconv.ParseFloat's, bit for bit,
// over random decimals of up to 25 digits and exponents around the exact range.
func TestScanNumberMatchesStrconv(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	digits := func(n int) string {
		b := make([]byte, n)
		for i := range b {
			b[i] = byte('0' + rng.IntN(10))
		}
		return string(b)
	}
	for range 200000 {
		s := ""
		if rng.IntN(4) == 0 {
			s = "-"
		}
		s += digits(rng.IntN(12))
		if rng.IntN(2) == 0 {
			s += "." + digits(rng.IntN(14))
		}
		if rng.IntN(3) == 0 {
			s += "e" + strconv.Itoa(rng.IntN(60)-30)
		}
		nb := scanNumber(s)
		if nb.syntax != refNumberSyntax(s) {
			t.Fatalf("%q: syntax %v", s, nb.syntax)
		}
		if !nb.syntax {
			continue
		}
		want, werr := strconv.ParseFloat(s, 64)
		got, err := nb.float(s)
		if math.Float64bits(got) != math.Float64bits(want) || (err == nil) != (werr == nil) {
			t.Fatalf("%q: %v %v, strconv %v %v (exact path %v)", s, got, err, want, werr, nb.exact)
		}
		if nb.plain != refIsPlainNumber(s) {
			t.Fatalf("%q: plain %v", s, nb.plain)
		}
	}
}
