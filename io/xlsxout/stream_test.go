package xlsxout

import (
	"bytes"
	"io"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"
	"unicode/utf8"

	"github.com/xuri/excelize/v2"

	"hoistfleet/calc"
	"hoistfleet/calc/approx"
	"hoistfleet/fleet"
)

// edgeTexts are texts that need care in XML or in a spreadsheet cell.
var edgeTexts = []string{
	"a & b", "x < y > z", `say "hi"`, "it's", "tab\there", "two\nlines", "cr\rhere", "ctl\x01\x08\x1fend",
	"bad utf8 \xff\xfe", "\xed\xa0\x80 surrogate bytes", "non-char \uFFFE\uFFFF", "replacement \uFFFD kept",
	" leading", "trailing ", "\tlead tab", "end nl\n", "=1+2", "@SUM(A1)", "+44 1234", "-1", "=HYPERLINK(\"http://x\")",
	"_x0041_ literal", "_x005F_x0041_", "_xD800_ gone", "_x005F_", "x_x12", "emoji 🏗️ crane", "ünïcödé",
	strings.Repeat("a", 40000), strings.Repeat("é", 20000), strings.Repeat("🏗", 20000), strings.Repeat("ab", 16383) + "🏗",
}

// edgeResults puts every edge text into register cells, ids, sites, messages and the
// check columns, with edge numbers and dates beside them.
func edgeResults() (*fleet.Header, []*fleet.Result) {
	h := &fleet.Header{File: "edge.csv", Sheet: "edge", Columns: []fleet.Column{
		{Index: 0, Title: "Asset ID", Key: "asset_id", Factor: 1},
		{Index: 1, Title: "Site & <place>", Key: "site", Factor: 1},
		{Index: 2, Title: "Rated load [t]", Key: "rated_load", Unit: "t", Factor: 1000},
		{Index: 3, Title: "Commissioned", Key: "commissioned", Factor: 1},
		{Index: 4, Title: " Note ", Factor: 1},
	}}
	nums := []string{"0.1", "1e-300", "1e300", "-0", "123456789012345678", "0.333333333333333333", "1.7976931348623157e308",
		"5e-324", "NaN", "Inf", "-Inf", " 42 ", "0x10", "1_000", "12,5", "9007199254740993", "2.5e-7", "-123.456"}
	utc := time.UTC
	dates := []time.Time{time.Date(2019, 3, 4, 0, 0, 0, 0, utc), time.Date(1900, 1, 1, 0, 0, 0, 0, utc),
		time.Date(1900, 2, 28, 0, 0, 0, 0, utc), time.Date(1900, 3, 1, 0, 0, 0, 0, utc), time.Date(1899, 12, 30, 0, 0, 0, 0, utc),
		time.Date(1850, 6, 1, 0, 0, 0, 0, utc), time.Date(2024, 2, 29, 12, 0, 0, 0, utc),
		time.Date(2024, 2, 29, 23, 30, 0, 0, time.FixedZone("X", 5*3600)), time.Date(9999, 12, 31, 0, 0, 0, 0, utc)}
	floats := []float64{0, -0.0, 1.0 / 3, 2.0 / 3, 1e-20, 1e20, 123456789.123456789, -5000 / 0.7, math.NaN(), math.Inf(1),
		math.Inf(-1), math.MaxFloat64, math.SmallestNonzeroFloat64, 0.1 + 0.2}
	n := max(len(edgeTexts), len(nums), len(dates), len(floats))
	var rs []*fleet.Result
	for i := range n {
		tx := edgeTexts[i%len(edgeTexts)]
		num := nums[i%len(nums)]
		d := dates[i%len(dates)]
		f := floats[i%len(floats)]
		cells := []fleet.Cell{{Text: tx}, {Text: edgeTexts[(i+1)%len(edgeTexts)]}, {Text: num, IsNumber: true},
			{Text: "d", IsDate: true, Date: d}, {Text: edgeTexts[(i+2)%len(edgeTexts)]}}
		if i%5 == 0 {
			cells = append(cells, fleet.Cell{Text: "beyond the header"}) // cut
		}
		if i%7 == 0 {
			cells = cells[:2] // short row
		}
		a := &fleet.Asset{Index: i, Row: i + 2, ID: tx, Cells: cells,
			Fields: map[string]fleet.Value{"site": {State: fleet.OK, Text: edgeTexts[(i+3)%len(edgeTexts)]}}}
		if i%11 == 3 {
			a.Row = i // out of order: placed after the previous row
		}
		cs := []fleet.CheckResult{
			{ID: "motor-torque", Status: fleet.Status(i % 6), Demand: f, Capacity: 1 / (f + 1), Unit: tx, Utilisation: f, Margin: 1 - f,
				LimitRatedLoadKg: f * 1000, Rule: edgeTexts[(i+4)%len(edgeTexts)], Source: edgeTexts[(i+5)%len(edgeTexts)],
				Message: edgeTexts[(i+6)%len(edgeTexts)], Figures: []calc.Figure{{Name: "x", Value: f, Unit: "N"}, {Name: "t", Text: tx}}},
			{ID: "", Status: fleet.StatusInfo, Demand: math.NaN(), Capacity: math.NaN(), Utilisation: math.NaN(), Margin: math.NaN(),
				LimitRatedLoadKg: math.NaN()},
		}
		if i%4 == 1 {
			cs = nil
		}
		r := &fleet.Result{Asset: a,
			Evaluation: fleet.Evaluation{Status: fleet.Status(i % 6), WorstCheck: tx, MinMargin: f, Checks: cs},
			Rating:     fleet.Rating{MaxRatedLoadKg: f * 7, GoverningCheck: edgeTexts[(i+7)%len(edgeTexts)]},
			Messages:   []string{tx, edgeTexts[(i+8)%len(edgeTexts)]}, DefaultsUsed: []string{edgeTexts[(i+9)%len(edgeTexts)]}}
		if i%3 == 0 {
			r.Proposed = &fleet.Evaluation{Status: fleet.Status((i + 1) % 6), Checks: cs}
		}
		rs = append(rs, r)
	}
	return h, rs
}

