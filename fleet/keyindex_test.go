package fleet

import (
	"fmt"
	"testing"

	"hoistfleet/fleet/schema"
)

// TestKeyIndex: every schema key finds its own column, and keys outside the schema
// (including near misses that share a length and bytes with real keys) find nothing.
func TestKeyIndex(t *testing.T) {
	var keys []string
	for _, c := range schema.Columns() {
		keys = append(keys, c.Key)
	}
	sets := map[string][]string{
		"schema":    keys,
		"empty":     nil,
		"one":       {"rated_load"},
		"colliding": {"ab", "ba", "aab", "aba", "baa", "abab", "a", ""},
	}
	for i := 0; i < 300; i++ {
		sets["many"] = append(sets["many"], fmt.Sprintf("k%03d", i))
	}
	for name, set := range sets {
		k := newKeyIndex(set)
		first := map[string]int{}
		for i, key := range set {
			if _, ok := first[key]; !ok {
				first[key] = i
			}
		}
		for key, want := range first {
			if got, ok := k.lookup(key); !ok || got != want {
				t.Errorf("%s: lookup(%q) = %d, %v; want %d", name, key, got, ok, want)
			}
		}
		for _, key := range []string{"rated_loadx", "xated_load", "rated_lobd", "zz", "b", "k300", "unknown_key"} {
			if _, in := first[key]; in {
				continue
			}
			if got, ok := k.lookup(key); ok {
				t.Errorf("%s: lookup(%q) = %d, want absent", name, key, got)
			}
		}
	}
}

func BenchmarkKeyLookup(b *testing.B) {
	var keys []string
	m := map[string]int{}
	for i, c := range schema.Columns() {
		keys = append(keys, c.Key)
		m[c.Key] = i
	}
	k := newKeyIndex(keys)
	b.Run("keyIndex", func(b *testing.B) {
		n := 0
		for b.Loop() {
			for _, key := range keys {
				i, _ := k.lookup(key)
				n += i
			}
		}
	})
	b.Run("map", func(b *testing.B) {
		n := 0
		for b.Loop() {
			for _, key := range keys {
				n += m[key]
			}
		}
	})
}
