package jsonout

import (
	"io"
	"testing"

	"hoistfleet/fleet"
	"hoistfleet/io/sinktest"
)

// BenchmarkWriteReal writes 2000 checked hoists from cmd/hoistgen.
func BenchmarkWriteReal(b *testing.B) {
	h, rs := sinktest.BenchResults(b)
	sinktest.BenchSink(b, h, rs, func(w io.Writer) fleet.Sink { return New(w, Options{}) })
}
