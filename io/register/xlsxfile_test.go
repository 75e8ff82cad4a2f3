package register

import (
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// TestXLSXFileSameAsReader: reading a workbook from its path gives exactly what reading it
// from a stream gives (header, every asset, every value), and what is not a workbook gets
// the same located diagnosis.
func TestXLSXFileSameAsReader(t *testing.T) {
	rows := [][]any{
		{"Asset ID", "Rated load [t]", "Rope diameter [in]", "Commissioned", "Notes"},
		{"007", 12.5, 0.75, 45292, "keep me"},
		{},
		{"H-4", "twelve", 0.5, "31/12/2023", nil},
	}
	b := book(t, "Register", rows, func(*excelize.File) {})
	dir := t.TempDir()
	path := filepath.Join(dir, "reg.xlsx")
	if err := os.WriteFile(path, b, 0o644); err != nil {
		t.Fatal(err)
	}
	fromFile, err := NewXLSXFile(path, "")
	if err != nil {
		t.Fatal(err)
	}
	defer fromFile.Close()
	fromStream := openXLSX(t, b, "")
	if !reflect.DeepEqual(fromFile.Header(), fromStream.Header()) {
		t.Errorf("header from file %+v, from stream %+v", fromFile.Header(), fromStream.Header())
	}
	a, s := readAll(t, fromFile), readAll(t, fromStream)
	if !reflect.DeepEqual(a, s) {
		t.Errorf("assets from file differ from assets from stream:\n%+v\n%+v", a, s)
	}
	if len(a) != 2 {
		t.Errorf("%d assets, want 2 (the empty row left out)", len(a))
	}

	text := filepath.Join(dir, "notes.xlsx")
	if err := os.WriteFile(text, []byte("Asset ID,Rated load [t]\nH-1,5\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	_, err = NewXLSXFile(text, "")
	if err == nil || !strings.Contains(err.Error(), "notes.xlsx") || !strings.Contains(err.Error(), "not an XLSX workbook") {
		t.Errorf("a CSV named .xlsx: error %v, want the file named and 'not an XLSX workbook'", err)
	}
}
