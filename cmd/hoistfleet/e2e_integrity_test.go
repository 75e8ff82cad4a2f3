package main

import (
	"bytes"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// TestDamagedRegistersRefused (issue 16): a register the reader cannot read whole is
// refused, exit 3, with the located message, and nothing is written: no results file and
// no temporary file. The workbooks are io/register's crafted fixtures (built and
// described in its crafted_test.go); the CSV files are made here.
func TestDamagedRegistersRefused(t *testing.T) {
	crafted := func(name string) string {
		return filepath.Join("..", "..", "io", "register", "testdata", "crafted", name)
	}
	bigCSV := func(dir string) string {
		var b strings.Builder
		b.WriteString("Asset ID,Site,Rated load [t]\n")
		for i := 0; b.Len() < 80<<10; i++ {
			b.WriteString("H-" + strings.Repeat("0", 3) + ",Dock,2\n")
		}
		b.WriteString("H-\x00X,Dock,2\n")
		p := filepath.Join(dir, "nul-late.csv")
		if err := os.WriteFile(p, []byte(b.String()), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	for _, tc := range []struct {
		name   string
		file   func(dir string) string
		errHas []string
	}{
		{"XML broken at row 501", func(string) string { return crafted("broken-ampersand-row-501.xlsx") },
			[]string{"broken-ampersand-row-501.xlsx", `sheet "Register", in row 501`}},
		{"XML cut in row 700", func(string) string { return crafted("cut-in-row-700.xlsx") },
			[]string{"cut-in-row-700.xlsx", "row 700"}},
		{"DOCTYPE", func(string) string { return crafted("doctype-entities.xlsx") },
			[]string{"doctype-entities.xlsx", "document type declaration"}},
		{"wrong CRC", func(string) string { return crafted("wrong-crc.xlsx") },
			[]string{"wrong-crc.xlsx", "CRC-32"}},
		{"size that lies", func(string) string { return crafted("size-lies.xlsx") },
			[]string{"size-lies.xlsx", "declares"}},
		{"duplicate entry", func(string) string { return crafted("duplicate-entry.xlsx") },
			[]string{"duplicate-entry.xlsx", "two entries named"}},
		{"duplicate row", func(string) string { return crafted("row-twice.xlsx") },
			[]string{"row-twice.xlsx", `sheet "Register" row 3`}},
		{"duplicate cell", func(string) string { return crafted("cell-twice.xlsx") },
			[]string{"cell-twice.xlsx", "cell C2"}},
		{"cell A0", func(string) string { return crafted("cell-A0.xlsx") },
			[]string{"cell-A0.xlsx", `"A0"`}},
		{"shared string index", func(string) string { return crafted("shared-string-out-of-range.xlsx") },
			[]string{"shared-string-out-of-range.xlsx", "cell A2", "shared string 7"}},
		{"a cell of 2 MiB", func(string) string { return crafted("inline-string-2MiB.xlsx") },
			[]string{"inline-string-2MiB.xlsx", "row 2", "the limit is 1 MiB"}},
		{"NUL after 64 KiB", bigCSV, []string{"nul-late.csv", "NUL"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			t.Setenv("TMPDIR", dir) // a temporary file anywhere would be left here
			in := tc.file(dir)
			out := filepath.Join(dir, "out.xlsx")
			r := runCmd(t, "", "check", in, "-o", out)
			r.mustExit(t, exitIO, tc.name)
			for _, w := range tc.errHas {
				if !strings.Contains(r.err, w) {
					t.Errorf("stderr %q lacks %q", r.err, w)
				}
			}
			if left := listDir(t, dir); len(left) > 1 || len(left) == 1 && left[0] != filepath.Base(in) {
				t.Errorf("left behind: %v", left)
			}
		})
	}
}

// TestCSVDialectsOfIssue16: CR-only line ends and Excel's sep= first line are read (every
// hoist, not 0 or every one unchecked), and the notes say how.
func TestCSVDialectsOfIssue16(t *testing.T) {
	dir := t.TempDir()
	const rows = "Asset ID;Site;Rated load [t]\nH-1;Dock;2,5\nH-2;Yard;3\n"
	for _, tc := range []struct{ name, text, note string }{
		{"cr.csv", strings.ReplaceAll(strings.ReplaceAll(rows, ";", ","), "2,5", "2.5"), "carriage return alone"},
		{"sep.csv", "sep=;\n" + rows, "separator hint"},
	} {
		text := tc.text
		if tc.name == "cr.csv" {
			text = strings.ReplaceAll(text, "\n", "\r")
		}
		in := filepath.Join(dir, tc.name)
		if err := os.WriteFile(in, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		r := runCmd(t, "", "check", in, "--format", "jsonl", "-o", "-")
		if r.code == exitIO || r.code == exitUsage {
			t.Fatalf("%s: exit %d: %s", tc.name, r.code, r.err)
		}
		hs := byAsset(parseJSONL(t, r.out))
		if len(hs) != 2 || hs["H-1"] == nil || hs["H-2"] == nil {
			t.Fatalf("%s: hoists %v", tc.name, hs)
		}
		if got := hs["H-1"].str("site"); got != "Dock" {
			t.Errorf("%s: H-1 site %q", tc.name, got)
		}
		c := runCmd(t, "", "columns", in)
		if !strings.Contains(c.out+c.err, tc.note) {
			t.Errorf("%s: the column report does not say %q:\n%s", tc.name, tc.note, c.out)
		}
	}
}

// TestWorkbookBytesReproducible (issue 16): two identical runs write byte-identical
// workbooks, part by part, apart from the Audit's run time (its start and finish times
// and its duration, in the shared strings). The content-types part used to list image
// extensions in a different order on each run.
func TestWorkbookBytesReproducible(t *testing.T) {
	dir := t.TempDir()
	reg := writeDemo(t, dir, "demo-si.csv")
	runTime := regexp.MustCompile(`<t>(\d{4}-\d\d-\d\dT[0-9:.]+Z?|[0-9.]+(µs|ms|s)|[0-9]+m[0-9.]+s)</t>`)
	var books []map[string][]byte
	for i := range 3 {
		out := filepath.Join(dir, "r"+strconv.Itoa(i)+".xlsx")
		runCmd(t, "", "check", reg, "-o", out, "--as-of", "2026-12-01", "--workers", "2", "-q").
			mustExit(t, exitFindings, "check")
		parts := zipFiles(t, out)
		parts["xl/sharedStrings.xml"] = runTime.ReplaceAll(parts["xl/sharedStrings.xml"], []byte("<t>RUNTIME</t>"))
		books = append(books, parts)
	}
	if len(books[0]) < 10 {
		t.Fatalf("%d parts", len(books[0]))
	}
	for i := 1; i < len(books); i++ {
		if len(books[i]) != len(books[0]) {
			t.Fatalf("run %d: %d parts, run 0: %d", i, len(books[i]), len(books[0]))
		}
		for name, b := range books[0] {
			if !bytes.Equal(b, books[i][name]) {
				t.Errorf("run %d: %s differs", i, name)
			}
		}
	}
}
