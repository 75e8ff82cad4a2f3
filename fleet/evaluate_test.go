package fleet

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"hoistfleet/calc"
)

// TestStatusWorse: a hoist's status is the worst of its checks in the order
// fail > error > unchecked > marginal > pass; info never counts (design.md "Statuses").
func TestStatusWorse(t *testing.T) {
	order := []Status{StatusPass, StatusMarginal, StatusUnchecked, StatusError, StatusFail} // design.md, best first
	for i, s := range order {
		for j, u := range order {
			if got, want := s.Worse(u), i > j; got != want {
				t.Errorf("%v.Worse(%v) = %v, want %v", s, u, got, want)
			}
		}
		if StatusInfo.Worse(s) || !s.Worse(StatusInfo) {
			t.Errorf("info must rank below %v", s)
		}
	}
	if !slices.Equal(Statuses, []Status{StatusFail, StatusError, StatusUnchecked, StatusMarginal, StatusPass}) {
		t.Errorf("Statuses = %v, want worst first", Statuses)
	}
	for _, s := range append(order, StatusInfo) {
		if p, ok := ParseStatus(s.String()); !ok || p != s {
			t.Errorf("ParseStatus(%q) = %v, %v", s.String(), p, ok)
		}
	}
}

// fakeCheck is a prepared check with a fixed outcome: status st for unrunnable checks
// (unchecked / error / info), or the outcome the run returns.
func fakeCheck(id string, st Status, o *calc.Outcome) preparedCheck {
	p := preparedCheck{spec: &checkSpec{Definition: *definitionAt(0, id)}, status: st, message: "fake " + st.String()}
	if o != nil {
		oc := *o
		p.run = func(calc.Hoist) (calc.Outcome, error) { return oc, nil }
	}
	return p
}

func util(u float64) *calc.Outcome {
	return &calc.Outcome{Demand: u, Capacity: 1, Unit: "1", Utilisation: u}
}

// TestEvaluationPrecedence runs evaluate over checks of known statuses and compares the
// hoist's status, min_margin and worst_check with design.md "Statuses".
func TestEvaluationPrecedence(t *testing.T) {
	c := isoChecker(t)
	d := &hoistData{a: &Asset{ID: "T-1"}, c: c}
	info := &calc.Outcome{Verdict: calc.Info, Utilisation: math.NaN(), Demand: math.NaN(), Capacity: math.NaN()}
	calcErr := preparedCheck{spec: &checkSpec{Definition: Definition{ID: "calc-error"}}, run: func(calc.Hoist) (calc.Outcome, error) {
		return calc.Outcome{}, errors.New("no convergence")
	}}
	failOutright := &calc.Outcome{Verdict: calc.Fail, Utilisation: math.NaN(), Demand: math.NaN(), Capacity: 0.25}
	cases := []struct {
		name      string
		checks    []preparedCheck
		want      Status
		minMargin float64 // NaN: none
		worst     string
	}{
		{"all pass", []preparedCheck{fakeCheck("a", 0, util(0.5)), fakeCheck("b", 0, util(0.8))}, StatusPass, 0.2, "b"},
		{"marginal beats pass", []preparedCheck{fakeCheck("a", 0, util(0.95)), fakeCheck("b", 0, util(0.3))}, StatusMarginal, 0.05, "a"},
		{"unchecked beats marginal", []preparedCheck{fakeCheck("a", 0, util(0.95)), fakeCheck("u", StatusUnchecked, nil)}, StatusUnchecked, 0.05, "a"},
		{"error beats unchecked", []preparedCheck{fakeCheck("u", StatusUnchecked, nil), fakeCheck("e", StatusError, nil), fakeCheck("a", 0, util(0.2))}, StatusError, 0.8, "a"},
		{"calc error is error", []preparedCheck{fakeCheck("a", 0, util(0.2)), calcErr}, StatusError, 0.8, "a"},
		{"fail beats error", []preparedCheck{fakeCheck("e", StatusError, nil), fakeCheck("f", 0, util(1.5)), fakeCheck("u", StatusUnchecked, nil)}, StatusFail, -0.5, "f"},
		{"info never counts", []preparedCheck{fakeCheck("i", 0, info), fakeCheck("a", 0, util(0.5))}, StatusPass, 0.5, "a"},
		{"info alone", []preparedCheck{fakeCheck("i", 0, info), fakeCheck("n", StatusInfo, nil)}, StatusPass, math.NaN(), ""},
		// design.md Revision 2, "Smallest margin": worst_check names the check whose
		// margin min_margin is; a check without a utilisation never carries one.
		{"fail outright without margin", []preparedCheck{fakeCheck("s", 0, failOutright)}, StatusFail, math.NaN(), ""},
		{"margin credited to its check (CS-H07)", []preparedCheck{fakeCheck("h", 0, util(2.949)), fakeCheck("s", 0, failOutright)}, StatusFail, -1.949, "h"},
		{"marginal outright, smaller margin elsewhere", []preparedCheck{fakeCheck("a", 0, util(0.85)), fakeCheck("m", 0, &calc.Outcome{Verdict: calc.Marginal, Utilisation: 0.15, Demand: 0.15, Capacity: 1})}, StatusMarginal, 0.15, "a"},
		{"utilisation exactly 1 is marginal", []preparedCheck{fakeCheck("a", 0, util(1))}, StatusMarginal, 0, "a"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			e := c.evaluate(d, calc.Hoist{}, tc.checks, false, nil)
			if e.Status != tc.want {
				t.Errorf("status %v, want %v", e.Status, tc.want)
			}
			if !approxEqual(e.MinMargin, tc.minMargin, 1e-12, 0) {
				t.Errorf("min margin %v, want %v", e.MinMargin, tc.minMargin)
			}
			if e.WorstCheck != tc.worst {
				t.Errorf("worst check %q, want %q", e.WorstCheck, tc.worst)
			}
			if len(e.Checks) != len(tc.checks) {
				t.Errorf("%d check results for %d checks", len(e.Checks), len(tc.checks))
			}
		})
	}
}

