package fleet

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	"hoistfleet/calc"
	"hoistfleet/templates"
)

// Options configure a run. The zero value is not usable: Rules is required.
type Options struct {
	Rules           *templates.Table
	MarginalBand    float64   // default 0.10
	AsOf            time.Time // the run's date for inspection and age checks
	RatedLoadFactor float64   // > 0: re-rate every hoist to factor × rated load
	Workers         int       // ≤ 0: GOMAXPROCS
	TopN            int       // length of the summary's lists; ≤ 0: 20
	Buffer          int       // reorder buffer (results in flight); ≤ 0: 64 × workers
	G               float64   // acceleration of gravity; 0: calc.StandardGravity
	// Record keeps each check's calculation record (CheckResult.Steps) for explain; bulk
	// runs leave it off, which is about ten times cheaper and gives the same numbers.
	Record bool
}

// Checker evaluates hoists against the rules in force. It is safe for concurrent use.
type Checker struct {
	opts    Options
	columns []templates.Column // the schema, read once
	specs   []checkSpec        // the checks, built once
	keys    keyIndex           // schema key → index in columns
	texts   sync.Map           // ruleSet → ruleText: the rule and source text of a set of rows
	ropes   ropeCache          // rope construction text → what calc reads from it
	dflts   sync.Map           // defaultKey → the text saying a rule default was applied
	scratch sync.Pool          // *scratch, reused from one Check to the next
	results sync.Pool          // *Result, recycled by Run once written (recycle)
}

// defaultKey identifies a "default applied" text: its format, rule and value. The value
// comes from a rule row, so there are at most as many texts as rows.
type defaultKey struct {
	format, rule string
	v            float64
}

// defaultText is fmt.Sprintf(format, v) + " (rule " + rule + ")", made once per key.
func (c *Checker) defaultText(format, rule string, v float64) string {
	k := defaultKey{format, rule, v}
	if t, ok := c.dflts.Load(k); ok {
		return t.(string)
	}
	t := fmt.Sprintf(format, v) + " (rule " + rule + ")"
	if v == v { // NaN never equals a key: do not store it
		c.dflts.Store(k, t)
	}
	return t
}

// ropeInfo is what calc reads from a rope construction text: the rule-table category and
// the EN 12385-4 minimum breaking force factor K.
type ropeInfo struct {
	category  string
	k         float64
	canonical string
	kOK       bool
}

// ropeCache remembers ropeInfo per construction text (a fleet has a handful of
// constructions; parsing one costs regular expressions). It stops growing at
// maxRopeCache texts, so a register of random text cannot grow it without bound.
type ropeCache struct {
	m sync.Map
	n atomic.Int64
}

const maxRopeCache = 4096

func (rc *ropeCache) get(construction string) ropeInfo {
	if v, ok := rc.m.Load(construction); ok {
		return v.(ropeInfo)
	}
	ri := ropeInfo{category: calc.RopeCategory(construction)}
	ri.k, ri.canonical, ri.kOK = calc.RopeK(construction)
	if rc.n.Load() < maxRopeCache {
		rc.n.Add(1)
		rc.m.Store(construction, ri)
	}
	return ri
}

// ruleSet names up to four rows of the rule table (indices, unused slots −1): the rows
// one check used for one hoist.
type ruleSet [4]int32

type ruleText struct{ rule, source string }

// ruleSetOf returns rows as a ruleSet, with ok false when there are too many to fit.
func ruleSetOf(rows []int) (key ruleSet, ok bool) {
	key = ruleSet{-1, -1, -1, -1}
	if len(rows) > len(key) {
		return key, false
	}
	for i, r := range rows {
		key[i] = int32(r)
	}
	return key, true
}

// ruleTexts returns the "rule" and "source" fields of a check that used the given rows:
// each row in words, joined by "; ", and their citations, a citation shared by two rows
// given once. The texts repeat from hoist to hoist, so they are built once per set.
func (c *Checker) ruleTexts(rows []int) (rule, source string) {
	t := c.opts.Rules
	switch len(rows) {
	case 0:
		return "", ""
	case 1:
		return t.RuleText(rows[0]), t.RuleCite(rows[0])
	}
	key, cacheable := ruleSetOf(rows)
	if cacheable {
		if v, ok := c.texts.Load(key); ok {
			rt := v.(ruleText)
			return rt.rule, rt.source
		}
	}
	var rs, ss []string
	for _, r := range rows {
		rs = append(rs, t.RuleText(r))
		if cite := t.RuleCite(r); !slices.Contains(ss, cite) { // two rules of one table share a source
			ss = append(ss, cite)
		}
	}
	rt := ruleText{strings.Join(rs, "; "), strings.Join(ss, "; ")}
	if cacheable {
		c.texts.Store(key, rt)
	}
	return rt.rule, rt.source
}

// NewChecker returns a checker for opts.
func NewChecker(opts Options) (*Checker, error) {
	if opts.Rules == nil {
		return nil, errors.New("fleet: no rule table")
	}
	if opts.MarginalBand < 0 || opts.MarginalBand >= 1 {
		return nil, fmt.Errorf("fleet: marginal band %g is not in [0, 1)", opts.MarginalBand)
	}
	if opts.G == 0 {
		opts.G = calc.StandardGravity
	}
	if opts.TopN <= 0 {
		opts.TopN = 20
	}
	c := &Checker{opts: opts, columns: templates.Columns(), specs: checkSpecs()}
	keys := make([]string, len(c.columns))
	for i, col := range c.columns {
		keys[i] = col.Key
	}
	c.keys = newKeyIndex(keys)
	for i := range c.specs {
		s := &c.specs[i]
		s.needsAt, s.needsLayeredAt, s.usesAt = c.indices(s.needs), c.indices(s.needsLayered), c.indices(s.uses)
	}
	return c, nil
}

// indices returns the schema indices of keys (a key outside the schema is left out: it
// can be neither empty nor unreadable).
func (c *Checker) indices(keys []string) []int {
	out := make([]int, 0, len(keys))
	for _, k := range keys {
		if i, ok := c.keys.lookup(k); ok {
			out = append(out, i)
		}
	}
	return out
}

// Options returns the checker's options with defaults applied.
func (c *Checker) Options() Options { return c.opts }

// utilisationTolerance absorbs floating-point rounding at exactly the limit: a hoist
// load-tested at exactly 1.1 × its rated load computes 1.0000000000000002.
const utilisationTolerance = 1e-9

// StatusOf turns a utilisation into pass / marginal / fail with marginal band b:
// pass u ≤ 1 − b, marginal 1 − b < u ≤ 1, fail u > 1 (design.md "Statuses").
func StatusOf(u, band float64) Status {
	switch {
	case math.IsNaN(u):
		return StatusError
	case u > 1+utilisationTolerance:
		return StatusFail
	case band > 0 && u > 1-band:
		return StatusMarginal
	}
	return StatusPass
}

