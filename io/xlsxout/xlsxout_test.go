package xlsxout

import (
	"archive/zip"
	"bytes"
	"fmt"
	"io"
	"math"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"hoistfleet/calc"
	"hoistfleet/calc/approx"
	"hoistfleet/fleet"
)

var nan = math.NaN()

// header is a register header as a reader would give it. Rated load in t: Factor 1000
// (NIST SP 811: 1 t = 1000 kg, exact).
func header(ratedUnit string, ratedFactor float64) *fleet.Header {
	return &fleet.Header{File: "fleet.xlsx", Sheet: "Hoists", Columns: []fleet.Column{
		{Index: 0, Title: "Asset ID", Key: "asset_id", Factor: 1},
		{Index: 1, Title: "Site", Key: "site", Factor: 1},
		{Index: 2, Title: "Rated load [" + ratedUnit + "]", Key: "rated_load", Unit: ratedUnit, Factor: ratedFactor},
		{Index: 3, Title: "Commissioned", Key: "commissioned", Factor: 1},
		{Index: 4, Title: "Owner's note", Factor: 1},
		{Index: 5, Title: "Proposed rated load [" + ratedUnit + "]", Key: "proposed_rated_load", Unit: ratedUnit, Factor: ratedFactor},
	}}
}

func asset(row int, id, site string, cells ...fleet.Cell) *fleet.Asset {
	return &fleet.Asset{Index: row - 2, Row: row, ID: id, Cells: cells,
		Fields: map[string]fleet.Value{"site": {State: fleet.OK, Text: site}}}
}

func check(id string, st fleet.Status, u float64) fleet.CheckResult {
	return fleet.CheckResult{ID: id, Status: st, Demand: 100 * u, Capacity: 100, Unit: "N m", Utilisation: u, Margin: 1 - u,
		LimitRatedLoadKg: 5000 / u, Rule: "M ≤ M_r", Source: "design.md", LoadDependent: true}
}

func fixture() []*fleet.Result {
	d := time.Date(2019, 3, 4, 0, 0, 0, 0, time.UTC)
	r1 := &fleet.Result{
		Asset: asset(2, "H-01", "North",
			fleet.Cell{Text: "H-01"}, fleet.Cell{Text: "North"}, fleet.Cell{Text: "5", IsNumber: true},
			fleet.Cell{Text: "2019-03-04", IsDate: true, Date: d}, fleet.Cell{Text: "=1+2"}, fleet.Cell{}),
		Evaluation: fleet.Evaluation{RatedLoadKg: 5000, Status: fleet.StatusPass, WorstCheck: "motor-torque", MinMargin: 0.2,
			Checks: []fleet.CheckResult{check("rope-design-factor", fleet.StatusPass, 0.5), check("motor-torque", fleet.StatusPass, 0.8),
				{ID: "inspection-due", Status: fleet.StatusPass, Demand: 100, Capacity: 365, Unit: "d", Utilisation: 100.0 / 365,
					Margin: 1 - 100.0/365, LimitRatedLoadKg: nan, Figures: []calc.Figure{{Name: "next_due", Value: nan, Text: "2027-03-01"}}}}},
		Rating: fleet.Rating{MaxRatedLoadKg: 6480.5, GoverningCheck: "motor-torque"},
	}
	r2 := &fleet.Result{
		Asset: asset(3, "@SUM(A1)", "South",
			fleet.Cell{Text: "@SUM(A1)"}, fleet.Cell{Text: "South"}, fleet.Cell{Text: "-5", IsNumber: true},
			fleet.Cell{Text: "soon", IsDate: true}, fleet.Cell{Text: "+44 1234"}, fleet.Cell{Text: "3", IsNumber: true}),
		Evaluation: fleet.Evaluation{RatedLoadKg: 2000, Status: fleet.StatusFail, WorstCheck: "drum-ratio", MinMargin: -0.25,
			Checks: []fleet.CheckResult{{ID: "drum-ratio", Status: fleet.StatusFail, Demand: 20, Capacity: 16, Unit: "1", Utilisation: 1.25,
				Margin: -0.25, LimitRatedLoadKg: nan, Message: "drum too small"},
				{ID: "runaway", Status: fleet.StatusInfo, Demand: nan, Capacity: nan, Utilisation: nan, Margin: nan, LimitRatedLoadKg: nan,
					Figures: []calc.Figure{{Name: "acceleration_m_s2", Value: 9.80665, Unit: "m/s2"}}}}},
		Rating:   fleet.Rating{MaxRatedLoadKg: nan, Note: "drum-ratio fails at any load"},
		Messages: []string{"Hoists!D3: \"soon\" is not a date"},
		Proposed: &fleet.Evaluation{RatedLoadKg: 3000, Status: fleet.StatusFail, WorstCheck: "drum-ratio", MinMargin: -0.25,
			Checks: []fleet.CheckResult{{ID: "drum-ratio", Status: fleet.StatusFail, Demand: 20, Capacity: 16, Unit: "1", Utilisation: 1.25, Margin: -0.25, LimitRatedLoadKg: nan}}},
	}
	r3 := &fleet.Result{Asset: &fleet.Asset{Index: 2, Row: 4, Blank: true, Cells: make([]fleet.Cell, 6)},
		Evaluation: fleet.Evaluation{Status: fleet.StatusError, MinMargin: nan, RatedLoadKg: nan},
		Rating:     fleet.Rating{MaxRatedLoadKg: nan}, Messages: []string{"Hoists!4:4: empty row"}}
	return []*fleet.Result{r1, r2, r3}
}

