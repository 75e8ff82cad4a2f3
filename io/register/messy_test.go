package register

import (
	"bytes"
	"errors"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"hoistfleet/calc/approx"
	"hoistfleet/fleet"
)

// The messy registers of testdata/ (README.md there has their ground truth): each trap
// cell is read as the ground truth says, or left out and noted.

var updateTestdata = flag.Bool("update-testdata", false, "rewrite testdata/messy-hidden.xlsx")

// problems returns the header's problems as text.
func problems(r *Reader) []string {
	var out []string
	for _, p := range r.Header().Problems {
		out = append(out, p.Error())
	}
	return out
}

func hasProblem(t *testing.T, r *Reader, want string) {
	t.Helper()
	for _, p := range problems(r) {
		if p == want {
			return
		}
	}
	t.Errorf("no header problem %q in\n  %s", want, strings.Join(problems(r), "\n  "))
}

func TestMessyTitleBlockCSV(t *testing.T) {
	r := openCSV(t, filepath.Join("..", "..", "..", "testdata", "messy-title-block.csv"))
	as := readAll(t, r)
	h := r.Header()
	// The header is row 4, under a title block; its units come from row 5.
	if keys := columnKeys(h); strings.Join(keys, ",") != "asset_id,location,rated_load,rope_diameter,motor_power,last_inspection,parts_of_line," {
		t.Errorf("columns %q", keys)
	}
	for i, unit := range []string{"", "", "kg", "mm", "kW", "", "", ""} {
		if h.Columns[i].Unit != unit {
			t.Errorf("column %d %q: unit %q, want %q (from the units row)", i+1, h.Columns[i].Title, h.Columns[i].Unit, unit)
		}
	}
	for _, want := range []string{
		`messy-title-block.csv!1:1: the header is row 4: rows 1 to 3 above it (a title block, "Hoist register - Castergate depot (inven…" …) are not hoists and were not read`,
		"messy-title-block.csv!5:5: row 5 is a units row under the header, not a hoist: it gives Rated load [kg], Rope diameter [mm], Motor power [kW]",
		"messy-title-block.csv!8:8: 1 row (8) is empty: skipped",
		`messy-title-block.csv!13:13: 2 rows (13 ("TOTAL"), 14 ("Summe")) are totals rows, not hoists: left out`,
		`messy-title-block.csv!10:10: 1 row (10 ("Plant No")) is the header repeated, not a hoist: left out`,
		"messy-title-block.csv!11:11: 1 row (11 (\"kg\")) is the units row repeated, not a hoist: left out",
		`messy-title-block.csv!C7: Rated load: 1 cell holds a blank marker ("n/a" first, at messy-title-block.csv!C7): read as empty`,
		`messy-title-block.csv!D12: Rope diameter: 1 cell holds a blank marker ("?" first, at messy-title-block.csv!D12): read as empty`,
		`messy-title-block.csv!E7: Motor power: 1 cell holds a blank marker ("TBC" first, at messy-title-block.csv!E7): read as empty`,
		`messy-title-block.csv!G7: Parts of line: 1 cell holds a blank marker ("-" first, at messy-title-block.csv!G7): read as empty`,
	} {
		hasProblem(t, r, want)
	}
	if len(as) != 4 {
		t.Fatalf("%d hoists, want 4 (H-101 to H-104)", len(as))
	}
	for i, w := range []struct {
		id  string
		row int
	}{{"H-101", 6}, {"H-102", 7}, {"H-103", 9}, {"H-104", 12}} {
		if as[i].ID != w.id || as[i].Row != w.row || len(as[i].Problems) != 0 {
			t.Errorf("hoist %d: %s row %d problems %v, want %s row %d", i, as[i].ID, as[i].Row, as[i].Problems, w.id, w.row)
		}
	}
	// SWL 500 under a units row "kg" is 500 kg, not 500 t.
	if v := as[0].Get("rated_load"); v.State != fleet.OK || v.Num != 500 {
		t.Errorf("H-101 rated load %+v, want 500 kg", v)
	}
	if v := as[0].Get("motor_power"); v.State != fleet.OK || v.Num != 1500 {
		t.Errorf("H-101 motor power %+v, want 1500 W", v)
	}
	if v := as[0].Get("rope_diameter"); v.State != fleet.OK || !approx.Equal(v.Num, 0.008, 0, 1e-15) {
		t.Errorf("H-101 rope diameter %+v, want 0.008 m", v)
	}
	// Blank markers are empty, not errors.
	for _, c := range []struct {
		i   int
		key string
	}{{1, "rated_load"}, {1, "motor_power"}, {1, "parts_of_line"}, {3, "rope_diameter"}} {
		if v := as[c.i].Get(c.key); v.State != fleet.Empty {
			t.Errorf("%s %s: %+v, want empty", as[c.i].ID, c.key, v)
		}
	}
	// "none" in a pass-through column is passed through as written.
	if as[3].Cells[7].Text != "none" {
		t.Errorf("H-104 notes %q", as[3].Cells[7].Text)
	}
	if n := r.RowsLeftOut(); n != 10 {
		t.Errorf("%d rows left out, want 10 (4 to the header, units row, blank row 8, rows 10, 11, 13, 14)", n)
	}
}

