package fleet

import (
	"math"
	"slices"
	"strings"
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
	rated := func() *assetBuilder { return fullWinchA(t) } // every check applies
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
		{"blank Component WLL", fullWinchA(t).drop("component_wll").asset(), "component_wll", false},
		{"blank upper limit device", rated().drop("upper_limit_fitted").asset(), "upper_limit_fitted", false},
		{"blank motor rating", rated().drop("motor_duty_factor").drop("motor_starts").asset(), "motor_duty_factor", false},
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
	rated := func() *assetBuilder { return fullWinchA(t) }
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

// TestMissingRatedLoad: a hoist whose register gives no rated load is not checked at
// 0 kg: its rated load is unknown (NaN: null in JSONL) and the overload limiter, whose
// need depends on the rated load, is unchecked for want of it, not "not applicable".
func TestMissingRatedLoad(t *testing.T) {
	c := isoChecker(t)
	r := c.Check(winchA(t).drop("rated_load").drop("limiter_fitted").asset())
	if !math.IsNaN(r.RatedLoadKg) {
		t.Errorf("rated load %g kg, want unknown (NaN)", r.RatedLoadKg)
	}
	if cr := mustCheck(t, r, "overload-limiter"); cr.Status != StatusUnchecked {
		t.Errorf("overload-limiter %s %q, want unchecked", cr.Status, cr.Message)
	}
}

// TestDutyGroupGap: without a duty group (none given, none derived) the checks whose
// rules have rows by group only are unchecked for want of it as well: the Duty group is
// their gap (and in their "needs"), alone where it is the only one missing.
func TestDutyGroupGap(t *testing.T) {
	c := isoChecker(t)
	r := c.Check(winchA(t).drop("duty_group").drop("drum_diameter").asset())
	if r.Derived != nil {
		t.Logf("derived: %v", r.Derived)
	}
	rdf := mustCheck(t, r, "rope-design-factor") // ISO 4308-1 Zp by group: M1 … M8
	if rdf.Status != StatusUnchecked || !strings.Contains(rdf.Message, "Duty group") {
		t.Fatalf("rope-design-factor %s %q, want unchecked needing the Duty group", rdf.Status, rdf.Message)
	}
	dr := mustCheck(t, r, "drum-ratio") // needs the drum diameter and h1 by group
	if !strings.Contains(dr.Message, "needs Drum diameter, Duty group") {
		t.Errorf("drum-ratio message %q, want both columns", dr.Message)
	}
	var rdfGaps, drGaps []Gap
	for _, g := range r.Gaps {
		switch g.Check {
		case "rope-design-factor":
			rdfGaps = append(rdfGaps, g)
		case "drum-ratio":
			drGaps = append(drGaps, g)
		}
	}
	if len(rdfGaps) != 1 || rdfGaps[0].Key != "duty_group" || !rdfGaps[0].Alone {
		t.Errorf("rope-design-factor gaps %+v, want the duty group alone", rdfGaps)
	}
	if len(drGaps) != 2 || drGaps[0].Alone || drGaps[1].Alone {
		t.Errorf("drum-ratio gaps %+v, want drum diameter and duty group, neither alone", drGaps)
	}
}

// fullWinchA is winchA with every optional check's columns: a Component WLL, the limit
// devices and the motor's intermittent rating.
func fullWinchA(t testing.TB) *assetBuilder {
	return winchA(t).num("component_wll", 10*tonne).
		text("upper_limit_fitted", "yes").date("limit_last_test", winchA(t).asset().Fields["last_inspection"].Date).
		num("motor_duty_factor", 0.40).num("motor_starts", 240)
}

// TestGearboxRatingIsAGap: without the gear unit's rated torque, gearbox-torque is
// unchecked (a gap of its own, counted as possible) but, as before, holds back neither the
// hoist's status nor its rating.
func TestGearboxRatingIsAGap(t *testing.T) {
	c := isoChecker(t)
	full := c.Check(fullWinchA(t).asset())
	r := c.Check(fullWinchA(t).drop("gearbox_rated_torque").asset())
	if cr := mustCheck(t, r, "gearbox-torque"); cr.Status != StatusUnchecked {
		t.Fatalf("gearbox-torque %s %q, want unchecked", cr.Status, cr.Message)
	}
	if r.Status != full.Status {
		t.Errorf("status %s, want the full hoist's %s", r.Status, full.Status)
	}
	if r.Coverage.Possible != full.Coverage.Possible || r.Coverage.Run != full.Coverage.Run-1 {
		t.Errorf("coverage %+v, full %+v: want one check fewer run of as many possible", r.Coverage, full.Coverage)
	}
	if len(r.Gaps) != 1 || r.Gaps[0].Key != "gearbox_rated_torque" || !r.Gaps[0].Alone {
		t.Errorf("gaps %+v, want the gearbox rated torque alone", r.Gaps)
	}
}