func runInfo() *fleet.RunInfo {
	return &fleet.RunInfo{Tool: "hoistfleet", Version: "0.1.0", Command: "hoistfleet check fleet.xlsx", Input: "fleet.xlsx",
		InputSHA256: strings.Repeat("ab", 32), Sheet: "Hoists", Profile: "iso", AsOf: time.Date(2026, 5, 1, 0, 0, 0, 0, time.UTC),
		Started: time.Date(2026, 5, 1, 9, 0, 0, 0, time.UTC), Finished: time.Date(2026, 5, 1, 9, 0, 2, 0, time.UTC),
		MarginalBand: 0.1, Workers: 2, Rows: 3, Cautions: []string{fleet.Caution},
		Rules: []fleet.RuleUse{{ID: "rope.zp", Groups: "M6", Value: "5.6", Unit: "1", Source: "ISO 4308-1:2003 table 2",
			Provenance: "seen", Origin: "built-in iso", Uses: 1}, {ID: "user.x", Value: "=cmd|' /C calc'!A0", Origin: "mine.csv"}}}
}

func build(t testing.TB, h *fleet.Header, rs []*fleet.Result, opts Options) []byte {
	t.Helper()
	var buf bytes.Buffer
	w := New(&buf, opts)
	if err := w.Begin(h, runInfo()); err != nil {
		t.Fatal(err)
	}
	s := fleet.NewSummary(10)
	for _, r := range rs {
		if err := w.Write(r); err != nil {
			t.Fatal(err)
		}
		s.Add(r)
	}
	if err := w.End(s, runInfo()); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

func open(t *testing.T, b []byte) *excelize.File {
	t.Helper()
	f, err := excelize.OpenReader(bytes.NewReader(b), excelize.Options{RawCellValue: true})
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { f.Close() })
	return f
}

// headerCol finds a Register column by its header text.
func headerCol(t *testing.T, f *excelize.File, sheet, title string) int {
	t.Helper()
	rows, err := f.GetRows(sheet)
	if err != nil {
		t.Fatal(err)
	}
	for i, h := range rows[0] {
		if h == title {
			return i + 1
		}
	}
	t.Fatalf("%s: no column %q in %q", sheet, title, rows[0])
	return 0
}

func cellName(c, r int) string { n, _ := excelize.CoordinatesToCellName(c, r); return n }

