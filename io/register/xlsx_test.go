package register

import (
	"archive/zip"
	"bytes"
	"errors"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"hoistfleet/calc/approx"
	"hoistfleet/fleet"
)

// book builds a workbook in memory: rows of cells from A1 on the named sheet (the first
// sheet is renamed to it). edit may change the file before it is written.
func book(t testing.TB, sheet string, rows [][]any, edit func(f *excelize.File)) []byte {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	if err := f.SetSheetName("Sheet1", sheet); err != nil {
		t.Fatal(err)
	}
	for i, row := range rows {
		cell, _ := excelize.CoordinatesToCellName(1, i+1)
		if err := f.SetSheetRow(sheet, cell, &row); err != nil {
			t.Fatal(err)
		}
	}
	if edit != nil {
		edit(f)
	}
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

func openXLSX(t testing.TB, b []byte, sheet string) *Reader {
	t.Helper()
	r, err := NewXLSX(bytes.NewReader(b), "dir/reg.xlsx", sheet)
	if err != nil {
		t.Fatalf("NewXLSX: %v", err)
	}
	t.Cleanup(func() { _ = r.Close() })
	return r
}

func TestXLSXRegister(t *testing.T) {
	rows := [][]any{
		{"Asset ID", "Rated load [t]", "Rope diameter [in]", "Commissioned", "Last inspection", "Notes", "Drum grooved"},
		{"007", 12.5, 0.75, 45292, "2023-06-30", "keep me", true}, // row 2
		{"H-2", 3.2, "0.5", nil, nil, 42, "no"},                   // row 3, hidden
		{},                                                        // row 4: empty, inside the data
		{"H-4", "twelve", 0.5, "31/12/2023", nil, nil, nil},       // row 5
	}
	b := book(t, "Register", rows, func(f *excelize.File) {
		_ = f.SetRowVisible("Register", 3, false)
		// Formatted but empty rows after the data: excelize reports them, the reader drops them.
		_ = f.SetRowHeight("Register", 9, 30)
		_ = f.SetRowHeight("Register", 12, 30)
	})
	r := openXLSX(t, b, "")
	h := r.Header()
	if h.Sheet != "Register" || h.File != "reg.xlsx" || len(h.Problems) != 0 {
		t.Errorf("header: sheet %q file %q problems %v", h.Sheet, h.File, h.Problems)
	}
	as := readAll(t, r)
	if len(as) != 3 {
		t.Fatalf("%d rows, want 3 (empty rows dropped)", len(as))
	}
	if p := h.Problems; len(p) != 2 || p[0].Error() != "Register!4:4: 1 row (4) is empty: skipped" ||
		p[1].Error() != `Register!D1: Commissioned: dates read with the day first, as the column's own dates show ("31/12/2023" at Register!D5)` {
		t.Errorf("empty row note (the trailing ones are not noted): %v", p)
	}
	for i, want := range []int{2, 3, 5} {
		if as[i].Row != want || as[i].Index != i {
			t.Errorf("asset %d: row %d index %d, want row %d", i, as[i].Row, as[i].Index, want)
		}
	}
	a := as[0]
	if a.ID != "007" || a.Cells[0].IsNumber {
		t.Errorf("id %q IsNumber %v: a text id stays text", a.ID, a.Cells[0].IsNumber)
	}
	if v := a.Get("rated_load"); v.State != fleet.OK || v.Num != 12500 || !a.Cells[1].IsNumber {
		t.Errorf("rated load %+v", v)
	}
	// 0.75 in = 19.05 mm (NIST SP 811: in = 0.0254 m, exact).
	if v := a.Get("rope_diameter"); !approx.Equal(v.Num, 0.01905, 0, 1e-15) {
		t.Errorf("rope diameter %v", v.Num)
	}
	// Excel serial 45292 is 2024-01-01 in the 1900 date system (Microsoft, "Date systems
	// in Excel": serial 1 = 1900-01-01, with the 1900-02-29 that never was).
	if v := a.Get("commissioned"); v.State != fleet.OK || !v.Date.Equal(time.Date(2024, 1, 1, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("commissioned %+v", v)
	}
	if !a.Cells[3].IsDate || a.Cells[3].IsNumber || a.Cells[3].Text != "45292" {
		t.Errorf("date cell %+v", a.Cells[3])
	}
	if v := a.Get("last_inspection"); !v.Date.Equal(time.Date(2023, 6, 30, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("text date %+v", v)
	}
	if v := a.Get("drum_grooved"); v.Text != "yes" {
		t.Errorf("bool cell %+v", v)
	}
	if a.Cells[5].Text != "keep me" || !as[1].Cells[5].IsNumber {
		t.Errorf("pass-through %+v %+v", a.Cells[5], as[1].Cells[5])
	}
	// Hidden row 3 is read like the others.
	if v := as[1].Get("rope_diameter"); !approx.Equal(v.Num, 0.0127, 0, 1e-15) {
		t.Errorf("hidden row %+v", v)
	}
	if got := errText(as[2].Get("rated_load")); got != `Register!B5: asset H-4: "twelve" is not a number in [t]` {
		t.Errorf("bad cell: %s", got)
	}
	// A date as a UK spreadsheet writes it: only the day can come first.
	if v := as[2].Get("commissioned"); v.State != fleet.OK || !v.Date.Equal(time.Date(2023, 12, 31, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("day-first date: %+v", v)
	}
}

// The 1904 date system starts 1462 days later than the 1900 system (Microsoft, "Date
// systems in Excel"): serial 43830 is 2024-01-01 in a 1904 workbook, and 0 is 1904-01-01.
func TestXLSXDate1904(t *testing.T) {
	yes := true
	rows := [][]any{{"Asset ID", "Commissioned", "Last inspection"}, {"H-1", 43830, 0}}
	b := book(t, "Sheet", rows, func(f *excelize.File) {
		if err := f.SetWorkbookProps(&excelize.WorkbookPropsOptions{Date1904: &yes}); err != nil {
			t.Fatal(err)
		}
	})
	a := readAll(t, openXLSX(t, b, ""))[0]
	if v := a.Get("commissioned"); !v.Date.Equal(time.Date(2024, 1, 1, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("1904 serial 43830: %+v", v)
	}
	// Serial 0 is outside the range accepted (1 … 2958465): refused rather than read as 1904-01-01.
	if v := a.Get("last_inspection"); v.State != fleet.Bad {
		t.Errorf("serial 0: %+v", v)
	}
	// The same serial in a 1900 workbook is 1462 days earlier.
	b = book(t, "Sheet", rows, nil)
	a = readAll(t, openXLSX(t, b, ""))[0]
	if v := a.Get("commissioned"); !v.Date.Equal(time.Date(2024, 1, 1, 0, 0, 0, 0, time.UTC).AddDate(0, 0, -1462)) {
		t.Errorf("1900 serial 43830: %+v", v)
	}
}

func TestXLSXSheetSelection(t *testing.T) {
	b := book(t, "Notes", [][]any{{"nothing"}}, func(f *excelize.File) {
		_, _ = f.NewSheet("Register")
		_ = f.SetSheetRow("Register", "A1", &[]any{"Asset ID", "Site"})
		_ = f.SetSheetRow("Register", "A2", &[]any{"H-1", "Dock"})
	})
	r := openXLSX(t, b, "register") // sheet names match without regard to case
	if a := readAll(t, r); len(a) != 1 || a[0].Get("site").Text != "Dock" {
		t.Errorf("named sheet: %+v", a)
	}
	// The first sheet by default: a cover sheet without a header is refused, naming it.
	if _, err := NewXLSX(bytes.NewReader(b), "reg.xlsx", ""); err == nil || !strings.HasPrefix(err.Error(), `reg.xlsx: sheet "Notes": no header row found in rows 1 to 1`) {
		t.Errorf("first sheet: %v", err)
	}
	_, err := NewXLSX(bytes.NewReader(b), "reg.xlsx", "Hoists")
	want := `reg.xlsx: there is no sheet "Hoists": the workbook has "Notes", "Register"`
	if err == nil || err.Error() != want {
		t.Errorf("unknown sheet:\ngot  %v\nwant %s", err, want)
	}
}

func TestXLSXMergedCells(t *testing.T) {
	header := [][]any{{"Asset ID", "Rope diameter", nil}, {"H-1", 16, 200}}
	b := book(t, "Register", header, func(f *excelize.File) { _ = f.MergeCell("Register", "B1", "C1") })
	_, err := NewXLSX(bytes.NewReader(b), "reg.xlsx", "")
	want := `reg.xlsx: sheet "Register": the header row 1 has merged cells (B1:C1): unmerge them and give every column its own title in row 1`
	if err == nil || err.Error() != want {
		t.Errorf("merged header:\ngot  %v\nwant %s", err, want)
	}
	data := [][]any{{"Asset ID", "Site"}, {"H-1", "Dock"}, {"H-2"}, {"H-3"}}
	b = book(t, "Register", data, func(f *excelize.File) { _ = f.MergeCell("Register", "B2", "B4") })
	// A value merged down over rows (a site over its hoists) applies to every row of
	// the merge (issue 14 item 8), said once in the notes.
	r := openXLSX(t, b, "")
	as := readAll(t, r)
	if len(as) != 3 {
		t.Fatalf("rows %d", len(as))
	}
	for _, a := range as {
		if got := a.Get("site").Text; got != "Dock" || len(a.Problems) != 0 {
			t.Errorf("%s: site %q, problems %v", a.ID, got, a.Problems)
		}
	}
	hasProblem(t, r, "Register: 1 merged cell ranges (B2:B4): the value of each range's first cell was read in every row of the range, as the spreadsheet shows it")
}

// A sheet as wide as a sheet can be (16 384 columns, XFD) is read; the columns the
// schema does not know are passed through.
func TestXLSXWidestSheet(t *testing.T) {
	b := book(t, "Register", [][]any{{"Asset ID", "Rated load [t]"}, {"H-1", 2}}, func(f *excelize.File) {
		_ = f.SetCellValue("Register", "XFD1", "Last column")
		_ = f.SetCellValue("Register", "XFD2", "far")
	})
	r := openXLSX(t, b, "")
	if n := len(r.Header().Columns); n != 16384 {
		t.Fatalf("%d columns", n)
	}
	a := readAll(t, r)[0]
	if a.Cells[16383].Text != "far" || a.Get("rated_load").Num != 2000 || len(a.Problems) != 0 {
		t.Errorf("row: %q %v %v", a.Cells[16383].Text, a.Get("rated_load"), a.Problems)
	}
}

// Cells beyond the header's last column are a shape problem.
func TestXLSXLongRow(t *testing.T) {
	b := book(t, "R", [][]any{{"Asset ID", "Site"}, {"H-1", "Dock", nil, "stray"}}, nil)
	a := readAll(t, openXLSX(t, b, ""))[0]
	want := `R!C2: asset H-1: row has 4 cells, the header 2: cells beyond the header's last column are not read and not passed through (R!D2 "stray")`
	if len(a.Problems) != 1 || a.Problems[0].Error() != want || a.Problems[0].Kind != fleet.Shape {
		t.Errorf("problems %v\nwant %s", a.Problems, want)
	}
}

func TestXLSXFileErrors(t *testing.T) {
	good := book(t, "Register", [][]any{{"Asset ID"}, {"H-1"}}, nil)
	f := excelize.NewFile()
	var locked bytes.Buffer
	if err := f.Write(&locked, excelize.Options{Password: "secret"}); err != nil {
		t.Fatal(err)
	}
	_ = f.Close()
	tests := []struct {
		name string
		in   []byte
		want string
	}{
		{"password", locked.Bytes(), "reg.xlsx: the workbook is password-protected: save an unprotected copy"},
		{"truncated", good[:len(good)/2], "reg.xlsx: not a readable XLSX workbook (truncated, or another kind of file): zip: not a valid zip file"},
		{"csv", []byte("Asset ID,Site\nH-1,A\n"), "reg.xlsx: not an XLSX workbook (an XLSX file is a zip archive; is this a CSV or text file?)"},
		{"empty", nil, "reg.xlsx: the file is empty"},
		{"legacy xls", append(append([]byte(nil), oleMagic...), make([]byte, 600)...), "reg.xlsx: this is a binary Office file (a legacy .xls workbook?), not XLSX: save it as .xlsx"},
		{"other zip", zipOf(t, map[string]int{"readme.txt": 10}), "reg.xlsx: a zip file, but not an XLSX workbook (no xl/workbook.xml)"},
		{"blank sheet", book(t, "Register", nil, nil), `reg.xlsx: sheet "Register": the sheet is empty: no row holds the column titles`},
	}
	for _, tt := range tests {
		_, err := NewXLSX(bytes.NewReader(tt.in), "/some/dir/reg.xlsx", "")
		var fe *fleet.Error
		if !errors.As(err, &fe) || fe.Kind != fleet.IO || err.Error() != tt.want {
			t.Errorf("%s:\ngot  %v\nwant %s", tt.name, err, tt.want)
		}
	}
}

// zipOf writes a zip whose parts hold n zero bytes each (highly compressible).
func zipOf(t testing.TB, parts map[string]int) []byte {
	t.Helper()
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	for name, n := range parts {
		w, err := zw.Create(name)
		if err != nil {
			t.Fatal(err)
		}
		if _, err := w.Write(make([]byte, n)); err != nil {
			t.Fatal(err)
		}
	}
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// A zip bomb and an outsized shared-strings table are refused from the sizes in the zip
// directory, before anything is inflated.
func TestXLSXLimits(t *testing.T) {
	lim := Limits{MaxUnzipped: 1 << 20, MaxSharedStrings: 256 << 10}
	bomb := zipOf(t, map[string]int{"xl/workbook.xml": 100, "xl/worksheets/sheet1.xml": 8 << 20})
	if len(bomb) > 64<<10 {
		t.Fatalf("the test bomb is %d bytes compressed", len(bomb))
	}
	_, err := NewXLSXLimits(bytes.NewReader(bomb), "bomb.xlsx", "", lim)
	want := "bomb.xlsx: the workbook unzips to 8 MiB, more than the 1 MiB limit (a zip bomb, or not a register)"
	if err == nil || err.Error() != want {
		t.Errorf("bomb:\ngot  %v\nwant %s", err, want)
	}
	sst := zipOf(t, map[string]int{"xl/workbook.xml": 100, "xl/sharedStrings.xml": 512 << 10})
	_, err = NewXLSXLimits(bytes.NewReader(sst), "sst.xlsx", "", lim)
	want = "sst.xlsx: the shared-strings table unzips to 0.5 MiB, more than the 0.25 MiB limit"
	if err == nil || err.Error() != want {
		t.Errorf("shared strings:\ngot  %v\nwant %s", err, want)
	}
	// A real workbook within the limits reads.
	rows := [][]any{{"Asset ID", "Site"}}
	for i := 0; i < 3000; i++ {
		rows = append(rows, []any{"H-" + strings.Repeat("x", 5) + string(rune('a'+i%26)), i})
	}
	b := book(t, "R", rows, nil)
	r, err := NewXLSXLimits(bytes.NewReader(b), "big.xlsx", "", lim)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	if as := readAll(t, r); len(as) != 3000 {
		t.Errorf("%d rows", len(as))
	}
}
