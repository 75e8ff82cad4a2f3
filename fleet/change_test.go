package fleet

import (
	"context"
	"math"
	"slices"
	"strings"
	"testing"
	"time"

	"hoistfleet/fleet/rules"
)

// result builds a Result for the comparison tests: an asset with id, site and register
// cells, a status, a rating and checks by id and status.
func changeResult(id, site string, cells []Cell, st Status, maxKg, mechKg float64, checks map[string]Status) *Result {
	a := &Asset{Row: 7, ID: id, Cells: cells, Fields: map[string]Value{}}
	if site != "" {
		a.Fields["site"] = Value{State: OK, Text: site}
	}
	r := &Result{Asset: a}
	r.Status, r.MaxRatedLoadKg, r.MechanismCapacityKg = st, maxKg, mechKg
	for _, d := range definitions { // in the definitions' order, as Check lists them
		if s, ok := checks[d.ID]; ok {
			r.Checks = append(r.Checks, CheckResult{ID: d.ID, Status: s})
		}
	}
	return r
}

// TestCompare checks one hoist's change since a baseline, case by case. The 1 % band is
// issue 19's "rating and capacity changes beyond 1 %".
func TestCompare(t *testing.T) {
	titles := []string{"Asset ID", "Rope MBF [kN]", "Last inspection", "Notes"}
	prevInputs := map[string]string{"Asset ID": "H-1", "Rope MBF [kN]": "178.6", "Last inspection": "2026-01-10", "Notes": ""}
	prevChecks := map[string]Status{"rope-design-factor": StatusPass, "drum-ratio": StatusFail, "inspection-due": StatusPass}
	b := NewBaseline(BaselineMeta{}, []BaselineHoist{
		{AssetID: "H-1", Site: "North", Row: 2, Status: StatusFail, MaxRatedLoadKg: 5000, MechanismCapacityKg: 7000,
			Checks: prevChecks, Inputs: prevInputs},
		// an id at two sites: matched by site
		{AssetID: "H-2", Site: "North", Row: 3, Status: StatusPass, MaxRatedLoadKg: 1000, MechanismCapacityKg: math.NaN()},
		{AssetID: "H-2", Site: "South", Row: 4, Status: StatusMarginal, MaxRatedLoadKg: 2000, MechanismCapacityKg: math.NaN()},
	})
	date := func(s string) Cell {
		d, _ := time.Parse(time.DateOnly, s)
		return Cell{Text: "10/01/2026", IsDate: true, Date: d}
	}
	same := []Cell{{Text: "H-1"}, {Text: "178.60", IsNumber: true}, date("2026-01-10"), {}}
	for _, tc := range []struct {
		name                  string
		r                     *Result
		kind, statusChange    string
		prevRow               int
		rating, capacity      bool
		failing, cleared      []string
		overdue, overdueClear bool
		inputs                []InputChange
	}{
		{name: "same (178.60 is 178.6, the date as ISO)", kind: ChangeUnchanged, prevRow: 2,
			r: changeResult("H-1", "North", same, StatusFail, 5000, 7000, prevChecks)},
		{name: "rating within 1 %", kind: ChangeUnchanged, prevRow: 2,
			r: changeResult("H-1", "North", same, StatusFail, 5049, 6931, prevChecks)},
		{name: "rating beyond 1 %", kind: ChangeChanged, prevRow: 2, rating: true, capacity: true,
			r: changeResult("H-1", "North", same, StatusFail, 4949, 7071, prevChecks)},
		{name: "rating to none", kind: ChangeChanged, prevRow: 2, rating: true,
			r: changeResult("H-1", "North", same, StatusFail, math.NaN(), 7000, prevChecks)},
		{name: "cleared and newly failing, better", kind: ChangeChanged, prevRow: 2, statusChange: "",
			failing: []string{"rope-design-factor"}, cleared: []string{"drum-ratio"},
			r: changeResult("H-1", "North", same, StatusFail, 5000, 7000,
				map[string]Status{"rope-design-factor": StatusFail, "drum-ratio": StatusPass, "inspection-due": StatusPass})},
		{name: "better, inspection newly overdue", kind: ChangeChanged, prevRow: 2, statusChange: "better",
			cleared: []string{"drum-ratio"}, overdue: true,
			r: changeResult("H-1", "North", same, StatusError, 5000, 7000,
				map[string]Status{"rope-design-factor": StatusPass, "drum-ratio": StatusPass, "inspection-due": StatusFail})},
		{name: "register values", kind: ChangeChanged, prevRow: 2,
			inputs: []InputChange{{"Rope MBF [kN]", "178.6", "150"}, {"Last inspection", "2026-01-10", "2026-03-01"}, {"Notes", "", "re-roped"}},
			r: changeResult("H-1", "North", []Cell{{Text: "H-1"}, {Text: "150", IsNumber: true}, date("2026-03-01"), {Text: "re-roped"}},
				StatusFail, 5000, 7000, prevChecks)},
		{name: "added", kind: ChangeAdded, r: changeResult("H-9", "North", nil, StatusPass, 1, 1, nil)},
		{name: "no id is added", kind: ChangeAdded, r: changeResult("", "North", nil, StatusPass, 1, 1, nil)},
		{name: "id at two sites, by site", kind: ChangeChanged, prevRow: 4, statusChange: "worse",
			r: changeResult("H-2", "south", nil, StatusFail, 2000, math.NaN(), nil)},
		{name: "id at two sites, a third site", kind: ChangeAdded,
			r: changeResult("H-2", "East", nil, StatusFail, 2000, math.NaN(), nil)},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := b.Compare(tc.r, titles)
			if c.Kind != tc.kind || c.StatusChange != tc.statusChange || c.PrevRow != tc.prevRow {
				t.Errorf("kind %s status %q previous row %d, want %s %q %d", c.Kind, c.StatusChange, c.PrevRow, tc.kind, tc.statusChange, tc.prevRow)
			}
			if c.RatingChanged != tc.rating || c.CapacityChanged != tc.capacity {
				t.Errorf("rating changed %v capacity changed %v, want %v %v", c.RatingChanged, c.CapacityChanged, tc.rating, tc.capacity)
			}
			if !slices.Equal(c.NewlyFailing, tc.failing) || !slices.Equal(c.Cleared, tc.cleared) {
				t.Errorf("newly failing %v cleared %v, want %v %v", c.NewlyFailing, c.Cleared, tc.failing, tc.cleared)
			}
			if c.NewlyOverdue != tc.overdue || c.OverdueCleared != tc.overdueClear {
				t.Errorf("newly overdue %v, cleared %v, want %v %v", c.NewlyOverdue, c.OverdueCleared, tc.overdue, tc.overdueClear)
			}
			if !slices.Equal(c.Inputs, tc.inputs) {
				t.Errorf("inputs %q, want %q", c.Inputs, tc.inputs)
			}
		})
	}
}

