package fleet

import (
	"go/ast"
	"go/parser"
	"go/token"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"hoistfleet/fleet/rules"
)

// resolveRuleIDs are the rule ids that resolving a hoist reads (judgement defaults and
// the usage-to-duty assumptions), not any one check.
var resolveRuleIDs = []string{
	"default.sheave_efficiency", "default.gear_efficiency", "default.peak_torque_ratio",
	"default.brake_delay", "default.acceleration", "default.design_years", "default.working_days",
}

// unreadRuleIDs are known rule ids with rows in the tables that no check reads yet, each
// with the reason (none now: rope_wear.broken_wires_strand is read since the register
// has a column for the broken wires in one strand).
var unreadRuleIDs = []string{}

// TestDefinitionsAreComplete: every check declares what the rest of the tool needs, so
// that a new check that forgets something fails here rather than misbehaving quietly.
func TestDefinitionsAreComplete(t *testing.T) {
	seen := map[string]bool{}
	for _, d := range Definitions() {
		if d.ID == "" || seen[d.ID] {
			t.Errorf("check id %q is empty or declared twice", d.ID)
		}
		seen[d.ID] = true
		if d.prepare == nil {
			t.Errorf("%s: no prepare (no calc function)", d.ID)
		}
		if len(d.Rules) == 0 && (d.Rule == "" || d.Source == "") {
			t.Errorf("%s: no rule ids and no Rule/Source text: its results would name no limit and no source", d.ID)
		}
		if len(d.OptionalRules) > 0 && (d.Rule == "" || d.Source == "") {
			t.Errorf("%s: optional rules need a Rule/Source text for when no row applies", d.ID)
		}
		if d.Linear && !d.LoadDependent {
			t.Errorf("%s: linear but not load-dependent", d.ID)
		}
		if d.NullsRating && d.LoadDependent {
			t.Errorf("%s: a load-dependent check sets the rating; it cannot also null it", d.ID)
		}
		if len(d.Reference) == 0 {
			t.Errorf("%s: no reference test against outside values", d.ID)
		}
	}
	if !slices.Equal(CheckIDs, func() []string {
		var ids []string
		for _, d := range Definitions() {
			ids = append(ids, d.ID)
		}
		return ids
	}()) {
		t.Errorf("CheckIDs %v differ from the definitions' order", CheckIDs)
	}
}

// TestDefinitionRulesInBothProfiles: every rule id a check declares is a known rule id
// with at least one row in each built-in profile, and every known rule id is read by a
// check or by resolving the hoist (an id nobody reads is a limit that is never applied).
func TestDefinitionRulesInBothProfiles(t *testing.T) {
	claimed := map[string]bool{}
	for _, id := range resolveRuleIDs {
		claimed[id] = true
	}
	for _, id := range AttentionRuleIDs { // read by the summary's attention order
		claimed[id] = true
	}
	for _, profile := range rules.Profiles() {
		tab, err := rules.Profile(profile)
		if err != nil {
			t.Fatal(err)
		}
		rows := map[string]bool{}
		for _, r := range tab.Rules {
			rows[r.ID] = true
		}
		for _, d := range Definitions() {
			for _, id := range d.Rules {
				claimed[id] = true
				if !rows[id] {
					t.Errorf("%s: rule %s has no row in the %s profile", d.ID, id, profile)
				}
			}
			for _, id := range d.OptionalRules {
				claimed[id] = true
			}
		}
		for _, id := range resolveRuleIDs {
			if !rows[id] {
				t.Errorf("resolve: rule %s has no row in the %s profile", id, profile)
			}
		}
	}
	known := rules.KnownRuleIDs()
	for id := range claimed {
		if !slices.Contains(known, id) {
			t.Errorf("rule %s is declared by a check but is not a known rule id (templates)", id)
		}
	}
	for _, id := range known {
		if !claimed[id] && !slices.Contains(unreadRuleIDs, id) {
			t.Errorf("known rule id %s is read by no check and not by resolve", id)
		}
	}
}