func TestSheets(t *testing.T) {
	f := open(t, build(t, header("t", 1000), fixture(), Options{}))
	if got := strings.Join(f.GetSheetList(), ","); got != "Summary,Register,Checks,Data,Audit" {
		t.Errorf("sheets %s", got)
	}
	if f.GetActiveSheetIndex() != 0 {
		t.Errorf("active sheet %d, want Summary", f.GetActiveSheetIndex())
	}
}

// TestRegisterPassThrough: register cells come back as given; text that looks like a
// formula stays text (OWASP CSV/formula injection); numbers stay numbers; dates are dates.
func TestRegisterPassThrough(t *testing.T) {
	f := open(t, build(t, header("t", 1000), fixture(), Options{}))
	for _, tc := range []struct {
		cell, want string
		typ        excelize.CellType
	}{
		{"A1", "Asset ID", excelize.CellTypeInlineString},
		{"E1", "Owner's note", excelize.CellTypeInlineString},
		{"A2", "H-01", excelize.CellTypeInlineString},
		{"C2", "5", excelize.CellTypeUnset}, // a number cell (no t attribute)
		{"E2", "=1+2", excelize.CellTypeInlineString},
		{"A3", "@SUM(A1)", excelize.CellTypeInlineString},
		{"C3", "-5", excelize.CellTypeUnset},
		{"D3", "soon", excelize.CellTypeInlineString}, // an unreadable date stays as written
		{"E3", "+44 1234", excelize.CellTypeInlineString},
		{"F3", "3", excelize.CellTypeUnset},
	} {
		got, err := f.GetCellValue(SheetRegister, tc.cell)
		if err != nil || got != tc.want {
			t.Errorf("%s = %q (%v), want %q", tc.cell, got, err, tc.want)
		}
		typ, _ := f.GetCellType(SheetRegister, tc.cell)
		if typ != tc.typ {
			t.Errorf("%s type %v, want %v", tc.cell, typ, tc.typ)
		}
		if fm, _ := f.GetCellFormula(SheetRegister, tc.cell); fm != "" {
			t.Errorf("%s has formula %q", tc.cell, fm)
		}
	}
	// 2019-03-04 is serial 43528 in the 1900 date system (ECMA-376 Part 1 §18.17.4.1:
	// serial 1 = 1900-01-01, with the 1900-02-29 leap-year bug; 2019-03-04 − 1899-12-30 = 43528 days).
	raw, _ := f.GetCellValue(SheetRegister, "D2")
	if v, err := strconv.ParseFloat(raw, 64); err != nil || !approx.Equal(v, 43528, 0, 0) {
		t.Errorf("D2 raw %q, want date serial 43528", raw)
	}
	sid, _ := f.GetCellStyle(SheetRegister, "D2")
	if s, _ := f.GetStyle(sid); s == nil || s.CustomNumFmt == nil || *s.CustomNumFmt != "yyyy-mm-dd" {
		t.Errorf("D2 is not formatted as a date: %+v", s)
	}
	// the empty row 4 is kept (design.md: never drop a row)
	if v, _ := f.GetCellValue(SheetRegister, cellName(headerCol(t, f, SheetRegister, "Status"), 4)); v != "error" {
		t.Errorf("empty row status %q", v)
	}
	// the whole workbook has exactly the formulas we wrote: links in the Checks column
	for _, sheet := range f.GetSheetList() {
		rows, _ := f.GetRows(sheet)
		for r, row := range rows {
			for c := range row {
				fm, _ := f.GetCellFormula(sheet, cellName(c+1, r+1))
				if fm != "" && !strings.HasPrefix(fm, `HYPERLINK("#'Checks'!A`) {
					t.Errorf("%s!%s: unexpected formula %q", sheet, cellName(c+1, r+1), fm)
				}
			}
		}
	}
}

