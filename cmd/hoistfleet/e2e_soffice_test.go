package main

// LibreOffice interop (issue 6, item 5; issue 5, rendering): a real spreadsheet
// application opens the results workbook. The tests need `soffice` on PATH; without it
// they skip, unless HOISTFLEET_REQUIRE_SOFFICE=1 (CI installs libreoffice-calc-nogui),
// when they fail. HOISTFLEET_RENDER_DIR=DIR keeps the rendered Summary (PDF and PNG) in
// DIR for a person to look at.

import (
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"hoistfleet/calc/approx"
	"hoistfleet/io/xlsxout"
)

func needSoffice(t *testing.T) string {
	t.Helper()
	p, err := exec.LookPath("soffice")
	if err != nil {
		if os.Getenv("HOISTFLEET_REQUIRE_SOFFICE") == "1" {
			t.Fatal("soffice is not on PATH and HOISTFLEET_REQUIRE_SOFFICE=1: install libreoffice-calc-nogui")
		}
		t.Skip("soffice is not on PATH (set HOISTFLEET_REQUIRE_SOFFICE=1 to make this a failure)")
	}
	return p
}

// soffice runs LibreOffice headless with a private profile, so that parallel runs and
// a user's own LibreOffice do not clash, and returns the output folder.
func soffice(t *testing.T, bin, convertTo, file string) string {
	t.Helper()
	profile := t.TempDir()
	out := t.TempDir()
	ctx, cancel := context.WithTimeout(context.Background(), 3*time.Minute)
	defer cancel()
	cmd := exec.CommandContext(ctx, bin, "-env:UserInstallation=file://"+filepath.ToSlash(profile),
		"--headless", "--norestore", "--convert-to", convertTo, "--outdir", out, file)
	cmd.Env = append(os.Environ(), "HOME="+profile)
	b, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("soffice --convert-to %s: %v\n%s", convertTo, err, b)
	}
	if len(listDir(t, out)) == 0 {
		t.Fatalf("soffice --convert-to %s wrote nothing:\n%s", convertTo, b)
	}
	return out
}

// sheetNumber is the 1-based position of a sheet in the results workbook.
func sheetNumber(t *testing.T, book, sheet string) int {
	t.Helper()
	f := openXLSX(t, book)
	for i, s := range f.GetSheetList() {
		if s == sheet {
			return i + 1
		}
	}
	t.Fatalf("%s has no %s sheet", book, sheet)
	return 0
}

// loNumber reads a number as LibreOffice wrote it to CSV: "63.7686825562454%" is a
// percentage cell (0.637686825562454), "" is an empty cell.
func loNumber(s string) (float64, bool) {
	s = strings.TrimSpace(s)
	if s == "" {
		return 0, false
	}
	div := 1.0
	if strings.HasSuffix(s, "%") {
		s, div = strings.TrimSuffix(s, "%"), 100
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return 0, false
	}
	return v / div, true
}