// TestDefinitionRulesAreTheOnesRead runs every check's prepare on two realistic hoists under
// both profiles and compares the rule rows it read with the ids its definition declares.
func TestDefinitionRulesAreTheOnesRead(t *testing.T) {
	for _, profile := range rules.Profiles() {
		tab, err := rules.Profile(profile)
		if err != nil {
			t.Fatal(err)
		}
		c, err := NewChecker(Options{Rules: tab})
		if err != nil {
			t.Fatal(err)
		}
		for _, a := range []*Asset{winchA(t).asset(), winchB(t).asset()} {
			s := c.getScratch()
			d := &s.d
			c.resolve(a, d)
			for i := range c.specs {
				spec := &c.specs[i]
				before := len(d.rules)
				c.prepare(d, spec)
				for _, row := range d.rules[before:] {
					id := tab.Rules[row].ID
					if !slices.Contains(spec.Rules, id) && !slices.Contains(spec.OptionalRules, id) {
						t.Errorf("%s (%s, %s): read rule %s, which its definition does not declare", spec.ID, profile, a.ID, id)
					}
				}
			}
			c.putScratch(s)
		}
	}
}

// TestDefinitionsInReadme: README.md describes every check (its id in backquotes).
func TestDefinitionsInReadme(t *testing.T) {
	b, err := os.ReadFile(filepath.Join("..", "README.md"))
	if err != nil {
		t.Fatal(err)
	}
	for _, id := range CheckIDs {
		if !strings.Contains(string(b), "`"+id+"`") {
			t.Errorf("README.md does not describe check %s", id)
		}
	}
}

// TestDefinitionReferenceTestsExist: the reference tests a definition names exist in calc.
func TestDefinitionReferenceTestsExist(t *testing.T) {
	files, err := filepath.Glob(filepath.Join("..", "calc", "*_test.go"))
	if err != nil || len(files) == 0 {
		t.Fatalf("calc tests: %v", err)
	}
	funcs := map[string]bool{}
	fset := token.NewFileSet()
	for _, f := range files {
		file, err := parser.ParseFile(fset, f, nil, parser.SkipObjectResolution)
		if err != nil {
			t.Fatal(err)
		}
		for _, decl := range file.Decls {
			if fn, ok := decl.(*ast.FuncDecl); ok && fn.Recv == nil {
				funcs[fn.Name.Name] = true
			}
		}
	}
	for _, d := range Definitions() {
		for _, name := range d.Reference {
			if !funcs[name] {
				t.Errorf("%s: reference test %s is not in calc", d.ID, name)
			}
		}
	}
}

// TestOverloadLimiterPaths follows the overload-limiter check through its definition: the
// ISO profile requires a limiter from 1 000 kg (Machinery Directive 2006/42/EC Annex I
// 4.2.2, memory, medium-high), the US profile has no such row.
func TestOverloadLimiterPaths(t *testing.T) {
	us, err := rules.Profile("us")
	if err != nil {
		t.Fatal(err)
	}
	usChecker, err := NewChecker(Options{Rules: us, MarginalBand: 0.10, AsOf: asOf})
	if err != nil {
		t.Fatal(err)
	}
	iso := isoChecker(t)
	cases := []struct {
		name    string
		c       *Checker
		a       *Asset
		want    Status
		message string
	}{
		{"ISO, fitted and tested", iso, winchA(t).asset(), StatusPass, "next overload limiter test due 2027-03-01"},
		{"ISO, 5 t, register silent", iso, winchA(t).drop("limiter_fitted").drop("limiter_last_test").asset(), StatusUnchecked, "needs Overload limiter (yes or no): the rules require one from 1000 kg"},
		{"ISO, 5 t, none fitted", iso, winchA(t).text("limiter_fitted", "no").asset(), StatusFail, "no overload limiter fitted"},
		{"ISO, fitted, no test date", iso, winchA(t).drop("limiter_last_test").asset(), StatusUnchecked, "needs Limiter last tested"},
		{"ISO, 0.5 t, register silent", iso, winchA(t).num("rated_load", 500).drop("limiter_fitted").asset(), StatusInfo, "not applicable"},
		{"US, register silent", usChecker, winchA(t).drop("limiter_fitted").asset(), StatusInfo, "not applicable"},
		{"US, none fitted", usChecker, winchA(t).text("limiter_fitted", "no").asset(), StatusInfo, "require none"},
	}
	for _, tc := range cases {
		r := tc.c.Check(tc.a)
		cr := mustCheck(t, r, "overload-limiter")
		if cr.Status != tc.want || !strings.Contains(cr.Message, tc.message) {
			t.Errorf("%s: %s %q, want %s with %q", tc.name, cr.Status, cr.Message, tc.want, tc.message)
		}
	}
}

