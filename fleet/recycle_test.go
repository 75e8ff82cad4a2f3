package fleet

import (
	"context"
	"sync"
	"testing"
	"time"
)

// recyclingSource is a fakeSource that takes Assets back (Recycler) and notes, for each,
// whether the sink had written it by then.
type recyclingSource struct {
	*fakeSource
	mu       sync.Mutex
	back     map[*Asset]int // times each Asset came back
	early    int            // came back before the sink had written that many rows
	recycled int
}

func (s *recyclingSource) Recycle(a *Asset) {
	s.mu.Lock()
	defer s.mu.Unlock()
	s.back[a]++
	s.recycled++
	// Results are written in register order, so the sink must have written at least
	// Index+1 results before this one comes back.
	if s.fakeSource.sink.writes.Load() < int64(a.Index+1) {
		s.early++
	}
}

// TestRunRecyclesEveryAsset: every Asset goes back to a Recycler Source exactly once,
// after its result was written (a Sink keeps nothing of a result: the Sink contract).
func TestRunRecyclesEveryAsset(t *testing.T) {
	const n = 300
	proto := rowAsset(t, 0)
	rec := &recordingSink{}
	fs := &fakeSource{h: testHeader(), n: n, sink: rec, t: t, gen: func(i int) *Asset {
		a := *proto
		a.ID = proto.ID + "-" + string(rune('a'+i%26))
		return &a
	}}
	src := &recyclingSource{fakeSource: fs, back: map[*Asset]int{}}
	if _, err := runWithin(t, 30*time.Second, context.Background(), src, rec, checkerWith(t, 4, 16), &RunInfo{}, nil); err != nil {
		t.Fatal(err)
	}
	if rec.writes.Load() != n {
		t.Fatalf("%d results written, want %d", rec.writes.Load(), n)
	}
	if src.recycled != n || len(src.back) != n {
		t.Errorf("%d Assets recycled (%d distinct), want %d", src.recycled, len(src.back), n)
	}
	for a, times := range src.back {
		if times != 1 {
			t.Errorf("asset %q came back %d times", a.ID, times)
		}
	}
	if src.early > 0 {
		t.Errorf("%d Assets came back before their result was written", src.early)
	}
}
