// Package rules is the rule engine: rule rows and tables, the "when" conditions, lookup
// of the most specific row for a hoist, parsing and validation of rule files. The
// built-in tables are embedded in package templates.
package rules

import (
	"bufio"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"sort"
	"strconv"
	"strings"
	"sync"

	"hoistfleet/io/units"
	"hoistfleet/templates"
)

// Rule tables
//
// A rule table is CSV with exactly these columns, in any order, one header row:
//
//	rule,groups,when,value,unit,source,provenance,note
//
// rule is a known rule id (KnownRuleIDs) or a user extension starting with "x.".
// groups is "all", one ISO 4301-1 mechanism group ("M5") or a range ("M1-M4").
// when is empty or conditions joined by " and ", each name=value (text, compared
// without regard to case; a number for a numeric name) or name<=number, name<number,
// name>=number, name>number. Condition names are those of a Scope: see ConditionNames.
// value is a number, or a word for the rules that take one (rope.basis, brake.each,
// rope_wear.basis). unit is one of RuleUnits; empty for words. source names the
// standard, clause or table and edition; provenance is a label of the project's
// standards notes: "seen", "law", "computed", "memory, <confidence>" or
// "common practice, no published source". Lines whose first field starts with # are
// comments; empty lines are skipped.
//
// Example row:
//
//	rope.design_factor,M6,,5.6,1,"ISO 4308-1, Zp, running ropes",seen,
//
// Lookup picks, among the rows of an id that match the hoist's group and all their
// conditions, the most specific one: most conditions first, then the narrowest group
// span (one group beats a range beats "all"), then the later row. A row whose
// provenance is "memory, low" is a review limit: it is looked up apart from the verified
// rows (LookupIndexes), and the checks judge against it at worst marginal, never fail
// (design.md Revision 2). A rule file confirms it by a row with the same rule, groups and
// when and the provenance seen or law, which replaces it.

// RuleColumns are the columns of a rule table, in the order the built-in tables use.
var RuleColumns = [...]string{"rule", "groups", "when", "value", "unit", "source", "provenance", "note"}

// Rule is one row of a rule table.
type Rule struct {
	ID         string // rule id, e.g. "rope.design_factor"
	Groups     string // "all", "M5" or "M1-M4", normalised
	When       string // conditions joined by " and ", as written; "" for none
	Value      string // a number or, for word rules, a word
	Unit       string // one of RuleUnits; "" for words
	Source     string // standard, clause or table, edition
	Provenance string // "seen", "law", "computed", "memory, medium", "common practice, no published source"
	Note       string
	Origin     string // "built-in iso", "built-in us", or the user's rule file
	Line       int    // line (CSV) or row (sheet) of the row in its origin
}

// String is the rule in words for a check's "rule" field:
// "rope.design_factor = 5.6 (M6)", "brake.factor = 1.0 (all; control=mechanical)".
func (r Rule) String() string {
	var b strings.Builder
	b.WriteString(r.ID)
	b.WriteString(" = ")
	b.WriteString(r.Value)
	if r.Unit != "" && r.Unit != "1" {
		b.WriteString(" ")
		b.WriteString(r.Unit)
	}
	b.WriteString(" (")
	b.WriteString(r.Groups)
	if r.When != "" {
		b.WriteString("; ")
		b.WriteString(r.When)
	}
	b.WriteString(")")
	return b.String()
}

// Cite is the source with its provenance label: "ISO 4308-1 …, Zp [seen]".
func (r Rule) Cite() string {
	return r.Source + " [" + r.Provenance + "]"
}

// Float returns the value as a number in the rule's own unit (an "in" value stays in
// inches: see ValueSI). Words, NaN and infinities are errors.
func (r Rule) Float() (float64, error) {
	v, err := parseNumber(r.Value)
	if err != nil {
		return 0, fmt.Errorf("rule %s (%s:%d): value %q: %w", r.ID, r.Origin, r.Line, r.Value, err)
	}
	return v, nil
}

// unitInfo describes a rule unit: its dimension and the factor to the unit the checks
// compute in.
type unitInfo struct {
	dim    string
	factor float64
}

// ruleUnits maps each accepted rule unit to its dimension and the factor that takes a
// value to the unit the checks work in. Ratios, lengths, accelerations and seconds are
// converted with io/units' exact factors (NIST SP 811: in = 0.0254 m, ft = 0.3048 m);
// time in hours, calendar months and years, days a year and angles in degrees are not
// converted: the checks report them in those units (design.md).
var ruleUnits = ruleUnitTable([]struct{ unit, dim, quantity string }{
	{"1", "ratio", "ratio"},
	{"%", "ratio", "ratio"},
	{"mm", "length", "length"},
	{"m", "length", "length"},
	{"in", "length", "length"},
	{"ft", "length", "length"},
	{"deg", "angle", ""},
	{"s", "time_s", "time"},
	{"h", "time_h", ""},
	{"months", "months", ""},
	{"years", "years", ""},
	{"d/year", "days_per_year", ""},
	{"1/h", "per_hour", ""},
	{"kg", "mass", "mass"},
	{"t", "mass", "mass"},
	{"m/s2", "acceleration", "acceleration"},
	{"ft/s2", "acceleration", "acceleration"},
})

