package sinktest

import (
	"bytes"
	"errors"
	"fmt"
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

// WriteInBlocks writes rs with the sink under test, checks that its output reached its
// writer in more than one block, and returns the output for the caller to compare.
func WriteInBlocks(t *testing.T, newSink func(io.Writer) fleet.Sink, rs []*fleet.Result) []byte {
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
	return buf.Bytes()
}

type countWrites struct {
	w io.Writer
	n int
}

func (c *countWrites) Write(p []byte) (int, error) { c.n++; return c.w.Write(p) }

// WriteAll writes rs with the sink newSink makes (Begin with h and info, every result,
// End with a summary and info) and returns its output.
func WriteAll(t testing.TB, newSink func(io.Writer) fleet.Sink, h *fleet.Header, info *fleet.RunInfo, rs []*fleet.Result) []byte {
	t.Helper()
	var buf bytes.Buffer
	s := newSink(&buf)
	if err := s.Begin(h, info); err != nil {
		t.Fatal(err)
	}
	for _, r := range rs {
		if err := s.Write(r); err != nil {
			t.Fatal(err)
		}
	}
	if err := s.End(fleet.NewSummary(10), info); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// Variant is a sink under test (the writer with some options) and the name of its
// subtests.
type Variant struct {
	Name string
	New  func(io.Writer) fleet.Sink
}

// testRegisters are the registers of the tests that run fleet: the demo registers and,
// unless -short, generated ones.
func testRegisters(t *testing.T, generated ...Register) []Register {
	t.Helper()
	regs := DemoRegisters(t)
	if !testing.Short() {
		regs = append(regs, generated...)
	}
	return regs
}

// GoldenRegisters runs fleet (iso rules) over the demo registers and, unless -short,
// two generated ones (400 hoists in SI units, 200 in US units), as given and re-rated
// by 1.25, into each variant's sink, and compares each output with its golden output
// (subtest register/factor=F/variant). Every result is prepared (encoded by the
// pipeline's workers) before it is written.
func GoldenRegisters(t *testing.T, variants ...Variant) {
	var gen []Register
	if !testing.Short() {
		gen = []Register{GeneratedRegister(t, 400, "si", 3), GeneratedRegister(t, 200, "us", 4)}
	}
	for _, reg := range testRegisters(t, gen...) {
		for _, factor := range []float64{0, 1.25} {
			c := NewChecker(t, "iso", factor)
			for _, v := range variants {
				name := fmt.Sprintf("%s/factor=%v", reg.Name, factor)
				if v.Name != "" {
					name += "/" + v.Name
				}
				t.Run(name, func(t *testing.T) {
					var got bytes.Buffer
					RunSinks(t, reg, c, v.New(&got))
					if got.Len() == 0 {
						t.Fatal("nothing written")
					}
					Golden(t, "", got.Bytes())
				})
			}
		}
	}
}
