package rulesfile

import (
	"bytes"
	"errors"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"hoistfleet/calc/approx"
	"hoistfleet/fleet/rules"
)

var header = []any{"rule", "groups", "when", "value", "unit", "source", "provenance", "note"}

// workbook builds an XLSX in memory: sheets in order, each a list of rows starting at
// row 1 (a nil row is left empty).
func workbook(t *testing.T, sheets []string, rows map[string][][]any) []byte {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	for i, s := range sheets {
		if i == 0 {
			if err := f.SetSheetName("Sheet1", s); err != nil {
				t.Fatal(err)
			}
		} else if _, err := f.NewSheet(s); err != nil {
			t.Fatal(err)
		}
		for r, row := range rows[s] {
			if row == nil {
				continue
			}
			cell, _ := excelize.CoordinatesToCellName(1, r+1)
			if err := f.SetSheetRow(s, cell, &row); err != nil {
				t.Fatal(err)
			}
		}
	}
	// Show numbers rounded, to prove the reader takes the stored value.
	style, err := f.NewStyle(&excelize.Style{NumFmt: 2}) // "0.00"
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range sheets {
		if err := f.SetColStyle(s, "D", style); err != nil {
			t.Fatal(err)
		}
	}
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

func TestReadXLSXNamedSheet(t *testing.T) {
	data := workbook(t, []string{"Notes", "Limits"}, map[string][][]any{
		"Notes": {{"These are our site's acceptance criteria."}},
		"Limits": {
			nil, // an empty first row: the header is the first non-empty row
			header,
			// ASME B30.2-2005 band (standards.md, seen): up to 5/16 in, 1/64 in = 0.015625 in.
			{"rope_wear.max_reduction", "all", "d_mm<=7.9375", 0.015625, "in", "ASME B30.2-2005 table", "seen", "1/64 in"},
			{"rope.design_factor", "M6", nil, 6.3, "1", "Site criteria rev 3", "seen", nil},
		},
	})
	rows, err := Read("rules.xlsx", bytes.NewReader(data), "limits")
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 2 {
		t.Fatalf("%d rules, want 2", len(rows))
	}
	r := rows[0]
	if r.Origin != "rules.xlsx, sheet Limits" || r.Line != 3 {
		t.Errorf("origin %q line %d", r.Origin, r.Line)
	}
	// 1/64 in = 0.000396875 m (in = 0.0254 m exactly, NIST SP 811).
	if v, err := r.ValueSI(); err != nil || !approx.Equal(v, 0.0254/64, 0, 1e-12) {
		t.Errorf("ValueSI = %v, %v; want %v", v, err, 0.0254/64)
	}
	iso, err := rules.Profile("iso")
	if err != nil {
		t.Fatal(err)
	}
	got, ok := iso.Override(rows).Lookup("rope.design_factor", rules.Scope{Group: 6})
	if !ok || got.Value != "6.3" || got.Origin != "rules.xlsx, sheet Limits" || got.Line != 4 {
		t.Errorf("override: %+v", got)
	}
}

func TestReadXLSXFirstSheetAndErrors(t *testing.T) {
	one := workbook(t, []string{"Rules"}, map[string][][]any{"Rules": {
		header,
		{"drum.h1", "M5", nil, 18, "1", "ISO 4308-1", "memory, medium", nil},
		{"drum.h1", "M9", nil, 18, "1", "ISO 4308-1", "memory, medium", nil},
		{"drum.h1", "M6", nil, "twenty", "1", "ISO 4308-1", "memory, medium", nil},
	}})
	_, err := Read("rules.xlsx", bytes.NewReader(one), "")
	var es rules.RuleErrors
	if !errors.As(err, &es) || len(es) != 2 {
		t.Fatalf("got %v, want two located errors", err)
	}
	if !strings.HasPrefix(es[0].Error(), "rules.xlsx!B3: groups: ") {
		t.Errorf("first error %q", es[0].Error())
	}
	if !strings.HasPrefix(es[1].Error(), `rules.xlsx!D4: value: "twenty" is not a number`) {
		t.Errorf("second error %q", es[1].Error())
	}

	two := workbook(t, []string{"Read me", "Limits"}, map[string][][]any{
		"Read me": {{"rule", "groups", "when", "value", "unit", "source", "note"}},
		"Limits":  {header},
	})
	_, err = Read("rules.xlsx", bytes.NewReader(two), "")
	if err == nil || !strings.HasPrefix(err.Error(), "rules.xlsx[Read me]!1:1: ") || !strings.Contains(err.Error(), `"provenance" is missing`) {
		t.Errorf("missing column: %v", err)
	}
	if _, err = Read("rules.xlsx", bytes.NewReader(two), "Other"); err == nil || !strings.Contains(err.Error(), "Read me, Limits") {
		t.Errorf("missing sheet: %v", err)
	}
}

func TestReadCSV(t *testing.T) {
	text := "rule,groups,when,value,unit,source,provenance,note\n" +
		"brake.factor,all,control=mechanical,1.1,1,Insurer criteria 2025,seen,\n" +
		"brake.factor,all,control=hydraulic,1.1,1,Insurer criteria 2025,seen,\n"
	_, err := Read("insurer.csv", strings.NewReader(text), "")
	if err == nil || !strings.HasPrefix(err.Error(), "insurer.csv:3: when: ") {
		t.Errorf("got %v", err)
	}
	rows, err := Read("insurer.csv", strings.NewReader(text[:strings.LastIndex(strings.TrimRight(text, "\n"), "\n")+1]), "")
	if err != nil || len(rows) != 1 || rows[0].Origin != "insurer.csv" {
		t.Errorf("got %v %v", rows, err)
	}
	if _, err := Read("insurer.csv", strings.NewReader(text), "Sheet1"); err == nil {
		t.Error("a sheet name with a CSV file: no error")
	}
	// A zip that is not a workbook is reported as such.
	if _, err := Read("broken.xlsx", bytes.NewReader([]byte("PK\x03\x04garbage")), ""); err == nil || !strings.Contains(err.Error(), "XLSX") {
		t.Errorf("broken zip: %v", err)
	}
}
