package main

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestColumnsFileEndToEnd: 'check --columns FILE' reads a register whose headers no
// synonym covers (testdata/kranliste.csv, ground truth in testdata/README.md) and names
// the file in the Audit; without the file the register is refused (exit 3); a malformed
// columns file is a usage error naming its line (exit 2).
func TestColumnsFileEndToEnd(t *testing.T) {
	dir := t.TempDir()
	reg := copyTestdata(t, dir, "kranliste.csv")
	cols := filepath.Join(dir, "kranliste-columns.csv")
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "columns", "kranliste.csv"))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(cols, b, 0o644); err != nil {
		t.Fatal(err)
	}

	res := runCmd(t, "", "check", reg, "--columns", cols, "--format", "jsonl", "-o", "-", "--as-of", "2026-12-05", "-q")
	res.mustExit(t, exitFindings, "check --columns")
	hs := byAsset(parseJSONL(t, res.out))
	if len(hs) != 3 {
		t.Fatalf("%d hoists, want 3", len(hs))
	}
	// K-102: 3.2 t (unit from the columns file), last inspected 25/11/2025, 12-month
	// interval: due 2026-11-25, 10 days overdue on 2026-12-05.
	k := hs["K-102"]
	if fmt.Sprint(k["rated_load_kg"]) != "3200" || k.str("status") != "fail" || !strings.Contains(k.str("action"), "10 days overdue") {
		t.Errorf("K-102: rated load %v, status %s, action %q; want 3200 kg, fail, 10 days overdue", k["rated_load_kg"], k.str("status"), k.str("action"))
	}

	out := filepath.Join(dir, "k.xlsx")
	runCmd(t, "", "check", reg, "--columns", cols, "-o", out, "--as-of", "2026-12-05", "-q").mustExit(t, exitFindings, "check --columns -o xlsx")
	found := false
	for _, row := range sheetRows(t, openXLSX(t, out), "Audit", 2) {
		found = found || row[0] == "Columns file" && row[1] == cols
	}
	if !found {
		t.Error("the Audit does not name the columns file")
	}

	runCmd(t, "", "check", reg, "-o", filepath.Join(dir, "none.xlsx")).mustExit(t, exitIO, "check without the columns file")

	bad := filepath.Join(dir, "bad.csv")
	if err := os.WriteFile(bad, []byte("register column,column\nKran-Nr.,kran_id\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	res = runCmd(t, "", "check", reg, "--columns", bad, "-o", filepath.Join(dir, "bad.xlsx"))
	res.mustExit(t, exitUsage, "a malformed columns file")
	if !strings.Contains(res.err, `bad.csv line 2: "kran_id" is not one of hoistfleet's columns`) {
		t.Errorf("message %q", res.err)
	}
}