// ruleUnitTable makes ruleUnits: a unit with an io/units quantity takes its factor
// from units.Factor, a unit without one is not converted. A unit io/units does not
// accept is a programming error (every rule unit has a case in TestValueSI).
func ruleUnitTable(list []struct{ unit, dim, quantity string }) map[string]unitInfo {
	m := make(map[string]unitInfo, len(list))
	for _, u := range list {
		f := 1.0
		if u.quantity != "" {
			var err error
			if f, err = units.Factor(u.quantity, u.unit); err != nil {
				panic("rules: rule unit " + u.unit + ": " + err.Error())
			}
		}
		m[u.unit] = unitInfo{u.dim, f}
	}
	return m
}

// RuleUnits lists the units a rule row may carry (besides "" for word values).
func RuleUnits() []string {
	out := make([]string, 0, len(ruleUnits))
	for u := range ruleUnits {
		out = append(out, u)
	}
	sort.Strings(out)
	return out
}

// ValueSI returns the value converted by its unit to the unit the checks compute in:
//
//	"1" → as is; "%" → ÷ 100; "mm" → m (× 0.001); "m" → m; "in" → m (× 0.0254);
//	"ft" → m (× 0.3048); "m/s2" → m/s²; "ft/s2" → m/s² (× 0.3048); "s" → s;
//	"kg" → kg; "t" → kg (× 1000);
//	"h" → hours (NOT seconds: design-life works in hours, FEM 9.755);
//	"months", "years", "d/year" → as is (calendar units); "1/h" → per hour (as is:
//	motor starts are counted an hour); "deg" → degrees (as is).
//
// Factors are exact (NIST SP 811). Words and an unknown unit are errors.
func (r Rule) ValueSI() (float64, error) {
	v, err := r.Float()
	if err != nil {
		return 0, err
	}
	u, ok := ruleUnits[r.Unit]
	if !ok {
		return 0, fmt.Errorf("rule %s (%s:%d): unit %q is not a rule unit", r.ID, r.Origin, r.Line, r.Unit)
	}
	return v * u.factor, nil
}

// Dimension is the kind of quantity of the rule's unit: "ratio", "length", "mass", "angle",
// "time_s", "time_h", "months", "years", "days_per_year", "per_hour", "acceleration", or "" for a
// word value. rope_wear.max_reduction is a "ratio" in the ISO profile (a fraction of
// the reference diameter) and a "length" in the US profile (ASME B30.2 table).
func (r Rule) Dimension() string {
	return ruleUnits[r.Unit].dim
}

// ruleSpec says what a known rule id accepts.
type ruleSpec struct {
	words []string // allowed words; nil for a number
	dims  []string // allowed dimensions of the unit, for a number
	min   float64  // smallest allowed value, in the check's unit
	max   float64  // largest allowed value (Inf for none)
	minEx bool     // min itself is excluded
}

var (
	factorSpec = ruleSpec{dims: []string{"ratio"}, min: 0, minEx: true, max: math.Inf(1)}
	effSpec    = ruleSpec{dims: []string{"ratio"}, min: 0, minEx: true, max: 1}
	countSpec  = ruleSpec{dims: []string{"ratio"}, min: 0, max: math.Inf(1)}
	angleSpec  = ruleSpec{dims: []string{"angle"}, min: 0, max: 90}
)

// knownRules are the rule ids the checks look up. A rule file may add ids starting with
// "x." (user extensions, listed but not used by the checks).
var knownRules = map[string]ruleSpec{
	"rope.design_factor":            factorSpec,
	"rope.basis":                    {words: []string{"hoisting", "static"}},
	"drum.h1":                       factorSpec,
	"sheave.h2":                     factorSpec,
	"drum.dead_wraps":               countSpec,
	"fleet_angle.max_grooved":       angleSpec,
	"fleet_angle.max_plain":         angleSpec,
	"fleet_angle.min":               angleSpec,
	"hoist_speed.tolerance":         ruleSpec{dims: []string{"ratio"}, min: 0, minEx: true, max: 1},
	"brake.factor":                  factorSpec,
	"brake.each":                    {words: []string{"yes", "no"}},
	"gearbox.peak_factor":           factorSpec,
	"brake.basis":                   {words: []string{"hoisting", "static"}},
	"brake.each_factor":             factorSpec,
	"brake.needs_control_braking":   {words: []string{"yes", "no"}},
	"brake.min_brakes":              countSpec,
	"brake_stop.max_distance":       {dims: []string{"length"}, min: 0, minEx: true, max: math.Inf(1)},
	"default.sheave_efficiency":     effSpec,
	"default.gear_efficiency":       effSpec,
	"default.peak_torque_ratio":     ruleSpec{dims: []string{"ratio"}, min: 1, max: 10},
	"default.brake_delay":           {dims: []string{"time_s"}, min: 0, max: 10},
	"default.acceleration":          {dims: []string{"acceleration"}, min: 0, minEx: true, max: 10},
	"default.design_years":          {dims: []string{"years"}, min: 0, minEx: true, max: 100},
	"default.working_days":          {dims: []string{"days_per_year"}, min: 0, minEx: true, max: 366},
	"life.duration_h":               {dims: []string{"time_h"}, min: 0, minEx: true, max: math.Inf(1)},
	"life.record_factor":            factorSpec,
	"inspection.interval_months":    {dims: []string{"months"}, min: 0, minEx: true, max: 120},
	"load_test.factor":              factorSpec,
	"load_test.proposed_factor":     factorSpec,
	"rope_wear.basis":               {words: []string{"reference", "nominal"}},
	"rope_wear.max_reduction":       {dims: []string{"ratio", "length"}, min: 0, minEx: true, max: math.Inf(1)},
	"rope_wear.broken_wires_lay":    countSpec,
	"rope_wear.broken_wires_strand": countSpec,
	"limiter.required_from":         {dims: []string{"mass"}, min: 0, max: math.Inf(1)},
	"limiter.test_interval_months":  {dims: []string{"months"}, min: 0, minEx: true, max: 120},
	// The attention order's weights (fleet.AttentionWeights: read by the summary, not a check).
	"attention.exposure_weight":  countSpec,
	"attention.unstated_weight":  countSpec,
	"attention.status_weight":    countSpec,
	"limiter.max_setting":        {dims: []string{"ratio"}, min: 1, max: 10},
	"limit.upper_required":       {words: []string{"yes", "no"}},
	"limit.lower_required":       {words: []string{"yes", "no"}},
	"limit.test_interval_months": {dims: []string{"months"}, min: 0, minEx: true, max: 120},
	"motor.min_duty_factor":      effSpec,
	"motor.min_starts":           {dims: []string{"per_hour"}, min: 0, minEx: true, max: 100000},
	"motor.starts_per_cycle":     {dims: []string{"ratio"}, min: 1, max: 100},
	"brake_energy.factor":        factorSpec,
}

