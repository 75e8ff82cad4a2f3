package sinktest

import (
	"bytes"
	"errors"
	"io"
	"testing"

	"hoistfleet/fleet"
	"hoistfleet/io/outbuf"
)

// Absorber makes W an outbuf.Absorber (as cmd/hoistfleet's output flusher is) and counts
// the writes it takes: the result writers hand such a writer each hoist's bytes as they
// come instead of gathering blocks.
type Absorber struct {
	W      io.Writer
	Writes int
}

var _ outbuf.Absorber = (*Absorber)(nil)

func (a *Absorber) Write(p []byte) (int, error) { a.Writes++; return a.W.Write(p) }

// AbsorbsWrites reports true (outbuf.Absorber).
func (a *Absorber) AbsorbsWrites() bool { return true }

// FailAfter takes OK writes, then fails every one with Err.
type FailAfter struct {
	OK  int
	Err error
}

func (f *FailAfter) Write(p []byte) (int, error) {
	if f.OK == 0 {
		return 0, f.Err
	}
	f.OK--
	return len(p), nil
}

// CountSink counts the results written, to compare with the writes an Absorber took.
type CountSink struct{ N int }

func (c *CountSink) Begin(*fleet.Header, *fleet.RunInfo) error { return nil }
func (c *CountSink) Prepare(*fleet.Result)                     {}
func (c *CountSink) Write(*fleet.Result) error                 { c.N++; return nil }
func (c *CountSink) End(*fleet.Summary, *fleet.RunInfo) error  { return nil }
func (c *CountSink) Abort()                                    {}

// The checks below hold for any sink that, in front of an Absorber, writes each hoist as
// it comes (io/csvout, io/jsonout). newSink makes the sink under test.

// AbsorbedErrorsStick checks, in front of an Absorber whose writer takes ok writes and
// then fails, that the first error comes from the call whose write failed (Begin for a
// header, Write for a hoist), wrapped with prefix ("csvout: "), and that every later
// Write and End returns it without writing again. With prepared the results go through
// the sink's Prepare first, as the pipeline's workers do.
func AbsorbedErrorsStick(t *testing.T, newSink func(io.Writer) fleet.Sink, rs []*fleet.Result, prefix string, ok int, prepared bool) {
	t.Helper()
	diskFull := errors.New("no space left on device")
	direct := &Absorber{W: &FailAfter{OK: ok, Err: diskFull}}
	w := newSink(direct)
	first := w.Begin(&fleet.Header{}, &fleet.RunInfo{})
	for _, r := range rs {
		if prepared {
			w.Prepare(r)
		}
		if err := w.Write(r); first == nil {
			first = err
		} else if err != first {
			t.Errorf("Write after %v: %v", first, err)
		}
	}
	if !errors.Is(first, diskFull) || first.Error() != prefix+diskFull.Error() {
		t.Fatalf("first error %v, want %s%v", first, prefix, diskFull)
	}
	if err := w.End(nil, nil); err != first {
		t.Errorf("End after %v: %v", first, err)
	}
	if direct.Writes != ok+1 {
		t.Errorf("%d writes, want %d: none after the failed one", direct.Writes, ok+1)
	}
}

// AbsorberAbortWritesNothing checks that after Abort nothing more reaches the Absorber
// (what it already took is its owner's to drop), prepared results included.
func AbsorberAbortWritesNothing(t *testing.T, newSink func(io.Writer) fleet.Sink, rs []*fleet.Result) {
	t.Helper()
	var out bytes.Buffer
	direct := &Absorber{W: &out}
	w := newSink(direct)
	_ = w.Begin(&fleet.Header{}, &fleet.RunInfo{})
	_ = w.Write(rs[0])
	took := direct.Writes
	w.Abort()
	for _, r := range rs[1:] {
		w.Prepare(r)
		_ = w.Write(r)
	}
	_ = w.End(nil, nil)
	if direct.Writes != took {
		t.Errorf("%d writes after Abort", direct.Writes-took)
	}
}

// AbsorberSameBytes checks, for each variant, that in front of an Absorber the sink
// writes what comes before the first hoist in headerWrites writes and then each hoist as
// one write, and that the bytes are exactly those it writes in blocks to any other
// writer: over the demo registers and (unless -short) a generated one, re-rated by 1.25
// with the iso rules, through the pipeline, whose workers' Prepare runs concurrently with
// Write, so a buffer recycled before the absorber took it would show as wrong bytes here
// (and as a race under -race). With the first variant, results written without Prepare,
// between prepared ones, keep their place.
func AbsorberSameBytes(t *testing.T, headerWrites int, variants ...Variant) {
	var gen []Register
	if !testing.Short() {
		gen = []Register{GeneratedRegister(t, 400, "si", 3)}
	}
	for _, reg := range testRegisters(t, gen...) {
		for _, v := range variants {
			name := reg.Name
			if v.Name != "" {
				name += "/" + v.Name
			}
			t.Run(name, func(t *testing.T) {
				c := NewChecker(t, "iso", 1.25)
				var blocks, out bytes.Buffer
				RunSinks(t, reg, c, v.New(&blocks))
				direct, hoists := &Absorber{W: &out}, &CountSink{}
				RunSinks(t, reg, c, v.New(direct), hoists)
				SameBytes(t, out.Bytes(), blocks.Bytes())
				if direct.Writes != headerWrites+hoists.N {
					t.Errorf("%d writes for %d hoists, want %d before the hoists and one each", direct.Writes, hoists.N, headerWrites)
				}
			})
		}
	}
	t.Run("some unprepared", func(t *testing.T) {
		rs := RandomResults(7, 300)
		var blocks, out bytes.Buffer
		direct := &Absorber{W: &out}
		for _, w := range []fleet.Sink{variants[0].New(&blocks), variants[0].New(direct)} {
			if err := w.Begin(&fleet.Header{}, &fleet.RunInfo{}); err != nil {
				t.Fatal(err)
			}
			for i, r := range rs {
				if i%3 != 0 {
					w.Prepare(r)
				}
				if err := w.Write(r); err != nil {
					t.Fatal(err)
				}
			}
			if err := w.End(nil, nil); err != nil {
				t.Fatal(err)
			}
		}
		SameBytes(t, out.Bytes(), blocks.Bytes())
		if direct.Writes != headerWrites+len(rs) {
			t.Errorf("%d writes for %d hoists, want %d before the hoists and one each", direct.Writes, len(rs), headerWrites)
		}
	})
}