func TestRegisterResults(t *testing.T) {
	for _, tc := range []struct {
		unit   string
		factor float64
		want   float64
		src    string
	}{
		{"t", 1000, 6.4805, "NIST SP 811: 1 t = 1000 kg (exact)"},
		{"kg", 1, 6480.5, "identity"},
		{"lb", 0.45359237, 6480.5 / 0.45359237, "NIST SP 811 B.8: 1 lb = 0.453 592 37 kg (exact)"},
	} {
		t.Run(tc.unit, func(t *testing.T) {
			f := open(t, build(t, header(tc.unit, tc.factor), fixture(), Options{}))
			c := headerCol(t, f, SheetRegister, "Max rated load ["+tc.unit+"]")
			raw, _ := f.GetCellValue(SheetRegister, cellName(c, 2))
			v, err := strconv.ParseFloat(raw, 64)
			// six significant digits (Digits): within half a unit of the sixth, 5e-6 relative
			if err != nil || !approx.Equal(v, tc.want, 0, 5e-6) {
				t.Errorf("max rated load %q, want %v (%s)", raw, tc.want, tc.src)
			}
			if raw, _ := f.GetCellValue(SheetRegister, cellName(c, 3)); raw != "" {
				t.Errorf("a null rating must be an empty cell, got %q", raw)
			}
		})
	}
	f := open(t, build(t, header("t", 1000), fixture(), Options{}))
	get := func(title string, row int) string {
		v, _ := f.GetCellValue(SheetRegister, cellName(headerCol(t, f, SheetRegister, title), row))
		return v
	}
	for _, tc := range []struct {
		title string
		row   int
		want  string
	}{
		{"Status", 2, "pass"}, {"Status", 3, "fail"}, {"Governing check", 2, "motor-torque"}, {"Worst check", 3, "drum-ratio"},
		{"Min margin", 2, "0.2"}, {"Min margin", 3, "-0.25"}, {"motor-torque status", 2, "pass"}, {"motor-torque utilisation", 2, "0.8"},
		{"drum-ratio status", 3, "fail"}, {"drum-ratio utilisation", 3, "1.25"}, {"drum-ratio status", 2, ""},
		{"runaway status", 3, "info"}, {"runaway utilisation", 3, ""},
		{"Messages", 3, "Hoists!D3: \"soon\" is not a date"}, {"Proposed status", 3, "fail"}, {"Verdict changes", 3, "no"},
		{"Proposed status", 2, ""},
	} {
		if got := get(tc.title, tc.row); got != tc.want {
			t.Errorf("%s row %d = %q, want %q", tc.title, tc.row, got, tc.want)
		}
	}
	// fills from the palette
	for _, tc := range []struct {
		title string
		row   int
		st    fleet.Status
	}{{"Status", 2, fleet.StatusPass}, {"Status", 3, fleet.StatusFail}, {"Status", 4, fleet.StatusError},
		{"drum-ratio utilisation", 3, fleet.StatusFail}, {"runaway status", 3, fleet.StatusInfo}} {
		sid, _ := f.GetCellStyle(SheetRegister, cellName(headerCol(t, f, SheetRegister, tc.title), tc.row))
		s, err := f.GetStyle(sid)
		if err != nil || len(s.Fill.Color) == 0 || !strings.EqualFold(s.Fill.Color[0], Palette[tc.st].Fill) {
			t.Errorf("%s row %d: fill %+v, want %s", tc.title, tc.row, s.Fill, Palette[tc.st].Fill)
		}
	}
	// frozen header (and the asset id column, which comes first here)
	p, err := f.GetPanes(SheetRegister)
	if err != nil || !p.Freeze || p.YSplit != 1 || p.XSplit != 1 {
		t.Errorf("panes %+v %v", p, err)
	}
	if p, _ := f.GetPanes(SheetChecks); !p.Freeze || p.YSplit != 1 {
		t.Errorf("checks panes %+v", p)
	}
}

