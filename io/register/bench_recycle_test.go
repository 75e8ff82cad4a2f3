package register

import (
	"bytes"
	"context"
	"io"
	"testing"

	"hoistfleet/fleet"
)

// BenchmarkReadCSVRecycled is BenchmarkReadCSV on the path the command takes: every
// Asset is handed back (Recycle) some rows later, as fleet.Run does once a result is
// written, so rows are built in reused memory.
func BenchmarkReadCSVRecycled(b *testing.B) {
	data := benchCSV(b)
	const lag = 64 // Assets in flight, as in fleet.Run's reorder buffer
	b.SetBytes(int64(len(data)))
	b.ResetTimer()
	for b.Loop() {
		r, err := NewCSV(bytes.NewReader(data), "bench.csv")
		if err != nil {
			b.Fatal(err)
		}
		if len(r.Header().Problems) != 0 {
			b.Fatal(r.Header().Problems)
		}
		var ring [lag]*fleet.Asset
		n := 0
		for ; ; n++ {
			a, err := r.Next(context.Background())
			if err == io.EOF {
				break
			}
			if err != nil {
				b.Fatal(err)
			}
			r.Recycle(ring[n%lag])
			ring[n%lag] = a
		}
		if n != benchRows {
			b.Fatalf("%d rows", n)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*benchRows), "ns/row")
}
