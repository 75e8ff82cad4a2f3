package main

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"hoistfleet/calc/approx"
	"hoistfleet/fleet"
)

// templateToDemo maps the template's canonical headers to the demo register's synonyms
// where they differ (templates/demo/README.md lists the synonyms the demo uses).
var templateToDemo = map[string]string{
	"Parts of line":         "Falls",
	"Motor inertia [kg m2]": "Rotor inertia [kg m2]",
	"Operating hours [h]":   "Hour meter [h]",
}

// TestTemplateFilledByHandChecksCleanly (issue 5): write the blank register, replace its
// example row by typing in a demo hoist (BQ-H01, intended verdict pass, stop 0.081 m in
// templates/demo/README.md) — numbers as numbers, dates as date cells — and check it.
func TestTemplateFilledByHandChecksCleanly(t *testing.T) {
	dir := t.TempDir()
	tpl := filepath.Join(dir, "register.xlsx")
	r := runCmd(t, "", "template", "-o", tpl)
	r.mustExit(t, exitOK, "template -o register.xlsx")
	before := sha256File(t, tpl)
	runCmd(t, "", "template", "-o", tpl).mustExit(t, exitUsage, "template over an existing file")
	if sha256File(t, tpl) != before {
		t.Fatal("template overwrote an existing file")
	}

	f := openXLSX(t, tpl)
	sheet := f.GetSheetList()[0]
	if sheet != "Register" {
		t.Errorf("the template's first sheet is %q, want Register (the reader takes the first sheet)", sheet)
	}
	if dvs, err := f.GetDataValidations(sheet); err != nil || len(dvs) == 0 {
		t.Errorf("the template has no data validation (%v)", err)
	}
	rows := sheetRows(t, f, sheet, 1)
	header := rows[0]

	demoHeader, demoRows := csvRecords(t, demoFile(t, "demo-si.csv"))
	var bq []string
	for _, rec := range demoRows {
		if rec[0] == "BQ-H01" {
			bq = rec
		}
	}
	if bq == nil {
		t.Fatal("BQ-H01 is not in demo-si.csv")
	}
	used := map[string]bool{}
	for c, h := range header {
		cell := cellName(c+1, 2)
		if err := f.SetCellValue(sheet, cell, nil); err != nil {
			t.Fatal(err)
		}
		src := h
		if s, ok := templateToDemo[h]; ok {
			src = s
		}
		i := colIndex(demoHeader, src)
		if i < 0 || strings.TrimSpace(bq[i]) == "" {
			continue
		}
		used[demoHeader[i]] = true
		v := strings.TrimSpace(bq[i])
		var val any = v
		if x, err := strconv.ParseFloat(v, 64); err == nil {
			val = x
		} else if d, err := time.Parse(time.DateOnly, v); err == nil {
			val = d
		}
		if err := f.SetCellValue(sheet, cell, val); err != nil {
			t.Fatal(err)
		}
	}
	for i, h := range demoHeader {
		if strings.TrimSpace(bq[i]) != "" && !used[h] && h != "Maintenance contractor" && h != "Notes" {
			t.Errorf("the template has no column for the demo's %q", h)
		}
	}
	filled := filepath.Join(dir, "filled.xlsx")
	if err := f.SaveAs(filled); err != nil {
		t.Fatal(err)
	}
	sum := sha256File(t, filled)

	res := runCmd(t, "", "check", filled, "--format", "jsonl", "-o", "-", "--as-of", "2026-12-01")
	res.mustExit(t, exitOK, "check the filled template")
	hs := parseJSONL(t, res.out)
	if len(hs) != 1 {
		t.Fatalf("the filled template gives %d hoists, want 1 (the 5000 validated but empty rows are not hoists)", len(hs))
	}
	h := hs[0]
	checkHoistObject(t, h)
	if h.str("asset_id") != "BQ-H01" || h.str("status") != "pass" {
		t.Errorf("filled template: %s %s, want BQ-H01 pass", h.str("asset_id"), h.str("status"))
	}
	if msgs := allMessagesOnly(h); len(msgs) != 0 {
		t.Errorf("filled template: messages %q, want none", msgs)
	}
	for _, c := range h.checks() {
		if st := c["status"]; st == "error" || st == "unchecked" {
			t.Errorf("filled template %s: %s %v", c["id"], st, c["message"])
		}
	}
	// README: BQ-H01 stops in 0.081 m; the component WLL of 5 t caps the rating.
	if d, _ := num(figures(h.check("brake-stop"))["distance_m"]); !approx.Equal(d, 0.081, 0.00051, 0) {
		t.Errorf("filled template: stop distance %v m, README 0.081 m", d)
	}
	if mr, _ := num(h["max_rated_load_kg"]); mr != 5000 {
		t.Errorf("filled template: max rated load %v kg, want the 5 t component WLL", h["max_rated_load_kg"])
	}
	if sha256File(t, filled) != sum {
		t.Error("checking the filled template modified it")
	}

	// The template as written: its example row must check cleanly too.
	res = runCmd(t, "", "check", tpl, "--format", "jsonl", "-o", "-", "--as-of", "2026-12-01")
	res.mustExit(t, exitOK, "check the template's example row")
	ex := parseJSONL(t, res.out)
	if len(ex) != 1 || ex[0].str("status") != "pass" {
		t.Fatalf("template example: %d hoists, status %q; want one, pass", len(ex), ex[0].str("status"))
	}
	for _, c := range ex[0].checks() {
		if st := c["status"]; st != "pass" && st != "info" {
			t.Errorf("template example %s: %s %v", c["id"], st, c["message"])
		}
	}
}