// TestStatusOfBandEdges: pass u ≤ 1 − b, marginal 1 − b < u ≤ 1, fail u > 1 (design.md).
func TestStatusOfBandEdges(t *testing.T) {
	cases := []struct {
		u, band float64
		want    Status
	}{
		{0, 0.1, StatusPass},
		{0.9, 0.1, StatusPass}, // u = 1 − b exactly: pass
		{math.Nextafter(0.9, 1), 0.1, StatusMarginal},
		{0.95, 0.1, StatusMarginal},
		{1, 0.1, StatusMarginal}, // u = 1 exactly: marginal, not fail
		{1 + 1e-12, 0.1, StatusMarginal},
		{1.001, 0.1, StatusFail},
		{2, 0.1, StatusFail},
		{math.Inf(1), 0.1, StatusFail},
		{0.8, 0.2, StatusPass},
		{0.81, 0.2, StatusMarginal},
		{0.999, 0, StatusPass}, // no band: pass up to 1
		{1, 0, StatusPass},
		{1.0001, 0, StatusFail},
		{math.NaN(), 0.1, StatusError},
	}
	for _, tc := range cases {
		if got := StatusOf(tc.u, tc.band); got != tc.want {
			t.Errorf("StatusOf(%v, %v) = %v, want %v", tc.u, tc.band, got, tc.want)
		}
	}
	// The checker's band comes from Options.
	c, err := NewChecker(Options{Rules: isoChecker(t).Options().Rules, MarginalBand: 0.3, AsOf: asOf})
	if err != nil {
		t.Fatal(err)
	}
	// winchA's motor torque is at utilisation ≈ 0.72: pass with 10 %, marginal with 30 %.
	if st := mustCheck(t, c.Check(winchA(t).asset()), "motor-torque").Status; st != StatusMarginal {
		t.Errorf("motor-torque with band 0.3: %v, want marginal", st)
	}
	if st := mustCheck(t, isoChecker(t).Check(winchA(t).asset()), "motor-torque").Status; st != StatusPass {
		t.Errorf("motor-torque with band 0.1: %v, want pass", st)
	}
	for _, b := range []float64{-0.1, 1, 1.5} {
		if _, err := NewChecker(Options{Rules: c.Options().Rules, MarginalBand: b}); err == nil {
			t.Errorf("NewChecker accepted marginal band %v", b)
		}
	}
	if _, err := NewChecker(Options{}); err == nil {
		t.Error("NewChecker accepted no rule table")
	}
}

