package baseline

import (
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet"
)

func write(t *testing.T, name, body string) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(p, []byte(body), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// TestReadJSONL reads hoists, skips a removed line of an earlier comparison, and says
// what JSON lines cannot carry.
func TestReadJSONL(t *testing.T) {
	p := write(t, "old.jsonl", `{"asset_id":"H-1","row":2,"status":"fail","max_rated_load_kg":5000,"mechanism_capacity_kg":null,"site":"North","crane":"C1","exposure":"low","checks":[{"id":"rope-wear","status":"fail"}]}
{"asset_id":"H-0","row":null,"status":null,"checks":[],"change":{"kind":"removed"}}

{"asset_id":"","row":4,"status":"pass","checks":[]}
`)
	b, err := Read(p)
	if err != nil {
		t.Fatal(err)
	}
	if len(b.Hoists) != 1 {
		t.Fatalf("hoists %+v, want H-1 only", b.Hoists)
	}
	h := b.Hoists[0]
	if h.AssetID != "H-1" || h.Row != 2 || h.Status != fleet.StatusFail || h.MaxRatedLoadKg != 5000 ||
		!math.IsNaN(h.MechanismCapacityKg) || h.Site != "North" || h.Crane != "C1" || h.Exposure != "low" ||
		h.Checks["rope-wear"] != fleet.StatusFail || h.Inputs != nil {
		t.Errorf("hoist %+v", h)
	}
	notes := strings.Join(b.Meta.Notes, "\n")
	for _, want := range []string{"1 lines of the baseline have no asset id", "no run header", "register values not compared"} {
		if !strings.Contains(notes, want) {
			t.Errorf("notes %q lack %q", notes, want)
		}
	}
	if b.Meta.Format != "jsonl" || len(b.Meta.FileSHA256) != 64 {
		t.Errorf("meta %+v", b.Meta)
	}
}

// TestReadErrors: what is not an earlier run of hoistfleet is refused, naming the file,
// the line, sheet or cell, and what was expected.
func TestReadErrors(t *testing.T) {
	book := func(sheets map[string][][]any) string {
		f := excelize.NewFile()
		for name, rows := range sheets {
			if _, err := f.NewSheet(name); err != nil {
				t.Fatal(err)
			}
			for i, r := range rows {
				cell, _ := excelize.CoordinatesToCellName(1, i+1)
				if err := f.SetSheetRow(name, cell, &r); err != nil {
					t.Fatal(err)
				}
			}
		}
		p := filepath.Join(t.TempDir(), "book.xlsx")
		if err := f.SaveAs(p); err != nil {
			t.Fatal(err)
		}
		return p
	}
	for _, tc := range []struct {
		name, path string
		want       []string
	}{
		{"missing", filepath.Join(t.TempDir(), "none.xlsx"), []string{"--baseline", "no such file"}},
		{"not json", write(t, "a.jsonl", "Asset ID,Site\nH-1,North\n"), []string{"a.jsonl: line 1: not a hoistfleet JSON line"}},
		{"csv long form", write(t, "long.csv", "row,asset_id,site,hoist_status\n2,H-1,North,pass\n"), []string{"long.csv: this is hoistfleet's CSV long form, which a baseline cannot be", "give the results workbook (.xlsx) or the JSON lines (.jsonl)"}},
		{"no status", write(t, "b.jsonl", `{"asset_id":"H-1","row":2}`+"\n"), []string{"b.jsonl: line 1: expected a hoist's line with \"row\" and \"status\""}},
		{"bad status", write(t, "c.jsonl", `{"asset_id":"H-1","row":2,"status":"ok"}`+"\n"), []string{"c.jsonl: line 1: status \"ok\" is not a status word"}},
		{"empty", write(t, "d.jsonl", "\n"), []string{"d.jsonl: no hoist's line"}},
		{"a register, not results", book(map[string][][]any{"Audit": {{"Version", "0.1.0"}}, "Register": {{"Asset ID", "Rated load [t]"}, {"H-1", 5}}}),
			[]string{"sheet Register: not a hoistfleet results sheet: no columns Status, Action, Governing check"}},
		{"no audit", book(map[string][][]any{"Register": {{"Asset ID"}}}), []string{"not a hoistfleet results workbook: no Audit sheet"}},
		{"bad status cell", book(map[string][][]any{"Audit": {{"Version", "0.1.0"}}, "Register": {
			{"Asset ID", "Status", "Action", "Governing check", "Max rated load [t]"}, {"H-1", "fine", "", "", 5}}}),
			[]string{"Register!B2: asset H-1: \"fine\" is not a status word"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Read(tc.path)
			if err == nil {
				t.Fatal("read without error")
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q lacks %q", err, w)
				}
			}
		})
	}
}

// TestReadWorkbookRegister reads a hand-made results sheet: the rating in the sheet's
// unit converted to kg (1 t = 1000 kg, NIST SP 811), check statuses, the register's
// values by column, and the Audit's run.
func TestReadWorkbookRegister(t *testing.T) {
	f := excelize.NewFile()
	must := func(err error) {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
	}
	_, err := f.NewSheet("Register")
	must(err)
	_, err = f.NewSheet("Audit")
	must(err)
	for i, r := range [][]any{
		{"Asset ID", "Site", "Rope MBF [kN]", "Status", "Action", "Governing check", "Max rated load [t]", "Min margin", "rope-wear status", "rope-wear utilisation"},
		{"H-1", "North", 178.6, "marginal", "", "rope-design-factor", 4.5, 0.05, "pass", 0.5},
	} {
		cell, _ := excelize.CoordinatesToCellName(1, i+1)
		must(f.SetSheetRow("Register", cell, &r))
	}
	for i, r := range [][]any{{"Version", "0.1.0"}, {"As of", "2026-12-01"}, {"Rule profile", "us"}, {"Input SHA-256", "abc"}, {"User rules file", "none"}} {
		cell, _ := excelize.CoordinatesToCellName(1, i+1)
		must(f.SetSheetRow("Audit", cell, &r))
	}
	p := filepath.Join(t.TempDir(), "old.xlsx")
	must(f.SaveAs(p))
	b, err := Read(p)
	if err != nil {
		t.Fatal(err)
	}
	if b.Meta.Version != "0.1.0" || b.Meta.AsOf != "2026-12-01" || b.Meta.Profile != "us" || b.Meta.InputSHA256 != "abc" || b.Meta.Format != "xlsx" {
		t.Errorf("meta %+v", b.Meta)
	}
	if want := []string{"Asset ID", "Site", "Rope MBF [kN]"}; strings.Join(b.Meta.Columns, "|") != strings.Join(want, "|") {
		t.Errorf("columns %q, want %q", b.Meta.Columns, want)
	}
	if len(b.Hoists) != 1 {
		t.Fatalf("hoists %+v", b.Hoists)
	}
	h := b.Hoists[0]
	if h.AssetID != "H-1" || h.Site != "North" || h.Status != fleet.StatusMarginal || h.Row != 2 ||
		math.Abs(h.MaxRatedLoadKg-4500) > 1e-9 || h.Checks["rope-wear"] != fleet.StatusPass ||
		h.Inputs["Rope MBF [kN]"] != "178.6" || h.Inputs["Site"] != "North" {
		t.Errorf("hoist %+v", h)
	}
}