// TestLinks: each Register row links to its hoist's first row in Checks; the Summary's
// worst hoists link to their Register row.
func TestLinks(t *testing.T) {
	f := open(t, build(t, header("t", 1000), fixture(), Options{}))
	lc := headerCol(t, f, SheetRegister, "Checks")
	re := regexp.MustCompile(`^HYPERLINK\("#'Checks'!A(\d+)","details"\)$`)
	for row, id := range map[int]string{2: "H-01", 3: "@SUM(A1)"} {
		fm, _ := f.GetCellFormula(SheetRegister, cellName(lc, row))
		m := re.FindStringSubmatch(fm)
		if m == nil {
			t.Fatalf("row %d: link formula %q", row, fm)
		}
		target, _ := strconv.Atoi(m[1])
		got, _ := f.GetCellValue(SheetChecks, cellName(2, target))
		prev, _ := f.GetCellValue(SheetChecks, cellName(2, target-1))
		if got != id || prev == id {
			t.Errorf("row %d links to Checks row %d holding %q (previous %q), want the first row of %q", row, target, got, prev, id)
		}
	}
	if fm, _ := f.GetCellFormula(SheetRegister, cellName(lc, 4)); fm != "" {
		t.Errorf("a hoist without checks has a link: %q", fm)
	}
	// Worst hoists on Summary: find "@SUM(A1)" and its link
	rows, _ := f.GetRows(SheetSummary)
	found := false
	for r, row := range rows {
		if len(row) > 0 && row[0] == "@SUM(A1)" {
			ok, loc, err := f.GetCellHyperLink(SheetSummary, cellName(1, r+1))
			if !ok || err != nil || loc != "'Register'!A3" {
				t.Errorf("summary link %v %q %v", ok, loc, err)
			}
			found = true
		}
	}
	if !found {
		t.Error("the failing hoist is not listed on Summary")
	}
}

func TestChecksSheet(t *testing.T) {
	f := open(t, build(t, header("t", 1000), fixture(), Options{}))
	rows, err := f.GetRows(SheetChecks)
	if err != nil {
		t.Fatal(err)
	}
	if got := strings.Join(rows[0], "|"); got != strings.Join(ChecksColumns, "|") {
		t.Errorf("header %s", got)
	}
	// 3 checks + 2 checks + 1 proposed check; the empty row has none
	if len(rows) != 1+6 {
		t.Fatalf("%d rows, want 7", len(rows))
	}
	want := [][]string{
		{"2", "H-01", "North", "rated", "rope-design-factor", "pass", "50", "100", "N m", "0.5", "0.5", "10000"},
		{"3", "@SUM(A1)", "South", "rated", "drum-ratio", "fail", "20", "16", "1", "1.25", "-0.25", ""},
		{"3", "@SUM(A1)", "South", "proposed", "drum-ratio", "fail"},
	}
	for i, r := range []int{1, 4, 6} {
		for j, w := range want[i] {
			if rows[r][j] != w {
				t.Errorf("Checks row %d col %s = %q, want %q", r+1, ChecksColumns[j], rows[r][j], w)
			}
		}
	}
	// the rule text, message and figures
	if rows[4][14] != "drum too small" || rows[3][15] != "next_due = 2027-03-01" || rows[5][15] != "acceleration_m_s2 = 9.8066 m/s2" {
		t.Errorf("text columns: %q / %q / %q", rows[4][14], rows[3][15], rows[5][15])
	}
}