// TestMissingRequiredValue: a missing required value makes the checks that need it
// unchecked, naming the column (design.md "Bad input").
func TestMissingRequiredValue(t *testing.T) {
	c := isoChecker(t)
	r := c.Check(winchA(t).drop("brake_torque").asset())
	// Header text from design.md's column table ("Brake torque [N m]").
	for _, id := range []string{"brake-holding", "brake-stop", "gearbox-torque"} {
		cr := mustCheck(t, r, id)
		if cr.Status != StatusUnchecked || !strings.Contains(cr.Message, "Brake torque") {
			t.Errorf("%s: %v %q, want unchecked naming Brake torque", id, cr.Status, cr.Message)
		}
	}
	// Checks that do not need it still run.
	for _, id := range []string{"rope-design-factor", "motor-torque", "drum-ratio"} {
		if st := mustCheck(t, r, id).Status; st != StatusPass {
			t.Errorf("%s: %v, want pass", id, st)
		}
	}
	if r.Status != StatusUnchecked {
		t.Errorf("hoist status %v, want unchecked", r.Status)
	}
	// A load-dependent check that could not run leaves the hoist without a rating.
	if !math.IsNaN(r.MaxRatedLoadKg) || !strings.Contains(r.Rating.Note, "brake-holding") {
		t.Errorf("rating %.1f kg, note %q: want null, naming brake-holding", r.MaxRatedLoadKg, r.Rating.Note)
	}

	// No rated load at all: every load-dependent check is unchecked, naming Rated load.
	r = c.Check(winchA(t).drop("rated_load").asset())
	for _, cr := range r.Checks {
		if cr.LoadDependent && (cr.Status != StatusUnchecked || !strings.Contains(cr.Message, "Rated load")) {
			t.Errorf("%s: %v %q, want unchecked naming Rated load", cr.ID, cr.Status, cr.Message)
		}
	}
}

// TestBadCell: an unreadable cell makes the checks using it error, with the cell
// reference in the message (design.md: `Register!F14: "twelve" is not a number in [t]`).
func TestBadCell(t *testing.T) {
	c := isoChecker(t)
	ref, err := excelize.CoordinatesToCellName(colOf(t, "rope_mbf"), 7)
	if err != nil {
		t.Fatal(err)
	}
	ref = testSheet + "!" + ref
	r := c.Check(winchA(t).bad("rope_mbf", "lots", `"lots" is not a number in [kN]`).asset())
	cr := mustCheck(t, r, "rope-design-factor")
	if cr.Status != StatusError || !strings.Contains(cr.Message, ref) || !strings.Contains(cr.Message, `"lots"`) {
		t.Errorf("rope-design-factor: %v %q, want error with %s", cr.Status, cr.Message, ref)
	}
	if r.Status != StatusError {
		t.Errorf("hoist status %v, want error (nothing fails)", r.Status)
	}
	if !slices.ContainsFunc(r.Messages, func(m string) bool { return strings.Contains(m, ref) }) {
		t.Errorf("messages %q: want the bad cell %s", r.Messages, ref)
	}
	if !math.IsNaN(r.MaxRatedLoadKg) {
		t.Errorf("rating %.1f kg with an unreadable rope MBF, want null", r.MaxRatedLoadKg)
	}

	// A Bad value without an Error of its own is still located, from Value.Cell.
	a := winchA(t).asset()
	v := a.Fields["drum_diameter"]
	v.State, v.Raw, v.Err = Bad, "30O", nil
	a.Fields["drum_diameter"] = v
	r = c.Check(a)
	want := v.Cell.String()
	if cr := mustCheck(t, r, "drum-ratio"); cr.Status != StatusError || !strings.Contains(cr.Message, want) {
		t.Errorf("drum-ratio: %v %q, want error with %s", cr.Status, cr.Message, want)
	}

	// An optional value with a default that is present but unreadable is an error, not
	// silently replaced by the default.
	r = c.Check(winchA(t).bad("hook_block_mass", "heavy", `"heavy" is not a number in [kg]`).asset())
	if cr := mustCheck(t, r, "rope-design-factor"); cr.Status != StatusError {
		t.Errorf("rope-design-factor with a bad hook block mass: %v, want error", cr.Status)
	}
	if slices.ContainsFunc(r.DefaultsUsed, func(s string) bool { return strings.Contains(s, "hook block") }) {
		t.Errorf("defaults %q: a bad cell must not be reported as a default", r.DefaultsUsed)
	}
	// The bad cell never stops the other checks.
	if st := mustCheck(t, r, "drum-ratio").Status; st != StatusPass {
		t.Errorf("drum-ratio: %v, want pass", st)
	}
}

