package main

import (
	"io"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// TestOutputToDeviceIsWrittenNotReplaced: a target that is not a regular file is written
// through, never replaced by a renamed temporary file (as root on /dev/null that would
// break the machine). A named pipe stands in for a device; its reader gets the results.
func TestOutputToDeviceIsWrittenNotReplaced(t *testing.T) {
	dir := t.TempDir()
	reg := writeDemo(t, dir, "demo-si.csv")
	fifo := filepath.Join(dir, "results.pipe")
	if err := syscall.Mkfifo(fifo, 0o600); err != nil {
		t.Fatalf("mkfifo: %v", err)
	}
	got := make(chan string, 1)
	go func() {
		f, err := os.Open(fifo)
		if err != nil {
			got <- "open: " + err.Error()
			return
		}
		defer f.Close()
		b, _ := io.ReadAll(f)
		got <- string(b)
	}()
	runCmd(t, "", "check", reg, "--as-of", "2026-12-01", "--format", "jsonl", "-o", fifo, "--quiet").mustExit(t, exitFindings, "check into a pipe")
	select {
	case s := <-got:
		if n := strings.Count(s, "\n"); n != 49 {
			t.Errorf("the pipe's reader got %d lines, want the 49 hoists", n)
		}
	case <-time.After(30 * time.Second):
		t.Fatal("nothing arrived through the pipe")
	}
	fi, err := os.Lstat(fifo)
	if err != nil || fi.Mode()&os.ModeNamedPipe == 0 {
		t.Errorf("the named pipe was replaced: %v %v", fi.Mode(), err)
	}
	if left, _ := filepath.Glob(filepath.Join(dir, ".*.tmp")); len(left) > 0 {
		t.Errorf("temporary files left: %v", left)
	}
}

// TestStaleTemporaryFilesRemoved: a temporary file of ours older than a day (a killed run)
// is removed by the next run into its folder; a fresh one (a run in progress), and files
// of other names, are not.
func TestStaleTemporaryFilesRemoved(t *testing.T) {
	dir := t.TempDir()
	reg := writeDemo(t, dir, "demo-si.csv")
	old := filepath.Join(dir, ".results.xlsx.123456789.tmp")
	fresh := filepath.Join(dir, ".results.xlsx.987654321.tmp")
	other := filepath.Join(dir, ".notes.tmp")
	for _, p := range []string{old, fresh, other} {
		if err := os.WriteFile(p, []byte("x"), 0o600); err != nil {
			t.Fatal(err)
		}
	}
	longAgo := time.Now().Add(-48 * time.Hour)
	for _, p := range []string{old, other} {
		if err := os.Chtimes(p, longAgo, longAgo); err != nil {
			t.Fatal(err)
		}
	}
	runCmd(t, "", "check", reg, "--as-of", "2026-12-01", "--format", "csv", "-o", filepath.Join(dir, "out.csv"), "--quiet").mustExit(t, exitFindings, "check")
	if _, err := os.Stat(old); !os.IsNotExist(err) {
		t.Errorf("the stale temporary file is still there (%v)", err)
	}
	for _, p := range []string{fresh, other} {
		if _, err := os.Stat(p); err != nil {
			t.Errorf("%s was removed: %v", filepath.Base(p), err)
		}
	}
}

// TestOutputIntoMissingFolder: a missing output folder is named as such, and a folder as
// the target is a usage error.
func TestOutputIntoMissingFolder(t *testing.T) {
	dir := t.TempDir()
	reg := writeDemo(t, dir, "demo-si.csv")
	r := runCmd(t, "", "check", reg, "-o", filepath.Join(dir, "nowhere", "out.xlsx"), "--quiet")
	r.mustExit(t, exitIO, "missing folder")
	if !strings.Contains(r.err, "the folder") || !strings.Contains(r.err, "does not exist") || strings.Contains(r.err, ".tmp") {
		t.Errorf("message %q does not name the missing folder (or names a temporary file)", r.err)
	}
	runCmd(t, "", "check", reg, "-o", dir, "--quiet").mustExit(t, exitUsage, "a folder as the target")
}