func TestSummarySheet(t *testing.T) {
	b := build(t, header("t", 1000), fixture(), Options{})
	f := open(t, b)
	rows, _ := f.GetRows(SheetSummary)
	// tiles: row 5 labels, row 6 counts in fleet.Statuses order
	wantLabels := []string{"Fail", "Error", "Unchecked", "Marginal", "Pass", "Total"}
	wantCounts := []string{"1", "1", "0", "0", "1", "3"}
	for i := range wantLabels {
		if rows[4][i] != wantLabels[i] || rows[5][i] != wantCounts[i] {
			t.Errorf("tile %d: %q %q, want %q %q", i, rows[4][i], rows[5][i], wantLabels[i], wantCounts[i])
		}
	}
	if !strings.HasPrefix(rows[2][0], "hoistfleet is a screening calculation") {
		t.Errorf("caution missing on Summary: %q", rows[2][0])
	}
	text := fmt.Sprint(rows)
	for _, s := range []string{"Hoists by site", "North", "South", "Smallest margin per hoist", "What limits the rated load",
		"Hoists needing attention first", "Overdue inspections: 0", "Re-rating: 1 hoists", "Checks by status", "Status colours"} {
		if !strings.Contains(text, s) {
			t.Errorf("Summary lacks %q", s)
		}
	}
	// three native charts on the Summary sheet
	z, err := zip.NewReader(bytes.NewReader(b), int64(len(b)))
	if err != nil {
		t.Fatal(err)
	}
	parts := map[string]string{}
	for _, zf := range z.File {
		rc, _ := zf.Open()
		data, _ := io.ReadAll(rc)
		rc.Close()
		parts[zf.Name] = string(data)
	}
	var charts []string
	for name := range parts {
		if strings.HasPrefix(name, "xl/charts/chart") {
			charts = append(charts, name)
		}
	}
	if len(charts) != 3 {
		t.Errorf("%d chart parts, want 3: %v", len(charts), charts)
	}
	all := strings.Join([]string{parts["xl/charts/chart1.xml"], parts["xl/charts/chart2.xml"], parts["xl/charts/chart3.xml"]}, "")
	for _, st := range fleet.Statuses {
		if !strings.Contains(all, Palette[st].Chart) {
			t.Errorf("chart colour %s of %s not used", Palette[st].Chart, st)
		}
	}
	if !strings.Contains(parts["xl/worksheets/_rels/sheet1.xml.rels"], "drawing") {
		t.Error("Summary sheet has no drawing")
	}
	// auto-filters on the streamed sheets
	for _, p := range []string{"xl/worksheets/sheet2.xml", "xl/worksheets/sheet3.xml"} {
		if !regexp.MustCompile(`<autoFilter ref="\$?A\$?1:\$?[A-Z]+\$?\d+"`).MatchString(parts[p]) {
			t.Errorf("%s has no auto-filter", p)
		}
		if strings.Contains(parts[p], `<dimension ref="A1"/>`) {
			t.Errorf("%s keeps the stream writer's A1 dimension", p)
		}
	}
	if !strings.Contains(parts["xl/workbook.xml"], "_xlnm._FilterDatabase") {
		t.Error("no filter database names")
	}
}

func TestAuditSheet(t *testing.T) {
	f := open(t, build(t, header("t", 1000), fixture(), Options{}))
	rows, _ := f.GetRows(SheetAudit)
	if rows[0][0] != "Cautions" || rows[1][0] != fleet.Caution {
		t.Errorf("cautions are not first: %q", rows[:2])
	}
	text := fmt.Sprint(rows)
	for _, s := range []string{"hoistfleet check fleet.xlsx", strings.Repeat("ab", 32), "2026-05-01", "2026-05-01T09:00:02Z",
		"Marginal band 10 %", "rope.zp 5.6 1 M6  ISO 4308-1:2003 table 2 seen built-in iso 1", "Run time 2s"} {
		if !strings.Contains(text, s) {
			t.Errorf("Audit lacks %q in %s", s, text)
		}
	}
	// a user rule's text is a string, never a formula
	for r, row := range rows {
		for c := range row {
			if fm, _ := f.GetCellFormula(SheetAudit, cellName(c+1, r+1)); fm != "" {
				t.Errorf("Audit formula %q", fm)
			}
		}
	}
}

func TestSig(t *testing.T) {
	for _, tc := range []struct {
		v    float64
		n    int
		want string
	}{
		{9.80665, 4, "9.807"}, {9.80665, 3, "9.81"}, {9.80665, 5, "9.8066"} /* float64(9.80665) is just below the tie */, {25000, 5, "25000"}, {0.000123456, 3, "0.000123"},
		{123456789, 3, "123000000"}, {1e-9, 3, "1e-09"}, {-2.5, 5, "-2.5"}, {0, 5, "0"}, {math.Inf(1), 5, "∞"}, {nan, 3, "n/a"},
		{99999.5, 5, "100000"},
	} {
		if got := Sig(tc.v, tc.n); got != tc.want {
			t.Errorf("Sig(%v, %d) = %q, want %q", tc.v, tc.n, got, tc.want)
		}
	}
}

