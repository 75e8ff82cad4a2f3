package main

import (
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet"
)

// designCheckIDs are the check ids of design.md's "Exact definitions" table, the
// contract scripts rely on. Written out here, not taken from fleet.CheckIDs, so that a
// renamed or dropped id fails the test.
var designCheckIDs = []string{
	"rope-design-factor", "drum-ratio", "sheave-ratio", "drum-capacity", "fleet-angle",
	"motor-torque", "motor-power", "hoist-speed", "motor-accel-torque", "gearbox-torque",
	"brake-holding", "brake-stop", "runaway", "shaft-load", "design-life", "inspection-due",
	"load-test", "rope-wear",
	// design.md Revision 2, "contract additions".
	"component-rating",
}

// demoRun is the demo written and checked once, shared by the tests that only read it.
type demoRun struct {
	dir   string
	res   cmdResult
	si    []jsonHoist // check demo-si.csv --format jsonl, as of the demo date, iso rules
	us    []jsonHoist // check demo-us.csv --format jsonl, as of the demo date, us rules
	errSI cmdResult
}

var (
	demoOnce sync.Once
	demoData *demoRun
	demoDir  string
)

// TestMain removes the shared demo folder after the package's tests.
func TestMain(m *testing.M) {
	code := m.Run()
	if demoDir != "" {
		os.RemoveAll(demoDir)
	}
	os.Exit(code)
}

// sharedDemo runs `demo -o DIR -q` and `check … --format jsonl -o -` on both demo
// registers once per test binary.
func sharedDemo(t *testing.T) *demoRun {
	t.Helper()
	demoOnce.Do(func() {
		d := &demoRun{res: cmdResult{code: -1}}
		demoData = d // set first: a failure below must not leave later tests a nil run
		dir, err := os.MkdirTemp("", "hoistfleet-e2e-demo-")
		if err != nil {
			t.Fatal(err)
		}
		demoDir, d.dir = dir, dir
		d.res = runCmd(t, "", "demo", "-o", dir, "-q")
		if d.res.code == exitOK {
			si := runCmd(t, "", "check", filepath.Join(dir, "demo-si.csv"), "--format", "jsonl", "-o", "-",
				"--as-of", "2026-12-01", "--rules", "iso")
			d.errSI = si
			if si.code == exitFindings {
				d.si = parseJSONL(t, si.out)
			}
			us := runCmd(t, "", "check", filepath.Join(dir, "demo-us.csv"), "--format", "jsonl", "-o", "-",
				"--as-of", "2026-12-01", "--rules", "us")
			if us.code == exitFindings {
				d.us = parseJSONL(t, us.out)
			}
		}
	})
	d := demoData
	d.res.mustExit(t, exitOK, "demo -o DIR -q")
	if d.si == nil {
		t.Fatalf("check demo-si.csv --format jsonl: exit %d (want 1: the demo has failing hoists)\n%s", d.errSI.code, clip(d.errSI.err))
	}
	if d.us == nil {
		t.Fatal("check demo-us.csv --format jsonl did not exit 1 (the demo has failing hoists)")
	}
	return d
}

// TestDemoQuietPrintsNothing: -q means no summary on the terminal.
func TestDemoQuietPrintsNothing(t *testing.T) {
	d := sharedDemo(t)
	if strings.TrimSpace(d.res.out) != "" || strings.TrimSpace(d.res.err) != "" {
		t.Errorf("demo -q printed:\nstdout %q\nstderr %q", d.res.out, d.res.err)
	}
	for _, n := range []string{"demo-si.csv", "demo-us.csv", "demo-si-results.xlsx", "demo-us-results.xlsx"} {
		if _, err := os.Stat(filepath.Join(d.dir, n)); err != nil {
			t.Errorf("demo did not write %s: %v", n, err)
		}
	}
	for _, n := range listDir(t, d.dir) {
		if strings.HasSuffix(n, ".tmp") || strings.HasPrefix(n, ".") {
			t.Errorf("demo left a temporary file behind: %s", n)
		}
	}
}

var isoDate = regexp.MustCompile(`^\d{4}-\d{2}-\d{2}$`)