// KnownRuleIDs lists the rule ids the checks use, sorted.
func KnownRuleIDs() []string {
	out := make([]string, 0, len(knownRules))
	for id := range knownRules {
		out = append(out, id)
	}
	sort.Strings(out)
	return out
}

// conditionNames are the names a "when" condition may test, with their allowed text
// values (nil for a numeric name).
var conditionNames = map[string][]string{
	"special": {"none", "hot metal", "personnel"},
	"control": {"none", "mechanical", "electrical"},
	"brakes":  nil,
	"service": {"normal", "heavy", "severe"},
	"records": {"meter and log", "log", "none"},
	"test":    {"static", "dynamic"},
	"rope":    {"fibre core", "steel core", "rotation resistant"},
	"d_mm":    nil,
	"grooved": {"yes", "no"},
	// the attention order's weights: the register's Exposure, a hoist's status
	"exposure": {"people below", "hazardous load", "process critical", "low"},
	"status":   {"fail", "error", "unchecked", "marginal", "pass"},
}

// ConditionNames lists the names a rule's conditions may test (a Scope supplies them),
// sorted. Names starting with "x." are user extensions and accepted too.
func ConditionNames() []string {
	out := make([]string, 0, len(conditionNames))
	for n := range conditionNames {
		out = append(out, n)
	}
	sort.Strings(out)
	return out
}

// Scope is what a hoist offers to the rule conditions: its mechanism group (1..8 for
// M1..M8, 0 when unknown: then only "all" rows match), text attributes (special,
// control, service, records, test, rope, grooved) and numbers (brakes, d_mm). A
// condition whose name the scope lacks does not match.
type Scope struct {
	Group int
	Attrs map[string]string
	Nums  map[string]float64
}

// Table is the rule table in force: a profile's built-in rows, possibly overridden.
// Lookup is safe for concurrent use once the table is built.
type Table struct {
	Profile string
	Rules   []Rule

	compiled []compiledRule   // parallel to Rules when built by this package
	byID     map[string][]int // rows of each id, in table order (built with compiled)
}

// Profiles lists the built-in rule profiles.
func Profiles() []string { return []string{"iso", "us"} }

var (
	builtinOnce sync.Once
	builtin     map[string][]Rule
	builtinErr  error
)

func loadBuiltin() {
	builtin = map[string][]Rule{}
	for _, p := range Profiles() {
		data, err := templates.RuleTable(p)
		if err != nil {
			builtinErr = fmt.Errorf("built-in rule profile %s: %w", p, err)
			return
		}
		rs, err := ParseRules(strings.NewReader(string(data)), "built-in "+p)
		if err != nil {
			builtinErr = err
			return
		}
		builtin[p] = rs
	}
}

// Profile returns a fresh copy of the named built-in rule table ("iso" or "us").
func Profile(name string) (*Table, error) {
	builtinOnce.Do(loadBuiltin)
	if builtinErr != nil {
		return nil, builtinErr
	}
	rs, ok := builtin[strings.ToLower(strings.TrimSpace(name))]
	if !ok {
		return nil, fmt.Errorf("rule profile %q: unknown (built-in profiles: %s)", name, strings.Join(Profiles(), ", "))
	}
	return NewTable(strings.ToLower(strings.TrimSpace(name)), rs)
}

// NewTable builds a table from rows (copied), checking every group and condition.
func NewTable(profile string, rules []Rule) (*Table, error) {
	t := &Table{Profile: profile, Rules: append([]Rule(nil), rules...)}
	t.compiled = make([]compiledRule, len(t.Rules))
	for i, r := range t.Rules {
		c, err := compile(r)
		if err != nil {
			return nil, fmt.Errorf("%s:%d: %w", r.Origin, r.Line, err)
		}
		t.compiled[i] = c
	}
	t.index()
	return t, nil
}

