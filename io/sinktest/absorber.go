package sinktest

import (
	"io"

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
func (c *CountSink) Write(*fleet.Result) error                 { c.N++; return nil }
func (c *CountSink) End(*fleet.Summary, *fleet.RunInfo) error  { return nil }
func (c *CountSink) Abort()                                    {}