// TestDemoWorkbookRoundTrip (issue 2, "How we will know"): the demo results workbook,
// read back with excelize, has exactly the demo register's rows in order with every
// input value unchanged, the result columns, the Checks/Summary/Audit sheets, the
// caution and the input's SHA-256 on the Audit sheet, and charts on the Summary.
func TestDemoWorkbookRoundTrip(t *testing.T) {
	d := sharedDemo(t)
	for _, tc := range []struct {
		register string
		hoists   []jsonHoist
	}{
		{"demo-si.csv", d.si},
		{"demo-us.csv", d.us},
	} {
		t.Run(tc.register, func(t *testing.T) {
			input := demoFile(t, tc.register)
			header, records := csvRecords(t, input)
			book := filepath.Join(d.dir, strings.TrimSuffix(tc.register, ".csv")+"-results.xlsx")
			f := openXLSX(t, book)

			sheets := f.GetSheetList()
			for _, want := range []string{"Summary", "Register", "Checks", "Audit"} {
				if colIndex(sheets, want) < 0 {
					t.Errorf("workbook sheets %q: no %s sheet", sheets, want)
				}
			}

			rows := sheetRows(t, f, "Register", len(header))
			if len(rows) != len(records)+1 {
				t.Fatalf("Register sheet has %d rows, want header + %d register rows", len(rows), len(records))
			}
			got := rows[0]
			for i, h := range header {
				if got[i] != h {
					t.Errorf("Register header column %d = %q, want the register's %q", i+1, got[i], h)
				}
			}
			// The result columns design.md names, after the register's own columns.
			results := []string{"Status", "Governing check", "Min margin", "Worst check"}
			for _, id := range designCheckIDs {
				results = append(results, id+" status", id+" utilisation")
			}
			idx := map[string]int{}
			for _, name := range results {
				i := colIndex(got, name)
				if i < len(header) {
					t.Errorf("Register header has no result column %q after the register's %d columns", name, len(header))
				}
				idx[name] = i
			}
			maxLoad := -1
			for i, h := range got {
				if strings.HasPrefix(h, "Max rated load") && i >= len(header) {
					maxLoad = i
				}
			}
			if maxLoad < 0 {
				t.Errorf("Register header has no Max rated load column: %q", got[len(header):])
			}

			for r, rec := range records {
				row := rows[r+1]
				for c, want := range rec {
					if c >= len(header) {
						break
					}
					cell, _ := excelize.CoordinatesToCellName(c+1, r+2)
					if msg := sameInputValue(t, f, cell, row[c], want); msg != "" {
						t.Errorf("Register!%s (%s, %s): %s", cell, rec[0], header[c], msg)
					}
				}
			}

			// The Register's verdicts are the JSON lines' verdicts, row for row.
			if len(tc.hoists) != len(records) {
				t.Fatalf("jsonl has %d hoists, register %d rows", len(tc.hoists), len(records))
			}
			for r, h := range tc.hoists {
				row := rows[r+1]
				if row[0] != h.str("asset_id") {
					t.Errorf("Register row %d is %q, jsonl line %d is %q", r+2, row[0], r+1, h.str("asset_id"))
				}
				if i := idx["Status"]; i >= 0 && row[i] != h.str("status") {
					t.Errorf("%s: Register status %q, jsonl %q", row[0], row[i], h.str("status"))
				}
				for _, c := range h.checks() {
					id, _ := c["id"].(string)
					if i, ok := idx[id+" status"]; ok && i >= 0 && row[i] != c["status"] {
						t.Errorf("%s %s: Register status %q, jsonl %q", row[0], id, row[i], c["status"])
					}
				}
			}

			// Audit: the caution and the input's SHA-256, as design.md "The results" asks.
			audit := sheetRows(t, f, "Audit", 1)
			var all strings.Builder
			for _, r := range audit {
				all.WriteString(strings.Join(r, " "))
				all.WriteString("\n")
			}
			text := all.String()
			if !strings.Contains(normSpace(text), normSpace(fleet.Caution)) {
				t.Errorf("Audit sheet does not carry the caution %q", fleet.Caution)
			}
			sum := sha256File(t, filepath.Join(d.dir, tc.register))
			if !strings.Contains(text, sum) {
				t.Errorf("Audit sheet does not carry the input's SHA-256 %s", sum)
			}
			if !strings.Contains(text, "2026-12-01") {
				t.Error("Audit sheet does not carry the as-of date 2026-12-01")
			}
			for _, want := range []string{"ISO 4308-1"} {
				if tc.register == "demo-si.csv" && !strings.Contains(text, want) {
					t.Errorf("Audit sheet's rules in force do not cite %s", want)
				}
			}

			// Checks: one row per hoist and check (the rated load case at least).
			crows := sheetRows(t, f, "Checks", 6)
			nChecks := 0
			for _, h := range tc.hoists {
				nChecks += len(h.checks())
			}
			if len(crows)-1 < nChecks {
				t.Errorf("Checks sheet has %d rows, want at least %d (every hoist's checks)", len(crows)-1, nChecks)
			}

			checkSummaryCharts(t, f, book)
		})
	}
}