// TestNextInspectionColumnGoverns: a register keeping six-monthly examinations (its own
// Next inspection due column) makes a hoist overdue that the rules' 12 months would pass
// (the silent misread of issue 14). Winch A: last inspection 2026-03-01, as of
// 2026-06-01; register due 2026-05-01 → 31 days overdue (May has 31 days).
func TestNextInspectionColumnGoverns(t *testing.T) {
	c := isoChecker(t)
	plain := mustCheck(t, c.Check(winchA(t).asset()), "inspection-due")
	if plain.Status != StatusPass {
		t.Fatalf("without the column: %s, want pass", plain.Status)
	}
	r := c.Check(winchA(t).date("next_inspection", time.Date(2026, 5, 1, 0, 0, 0, 0, time.UTC)).asset())
	cr := mustCheck(t, r, "inspection-due")
	if cr.Status != StatusFail || !strings.Contains(cr.Message, "overdue by 31 days") || !strings.Contains(r.Action, "31 days overdue") {
		t.Errorf("with the register's 6-monthly date: %s %q, action %q; want fail, 31 days overdue", cr.Status, cr.Message, r.Action)
	}
}

// TestInspectionIntervalColumnGoverns: the register's own interval (Inspection interval
// [months]) works as its next due date does. Winch A: last inspection 2026-03-01, as of
// 2026-06-01; a 2-month interval falls due 2026-05-01 → 31 days overdue; 2.5 months is no
// whole number of months: an error of the check, not a guess.
func TestInspectionIntervalColumnGoverns(t *testing.T) {
	c := isoChecker(t)
	r := c.Check(winchA(t).num("inspection_interval", 2).asset())
	cr := mustCheck(t, r, "inspection-due")
	if cr.Status != StatusFail || !strings.Contains(cr.Message, "overdue by 31 days") || !strings.Contains(cr.Message, "2-month interval governs") {
		t.Errorf("2-month interval: %s %q; want fail, 31 days overdue, the interval governs", cr.Status, cr.Message)
	}
	half := mustCheck(t, c.Check(winchA(t).num("inspection_interval", 2.5).asset()), "inspection-due")
	if half.Status != StatusError || !strings.Contains(half.Message, "not a whole number of months") {
		t.Errorf("2.5 months: %s %q; want error", half.Status, half.Message)
	}
}

// TestMissingDataIsUncheckedNotError: a column left blank (n/a) makes the checks that
// need it unchecked, naming it, never an error with a calculation's internal message.
func TestMissingDataIsUncheckedNotError(t *testing.T) {
	c := isoChecker(t)
	for _, key := range []string{"gear_ratio", "drum_diameter"} {
		r := c.Check(winchA(t).drop(key).asset())
		for _, cr := range r.Checks {
			if cr.Status == StatusError {
				t.Errorf("%s blank: %s is an error: %s", key, cr.ID, cr.Message)
			}
		}
	}
	mp := mustCheck(t, c.Check(winchA(t).drop("gear_ratio").asset()), "motor-power")
	if mp.Status != StatusPass {
		t.Errorf("gear ratio blank: motor-power %s %q, want it checked (the power does not need the ratio)", mp.Status, mp.Message)
	}
}
