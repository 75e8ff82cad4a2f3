package main

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// TestSheetAllEndToEnd: 'check --sheet all' checks the hoists of every sheet with a
// header (two site sheets of small-si.csv's first hoist, one without a Site column), names
// each hoist's sheet in JSONL and the Register, and says which sheets it skipped.
func TestSheetAllEndToEnd(t *testing.T) {
	dir := t.TempDir()
	rows := readCSVRows(t, filepath.Join("..", "..", "testdata", "small-si.csv"))
	f := excelize.NewFile()
	_ = f.SetSheetName("Sheet1", "Read me")
	_ = f.SetCellValue("Read me", "A1", "One sheet a site (invented)")
	siteCol := -1
	for i, h := range rows[0] {
		if h == "Site" {
			siteCol = i
		}
	}
	for k, sheet := range []string{"North yard", "South yard"} {
		if _, err := f.NewSheet(sheet); err != nil {
			t.Fatal(err)
		}
		for r, row := range rows[:3] {
			var cells []any
			for i, v := range row {
				if k == 0 && i == siteCol { // North yard keeps no Site column
					continue
				}
				cells = append(cells, v)
			}
			cell, _ := excelize.CoordinatesToCellName(1, r+1)
			if err := f.SetSheetRow(sheet, cell, &cells); err != nil {
				t.Fatal(err)
			}
		}
	}
	book := filepath.Join(dir, "sites.xlsx")
	if err := f.SaveAs(book); err != nil {
		t.Fatal(err)
	}
	f.Close()

	res := runCmd(t, "", "check", book, "--sheet", "all", "--format", "jsonl", "-o", "-", "--as-of", "2026-12-01", "-q")
	if res.code != exitOK && res.code != exitFindings {
		t.Fatalf("exit %d: %s", res.code, res.err)
	}
	hs := parseJSONL(t, res.out)
	if len(hs) != 4 {
		t.Fatalf("%d hoists, want 4 (2 a sheet)", len(hs))
	}
	for i, h := range hs {
		wantSheet := []string{"North yard", "North yard", "South yard", "South yard"}[i]
		if h.str("sheet") != wantSheet {
			t.Errorf("hoist %d: sheet %q, want %q", i, h.str("sheet"), wantSheet)
		}
	}
	if hs[0].str("site") != "North yard" {
		t.Errorf("North yard has no Site column: site %q, want the sheet's name", hs[0].str("site"))
	}
	if hs[0].str("status") != hs[2].str("status") || hs[0].str("asset_id") != hs[2].str("asset_id") {
		t.Errorf("the same hoist on two sheets: %s %s and %s %s", hs[0].str("asset_id"), hs[0].str("status"), hs[2].str("asset_id"), hs[2].str("status"))
	}

	out := filepath.Join(dir, "sites-results.xlsx")
	res = runCmd(t, "", "check", book, "--sheet", "all", "-o", out, "--as-of", "2026-12-01")
	if hs[0].str("status") != "pass" && !strings.Contains(res.out, "North yard!2") {
		t.Errorf("the terminal's worst list does not name the row's sheet:\n%s", res.out)
	}
	if !strings.Contains(res.out, `skipped, no recognisable header: "Read me"`) && !strings.Contains(res.err, `skipped, no recognisable header: "Read me"`) {
		t.Errorf("the terminal does not say which sheets were skipped:\n%s\n%s", res.out, res.err)
	}
	// explain: the same id and row on two sheets are two records, none lost.
	recs := filepath.Join(dir, "recs")
	res = runCmd(t, "", "explain", book, "--sheet", "all", "--all", "-o", recs, "--as-of", "2026-12-01")
	res.mustExit(t, exitOK, "explain --sheet all --all")
	files, _ := os.ReadDir(recs)
	if len(files) != 4 || !strings.Contains(res.out, "4 calculation records written") {
		t.Errorf("explain --all: %d files (%s), want 4", len(files), res.out)
	}
	id := hs[0].str("asset_id")
	one := filepath.Join(dir, "one.txt")
	res = runCmd(t, "", "explain", book, "--sheet", "all", "--asset", id, "-o", one, "--as-of", "2026-12-01")
	res.mustExit(t, exitOK, "explain --asset of an id on two sheets")
	for _, sheet := range []string{"North_yard", "South_yard"} {
		p := filepath.Join(dir, "one_"+sheet+"_row-0002_"+id+".txt")
		b, err := os.ReadFile(p)
		if err != nil {
			t.Errorf("%v (stderr %q)", err, res.err)
			continue
		}
		if want := ", sheet " + strings.ReplaceAll(sheet, "_", " ") + ", row 2"; !strings.Contains(string(b), want) {
			t.Errorf("%s does not say %q", p, want)
		}
	}

	reg := sheetRows(t, openXLSX(t, out), "Register", 0)
	col := colIndex(reg[0], "Register sheet")
	if col < 0 || len(reg) < 5 || reg[1][col] != "North yard" || reg[4][col] != "South yard" {
		t.Errorf("Register sheet column %d in %q", col, reg)
	}
}

// readCSVRows reads a test register's rows.
func readCSVRows(t *testing.T, path string) [][]string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(bytes.NewReader(b)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return rows
}

// TestColumnsSheetAllJSON: 'columns --sheet all --format json' gives each sheet's report
// and the read's own notes (the sheets skipped).
func TestColumnsSheetAllJSON(t *testing.T) {
	dir := t.TempDir()
	f := excelize.NewFile()
	_ = f.SetSheetName("Sheet1", "Cover")
	_ = f.SetCellValue("Cover", "A1", "Register (invented)")
	_, _ = f.NewSheet("Yard")
	_ = f.SetSheetRow("Yard", "A1", &[]any{"Asset ID", "SWL [t]"})
	_ = f.SetSheetRow("Yard", "A2", &[]any{"Y-1", 5})
	book := filepath.Join(dir, "b.xlsx")
	if err := f.SaveAs(book); err != nil {
		t.Fatal(err)
	}
	f.Close()
	res := runCmd(t, "", "columns", book, "--sheet", "all", "--format", "json")
	res.mustExit(t, exitOK, "columns --sheet all --format json")
	var rep struct {
		Sheets []struct {
			Sheet string `json:"sheet"`
		} `json:"sheets"`
		Notes []string `json:"notes"`
	}
	if err := json.Unmarshal([]byte(res.out), &rep); err != nil {
		t.Fatalf("%v\n%s", err, res.out)
	}
	if len(rep.Sheets) != 1 || rep.Sheets[0].Sheet != "Yard" || !strings.Contains(strings.Join(rep.Notes, "\n"), `skipped, no recognisable header: "Cover"`) {
		t.Errorf("report %+v", rep)
	}
}