// TestEdgeCellsAsStreamWriter: escaping, invalid characters, xml:space, the cell length
// limit, _xHHHH_ literals, non-finite and extreme numbers, dates (before 1900, the
// phantom leap day, time zones) and odd row shapes come out as excelize wrote them
// (goldenStreamed).
func TestEdgeCellsAsStreamWriter(t *testing.T) {
	h, rs := edgeResults()
	for _, maxRows := range []int{0, 9} {
		t.Run("maxRows="+strconv.Itoa(maxRows), func(t *testing.T) {
			goldenStreamed(t, writeNew(t, h, runInfo(), rs, Options{}, maxRows))
		})
	}
}

// TestEdgeCellsReadBack states what the edge cases read back as, independently of
// excelize's writer: text as given (cut at 32 767 UTF-16 units, characters XML cannot
// carry as U+FFFD), always a text cell; non-finite numbers no value; dates as serials.
func TestEdgeCellsReadBack(t *testing.T) {
	cells := []fleet.Cell{}
	for _, s := range edgeTexts {
		cells = append(cells, fleet.Cell{Text: s})
	}
	cells = append(cells, fleet.Cell{Text: "NaN", IsNumber: true}, fleet.Cell{Text: "1e400", IsNumber: true},
		fleet.Cell{Text: "2.5", IsNumber: true}, fleet.Cell{IsDate: true, Date: time.Date(2019, 3, 4, 0, 0, 0, 0, time.UTC)},
		fleet.Cell{IsDate: true, Date: time.Date(2019, 3, 4, 18, 0, 0, 0, time.UTC)},
		fleet.Cell{IsDate: true, Date: time.Date(1900, 3, 1, 0, 0, 0, 0, time.UTC)})
	h := &fleet.Header{File: "edge.csv"}
	for i := range cells {
		h.Columns = append(h.Columns, fleet.Column{Index: i, Title: "c" + strconv.Itoa(i), Factor: 1})
	}
	r := &fleet.Result{Asset: &fleet.Asset{Row: 2, Cells: cells}, Evaluation: fleet.Evaluation{Status: fleet.StatusPass,
		MinMargin: math.NaN()}, Rating: fleet.Rating{MaxRatedLoadKg: math.Inf(1)}}
	f := open(t, writeNew(t, h, runInfo(), []*fleet.Result{r}, Options{}, 0))
	utf16Len := func(s string) int {
		n := 0
		for _, r := range s {
			n++
			if r >= 0x10000 {
				n++
			}
		}
		return n
	}
	for i, s := range edgeTexts {
		// every invalid byte and every rune XML 1.0 excludes becomes one U+FFFD
		var b strings.Builder
		for j := 0; j < len(s); {
			r, w := utf8.DecodeRuneInString(s[j:])
			if (r == utf8.RuneError && w == 1) || !(r == '\t' || r == '\n' || r == '\r' || r >= 0x20 && r <= 0xD7FF ||
				r >= 0xE000 && r <= 0xFFFD || r >= 0x10000) {
				r = '\uFFFD'
			}
			b.WriteRune(r)
			j += w
		}
		want := b.String()
		if utf16Len(want) > maxCellChars { // cut at the last whole rune within the limit
			units := 0
			for j, r := range want {
				if units += utf16Len(string(r)); units > maxCellChars {
					want = want[:j]
					break
				}
			}
		}
		ref := cellName(i+1, 2)
		got, _ := f.GetCellValue(SheetRegister, ref)
		typ, _ := f.GetCellType(SheetRegister, ref)
		if fm, _ := f.GetCellFormula(SheetRegister, ref); fm != "" {
			t.Errorf("%s: text %q became formula %q", ref, clip(s), fm)
		}
		if typ != excelize.CellTypeInlineString {
			t.Errorf("%s: type %v, want inline string", ref, typ)
		}
		if s == "_xD800_ gone" {
			continue // excelize drops an escape it cannot decode; the comparison test covers it
		}
		if got != want {
			t.Errorf("%s: read back %q, want %q", ref, clip(got), clip(want))
		}
	}
	n := len(edgeTexts)
	for _, tc := range []struct {
		col  int
		want string
		typ  excelize.CellType
	}{
		{n + 1, "NaN", excelize.CellTypeInlineString}, // not a finite number: the text as given
		{n + 2, "1e400", excelize.CellTypeInlineString},
		{n + 3, "2.5", excelize.CellTypeUnset},
		{n + 4, "43528", excelize.CellTypeUnset},    // ECMA-376 Part 1 §18.17.4.1: 2019-03-04 − 1899-12-30 days
		{n + 5, "43528.75", excelize.CellTypeUnset}, // 18:00 is 0.75 of a day
		{n + 6, "61", excelize.CellTypeUnset},       // 1900-03-01 is serial 61 after the phantom 1900-02-29
	} {
		ref := cellName(tc.col, 2)
		got, _ := f.GetCellValue(SheetRegister, ref)
		typ, _ := f.GetCellType(SheetRegister, ref)
		if got != tc.want || typ != tc.typ {
			t.Errorf("%s = %q (type %v), want %q (type %v)", ref, got, typ, tc.want, tc.typ)
		}
	}
	// non-finite results have no value (the style is kept)
	for _, title := range []string{"Min margin", "Max rated load [kg]"} {
		ref := cellName(headerCol(t, f, SheetRegister, title), 2)
		if v, _ := f.GetCellValue(SheetRegister, ref); v != "" {
			t.Errorf("%s %s = %q, want no value", title, ref, v)
		}
	}
}