// hoistData is one asset's inputs resolved for the checks: values, defaults, scope.
type hoistData struct {
	a        *Asset
	h        calc.Hoist
	group    int
	scope    templates.Scope
	missing  []bool   // empty fields, by schema index
	bad      []*Error // unreadable fields, by schema index
	defaults []string
	derived  []string
	messages []string
	rules    []int // rows of the rule table used (indices into Rules.Rules, for the audit counts)
	rowBuf   []int // the rows one check's prepare used, read before the next check's prepare
	texts    *textMemo
	// closedLimit is handed from a check's prepare to its preparedCheck: the limiting
	// rated load in closed form, when the check has one.
	closedLimit func(h calc.Hoist) float64
	c           *Checker
}

// usedRows returns rows in d's reusable buffer: a check's prepare returns the rule rows
// it used this way, without a fresh slice per check and hoist. The caller reads them
// before the next prepare overwrites them.
func (d *hoistData) usedRows(rows ...int) []int {
	d.rowBuf = append(d.rowBuf[:0], rows...)
	return d.rowBuf
}

// isMissing reports whether the field is empty in the register.
func (d *hoistData) isMissing(key string) bool {
	i, ok := d.c.keys.lookup(key)
	return ok && d.missing[i]
}

// badField returns the error of an unreadable field.
func (d *hoistData) badField(key string) (*Error, bool) {
	i, ok := d.c.keys.lookup(key)
	if !ok || d.bad[i] == nil {
		return nil, false
	}
	return d.bad[i], true
}

// field returns the field's value without copying it; nil when absent.
func (d *hoistData) field(key string) *Value {
	i, ok := d.c.keys.lookup(key)
	if !ok {
		return nil
	}
	return d.a.at(i, key)
}

func (d *hoistData) num(key string) (float64, bool) {
	if v := d.field(key); v != nil && v.State == OK {
		return v.Num, true
	}
	return 0, false
}

func (d *hoistData) text(key string) string {
	if v := d.field(key); v != nil && v.State == OK {
		return v.Text
	}
	return ""
}

// rule looks up a rule for this hoist, records its use and returns its value in the
// checks' units with the row's index in the table.
func (d *hoistData) rule(id string) (float64, int, error) {
	t := d.c.opts.Rules
	i := t.LookupIndex(id, d.scope)
	if i < 0 {
		return 0, -1, t.NoRowError(id, d.scope)
	}
	v, err := t.ValueAt(i)
	if err != nil {
		return 0, -1, err
	}
	d.rules = append(d.rules, i)
	return v, i, nil
}

// ruleWord looks up a rule whose value is a word, lower-cased.
func (d *hoistData) ruleWord(id string) (string, int, error) {
	t := d.c.opts.Rules
	i := t.LookupIndex(id, d.scope)
	if i < 0 {
		return "", -1, fmt.Errorf("rule %s: no row of the %s rules applies", id, t.Profile)
	}
	d.rules = append(d.rules, i)
	return strings.ToLower(strings.TrimSpace(t.Rules[i].Value)), i, nil
}

// resolve reads an asset into hoistData: SI values with defaults applied and reported.
func (c *Checker) resolve(a *Asset, d *hoistData) {
	d.reset(c, a)
	for _, p := range a.Problems {
		d.messages = append(d.messages, p.Error())
	}
	for i, col := range c.columns {
		v := a.at(i, col.Key)
		if v == nil {
			d.missing[i] = true
			continue
		}
		switch v.State {
		case Empty:
			d.missing[i] = true
		case Bad:
			e := v.Err
			if e == nil {
				e = &Error{Kind: Invalid, Cell: v.Cell, Field: col.Key, Asset: a.ID, Err: fmt.Errorf("unreadable value %q", v.Raw)}
			}
			d.bad[i] = e
			if e.Kind != HeaderProblem { // said once, with the header, not on every row
				d.messages = append(d.messages, e.Error())
			}
		}
	}
	d.resolveDuty()
	d.scope.Group = d.group
	for _, k := range []struct{ attr, key, def string }{
		{"special", "special_service", "none"}, {"control", "control_braking", "none"},
		{"service", "service", "normal"}, {"records", "usage_records", "none"},
		{"test", "test_type", "static"}, {"grooved", "drum_grooved", "yes"},
	} {
		v := d.text(k.key)
		if v == "" {
			v = k.def
		}
		d.scope.Attrs[k.attr] = v
	}
	if sp := d.scope.Attrs["special"]; sp != "none" && !c.hasCondition("special="+sp) {
		d.messages = append(d.messages, fmt.Sprintf("special service %q: the %s rules have no stricter row for it, so the ordinary rules were applied; supply a rule file with rows for special=%s", sp, c.opts.Rules.Profile, sp))
	}
	rope := c.ropes.get(d.text("rope_construction"))
	if rope.category != "" {
		d.scope.Attrs["rope"] = rope.category
	}

	h := calc.Hoist{G: c.opts.G, SkipRecord: !c.opts.Record}
	h.RatedLoadKg, _ = d.num("rated_load")
	h.HookBlockKg = d.numDefault("hook_block_mass", 0, "hook block mass 0 kg")
	h.Parts = int(d.numDefault("parts_of_line", 1, "parts of line 1"))
	h.RopeEnds = int(d.numDefault("rope_ends", 1, "rope ends on drum 1"))
	h.SheaveEff = d.numRule("sheave_efficiency", "default.sheave_efficiency", "sheave efficiency %g")
	h.DeflectionSheaves = int(d.numDefault("deflection_sheaves", 0, ""))
	h.RopeDiameterM, _ = d.num("rope_diameter")
	h.RopeMBFN, _ = d.num("rope_mbf")
	h.DrumDiameterM, _ = d.num("drum_diameter")
	h.Layers = int(d.numDefault("rope_layers", 1, ""))
	h.Grooves, _ = d.num("drum_grooves")
	h.Grooved = d.scope.Attrs["grooved"] != "no"
	h.LiftHeightM, _ = d.num("lift_height")
	h.SheaveDiameterM, _ = d.num("sheave_diameter")
	h.FleetAngleDeg, _ = d.num("fleet_angle")
	h.DrumInertiaKgM2, _ = d.num("drum_inertia")
	h.DrumMassKg, _ = d.num("drum_mass")
	h.GearRatio, _ = d.num("gear_ratio")
	h.GearEff = d.numRule("gear_efficiency", "default.gear_efficiency", "gear efficiency %g")
	if v, ok := d.num("gear_backdrive_efficiency"); ok {
		h.GearBackEff = v
	} else {
		h.GearBackEff = h.GearEff
		if d.isMissing("gear_backdrive_efficiency") {
			d.defaults = append(d.defaults, "gear back-drive efficiency = gear efficiency "+strconv.FormatFloat(h.GearEff, 'g', -1, 64))
		}
	}
	h.GearboxRatedTorqueNm, _ = d.num("gearbox_rated_torque")
	h.MotorPowerW, _ = d.num("motor_power")
	h.MotorSpeedRPM, _ = d.num("motor_speed")
	h.PeakTorqueRatio = d.numRule("motor_peak_torque", "default.peak_torque_ratio", "motor peak torque %g × rated")
	h.MotorInertiaKgM2, _ = d.num("motor_inertia")
	h.BrakeTorqueNm, _ = d.num("brake_torque")
	h.BrakeOnDrum = d.text("brake_location") == "drum"
	h.Brakes = int(d.numDefault("brakes", 1, ""))
	d.scope.Nums["brakes"] = float64(h.Brakes)
	h.BrakeDelayS = d.numRule("brake_delay", "default.brake_delay", "brake delay %g s")
	h.HoistSpeedMS, _ = d.num("hoist_speed")
	h.LoweringSpeedMS, _ = d.num("lowering_speed")
	h.AccelMS2 = d.numRule("acceleration", "default.acceleration", "acceleration %g m/s²")
	if h.RopeDiameterM > 0 {
		d.scope.Nums["d_mm"] = h.RopeDiameterM * 1000
	}
	// Minimum breaking force from grade and construction (EN 12385-4) when not given.
	if d.isMissing("rope_mbf") && h.RopeDiameterM > 0 {
		grade, okg := d.num("rope_grade")
		if k, canon, ok := rope.k, rope.canonical, rope.kOK; ok && okg {
			h.RopeMBFN = calc.MBFFromGrade(h.RopeDiameterM, grade, k)
			if i, ok := d.c.keys.lookup("rope_mbf"); ok {
				d.missing[i] = false
			}
			d.derived = append(d.derived, fmt.Sprintf("rope MBF %.1f kN from EN 12385-4: d² R K/1000 with d %g mm, R %g N/mm², K %g (%s)",
				h.RopeMBFN/1000, h.RopeDiameterM*1000, grade, k, canon))
		}
	}
	d.h = h.WithEfficiencies()
}