// index precomputes each row's text, citation and SI value and groups the rows by id,
// so that a lookup per hoist scans only its id's rows and allocates nothing.
func (t *Table) index() {
	t.byID = make(map[string][]int)
	for i := range t.Rules {
		r := &t.Rules[i]
		t.byID[r.ID] = append(t.byID[r.ID], i)
		c := &t.compiled[i]
		c.text, c.cite = r.String(), r.Cite()
		c.si, c.siErr = r.ValueSI()
		c.review = IsReviewProvenance(r.Provenance)
	}
}

// Override returns a new table: each user row replaces the built-in rows with the same
// (ID, Groups, When), and every user row is placed after the remaining rows, so that a
// user row wins a tie in Lookup. t is not changed. User rows are expected to come from
// ParseRules / ParseRuleRecords; a row whose groups or conditions do not parse is kept
// in Rules but never matches.
func (t *Table) Override(user []Rule) *Table {
	key := func(r Rule) string {
		return r.ID + "\x00" + normGroups(r.Groups) + "\x00" + normWhen(r.When)
	}
	replaced := map[string]bool{}
	for _, u := range user {
		replaced[key(u)] = true
	}
	out := &Table{Profile: t.Profile}
	for _, r := range t.Rules {
		if !replaced[key(r)] {
			out.Rules = append(out.Rules, r)
		}
	}
	out.Rules = append(out.Rules, user...)
	out.compiled = make([]compiledRule, len(out.Rules))
	for i, r := range out.Rules {
		c, err := compile(r)
		if err != nil {
			c = compiledRule{never: true}
		}
		out.compiled[i] = c
	}
	out.index()
	return out
}

// Lookup returns the rule for id that applies in scope s: among the rows of id whose
// groups include s.Group and whose conditions all hold, the one with the most
// conditions; then the narrowest group span (one group, a range, "all"); then the later
// row. ok is false when no row applies.
func (t *Table) Lookup(id string, s Scope) (Rule, bool) {
	i := t.LookupIndex(id, s)
	if i < 0 {
		return Rule{}, false
	}
	return t.Rules[i], true
}

// LookupIndex is Lookup returning the row's index in t.Rules, or -1 when no row
// applies. It considers the verified rows only: a review row (IsReviewProvenance) is
// found by LookupIndexes. With an indexed table (NewTable, Profile, Override) it
// allocates nothing.
func (t *Table) LookupIndex(id string, s Scope) int {
	i, _ := t.LookupIndexes(id, s)
	return i
}

// IsReviewProvenance reports whether a provenance label makes its row a review limit:
// "memory, low", a value recalled with low confidence (design.md Revision 2, "Review
// limits"). A check judged against a review row is at worst marginal, never fail, and
// the rating search does not use it. A rule file confirms such a row by giving it the
// provenance seen or law.
func IsReviewProvenance(p string) bool {
	return strings.ToLower(strings.Join(strings.Fields(p), " ")) == "memory, low"
}

// IsReview reports whether row i of the table is a review limit (IsReviewProvenance).
func (t *Table) IsReview(i int) bool {
	if len(t.compiled) == len(t.Rules) && t.byID != nil {
		return t.compiled[i].review
	}
	return IsReviewProvenance(t.Rules[i].Provenance)
}

// LookupIndexes returns, for id in scope s, the verified row that applies (as
// LookupIndex) and the review row that applies (a row whose provenance is "memory,
// low"), each chosen among its own kind by Lookup's order; -1 where none applies.
func (t *Table) LookupIndexes(id string, s Scope) (verified, review int) {
	var best, bestConds, bestSpan [2]int
	best, bestConds = [2]int{-1, -1}, [2]int{-1, -1}
	consider := func(i int, c *compiledRule, rv bool) {
		if !c.matches(s) {
			return
		}
		k := 0
		if rv {
			k = 1
		}
		span := c.hi - c.lo
		if len(c.conds) > bestConds[k] || (len(c.conds) == bestConds[k] && span <= bestSpan[k]) {
			best[k], bestConds[k], bestSpan[k] = i, len(c.conds), span
		}
	}
	if t.byID != nil && len(t.compiled) == len(t.Rules) {
		for _, i := range t.byID[id] {
			c := &t.compiled[i]
			consider(i, c, c.review)
		}
		return best[0], best[1]
	}
	for i := range t.Rules { // a Table built without NewTable
		if t.Rules[i].ID != id {
			continue
		}
		c, err := compile(t.Rules[i])
		if err != nil {
			continue
		}
		consider(i, &c, IsReviewProvenance(t.Rules[i].Provenance))
	}
	return best[0], best[1]
}

// RuleText is Rules[i].String(), precomputed for an indexed table.
func (t *Table) RuleText(i int) string {
	if len(t.compiled) == len(t.Rules) && t.byID != nil {
		return t.compiled[i].text
	}
	return t.Rules[i].String()
}

// RuleCite is Rules[i].Cite(), precomputed for an indexed table.
func (t *Table) RuleCite(i int) string {
	if len(t.compiled) == len(t.Rules) && t.byID != nil {
		return t.compiled[i].cite
	}
	return t.Rules[i].Cite()
}

