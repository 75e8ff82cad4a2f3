package jsonout

import (
	"io"
	"sync"
	"testing"

	"hoistfleet/fleet"
)

var (
	realOnce    sync.Once
	realHeader  *fleet.Header
	realResults []*fleet.Result
)

// benchRealResults returns 2000 hoists from cmd/hoistgen, checked with the iso rules.
func benchRealResults(b *testing.B) (*fleet.Header, []*fleet.Result) {
	realOnce.Do(func() {
		reg := generatedRegister(b, 2000, "si", 1)
		realHeader, realResults = checkedResults(b, reg, newChecker(b, "iso", 0))
	})
	if realResults == nil {
		b.Skip("no results")
	}
	return realHeader, realResults
}

func benchSink(b *testing.B, h *fleet.Header, rs []*fleet.Result, newSink func(io.Writer) fleet.Sink) {
	var out countingDiscard
	for b.Loop() {
		s := newSink(&out)
		if err := s.Begin(h, &fleet.RunInfo{}); err != nil {
			b.Fatal(err)
		}
		for _, r := range rs {
			if err := s.Write(r); err != nil {
				b.Fatal(err)
			}
		}
		if err := s.End(nil, nil); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*len(rs)), "ns/hoist")
	b.ReportMetric(float64(out.n)/float64(b.N*len(rs)), "bytes/hoist")
}

// BenchmarkWriteReal writes 2000 checked hoists from cmd/hoistgen.
func BenchmarkWriteReal(b *testing.B) {
	h, rs := benchRealResults(b)
	benchSink(b, h, rs, func(w io.Writer) fleet.Sink { return New(w, Options{}) })
}

// BenchmarkWriteRealReference is BenchmarkWriteReal with the previous writer.
func BenchmarkWriteRealReference(b *testing.B) {
	h, rs := benchRealResults(b)
	benchSink(b, h, rs, func(w io.Writer) fleet.Sink { return refNew(w, Options{}) })
}

type countingDiscard struct{ n int64 }

func (w *countingDiscard) Write(p []byte) (int, error) { w.n += int64(len(p)); return len(p), nil }
