package main

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestCommandLineCatchesSlips: the slips a new user makes are refused with the fix, or
// resolved the way the user meant, never carried out silently.
func TestCommandLineCatchesSlips(t *testing.T) {
	dir := t.TempDir()
	reg := writeDemo(t, dir, "demo-si.csv")
	cases := []struct {
		name string
		args []string
		code exitCode
		want string // in standard error
	}{
		{"125 meant as 125 %", []string{"check", reg, "--rated-load-factor", "125"}, exitUsage, "did you mean 1.25?"},
		{"a factor of 0.1", []string{"check", reg, "--rated-load-factor", "0.1"}, exitUsage, "want a factor from 0.5 to 3"},
		{"negative workers", []string{"check", reg, "--workers", "-3"}, exitUsage, "want at least 1"},
		{"text name, no format", []string{"check", reg, "-o", filepath.Join(dir, "out.txt")}, exitUsage, "name the file .xlsx, .csv or .jsonl"},
		{"jsonl into .xlsx", []string{"check", reg, "--format", "jsonl", "-o", filepath.Join(dir, "x.xlsx")}, exitUsage, `the name says "xlsx"`},
		{"unknown help topic", []string{"help", "nonsense"}, exitUsage, "no help on"},
		{"usage error points at the command's help", []string{"check"}, exitUsage, "hoistfleet help check"},
	}
	for _, c := range cases {
		r := runCmd(t, "", c.args...)
		r.mustExit(t, c.code, c.name)
		if !strings.Contains(r.err, c.want) {
			t.Errorf("%s: stderr %q lacks %q", c.name, r.err, c.want)
		}
	}
	// The format follows the output's name.
	out := filepath.Join(dir, "results.jsonl")
	runCmd(t, "", "check", reg, "--as-of", "2026-12-01", "-o", out, "--quiet").mustExit(t, exitFindings, "jsonl by name")
	if b, err := os.ReadFile(out); err != nil || !strings.HasPrefix(string(b), `{"asset_id":`) {
		t.Errorf("-o results.jsonl did not write JSON lines: %.40q %v", b, err)
	}
	// A register on standard input gives CSV on standard output, not a zip.
	csv, err := os.ReadFile(reg)
	if err != nil {
		t.Fatal(err)
	}
	r := runCmd(t, string(csv), "check", "-", "--as-of", "2026-12-01", "--quiet")
	r.mustExit(t, exitFindings, "stdin to stdout")
	if strings.HasPrefix(r.out, "PK") || !strings.Contains(r.out, "BQ-H01") {
		t.Errorf("check - wrote %.40q, want the CSV long form", r.out)
	}
}

// TestNoWorkbookOntoATerminal: a workbook asked for on standard output that is a terminal
// is refused with the fix; the same to a pipe is written.
func TestNoWorkbookOntoATerminal(t *testing.T) {
	dir := t.TempDir()
	reg := writeDemo(t, dir, "demo-si.csv")
	for _, tty := range []bool{true, false} {
		var out, errb strings.Builder
		code := run(context.Background(), []string{"check", reg, "--format", "xlsx", "-o", "-", "--quiet", "--as-of", "2026-12-01"},
			Streams{In: strings.NewReader(""), Out: &out, Err: &errb, OutIsTTY: tty})
		switch {
		case tty && (code != exitUsage || !strings.Contains(errb.String(), "redirect it")):
			t.Errorf("onto a terminal: exit %d, %q", code, errb.String())
		case !tty && (code != exitFindings || !strings.HasPrefix(out.String(), "PK")):
			t.Errorf("into a pipe: exit %d, %.10q", code, out.String())
		}
	}
}
