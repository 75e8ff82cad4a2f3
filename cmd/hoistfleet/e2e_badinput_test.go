package main

import (
	"context"
	"encoding/csv"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// badCellsWant is testdata/README.md's table for bad-cells.csv: for each spreadsheet
// row, the located problems a run must report. Each problem is the cell reference (the
// reader writes FILE!CELL) and words that say what was wrong or what was expected.
var badCellsWant = []struct {
	row  int
	id   string
	want [][]string // each: substrings that must all appear in one message of the row
}{
	{3, "B-02", [][]string{{"bad-cells.csv!E3", `"twelve"`, "not a number", "[t]"}}},
	{4, "B-01", [][]string{{"bad-cells.csv!A4", "B-01", "row 2"}}},
	{5, "", [][]string{{"bad-cells.csv!A5", "missing"}}},
	{7, "B-05", [][]string{{"bad-cells.csv!", "7", "5 cells", "27"}}},
	{8, "B-06", [][]string{{"bad-cells.csv!AB8", "stray"}}},
	{9, "B-07", [][]string{
		{"bad-cells.csv!G9", `"0"`, "Parts of line", "1"},
		{"bad-cells.csv!I9", `"1.2"`, "Sheave efficiency", "1"},
		{"bad-cells.csv!J9", `"500"`, "Rope diameter", "mm"}}},
	{10, "B-08", [][]string{
		{"bad-cells.csv!E10", `"-5"`, "Rated load", "0"},
		{"bad-cells.csv!S10", `"0"`, "Motor speed", "1"}}},
	{11, "B-09", [][]string{{"bad-cells.csv!G11", "3 parts", "2 rope ends"}}},
	{12, "B-10", [][]string{{"bad-cells.csv!H12", `"3"`, "Rope ends", "2"}}},
	{13, "B-11", [][]string{{"bad-cells.csv!Y13", `"31/02/2025"`, "not a date", "YYYY-MM-DD"}}},
	{14, "B-12", [][]string{{"bad-cells.csv!Y14", `"2025-13-01"`, "not a date"}}},
	{15, "B-13", [][]string{{"bad-cells.csv!C15", `"M9"`, "M8"}}},
	{16, "B-14", [][]string{
		{"bad-cells.csv!D16", `"extreme"`, "normal", "heavy", "severe"},
		{"bad-cells.csv!O16", `"maybe"`, "yes", "no"},
		{"bad-cells.csv!V16", `"gearbox"`, "motor", "drum"}}},
	{17, "B-15", [][]string{{"bad-cells.csv!X17", `"0.5"`, "Spectrum factor"}}},
	{18, "B-16", [][]string{
		{"bad-cells.csv!Q18", `"approx 95"`, "not a number"},
		{"bad-cells.csv!R18", `"11 kW (derated)"`, "comment", "Notes"}}},
	{19, "B-17", [][]string{
		{"bad-cells.csv!K19", `"NaN"`, "[kN]"},
		{"bad-cells.csv!U19", `"inf"`, "[N m]"}}},
	{20, "B-18", [][]string{{"Rated load"}, {"Gear ratio"}}},
	{23, "B-21", [][]string{
		{"bad-cells.csv!G23", `"2.5"`, "whole number"},
		{"bad-cells.csv!W23", `"1e9"`, "1000"}}},
	{24, "B-01", [][]string{{"bad-cells.csv!A24", "B-01", "row 2"}}},
}

// allMessages is every message of a hoist: its own and its checks'.
func allMessages(h jsonHoist) []string {
	var out []string
	if arr, ok := h["messages"].([]any); ok {
		for _, m := range arr {
			s, _ := m.(string)
			out = append(out, s)
		}
	}
	for _, c := range h.checks() {
		if m, ok := c["message"].(string); ok && m != "" {
			out = append(out, m)
		}
	}
	return out
}

func findMessage(msgs []string, parts []string) bool {
	for _, m := range msgs {
		ok := true
		for _, p := range parts {
			if !strings.Contains(m, p) {
				ok = false
				break
			}
		}
		if ok {
			return true
		}
	}
	return false
}

// TestBadCells runs testdata/bad-cells.csv through every output format: the run keeps
// going, every input row appears exactly once and in order, each problem is located,
// the exit status follows --fail-on, and the input is never modified.
func TestBadCells(t *testing.T) {
	dir := t.TempDir()
	reg := copyTestdata(t, dir, "bad-cells.csv")
	raw, err := os.ReadFile(reg)
	if err != nil {
		t.Fatal(err)
	}
	before := sha256File(t, reg)
	header, records := csvRecords(t, raw)
	if len(records) != 23 {
		t.Fatalf("encoding/csv reads %d data records from bad-cells.csv, testdata/README.md lists 23", len(records))
	}

	// Exit status by --fail-on: the file has error hoists, and error counts as fail.
	for _, c := range []struct {
		failOn string
		want   exitCode
	}{{"", exitFindings}, {"fail", exitFindings}, {"marginal", exitFindings}, {"never", exitOK}} {
		args := []string{"check", reg, "--format", "jsonl", "-o", "-", "--as-of", "2026-12-01", "-q"}
		if c.failOn != "" {
			args = append(args, "--fail-on", c.failOn)
		}
		runCmd(t, "", args...).mustExit(t, c.want, "check bad-cells.csv --fail-on "+c.failOn)
	}

	res := runCmd(t, "", "check", reg, "--format", "jsonl", "-o", "-", "--as-of", "2026-12-01", "-q")
	hs := parseJSONL(t, res.out)
	// Every record is a hoist but the empty row 6, which is left out (noted once).
	var rows []int
	var ids []string
	for i, rec := range records {
		if strings.Join(rec, "") != "" {
			rows, ids = append(rows, i+2), append(ids, strings.TrimSpace(rec[0]))
		}
	}
	if len(hs) != len(rows) || len(rows) != 22 {
		t.Fatalf("jsonl has %d hoists, the register %d rows that are not empty (want 22): every row must appear exactly once", len(hs), len(rows))
	}
	for i, h := range hs {
		if got, want := h.str("asset_id"), ids[i]; got != want {
			t.Errorf("jsonl line %d: asset %q, register row %d is %q", i+1, got, rows[i], want)
		}
		// A spreadsheet opening the CSV shows record i in row i+2 (a quoted field with
		// a line break stays in one cell); design.md: row is the spreadsheet row.
		if row, _ := num(h["row"]); row != float64(rows[i]) {
			t.Errorf("%q: row %v, the register shows it in spreadsheet row %d", h.str("asset_id"), h["row"], rows[i])
		}
		checkHoistObject(t, h)
	}

	byRow := map[int]jsonHoist{}
	for i, h := range hs {
		byRow[rows[i]] = h
	}
	for _, w := range badCellsWant {
		h := byRow[w.row]
		if h.str("asset_id") != w.id {
			t.Errorf("row %d: asset %q, want %q", w.row, h.str("asset_id"), w.id)
		}
		msgs := allMessages(h)
		for _, parts := range w.want {
			if !findMessage(msgs, parts) {
				t.Errorf("row %d (%s): no message with all of %q; messages:\n  %s", w.row, w.id, parts, strings.Join(distinct(msgs, 6), "\n  "))
			}
		}
	}

	// Header problems are located at the header cell and name the fix.
	for _, parts := range [][]string{
		{"bad-cells.csv!P1", "kgf m2", "GD2"},
		{"bad-cells.csv!Z1", "ton", "short ton", "long ton"},
	} {
		if !findMessage(allMessages(byRow[2]), parts) {
			t.Errorf("control row 2: no header message with all of %q", parts)
		}
	}
	// Row 2 is the control row: nothing wrong but the two header columns.
	for _, c := range byRow[2].checks() {
		st, _ := c["status"].(string)
		m, _ := c["message"].(string)
		if st == "error" && !strings.Contains(m, "!P1") && !strings.Contains(m, "!Z1") {
			t.Errorf("control row 2 %s: error not caused by the two bad headers: %s", c["id"], m)
		}
	}
	// Row 6 is blank: left out, noted once in the summary.
	if _, ok := byRow[6]; ok {
		t.Errorf("blank row 6 is in the results")
	}
	// (The workbook's Audit sheet lists the note, below.)
	// Missing required values make the affected checks unchecked, not error (row 20).
	for _, id := range []string{"rope-design-factor", "motor-torque"} {
		if c := byRow[20].check(id); c == nil || c["status"] != "unchecked" {
			t.Errorf("row 20 (rated load, gear ratio empty) %s: %v, want unchecked", id, c["status"])
		}
	}
	// A bad cell makes the checks that need it `error`, with the cell reference
	// (design.md "The register"): rated load "twelve" (E3), duty group "M9" (C15).
	for _, c := range []struct {
		row      int
		check    string
		ref      string
		cellText string
	}{
		{3, "rope-design-factor", "bad-cells.csv!E3", "twelve"},
		{3, "motor-torque", "bad-cells.csv!E3", "twelve"},
		{15, "rope-design-factor", "bad-cells.csv!C15", "M9"},
		{15, "drum-ratio", "bad-cells.csv!C15", "M9"},
		{16, "inspection-due", "bad-cells.csv!D16", "extreme"},
		{16, "brake-holding", "bad-cells.csv!V16", "gearbox"},
		{18, "motor-power", "bad-cells.csv!R18", "11 kW (derated)"},
	} {
		ch := byRow[c.row].check(c.check)
		if ch == nil {
			t.Errorf("row %d: no %s check", c.row, c.check)
			continue
		}
		m, _ := ch["message"].(string)
		if ch["status"] != "error" || !strings.Contains(m, c.ref) || !strings.Contains(m, c.cellText) {
			t.Errorf("row %d %s: %v %q; want error citing %s %q", c.row, c.check, ch["status"], m, c.ref, c.cellText)
		}
	}

	// The workbook: every input row exactly once, in order, values as given.
	book := filepath.Join(dir, "bad-results.xlsx")
	runCmd(t, "", "check", reg, "-o", book, "--as-of", "2026-12-01", "-q").mustExit(t, exitFindings, "check bad-cells.csv -o xlsx")
	f := openXLSX(t, book)
	// Each hoist is on its register row: the empty row 6, left out, stays empty.
	sheet := sheetRows(t, f, "Register", len(header))
	var kept [][]string // the records that are not empty (row 6 is left out)
	for _, rec := range records {
		if strings.Join(rec, "") != "" {
			kept = append(kept, rec)
		}
	}
	if len(sheet)-1 != len(records) {
		t.Errorf("Register sheet has %d data rows, the register %d records (every row on its own row)", len(sheet)-1, len(records))
	}
	badRecords := 0
	for i, rec := range records {
		if i+1 >= len(sheet) || badRecords >= 3 {
			break
		}
		var diffs []string
		for c, want := range rec {
			if c >= len(header) {
				break // cells past the header are reported, not a column
			}
			cell := cellName(c+1, i+2)
			if msg := sameInputValue(t, f, cell, sheet[i+1][c], want); msg != "" {
				diffs = append(diffs, cell+" ("+header[c]+"): "+msg)
			}
		}
		if len(diffs) > 0 {
			badRecords++
			if len(diffs) > 4 {
				diffs = append(diffs[:4], "…")
			}
			t.Errorf("Register row %d does not hold register record %d %q as given:\n  %s", i+2, i+1, rec[0], strings.Join(diffs, "\n  "))
		}
	}
	// The Audit sheet notes the empty row left out.
	if !sheetHas(t, f, "Audit", "bad-cells.csv!6:6: 1 row (6) is empty: skipped") {
		t.Errorf("the Audit sheet does not note the empty row 6")
	}
	// Formula injection: the register's "=HYPERLINK(…)" stays text.
	for r := 2; r <= len(rows); r++ {
		for c := 1; c <= len(header); c++ {
			cell := cellName(c, r)
			if fm, _ := f.GetCellFormula("Register", cell); fm != "" {
				t.Errorf("Register!%s became a formula %q", cell, fm)
			}
		}
	}

	// The long-form CSV: every register row present, none twice, formula text defused.
	csvOut := filepath.Join(dir, "bad-results.csv")
	runCmd(t, "", "check", reg, "-o", csvOut, "--as-of", "2026-12-01", "-q").mustExit(t, exitFindings, "check bad-cells.csv -o csv")
	b, err := os.ReadFile(csvOut)
	if err != nil {
		t.Fatal(err)
	}
	cr := csv.NewReader(strings.NewReader(string(b)))
	cr.FieldsPerRecord = -1
	out, err := cr.ReadAll()
	if err != nil {
		t.Fatalf("results CSV: %v", err)
	}
	var order []string
	last := ""
	for _, rec := range out[1:] {
		key := rec[0] + "\x00" + rec[1]
		if key != last {
			order = append(order, rec[1])
			last = key
		}
		for _, field := range rec {
			if field != "" && strings.ContainsRune("=+@", rune(field[0])) {
				t.Errorf("results CSV field %q would run as a formula in a spreadsheet", field)
			}
		}
	}
	if len(order) != len(kept) {
		t.Errorf("results CSV has %d hoists, the register %d", len(order), len(kept))
	}
	for i := range min(len(order), len(kept)) {
		if order[i] != strings.TrimSpace(kept[i][0]) {
			t.Errorf("results CSV hoist %d is %q, register record %d is %q", i+1, order[i], i+1, kept[i][0])
		}
	}

	if after := sha256File(t, reg); after != before {
		t.Errorf("bad-cells.csv was modified by the runs: SHA-256 %s → %s", before, after)
	}
}

func cellName(col, row int) string {
	name := ""
	for c := col; c > 0; c = (c - 1) / 26 {
		name = string(rune('A'+(c-1)%26)) + name
	}
	return name + strconv.Itoa(row)
}

// TestNeverOverwritesInput: -o naming the register itself, by any spelling, is a usage
// error (exit 2) and leaves it as it was.
func TestNeverOverwritesInput(t *testing.T) {
	dir := t.TempDir()
	reg := copyTestdata(t, dir, "small-si.csv")
	before := sha256File(t, reg)
	link := filepath.Join(dir, "link.csv")
	if err := os.Symlink(reg, link); err != nil {
		t.Fatal(err)
	}
	hard := filepath.Join(dir, "hard.csv")
	if err := os.Link(reg, hard); err != nil {
		t.Fatal(err)
	}
	for _, out := range []string{reg, filepath.Join(dir, ".", "sub", "..", "small-si.csv"), link, hard} {
		for _, format := range []string{"csv", "xlsx", "jsonl"} {
			r := runCmd(t, "", "check", reg, "-o", out, "--format", format, "--as-of", "2026-12-01", "-q")
			r.mustExit(t, exitUsage, "check REG -o "+out+" --format "+format)
			if !strings.Contains(r.err, "overwrite") && !strings.Contains(r.err, "register itself") {
				t.Errorf("-o %s: message %q does not say why", out, r.err)
			}
		}
	}
	if after := sha256File(t, reg); after != before {
		t.Errorf("the register was modified: %s → %s", before, after)
	}
	for _, n := range listDir(t, dir) {
		if n != "small-si.csv" && n != "link.csv" && n != "hard.csv" {
			t.Errorf("a refused run left %s behind", n)
		}
	}
}

// TestFailedRunLeavesNothing: a run that cannot read its input, or is cancelled, exits 3
// and leaves no output and no temporary file in the output folder.
func TestFailedRunLeavesNothing(t *testing.T) {
	in := t.TempDir()
	garbage := filepath.Join(in, "garbage.xlsx")
	if err := os.WriteFile(garbage, []byte("this is not a workbook\x00\x01\x02 at all"), 0o644); err != nil {
		t.Fatal(err)
	}
	truncated := filepath.Join(in, "truncated.xlsx")
	if err := os.WriteFile(truncated, []byte("PK\x03\x04\x14\x00\x00\x00 cut short"), 0o644); err != nil {
		t.Fatal(err)
	}
	good := copyTestdata(t, in, "small-si.csv")

	for _, c := range []struct {
		name, reg string
		cancel    bool
	}{
		{"garbage with an .xlsx name", garbage, false},
		{"truncated zip", truncated, false},
		{"missing file", filepath.Join(in, "no-such-register.xlsx"), false},
		{"a directory", in, false},
		{"cancelled run", good, true},
	} {
		for _, format := range []string{"xlsx", "csv", "jsonl"} {
			out := t.TempDir()
			ctx := context.Background()
			if c.cancel {
				cctx, cancel := context.WithCancel(ctx)
				cancel()
				ctx = cctx
			}
			r := runCmdCtx(t, ctx, "", "check", c.reg, "-o", filepath.Join(out, "results."+format), "--as-of", "2026-12-01", "-q")
			r.mustExit(t, exitIO, c.name+" --format "+format)
			if strings.TrimSpace(r.err) == "" {
				t.Errorf("%s: exit 3 without a message", c.name)
			}
			if left := listDir(t, out); len(left) != 0 {
				t.Errorf("%s (%s): the output folder holds %q after the failed run", c.name, format, left)
			}
		}
	}
	if left := listDir(t, in); len(left) != 3 {
		t.Errorf("the input folder holds %q, want only the three inputs", left)
	}
}

// TestOutputFileMode: the results file gets the permissions any new file gets in that
// folder (the umask), not the 0600 of a private temporary file, so that colleagues
// sharing the folder can open the results.
func TestOutputFileMode(t *testing.T) {
	dir := t.TempDir()
	reg := copyTestdata(t, dir, "small-si.csv")
	probe := filepath.Join(dir, "probe")
	pf, err := os.Create(probe)
	if err != nil {
		t.Fatal(err)
	}
	pf.Close()
	pi, _ := os.Stat(probe)
	for _, format := range []string{"xlsx", "csv", "jsonl"} {
		out := filepath.Join(dir, "results."+format)
		runCmd(t, "", "check", reg, "-o", out, "--as-of", "2026-12-01", "-q").mustExit(t, exitOK, "check small-si.csv")
		oi, err := os.Stat(out)
		if err != nil {
			t.Fatal(err)
		}
		if oi.Mode().Perm() != pi.Mode().Perm() {
			t.Errorf("%s has mode %v, a new file in the folder gets %v", filepath.Base(out), oi.Mode().Perm(), pi.Mode().Perm())
		}
	}
}

// TestExitCodes: 0 nothing at or above --fail-on, 1 some hoist at or above it, 2 usage
// error, 3 input unreadable or output unwritable (design.md).
func TestExitCodes(t *testing.T) {
	dir := t.TempDir()
	small := copyTestdata(t, dir, "small-si.csv")
	demo := writeDemo(t, dir, "demo-si.csv")
	garbage := filepath.Join(dir, "garbage.xlsx")
	if err := os.WriteFile(garbage, []byte("not a workbook, not a register\n\x00\xff"), 0o644); err != nil {
		t.Fatal(err)
	}
	smallBytes, _ := os.ReadFile(small)
	o := func(n string) string { return filepath.Join(dir, n) }
	for _, c := range []struct {
		name  string
		stdin string
		args  []string
		want  exitCode
	}{
		{"all pass", "", []string{"check", small, "-o", o("a.jsonl"), "--as-of", "2026-12-01", "-q"}, exitOK},
		{"stdin CSV to stdout", string(smallBytes), []string{"check", "-", "--format", "jsonl", "-o", "-", "--as-of", "2026-12-01"}, exitOK},
		{"fails found", "", []string{"check", demo, "-o", o("b.jsonl"), "--as-of", "2026-12-01", "-q"}, exitFindings},
		{"fails found, --fail-on never", "", []string{"check", demo, "-o", o("c.jsonl"), "--as-of", "2026-12-01", "-q", "--fail-on", "never"}, exitOK},
		{"unknown flag", "", []string{"check", small, "--bogus"}, exitUsage},
		{"bad --as-of month", "", []string{"check", small, "--as-of", "2026-13-45", "-o", o("d.jsonl")}, exitUsage},
		{"bad --as-of format", "", []string{"check", small, "--as-of", "01/12/2026", "-o", o("e.jsonl")}, exitUsage},
		{"bad --format", "", []string{"check", small, "--format", "pdf"}, exitUsage},
		{"bad --fail-on", "", []string{"check", small, "--fail-on", "sometimes", "-o", o("f.jsonl")}, exitUsage},
		{"bad --marginal", "", []string{"check", small, "--marginal", "1.5", "-o", o("g.jsonl")}, exitUsage},
		{"bad --rules", "", []string{"check", small, "--rules", o("no-such-rules.csv"), "-o", o("h.jsonl")}, exitUsage},
		{"no register", "", []string{"check"}, exitUsage},
		{"two registers", "", []string{"check", small, demo}, exitUsage},
		{"unknown command", "", []string{"inspect", small}, exitUsage},
		{"no command", "", nil, exitUsage},
		{"explain without --asset", "", []string{"explain", demo}, exitUsage},
		{"explain unknown asset", "", []string{"explain", demo, "--asset", "NOPE-1"}, exitUsage},
		{"missing file", "", []string{"check", o("missing.csv"), "-o", o("i.jsonl")}, exitIO},
		{"garbage .xlsx", "", []string{"check", garbage, "-o", o("j.jsonl")}, exitIO},
		{"output folder missing", "", []string{"check", small, "-o", o("no/such/dir/k.jsonl")}, exitIO},
		{"help", "", []string{"help"}, exitOK},
		{"check --help", "", []string{"check", "--help"}, exitOK},
	} {
		t.Run(c.name, func(t *testing.T) {
			r := runCmd(t, c.stdin, c.args...)
			r.mustExit(t, c.want, strings.Join(c.args, " "))
			if (c.want == exitUsage || c.want == exitIO) && strings.TrimSpace(r.err) == "" {
				t.Errorf("exit %d with nothing on stderr", c.want)
			}
			if c.want == exitUsage && strings.TrimSpace(r.out) != "" {
				t.Errorf("usage error printed on stdout: %q", r.out)
			}
		})
	}
	if f, err := os.ReadFile(o("a.jsonl")); err != nil || strings.Count(string(f), "\n") != 5 {
		t.Errorf("small-si.csv: want 5 hoists in the jsonl, got %q (%v)", f, err)
	}
}

// distinct returns the first n different strings of ss.
func distinct(ss []string, n int) []string {
	seen := map[string]bool{}
	var out []string
	for _, s := range ss {
		if !seen[s] && len(out) < n {
			seen[s] = true
			out = append(out, s)
		}
	}
	return out
}

// TestStdoutIsOnlyResults: with -o -, standard output carries the results alone (the
// terminal summary goes to standard error), whatever the format.
func TestStdoutIsOnlyResults(t *testing.T) {
	dir := t.TempDir()
	reg := copyTestdata(t, dir, "small-si.csv")
	for _, format := range []string{"jsonl", "csv", "xlsx"} {
		r := runCmd(t, "", "check", reg, "--format", format, "-o", "-", "--as-of", "2026-12-01")
		r.mustExit(t, exitOK, "check --format "+format+" -o -")
		switch format {
		case "jsonl":
			if hs := parseJSONL(t, r.out); len(hs) != 5 {
				t.Errorf("jsonl on stdout: %d hoists, want 5", len(hs))
			}
		case "csv":
			cr := csv.NewReader(strings.NewReader(r.out))
			cr.FieldsPerRecord = -1
			recs, err := cr.ReadAll()
			if err != nil || len(recs) < 6 || recs[0][0] != "row" {
				t.Errorf("csv on stdout is not the long-form results (%v): %q", err, clip(r.out))
			}
		case "xlsx":
			p := filepath.Join(dir, "stdout.xlsx")
			if err := os.WriteFile(p, []byte(r.out), 0o644); err != nil {
				t.Fatal(err)
			}
			f := openXLSX(t, p)
			if rows := sheetRows(t, f, "Register", 1); len(rows) != 6 {
				t.Errorf("xlsx on stdout: Register has %d rows, want header + 5", len(rows))
			}
		}
		if !strings.Contains(r.err, "5 hoists") {
			t.Errorf("--format %s -o -: the summary should go to stderr, got %q", format, clip(r.err))
		}
	}
}

// sheetHas reports whether a cell of the sheet holds text.
func sheetHas(t *testing.T, f *excelize.File, sheet, text string) bool {
	t.Helper()
	rows, err := f.GetRows(sheet)
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range rows {
		for _, c := range r {
			if strings.Contains(c, text) {
				return true
			}
		}
	}
	return false
}