func columnKeys(h *fleet.Header) []string {
	var keys []string
	for _, c := range h.Columns {
		keys = append(keys, c.Key)
	}
	return keys
}

// TestHeaderRowOption: --header-row takes the row given, whatever it holds.
func TestHeaderRowOption(t *testing.T) {
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "messy-title-block.csv"))
	if err != nil {
		t.Fatal(err)
	}
	r, err := NewCSVOptions(bytes.NewReader(b), "m.csv", Options{HeaderRow: 4})
	if err != nil {
		t.Fatal(err)
	}
	if as := readAll(t, r); len(as) != 4 || as[0].Get("rated_load").Num != 500 {
		t.Errorf("--header-row 4: %d hoists", len(as))
	}
	r, err = NewCSVOptions(bytes.NewReader(b), "m.csv", Options{HeaderRow: 2})
	if err != nil {
		t.Fatal(err)
	}
	hasProblem(t, r, "m.csv!2:2: no column title matches the register's columns: is the first row the header?")
	_, err = NewCSVOptions(bytes.NewReader(b), "m.csv", Options{HeaderRow: 99})
	if err == nil || err.Error() != "m.csv: --header-row 99: the register has no row 99 (its last row is 14)" {
		t.Errorf("row past the end: %v", err)
	}
}

// TestNotARegister: a file with no recognisable header is refused, saying what was
// looked for and where.
func TestNotARegister(t *testing.T) {
	for _, c := range []struct{ in, want string }{
		{"hello,world\n1,2\n3,4\n", "x.csv: no header row found in rows 1 to 3: looked for a row of column titles naming the asset id (Asset ID, asset, asset no, asset number, hoist id, equipment id, …) and at least one other column of the register (Rated load, Rope diameter, Motor power, … : 'hoistfleet help columns' lists them); no row names any of them. Give the header's row with --header-row N, say which column is which with --columns FILE, or rename the columns"},
		{"# Hoistfleet\n\nA README renamed .csv.\nIt mentions the Rated load and the Site.\n", "x.csv: no header row found in rows 1 to 4: looked for a row of column titles naming the asset id"},
		{"Site,Rated load [t]\nA,5\n", "the closest, row 1, names Site, Rated load but no asset id"},
	} {
		_, err := NewCSV(strings.NewReader(c.in), "x.csv")
		var fe *fleet.Error
		if !errors.As(err, &fe) || fe.Kind != fleet.IO || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q:\ngot  %v\nwant %s", c.in, err, c.want)
		}
	}
}

// messyWorkbook writes testdata/messy-hidden.xlsx's workbook (README.md there).
func messyWorkbook(t *testing.T) []byte {
	rows := [][]any{
		{"Lifting equipment register - Brindlemouth Quay (invented)"},
		{"Prepared by", "R. Okafor"},
		{},
		{"Asset ID", "SWL (t)", "SWL [kg]", "Rope diameter [mm]", "Site", "Last inspection"},
		{"BQ-01", 0.5, 500, 8, "Quay", "2026-02-01"},
		{"BQ-02", 1, 1000, 10, "Quay", "2026-03-01"},
		{"BQ-99", 5, 5000, 6, "Quay", "2019-01-01"},
		{"BQ-03", 2, 2000, 12, "Quay", "-"},
		{},
		{"Total"},
	}
	return book(t, "Register", rows, func(f *excelize.File) {
		must := func(err error) {
			if err != nil {
				t.Fatal(err)
			}
		}
		must(f.MergeCell("Register", "A1", "F1"))
		must(f.SetColVisible("Register", "B", false))
		must(f.SetRowVisible("Register", 7, false))
		must(f.SetCellFormula("Register", "B9", "SUM(B5:B8)"))
		must(f.SetCellFormula("Register", "C9", "SUM(C5:C8)"))
		must(f.SetCellFormula("Register", "C10", "SUBTOTAL(9,C5:C8)"))
	})
}

