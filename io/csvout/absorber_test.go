package csvout

import (
	"io"
	"testing"

	"hoistfleet/fleet"
	"hoistfleet/io/sinktest"
)

// TestAbsorberSameBytes: in front of an outbuf.Absorber the Writer writes the header and
// then each hoist's records as they come, one write each, and the bytes are exactly those
// it writes in 64 KiB blocks to any other writer, in the default and the spreadsheet
// dialect (sinktest.AbsorberSameBytes).
func TestAbsorberSameBytes(t *testing.T) {
	sinktest.AbsorberSameBytes(t, 1, variant(Options{}), variant(Options{Comma: ';', UseCRLF: true, BOM: true}))
}

// TestAbsorberErrorsStick: in front of an absorber a failed write is reported by the call
// that made it (Begin for the header, Write for a hoist) wrapped as every write error of
// the Writer is, and every later Write and End returns it without writing again; a short
// write is io.ErrShortWrite, as in front of any writer.
func TestAbsorberErrorsStick(t *testing.T) {
	tests := []struct {
		name     string
		ok       int  // writes that succeed: the header, then hoists
		prepared bool // the results are prepared, as the pipeline does
	}{
		{"header", 0, true},
		{"prepared hoist", 2, true},
		{"unprepared hoist", 2, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			sinktest.AbsorbedErrorsStick(t, newDirect, fixture(), "csvout: ", tt.ok, tt.prepared)
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

// chunkCopier copies what it is given into a reused 4 MiB chunk, as cmd/hoistfleet's
// flusher does; absorbs says whether it claims to be an outbuf.Absorber.
type chunkCopier struct {
	chunk   []byte
	absorbs bool
	n       int64
}

func (c *chunkCopier) Write(p []byte) (int, error) {
	n := len(p)
	for len(p) > 0 {
		if len(c.chunk) == cap(c.chunk) {
			c.chunk = c.chunk[:0]
		}
		k := copy(c.chunk[len(c.chunk):cap(c.chunk)], p)
		c.chunk, p = c.chunk[:len(c.chunk)+k], p[k:]
		c.n += int64(k)
	}
	return n, nil
}

func (c *chunkCopier) AbsorbsWrites() bool { return c.absorbs }

// BenchmarkWritePrepared writes 2000 checked hoists as the command does, each prepared
// (encoded) and then written, into a writer that copies into 4 MiB chunks like the
// command's flusher: "blocks" gathers 64 KiB blocks first (the writer does not claim to
// absorb writes), "direct" hands each hoist's bytes straight on.
func BenchmarkWritePrepared(b *testing.B) {
	h, rs := sinktest.BenchResults(b)
	for _, absorbs := range []bool{false, true} {
		name := map[bool]string{false: "blocks", true: "direct"}[absorbs]
		b.Run(name, func(b *testing.B) {
			out := &chunkCopier{chunk: make([]byte, 0, 4<<20), absorbs: absorbs}
			for b.Loop() {
				w := New(out, Options{})
				if err := w.Begin(h, &fleet.RunInfo{}); err != nil {
					b.Fatal(err)
				}
				for _, r := range rs {
					w.Prepare(r)
					if err := w.Write(r); err != nil {
						b.Fatal(err)
					}
				}
				if err := w.End(nil, nil); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*len(rs)), "ns/hoist")
			b.ReportMetric(float64(out.n)/float64(b.N*len(rs)), "bytes/hoist")
		})
	}
}