func TestLifecycleErrors(t *testing.T) {
	w := New(io.Discard, Options{})
	if err := w.Write(fixture()[0]); err == nil {
		t.Error("Write before Begin must fail")
	}
	w = New(io.Discard, Options{})
	if err := w.Begin(header("t", 1000), runInfo()); err != nil {
		t.Fatal(err)
	}
	w.Abort()
	if err := w.End(nil, nil); err == nil {
		t.Error("End after Abort must fail")
	}
	// rows out of order are placed after the last one, never rejected
	rs := fixture()
	rs[1].Asset.Row = 2
	f := open(t, build(t, header("t", 1000), rs, Options{}))
	if v, _ := f.GetCellValue(SheetRegister, "A3"); v != "@SUM(A1)" {
		t.Errorf("out-of-order row written at A3 = %q", v)
	}
}

// synthetic makes n hoists over four sites with every check, statuses varying.
func synthetic(n int) []*fleet.Result {
	sites := []string{"Northgate works", "Harbour yard", "Mill B", "Depot 4"}
	govs := []string{"brake-holding", "motor-torque", "rope-design-factor", "motor-accel-torque", "drum-capacity"}
	rs := make([]*fleet.Result, n)
	for i := range rs {
		site := sites[(i*7)%len(sites)]
		id := fmt.Sprintf("H-%04d", i+1)
		cs := make([]fleet.CheckResult, len(fleet.CheckIDs))
		worst, wm := "", math.Inf(1)
		status := fleet.StatusPass
		for j, cid := range fleet.CheckIDs {
			u := 0.2 + 0.8*math.Pow(math.Abs(math.Sin(float64(i*19+j*7))), 3)*float64(j%5+4)/7
			st := fleet.StatusPass
			switch {
			case u > 1:
				st = fleet.StatusFail
			case u > 0.9:
				st = fleet.StatusMarginal
			}
			if cid == "runaway" || cid == "shaft-load" {
				st, u = fleet.StatusInfo, nan
			}
			if (i+j)%97 == 0 {
				st, u = fleet.StatusUnchecked, nan
			}
			if (i*3+j)%211 == 0 {
				st, u = fleet.StatusError, nan
			}
			cs[j] = fleet.CheckResult{ID: cid, Status: st, Demand: 1000 * u, Capacity: 1000, Unit: "N m", Utilisation: u, Margin: 1 - u,
				LimitRatedLoadKg: 5000 / u, Rule: "demand ≤ capacity", Source: "design.md (computed)",
				Figures: []calc.Figure{{Name: "x_n", Value: 1234.5 * u, Unit: "N"}}}
			if cid == "inspection-due" {
				cs[j].Unit, cs[j].Demand, cs[j].Capacity = "d", 365*u, 365
				if st == fleet.StatusFail {
					cs[j].Message = "inspection overdue"
				}
			}
			if st != fleet.StatusInfo && st.Worse(status) {
				status = st
			}
			if !math.IsNaN(u) && 1-u < wm {
				worst, wm = cid, 1-u
			}
		}
		if math.IsInf(wm, 1) {
			wm = nan
		}
		cells := []fleet.Cell{{Text: id}, {Text: site}, {Text: strconv.Itoa(1 + i%10), IsNumber: true},
			{IsDate: true, Date: time.Date(2005+i%18, time.Month(1+i%12), 1+i%28, 0, 0, 0, 0, time.UTC)}, {Text: "note"}, {}}
		rs[i] = &fleet.Result{Asset: asset(i+2, id, site, cells...),
			Evaluation: fleet.Evaluation{RatedLoadKg: float64(1000 * (1 + i%10)), Status: status, WorstCheck: worst, MinMargin: wm, Checks: cs},
			Rating:     fleet.Rating{MaxRatedLoadKg: math.Floor(float64(1000*(1+i%10))*(1+wm)*10) / 10, GoverningCheck: govs[i%len(govs)]}}
	}
	return rs
}