// TestDefaultsUsed: every default the evaluation rests on is listed (design.md: "Every
// result lists the defaults it used (hook block mass 0, an efficiency, a delay)"), and
// the default is the value actually used.
func TestDefaultsUsed(t *testing.T) {
	c := isoChecker(t)
	a := winchA(t).drop("hook_block_mass").drop("sheave_efficiency").asset()
	r := c.Check(a)
	for _, want := range []string{"hook block mass 0 kg", "sheave efficiency 0.98", "gear efficiency 0.94", "brake delay 0.3 s", "acceleration 0.3", "motor peak torque 1.6"} {
		if !slices.ContainsFunc(r.DefaultsUsed, func(s string) bool { return strings.Contains(s, want) }) {
			t.Errorf("defaults %q: want %q", r.DefaultsUsed, want)
		}
	}
	// The defaults are the ones used: rope design factor utilisation = Zp m g/(n η_R MBF)
	// with m_H = 0 and η_s = 0.98 (η_R = 0.99, standards.md "Reeving"; Zp 4.5 for M5,
	// standards.md ISO 4308-1, seen).
	want := 4.5 * 5000 * g / (4 * 0.99 * 136.8e3)
	if got := mustCheck(t, r, "rope-design-factor").Utilisation; !approxEqual(got, want, 0, 1e-12) {
		t.Errorf("rope-design-factor utilisation %.9f, want %.9f", got, want)
	}
	// A given value is not reported as a default.
	r = c.Check(winchA(t).asset())
	for _, s := range r.DefaultsUsed {
		if strings.Contains(s, "hook block") || strings.Contains(s, "sheave efficiency") {
			t.Errorf("default %q reported although the register gives the value", s)
		}
	}
	// Every default is reported once.
	seen := map[string]bool{}
	for _, s := range r.DefaultsUsed {
		if seen[s] {
			t.Errorf("default %q reported twice", s)
		}
		seen[s] = true
	}
}

// TestBlankRow: an empty row is kept, unchecked, with a located message and no checks.
func TestBlankRow(t *testing.T) {
	a := &Asset{Row: 12, Blank: true}
	r := isoChecker(t).Check(a)
	if r.Status != StatusUnchecked || len(r.Checks) != 0 || !math.IsNaN(r.MaxRatedLoadKg) {
		t.Errorf("blank row: %v, %d checks, rating %v", r.Status, len(r.Checks), r.MaxRatedLoadKg)
	}
	if len(r.Messages) == 0 || !strings.Contains(r.Messages[0], "12") {
		t.Errorf("messages %q: want the row number", r.Messages)
	}
}