// hasCondition reports whether any rule row in force has the condition cond.
func (c *Checker) hasCondition(cond string) bool {
	for _, r := range c.opts.Rules.Rules {
		if strings.Contains(strings.ToLower(r.When), cond) {
			return true
		}
	}
	return false
}

// numDefault returns the field, or def when empty (reporting the default when text is
// not empty). A bad cell also returns def: the checks that need it report the error.
func (d *hoistData) numDefault(key string, def float64, text string) float64 {
	if v, ok := d.num(key); ok {
		return v
	}
	if d.isMissing(key) && text != "" {
		d.defaults = append(d.defaults, text)
	}
	return def
}

// numRule returns the field, or the rule table's default (reported).
func (d *hoistData) numRule(key, ruleID, format string) float64 {
	if v, ok := d.num(key); ok {
		return v
	}
	v, _, err := d.rule(ruleID)
	if err != nil {
		d.messages = append(d.messages, err.Error())
		return math.NaN()
	}
	if d.isMissing(key) {
		d.defaults = append(d.defaults, d.c.defaultText(format, ruleID, v))
	}
	return v
}

// resolveDuty sets the mechanism group from the register, or derives it from usage
// (ISO 4301-1), and flags a disagreement.
func (d *hoistData) resolveDuty() {
	given := 0
	if s := d.text("duty_group"); s != "" {
		if g, fem, ok := calc.ParseDutyGroup(s); ok {
			given = g
			if fem {
				d.derived = append(d.derived, fmt.Sprintf("FEM 9.511 class %s read as ISO 4301-1 group %s", s, calc.DutyGroupName(g)))
			}
		}
	}
	u := calc.Usage{}
	u.CyclesPerHour, _ = d.num("cycles_per_hour")
	u.MeanLiftM, _ = d.num("mean_lift")
	if v, ok := d.num("hours_per_day"); ok {
		u.HoursPerDay = v / 3600
	}
	if v, ok := d.num("hoist_speed"); ok {
		u.SpeedMPerMin = v * 60
	}
	if s := d.text("load_spectrum"); len(s) == 2 {
		u.SpectrumClass = int(s[1] - '0')
	}
	u.Km, _ = d.num("spectrum_factor")
	haveUsage := u.CyclesPerHour > 0 && u.MeanLiftM > 0 && u.HoursPerDay > 0 && (u.SpectrumClass > 0 || u.Km > 0)
	if !haveUsage {
		d.group = given
		return
	}
	if v, _, err := d.rule("default.working_days"); err == nil {
		u.WorkingDaysPerYear = v
	}
	if v, _, err := d.rule("default.design_years"); err == nil {
		u.DesignYears = v
	}
	der, err := calc.DeriveDuty(u)
	if err != nil {
		d.messages = append(d.messages, "duty group not derived from usage: "+err.Error())
		d.group = given
		return
	}
	switch {
	case given == 0:
		d.group = der.Group
		note := fmt.Sprintf("duty group %s derived from usage (ISO 4301-1): %s", calc.DutyGroupName(der.Group), der.Basis)
		if der.Clamped {
			note += "; clamped at a corner of the ISO 4301-1 table"
		}
		d.derived = append(d.derived, note)
	case given != der.Group:
		d.group = given
		d.messages = append(d.messages, fmt.Sprintf("duty group %s given, but the usage columns give %s (%s): the given group is used; check the register",
			calc.DutyGroupName(given), calc.DutyGroupName(der.Group), der.Basis))
	default:
		d.group = given
	}
}

// checkSpec describes one check: the fields it needs, the rules it uses and how it runs.
type checkSpec struct {
	id    string
	needs []string // schema keys that must be present (Bad → error, Empty → unchecked)
	// needsOuterLayer: with more than one rope layer the check needs needsLayered instead
	// (needs plus the rope diameter, which places the outer layer).
	needsOuterLayer bool
	needsLayered    []string
	// needsAt, needsLayeredAt and usesAt are the same keys as schema indices (NewChecker).
	needsAt, needsLayeredAt, usesAt []int
	uses                            []string // optional keys with defaults: Bad → error, Empty → the default
	// loadDependent checks enter the maximum permissible rated load; linear ones are
	// solved in closed form (utilisation affine in the rated load), the others by bracketed
	// root finding.
	loadDependent, linear bool
	// nullsRating: when this load-independent check fails, the hoist has no rating.
	nullsRating bool
	// noBand: pass up to utilisation 1, no marginal band (a load test at exactly the
	// required test load covers the rating).
	noBand bool
	// rule and source describe the limit of a check that has no rule-table row (the limit
	// is the register's own rating of the component).
	rule, source string
	// applicable reports whether the check applies at all (false → info "not applicable").
	applicable func(d *hoistData) (bool, string)
	// prepare looks up rules and returns the function to evaluate at any hoist state,
	// with the rule text and source; an error makes the check unchecked (missing rule) or
	// error.
	prepare func(d *hoistData) (run func(h calc.Hoist) (calc.Outcome, error), rules []int, err error)
}