// BenchmarkXLSXWrite writes 10 000 hoists (18 checks each: 10 000 Register rows of 50
// columns and 180 000 Checks rows of 16) and the Summary and Audit sheets.
func BenchmarkXLSXWrite(b *testing.B) {
	rs := synthetic(10000)
	h := header("t", 1000)
	b.ResetTimer()
	for range b.N {
		w := New(io.Discard, Options{TopN: 20})
		if err := w.Begin(h, runInfo()); err != nil {
			b.Fatal(err)
		}
		s := fleet.NewSummary(20)
		for _, r := range rs {
			if err := w.Write(r); err != nil {
				b.Fatal(err)
			}
			s.Add(r)
		}
		if err := w.End(s, runInfo()); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkFloorStreamWrite is the baseline: excelize's StreamWriter writing the same
// number of cells (plain values, no styles, no other sheets) on two sheets.
func BenchmarkFloorStreamWrite(b *testing.B) {
	regCols := len(header("t", 1000).Columns) + 8 + 2*len(fleet.CheckIDs) + 2
	for range b.N {
		f := excelize.NewFile()
		_, _ = f.NewSheet("B")
		s1, _ := f.NewStreamWriter("Sheet1")
		s2, _ := f.NewStreamWriter("B")
		row := make([]any, regCols)
		crow := make([]any, len(ChecksColumns))
		cr := 1
		for i := range 10000 {
			for j := range row {
				row[j] = float64(i*j) / 7
			}
			_ = s1.SetRow(cellName(1, i+1), row)
			for range fleet.CheckIDs {
				for j := range crow {
					crow[j] = float64(j) / 3
				}
				_ = s2.SetRow(cellName(1, cr), crow)
				cr++
			}
		}
		_ = s1.Flush()
		_ = s2.Flush()
		if err := f.Write(io.Discard); err != nil {
			b.Fatal(err)
		}
		f.Close()
	}
}

// TestDataSheet: the Data sheet lists the columns the fleet lacks as the summary ranks
// them, with the hoists lacking each and the checks it alone would let run, and the
// Register says how many checks ran on each hoist.
func TestDataSheet(t *testing.T) {
	rs := fixture()
	rs[0].Coverage = fleet.Coverage{Run: 3, Possible: 4}
	rs[0].Gaps = []fleet.Gap{{Key: "rope_mbf", Check: "rope-design-factor", Alone: true}}
	rs[1].Coverage = fleet.Coverage{Run: 1, Possible: 4}
	rs[1].Gaps = []fleet.Gap{{Key: "operating_hours", Check: "design-life", Alone: true},
		{Key: "rope_mbf", Check: "rope-design-factor", Alone: true}, {Key: "drum_diameter", Check: "drum-ratio", Unitless: true},
		{Key: "rope_mbf", Check: "brake-stop"}}
	f := open(t, build(t, header("t", 1000), rs, Options{}))
	rows, err := f.GetRows(SheetData)
	if err != nil {
		t.Fatal(err)
	}
	want := [][]string{
		{"Rope MBF", "kN", "2", "0", "3", "2", "rope-design-factor, brake-stop"},
		{"Operating hours", "h", "1", "0", "1", "1", "design-life"},
		{"Drum diameter", "mm", "1", "1", "1", "0", "drum-ratio"},
	}
	if len(rows) < 5+len(want) {
		t.Fatalf("Data has %d rows: %q", len(rows), rows)
	}
	if !strings.Contains(rows[1][0], "4 of the 8 checks that apply (50 %); 1 hoist had fewer than half") {
		t.Errorf("Data sentence %q", rows[1][0])
	}
	for i, w := range want {
		if got := rows[5+i]; !slices.Equal(got, w) {
			t.Errorf("Data row %d: %q, want %q", 6+i, got, w)
		}
	}
	col := headerCol(t, f, SheetRegister, "Checks run")
	for i, w := range []string{"3 of 4", "1 of 4"} {
		if got, _ := f.GetCellValue(SheetRegister, cellName(col, 2+i)); got != w {
			t.Errorf("Register row %d Checks run %q, want %q", 2+i, got, w)
		}
	}
}
