package register

import (
	"os"
	"strings"
	"testing"
	"time"

	"hoistfleet/fleet"
)

// TestColumnsFileReadsKranliste: a register whose headers no synonym covers (German,
// testdata/kranliste.csv) is read through its columns file (testdata/kranliste-columns.csv)
// as testdata/README.md's ground truth says: the header found under the title block by
// the mapped titles, the rated load in tonnes and the rope in mm as the file says, the
// ambiguous 03/04/2026 as 3 April (the file's dmy), the remark column passed through, the
// lift height's own [m] agreeing with the file, and the unused entry noted.
func TestColumnsFileReadsKranliste(t *testing.T) {
	m := readMap(t, "../../testdata/columns/kranliste.csv")
	b, err := os.ReadFile("../../testdata/kranliste.csv")
	if err != nil {
		t.Fatal(err)
	}
	r, err := NewCSVOptions(strings.NewReader(string(b)), "kranliste.csv", Options{Columns: m})
	if err != nil {
		t.Fatal(err)
	}
	as := readAll(t, r)
	h := r.Header()
	if h.Row != 4 || len(as) != 3 {
		t.Fatalf("header row %d, %d hoists; want row 4, 3 hoists", h.Row, len(as))
	}
	keys := columnKeys(h)
	want := []string{"asset_id", "site", "rated_load", "rope_diameter", "last_inspection", "", "lift_height"}
	if strings.Join(keys, ",") != strings.Join(want, ",") {
		t.Errorf("columns read as %q, want %q", keys, want)
	}
	k101 := as[0]
	if k101.ID != "K-101" {
		t.Fatalf("first hoist %q", k101.ID)
	}
	for _, c := range []struct {
		key  string
		want float64 // SI: kg, m
	}{{"rated_load", 5000}, {"rope_diameter", 0.014}, {"lift_height", 12}} {
		if v := k101.Get(c.key); v.State != fleet.OK || v.Num != c.want {
			t.Errorf("K-101 %s = %+v, want %g", c.key, v, c.want)
		}
	}
	if v := k101.Get("last_inspection"); v.State != fleet.OK || !v.Date.Equal(time.Date(2026, 4, 3, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("K-101 last inspection %+v, want 2026-04-03 (dmy from the columns file)", v)
	}
	if v := as[2].Get("lift_height"); v.State != fleet.Empty {
		t.Errorf("K-103 blank lift height read as %+v", v)
	}
	if c := h.Columns[2]; c.UnitFrom != "columns file" || c.Mapped != "kranliste-columns.csv line 4" {
		t.Errorf("Tragfähigkeit: unit from %q, mapped %q", c.UnitFrom, c.Mapped)
	}
	hasProblem(t, r, "kranliste.csv!4:4: kranliste-columns.csv says what 7 columns are (1 of them passed through unread)")
	if c := h.Columns[5]; c.Key != "" || c.Mapped != "kranliste-columns.csv line 7" {
		t.Errorf("Bemerkung: key %q, mapped %q; want passed through as line 7 says", c.Key, c.Mapped)
	}
	hasProblem(t, r, `kranliste.csv!4:4: kranliste-columns.csv line 9 maps "Inbetriebnahme", but no column of the header row is titled so: that entry is not used`)
	hasProblem(t, r, "kranliste.csv!E4: Last inspection: dates written with numbers read in the order dmy (the columns file)")

	// Without the file, nothing is recognised as a header: refused, not guessed.
	if _, err := NewCSVOptions(strings.NewReader(string(b)), "kranliste.csv", Options{}); err == nil {
		t.Error("the German register read without its columns file")
	}
}

func readMap(t *testing.T, path string) *ColumnMap {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	m, err := ReadColumnMap("kranliste-columns.csv", f)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// TestColumnsFileWins: an entry wins over the synonyms (a column titled like one of ours
// can be ignored or read as another), and a header unit that disagrees with the file's
// refuses the column instead of choosing one.
func TestColumnsFileWins(t *testing.T) {
	reg := "Asset ID,SWL [kg],Capacity,Rope diameter [mm]\nH1,5000,7,14\n"
	m, err := ReadColumnMap("c.csv", strings.NewReader("register column,column,unit\nCapacity,ignore,\nSWL,Rated load,t\n"))
	if err != nil {
		t.Fatal(err)
	}
	r, err := NewCSVOptions(strings.NewReader(reg), "r.csv", Options{Columns: m})
	if err != nil {
		t.Fatal(err)
	}
	as := readAll(t, r)
	if got := strings.Join(columnKeys(r.Header()), ","); got != "asset_id,,,rope_diameter" {
		t.Errorf("columns %q: want SWL refused (kg against t) and Capacity ignored", got)
	}
	if v := as[0].Get("rated_load"); v.State == fleet.OK {
		t.Errorf("rated load read as %+v from a column whose units disagree", v)
	}
	hasProblem(t, r, `r.csv!B1: "SWL [kg]" gives the unit "kg", c.csv line 3 gives "t": the column is passed through unread; correct one of them`)
}

// TestReadColumnMapRefuses: every malformed entry is refused with the file, line and
// what to write.
func TestReadColumnMapRefuses(t *testing.T) {
	head := "register column,column,unit,date order\n"
	for _, tc := range []struct{ name, text, want string }{
		{"empty", "", "the columns file is empty"},
		{"bad header", "from,to\nA,asset_id\n", `line 1: "from" is not a columns-file column`},
		{"no key column", "register column,unit\nA,t\n", "must name 'register column' and 'column'"},
		{"unknown column", head + "Kran,crane_id,,\n", `c.csv line 2: "crane_id" is not one of hoistfleet's columns`},
		{"no column of ours", head + "Kran,,,\n", `line 2: no column of ours given for "Kran"`},
		{"twice", head + "A,asset_id,,\na,site,,\n", `line 3: register column "a" is already mapped on line 2`},
		{"two to one", head + "A,asset_id,,\nB,Asset ID,,\n", `line 3: Asset ID is already given by register column "A" on line 2`},
		{"wrong unit", head + "L,rated_load,m,\n", "line 2: Rated load"},
		{"unit on text", head + "S,site,kg,\n", "Site takes no unit"},
		{"unit on ignored", head + "S,ignore,kg,\n", "a unit (\"kg\") for a column that is ignored"},
		{"order on a number", head + "L,rated_load,t,dmy\n", "a date order (\"dmy\") for \"L\", a column that holds no dates"},
		{"interval in weeks", head + "Prüfintervall,inspection_interval,weeks,\n", "line 2: Inspection interval is in months, not \"weeks\""},
		{"bad order", head + "D,last_inspection,,dym\n", "line 2: "},
		{"maps nothing", head, "maps no column"},
	} {
		_, err := ReadColumnMap("c.csv", strings.NewReader(tc.text))
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want it to contain %q", tc.name, err, tc.want)
		}
	}
}

// TestInspectionIntervalHeader: the interval column is in months; a header in months
// (any common spelling) is read, one without a unit is read in months and said so, and
// one in weeks is refused (26 weeks read as 26 months would be a misread).
func TestInspectionIntervalHeader(t *testing.T) {
	for _, tc := range []struct {
		header string
		read   bool
		note   string
	}{
		{"Inspection interval [months]", true, ""},
		{"Examination interval (mths)", true, ""},
		{"Inspection interval", true, `"Inspection interval" gives no unit: read in months, the column's only unit (write "Inspection interval [months]" to say so)`},
		{"Inspection interval (weeks)", false, `Inspection interval is in months, not "weeks"`},
	} {
		reg := "Asset ID,Rated load [t]," + tc.header + "\nH1,5,6\n"
		r, err := NewCSVOptions(strings.NewReader(reg), "r.csv", Options{})
		if err != nil {
			t.Fatal(err)
		}
		as := readAll(t, r)
		v := as[0].Get("inspection_interval")
		if got := v.State == fleet.OK && v.Num == 6; got != tc.read {
			t.Errorf("%s: read %v (%+v), want %v", tc.header, got, v, tc.read)
		}
		if tc.note != "" && !strings.Contains(strings.Join(problems(r), "\n"), tc.note) {
			t.Errorf("%s: no note %q in\n%s", tc.header, tc.note, strings.Join(problems(r), "\n"))
		}
	}
}

// TestColumnsFileClaimsBeforeSynonyms: a column the file gives to one register column is
// that column even where another column's title would match it by a synonym and comes
// first; the other is passed through, said so.
func TestColumnsFileClaimsBeforeSynonyms(t *testing.T) {
	m, err := ReadColumnMap("c.csv", strings.NewReader("register column,column,unit\nNennlast,rated_load,t\n"))
	if err != nil {
		t.Fatal(err)
	}
	r, err := NewCSVOptions(strings.NewReader("Asset ID,SWL [t],Nennlast,Capacity [t]\nH1,5,3.2,7\n"), "w.csv", Options{Columns: m})
	if err != nil {
		t.Fatal(err)
	}
	as := readAll(t, r)
	if got := strings.Join(columnKeys(r.Header()), ","); got != "asset_id,,rated_load," {
		t.Errorf("columns %q, want only Nennlast read as the rated load", got)
	}
	if v := as[0].Get("rated_load"); v.Num != 3200 {
		t.Errorf("rated load %+v, want 3200 kg from Nennlast", v)
	}
	hasProblem(t, r, `w.csv!B1: "SWL [t]" would be Rated load by its title, but c.csv gives Rated load to "Nennlast": passed through unread`)
}

// TestReadColumnMapDialects: a columns file as a spreadsheet saves it — a UTF-8 mark,
// semicolons (a comma decimal separator) — is read; the interval column takes its months;
// every fault of a file is reported at once, each with its line.
func TestReadColumnMapDialects(t *testing.T) {
	m, err := ReadColumnMap("c.csv", strings.NewReader("\ufeffregister column;column;unit;date order\nKran-Nr.;asset_id;;\nPrüfintervall;inspection_interval;Monate;\nTragfähigkeit;rated_load;t;\n"))
	if err == nil || !strings.Contains(err.Error(), `c.csv line 3: Inspection interval is in months, not "Monate"`) {
		t.Errorf("German month word: %v", err)
	}
	m, err = ReadColumnMap("c.csv", strings.NewReader("\ufeffregister column;column;unit;date order\nKran-Nr.;asset_id;;\nPrüfintervall;inspection_interval;months;\nTragfähigkeit;rated_load;t;\n"))
	if err != nil {
		t.Fatal(err)
	}
	r, err := NewCSVOptions(strings.NewReader("Kran-Nr.,Tragfähigkeit,Prüfintervall\nK1,5,6\n"), "k.csv", Options{Columns: m})
	if err != nil {
		t.Fatal(err)
	}
	as := readAll(t, r)
	if v := as[0].Get("inspection_interval"); v.State != fleet.OK || v.Num != 6 {
		t.Errorf("interval %+v, want 6 (months, from the file)", v)
	}
	_, err = ReadColumnMap("c.csv", strings.NewReader("register column,column,unit\nA,nope,\nB,asset_id,kg\nC,site,\nC,site,\n"))
	for _, want := range []string{"c.csv line 2: \"nope\"", "c.csv line 3: Asset ID takes no unit", "c.csv line 5: register column \"C\" is already mapped on line 4"} {
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("all faults at once: %v lacks %q", err, want)
		}
	}
}