// sameInputValue compares a Register cell with the register's CSV field: text equal,
// numbers equal as numbers and stored as numbers, ISO dates equal as dates. It returns
// "" when they agree.
func sameInputValue(t *testing.T, f *excelize.File, cell, got, want string) string {
	t.Helper()
	w := strings.TrimSpace(want)
	switch {
	case w == "":
		if got != "" {
			return "empty in the register, " + strconv.Quote(got) + " in the workbook"
		}
		return ""
	case isoDate.MatchString(w):
		if got == w {
			return ""
		}
		serial, err := strconv.ParseFloat(got, 64)
		if err != nil {
			return "date " + w + " written as " + strconv.Quote(got)
		}
		tm, err := excelize.ExcelDateToTime(serial, false)
		if err != nil || tm.Format(time.DateOnly) != w {
			return "date " + w + " written as " + strconv.Quote(got)
		}
		return ""
	}
	if x, err := strconv.ParseFloat(w, 64); err == nil && !math.IsInf(x, 0) && !math.IsNaN(x) {
		y, err := strconv.ParseFloat(got, 64)
		if err != nil || y != x {
			return "number " + w + " written as " + strconv.Quote(got)
		}
		typ, err := f.GetCellType("Register", cell)
		if err == nil && (typ == excelize.CellTypeSharedString || typ == excelize.CellTypeInlineString) {
			return "number " + w + " written as a text cell"
		}
		return ""
	}
	if got != want {
		return "text " + strconv.Quote(want) + " written as " + strconv.Quote(got)
	}
	return ""
}

var groupingRe = regexp.MustCompile(`<(?:c:)?grouping val="(\w+)"`)

// checkSummaryCharts: issue 5 asks for native charts on the Summary (hoists by status
// per site as stacked bars, the smallest-margin distribution, hoists by governing check),
// each drawing real numbers from the workbook.
func checkSummaryCharts(t *testing.T, f *excelize.File, book string) {
	t.Helper()
	parts := zipFiles(t, book)
	charts := sheetCharts(t, parts, "Summary")
	if len(charts) < 3 {
		t.Fatalf("Summary sheet has %d charts, want at least 3 (by site, margins, governing check)", len(charts))
	}
	stacked := false
	for _, c := range charts {
		xml := string(parts[c])
		if xml == "" {
			t.Errorf("chart part %s is missing from the workbook", c)
			continue
		}
		for _, g := range groupingRe.FindAllStringSubmatch(xml, -1) {
			if g[1] == "stacked" || g[1] == "percentStacked" {
				stacked = true
			}
		}
		refs := chartFRe.FindAllStringSubmatch(xml, -1)
		if len(refs) == 0 {
			t.Errorf("chart %s has no series referring to cells", c)
			continue
		}
		total := 0.0
		for _, r := range refs {
			vals := rangeNumbers(t, f, r[1])
			if len(vals) == 0 {
				t.Errorf("chart %s series %s points at no numbers", c, r[1])
			}
			for _, v := range vals {
				total += v
			}
		}
		if total <= 0 {
			t.Errorf("chart %s draws nothing: its series add up to %g", c, total)
		}
	}
	if !stacked {
		t.Error("no stacked bar chart on the Summary (issue 5: hoists by status per site, stacked bars)")
	}
}