// ValueAt is Rules[i].ValueSI(), precomputed for an indexed table.
func (t *Table) ValueAt(i int) (float64, error) {
	if len(t.compiled) == len(t.Rules) && t.byID != nil {
		return t.compiled[i].si, t.compiled[i].siErr
	}
	return t.Rules[i].ValueSI()
}

// Value looks up id and returns its value converted by ValueSI, with the rule.
func (t *Table) Value(id string, s Scope) (float64, Rule, error) {
	i := t.LookupIndex(id, s)
	if i < 0 {
		return 0, Rule{}, t.NoRowError(id, s)
	}
	v, err := t.ValueAt(i)
	return v, t.Rules[i], err
}

// NoRowError is the error for a rule id no row of t applies to in scope s.
func (t *Table) NoRowError(id string, s Scope) error {
	return fmt.Errorf("rule %s: no row of the %s rules applies (group %s%s)", id, t.Profile, groupName(s.Group), scopeText(s))
}

func groupName(g int) string {
	if g < 1 || g > 8 {
		return "unknown"
	}
	return "M" + strconv.Itoa(g)
}

func scopeText(s Scope) string {
	var parts []string
	for k, v := range s.Attrs {
		parts = append(parts, k+"="+v)
	}
	for k, v := range s.Nums {
		parts = append(parts, k+"="+strconv.FormatFloat(v, 'g', -1, 64))
	}
	if len(parts) == 0 {
		return ""
	}
	sort.Strings(parts)
	return "; " + strings.Join(parts, ", ")
}

// compiledRule is a rule's groups and conditions in a form Lookup can test quickly.
type compiledRule struct {
	lo, hi int // group span: 1..8, or 0..9 for "all" (also matches an unknown group)
	conds  []condition
	never  bool
	// precomputed by Table.index
	text, cite string
	si         float64
	siErr      error
	review     bool // a review limit (IsReviewProvenance)
}

type condition struct {
	name  string
	op    string // "=", "<", "<=", ">", ">="
	text  string // lower-case value for "="
	num   float64
	isNum bool // the value parsed as a number
}

func (c *compiledRule) matches(s Scope) bool {
	if c.never {
		return false
	}
	// "all" (lo 0) matches any group, known or not.
	if c.lo != 0 && (s.Group < c.lo || s.Group > c.hi) {
		return false
	}
	for _, k := range c.conds {
		if !k.holds(s) {
			return false
		}
	}
	return true
}

// relTol is the relative tolerance under which a scope number equals a condition's
// number, so that a band edge written in one unit and converted (5/16 in = 7.9375 mm)
// falls in the band whose edge it is, whatever the rounding of the conversion.
const relTol = 1e-9

func (k condition) holds(s Scope) bool {
	if k.op == "=" && !k.isNum {
		v, ok := s.Attrs[k.name]
		return ok && strings.EqualFold(strings.TrimSpace(v), k.text)
	}
	x, ok := s.Nums[k.name]
	if !ok {
		if v, ok2 := s.Attrs[k.name]; ok2 {
			f, err := parseNumber(v)
			if err != nil {
				return false
			}
			x, ok = f, true
		}
	}
	if !ok || math.IsNaN(x) {
		return false
	}
	eq := math.Abs(x-k.num) <= relTol*math.Max(math.Abs(x), math.Abs(k.num))
	switch k.op {
	case "=":
		return eq
	case "<=":
		return eq || x < k.num
	case "<":
		return !eq && x < k.num
	case ">=":
		return eq || x > k.num
	case ">":
		return !eq && x > k.num
	}
	return false
}

func compile(r Rule) (compiledRule, error) {
	lo, hi, err := parseGroups(r.Groups)
	if err != nil {
		return compiledRule{}, err
	}
	conds, err := parseWhen(r.When)
	if err != nil {
		return compiledRule{}, err
	}
	return compiledRule{lo: lo, hi: hi, conds: conds}, nil
}

// parseGroups reads "all", "M5" or "M1-M4" (case and spaces ignored).
func parseGroups(s string) (lo, hi int, err error) {
	t := strings.ToUpper(strings.ReplaceAll(strings.TrimSpace(s), " ", ""))
	if t == "ALL" {
		return 0, 9, nil
	}
	one := func(g string) (int, error) {
		if len(g) == 2 && g[0] == 'M' && g[1] >= '1' && g[1] <= '8' {
			return int(g[1] - '0'), nil
		}
		return 0, fmt.Errorf("groups: %q is not all, a group M1 to M8, or a range like M1-M4", s)
	}
	if a, b, ok := strings.Cut(t, "-"); ok {
		if lo, err = one(a); err != nil {
			return 0, 0, err
		}
		if hi, err = one(b); err != nil {
			return 0, 0, err
		}
		if lo > hi {
			return 0, 0, fmt.Errorf("groups: range %q runs backwards", s)
		}
		return lo, hi, nil
	}
	g, err := one(t)
	return g, g, err
}

func normGroups(s string) string {
	lo, hi, err := parseGroups(s)
	switch {
	case err != nil:
		return strings.TrimSpace(s)
	case lo == 0:
		return "all"
	case lo == hi:
		return "M" + strconv.Itoa(lo)
	}
	return "M" + strconv.Itoa(lo) + "-M" + strconv.Itoa(hi)
}