// TestSameInput: numbers compare as numbers (a workbook cell holds the double's shortest
// decimal form), text as trimmed text.
func TestSameInput(t *testing.T) {
	for _, tc := range []struct {
		a, b string
		want bool
	}{
		{"5", "5.0", true}, {"0.1", "0.10000000000000001", true}, {"178.6", "178.61", false},
		{"M5", " M5 ", true}, {"M5", "m5", false}, {"", "0", false}, {"1e3", "1000", true},
	} {
		if got := SameInput(tc.a, tc.b); got != tc.want {
			t.Errorf("SameInput(%q, %q) = %v, want %v", tc.a, tc.b, got, tc.want)
		}
	}
}

// TestSortChanges: worse first, then better, added, removed, changes of the results
// (a rating), register values alone (a site renamed: the new-user run saw 17 of these
// push a cleared rope-wear fail and a derating out of the terminal's list).
func TestSortChanges(t *testing.T) {
	cs := []*Change{
		{AssetID: "input", Kind: ChangeChanged},
		{AssetID: "better", Kind: ChangeChanged, StatusChange: "better"},
		{AssetID: "rating", Kind: ChangeChanged, RatingChanged: true},
		{AssetID: "removed", Kind: ChangeRemoved},
		{AssetID: "added", Kind: ChangeAdded},
		{AssetID: "worse", Kind: ChangeChanged, StatusChange: "worse"},
		{AssetID: "worse2", Kind: ChangeChanged, StatusChange: "worse"},
	}
	SortChanges(cs)
	var got []string
	for _, c := range cs {
		got = append(got, c.AssetID)
	}
	if want := []string{"worse", "worse2", "better", "added", "removed", "rating", "input"}; !slices.Equal(got, want) {
		t.Errorf("order %v, want %v", got, want)
	}
}

