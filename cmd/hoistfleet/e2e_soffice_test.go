package main

// LibreOffice interop (issue 6, item 5; issue 5, rendering): a real spreadsheet
// application opens the results workbook. The tests need `soffice` on PATH; without it
// they skip, unless HOISTFLEET_REQUIRE_SOFFICE=1 (CI installs libreoffice-calc-nogui),
// when they fail. HOISTFLEET_RENDER_DIR=DIR keeps the rendered Summary (PDF and PNG) in
// DIR for a person to look at.

import (
	"context"
	"fmt"
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
				if y, ok := loNumber(got); !ok || !approx.Equal(y, x, 0, 1e-12) { // the register's own numbers, as given
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
		// the workbook carries six significant digits (xlsxout.Digits): 5e-6 relative
		if gok != wok || (wok && !approx.Equal(got*1000, want, 1e-9, 5e-6)) {
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
			if gok != wok || (wok && !approx.Equal(got, want, 1e-12, 5e-6)) {
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

// TestLibreOfficePrintsWorkbook prints the demo results workbook through LibreOffice on
// each paper: every page is that paper, landscape or portrait (pdfinfo: A4 is
// 595.3 × 841.9 pt, ISO 216; Letter 612 × 792 pt, 8.5 × 11 in), the Summary is the
// first page and the only one, and every Register page shows Asset IDs (pdftotext per
// page): the Asset ID column is repeated on each page across. HOISTFLEET_RENDER_DIR
// keeps the PDFs.
func TestLibreOfficePrintsWorkbook(t *testing.T) {
	bin := needSoffice(t)
	for _, tool := range []string{"pdfinfo", "pdftotext"} {
		if _, err := exec.LookPath(tool); err != nil {
			if os.Getenv("HOISTFLEET_REQUIRE_SOFFICE") == "1" {
				t.Fatalf("%s is not on PATH: install poppler-utils", tool)
			}
			t.Skipf("%s is not on PATH", tool)
		}
	}
	d := sharedDemo(t)
	ids := map[string]bool{}
	for _, h := range d.si {
		ids[h.str("asset_id")] = true
	}
	for _, tc := range []struct {
		paper       string
		short, long float64 // points
	}{{"a4", 595.3, 841.9}, {"letter", 612, 792}} {
		t.Run(tc.paper, func(t *testing.T) {
			dir := t.TempDir()
			book := filepath.Join(dir, "demo-si-results.xlsx")
			res := runCmd(t, "", "check", filepath.Join(d.dir, "demo-si.csv"), "-o", book, "--paper", tc.paper,
				"--as-of", "2026-12-01", "-q")
			res.mustExit(t, exitFindings, "check --paper "+tc.paper)
			out := soffice(t, bin, "pdf", book)
			pdf := filepath.Join(out, "demo-si-results.pdf")
			info, err := exec.Command("pdfinfo", "-f", "1", "-l", "10000", pdf).CombinedOutput()
			if err != nil {
				t.Fatalf("pdfinfo: %v\n%s", err, info)
			}
			var pages int
			sizes := map[int][2]float64{}
			for _, line := range strings.Split(string(info), "\n") {
				var p int
				var w, h float64
				if _, err := fmt.Sscanf(line, "Page %d size: %g x %g pts", &p, &w, &h); err == nil {
					sizes[p] = [2]float64{w, h}
				}
				if strings.HasPrefix(line, "Pages:") {
					pages, _ = strconv.Atoi(strings.TrimSpace(strings.TrimPrefix(line, "Pages:")))
				}
			}
			if pages == 0 || len(sizes) != pages {
				t.Fatalf("pdfinfo reads %d pages and %d page sizes:\n%s", pages, len(sizes), info)
			}
			t.Logf("%s: %d pages", tc.paper, pages)
			register := 0
			for p := 1; p <= pages; p++ {
				w, h := sizes[p][0], sizes[p][1]
				if !(approx.Equal(min(w, h), tc.short, 1, 0) && approx.Equal(max(w, h), tc.long, 1, 0)) {
					t.Errorf("page %d is %g × %g pt, not %s", p, w, h, tc.paper)
				}
				txt, err := exec.Command("pdftotext", "-f", strconv.Itoa(p), "-l", strconv.Itoa(p), "-layout", pdf, "-").Output()
				if err != nil {
					t.Fatalf("pdftotext page %d: %v", p, err)
				}
				page := string(txt)
				sheet := strings.TrimSpace(strings.SplitN(strings.TrimSpace(page), " ", 2)[0])
				switch {
				case p == 1 && sheet != xlsxout.SheetSummary:
					t.Errorf("page 1 is %q, want the Summary", sheet)
				case p == 2 && sheet == xlsxout.SheetSummary:
					t.Errorf("the Summary runs onto page 2")
				case p == 1 && !strings.Contains(page, "page 1 of "+strconv.Itoa(pages)):
					t.Errorf("page 1 has no \"page 1 of %d\" footer:\n%s", pages, clip(page))
				}
				if sheet != xlsxout.SheetRegister {
					continue
				}
				register++
				n := 0
				for _, f := range strings.Fields(page) {
					if ids[f] {
						n++
					}
				}
				if n == 0 {
					t.Errorf("Register page %d shows no Asset ID:\n%s", p, clip(page))
				}
			}
			if register == 0 {
				t.Errorf("no Register page among %d", pages)
			}
			if keep := os.Getenv("HOISTFLEET_RENDER_DIR"); keep != "" {
				b, _ := os.ReadFile(pdf)
				if err := os.WriteFile(filepath.Join(keep, "demo-si-results-"+tc.paper+".pdf"), b, 0o644); err != nil {
					t.Error(err)
				}
			}
		})
	}
}
