package register

import (
	"context"
	"errors"
	"io"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet"
)

// siteBook writes a workbook as sites keep one: a cover sheet, a sheet per site (the
// first without a Site column, the second with one, its columns in another order and
// its rated load in kg), and a summary sheet of totals.
func siteBook(t *testing.T) string {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	put := func(sheet string, rows [][]any) {
		if sheet != "Sheet1" {
			if _, err := f.NewSheet(sheet); err != nil {
				t.Fatal(err)
			}
		}
		for i, row := range rows {
			cell, _ := excelize.CoordinatesToCellName(1, i+1)
			if err := f.SetSheetRow(sheet, cell, &row); err != nil {
				t.Fatal(err)
			}
		}
	}
	if err := f.SetSheetName("Sheet1", "Cover"); err != nil {
		t.Fatal(err)
	}
	put("Cover", [][]any{{"Hoist register, all sites (invented)"}, {"Prepared by: the maintenance office"}})
	put("Brindle Yard", [][]any{
		{"Asset ID", "Rated load [t]", "Rope diameter [mm]"},
		{"H-1", 5, 14},
		{"H-2", 3.2, 11},
	})
	put("Castle Depot", [][]any{
		{"Site", "Rope diameter [mm]", "Asset ID", "Rated load [kg]"},
		{"Castle Depot", 16, "H-1", 10000},
		{"Castle Depot", 12, "H-3", 2000},
		{"Castle Depot", 12, "H-3", 2000},
	})
	put("Dock", [][]any{
		{"Plant No", "SWL", "Rope dia"},
		{"", "t", "mm"},
		{"D-7", 1.6, 9},
	})
	put("Totals", [][]any{{"Site", "Hoists"}, {"Brindle Yard", 2}, {"Castle Depot", 3}})
	path := filepath.Join(t.TempDir(), "sites.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	return path
}

// TestAllSheets: --sheet all reads the site sheets as one register: every hoist, each
// cell under its own column (10000 kg under "Rated load [kg]", not under "[t]"; Dock's
// "Plant No" and "SWL" with a units row "t" under "Asset ID" and "Rated load [t]"), the
// sheet named on each row, the sheet's name as the site (and in the Site column) where it
// has no Site column, the cover and totals sheets skipped and listed; H-1 at two sites is two hoists, H-3 twice at one
// site is a duplicate (the reader's own check, within the sheet).
func TestAllSheets(t *testing.T) {
	s, err := NewXLSXAllSheets(siteBook(t), Options{})
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	var as []*fleet.Asset
	for {
		a, err := s.Next(context.Background())
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			t.Fatal(err)
		}
		as = append(as, a)
	}
	h := s.Header()
	var titles []string
	for _, c := range h.Columns {
		titles = append(titles, c.Title)
	}
	wantTitles := "Asset ID|Rated load [t]|Rope diameter [mm]|Site|Rated load [kg]|Register sheet"
	if got := strings.Join(titles, "|"); got != wantTitles {
		t.Errorf("combined header %q, want %q", got, wantTitles)
	}
	if len(as) != 6 {
		t.Fatalf("%d hoists, want 6", len(as))
	}
	type row struct {
		id, site, sheet string
		kg              float64
		cells           string
	}
	want := []row{
		{"H-1", "Brindle Yard", "Brindle Yard", 5000, "H-1|5|14|Brindle Yard||Brindle Yard"},
		{"H-2", "Brindle Yard", "Brindle Yard", 3200, "H-2|3.2|11|Brindle Yard||Brindle Yard"},
		{"H-1", "Castle Depot", "Castle Depot", 10000, "H-1||16|Castle Depot|10000|Castle Depot"},
		{"H-3", "Castle Depot", "Castle Depot", 2000, "H-3||12|Castle Depot|2000|Castle Depot"},
		{"H-3", "Castle Depot", "Castle Depot", 2000, "H-3||12|Castle Depot|2000|Castle Depot"},
		// Dock titles its columns otherwise, with units in a units row: the same columns.
		{"D-7", "Dock", "Dock", 1600, "D-7|1.6|9|Dock||Dock"},
	}
	for i, w := range want {
		a := as[i]
		var cells []string
		for _, c := range a.Cells {
			cells = append(cells, c.Text)
		}
		if a.ID != w.id || a.Get("site").Text != w.site || a.Get("rated_load").Num != w.kg || strings.Join(cells, "|") != w.cells {
			t.Errorf("hoist %d: %s at %q, %g kg, cells %q; want %s at %q, %g kg, %q", i, a.ID, a.Get("site").Text, a.Get("rated_load").Num,
				strings.Join(cells, "|"), w.id, w.site, w.kg, w.cells)
		}
	}
	if len(as[2].Problems) != 0 {
		t.Errorf("H-1 at a second site is flagged: %v", as[2].Problems)
	}
	if len(as[4].Problems) == 0 || !strings.Contains(as[4].Problems[0].Error(), `"H-3" is already used in row 3`) {
		t.Errorf("H-3 twice at Castle Depot: %v", as[4].Problems)
	}
	notes := ""
	for _, p := range h.Problems {
		notes += p.Error() + "\n"
	}
	for _, w := range []string{
		`--sheet all: 3 sheets read ("Brindle Yard", "Castle Depot", "Dock"); skipped, no recognisable header: "Cover" (`,
		`"Totals" (`,
		`sheet "Brindle Yard" has no Site column: its name is each of its hoists' site`,
	} {
		if !strings.Contains(notes, w) {
			t.Errorf("notes lack %q:\n%s", w, notes)
		}
	}
}

