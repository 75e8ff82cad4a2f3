package fleet

import (
	"math"
	"testing"
)

// TestEvaluateAtLoadsIsCheck: evaluating a hoist at a list of rated loads gives, for every
// load-dependent check, what a whole Check of the same hoist with that rated load in the
// register gives (an invariant: one set of checks, rules and defaults), and at the
// proposed load every check as Check gives it in Result.Proposed. It computes no limit
// loads. (A records check prepared from the register's rated load, overload-limiter's
// "required from 1000 kg", is judged as at a proposed load: the register's rating
// decides whether it applies; so is component-rating without a Component WLL.)
func TestEvaluateAtLoadsIsCheck(t *testing.T) {
	cases := []struct {
		name  string
		a     *Asset
		rules []string
	}{
		{"single layer, motor brake", winchA(t).num("proposed_rated_load", 6000).asset(), nil},
		{"two layers, drum brakes, stop-distance rule", winchB(t).asset(), []string{stopDistanceRule}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			c := isoChecker(t, tc.rules...)
			rated := c.Check(tc.a).RatedLoadKg
			loads := []float64{0, 0.4 * rated, rated, 1.3 * rated, 2 * rated}
			got := c.EvaluateAtLoads(tc.a, loads)
			if len(got) != len(loads) {
				t.Fatalf("%d evaluations for %d loads", len(got), len(loads))
			}
			for i, kg := range loads {
				want := c.Check(withLoad(tc.a, kg))
				e := got[i]
				if e.RatedLoadKg != kg {
					t.Errorf("at %g kg: load %g", kg, e.RatedLoadKg)
				}
				for j, cr := range e.Checks {
					w := want.Checks[j]
					if !w.LoadDependent {
						continue
					}
					// component-rating without a Component WLL is judged against the
					// register's rated load (design.md Revision 2): above it, marginal; a
					// register rated at that load has nothing above it to check.
					if cr.ID == "component-rating" && w.Status == StatusUnchecked && kg > rated {
						if cr.Status != StatusMarginal {
							t.Errorf("at %g kg, above the rated %g kg without a Component WLL: component-rating %v, want marginal", kg, rated, cr.Status)
						}
						continue
					}
					if cr.ID != w.ID || cr.Status != w.Status || !sameFloat(cr.Utilisation, w.Utilisation) || !sameFloat(cr.Demand, w.Demand) {
						t.Errorf("at %g kg %s: %v u=%v d=%v, want %s %v u=%v d=%v", kg, cr.ID, cr.Status, cr.Utilisation, cr.Demand, w.ID, w.Status, w.Utilisation, w.Demand)
					}
					if len(cr.Steps) != 0 || !math.IsNaN(cr.LimitRatedLoadKg) {
						t.Errorf("at %g kg %s: %d steps, limit %v: want none", kg, cr.ID, len(cr.Steps), cr.LimitRatedLoadKg)
					}
				}
			}
			if r := c.Check(tc.a); r.Proposed != nil {
				p := c.EvaluateAtLoads(tc.a, []float64{r.Proposed.RatedLoadKg})[0]
				for j, cr := range p.Checks {
					if w := r.Proposed.Checks[j]; cr.Status != w.Status || !sameFloat(cr.Utilisation, w.Utilisation) {
						t.Errorf("proposed %s: %v %v, want %v %v", cr.ID, cr.Status, cr.Utilisation, w.Status, w.Utilisation)
					}
				}
			}
		})
	}
	if got := isoChecker(t).EvaluateAtLoads(&Asset{Blank: true}, []float64{1}); got != nil {
		t.Errorf("blank row: %v, want nil", got)
	}
}

// sameFloat is equality with NaN equal to NaN.
func sameFloat(a, b float64) bool { return a == b || (math.IsNaN(a) && math.IsNaN(b)) }
