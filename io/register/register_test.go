package register

import (
	"bytes"
	"context"
	"errors"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"hoistfleet/calc/approx"
	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
)

// readAll reads every row of a source.
func readAll(t testing.TB, r fleet.Source) []*fleet.Asset {
	t.Helper()
	var out []*fleet.Asset
	for {
		a, err := r.Next(context.Background())
		if err == io.EOF {
			return out
		}
		if err != nil {
			t.Fatalf("Next after %d rows: %v", len(out), err)
		}
		out = append(out, a)
	}
}

func openCSV(t testing.TB, file string) *Reader {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("testdata", file))
	if err != nil {
		t.Fatal(err)
	}
	r, err := NewCSV(bytes.NewReader(b), file)
	if err != nil {
		t.Fatalf("NewCSV(%s): %v", file, err)
	}
	return r
}

func csvString(t testing.TB, text string) *Reader {
	t.Helper()
	r, err := NewCSV(strings.NewReader(text), "reg.csv")
	if err != nil {
		t.Fatalf("NewCSV: %v", err)
	}
	return r
}

// errText returns a Value's error message, "" when it has none.
func errText(v fleet.Value) string {
	if v.Err == nil {
		return ""
	}
	return v.Err.Error()
}

// Every dialect of design.md gives the same register.
func TestCSVDialects(t *testing.T) {
	files := []string{
		"dialect-comma.csv",          // comma, UTF-8, LF
		"dialect-comma-crlf-bom.csv", // comma, UTF-8 with BOM, CRLF
		"dialect-semicolon.csv",      // semicolon, decimal comma, UTF-8 with BOM
		"dialect-utf16le.csv",        // comma, UTF-16 LE with BOM, CRLF
		"dialect-utf16be.csv",        // semicolon, decimal comma, UTF-16 BE with BOM
		"dialect-cp1252.csv",         // semicolon, decimal comma, Windows-1252, CRLF
	}
	for _, file := range files {
		t.Run(file, func(t *testing.T) {
			r := openCSV(t, file)
			h := r.Header()
			if len(h.Problems) != 0 {
				t.Errorf("header problems: %v", h.Problems)
			}
			wantKeys := []string{"asset_id", "site", "rated_load", "rope_diameter", "sheave_efficiency", "last_inspection", ""}
			if len(h.Columns) != len(wantKeys) {
				t.Fatalf("%d columns, want %d", len(h.Columns), len(wantKeys))
			}
			for i, k := range wantKeys {
				if h.Columns[i].Key != k {
					t.Errorf("column %d key %q, want %q", i, h.Columns[i].Key, k)
				}
			}
			if h.Sheet != file || h.File != file {
				t.Errorf("Sheet %q File %q", h.Sheet, h.File)
			}
			as := readAll(t, r)
			if len(as) != 2 {
				t.Fatalf("%d rows, want 2", len(as))
			}
			a := as[0]
			if a.ID != "H-1" || a.Row != 2 || a.Index != 0 || as[1].Row != 3 || as[1].Index != 1 {
				t.Errorf("identity: %q row %d index %d; second row %d", a.ID, a.Row, a.Index, as[1].Row)
			}
			if got := a.Get("site").Text; got != "Lagerhalle Süd" {
				t.Errorf("site %q (encoding)", got)
			}
			// 12.5 t = 12 500 kg (NIST SP 811: tonne = 1000 kg).
			if v := a.Get("rated_load"); v.State != fleet.OK || !approx.Equal(v.Num, 12500, 0, 1e-15) {
				t.Errorf("rated load %+v", v)
			}
			if v := a.Get("rope_diameter"); !approx.Equal(v.Num, 0.016, 0, 1e-15) {
				t.Errorf("rope diameter %v", v.Num)
			}
			if v := a.Get("sheave_efficiency"); !approx.Equal(v.Num, 0.98, 0, 1e-15) {
				t.Errorf("sheave efficiency %v", v.Num)
			}
			if v := a.Get("last_inspection"); !v.Date.Equal(time.Date(2024, 3, 1, 0, 0, 0, 0, time.UTC)) {
				t.Errorf("last inspection %v", v.Date)
			}
			if a.Cells[6].Text != `24" drum` {
				t.Errorf("pass-through %q", a.Cells[6].Text)
			}
			if len(a.Problems) != 0 || len(as[1].Problems) != 0 {
				t.Errorf("problems: %v %v", a.Problems, as[1].Problems)
			}
		})
	}
}