var ops = []string{"<=", ">=", "<", ">", "="}

// splitOp finds the first operator in a condition.
func splitOp(s string) (name, op, val string, ok bool) {
	i := strings.IndexAny(s, "<>=")
	if i < 0 {
		return "", "", "", false
	}
	for _, o := range ops {
		if strings.HasPrefix(s[i:], o) {
			return strings.TrimSpace(s[:i]), o, strings.TrimSpace(s[i+len(o):]), true
		}
	}
	return "", "", "", false
}

// parseWhen reads conditions joined by " and ". A value may itself contain " and "
// ("records=meter and log"): a piece without an operator continues the value before.
func parseWhen(s string) ([]condition, error) {
	s = strings.TrimSpace(s)
	if s == "" {
		return nil, nil
	}
	pieces := strings.Split(s, " and ")
	var parts []string
	for _, p := range pieces {
		if _, _, _, ok := splitOp(p); !ok && len(parts) > 0 {
			parts[len(parts)-1] += " and " + p
			continue
		}
		parts = append(parts, p)
	}
	var out []condition
	seen := map[string]bool{}
	for _, p := range parts {
		name, op, val, ok := splitOp(p)
		if !ok {
			return nil, fmt.Errorf("when: %q is not a condition like name=value or name<=number", strings.TrimSpace(p))
		}
		name = strings.ToLower(name)
		if strings.ContainsAny(val, "<>=") {
			return nil, fmt.Errorf("when: %q has more than one operator", strings.TrimSpace(p))
		}
		allowed, known := conditionNames[name]
		if !known && !strings.HasPrefix(name, "x.") {
			return nil, fmt.Errorf("when: unknown condition name %q (known: %s; user names start with x.)", name, strings.Join(ConditionNames(), ", "))
		}
		if val == "" {
			return nil, fmt.Errorf("when: %q has no value", strings.TrimSpace(p))
		}
		c := condition{name: name, op: op, text: strings.ToLower(val)}
		if f, err := parseNumber(val); err == nil {
			c.num, c.isNum = f, true
		}
		numeric := known && allowed == nil
		switch {
		case op != "=" && !c.isNum:
			return nil, fmt.Errorf("when: %s%s%q: expected a number after %s", name, op, val, op)
		case numeric && !c.isNum:
			return nil, fmt.Errorf("when: %s=%q: %s is a number", name, val, name)
		case known && allowed != nil && op != "=":
			return nil, fmt.Errorf("when: %s%s%s: %s takes text, compare it with =", name, op, val, name)
		case known && allowed != nil && !contains(allowed, c.text):
			return nil, fmt.Errorf("when: %s=%q: expected one of %s", name, val, strings.Join(allowed, ", "))
		}
		if allowed != nil {
			c.isNum = false // a text name compares text, even "1"
		}
		key := name + op
		if seen[key] {
			return nil, fmt.Errorf("when: %s%s appears twice", name, op)
		}
		seen[key] = true
		out = append(out, c)
	}
	return out, nil
}

// normWhen is the canonical form of a when: conditions as name op value, lower-case
// text, sorted, joined by " and ". An unparsable when is returned trimmed.
func normWhen(s string) string {
	cs, err := parseWhen(s)
	if err != nil {
		return strings.TrimSpace(s)
	}
	parts := make([]string, len(cs))
	for i, c := range cs {
		v := c.text
		if c.isNum {
			v = strconv.FormatFloat(c.num, 'g', -1, 64)
		}
		parts[i] = c.name + c.op + v
	}
	sort.Strings(parts)
	return strings.Join(parts, " and ")
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// parseNumber reads a finite decimal number ("0.075", "1e3"); it refuses NaN, Inf,
// decimal commas and fractions.
func parseNumber(s string) (float64, error) {
	t := strings.TrimSpace(s)
	if t == "" {
		return 0, errors.New("empty, expected a number")
	}
	v, err := strconv.ParseFloat(t, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		if strings.Contains(t, ",") {
			return 0, fmt.Errorf("%q is not a number (use a decimal point)", t)
		}
		return 0, fmt.Errorf("%q is not a number", t)
	}
	return v, nil
}

// RuleError is one problem in a rule file, located by origin, line (or sheet row) and
// column. Col is the 1-based column of the field in the file (0 for the whole row);
// Cell, when set by a spreadsheet reader, replaces "origin:line" with "origin!Cell".
type RuleError struct {
	Origin string
	Line   int
	Col    int
	Column string // the field's column name, "" for the whole row
	Cell   string
	Err    error
}

func (e *RuleError) Error() string {
	var b strings.Builder
	b.WriteString(e.Origin)
	if e.Cell != "" {
		b.WriteString("!")
		b.WriteString(e.Cell)
	} else {
		b.WriteString(":")
		b.WriteString(strconv.Itoa(e.Line))
	}
	b.WriteString(": ")
	if e.Column != "" {
		b.WriteString(e.Column)
		b.WriteString(": ")
	}
	b.WriteString(e.Err.Error())
	return b.String()
}

func (e *RuleError) Unwrap() error { return e.Err }

// RuleErrors is every problem found in one rule file, in file order.
type RuleErrors []*RuleError

func (es RuleErrors) Error() string {
	parts := make([]string, len(es))
	for i, e := range es {
		parts[i] = e.Error()
	}
	return strings.Join(parts, "\n")
}

// maxRuleErrors bounds the problems reported for one file.
const maxRuleErrors = 50

// ParseRules reads a rule table as CSV (comma or semicolon separated, UTF-8 with or
// without BOM). Every problem is reported, located "origin:line: column: …", in a
// RuleErrors; nothing is defaulted. Rows are returned with Origin set to origin.
func ParseRules(r io.Reader, origin string) ([]Rule, error) {
	br := bufio.NewReader(r)
	if b, err := br.Peek(3); err == nil && string(b) == "\uFEFF" {
		_, _ = br.Discard(3)
	}
	sep := ','
	if first, err := br.Peek(4096); len(first) > 0 || err == nil {
		line, _, _ := strings.Cut(string(first), "\n")
		if strings.Count(line, ";") > strings.Count(line, ",") {
			sep = ';'
		}
	}
	cr := csv.NewReader(br)
	cr.Comma = sep
	cr.Comment = '#'
	cr.FieldsPerRecord = -1
	var (
		records [][]string
		lines   []int
	)
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				return nil, RuleErrors{{Origin: origin, Line: pe.Line, Err: pe.Err}}
			}
			return nil, fmt.Errorf("%s: reading rules: %w", origin, err)
		}
		line, _ := cr.FieldPos(0)
		records = append(records, rec)
		lines = append(lines, line)
	}
	return parseRecords(records, lines, origin)
}

