package fleet

import (
	"slices"
	"testing"
)

// unitless makes key a number the register gives without a unit (register: not read).
func (b *assetBuilder) unitless(key, raw string) *assetBuilder {
	c := b.cell(key)
	b.a.Fields[key] = Value{State: Bad, Raw: raw, Cell: c,
		Err: &Error{Kind: Unitless, Cell: c, Asset: b.a.ID, Field: key, Err: errString("no unit")}}
	return b
}

// TestCoverageAndGaps: a full register runs every check that applies; each missing column
// takes out exactly the checks that need it, and is named as their gap (alone when it is
// the check's only missing column); an unreadable value is an error, not a gap.
func TestCoverageAndGaps(t *testing.T) {
	c := isoChecker(t)
	rated := func() *assetBuilder { return winchA(t).num("component_wll", 10*tonne) } // every check applies
	full := c.Check(rated().asset())
	if full.Coverage.Run != full.Coverage.Possible || full.Coverage.Possible == 0 {
		t.Fatalf("full hoist: coverage %+v, want every applicable check run", full.Coverage)
	}
	if full.Gaps != nil {
		t.Errorf("full hoist has gaps %+v", full.Gaps)
	}
	applicable := 0
	for _, cr := range full.Checks {
		if !(cr.Status == StatusInfo && len(cr.Message) > 15 && cr.Message[:15] == "not applicable:") {
			applicable++
		}
	}
	if full.Coverage.Possible != applicable {
		t.Errorf("possible %d, want the %d checks that are not 'not applicable'", full.Coverage.Possible, applicable)
	}

	cases := []struct {
		name     string
		a        *Asset
		key      string
		unitless bool
	}{
		{"blank MBF", rated().drop("rope_mbf").asset(), "rope_mbf", false},
		{"blank operating hours", rated().drop("operating_hours").asset(), "operating_hours", false},
		{"blank Component WLL", winchA(t).asset(), "component_wll", false},
		{"unitless drum diameter", rated().unitless("drum_diameter", "335").asset(), "drum_diameter", true},
	}
	for _, tc := range cases {
		r := c.Check(tc.a)
		var unchecked []string
		for _, cr := range r.Checks {
			if cr.Status == StatusUnchecked {
				unchecked = append(unchecked, cr.ID)
			}
		}
		if len(unchecked) == 0 {
			t.Fatalf("%s: no check unchecked", tc.name)
		}
		if got, want := r.Coverage.Run, full.Coverage.Run-len(unchecked); got != want {
			t.Errorf("%s: run %d, want %d (%d unchecked: %v)", tc.name, got, want, len(unchecked), unchecked)
		}
		if r.Coverage.Possible != full.Coverage.Possible {
			t.Errorf("%s: possible %d, want %d", tc.name, r.Coverage.Possible, full.Coverage.Possible)
		}
		var gapChecks []string
		for _, g := range r.Gaps {
			if g.Key != tc.key {
				t.Errorf("%s: gap %+v names another column", tc.name, g)
			}
			if !g.Alone || g.Unitless != tc.unitless {
				t.Errorf("%s: gap %+v, want alone, unitless %v", tc.name, g, tc.unitless)
			}
			gapChecks = append(gapChecks, g.Check)
		}
		if !slices.Equal(gapChecks, unchecked) {
			t.Errorf("%s: gaps name checks %v, want the unchecked ones %v", tc.name, gapChecks, unchecked)
		}
	}

	bad := c.Check(rated().bad("rope_mbf", "lots", "not a number").asset())
	if bad.Gaps != nil {
		t.Errorf("an unreadable MBF is a register fix, not a gap: %+v", bad.Gaps)
	}
	if bad.Coverage.Run >= full.Coverage.Run {
		t.Errorf("an unreadable MBF: run %d, want fewer than %d", bad.Coverage.Run, full.Coverage.Run)
	}
}

// TestFleetCoverage: the summary adds the hoists' coverage and ranks the columns to
// collect by the checks each alone would let run.
func TestFleetCoverage(t *testing.T) {
	c := isoChecker(t)
	s := NewSummary(5)
	rated := func() *assetBuilder { return winchA(t).num("component_wll", 10*tonne) }
	rs := []*Result{
		c.Check(rated().asset()),
		c.Check(rated().drop("rope_mbf").asset()),
		c.Check(rated().drop("rope_mbf").drop("operating_hours").asset()),
		c.Check(rated().drop("operating_hours").asset()),
		c.Check(rated().drop("rope_mbf").asset()),
	}
	run, possible := 0, 0
	for _, r := range rs {
		s.Add(r)
		run += r.Coverage.Run
		possible += r.Coverage.Possible
	}
	fc := s.Coverage
	if fc.Run != run || fc.Possible != possible {
		t.Errorf("fleet coverage %d of %d, want %d of %d", fc.Run, fc.Possible, run, possible)
	}
	sorted := fc.Sorted()
	if len(sorted) != 2 || sorted[0].Key != "rope_mbf" || sorted[1].Key != "operating_hours" {
		t.Fatalf("gaps %+v, want rope_mbf then operating_hours", sorted)
	}
	if sorted[0].Hoists != 3 || sorted[1].Hoists != 2 {
		t.Errorf("hoists lacking: %d and %d, want 3 and 2", sorted[0].Hoists, sorted[1].Hoists)
	}
	perHoist := len(rs[1].Gaps) // checks MBF alone holds back on one hoist
	if sorted[0].Unlocks != 3*perHoist || sorted[0].Waiting != 3*perHoist || len(sorted[0].Checks) != perHoist {
		t.Errorf("MBF unlocks %d results of %v, want %d (3 hoists × %d checks)", sorted[0].Unlocks, sorted[0].Checks, 3*perHoist, perHoist)
	}
}