// A hoist described in US customary units gives the same SI values as the same hoist in
// SI units. equiv-si.csv holds the US values converted by hand with the NIST SP 811
// factors: lb 0.45359237 kg, in 0.0254 m, ft 0.3048 m, lbf 4.4482216152605 N,
// hp 745.69987158227022 W, lbf ft 1.3558179483314004 N m, lb ft² 0.0421401100938048
// kg m², slug ft² = 14.59390293720636 × 0.3048² kg m², psi = lbf/in².
func TestUSUnitsMatchSI(t *testing.T) {
	si := readAll(t, openCSV(t, "equiv-si.csv"))
	usr := openCSV(t, "equiv-us.csv")
	if len(usr.Header().Problems) != 0 {
		t.Fatalf("US header problems: %v", usr.Header().Problems)
	}
	us := readAll(t, usr)
	if len(si) != 1 || len(us) != 1 {
		t.Fatalf("rows: %d %d", len(si), len(us))
	}
	n := 0
	for _, col := range schema.Columns() {
		k := col.Key
		want, got := si[0].Get(k), us[0].Get(k)
		if want.Cell.Row == 0 { // not a column of the register
			continue
		}
		if want.State != fleet.OK || got.State != fleet.OK {
			t.Errorf("%s: states %v %v (%s %s)", k, want.State, got.State, errText(want), errText(got))
			continue
		}
		if k == "asset_id" {
			continue
		}
		n++
		if !approx.Equal(got.Num, want.Num, 0, 1e-12) {
			t.Errorf("%s: US %.15g, SI %.15g", k, got.Num, want.Num)
		}
	}
	if n != 19 {
		t.Errorf("compared %d fields, want 19", n)
	}
	// Spot checks against NIST SP 811 appendix B (7 significant digits).
	spot := []struct {
		key  string
		want float64
		note string
	}{
		{"rated_load", 4535.924, "10 000 lb × 4.535 924 E-01 kg/lb"},
		{"rope_mbf", 266893.3, "60 000 lbf × 4.448 222 N/lbf"},
		{"motor_power", 14914.00, "20 hp × 7.456 999 E+02 W/hp"},
		{"brake_torque", 135.5818, "100 lbf ft × 1.355 818 N m"},
		{"motor_inertia", 0.08428022, "2 lb ft² × 4.214 011 E-02 kg m²"},
		{"hoist_speed", 0.1524, "30 ft/min × 5.08 E-03 m/s (exact)"},
		{"operating_hours", 4.32e6, "72 000 min × 60 s (exact)"},
		{"motor_peak_torque", 1.6, "160 % (default unit of the column) = 1.6"},
	}
	for _, s := range spot {
		if got := us[0].Get(s.key).Num; !approx.Equal(got, s.want, 0, 5e-7) {
			t.Errorf("%s = %.10g, want %.10g (NIST SP 811: %s)", s.key, got, s.want, s.note)
		}
	}
	// The header's own unit and its factor are kept for the writers.
	for _, c := range usr.Header().Columns {
		if c.Key == "rated_load" && (c.Unit != "lb" || c.Factor != 0.45359237) {
			t.Errorf("rated load column: unit %q factor %v", c.Unit, c.Factor)
		}
		if c.Key == "motor_peak_torque" && (c.Unit != "%" || c.Factor != 0.01) {
			t.Errorf("peak torque column: unit %q factor %v", c.Unit, c.Factor)
		}
	}
}

