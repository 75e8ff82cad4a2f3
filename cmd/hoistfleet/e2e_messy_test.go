package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestMessyRegisters: the registers of testdata/ kept the way people keep them
// (testdata/README.md has their ground truth) run end to end.
func TestMessyRegisters(t *testing.T) {
	dir := t.TempDir()

	// A file that is not a register is refused, exit 3, saying what was looked for.
	bad := copyTestdata(t, dir, "not-a-register.csv")
	res := runCmd(t, "", "check", bad, "-o", filepath.Join(dir, "bad.jsonl"))
	res.mustExit(t, exitIO, "check not-a-register.csv")
	if !strings.Contains(res.err, "not-a-register.csv: no header row found in rows 1 to 3: looked for a row of column titles naming the asset id") {
		t.Errorf("refusal: %s", res.err)
	}
	if _, err := os.Stat(filepath.Join(dir, "bad.jsonl")); err == nil {
		t.Errorf("a refused register left a results file")
	}

	// A header with nothing under it: no hoist read, never exit 0, no results.
	empty := filepath.Join(dir, "empty.csv")
	if err := os.WriteFile(empty, []byte("Asset ID,Rated load [t]\n,\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	res = runCmd(t, "", "check", empty, "-o", filepath.Join(dir, "empty.jsonl"), "--fail-on", "never")
	res.mustExit(t, exitIO, "check empty.csv")
	if !strings.Contains(res.err, "no hoist was read") {
		t.Errorf("no-hoist run: %s", res.err)
	}
	if _, err := os.Stat(filepath.Join(dir, "empty.jsonl")); err == nil {
		t.Errorf("a run without hoists left a results file")
	}

	// The title-block CSV: four hoists, found under the header in row 4.
	csv := copyTestdata(t, dir, "messy-title-block.csv")
	res = runCmd(t, "", "check", csv, "--format", "jsonl", "-o", "-", "--as-of", "2026-12-01", "-q")
	hs := parseJSONL(t, res.out)
	var ids []string
	for _, h := range hs {
		ids = append(ids, h.str("asset_id"))
	}
	if strings.Join(ids, " ") != "H-101 H-102 H-103 H-104" {
		t.Errorf("hoists %q, want H-101 to H-104 (title, units, blank, repeated header and totals rows left out)", ids)
	}
	// --header-row gives the same reading.
	res2 := runCmd(t, "", "check", csv, "--format", "jsonl", "-o", "-", "--as-of", "2026-12-01", "-q", "--header-row", "4")
	if res2.out != res.out {
		t.Errorf("--header-row 4 reads differently from the header found")
	}
	runCmd(t, "", "check", csv, "--header-row", "-1").mustExit(t, exitUsage, "--header-row -1")
	runCmd(t, "", "check", csv, "--date-order", "dym").mustExit(t, exitUsage, "--date-order dym")
	runCmd(t, "", "explain", csv, "--all", "-o", filepath.Join(dir, "rec"), "--date-order", "dmy", "--as-of", "2026-12-01").mustExit(t, exitOK, "explain --date-order dmy")

	// The workbook: the hidden, scrapped BQ-99 is checked and marked hidden.
	book := copyTestdata(t, dir, "messy-hidden.xlsx")
	res = runCmd(t, "", "check", book, "--format", "jsonl", "-o", "-", "--as-of", "2026-12-01", "-q")
	hs = parseJSONL(t, res.out)
	if len(hs) != 4 {
		t.Fatalf("%d hoists, want 4", len(hs))
	}
	for _, h := range hs {
		want := h.str("asset_id") == "BQ-99"
		if got, ok := h["hidden"].(bool); !ok || got != want {
			t.Errorf("%s: hidden %v, want %v", h.str("asset_id"), h["hidden"], want)
		}
	}
	res = runCmd(t, "", "check", book, "-o", filepath.Join(dir, "out.xlsx"), "--as-of", "2026-12-01")
	if !strings.Contains(res.out, "Hidden rows  1") {
		t.Errorf("the summary does not count the hidden row:\n%s", res.out)
	}

	// A column without a unit anywhere: the checks that need it are unchecked, citing
	// the header, never read in an assumed unit.
	units := copyTestdata(t, dir, "messy-units.csv")
	res = runCmd(t, "", "check", units, "--format", "jsonl", "-o", "-", "--as-of", "2026-12-01", "-q")
	ub := byAsset(parseJSONL(t, res.out))
	for _, id := range []string{"rope-design-factor", "motor-power", "brake-holding"} {
		c := ub["S-02"].check(id)
		m, _ := c["message"].(string)
		if c["status"] != "unchecked" || !strings.Contains(m, "the Rated load column gives no unit (header messy-units.csv!G1)") {
			t.Errorf("S-02 %s: %v %q, want unchecked citing the header without a unit", id, c["status"], m)
		}
	}
	// S-01's rated load "5 t" is small-si.csv's 5 [t]: the same result.
	si := copyTestdata(t, dir, "small-si.csv")
	want := byAsset(parseJSONL(t, runCmd(t, "", "check", si, "--format", "jsonl", "-o", "-", "--as-of", "2026-12-01", "-q").out))["S-01"]
	if got := ub["S-01"]; got.str("status") != want.str("status") || got["max_rated_load_kg"] != want["max_rated_load_kg"] {
		t.Errorf("S-01 (rated load \"5 t\" in the cell): %s %v, small-si.csv's S-01 %s %v", got.str("status"), got["max_rated_load_kg"], want.str("status"), want["max_rated_load_kg"])
	}
}

// TestColumnsCommand: 'hoistfleet columns REGISTER' reports how the columns were read, as
// text and as JSON.
func TestColumnsCommand(t *testing.T) {
	dir := t.TempDir()
	book := copyTestdata(t, dir, "messy-hidden.xlsx")
	res := runCmd(t, "", "columns", book, "--format", "json")
	res.mustExit(t, exitOK, "columns --format json")
	var rep struct {
		HeaderRow int `json:"header_row"`
		Columns   []struct {
			Column, Title, Status, Key, Unit, Reason string
			UnitFrom                                 string `json:"unit_from"`
		} `json:"columns"`
		Missing []struct {
			Key     string   `json:"key"`
			Unlocks []string `json:"unlocks"`
		} `json:"missing"`
		Notes []string `json:"notes"`
	}
	if err := json.Unmarshal([]byte(res.out), &rep); err != nil {
		t.Fatalf("not JSON: %v\n%s", err, res.out)
	}
	if rep.HeaderRow != 4 || len(rep.Columns) != 6 {
		t.Fatalf("header row %d, %d columns", rep.HeaderRow, len(rep.Columns))
	}
	if b := rep.Columns[1]; b.Status != "refused" || !strings.Contains(b.Reason, "hidden Rated load column") {
		t.Errorf("hidden stale SWL (t): %+v", b)
	}
	if c := rep.Columns[2]; c.Status != "read" || c.Key != "rated_load" || c.Unit != "kg" || c.UnitFrom != "header" {
		t.Errorf("visible SWL [kg]: %+v", c)
	}
	if len(rep.Missing) == 0 || !strings.Contains(strings.Join(rep.Notes, "\n"), "totals rows") {
		t.Errorf("missing %d, notes %q", len(rep.Missing), rep.Notes)
	}
	text := runCmd(t, "", "columns", book)
	text.mustExit(t, exitOK, "columns")
	if !strings.Contains(text.out, "Missing columns the checks need") || !strings.Contains(text.out, "REFUSED") {
		t.Errorf("text report:\n%s", text.out)
	}
	runCmd(t, "", "columns").mustExit(t, exitUsage, "columns without a register")
	runCmd(t, "", "columns", book, "--format", "xml").mustExit(t, exitUsage, "columns --format xml")
	runCmd(t, "", "columns", copyTestdata(t, dir, "not-a-register.csv")).mustExit(t, exitIO, "columns not-a-register.csv")
}