var loadNeeds = []string{"rated_load"}

// reevingUses are the optional inputs of every rope-tension calculation.
var reevingUses = []string{"hook_block_mass", "parts_of_line", "rope_ends", "sheave_efficiency", "deflection_sheaves", "special_service"}

// driveUses are the optional inputs of the drive-train calculations.
var driveUses = join(reevingUses, []string{"rope_layers", "gear_efficiency", "gear_backdrive_efficiency", "motor_peak_torque", "acceleration"})

// brakeUses are the optional inputs of the brake calculations.
var brakeUses = join(driveUses, []string{"brake_location", "brakes", "brake_delay", "control_braking", "lowering_speed"})

func join(lists ...[]string) []string {
	var out []string
	for _, l := range lists {
		out = append(out, l...)
	}
	return out
}

// checkSpecs returns the checks in fleet.CheckIDs order.
func checkSpecs() []checkSpec {
	specs := baseCheckSpecs()
	for i := range specs {
		s := &specs[i]
		switch s.id {
		case "motor-torque", "motor-power", "brake-holding", "motor-accel-torque", "gearbox-torque", "brake-stop", "runaway":
			// With more than one layer the outer layer's radius needs the rope diameter.
			s.needsOuterLayer = true
			s.needsLayered = join(s.needs, []string{"rope_diameter"})
		}
	}
	return specs
}

// baseCheckSpecs are the checks before the needs that depend on the hoist are added.
func baseCheckSpecs() []checkSpec {
	ruleOf := func(d *hoistData, id string) (float64, int, error) { return d.rule(id) }
	return []checkSpec{
		{id: "rope-design-factor", needs: join(loadNeeds, []string{"rope_mbf"}), uses: join(reevingUses, []string{"rope_grade", "rope_construction", "duty_group"}), loadDependent: true, linear: true,
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				z, rz, err := ruleOf(d, "rope.design_factor")
				if err != nil {
					return nil, nil, err
				}
				basis, rb, err := d.ruleWord("rope.basis")
				if err != nil {
					return nil, nil, err
				}
				static := basis == "static"
				return func(h calc.Hoist) (calc.Outcome, error) { return calc.RopeDesignFactor(h, z, static) }, d.usedRows(rz, rb), nil
			}},
		{id: "drum-ratio", needs: []string{"drum_diameter", "rope_diameter"}, uses: []string{"duty_group"}, nullsRating: true,
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				h1, r, err := ruleOf(d, "drum.h1")
				if err != nil {
					return nil, nil, err
				}
				return func(h calc.Hoist) (calc.Outcome, error) { return calc.DrumRatio(h, h1) }, d.usedRows(r), nil
			}},
		{id: "sheave-ratio", needs: []string{"sheave_diameter", "rope_diameter"}, uses: []string{"duty_group"}, nullsRating: true,
			applicable: func(d *hoistData) (bool, string) {
				if d.h.Parts <= d.h.RopeEnds && d.h.DeflectionSheaves == 0 && d.isMissing("sheave_diameter") {
					return false, "no running sheaves (single part per rope end, no deflection sheaves)"
				}
				return true, ""
			},
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				h2, r, err := ruleOf(d, "sheave.h2")
				if err != nil {
					return nil, nil, err
				}
				return func(h calc.Hoist) (calc.Outcome, error) { return calc.SheaveRatio(h, h2) }, d.usedRows(r), nil
			}},
		{id: "drum-capacity", needs: []string{"drum_diameter", "rope_diameter", "lift_height", "drum_grooves"}, uses: []string{"parts_of_line", "rope_ends", "rope_layers"}, nullsRating: true,
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				w, r, err := ruleOf(d, "drum.dead_wraps")
				if err != nil {
					return nil, nil, err
				}
				return func(h calc.Hoist) (calc.Outcome, error) { return calc.DrumCapacity(h, w) }, d.usedRows(r), nil
			}},
		{id: "fleet-angle", needs: []string{"fleet_angle"}, uses: []string{"drum_grooved"}, nullsRating: true,
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				id := "fleet_angle.max_grooved"
				if !d.h.Grooved {
					id = "fleet_angle.max_plain"
				}
				mx, r1, err := ruleOf(d, id)
				if err != nil {
					return nil, nil, err
				}
				mn, r2, err := ruleOf(d, "fleet_angle.min")
				if err != nil {
					return nil, nil, err
				}
				return func(h calc.Hoist) (calc.Outcome, error) { return calc.FleetAngle(h, mx, mn) }, d.usedRows(r1, r2), nil
			}},
		{id: "motor-torque", rule: "steady hoisting torque ≤ rated motor torque M_r = P / ω_m", source: "motor rating from the register; statics of the drive train (textbook)", needs: join(loadNeeds, []string{"drum_diameter", "gear_ratio", "motor_power", "motor_speed"}), uses: driveUses, loadDependent: true, linear: true,
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				return calc.MotorTorque, nil, nil
			}},
		{id: "motor-power", rule: "steady hoisting power ≤ rated motor power P", source: "motor rating from the register; P = m g v / η (textbook identity)", needs: join(loadNeeds, []string{"hoist_speed", "motor_power"}), uses: driveUses, loadDependent: true, linear: true,
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				return calc.MotorPower, nil, nil
			}},
		{id: "hoist-speed", nullsRating: true, needs: []string{"motor_speed", "drum_diameter", "gear_ratio", "hoist_speed"}, uses: []string{"parts_of_line", "rope_ends"},
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				tol, r, err := ruleOf(d, "hoist_speed.tolerance")
				if err != nil {
					return nil, nil, err
				}
				return func(h calc.Hoist) (calc.Outcome, error) { return calc.HoistSpeed(h, tol) }, d.usedRows(r), nil
			}},
		{id: "motor-accel-torque", rule: "accelerating torque ≤ peak motor torque p M_r", source: "Newton's second law for load, drum and rotor; peak torque ratio from the register or the rule default", needs: join(loadNeeds, []string{"drum_diameter", "gear_ratio", "motor_power", "motor_speed", "drum_inertia", "motor_inertia"}), uses: driveUses, loadDependent: true,
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				d.closedLimit = calc.MotorAccelTorqueLimitKg
				return calc.MotorAccelTorque, nil, nil
			}},
		{id: "gearbox-torque", rule: "largest drum-shaft torque ≤ gearbox rated output torque", source: "gear unit rating from the register; Newton's second law", needs: join(loadNeeds, []string{"gearbox_rated_torque", "drum_diameter", "gear_ratio", "drum_inertia", "motor_inertia", "brake_torque"}), uses: brakeUses, loadDependent: true,
			applicable: func(d *hoistData) (bool, string) {
				if d.isMissing("gearbox_rated_torque") {
					return false, "no gearbox rated torque in the register"
				}
				return true, ""
			},
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				d.closedLimit = calc.GearboxTorqueLimitKg
				return calc.GearboxTorque, nil, nil
			}},
		{id: "brake-holding", needs: join(loadNeeds, []string{"brake_torque", "drum_diameter", "gear_ratio"}), uses: brakeUses, loadDependent: true, linear: true,
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				f, r1, err := ruleOf(d, "brake.factor")
				if err != nil {
					return nil, nil, err
				}
				each, r2, err := d.ruleWord("brake.each")
				if err != nil {
					return nil, nil, err
				}
				e := each == "yes"
				return func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeHolding(h, f, e) }, d.usedRows(r1, r2), nil
			}},
		{id: "brake-stop", needs: join(loadNeeds, []string{"brake_torque", "drum_diameter", "gear_ratio", "drum_inertia", "motor_inertia", "hoist_speed"}), uses: join(brakeUses, []string{"rope_mbf"}), loadDependent: true,
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				lim := math.NaN()
				var rules []int
				if i := d.c.opts.Rules.LookupIndex("brake_stop.max_distance", d.scope); i >= 0 {
					v, err := d.c.opts.Rules.ValueAt(i)
					if err != nil {
						return nil, nil, err
					}
					d.rules = append(d.rules, i)
					lim, rules = v, d.usedRows(i)
				}
				if len(rules) == 0 {
					d.closedLimit = calc.BrakeStopLimitKg
				}
				return func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeStop(h, lim) }, rules, nil
			}},
		{id: "runaway", rule: "information: no limit", source: "Newton's second law (brake released, motor unpowered)", needs: join(loadNeeds, []string{"drum_diameter", "gear_ratio", "drum_inertia", "motor_inertia", "hoist_speed"}), uses: driveUses,
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				return calc.Runaway, nil, nil
			}},
		{id: "shaft-load", rule: "information: no limit", source: "statics: drum weight plus rope pull", needs: join(loadNeeds, []string{"drum_mass"}), uses: reevingUses,
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				return calc.ShaftLoad, nil, nil
			}},
		{id: "design-life", needs: []string{"operating_hours"}, uses: []string{"duty_group", "load_spectrum", "spectrum_factor", "usage_records", "commissioned"}, nullsRating: true,
			prepare: prepareDesignLife},
		{id: "inspection-due", needs: []string{"last_inspection"}, uses: []string{"service"},
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				months, r, err := ruleOf(d, "inspection.interval_months")
				if err != nil {
					return nil, nil, err
				}
				last := d.a.Get("last_inspection").Date
				asOf := d.c.opts.AsOf
				interval := int(math.Round(months))
				if d.c.opts.Record {
					return func(calc.Hoist) (calc.Outcome, error) {
						return calc.InspectionDue(last, asOf, interval)
					}, d.usedRows(r), nil
				}
				return func(h calc.Hoist) (calc.Outcome, error) {
					return calc.InspectionDueNumbers(last, asOf, interval, h.Figs)
				}, d.usedRows(r), nil
			}},
		{id: "load-test", needs: join(loadNeeds, []string{"test_load"}), uses: []string{"test_type", "proposed_rated_load"}, noBand: true,
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				f, r, err := ruleOf(d, "load_test.factor")
				if err != nil {
					return nil, nil, err
				}
				test, _ := d.num("test_load")
				if d.c.opts.Record {
					return func(h calc.Hoist) (calc.Outcome, error) { return calc.LoadTest(h.RatedLoadKg, test, f) }, d.usedRows(r), nil
				}
				return func(h calc.Hoist) (calc.Outcome, error) { return calc.LoadTestNumbers(h.RatedLoadKg, test, f, h.Figs) }, d.usedRows(r), nil
			}},
		{id: "rope-wear", needs: []string{"rope_diameter"}, uses: []string{"rope_measured_diameter", "rope_broken_wires", "rope_reference_diameter", "rope_construction", "rope_fitted"}, nullsRating: true,
			prepare: prepareRopeWear},
	}
}

