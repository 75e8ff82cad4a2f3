package jsonout

import (
	"io"
	"testing"

	"hoistfleet/fleet"
	"hoistfleet/io/sinktest"
)

// TestAbsorberSameBytes: in front of an outbuf.Absorber the Writer writes each hoist's
// line as it comes, one write each, and the bytes are exactly those it writes in 64 KiB
// blocks to any other writer (sinktest.AbsorberSameBytes).
func TestAbsorberSameBytes(t *testing.T) {
	sinktest.AbsorberSameBytes(t, 0, sinktest.Variant{New: newSink})
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