// A register full of bad cells still yields every row, each bad cell located and
// explained.
func TestBadCellsKeepEveryRow(t *testing.T) {
	const reg = `Asset ID,Rated load [t],Parts of line,Duty group,Load spectrum,Drum grooved,Last inspection,Sheave efficiency,Rope diameter [mm],Notes
H-1,twelve,4,M5,L2,yes,2024-01-31,0.98,16,ok
H-2,"1,250",2.5,M9,0.5,maybe,03/04/2024,1.2,130,
H-3,12 m,0,m5,l3,Y,2024-02-30,95%,16,
H-4,#DIV/0!,4,FEM 1Am,L1,0,2024-01-31T08:30:00,0.97,0.5,
`
	r := csvString(t, reg)
	as := readAll(t, r)
	if len(as) != 4 {
		t.Fatalf("%d rows, want 4", len(as))
	}
	tests := []struct {
		row   int
		key   string
		state fleet.ValueState
		kind  fleet.Kind
		msg   string // the whole Err.Error()
	}{
		{0, "rated_load", fleet.Bad, fleet.Invalid, `reg.csv!B2: asset H-1: "twelve" is not a number in [t]`},
		{1, "rated_load", fleet.Bad, fleet.Invalid, `reg.csv!B3: asset H-2: "1,250" is not a number in [t]: write it without thousands separators`},
		{2, "rated_load", fleet.Bad, fleet.Invalid, `reg.csv!B4: asset H-3: "12 m" carries the unit "m": m is a unit of length, not of mass: write one of kg, g, t, tonne, lb, short ton or long ton`},
		{3, "rated_load", fleet.Bad, fleet.Invalid, `reg.csv!B5: asset H-4: "#DIV/0!" is not a number in [t]: the cell holds a spreadsheet error`},
		{1, "parts_of_line", fleet.Bad, fleet.Invalid, `reg.csv!C3: asset H-2: "2.5" is not a whole number`},
		{2, "parts_of_line", fleet.Bad, fleet.OutOfRange, `reg.csv!C4: asset H-3: "0" is out of range: Parts of line must be 1 to 24`},
		{1, "duty_group", fleet.Bad, fleet.Invalid, `reg.csv!D3: asset H-2: "M9" is not one of M1, M2, M3, M4, M5, M6, M7, M8, 1Dm, 1Cm, 1Bm, 1Am, 2m, 3m, 4m, 5m`},
		{1, "load_spectrum", fleet.Bad, fleet.Invalid, `reg.csv!E3: asset H-2: "0.5" is a number: the load spectrum is a class L1 to L4; for a factor km use the Spectrum factor column`},
		{1, "drum_grooved", fleet.Bad, fleet.Invalid, `reg.csv!F3: asset H-2: "maybe" is not yes or no`},
		{1, "last_inspection", fleet.Bad, fleet.Invalid, `reg.csv!G3: asset H-2: "03/04/2024" is not a date: it reads as 3 April 2024 (day first) or March 4, 2024 (month first), and the column has no date that settles which (a day above 12): give --date-order dmy or mdy, or write it as YYYY-MM-DD`},
		{2, "last_inspection", fleet.Bad, fleet.Invalid, `reg.csv!G4: asset H-3: "2024-02-30" is not a date: write it as YYYY-MM-DD (ISO 8601)`},
		{1, "sheave_efficiency", fleet.Bad, fleet.OutOfRange, `reg.csv!H3: asset H-2: "1.2" is out of range: Sheave efficiency must be 0.5 to 1`},
		// Schema range of rope diameter: 1 to 120 mm (templates/columns.csv).
		{1, "rope_diameter", fleet.Bad, fleet.OutOfRange, `reg.csv!I3: asset H-2: "130" is out of range in [mm]: Rope diameter must be 1 to 120 mm`},
		{3, "rope_diameter", fleet.Bad, fleet.OutOfRange, `reg.csv!I5: asset H-4: "0.5" is out of range in [mm]: Rope diameter must be 1 to 120 mm`},
	}
	for _, tt := range tests {
		v := as[tt.row].Get(tt.key)
		if v.State != tt.state {
			t.Errorf("row %d %s: state %v, want %v (%s)", tt.row, tt.key, v.State, tt.state, errText(v))
			continue
		}
		if v.Err == nil {
			t.Errorf("row %d %s: no error", tt.row, tt.key)
			continue
		}
		if v.Err.Kind != tt.kind || v.Err.Field != tt.key || v.Err.Asset != as[tt.row].ID || v.Err.Cell != v.Cell || v.Cell.IsZero() {
			t.Errorf("row %d %s: error fields %+v", tt.row, tt.key, v.Err)
		}
		if got := v.Err.Error(); got != tt.msg {
			t.Errorf("row %d %s:\ngot  %s\nwant %s", tt.row, tt.key, got, tt.msg)
		}
	}
	// Sentinels for errors.Is.
	if !errors.Is(as[0].Get("rated_load").Err, ErrNotNumber) || !errors.Is(as[1].Get("rope_diameter").Err, ErrOutOfRange) {
		t.Error("sentinels not wrapped")
	}
	// Good cells in the same rows.
	good := []struct {
		row  int
		key  string
		text string
		num  float64
	}{
		{0, "duty_group", "M5", 0},
		{2, "duty_group", "M5", 0},    // "m5"
		{3, "duty_group", "1Am", 0},   // "FEM 1Am"
		{2, "load_spectrum", "L3", 0}, // "l3"
		{2, "drum_grooved", "yes", 0}, // "Y"
		{3, "drum_grooved", "no", 0},  // "0"
		{2, "sheave_efficiency", "", 0.95},
		{3, "sheave_efficiency", "", 0.97},
	}
	for _, g := range good {
		v := as[g.row].Get(g.key)
		if v.State != fleet.OK || v.Text != g.text || !approx.Equal(v.Num, g.num, 1e-15, 0) {
			t.Errorf("row %d %s: %+v, want %q %v", g.row, g.key, v, g.text, g.num)
		}
	}
	if d := as[3].Get("last_inspection"); d.State != fleet.OK || !d.Date.Equal(time.Date(2024, 1, 31, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("date with time: %+v", d)
	}
}

func TestRowProblems(t *testing.T) {
	const reg = "Asset ID,Site,Rated load [t]\n" +
		"H-1,A,1\n" + // row 2
		"\n" + // row 3: a blank line (encoding/csv skips it; it still counts as a line)
		",,\n" + // row 4: an empty row
		"H-1,B,2\n" + // row 5: duplicate of row 2
		",C,3\n" + // row 6: no id
		"H-3,D\n" + // row 7: short
		"H-4,E,4,extra,\n" + // row 8: long
		"H-5,F,5,,\n" // row 9: long but the extra cells are empty
	r := csvString(t, reg)
	as := readAll(t, r)
	if len(as) != 6 {
		t.Fatalf("%d rows, want 6 (the empty row left out)", len(as))
	}
	tests := []struct {
		i    int
		row  int
		kind fleet.Kind
		msg  string
	}{
		{1, 5, fleet.Duplicate, `reg.csv!A5: asset H-1: asset id "H-1" is already used in row 2`},
		{2, 6, fleet.Missing, "reg.csv!A6: the asset id is missing"},
		{3, 7, fleet.Shape, "reg.csv!7:7: asset H-3: row has 2 cells, the header 3: the missing cells are read as empty"},
		{4, 8, fleet.Shape, `reg.csv!D8: asset H-4: row has 5 cells, the header 3: cells beyond the header's last column are not read and not passed through (reg.csv!D8 "extra")`},
		{5, 9, fleet.Shape, "reg.csv!9:9: asset H-5: row has 5 cells, the header 3 (the extra cells are empty)"},
	}
	if len(as[0].Problems) != 0 {
		t.Errorf("row 2: %v", as[0].Problems)
	}
	// The empty row 4 is noted once, in the header's problems, at the end.
	if p := r.Header().Problems; len(p) != 1 || p[0].Error() != "reg.csv!4:4: 1 row (4) is empty: skipped" {
		t.Errorf("empty row note: %v", p)
	}
	for _, tt := range tests {
		a := as[tt.i]
		if a.Row != tt.row || a.Index != tt.i {
			t.Errorf("asset %d: row %d index %d, want row %d", tt.i, a.Row, a.Index, tt.row)
		}
		if len(a.Problems) != 1 {
			t.Errorf("row %d: problems %v", tt.row, a.Problems)
			continue
		}
		p := a.Problems[0]
		if p.Kind != tt.kind || p.Error() != tt.msg {
			t.Errorf("row %d: %v %q\nwant    %v %q", tt.row, p.Kind, p.Error(), tt.kind, tt.msg)
		}
		if len(a.Cells) != 3 {
			t.Errorf("row %d: %d cells, want 3 (aligned with the header)", tt.row, len(a.Cells))
		}
	}
	// The short row still reads what it has.
	if v := as[3].Get("site"); v.Text != "D" {
		t.Errorf("short row site %+v", v)
	}
}

func TestHeaderProblems(t *testing.T) {
	tests := []struct {
		name   string
		header string
		row    string
		want   []string // Header.Problems, in order
		field  string   // a field made Bad in the row by the header problem ("" none)
		msg    string   // its message
	}{
		{"ambiguous ton", "Asset ID,Site,Rated load [ton]", "H-1,A,5",
			[]string{`reg.csv!C1: "Rated load [ton]": ton is ambiguous: write short ton or long ton`},
			"rated_load", `reg.csv!C2: asset H-1: header reg.csv!C1 "Rated load [ton]": ton is ambiguous: write short ton or long ton`},
		{"lb in a torque column", "Asset ID,Brake torque [lb]", "H-1,100",
			[]string{`reg.csv!B1: "Brake torque [lb]": lb is not a torque: write lbf ft (lb ft is read as lbf ft) or lbf in`},
			"brake_torque", `reg.csv!B2: asset H-1: header reg.csv!B1 "Brake torque [lb]": lb is not a torque: write lbf ft (lb ft is read as lbf ft) or lbf in`},
		{"GD2 unit without GD2", "Asset ID,Motor inertia [kgf m2]", "H-1,0.4",
			[]string{`reg.csv!B1: "Motor inertia [kgf m2]": kgf m2 is the unit of GD² (4 × the moment of inertia): if the column holds GD², write GD2 in the header, e.g. "Motor inertia GD2 [kgf m2]"; a moment of inertia is in kg m2`},
			"motor_inertia", ""},
		{"wrong quantity", "Asset ID,Rope diameter [kN]", "H-1,16",
			[]string{`reg.csv!B1: "Rope diameter [kN]": kN is a unit of force, not of length: write one of mm, cm, m, in or ft`},
			"rope_diameter", ""},
		{"unclosed bracket", "Asset ID,Rated load [t", "H-1,5",
			[]string{`reg.csv!B1: "Rated load [t": the bracket "[" is not closed`},
			"rated_load", ""},
		{"unit on a unitless column", "Asset ID,Parts of line [m]", "H-1,4",
			[]string{`reg.csv!B1: "Parts of line [m]": Parts of line takes no unit; "m" is ignored`}, "", ""},
		{"duplicate column", "Asset ID,Rated load [t],WLL [kg]", "H-1,5,5000",
			[]string{`reg.csv!C1: "WLL [kg]" is a second Rated load column (the first is reg.csv!B1): this copy is passed through unread`}, "", ""},
		{"no id column", "Site,Rated load [t]", "A,5",
			[]string{"reg.csv!1:1: there is no Asset ID column: rows are identified by their row number only"}, "", ""},
		{"looks like data", "H-1,5,16,2024-01-01", "H-2,6,16,2024-01-01",
			[]string{"reg.csv!1:1: the first row looks like data (3 of its 4 cells are numbers or dates), not a header: the first row must hold the column titles",
				"reg.csv!1:1: there is no Asset ID column: rows are identified by their row number only"}, "", ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			// The header row is given: a header without an asset id is not found.
			r, err := NewCSVOptions(strings.NewReader(tt.header+"\n"+tt.row+"\n"), "reg.csv", Options{HeaderRow: 1})
			if err != nil {
				t.Fatal(err)
			}
			var got []string
			for _, p := range r.Header().Problems {
				got = append(got, p.Error())
			}
			if strings.Join(got, "\n") != strings.Join(tt.want, "\n") {
				t.Errorf("header problems:\ngot  %q\nwant %q", got, tt.want)
			}
			as := readAll(t, r)
			if len(as) != 1 {
				t.Fatalf("%d rows", len(as))
			}
			if tt.field == "" {
				return
			}
			v := as[0].Get(tt.field)
			if v.State != fleet.Bad || !errors.Is(v.Err, ErrUnit) {
				t.Errorf("%s: %+v, want Bad with ErrUnit", tt.field, v)
			}
			if tt.msg != "" && errText(v) != tt.msg {
				t.Errorf("%s:\ngot  %s\nwant %s", tt.field, errText(v), tt.msg)
			}
		})
	}
}