// allMessagesOnly is a hoist's own messages (not its checks' notes).
func allMessagesOnly(h jsonHoist) []string {
	var out []string
	arr, _ := h["messages"].([]any)
	for _, m := range arr {
		s, _ := m.(string)
		out = append(out, s)
	}
	return out
}

// TestTemplateUSUnits: `template --units us -o x.csv` writes US customary headers, and
// its example hoist gives the SI template's results (the example converted with the
// exact NIST SP 811 factors, rounded to 5 significant digits).
func TestTemplateUSUnits(t *testing.T) {
	dir := t.TempDir()
	us := filepath.Join(dir, "x.csv")
	si := filepath.Join(dir, "y.csv")
	runCmd(t, "", "template", "--units", "us", "-o", us).mustExit(t, exitOK, "template --units us -o x.csv")
	runCmd(t, "", "template", "-o", si).mustExit(t, exitOK, "template -o y.csv")
	b, err := os.ReadFile(us)
	if err != nil {
		t.Fatal(err)
	}
	header, recs := csvRecords(t, b)
	for _, want := range []string{"Rated load [lb]", "Rope diameter [in]", "Rope MBF [lbf]", "Hoist speed [ft/min]",
		"Motor power [hp]", "Brake torque [lbf ft]", "Lift height [ft]"} {
		if colIndex(header, want) < 0 {
			t.Errorf("US template has no %q header: %q", want, header)
		}
	}
	if len(recs) != 1 {
		t.Fatalf("US template has %d data rows, want the one example", len(recs))
	}
	// 5 t = 5000 / 0.45359237 lb = 11023.1 lb (NIST SP 811, lb = 0.45359237 kg exactly).
	if v, _ := strconv.ParseFloat(recs[0][colIndex(header, "Rated load [lb]")], 64); !approx.Equal(v, 5000/0.45359237, 0, 1e-4) {
		t.Errorf("US template rated load %v lb, want 11023 lb", v)
	}
	var got [2]jsonHoist
	for i, p := range []string{us, si} {
		res := runCmd(t, "", "check", p, "--format", "jsonl", "-o", "-", "--as-of", "2026-12-01", "--rules", "iso")
		res.mustExit(t, exitOK, "check "+filepath.Base(p))
		hs := parseJSONL(t, res.out)
		if len(hs) != 1 {
			t.Fatalf("%s: %d hoists", p, len(hs))
		}
		got[i] = hs[0]
	}
	if got[0].str("status") != "pass" {
		t.Errorf("US template example: %s, want pass", got[0].str("status"))
	}
	// Utilisations agree to 1e-3: the US example is rounded to 5 significant digits, and
	// differences such as the rope's 10.3 − 10.1 mm reduction amplify that rounding.
	for _, c := range got[1].checks() {
		id, _ := c["id"].(string)
		u1, ok1 := num(c["utilisation"])
		u0, ok0 := num(got[0].check(id)["utilisation"])
		if ok1 != ok0 || (ok1 && !approx.Equal(u0, u1, 1e-3, 5e-4)) {
			t.Errorf("%s: utilisation %v in US units, %v in SI", id, got[0].check(id)["utilisation"], c["utilisation"])
		}
	}
	// US customary registers are also checked against the US profile.
	res := runCmd(t, "", "check", us, "--format", "jsonl", "-o", "-", "--as-of", "2026-12-01", "--rules", "us")
	res.mustExit(t, exitOK, "check x.csv --rules us")
	if h := parseJSONL(t, res.out)[0]; h.str("status") != "pass" {
		t.Errorf("US template example under US rules: %s", h.str("status"))
	}
}

