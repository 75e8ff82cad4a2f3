package fleet

import "testing"

// BenchmarkCheck puts one realistic hoist (winchA: every check runs, a proposed rated
// load re-runs them, the rating bisects three checks) through Checker.Check.
func BenchmarkCheck(b *testing.B) {
	for _, bc := range []struct {
		name string
		a    *Asset
	}{
		{"rated", winchA(b).asset()},
		{"with-proposed", winchA(b).num("proposed_rated_load", 6000).asset()},
		{"two-layer-drum-brakes", winchB(b).asset()},
	} {
		b.Run(bc.name, func(b *testing.B) {
			c := isoChecker(b, stopDistanceRule)
			b.ReportAllocs()
			for b.Loop() {
				if r := c.Check(bc.a); r == nil {
					b.Fatal("nil result")
				}
			}
		})
	}
}
