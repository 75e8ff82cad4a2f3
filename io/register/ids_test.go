package register

import (
	"fmt"
	"math/rand/v2"
	"testing"
)

// TestIDSetMatchesMap: the id set answers as a map from id to first row does, for ids
// that repeat, ids that are prefixes of others, odd bytes, and enough ids to grow the
// table many times.
func TestIDSetMatchesMap(t *testing.T) {
	tests := []struct {
		name string
		ids  func(rng *rand.Rand, i int) string
		n    int
	}{
		{"sequential", func(_ *rand.Rand, i int) string { return fmt.Sprintf("G%07d", i%7000) }, 10000},
		{"prefixes", func(_ *rand.Rand, i int) string { d := fmt.Sprint(i % 3000); return "H-" + d[:min(len(d), 1+i%4)] }, 5000},
		{"random bytes", func(rng *rand.Rand, _ int) string {
			b := make([]byte, rng.IntN(4))
			for j := range b {
				b[j] = byte(rng.IntN(256))
			}
			return string(b)
		}, 20000},
		{"long", func(rng *rand.Rand, _ int) string { return fmt.Sprintf("%0300d", rng.IntN(500)) }, 2000},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(1, 2))
			s := newIDSet()
			want := map[string]int{}
			dups := 0
			for i := range tt.n {
				id, row := tt.ids(rng, i), i+2
				first, seen := s.first(id, row)
				wfirst, wseen := want[id]
				if seen != wseen || first != wfirst {
					t.Fatalf("id %d %q: first %d %v, want %d %v", i, id, first, seen, wfirst, wseen)
				}
				if !wseen {
					want[id] = row
				} else {
					dups++
				}
			}
			if dups == 0 || len(want) < 2 {
				t.Fatalf("%d duplicates among %d ids: the case tests nothing", dups, len(want))
			}
		})
	}
}