// TestBaselineDifferences: a baseline from another version or profile is allowed and
// said so; the baseline's own notes follow.
func TestBaselineDifferences(t *testing.T) {
	m := BaselineMeta{Version: "0.0.9", Profile: "us", RulesFile: "none", Notes: []string{"note"}}
	got := m.Differences(&RunInfo{Version: "0.1.0", Profile: "iso", RulesFile: "ours.csv"})
	if len(got) != 4 || !strings.Contains(got[0], "0.0.9") || !strings.Contains(got[1], "us rules") ||
		!strings.Contains(got[2], "ours.csv") || got[3] != "note" {
		t.Errorf("differences %q", got)
	}
	if got := (&BaselineMeta{Version: "0.1.0", Profile: "iso", RulesFile: "none"}).Differences(&RunInfo{Version: "0.1.0", Profile: "iso"}); len(got) != 0 {
		t.Errorf("the same run setup: differences %q, want none", got)
	}
}

// TestAttentionWeights reads the built-in weights and checks the ordering they promise:
// a marginal hoist over people ranks above a failing one in a low-exposure place, a
// failing one anywhere else above it; a blank Exposure weighs as the unstated rule says.
func TestAttentionWeights(t *testing.T) {
	for _, profile := range rules.Profiles() {
		tab, err := rules.Profile(profile)
		if err != nil {
			t.Fatal(err)
		}
		w, err := NewAttentionWeights(tab)
		if err != nil {
			t.Fatal(err)
		}
		if w.Priority(StatusMarginal, "people below") <= w.Priority(StatusFail, "low") {
			t.Errorf("%s: marginal over people %g ≤ fail in a store room %g", profile, w.Priority(StatusMarginal, "people below"), w.Priority(StatusFail, "low"))
		}
		if w.Priority(StatusFail, "process critical") <= w.Priority(StatusMarginal, "people below") {
			t.Errorf("%s: fail, process critical ≤ marginal over people", profile)
		}
		if w.Priority(StatusPass, "people below") != 0 {
			t.Errorf("%s: a passing hoist has priority %g, want 0", profile, w.Priority(StatusPass, "people below"))
		}
		u, _, err := tab.Value("attention.unstated_weight", rules.Scope{})
		if err != nil {
			t.Fatal(err)
		}
		if got, want := w.Priority(StatusFail, ""), w.Status[StatusFail]*u; got != want {
			t.Errorf("%s: blank exposure %g, want %g", profile, got, want)
		}
		// Without weighting (no Exposure column) statuses keep today's order: the
		// status weights rank as the statuses do, so equal exposures never reorder them.
		for i := 1; i < len(Statuses); i++ {
			if w.Status[Statuses[i-1]] < w.Status[Statuses[i]] {
				t.Errorf("%s: %s weighs less than %s", profile, Statuses[i-1], Statuses[i])
			}
		}
	}
	// A table without a row is refused, naming it.
	tab, _ := rules.Profile("iso")
	var kept []rules.Rule
	for _, r := range tab.Rules {
		if !(r.ID == "attention.exposure_weight" && r.When == "exposure=low") {
			kept = append(kept, r)
		}
	}
	t2, err := rules.NewTable("iso", kept)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := NewAttentionWeights(t2); err == nil || !strings.Contains(err.Error(), "attention.exposure_weight for exposure=low") {
		t.Errorf("missing row: error %v", err)
	}
}