// TestLibreOfficeReadsRegister converts the demo results workbook's Register sheet to
// CSV with LibreOffice and compares it with the JSON lines: status, maximum rated load
// and every check's status and utilisation; and the register's own values as given.
func TestLibreOfficeReadsRegister(t *testing.T) {
	bin := needSoffice(t)
	d := sharedDemo(t)
	book := filepath.Join(d.dir, "demo-si-results.xlsx")
	n := sheetNumber(t, book, xlsxout.SheetRegister)
	// CSV filter options: separator 44 (,), text delimiter 34 ("), UTF-8 (76), from line 1,
	// cell formats default, language default, do not quote all text, detect special
	// numbers, do not save as shown (full precision), …, sheet number n.
	opts := "csv:Text - txt - csv (StarCalc):44,34,76,1,,0,false,true,false,false,false," + strconv.Itoa(n)
	out := soffice(t, bin, opts, book)
	files := listDir(t, out)
	if len(files) != 1 {
		t.Fatalf("soffice wrote %q, want one CSV of the Register sheet", files)
	}
	b, err := os.ReadFile(filepath.Join(out, files[0]))
	if err != nil {
		t.Fatal(err)
	}
	header, rows := csvRecords(t, b)
	demoHeader, demoRows := csvRecords(t, demoFile(t, "demo-si.csv"))
	if len(rows) != len(demoRows) || len(rows) != len(d.si) {
		t.Fatalf("LibreOffice reads %d Register rows; the register has %d, the jsonl %d", len(rows), len(demoRows), len(d.si))
	}
	for i, h := range demoHeader {
		if i >= len(header) || header[i] != h {
			t.Fatalf("LibreOffice reads Register header %d as %q, the register's is %q", i+1, header[i], h)
		}
	}
	status := colIndex(header, "Status")
	maxLoad := colIndex(header, "Max rated load [t]")
	if status < 0 || maxLoad < 0 {
		t.Fatalf("LibreOffice finds no Status or Max rated load [t] column: %q", header[len(demoHeader):])
	}
	for r, h := range d.si {
		row := rows[r]
		id := h.str("asset_id")
		for c := range demoHeader {
			want := strings.TrimSpace(demoRows[r][c])
			got := strings.TrimSpace(row[c])
			if x, err := strconv.ParseFloat(want, 64); err == nil {
				if y, ok := loNumber(got); !ok || !approx.Equal(y, x, 0, 1e-12) {
					t.Errorf("%s %s: LibreOffice reads %q, the register holds %q", id, demoHeader[c], got, want)
				}
			} else if got != want {
				t.Errorf("%s %s: LibreOffice reads %q, the register holds %q", id, demoHeader[c], got, want)
			}
		}
		if row[0] != id {
			t.Errorf("Register row %d: LibreOffice reads %q, jsonl line %d is %q", r+2, row[0], r+1, id)
		}
		if row[status] != h.str("status") {
			t.Errorf("%s: LibreOffice reads status %q, jsonl %q", id, row[status], h.str("status"))
		}
		got, gok := loNumber(row[maxLoad])
		want, wok := num(h["max_rated_load_kg"])
		if gok != wok || (wok && !approx.Equal(got*1000, want, 1e-9, 1e-12)) {
			t.Errorf("%s: LibreOffice reads max rated load %q t, jsonl %v kg", id, row[maxLoad], h["max_rated_load_kg"])
		}
		for _, c := range h.checks() {
			cid, _ := c["id"].(string)
			si, ui := colIndex(header, cid+" status"), colIndex(header, cid+" utilisation")
			if si < 0 || ui < 0 {
				t.Errorf("LibreOffice finds no %s status/utilisation columns", cid)
				continue
			}
			if row[si] != c["status"] {
				t.Errorf("%s %s: LibreOffice reads %q, jsonl %v", id, cid, row[si], c["status"])
			}
			got, gok := loNumber(row[ui])
			want, wok := num(c["utilisation"])
			if gok != wok || (wok && !approx.Equal(got, want, 1e-12, 1e-12)) {
				t.Errorf("%s %s: LibreOffice reads utilisation %q, jsonl %v", id, cid, row[ui], c["utilisation"])
			}
		}
	}
}

// TestLibreOfficeRendersSummary renders the demo results workbook to PDF with
// LibreOffice and its first page to PNG with pdftoppm: the Summary is the first page,
// with its title, the caution and the status counts.
func TestLibreOfficeRendersSummary(t *testing.T) {
	bin := needSoffice(t)
	d := sharedDemo(t)
	book := filepath.Join(d.dir, "demo-si-results.xlsx")
	if n := sheetNumber(t, book, xlsxout.SheetSummary); n != 1 {
		t.Errorf("Summary is sheet %d, want the first (what the workbook opens on)", n)
	}
	out := soffice(t, bin, "pdf", book)
	pdf := filepath.Join(out, "demo-si-results.pdf")
	if _, err := os.Stat(pdf); err != nil {
		t.Fatalf("no PDF: %v (%q)", err, listDir(t, out))
	}
	if p, err := exec.LookPath("pdftotext"); err == nil {
		txt := filepath.Join(out, "page1.txt")
		if b, err := exec.Command(p, "-f", "1", "-l", "1", "-layout", pdf, txt).CombinedOutput(); err != nil {
			t.Fatalf("pdftotext: %v\n%s", err, b)
		}
		b, _ := os.ReadFile(txt)
		page := normSpace(string(b))
		for _, want := range []string{"Hoist fleet check", "screening calculation", "Fail", "Pass", "Brindlemouth Quay"} {
			if !strings.Contains(page, want) {
				t.Errorf("the PDF's first page (the Summary) does not show %q:\n%s", want, clip(page))
			}
		}
	}
	p, err := exec.LookPath("pdftoppm")
	if err != nil {
		t.Log("pdftoppm not on PATH: PNG not rendered")
		return
	}
	prefix := filepath.Join(out, "summary")
	if b, err := exec.Command(p, "-f", "1", "-l", "1", "-r", "80", "-png", pdf, prefix).CombinedOutput(); err != nil {
		t.Fatalf("pdftoppm: %v\n%s", err, b)
	}
	var png string
	for _, n := range listDir(t, out) {
		if strings.HasPrefix(n, "summary") && strings.HasSuffix(n, ".png") {
			png = filepath.Join(out, n)
		}
	}
	fi, err := os.Stat(png)
	if png == "" || err != nil || fi.Size() < 10_000 {
		t.Fatalf("the rendered Summary page is missing or nearly empty (%v)", err)
	}
	if keep := os.Getenv("HOISTFLEET_RENDER_DIR"); keep != "" {
		for _, src := range []string{pdf, png} {
			b, _ := os.ReadFile(src)
			if err := os.WriteFile(filepath.Join(keep, filepath.Base(src)), b, 0o644); err != nil {
				t.Error(err)
			}
		}
	}
}