// TestExplain: the calculation record of CS-H04 (rope too small) carries the caution,
// the rule and its published source, the numbers substituted into the formulas, and the
// rating; --format md is Markdown; --all writes one record per hoist.
func TestExplain(t *testing.T) {
	dir := t.TempDir()
	reg := writeDemo(t, dir, "demo-si.csv")
	before := sha256File(t, reg)

	// By hand, from demo-si.csv's CS-H04 row: m = 10000 + 210 kg; W = m g (g = 9.80665,
	// NIST SP 811); η_R = (1 − 0.98²)/(2 · 0.02) = 0.99; F = W / (2 · 0.99);
	// Z = MBF / F = 226100 / F; ISO 4308-1 Zp(M6) = 5.6 (standards.md, seen);
	// rating = MBF / 5.6 · 1.98 / g − 210, floored to 0.1 kg.
	const g = 9.80665
	W := 10210 * g
	F := W / 1.98
	Z := 226100 / F
	rating := math.Floor((226100/5.6*1.98/g-210)*10) / 10
	wants := []string{
		"CS-H04",
		"ISO 4308-1", // the rule's published source
		"5.6",        // Zp for M6
		"10210",      // m
		fmt.Sprintf("%.0f", W),
		fmt.Sprintf("%.0f", F),
		fmt.Sprintf("%.4g", Z),
		"226100",
		fmt.Sprintf("%.1f kg", rating),
		"rope-design-factor",
		"fail",
	}

	for _, format := range []string{"text", "md"} {
		r := runCmd(t, "", "explain", reg, "--asset", "CS-H04", "--as-of", "2026-12-01", "--format", format)
		r.mustExit(t, exitOK, "explain --asset CS-H04 --format "+format)
		if strings.TrimSpace(r.err) != "" {
			t.Errorf("explain --format %s wrote on stderr: %q", format, r.err)
		}
		// Wrapped at 100 columns; a Markdown quote continues on lines starting "> ".
		if !strings.Contains(normSpace(strings.ReplaceAll(r.out, "\n> ", "\n")), normSpace(fleet.Caution)) {
			t.Errorf("explain --format %s: no caution", format)
		}
		for _, w := range wants {
			if !strings.Contains(r.out, w) {
				t.Errorf("explain --format %s: the record does not contain %q", format, w)
			}
		}
		if strings.Contains(r.out, "NaN") || strings.Contains(r.out, "%!") {
			t.Errorf("explain --format %s: the record shows NaN or a formatting error", format)
		}
		if format == "md" {
			if !strings.HasPrefix(r.out, "# ") || !strings.Contains(r.out, "|---") {
				t.Errorf("explain --format md: not Markdown (no title, no table): %q", clip(r.out))
			}
		}
	}

	out := filepath.Join(dir, "records")
	r := runCmd(t, "", "explain", reg, "--all", "-o", out, "--as-of", "2026-12-01")
	r.mustExit(t, exitOK, "explain --all -o DIR")
	files := listDir(t, out)
	if len(files) != 49 {
		t.Fatalf("explain --all wrote %d files, want 49 (one per demo hoist)", len(files))
	}
	_, recs := csvRecords(t, demoFile(t, "demo-si.csv"))
	for i, rec := range recs {
		name := files[i]
		if !strings.Contains(name, rec[0]) {
			t.Errorf("record file %d is %s, want the name to carry %s (register order)", i+1, name, rec[0])
			continue
		}
		b, err := os.ReadFile(filepath.Join(out, name))
		if err != nil {
			t.Fatal(err)
		}
		if !strings.Contains(normSpace(string(b)), normSpace(fleet.Caution)) || !strings.Contains(string(b), rec[0]) {
			t.Errorf("%s: no caution or no asset id", name)
		}
	}
	if sha256File(t, reg) != before {
		t.Error("explain modified the register")
	}
}