// TestPercentColumnWithoutUnit: a percentage column whose header gives no unit is read in
// % and said so (a duty factor written 1 for 100 % would otherwise pass as 1 % unseen).
func TestPercentColumnWithoutUnit(t *testing.T) {
	r, err := NewCSVOptions(strings.NewReader("Asset ID,Rated load [t],Motor duty factor\nH1,5,40\n"), "p.csv", Options{})
	if err != nil {
		t.Fatal(err)
	}
	as := readAll(t, r)
	if v := as[0].Get("motor_duty_factor"); v.State != fleet.OK || v.Num != 0.4 {
		t.Errorf("duty factor %+v, want 40 %% (0.4)", v)
	}
	hasProblem(t, r, `p.csv!C1: "Motor duty factor" gives no unit: read in % (write "Motor duty factor [%]" to say so; a fraction such as 0.4 is not a percentage)`)
}

// TestColumnsFileDateOrderMessage: a date refused under the columns file's order says the
// order is the file's, not --date-order's.
func TestColumnsFileDateOrderMessage(t *testing.T) {
	m, err := ReadColumnMap("c.csv", strings.NewReader("register column,column,unit,date order\nGeprüft,last_inspection,,mdy\n"))
	if err != nil {
		t.Fatal(err)
	}
	r, err := NewCSVOptions(strings.NewReader("Asset ID,Rated load [t],Geprüft\nH1,5,25/03/2026\n"), "d.csv", Options{Columns: m, DateOrder: DMY})
	if err != nil {
		t.Fatal(err)
	}
	as := readAll(t, r)
	v := as[0].Get("last_inspection")
	if v.State != fleet.Bad || !strings.Contains(v.Err.Error(), "not a date with the month first (the columns file's date order mdy)") {
		t.Errorf("25/03/2026 under the file's mdy: %+v", v)
	}
}

// TestNoHeaderMessageUsesColumnsFile: the "no header" message counts what the columns
// file names: a file mapping only the asset id finds a row naming only that, and says
// that a register needs another column.
func TestNoHeaderMessageUsesColumnsFile(t *testing.T) {
	m, err := ReadColumnMap("c.csv", strings.NewReader("register column,column\nKran-Nr.,asset_id\n"))
	if err != nil {
		t.Fatal(err)
	}
	_, err = NewCSVOptions(strings.NewReader("Kran-Nr.,Tragfähigkeit\nK1,5\n"), "k.csv", Options{Columns: m})
	if err == nil || !strings.Contains(err.Error(), "the closest, row 1, names only the asset id: a register needs at least one other of its columns") {
		t.Errorf("error %v", err)
	}
}