func prepareDesignLife(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
	if d.group == 0 {
		return nil, nil, &Error{Kind: Missing, Field: "duty_group", Err: errors.New("needs the duty group (or the usage to derive it)")}
	}
	km, ok := d.num("spectrum_factor")
	if !ok {
		if s := d.text("load_spectrum"); len(s) == 2 {
			km, ok = calc.SpectrumFactor(int(s[1] - '0'))
		}
	}
	if !ok {
		return nil, nil, &Error{Kind: Missing, Field: "load_spectrum", Err: errors.New("needs the load spectrum (L1–L4) or the spectrum factor")}
	}
	dur, r1, err := d.rule("life.duration_h")
	if err != nil {
		return nil, nil, err
	}
	x, r2, err := d.rule("life.record_factor")
	if err != nil {
		return nil, nil, err
	}
	hours, _ := d.num("operating_hours")
	in := calc.LifeInput{OperatingHours: hours / 3600, Km: km, RecordFactor: x, FullLoadDurationH: dur,
		Commissioned: d.a.Get("commissioned").Date, AsOf: d.c.opts.AsOf, SkipRecord: !d.c.opts.Record}
	return func(h calc.Hoist) (calc.Outcome, error) {
		in := in
		in.Figs = h.Figs
		return calc.DesignLife(in)
	}, d.usedRows(r1, r2), nil
}

func prepareRopeWear(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
	meas, okm := d.num("rope_measured_diameter")
	bw, okb := d.num("rope_broken_wires")
	if !okm && !okb {
		return nil, nil, &Error{Kind: Missing, Field: "rope_measured_diameter", Err: errors.New("needs the measured rope diameter or the broken-wire count from the last inspection")}
	}
	in := calc.WearInput{NominalM: d.h.RopeDiameterM, MeasuredM: meas, BrokenWires: -1,
		Fitted: d.a.Get("rope_fitted").Date, AsOf: d.c.opts.AsOf, SkipRecord: !d.c.opts.Record}
	in.ReferenceM, _ = d.num("rope_reference_diameter")
	if basis, _, err := d.ruleWord("rope_wear.basis"); err == nil && basis == "nominal" {
		// The profile measures the reduction from nominal (ASME B30.2), whatever
		// reference diameter the register gives.
		in.ReferenceM = 0
	}
	if okb {
		in.BrokenWires = int(bw)
	}
	rules := d.rowBuf[:0]
	if okm {
		v, r, err := d.rule("rope_wear.max_reduction")
		if err != nil {
			return nil, nil, err
		}
		rules = append(rules, r)
		if d.c.opts.Rules.Rules[r].Dimension() == "length" {
			in.MaxReductionM = v
		} else {
			in.MaxReductionFraction = v
		}
	}
	if okb {
		v, r, err := d.rule("rope_wear.broken_wires_lay")
		if err != nil {
			return nil, nil, err
		}
		rules = append(rules, r)
		in.MaxBrokenWires = int(v)
	}
	d.rowBuf = rules // keep a grown buffer
	return func(h calc.Hoist) (calc.Outcome, error) {
		in := in
		in.Figs = h.Figs
		return calc.RopeWear(in)
	}, rules, nil
}

