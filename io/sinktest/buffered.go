package sinktest

import (
	"bytes"
	"errors"
	"io"
	"strings"
	"testing"

	"hoistfleet/fleet"
)

// The checks below hold for any sink that buffers its output and hands it to an
// io.Writer in blocks (io/csvout, io/jsonout). newSink makes the sink under test.

// AbortDropsOutput checks that after Abort nothing buffered reaches the writer.
func AbortDropsOutput(t *testing.T, newSink func(io.Writer) fleet.Sink, rs []*fleet.Result) {
	t.Helper()
	var buf bytes.Buffer
	w := newSink(&buf)
	if err := w.Begin(&fleet.Header{}, &fleet.RunInfo{}); err != nil {
		t.Fatal(err)
	}
	for _, r := range rs {
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

// ShortWriteSticks checks that a writer taking less than it is given without saying why
// is an error (as bufio reports it), and that the error sticks.
func ShortWriteSticks(t *testing.T, newSink func(io.Writer) fleet.Sink, r *fleet.Result) {
	t.Helper()
	w := newSink(shortWriter{})
	_ = w.Begin(&fleet.Header{}, &fleet.RunInfo{})
	_ = w.Write(r)
	err := w.End(nil, nil)
	if !errors.Is(err, io.ErrShortWrite) {
		t.Fatalf("End = %v, want a short write", err)
	}
	if err := w.Write(r); err == nil || !strings.Contains(err.Error(), "short write") {
		t.Errorf("error did not stick: %v", err)
	}
}

// WriteInBlocks writes rs with the sink under test and with ref, checks that the sink's
// output reached its writer in more than one block, and returns both outputs for the
// caller to compare.
func WriteInBlocks(t *testing.T, newSink, ref func(io.Writer) fleet.Sink, rs []*fleet.Result) (got, want []byte) {
	t.Helper()
	var buf bytes.Buffer
	cw := &countWrites{w: &buf}
	w := newSink(cw)
	_ = w.Begin(&fleet.Header{}, &fleet.RunInfo{})
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
	var refBuf bytes.Buffer
	rw := ref(&refBuf)
	_ = rw.Begin(&fleet.Header{}, &fleet.RunInfo{})
	for _, r := range rs {
		_ = rw.Write(r)
	}
	_ = rw.End(nil, nil)
	return buf.Bytes(), refBuf.Bytes()
}

type countWrites struct {
	w io.Writer
	n int
}

func (c *countWrites) Write(p []byte) (int, error) { c.n++; return c.w.Write(p) }
