package main

import (
	"bytes"
	"errors"
	"sync/atomic"
	"testing"
)

// TestFlusher: every byte reaches the file in order, a sync is requested for each
// flushEvery bytes written (merged when one is still running), and a sync error is
// returned by Close.
func TestFlusher(t *testing.T) {
	var out bytes.Buffer
	var syncs atomic.Int64
	f := newFlusher(&out, func() error { syncs.Add(1); return nil })
	chunk := bytes.Repeat([]byte("0123456789abcdef"), 4096) // 64 KiB
	total := 0
	for total < 3*flushEvery+len(chunk) {
		n, err := f.Write(chunk)
		if err != nil || n != len(chunk) {
			t.Fatalf("write: %d, %v", n, err)
		}
		total += n
	}
	if err := f.Close(); err != nil {
		t.Fatal(err)
	}
	if out.Len() != total || !bytes.Equal(out.Bytes()[:len(chunk)], chunk) || !bytes.Equal(out.Bytes()[total-len(chunk):], chunk) {
		t.Errorf("wrote %d bytes, want %d", out.Len(), total)
	}
	if n := syncs.Load(); n < 1 || n > 3 {
		t.Errorf("%d syncs for %d bytes, want 1 to 3 (one per %d bytes, merged when busy)", n, total, flushEvery)
	}
	if err := f.Close(); err != nil { // a second Close is harmless
		t.Fatal(err)
	}

	boom := errors.New("disk full")
	g := newFlusher(&out, func() error { return boom })
	for range flushEvery / len(chunk) {
		g.Write(chunk)
	}
	if err := g.Close(); !errors.Is(err, boom) {
		t.Errorf("Close after a failed sync: %v, want %v", err, boom)
	}
}