// Check evaluates one asset: every check at its rated load (and at the proposed load
// when there is one), the maximum permissible rated load and its governing check.
func (c *Checker) Check(a *Asset) *Result {
	r := c.newResult(a)
	if a.Blank {
		r.Status = StatusUnchecked
		r.MinMargin = math.NaN()
		r.MaxRatedLoadKg = math.NaN()
		r.Rating.Note = "empty row"
		for _, p := range a.Problems {
			r.Messages = append(r.Messages, p.Error())
		}
		if len(r.Messages) == 0 {
			r.Messages = append(r.Messages, fmt.Sprintf("row %d is empty", a.Row))
		}
		return r
	}
	s := c.getScratch()
	defer c.putScratch(s)
	d := &s.d
	c.resolve(a, d)
	d.h.Figs = r.figs
	prepared := s.prepared
	for i := range c.specs {
		prepared[i] = c.prepare(d, &c.specs[i])
	}
	r.Evaluation = c.evaluate(d, d.h, prepared, true, r.Checks[:0])
	if hs := r.Check("hoist-speed"); hs != nil && hs.Status == StatusFail {
		if vc := calc.FigureValue(hs.Figures, "calculated_speed_m_s"); !math.IsNaN(vc) {
			d.messages = append(d.messages, fmt.Sprintf("the declared hoist speed %.3g m/min disagrees with the drive's %.3g m/min (motor speed, gear ratio, drum, reeving): motor-power, brake-stop and runaway use the declared speed, so check the register before trusting them",
				d.h.HoistSpeedMS*60, vc*60))
		}
	}
	r.Rating = c.rating(d, prepared, r.Checks)

	proposed := math.NaN()
	if v, ok := d.num("proposed_rated_load"); ok {
		proposed = v
	} else if c.opts.RatedLoadFactor > 0 && d.h.RatedLoadKg > 0 {
		proposed = c.opts.RatedLoadFactor * d.h.RatedLoadKg
	}
	if !math.IsNaN(proposed) {
		e := c.evaluate(d, d.h.WithRatedLoad(proposed), prepared, false, r.spare.Checks[:0])
		for i := range e.Checks {
			e.Checks[i].LimitRatedLoadKg = r.Checks[i].LimitRatedLoadKg
		}
		r.spare = e
		r.Proposed = &r.spare
	}
	r.Messages = append(r.Messages, d.messages...)
	r.DefaultsUsed = d.defaults
	r.Derived = d.derived
	r.rules = append(r.rules[:0], d.rules...)
	return r
}

// newResult returns an empty Result for a, with the memory of a recycled one when there
// is one. A new Result has no figure memory of its own (its checks' figures are each
// allocated, as a kept Result's should be: a FigureBuf's blocks are sized for reuse);
// recycle gives it one.
func (c *Checker) newResult(a *Asset) *Result {
	r, ok := c.results.Get().(*Result)
	if !ok {
		r = new(Result)
	}
	r.Asset = a
	return r
}

// recycle takes back a Result that nothing reads any more (Run: after the Sink, which
// forgets results, has written it and the summary has counted it), so that a later
// Check reuses its memory: the checks, the proposed evaluation's checks, the figures
// (calc.FigureBuf) and the rule rows. Strings are never reused, so a string taken from
// the Result stays valid; its slices do not.
func (c *Checker) recycle(r *Result) {
	figs, checks, proposed, rules := r.figs, r.Checks[:0], r.spare.Checks[:0], r.rules[:0]
	if figs == nil {
		figs = new(calc.FigureBuf) // from its next use on
	}
	figs.Reset()
	*r = Result{figs: figs, rules: rules}
	r.Checks, r.spare.Checks = checks, proposed
	c.results.Put(r)
}

type preparedCheck struct {
	spec *checkSpec
	// closedLimit, when set, gives the check's limiting rated load in closed form.
	closedLimit func(h calc.Hoist) float64
	run         func(calc.Hoist) (calc.Outcome, error)
	status      Status // StatusPass when runnable; otherwise the status to report
	message     string
	rule        string
	source      string
}

func (c *Checker) prepare(d *hoistData, s *checkSpec) preparedCheck {
	p := preparedCheck{spec: s}
	if s.applicable != nil {
		if ok, why := s.applicable(d); !ok {
			p.status, p.message = StatusInfo, "not applicable: "+why
			return p
		}
	}
	needs := s.needsAt
	if s.needsOuterLayer && d.h.Layers > 1 {
		needs = s.needsLayeredAt
	}
	for _, i := range s.usesAt {
		if e := d.bad[i]; e != nil {
			p.status, p.message = StatusError, e.Error()
			return p
		}
	}
	var missing []string
	for _, i := range needs {
		if e := d.bad[i]; e != nil {
			p.status, p.message = StatusError, e.Error()
			return p
		}
		if d.missing[i] {
			missing = append(missing, c.columns[i].Header)
		}
	}
	if len(missing) > 0 {
		p.status, p.message = StatusUnchecked, "needs "+strings.Join(missing, ", ")
		return p
	}
	run, rules, err := s.prepare(d)
	if err != nil {
		var fe *Error
		if errors.As(err, &fe) && fe.Kind == Missing {
			p.status, p.message = StatusUnchecked, fe.Err.Error()
		} else {
			p.status, p.message = StatusUnchecked, err.Error()
		}
		return p
	}
	p.run = run
	p.closedLimit, d.closedLimit = d.closedLimit, nil
	p.rule, p.source = d.ruleTexts(rules)
	if p.rule == "" {
		p.rule, p.source = s.rule, s.source
	}
	if s.id == "brake-stop" && len(rules) == 0 {
		p.rule, p.source = "information: no stopping-distance limit in the rules in force; fails only when the brakes cannot stop the load", "Newton's second law (emergency stop while lowering)"
	}
	return p
}