// ParseRuleRecords is ParseRules for rows already split into fields (a spreadsheet
// sheet): records[i] is on line (row) firstLine+i. Empty rows are skipped; the first
// non-empty row is the header.
func ParseRuleRecords(records [][]string, origin string, firstLine int) ([]Rule, error) {
	lines := make([]int, len(records))
	for i := range records {
		lines[i] = firstLine + i
	}
	return parseRecords(records, lines, origin)
}

func isEmptyRecord(rec []string) bool {
	for _, f := range rec {
		if strings.TrimSpace(f) != "" {
			return false
		}
	}
	return true
}

func parseRecords(records [][]string, lines []int, origin string) ([]Rule, error) {
	var errs RuleErrors
	add := func(line, col int, column string, err error) {
		if len(errs) < maxRuleErrors {
			errs = append(errs, &RuleError{Origin: origin, Line: line, Col: col, Column: column, Err: err})
		}
	}
	h := -1
	for i, rec := range records {
		if !isEmptyRecord(rec) && !strings.HasPrefix(strings.TrimSpace(rec[0]), "#") {
			h = i
			break
		}
	}
	if h < 0 {
		return nil, RuleErrors{{Origin: origin, Line: 1, Err: fmt.Errorf("no header row: expected %s", strings.Join(RuleColumns[:], ","))}}
	}
	idx := map[string]int{}
	for j, name := range records[h] {
		n := strings.ToLower(strings.TrimSpace(name))
		if j == 0 {
			n = strings.TrimPrefix(n, "\uFEFF")
		}
		if n == "" {
			continue
		}
		if !contains(RuleColumns[:], n) {
			add(lines[h], j+1, "", fmt.Errorf("header: unknown column %q (expected exactly %s)", name, strings.Join(RuleColumns[:], ",")))
			continue
		}
		if _, dup := idx[n]; dup {
			add(lines[h], j+1, "", fmt.Errorf("header: column %q appears twice", n))
			continue
		}
		idx[n] = j
	}
	for _, c := range RuleColumns {
		if _, ok := idx[c]; !ok {
			add(lines[h], 0, "", fmt.Errorf("header: column %q is missing (expected exactly %s)", c, strings.Join(RuleColumns[:], ",")))
		}
	}
	if len(errs) > 0 {
		return nil, errs
	}
	var rules []Rule
	for i := h + 1; i < len(records); i++ {
		rec, line := records[i], lines[i]
		if isEmptyRecord(rec) || strings.HasPrefix(strings.TrimSpace(rec[0]), "#") {
			continue
		}
		field := func(name string) string {
			j := idx[name]
			if j < len(rec) {
				return strings.TrimSpace(rec[j])
			}
			return ""
		}
		fail := func(name string, err error) { add(line, idx[name]+1, name, err) }
		for j := range rec {
			if strings.TrimSpace(rec[j]) != "" && !inIndex(idx, j) {
				add(line, j+1, "", fmt.Errorf("text %q outside the columns of the header", rec[j]))
			}
		}
		r := Rule{ID: field("rule"), Groups: field("groups"), When: field("when"), Value: field("value"),
			Unit: field("unit"), Source: field("source"), Provenance: field("provenance"), Note: field("note"),
			Origin: origin, Line: line}
		if msg := checkRule(&r, fail); msg {
			rules = append(rules, r)
		}
	}
	if len(errs) > 0 {
		return nil, errs
	}
	return rules, nil
}

func inIndex(idx map[string]int, j int) bool {
	for _, v := range idx {
		if v == j {
			return true
		}
	}
	return false
}

