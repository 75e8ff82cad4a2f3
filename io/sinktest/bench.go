package sinktest

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

// BenchResults returns 2000 hoists from cmd/hoistgen, checked with the iso rules.
func BenchResults(b *testing.B) (*fleet.Header, []*fleet.Result) {
	realOnce.Do(func() {
		reg := GeneratedRegister(b, 2000, "si", 1)
		realHeader, realResults = CheckedResults(b, reg, NewChecker(b, "iso", 0))
	})
	if realResults == nil {
		b.Skip("no results")
	}
	return realHeader, realResults
}

func BenchSink(b *testing.B, h *fleet.Header, rs []*fleet.Result, newSink func(io.Writer) fleet.Sink) {
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

type countingDiscard struct{ n int64 }

func (w *countingDiscard) Write(p []byte) (int, error) { w.n += int64(len(p)); return len(p), nil }