// TestEveryCheckReported: a complete hoist reports every check id, in CheckIDs order.
func TestEveryCheckReported(t *testing.T) {
	r := isoChecker(t).Check(winchA(t).asset())
	var ids []string
	for _, cr := range r.Checks {
		ids = append(ids, cr.ID)
	}
	if !slices.Equal(ids, CheckIDs) {
		t.Errorf("checks %v, want %v", ids, CheckIDs)
	}
	if r.Status != StatusPass {
		for _, cr := range r.Checks {
			t.Logf("%s %v %s", cr.ID, cr.Status, cr.Message)
		}
		t.Errorf("winchA status %v, want pass (a sound design)", r.Status)
	}
}

// TestCheckSpecKeysInSchema: every field a check needs or uses is a column of the schema
// (templates/columns.csv), so that its schema index exists and an empty or unreadable
// cell in it is never overlooked.
func TestCheckSpecKeysInSchema(t *testing.T) {
	c := isoChecker(t)
	for _, s := range c.specs {
		for _, list := range [][]string{s.Needs, s.Uses} {
			for _, k := range list {
				if _, ok := c.keys.lookup(k); !ok {
					t.Errorf("%s: field %q is not in the schema", s.ID, k)
				}
			}
		}
		layered := len(s.Needs)
		if s.NeedsOuterLayer {
			layered++
		}
		if len(s.needsAt) != len(s.Needs) || len(s.usesAt) != len(s.Uses) || len(s.needsLayeredAt) != layered {
			t.Errorf("%s: index lists do not match the key lists", s.ID)
		}
	}
}

// TestValuesAndFieldsAgree: an asset whose fields are in Values (as the readers fill
// them) and the same asset keyed in Fields give identical results.
func TestValuesAndFieldsAgree(t *testing.T) {
	c := isoChecker(t, stopDistanceRule)
	for name, a := range map[string]*Asset{"winch A": winchA(t).asset(), "winch B": winchB(t).asset(),
		"proposed": winchA(t).num("proposed_rated_load", 6000).asset()} {
		b := &Asset{Row: a.Row, ID: a.ID, Cells: a.Cells, Problems: a.Problems}
		for k, v := range a.Fields {
			if err := b.Set(k, v); err != nil {
				t.Fatal(err)
			}
		}
		if sa, sb := resultText(c.Check(a)), resultText(c.Check(b)); sa != sb {
			t.Errorf("%s: results differ:\nFields %s\nValues %s", name, sa, sb)
		}
	}
	if err := (&Asset{}).Set("no_such_field", Value{}); err == nil {
		t.Error("Set of an unknown key: no error")
	}
}

// resultText prints everything a result carries except the asset pointer.
func resultText(r *Result) string {
	p := "none"
	if r.Proposed != nil {
		p = fmt.Sprintf("%+v", *r.Proposed)
	}
	return fmt.Sprintf("%+v|%+v|%q|%q|%q|%v|%s", r.Evaluation, r.Rating, r.Messages, r.DefaultsUsed, r.Derived, r.rules, p)
}

// TestDerivedMBFIsADefault (design.md Revision 2): a minimum breaking force derived from
// grade and construction (EN 12385-4 F_min = d² R K / 1000: 14² × 1960 × 0.356 / 1000 =
// 136.8 kN for 14 mm 6x36 IWRC 1960, computed) is listed in defaults_used, since no
// certificate stands behind it; a certificate value in the register always wins.
func TestDerivedMBFIsADefault(t *testing.T) {
	c := isoChecker(t)
	r := c.Check(winchA(t).drop("rope_mbf").num("rope_grade", 1960).text("rope_construction", "6x36 IWRC").asset())
	found := false
	for _, s := range r.DefaultsUsed {
		if strings.Contains(s, "rope MBF 136.8 kN derived from grade and construction") {
			found = true
		}
	}
	if !found {
		t.Errorf("defaults_used %q: want the derived MBF (136.8 kN) listed", r.DefaultsUsed)
	}
	given := c.Check(winchA(t).num("rope_grade", 1960).text("rope_construction", "6x36 IWRC").asset())
	for _, s := range given.DefaultsUsed {
		if strings.Contains(s, "rope MBF") {
			t.Errorf("MBF given in the register, yet defaults_used lists %q", s)
		}
	}
}