// evaluate runs every prepared check at hoist state h.
// The checks are appended to dst (empty, perhaps with room for them).
func (c *Checker) evaluate(d *hoistData, h calc.Hoist, prepared []preparedCheck, limits bool, dst []CheckResult) Evaluation {
	if dst == nil {
		dst = make([]CheckResult, 0, len(prepared))
	}
	e := Evaluation{RatedLoadKg: h.RatedLoadKg, MinMargin: math.NaN(), Status: StatusPass, Checks: dst}
	for _, p := range prepared {
		cr := CheckResult{ID: p.spec.id, Demand: math.NaN(), Capacity: math.NaN(), Utilisation: math.NaN(),
			Margin: math.NaN(), LimitRatedLoadKg: math.NaN(), Rule: p.rule, Source: p.source,
			LoadDependent: p.spec.loadDependent}
		if p.run == nil {
			cr.Status, cr.Message = p.status, p.message
		} else {
			o, err := p.run(h)
			if err != nil {
				cr.Status, cr.Message = StatusError, c.calcError(d, p.spec.id, err).Error()
			} else {
				c.fill(&cr, o, p.spec.noBand)
				if limits && p.spec.loadDependent {
					cr.LimitRatedLoadKg = c.limitLoad(h, p, o)
				}
			}
		}
		e.Checks = append(e.Checks, cr)
		if cr.Status.Worse(e.Status) {
			e.Status = cr.Status
		}
		// A check judged without the marginal band (load-test) can pass at margin 0: it
		// would outrank a genuinely marginal check, so it does not set the smallest margin
		// unless it fails.
		counts := !p.spec.noBand || cr.Status == StatusFail
		if counts && (cr.Status == StatusPass || cr.Status == StatusMarginal || cr.Status == StatusFail) {
			if !math.IsNaN(cr.Margin) && (math.IsNaN(e.MinMargin) || cr.Margin < e.MinMargin) {
				e.MinMargin = cr.Margin
			}
		}
	}
	e.WorstCheck = worstCheck(e.Checks)
	return e
}

// worstCheck names the check behind the hoist's verdict: among the pass / marginal / fail
// checks of the worst status, the one with the smallest margin (a fleet angle below its
// minimum is marginal with a large margin, so the status comes first). A failing check
// without a margin (brakes that cannot stop) counts as the smallest.
func worstCheck(checks []CheckResult) string {
	worst, best, bestMargin := StatusPass, "", math.Inf(1)
	for _, c := range checks {
		if c.Status != StatusPass && c.Status != StatusMarginal && c.Status != StatusFail {
			continue
		}
		if c.ID == "load-test" && c.Status != StatusFail {
			continue // judged without the band: a pass at margin 0 is not a near miss
		}
		m := c.Margin
		if math.IsNaN(m) {
			m = math.Inf(-1)
		}
		if c.Status.Worse(worst) || (c.Status == worst && (best == "" || m < bestMargin)) {
			worst, best, bestMargin = c.Status, c.ID, m
		}
	}
	return best
}

func (c *Checker) calcError(d *hoistData, op string, err error) *Error {
	e := &Error{Op: op, Kind: Calc, Asset: d.a.ID, Err: err}
	var re *calc.RangeError
	if errors.As(err, &re) {
		e.Kind = OutOfRange
		e.Field = re.Field
		if v := d.a.Get(re.Field); v.State == OK {
			e.Cell = v.Cell
		}
	}
	return e
}

func (c *Checker) fill(cr *CheckResult, o calc.Outcome, noBand bool) {
	cr.Demand, cr.Capacity, cr.Utilisation = o.Demand, o.Capacity, o.Utilisation
	cr.Unit, cr.Figures, cr.Steps = o.Unit, o.Figures, o.Steps
	if o.Note != "" {
		cr.Message = o.Note
	}
	switch o.Verdict {
	case calc.Info:
		cr.Status = StatusInfo
		cr.Utilisation = math.NaN()
	case calc.Fail:
		cr.Status = StatusFail
	case calc.Marginal:
		cr.Status = StatusMarginal
	default:
		band := c.opts.MarginalBand
		if noBand {
			band = 0
		}
		cr.Status = StatusOf(o.Utilisation, band)
	}
	if !math.IsNaN(cr.Utilisation) && !math.IsInf(cr.Utilisation, 0) {
		cr.Margin = 1 - cr.Utilisation
	}
}

// limitFunc is the quantity whose root is the check's limiting rated load: utilisation
// − 1, or for a check without a limit (brake-stop with no distance rule) the margin to
// being unable to stop: +1 when the brakes cannot stop the load, −1 when they can.
func limitFunc(p preparedCheck) func(h calc.Hoist) (float64, bool) {
	return func(h calc.Hoist) (float64, bool) {
		h.SkipRecord, h.SkipDetail = true, true // the search needs numbers only
		o, err := p.run(h)
		if err != nil {
			return 0, false
		}
		if o.Verdict == calc.Fail {
			return 1, true
		}
		if o.Verdict == calc.Info || math.IsNaN(o.Utilisation) {
			if p.spec.id == "brake-stop" {
				return -1, true
			}
			return 0, false
		}
		return o.Utilisation - 1, true
	}
}

// maxSearchKg bounds the rated-load search: no drum hoist in a register carries more.
const maxSearchKg = 1e7

// noLoadKg stands in for an empty hook where the checks cannot evaluate one (no hook block
// and no inertia: nothing to move): far below the 0.1 kg the rating is given to.
const noLoadKg = 1e-3

// limitLoad is the rated load at which the check reaches its limit (design.md: closed form
// where linear, bisection otherwise, floored to 0.1 kg). NaN when the limit is not
// reached below maxSearchKg or cannot be evaluated; 0 when the check fails at no load.
//
// The search starts from the hoist's own rated load: a check that passes there is
// followed upwards to the load where it stops passing, one that fails there downwards.
// Not every check is monotonic in the load over the whole range (with a drum brake the
// rotor's share of an emergency stop is largest for the lightest load), so the bracket
// around the actual rating is the one that matters.
func (c *Checker) limitLoad(h calc.Hoist, p preparedCheck, o calc.Outcome) float64 {
	if p.closedLimit != nil {
		if v := p.closedLimit(h); !math.IsNaN(v) {
			if v > maxSearchKg {
				return math.NaN() // as the search: not reached below maxSearchKg
			}
			return floorTenth(v)
		}
	}
	f := limitFunc(p)
	// atNoLoad evaluates the check with no rated load on the hook. A train with no hook
	// block and no inertia has nothing to move then, and the checks refuse it: a load far
	// below the 0.1 kg resolution stands in for it.
	atNoLoad := func() (float64, bool) {
		if f0, ok := f(h.WithRatedLoad(0)); ok {
			return f0, true
		}
		return f(h.WithRatedLoad(noLoadKg))
	}
	if p.spec.linear && !math.IsNaN(o.Utilisation) && h.RatedLoadKg > 0 {
		f0, ok := atNoLoad()
		if !ok {
			return math.NaN()
		}
		if f0 > 0 {
			return 0
		}
		// Utilisation is affine in the rated load: u(m) = u(0) + m (u(m_L) − u(0)) / m_L.
		u0, u1 := f0+1, o.Utilisation
		slope := (u1 - u0) / h.RatedLoadKg
		if slope <= 0 {
			return math.NaN()
		}
		return floorTenth((1 - u0) / slope)
	}
	fr, ok := f(h)
	if !ok {
		return math.NaN()
	}
	var lo, hi float64
	if fr <= 0 {
		// Passes at the rated load: bracket upwards.
		lo, hi = h.RatedLoadKg, math.Min(math.Max(2*h.RatedLoadKg, 100), maxSearchKg)
		for {
			fh, ok := f(h.WithRatedLoad(hi))
			if !ok {
				return math.NaN()
			}
			if fh > 0 {
				break
			}
			if hi >= maxSearchKg { // as the closed forms: no limit below maxSearchKg
				return math.NaN()
			}
			lo = hi
			hi = math.Min(2*hi, maxSearchKg)
		}
	} else {
		// Fails at the rated load: the limit lies below it, if anywhere.
		f0, ok := atNoLoad()
		if !ok {
			return math.NaN()
		}
		if f0 > 0 {
			return 0
		}
		lo, hi = 0, h.RatedLoadKg
	}
	g := func(m float64) (float64, bool) { return f(h.WithRatedLoad(m)) }
	lo, hi, ok = rootIllinois(g, lo, hi)
	if !ok {
		return math.NaN()
	}
	// The root lies in [lo, hi], at most 0.01 kg wide: at most one 0.1 kg step falls
	// inside, and the answer is that step when the check still passes there.
	v := floorTenth(lo)
	if c := floorTenth(hi); c > v {
		if fc, ok := g(c); ok && fc <= 0 {
			v = c
		}
	}
	return v
}