// GD² columns: J = GD²/4 (GD² in kgf m² is numerically 4 J in kg m²).
func TestGD2Column(t *testing.T) {
	r := csvString(t, "Asset ID,Motor inertia GD2 [kgf m2],Drum inertia (GD²) [N m2]\nH-1,2,98.0665\n")
	if len(r.Header().Problems) != 0 {
		t.Fatalf("problems: %v", r.Header().Problems)
	}
	a := readAll(t, r)[0]
	// 2 kgf m² GD² → 0.5 kg m²; 98.0665 N m² GD² = 10 kgf m² → 2.5 kg m² (g_n 9.80665, NIST SP 811).
	if v := a.Get("motor_inertia").Num; !approx.Equal(v, 0.5, 0, 1e-15) {
		t.Errorf("motor inertia %v, want 0.5", v)
	}
	if v := a.Get("drum_inertia").Num; !approx.Equal(v, 2.5, 0, 1e-15) {
		t.Errorf("drum inertia %v, want 2.5", v)
	}
	if u := r.Header().Columns[1].Unit; u != "GD2 kgf m2" {
		t.Errorf("unit %q", u)
	}
}

// Synonyms and title spellings find the schema's columns.
func TestHeaderMatching(t *testing.T) {
	r := csvString(t, "asset-no,SWL [kg],ROPE_MBF [kN],Falls,Rope dia (mm),Grooved drum,Maintenance contractor,motor rpm\nH-1,500,80,2,10,no,ACME,1450\n")
	want := []string{"asset_id", "rated_load", "rope_mbf", "parts_of_line", "rope_diameter", "drum_grooved", "", "motor_speed"}
	for i, c := range r.Header().Columns {
		if c.Key != want[i] {
			t.Errorf("column %d %q: key %q, want %q", i, c.Title, c.Key, want[i])
		}
	}
	a := readAll(t, r)[0]
	if a.Get("rated_load").Num != 500 || a.Get("rope_mbf").Num != 80000 || a.Cells[6].Text != "ACME" {
		t.Errorf("values: %+v", a.Values)
	}
}