// TestAllSheetsNoHeader: a workbook none of whose sheets has a header is refused, naming
// each sheet and why.
func TestAllSheetsNoHeader(t *testing.T) {
	f := excelize.NewFile()
	_ = f.SetCellValue("Sheet1", "A1", "notes only")
	path := filepath.Join(t.TempDir(), "notes.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	f.Close()
	_, err := NewXLSXAllSheets(path, Options{})
	if err == nil || !strings.Contains(err.Error(), `notes.xlsx: --sheet all: no sheet has a recognisable header: "Sheet1" (`) {
		t.Errorf("error %v", err)
	}
}

// TestAllSheetsHiddenAndEmpty: a sheet the workbook hides is read all the same and said
// so; a sheet with a header and no hoist is said to have none.
func TestAllSheetsHiddenAndEmpty(t *testing.T) {
	f := excelize.NewFile()
	_ = f.SetSheetName("Sheet1", "Yard")
	_ = f.SetSheetRow("Yard", "A1", &[]any{"Asset ID", "Rated load [t]"})
	_ = f.SetSheetRow("Yard", "A2", &[]any{"Y-1", 5})
	for _, sh := range []string{"Old yard", "Empty"} {
		if _, err := f.NewSheet(sh); err != nil {
			t.Fatal(err)
		}
		_ = f.SetSheetRow(sh, "A1", &[]any{"Asset ID", "Rated load [t]"})
	}
	_ = f.SetSheetRow("Old yard", "A2", &[]any{"O-9", 2})
	if err := f.SetSheetVisible("Old yard", false); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "hidden.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	f.Close()
	s, err := NewXLSXAllSheets(path, Options{})
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	n := 0
	for {
		if _, err := s.Next(context.Background()); errors.Is(err, io.EOF) {
			break
		} else if err != nil {
			t.Fatal(err)
		}
		n++
	}
	if n != 2 {
		t.Errorf("%d hoists, want 2 (the hidden sheet's too)", n)
	}
	var notes []string
	for _, p := range s.Notes() {
		notes = append(notes, p.Error())
	}
	all := strings.Join(notes, "\n")
	for _, want := range []string{`the workbook hides "Old yard": read all the same`, `sheet "Empty" has a header and no hoist under it`} {
		if !strings.Contains(all, want) {
			t.Errorf("notes lack %q:\n%s", want, all)
		}
	}
}