// rootIllinois narrows [lo, hi] with f(lo) ≤ 0 < f(hi) to at most 0.01 kg around the
// largest load where f ≤ 0: regula falsi with the Illinois modification (the retained end's value is
// halved when the same end is kept twice), which converges in a handful of evaluations
// for the smooth, nearly linear utilisations of the checks; every tenth step is a plain
// bisection so that a kink or a jump (brakes that cannot stop) still converges.
func rootIllinois(f func(float64) (float64, bool), lo, hi float64) (float64, float64, bool) {
	flo, ok := f(lo)
	if !ok {
		return 0, 0, false
	}
	fhi, ok := f(hi)
	if !ok {
		return 0, 0, false
	}
	side := 0
	for k := 0; hi-lo > 0.01 && k < 200; k++ {
		x := lo - flo*(hi-lo)/(fhi-flo)
		if k%10 == 9 || !(x > lo && x < hi) || math.IsInf(fhi, 0) || math.IsInf(flo, 0) {
			x = (lo + hi) / 2
		}
		// Keep the bracket from collapsing onto one end by less than the tolerance.
		x = math.Min(math.Max(x, lo+0.004), hi-0.004)
		fx, ok := f(x)
		if !ok {
			return 0, 0, false
		}
		if fx > 0 {
			hi, fhi = x, fx
			if side == 1 {
				flo /= 2
			}
			side = 1
		} else {
			lo, flo = x, fx
			if side == -1 {
				fhi /= 2
			}
			side = -1
		}
		// Regula falsi lands next to the root of a nearly linear function at once but
		// closes the bracket from one side only: probe the tolerance beyond the new end.
		if hi-lo > 0.01 {
			probe := lo + 0.01
			if fx > 0 {
				probe = hi - 0.01
			}
			fp, ok := f(probe)
			if !ok {
				return 0, 0, false
			}
			if fp > 0 {
				hi, fhi = probe, fp
			} else {
				lo, flo = probe, fp
			}
		}
	}
	return lo, hi, true
}

func floorTenth(kg float64) float64 { return math.Floor(kg*10+1e-9) / 10 }

// rating is the maximum permissible rated load: the smallest limit over the
// load-dependent checks, null when a load-independent check fails or a load-dependent
// check could not run, capped by the component WLL.
func (c *Checker) rating(d *hoistData, prepared []preparedCheck, checks []CheckResult) Rating {
	rt := Rating{MaxRatedLoadKg: math.NaN()}
	var notRun []string
	for i, cr := range checks {
		spec := prepared[i].spec
		if spec.nullsRating && cr.Status == StatusFail {
			rt.GoverningCheck = cr.ID
			rt.Note = cr.ID + " fails whatever the load: no rating can be given"
			return rt
		}
		if spec.loadDependent && (cr.Status == StatusError || cr.Status == StatusUnchecked) {
			notRun = append(notRun, cr.ID)
		}
		if spec.loadDependent && cr.Status == StatusFail && math.IsNaN(cr.LimitRatedLoadKg) {
			// Failing at the rated load without a limit found: leaving it out would rate
			// the hoist above a load it already fails at.
			rt.GoverningCheck = cr.ID
			rt.Note = cr.ID + " fails and the load at which it would pass could not be found: no rating can be given"
			return rt
		}
	}
	if len(notRun) > 0 {
		rt.Note = "not rated: " + strings.Join(notRun, ", ") + " could not be checked"
		return rt
	}
	for _, cr := range checks {
		if !cr.LoadDependent || math.IsNaN(cr.LimitRatedLoadKg) {
			continue
		}
		if math.IsNaN(rt.MaxRatedLoadKg) || cr.LimitRatedLoadKg < rt.MaxRatedLoadKg {
			rt.MaxRatedLoadKg, rt.GoverningCheck = cr.LimitRatedLoadKg, cr.ID
		}
	}
	if rt.MaxRatedLoadKg == 0 {
		rt.Note = rt.GoverningCheck + " fails even with no rated load on the hook"
	}
	if wll, ok := d.num("component_wll"); ok && (math.IsNaN(rt.MaxRatedLoadKg) || wll < rt.MaxRatedLoadKg) {
		mech := rt.MaxRatedLoadKg
		rt.MaxRatedLoadKg, rt.GoverningCheck = floorTenth(wll), "component-wll"
		if math.IsNaN(mech) {
			rt.Note = "capped by the component WLL"
		} else {
			rt.Note = "capped by the component WLL; the mechanism alone would allow " + strconv.FormatFloat(mech, 'f', 1, 64) + " kg"
		}
	}
	return rt
}

// ruleUses turns use counts into the audit list: every rule in force, sorted by rule id
// (table order within an id).
func ruleUses(t *templates.Table, counts []int) []RuleUse {
	out := make([]RuleUse, 0, len(t.Rules))
	for i, r := range t.Rules {
		n := 0
		if i < len(counts) {
			n = counts[i]
		}
		out = append(out, RuleUse{ID: r.ID, Groups: r.Groups, When: r.When, Value: r.Value, Unit: r.Unit,
			Source: r.Source, Provenance: r.Provenance, Note: r.Note, Origin: r.Origin, Uses: n})
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].ID < out[j].ID })
	return out
}