// TestCraneCounts: a crane's status is its worst hoist's; at two sites it is at least
// error; its exposure is the most exposed hoist's; "C1" and "c1 " are one crane.
func TestCraneCounts(t *testing.T) {
	s := NewSummary(5)
	add := func(id, site, crane, exposure string, st Status) {
		r := &Result{Asset: &Asset{ID: id, Fields: map[string]Value{
			"site": {State: OK, Text: site}, "crane": {State: OK, Text: crane}, "exposure": {State: OK, Text: exposure}}}}
		r.Status, r.MinMargin, r.MaxRatedLoadKg = st, math.NaN(), math.NaN()
		s.Add(r)
	}
	add("A1", "North", "C1", "low", StatusPass)
	add("A2", "North", "c1 ", "people below", StatusMarginal) // the same crane, as a reader takes it
	add("B1", "North", "C2", "", StatusPass)
	add("B2", "South", "C2", "", StatusPass)
	add("D1", "South", "", "", StatusFail)
	if len(s.Cranes) != 2 {
		t.Fatalf("cranes %+v, want C1 and C2", s.Cranes)
	}
	c1, c2 := s.Cranes[0], s.Cranes[1]
	if c1.Status != StatusMarginal || c1.Exposure != "people below" || !slices.Equal(c1.Hoists, []string{"A1", "A2"}) {
		t.Errorf("C1 %+v", c1)
	}
	if c2.Status != StatusError || !slices.Equal(c2.Sites, []string{"North", "South"}) {
		t.Errorf("C2 at two sites %+v, want error", c2)
	}
	if by := s.CranesByStatus(); by[StatusMarginal] != 1 || by[StatusError] != 1 {
		t.Errorf("cranes by status %v", by)
	}
	if s.ExposureCounts[ExposureIndex("people below")][StatusMarginal] != 1 || s.ExposureCounts[len(Exposures)][StatusFail] != 1 {
		t.Errorf("exposure counts %v", s.ExposureCounts)
	}
}

// TestRunCraneAtTwoSites: Run locates the later row of a crane id seen at another site
// (a problem on the row, in its messages), and compares every result with the baseline.
func TestRunCraneAtTwoSites(t *testing.T) {
	c := isoChecker(t)
	rows := []struct{ id, site, crane string }{{"A", "North", "C1"}, {"B", "North", "C1"}, {"C", "South", "C1"}, {"D", "South", "C2"}}
	src := &fakeSource{h: testHeader(), n: len(rows), t: t, gen: func(i int) *Asset {
		a := winchA(t).asset()
		a.ID, a.Row = rows[i].id, i+2
		_ = a.Set("site", Value{State: OK, Text: rows[i].site})
		_ = a.Set("crane", Value{State: OK, Text: rows[i].crane, Cell: CellRef{Sheet: testSheet, Row: i + 2, Col: 3}})
		return a
	}}
	b := NewBaseline(BaselineMeta{File: "old.jsonl"}, []BaselineHoist{{AssetID: "A", Status: StatusFail, MaxRatedLoadKg: math.NaN()}, {AssetID: "Z", Status: StatusPass}})
	c.opts.Baseline = b
	sink := &recordingSink{}
	s, err := Run(context.Background(), src, sink, c, &RunInfo{}, nil)
	if err != nil {
		t.Fatal(err)
	}
	var msgs []string
	for i, ms := range sink.messages {
		for _, m := range ms {
			if strings.Contains(m, "crane") {
				msgs = append(msgs, sink.ids[i]+": "+m)
			}
		}
	}
	want := "C: " + testSheet + "!C4: asset C: crane C1 is at site 'South' here and at site 'North' on row 2: a crane is at one site; give the crane at each site its own id"
	if len(msgs) != 1 || msgs[0] != want {
		t.Errorf("messages %q, want [%q]", msgs, want)
	}
	if s.ChangeCounts.Added != 3 || s.ChangeCounts.Removed != 1 || len(s.Removed) != 1 || s.Removed[0].AssetID != "Z" {
		t.Errorf("changes %+v, removed %+v", s.ChangeCounts, s.Removed)
	}
}

// TestChangeCountsNoMatch: a baseline with no hoist in common with the register (another
// site's results given by mistake) is said to be probably the wrong file.
func TestChangeCountsNoMatch(t *testing.T) {
	wrong := ChangeCounts{Added: 49, Removed: 10}
	if !strings.Contains(wrong.Words(), "No hoist of this register is in the baseline") {
		t.Errorf("%q", wrong.Words())
	}
	right := ChangeCounts{Compared: 47, Added: 1, Removed: 1, Unchanged: 47} // as Summary counts them
	if strings.Contains(right.Words(), "No hoist") {
		t.Errorf("%q", right.Words())
	}
}
