package fleet

import (
	"fmt"
	"math"
	"slices"
	"sort"
	"strconv"
)

// FleetCoverage is what the fleet's verdict rests on: how many of the checks that apply
// were run on the register's data, and which missing columns hold the rest back (the
// data completeness view: which data to collect first).
type FleetCoverage struct {
	Coverage
	// Thin counts the hoists on which fewer than half the checks that apply could run.
	Thin int
	// Gaps are the columns the hoists lack, in the order first met; Sorted orders them.
	Gaps []ColumnGap

	gapIndex map[string]int
}

// ColumnGap is one register column as the fleet lacks it.
type ColumnGap struct {
	Key string // the schema column
	// Hoists counts the hoists lacking it where a check needs it; Unitless those of them
	// whose register gives the column without a unit.
	Hoists, Unitless int
	// Checks are the checks unchecked for want of it (on some hoist), in check order.
	Checks []string
	// Waiting counts the check results over the fleet unchecked for want of it (with or
	// without other columns); Unlocks those it alone holds back: filling it in runs that
	// many at once.
	Waiting, Unlocks int
}

// add counts one hoist's coverage and gaps.
func (f *FleetCoverage) add(r *Result) {
	f.Run += r.Coverage.Run
	f.Possible += r.Coverage.Possible
	if 2*r.Coverage.Run < r.Coverage.Possible {
		f.Thin++
	}
	if f.gapIndex == nil && len(r.Gaps) > 0 {
		f.gapIndex = map[string]int{}
	}
	for k, g := range r.Gaps {
		i, ok := f.gapIndex[g.Key]
		if !ok {
			i = len(f.Gaps)
			f.gapIndex[g.Key] = i
			f.Gaps = append(f.Gaps, ColumnGap{Key: g.Key})
		}
		cg := &f.Gaps[i]
		if !slices.ContainsFunc(r.Gaps[:k], func(p Gap) bool { return p.Key == g.Key }) {
			cg.Hoists++
			if g.Unitless {
				cg.Unitless++
			}
		}
		if !slices.Contains(cg.Checks, g.Check) {
			cg.Checks = append(cg.Checks, g.Check)
			slices.SortFunc(cg.Checks, func(a, b string) int { return checkOrder(a) - checkOrder(b) })
		}
		cg.Waiting++
		if g.Alone {
			cg.Unlocks++
		}
	}
}

// checkOrder is a check's place in presentation order (unknown ids last).
func checkOrder(id string) int {
	if i := slices.Index(CheckIDs, id); i >= 0 {
		return i
	}
	return len(CheckIDs)
}

// Sorted returns the gaps with the most valuable first: the most check results waiting on
// the column, then the most it alone would let run, then the order first met.
func (f *FleetCoverage) Sorted() []ColumnGap {
	out := slices.Clone(f.Gaps)
	sort.SliceStable(out, func(i, j int) bool {
		a, b := out[i], out[j]
		if a.Waiting != b.Waiting {
			return a.Waiting > b.Waiting
		}
		return a.Unlocks > b.Unlocks
	})
	return out
}

// Sentence says in words what the fleet's verdicts rest on: "The verdicts rest on 612 of
// the 792 checks that apply (77 %); 5 hoists had fewer than half of theirs run."
func (f *FleetCoverage) Sentence() string {
	if f.Possible == 0 {
		return "No check applied to any hoist."
	}
	pct := 100 * float64(f.Run) / float64(f.Possible)
	s := fmt.Sprintf("The verdicts rest on %d of the %d checks that apply (%s %%)", f.Run, f.Possible, strconv.FormatFloat(math.Floor(pct*10)/10, 'f', -1, 64))
	switch f.Thin {
	case 0:
		return s + "."
	case 1:
		return s + "; 1 hoist had fewer than half of its checks run."
	}
	return s + fmt.Sprintf("; %d hoists had fewer than half of their checks run.", f.Thin)
}