// checkRule validates and normalises one row, reporting each problem through fail. It
// returns true when the row is good.
func checkRule(r *Rule, fail func(column string, err error)) bool {
	ok := true
	bad := func(column string, err error) { ok = false; fail(column, err) }

	spec, known := knownRules[r.ID]
	user := strings.HasPrefix(r.ID, "x.") && len(r.ID) > 2
	switch {
	case r.ID == "":
		bad("rule", errors.New("empty, expected a rule id"))
	case !known && !user:
		bad("rule", fmt.Errorf("unknown rule id %q (user rules must start with x.; known ids: %s)", r.ID, strings.Join(KnownRuleIDs(), ", ")))
	}
	if r.Groups == "" {
		bad("groups", errors.New("empty, expected all, a group M1 to M8, or a range like M1-M4"))
	} else if _, _, err := parseGroups(r.Groups); err != nil {
		bad("groups", errors.New(strings.TrimPrefix(err.Error(), "groups: ")))
	} else {
		r.Groups = normGroups(r.Groups)
	}
	if _, err := parseWhen(r.When); err != nil {
		bad("when", errors.New(strings.TrimPrefix(err.Error(), "when: ")))
	}
	if r.Unit != "" {
		if _, ok := ruleUnits[r.Unit]; !ok {
			bad("unit", fmt.Errorf("%q is not a rule unit (expected one of %s, or empty for a word)", r.Unit, strings.Join(RuleUnits(), ", ")))
		}
	}
	switch {
	case r.Value == "":
		bad("value", errors.New("empty, expected a number or a word"))
	case known && spec.words != nil:
		if !contains(spec.words, strings.ToLower(r.Value)) {
			bad("value", fmt.Errorf("%q: expected one of %s", r.Value, strings.Join(spec.words, ", ")))
		} else {
			r.Value = strings.ToLower(r.Value)
		}
		if r.Unit != "" {
			bad("unit", fmt.Errorf("%q: %s takes a word, leave the unit empty", r.Unit, r.ID))
		}
	case known:
		v, err := parseNumber(r.Value)
		if err != nil {
			bad("value", err)
			break
		}
		u, uok := ruleUnits[r.Unit]
		if !uok {
			if r.Unit == "" {
				bad("unit", fmt.Errorf("empty, expected a unit of %s", strings.Join(unitsOf(spec.dims), " or ")))
			}
			break
		}
		if !contains(spec.dims, u.dim) {
			bad("unit", fmt.Errorf("%q does not suit %s: expected %s", r.Unit, r.ID, strings.Join(unitsOf(spec.dims), " or ")))
			break
		}
		x := v * u.factor
		if x < spec.min || (spec.minEx && x == spec.min) || x > spec.max {
			bad("value", fmt.Errorf("%s %s is outside the range %s", r.Value, r.Unit, rangeText(spec)))
		}
	case user:
		if _, err := parseNumber(r.Value); err == nil && r.Unit == "" {
			bad("unit", errors.New("empty, a number needs a unit (1 for a plain ratio)"))
		}
	}
	if r.Source == "" {
		bad("source", errors.New("empty, expected the standard, clause or table and edition (or say there is none)"))
	}
	if p, err := normProvenance(r.Provenance); err != nil {
		bad("provenance", err)
	} else {
		r.Provenance = p
	}
	return ok
}

func unitsOf(dims []string) []string {
	var out []string
	for _, u := range RuleUnits() {
		if contains(dims, ruleUnits[u].dim) {
			out = append(out, u)
		}
	}
	return out
}

func rangeText(s ruleSpec) string {
	lo := "["
	if s.minEx {
		lo = "("
	}
	hi := "+inf)"
	if !math.IsInf(s.max, 1) {
		hi = strconv.FormatFloat(s.max, 'g', -1, 64) + "]"
	}
	return lo + strconv.FormatFloat(s.min, 'g', -1, 64) + ", " + hi + " in the check's unit"
}

// ProvenanceLabels are the labels of the project's standards notes. "memory" is
// followed by a confidence: "memory, medium".
// "owner's criterion" marks a value a rule file's owner (an insurer, a jurisdiction, the
// operator) sets as their own acceptance criterion, with no published source behind it.
var ProvenanceLabels = [...]string{"seen", "law", "computed", "memory", "common practice, no published source", "owner's criterion"}

// Confidences are the confidences a "memory" label may carry.
var Confidences = [...]string{"high", "medium-high", "medium", "low-medium", "low"}

func normProvenance(p string) (string, error) {
	t := strings.ToLower(strings.Join(strings.Fields(p), " "))
	switch t {
	case "seen", "law", "computed", "common practice, no published source", "owner's criterion":
		return t, nil
	case "":
		return "", fmt.Errorf("empty, expected one of seen, law, computed, memory with a confidence (memory, medium), common practice, no published source, owner's criterion")
	}
	if conf, ok := strings.CutPrefix(t, "memory"); ok {
		conf = strings.TrimSpace(strings.TrimLeft(strings.TrimSpace(conf), ",:"))
		if contains(Confidences[:], conf) {
			return "memory, " + conf, nil
		}
		return "", fmt.Errorf("%q: memory needs a confidence: one of %s (e.g. memory, medium)", p, strings.Join(Confidences[:], ", "))
	}
	return "", fmt.Errorf("%q: expected one of seen, law, computed, memory with a confidence (memory, medium), common practice, no published source", p)
}