func clip(s string) string {
	if len(s) > 60 {
		return s[:60] + "…"
	}
	return s
}

// TestNumberFormat: numbers are written as excelize writes them, shortest form cut to 15
// significant digits (Excel keeps 15), and read back within that precision.
func TestNumberFormat(t *testing.T) {
	tenth, lb := 0.1, 0.45359237 // variables: Go constant arithmetic would be exact
	for _, tc := range []struct {
		v    float64
		want string
	}{
		{0, "0"}, {1, "1"}, {-2.5, "-2.5"}, {0.1, "0.1"}, {tenth + 0.2, "0.300000000000000"} /* 0.30000000000000004 */, {1.0 / 3, "0.333333333333333"},
		{123456789012345678, "123456789012345000"}, {1e-7, "0.0000001"}, {6480.5 / lb, "14287.0569008909"}, /* 14287.056900890992: cut, not rounded */
		{-1e21, "-1000000000000000000000"},
	} {
		if got := string(appendNumber(nil, tc.v)); got != tc.want {
			t.Errorf("appendNumber(%v) = %q, want %q", tc.v, got, tc.want)
		}
		got, _ := strconv.ParseFloat(string(appendNumber(nil, tc.v)), 64)
		if tc.v != 0 && !approx.Equal(got, tc.v, 0, 1e-14) {
			t.Errorf("appendNumber(%v) reads back as %v", tc.v, got)
		}
	}
}

