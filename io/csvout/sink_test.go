package csvout

import (
	"bytes"
	"errors"
	"io"
	"strings"
	"testing"

	"hoistfleet/fleet"
	"hoistfleet/io/sinktest"
)

// TestAbortDropsOutput: after Abort nothing buffered reaches the writer.
func TestAbortDropsOutput(t *testing.T) {
	var buf bytes.Buffer
	w := New(&buf, Options{})
	if err := w.Begin(&fleet.Header{}, nil); err != nil {
		t.Fatal(err)
	}
	for _, r := range fixture() {
		if err := w.Write(r); err != nil {
			t.Fatal(err)
		}
	}
	w.Abort()
	_ = w.End(nil, nil)
	if buf.Len() != 0 {
		t.Errorf("%d bytes written after Abort", buf.Len())
	}
}

type shortWriter struct{}

func (shortWriter) Write(p []byte) (int, error) { return len(p) / 2, nil }

// TestShortWrite: a writer that takes less than it is given without saying why is an
// error (as bufio reports it), and the error sticks.
func TestShortWrite(t *testing.T) {
	w := New(shortWriter{}, Options{})
	_ = w.Begin(&fleet.Header{}, nil)
	_ = w.Write(fixture()[0])
	err := w.End(nil, nil)
	if !errors.Is(err, io.ErrShortWrite) {
		t.Fatalf("End = %v, want a short write", err)
	}
	if err := w.Write(fixture()[0]); err == nil || !strings.Contains(err.Error(), "short write") {
		t.Errorf("error did not stick: %v", err)
	}
}

// TestLargeOutputInBlocks: output larger than the buffer reaches the writer whole, in
// more than one block.
func TestLargeOutputInBlocks(t *testing.T) {
	var buf bytes.Buffer
	cw := &countWrites{w: &buf}
	rs := sinktest.RandomResults(5, 2000)
	w := New(cw, Options{})
	_ = w.Begin(&fleet.Header{}, nil)
	for _, r := range rs {
		if err := w.Write(r); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.End(nil, nil); err != nil {
		t.Fatal(err)
	}
	if cw.n < 2 {
		t.Errorf("%d writes for %d bytes", cw.n, buf.Len())
	}
	var want bytes.Buffer
	ref := refNew(&want, Options{})
	_ = ref.Begin(&fleet.Header{}, nil)
	for _, r := range rs {
		_ = ref.Write(r)
	}
	_ = ref.End(nil, nil)
	sameBytes(t, buf.Bytes(), want.Bytes())
}

type countWrites struct {
	w io.Writer
	n int
}

func (c *countWrites) Write(p []byte) (int, error) { c.n++; return c.w.Write(p) }
