package register

import (
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// TestXLSXFormulaCells: formula cells are read as their cached values, and the reader says
// so once, naming the cells (issue: "formulas in cells: use the cached value, say so").
func TestXLSXFormulaCells(t *testing.T) {
	rows := [][]any{
		{"Asset ID", "Rated load [t]", "Hook block mass [kg]"},
		{"H-1", 5, 100},
		{"H-2", 3.2, 80},
	}
	b := book(t, "Register", rows, func(f *excelize.File) {
		_ = f.SetCellFormula("Register", "B3", "=B2*0.64")
		_ = f.SetCellFormula("Register", "C2", "=50+50")
	})
	r := openXLSX(t, b, "")
	var msg string
	for _, p := range r.Header().Problems {
		if strings.Contains(p.Error(), "formulas") {
			msg = p.Error()
		}
	}
	if !strings.Contains(msg, "2 cells hold formulas") || !strings.Contains(msg, "B3") || !strings.Contains(msg, "C2") {
		t.Errorf("formula message %q: want the count and the cells B3, C2", msg)
	}
	as := readAll(t, r)
	if len(as) != 2 {
		t.Fatalf("%d assets, want 2", len(as))
	}
	// excelize's SetCellFormula stores the cached value it had (B3: 3.2, C2: 100).
	if v := as[1].Get("rated_load"); v.Num != 3200 {
		t.Errorf("B3 read as %v kg, want the cached 3200 kg", v.Num)
	}

	plain := openXLSX(t, book(t, "Register", rows, func(*excelize.File) {}), "")
	for _, p := range plain.Header().Problems {
		if strings.Contains(p.Error(), "formulas") {
			t.Errorf("a workbook without formulas reports %q", p.Error())
		}
	}
}