// TestZipEntries: every entry of the workbook, the precompressed ones included, has the
// right CRC-32 and sizes (archive/zip checks them on reading; unzip -t when installed).
func TestZipEntries(t *testing.T) {
	h, rs := edgeResults()
	b := writeNew(t, h, runInfo(), rs, Options{}, 9)
	parts := zipParts(t, b) // fails on a CRC or size mismatch
	for _, p := range []string{"xl/worksheets/sheet2.xml", "xl/worksheets/sheet3.xml", "xl/workbook.xml", "[Content_Types].xml"} {
		if parts[p] == "" {
			t.Errorf("no part %s", p)
		}
	}
	unzip, err := exec.LookPath("unzip")
	if err != nil {
		t.Skip("unzip not installed")
	}
	path := filepath.Join(t.TempDir(), "w.xlsx")
	if err := os.WriteFile(path, b, 0o644); err != nil {
		t.Fatal(err)
	}
	out, err := exec.Command(unzip, "-t", path).CombinedOutput()
	if err != nil || !bytes.Contains(out, []byte("No errors detected")) {
		t.Errorf("unzip -t: %v\n%s", err, out)
	}
}

// TestSheetParts: the part found for each sheet is the one excelize wrote that sheet to,
// also when sheets are renamed, deleted and moved so that names, order and part numbers
// do not line up.
func TestSheetParts(t *testing.T) {
	f := excelize.NewFile()
	defer f.Close()
	for _, s := range []string{"A", "B", "C", "D"} {
		if _, err := f.NewSheet(s); err != nil {
			t.Fatal(err)
		}
	}
	if err := f.DeleteSheet("B"); err != nil {
		t.Fatal(err)
	}
	if err := f.SetSheetName("Sheet1", "First"); err != nil {
		t.Fatal(err)
	}
	if _, err := f.NewSheet("E"); err != nil {
		t.Fatal(err)
	}
	if err := f.MoveSheet("E", "A"); err != nil {
		t.Fatal(err)
	}
	for _, s := range f.GetSheetList() {
		if err := f.SetCellStr(s, "A1", "marker of "+s); err != nil {
			t.Fatal(err)
		}
	}
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		t.Fatal(err)
	}
	parts := zipParts(t, buf.Bytes())
	m, err := sheetParts(func(name string) ([]byte, bool) { s, ok := parts[name]; return []byte(s), ok })
	if err != nil {
		t.Fatal(err)
	}
	if len(m) != len(f.GetSheetList()) {
		t.Errorf("%d sheets mapped, want %d: %v", len(m), len(f.GetSheetList()), m)
	}
	for _, s := range f.GetSheetList() {
		xml := parts[m[s]]
		// the marker is a shared string: find its index and the cell that refers to it
		sst := parts["xl/sharedStrings.xml"]
		i := strings.Index(sst, "marker of "+s+"<")
		if i < 0 {
			t.Fatalf("no shared string for %s", s)
		}
		idx := strings.Count(sst[:i], "<si>") - 1
		if !strings.Contains(xml, `<c r="A1" t="s"><v>`+strconv.Itoa(idx)+`</v>`) {
			t.Errorf("sheet %s mapped to %s, which does not hold its A1 (shared string %d): %.200s", s, m[s], idx, xml)
		}
	}
}

// TestTemporaryFilesRemoved: the streamed sheets' temporary files are gone after End and
// after Abort, also after a Checks roll-over, and Options.TmpDir is where they go.
func TestTemporaryFilesRemoved(t *testing.T) {
	for _, end := range []bool{true, false} {
		dir := t.TempDir()
		var buf bytes.Buffer
		w := New(&buf, Options{TmpDir: dir})
		w.maxRows = 40
		if err := w.Begin(header("t", 1000), runInfo()); err != nil {
			t.Fatal(err)
		}
		for _, r := range synthetic(10) {
			if err := w.Write(r); err != nil {
				t.Fatal(err)
			}
		}
		if len(w.spools) < 3 {
			t.Fatalf("%d spools, want Register and at least two Checks sheets", len(w.spools))
		}
		for _, sp := range w.spools {
			if sp.path != "" && filepath.Dir(sp.path) != dir {
				t.Errorf("temporary file %s is not in TmpDir %s", sp.path, dir)
			}
		}
		if end {
			if err := w.End(fleet.NewSummary(10), runInfo()); err != nil {
				t.Fatal(err)
			}
		} else {
			w.Abort()
		}
		if ents, _ := os.ReadDir(dir); len(ents) != 0 {
			t.Errorf("end=%v: left in TmpDir: %v", end, ents)
		}
		if w.spools != nil {
			t.Errorf("end=%v: spools still held", end)
		}
	}
	// an unusable TmpDir is an error from Begin, not a panic
	w := New(io.Discard, Options{TmpDir: filepath.Join(t.TempDir(), "missing")})
	if err := w.Begin(header("t", 1000), runInfo()); err == nil {
		t.Error("Begin with a missing TmpDir succeeded")
	}
}