func TestMessyWorkbook(t *testing.T) {
	path := filepath.Join("..", "..", "testdata", "messy-hidden.xlsx")
	if *updateTestdata {
		if err := os.WriteFile(path, messyWorkbook(t), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	r, err := NewXLSXFile(path, "")
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	as := readAll(t, r)
	for _, want := range []string{
		// The merged title above the header is no header problem.
		`Register!1:1: the header is row 4: rows 1 to 3 above it (a title block, "Lifting equipment register - Brindlemout…" …) are not hoists and were not read`,
		// The hidden stale "SWL (t)" never wins over the visible "SWL [kg]".
		`Register!B4: "SWL (t)" is a hidden Rated load column; the visible one, Register!C4, is read and this hidden copy is passed through unread`,
		// Row 9 sums the columns without a label, row 10 is labelled.
		`Register!9:9: 2 rows (9, 10 ("Total")) are totals rows, not hoists: left out`,
		`Register!F8: Last inspection: 1 cell holds a blank marker ("-" first, at Register!F8): read as empty`,
	} {
		hasProblem(t, r, want)
	}
	if len(as) != 4 {
		t.Fatalf("%d hoists, want 4", len(as))
	}
	if v := as[0].Get("rated_load"); v.Num != 500 || r.Header().Columns[1].Key != "" || r.Header().Columns[2].Key != "rated_load" {
		t.Errorf("BQ-01 rated load %+v: the visible SWL [kg] column must be read", v)
	}
	// The hidden, scrapped BQ-99 is checked but marked hidden.
	for i, hidden := range []bool{false, false, true, false} {
		if as[i].Hidden != hidden {
			t.Errorf("%s hidden %v, want %v", as[i].ID, as[i].Hidden, hidden)
		}
	}
	if p := as[2].Problems; len(p) != 1 || p[0].Error() != "Register!7:7: asset BQ-99: row 7 is hidden or filtered out in the register: checked all the same, and marked hidden" {
		t.Errorf("BQ-99 problems %v", p)
	}
	if v := as[3].Get("last_inspection"); v.State != fleet.Empty {
		t.Errorf("BQ-03 last inspection %+v, want empty", v)
	}
	if v := as[1].Get("last_inspection"); !v.Date.Equal(time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("BQ-02 last inspection %+v", v)
	}
}

// TestTotalLabels: what a totals row's first cell says, and ids that only look like it.
func TestTotalLabels(t *testing.T) {
	for text, want := range map[string]bool{
		"Total": true, "TOTAL": true, "Totals:": true, "Grand total": true, "Sub-total": true, "Summe": true,
		"Gesamt": true, "Totaal": true, "Total rated load": true, "SUM": true,
		"SUM-01": false, "Total 2": false, "T-1": false, "Totalizer hoist": false, "Sumner Street": false, "": false,
	} {
		if got := isTotalLabel(text); got != want {
			t.Errorf("isTotalLabel(%q) = %v, want %v", text, got, want)
		}
	}
}

// TestSumRows: a SUM over several rows marks a totals row; a sum along its own row
// does not.
func TestSumRows(t *testing.T) {
	for xml, want := range map[string]bool{
		`<c r="C9"><f>SUM(C5:C8)</f><v>1</v></c>`:           true,
		`<c r="C9"><f>SUM($C$5:$C$8)</f></c>`:               true,
		`<c r="C9"><f>SUBTOTAL(9,C5:C8)</f></c>`:            true,
		`<c r="C9"><f>AGGREGATE(9,4,C5:C8)</f></c>`:         true,
		`<c r="C9"><f>Sheet2!SUM(C5:C8)</f></c>`:            true,
		`<c r="C9"><f>SUM(A9:B9)</f></c>`:                   false,
		`<c r="C9"><f>SUM(A9,B9)</f></c>`:                   false,
		`<c r="C9"><v>1</v></c><c r="D9"><t>SUM(C5:C8)</t>`: false,
	} {
		var fc formulaCells
		fc.scan([]byte(xml), 0)
		if got := fc.sumRows[9]; got != want {
			t.Errorf("%s: totals row %v, want %v", xml, got, want)
		}
	}
}

// TestTradeHeaders: testdata/messy-trade-headers.csv, headers in the trade's
// abbreviations, reeving written parts/ends (README.md there has the ground truth).
func TestTradeHeaders(t *testing.T) {
	r := openCSV(t, filepath.Join("..", "..", "..", "testdata", "messy-trade-headers.csv"))
	as := readAll(t, r)
	want := "asset_id,location,rated_load,rope_diameter,rope_reference_diameter,rope_measured_diameter,parts_of_line,motor_power,gear_efficiency,drum_diameter,hoist_speed,last_inspection,"
	if keys := strings.Join(columnKeys(r.Header()), ","); keys != want {
		t.Errorf("columns\n%s\nwant\n%s", keys, want)
	}
	hasProblem(t, r, `messy-trade-headers.csv!M1: "Rope Ø (mm)" is a second Rope diameter column (the first is messy-trade-headers.csv!D1): this copy is passed through unread`)
	hasProblem(t, r, `messy-trade-headers.csv!G2: Parts of line: 3 cells written as parts/rope ends read as both ("4/1" at messy-trade-headers.csv!G2: 4 parts of line on 1 rope ends)`)
	if len(as) != 4 {
		t.Fatalf("%d hoists", len(as))
	}
	for i, w := range []struct {
		parts, ends float64
		endsState   fleet.ValueState
	}{{4, 1, fleet.OK}, {4, 2, fleet.OK}, {2, 0, fleet.Empty}, {8, 3, fleet.Bad}} {
		p, e := as[i].Get("parts_of_line"), as[i].Get("rope_ends")
		if p.State != fleet.OK || p.Num != w.parts || e.State != w.endsState || e.Num != w.ends {
			t.Errorf("%s: parts %+v, ends %+v; want %v on %v (%v)", as[i].ID, p, e, w.parts, w.ends, w.endsState)
		}
	}
	if got := errText(as[3].Get("rope_ends")); got != `messy-trade-headers.csv!G5: asset T-04: "3" is out of range: Rope ends on drum must be 1 to 2` {
		t.Errorf("T-04 8/3: %s", got)
	}
	if c := as[0].Cells[6]; c.Text != "4/1" || c.IsNumber {
		t.Errorf("the reeving cell passes through as written: %+v", c)
	}
	for i, w := range []time.Time{day(2026, 3, 25), day(2026, 4, 1), day(2026, 3, 1), day(2026, 5, 4)} {
		if v := as[i].Get("last_inspection"); !v.Date.Equal(w) {
			t.Errorf("%s last TE %+v, want %v", as[i].ID, v, w)
		}
	}
	if v := as[0].Get("gear_efficiency"); v.Num != 0.92 {
		t.Errorf("Gearbox eff. %+v", v)
	}
	if v := as[0].Get("rope_measured_diameter"); !approx.Equal(v.Num, 0.0094, 0, 1e-15) {
		t.Errorf("Rope meas. dia %+v", v)
	}
}

// TestAbbreviations: the short forms registers write.
func TestAbbreviations(t *testing.T) {
	for in, want := range map[string]string{
		"Rope Ø":          "Rope diameter",
		"Rope⌀":           "Rope diameter",
		"No. of falls":    "number of falls",
		"Gearbox eff.":    "Gearbox efficiency",
		"Rope meas. dia":  "Rope measured diameter",
		"Drum PCD":        "Drum pitch circle diameter",
		"SWL":             "safe working load",
		"Last TE":         "Last thorough examination",
		"Notes (no unit)": "Notes number unit",
	} {
		if got := expandAbbreviations(in); got != want {
			t.Errorf("expandAbbreviations(%q) = %q, want %q", in, got, want)
		}
	}
}

// TestSumRowsAfterFirstRefs: totals rows are found on the counting path too (after the
// first maxFormulaRefs formula references are kept).
func TestSumRowsAfterFirstRefs(t *testing.T) {
	var b strings.Builder
	for r := 2; r < 2+maxFormulaRefs+2; r++ {
		fmt.Fprintf(&b, `<row r="%d"><c r="B%d"><f>A%d*2</f></c></row>`, r, r, r)
	}
	b.WriteString(`<row r="40"><c r="B40"><f>SUM(B2:B39)</f></c></row>`)
	var fc formulaCells
	fc.scan([]byte(b.String()), 0)
	fc.scan([]byte(b.String()), 0) // the second window: the counting path
	if !fc.sumRows[40] || len(fc.sumRows) != 1 {
		t.Errorf("totals rows %v, want row 40", fc.sumRows)
	}
}
