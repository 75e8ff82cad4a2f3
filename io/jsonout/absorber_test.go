package jsonout

import (
	"bytes"
	"io"
	"testing"

	"hoistfleet/fleet"
	"hoistfleet/io/sinktest"
)

// TestAbsorberSameBytes: in front of an outbuf.Absorber the Writer writes each hoist's
// line as it comes, one write each, and the bytes are exactly those it writes in 64 KiB
// blocks to any other writer. Through the pipeline the workers' Prepare runs
// concurrently with Write, so a buffer recycled before the absorber took it would show as
// wrong bytes here (and as a race under -race). Results written without Prepare, between
// prepared ones, keep their place.
func TestAbsorberSameBytes(t *testing.T) {
	regs := sinktest.DemoRegisters(t)
	if !testing.Short() {
		regs = append(regs, sinktest.GeneratedRegister(t, 400, "si", 3))
	}
	for _, reg := range regs {
		t.Run(reg.Name, func(t *testing.T) {
			c := sinktest.NewChecker(t, "iso", 1.25)
			var blocks, out bytes.Buffer
			sinktest.RunSinks(t, reg, c, New(&blocks, Options{}))
			direct, hoists := &sinktest.Absorber{W: &out}, &sinktest.CountSink{}
			sinktest.RunSinks(t, reg, c, New(direct, Options{}), hoists)
			sameBytes(t, out.Bytes(), blocks.Bytes())
			if direct.Writes != hoists.N {
				t.Errorf("%d writes for %d hoists, want one each", direct.Writes, hoists.N)
			}
		})
	}
	t.Run("some unprepared", func(t *testing.T) {
		rs := sinktest.RandomResults(7, 300)
		var blocks, out bytes.Buffer
		direct := &sinktest.Absorber{W: &out}
		for _, w := range []*Writer{New(&blocks, Options{}), New(direct, Options{})} {
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
		sameBytes(t, out.Bytes(), blocks.Bytes())
		if direct.Writes != len(rs) {
			t.Errorf("%d writes for %d hoists, want one each", direct.Writes, len(rs))
		}
	})
}

// TestAbsorberErrorsStick: in front of an absorber a failed write is reported by the
// Write that made it, wrapped as every write error of the Writer is, and every later
// Write and End returns it without writing again; a short write is io.ErrShortWrite, as
// in front of any writer.
func TestAbsorberErrorsStick(t *testing.T) {
	tests := []struct {
		name     string
		ok       int  // writes (hoists) that succeed
		prepared bool // the results are prepared, as the pipeline does
	}{
		{"first prepared hoist", 0, true},
		{"prepared hoist", 1, true},
		{"unprepared hoist", 1, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			sinktest.AbsorbedErrorsStick(t, newDirect, fixture(), "jsonout: ", tt.ok, tt.prepared)
		})
	}
	t.Run("short write", func(t *testing.T) {
		sinktest.ShortWriteSticks(t, newDirect, fixture()[0])
	})
}

// TestAbsorberAbort: after Abort nothing more reaches the absorber (what it already took
// is its owner's to drop).
func TestAbsorberAbort(t *testing.T) {
	sinktest.AbsorberAbortWritesNothing(t, newDirect, fixture())
}

// newDirect is a Writer in front of an absorber (sinktest.Absorber around w).
func newDirect(w io.Writer) fleet.Sink { return New(&sinktest.Absorber{W: w}, Options{}) }
