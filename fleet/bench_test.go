package fleet

import "testing"

// BenchmarkCheck puts one realistic hoist (winchA: every check runs, a proposed rated
// load re-runs them, the rating bisects three checks) through Checker.Check. The asset
// holds its fields in Values, as the register readers give them. "recycled" hands each
// Result back as Run does when the Sink forgets results.
func BenchmarkCheck(b *testing.B) {
	for _, bc := range []struct {
		name    string
		a       *Asset
		recycle bool
	}{
		{"rated", winchA(b).asset(), false},
		{"rated-recycled", winchA(b).asset(), true},
		{"with-proposed", winchA(b).num("proposed_rated_load", 6000).asset(), false},
		{"two-layer-drum-brakes", winchB(b).asset(), false},
	} {
		b.Run(bc.name, func(b *testing.B) {
			a := asValues(b, bc.a)
			c := isoChecker(b, stopDistanceRule)
			b.ReportAllocs()
			for b.Loop() {
				r := c.Check(a)
				if r == nil {
					b.Fatal("nil result")
				}
				if bc.recycle {
					c.recycle(r)
				}
			}
		})
	}
}

// asValues returns a copy of a with its Fields moved into Values.
func asValues(t testing.TB, a *Asset) *Asset {
	v := *a
	v.Fields = nil
	for k, f := range a.Fields {
		if err := v.Set(k, f); err != nil {
			t.Fatal(err)
		}
	}
	return &v
}
