//go:build unix

package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"golang.org/x/sys/unix"
)

// TestRegisterThroughFIFO (issue 16 item 10): an XLSX register given as a named pipe is
// read through once (it said "illegal seek", then it waited for a second writer).
func TestRegisterThroughFIFO(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "reg.xlsx")
	if err := unix.Mkfifo(fifo, 0o600); err != nil {
		t.Skip("no named pipes here:", err)
	}
	data, err := os.ReadFile(filepath.Join("..", "..", "io", "register", "testdata", "crafted", "text-as-shown.xlsx"))
	if err != nil {
		t.Fatal(err)
	}
	done := make(chan error, 1)
	go func() {
		f, err := os.OpenFile(fifo, os.O_WRONLY, 0)
		if err == nil {
			_, err = f.Write(data)
			f.Close()
		}
		done <- err
	}()
	r := runCmd(t, "", "check", fifo, "--format", "jsonl", "-o", "-", "-q")
	if err := <-done; err != nil {
		t.Fatal(err)
	}
	if r.code == exitIO || r.code == exitUsage {
		t.Fatalf("exit %d: %s", r.code, r.err)
	}
	for _, id := range []string{"00125", "00126", "04031"} {
		if !strings.Contains(r.out, `"asset_id":"`+id+`"`) {
			t.Errorf("no hoist %s (the id as shown):\n%s", id, clip(r.out))
		}
	}
	if n := strings.Count(r.out, `"asset_id":`); n != 3 {
		t.Errorf("%d hoists", n)
	}
}
