package xlsxout

import (
	"bytes"
	"regexp"
	"strconv"
	"testing"

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet"
)

// TestChecksSheetContinues: when the long form would pass a sheet's row limit, it
// continues on "Checks 2", … with each hoist's rows kept together, every check row
// written once, and each Register link pointing at its hoist's first row on the right
// sheet. The limit is lowered to 40 rows here; the real one is excelize.TotalRows
// (1 048 576, the spreadsheet format's limit).
func TestChecksSheetContinues(t *testing.T) {
	rs := synthetic(10)
	var buf bytes.Buffer
	w := New(&buf, Options{})
	w.maxRows = 40
	if err := w.Begin(header("t", 1000), runInfo()); err != nil {
		t.Fatal(err)
	}
	s := fleet.NewSummary(10)
	want := 0
	for _, r := range rs {
		if err := w.Write(r); err != nil {
			t.Fatal(err)
		}
		s.Add(r)
		want += len(r.Checks)
	}
	if err := w.End(s, runInfo()); err != nil {
		t.Fatal(err)
	}
	f, err := excelize.OpenReader(bytes.NewReader(buf.Bytes()), excelize.Options{RawCellValue: true})
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sheets := f.GetSheetList()
	got := 0
	for _, name := range sheets {
		if name != SheetChecks && !regexp.MustCompile(`^Checks \d+$`).MatchString(name) {
			continue
		}
		rows, err := f.GetRows(name)
		if err != nil {
			t.Fatal(err)
		}
		if len(rows) > 40 {
			t.Errorf("%s has %d rows, limit 40", name, len(rows))
		}
		got += len(rows) - 1
	}
	if got != want {
		t.Errorf("%d check rows over the Checks sheets, want %d (sheets %v)", got, want, sheets)
	}
	if i, j := indexOf(sheets, "Checks 2"), indexOf(sheets, SheetAudit); i < 0 || i > j {
		t.Errorf("sheet order %v: continuation sheets belong before Audit", sheets)
	}
	// Every Register link points at a row of its own hoist.
	link := regexp.MustCompile(`HYPERLINK\("#'([^']+)'!A(\d+)"`)
	rows, _ := f.GetRows(SheetRegister)
	found := 0
	for r := 2; r <= len(rows); r++ {
		for c := 1; c <= len(rows[0]); c++ {
			cell, _ := excelize.CoordinatesToCellName(c, r)
			formula, _ := f.GetCellFormula(SheetRegister, cell)
			m := link.FindStringSubmatch(formula)
			if m == nil {
				continue
			}
			found++
			n, _ := strconv.Atoi(m[2])
			id, _ := f.GetCellValue(m[1], "B"+strconv.Itoa(n))
			if id != rows[r-1][0] {
				t.Errorf("Register row %d (%s) links to %s!A%d, which holds %q", r, rows[r-1][0], m[1], n, id)
			}
		}
	}
	if found != len(rs) {
		t.Errorf("%d links, want %d", found, len(rs))
	}
}

func indexOf(list []string, s string) int {
	for i, x := range list {
		if x == s {
			return i
		}
	}
	return -1
}