func TestIsNumberPassThrough(t *testing.T) {
	a := readAll(t, csvString(t, "Asset ID,Rated load [t],Notes,Code,Commissioned\n007,1.5,12,+5,2020-05-01\n"))[0]
	want := []bool{false, true, true, false, false}
	for i, c := range a.Cells {
		if c.IsNumber != want[i] {
			t.Errorf("cell %d %q: IsNumber %v", i, c.Text, c.IsNumber)
		}
	}
	if !a.Cells[4].IsDate || !a.Cells[4].Date.Equal(time.Date(2020, 5, 1, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("date cell %+v", a.Cells[4])
	}
	if a.ID != "007" {
		t.Errorf("id %q", a.ID)
	}
}

func TestCSVSyntaxErrorKeepsRow(t *testing.T) {
	const reg = "Asset ID,Description,Rated load [t],Site\nH-1,drum 24\" dia,5,A\nH-2,ok,6,B\n"
	as := readAll(t, csvString(t, reg))
	if len(as) != 2 {
		t.Fatalf("%d rows, want 2", len(as))
	}
	a := as[0]
	if a.ID != "H-1" || a.Row != 2 || len(a.Problems) != 1 {
		t.Fatalf("row: %q %d %v", a.ID, a.Row, a.Problems)
	}
	want := `reg.csv!B2: asset H-1: CSV syntax error at line 2, column 12: bare " in non-quoted-field: a field holding a double quote must itself be quoted, with the quote doubled ("24"" drum")`
	if got := a.Problems[0].Error(); got != want {
		t.Errorf("\ngot  %s\nwant %s", got, want)
	}
	for _, k := range []string{"description", "rated_load", "site"} {
		if v := a.Get(k); v.State != fleet.Bad || !errors.Is(v.Err, ErrSyntax) {
			t.Errorf("%s: %+v", k, v)
		}
	}
	if v := as[1].Get("rated_load"); v.State != fleet.OK || v.Num != 6000 {
		t.Errorf("next row: %+v", v)
	}
}

func TestCSVFileErrors(t *testing.T) {
	tests := []struct {
		name, in, want string
	}{
		{"empty", "", "reg.csv: the file is empty: no row holds the column titles"},
		{"blank lines", "\n,,\n,\n", "reg.csv: the file is empty: no row holds the column titles"},
		{"blank header", ",,\nH-1,2,3\n", "reg.csv: no header row found in rows 1 to 2: looked for a row of column titles naming the asset id (Asset ID, asset, asset no, asset number, hoist id, equipment id, …) and at least one other column of the register (Rated load, Rope diameter, Motor power, … : 'hoistfleet help columns' lists them); no row names any of them. Give the header's row with --header-row N, say which column is which with --columns FILE, or rename the columns"},
		{"zip", "PK\x03\x04rest", "reg.csv: this is a zip file (an XLSX workbook?), not a CSV file: read it as XLSX"},
		{"nul", "A\x00s\x00s\x00", "reg.csv: the file holds NUL bytes: it is not a text CSV file (UTF-16 without a byte-order mark?): save it as CSV UTF-8"},
		{"bad header", "Asset \"ID,Site\n", `reg.csv: the header row cannot be read: CSV syntax error at line 1, column 7: bare " in non-quoted-field: a field holding a double quote must itself be quoted, with the quote doubled ("24"" drum")`},
	}
	for _, tt := range tests {
		_, err := NewCSV(strings.NewReader(tt.in), "dir/reg.csv")
		var fe *fleet.Error
		if !errors.As(err, &fe) || fe.Kind != fleet.IO || err.Error() != tt.want {
			t.Errorf("%s:\ngot  %v\nwant %s", tt.name, err, tt.want)
		}
	}
}

func TestSeparatorDetection(t *testing.T) {
	tests := []struct {
		in   string
		want rune
	}{
		{"a,b,c\n1;2", ','},
		{"a;b;c\n1,2,3,4,5", ';'},
		{`"a;b",c` + "\n", ','},
		{`"a,b,c";d;e` + "\n", ';'},
		{"single\n", ','},
	}
	for _, tt := range tests {
		if got := detectSeparator([]byte(tt.in)); got != tt.want {
			t.Errorf("detectSeparator(%q) = %q, want %q", tt.in, got, tt.want)
		}
	}
}

func TestNextHonoursContext(t *testing.T) {
	r := csvString(t, "Asset ID,Site\nH-1,A\n")
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := r.Next(ctx); !errors.Is(err, context.Canceled) {
		t.Errorf("Next: %v", err)
	}
}

// Every header spelling in the schema names one column only (templates/columns.csv):
// a collision would make a header ambiguous.
func TestSchemaNamesUnique(t *testing.T) {
	if amb := schemaIndex().ambiguous; len(amb) != 0 {
		t.Errorf("schema names claimed by several columns: %v", amb)
	}
}
