package fleet

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"

	"hoistfleet/calc"
	"hoistfleet/fleet/rules"
)

// defaultText is the text saying a rule default was applied:
// fmt.Sprintf(format, v) + " (rule " + rule + ")".
func defaultText(format, rule string, v float64) string {
	return fmt.Sprintf(format, v) + " (rule " + rule + ")"
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
//
// What it beats: parsing the text for every hoist. BenchmarkCheckEach (2000 generated
// hoists, CPU time of 50 000 checks, 12 interleaved runs, 2026-12-05) takes 1.30× the
// time without it (22.5 → 29.5 µs a hoist).
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

// hoistData is one asset's inputs resolved for the checks: values, defaults, scope.
type hoistData struct {
	a        *Asset
	h        calc.Hoist
	group    int
	scope    rules.Scope
	missing  []bool   // empty fields, by schema index
	bad      []*Error // unreadable fields, by schema index
	defaults []string
	derived  []string
	messages []string
	gaps     []Gap // the columns the checks lack (Result.Gaps)
	rules    []int // rows of the rule table used (indices into Rules.Rules, for the audit counts)
	rowBuf   []int // the rows one check's prepare used, read before the next check's prepare
	// closedLimit is handed from a check's prepare to its preparedCheck: the limiting
	// rated load in closed form, when the check has one.
	closedLimit func(h calc.Hoist) float64
	// Review limits (design.md Revision 2): reviewRows are the review rows (provenance
	// "memory, low") that apply to the rule ids one check's prepare looked up;
	// reviewOnly is set when an id had a review row and no verified one (the prepare then
	// used the review row); reviewMode makes the lookups prefer the review rows, to
	// prepare the check once more against them.
	reviewRows []int
	reviewOnly bool
	reviewMode bool
	c          *Checker
}

// lookupRule returns the row of id that applies to this hoist: the verified row, or,
// in review mode, the review row where there is one; it notes the review rows it saw.
// -1 when no row applies.
func (d *hoistData) lookupRule(id string) int {
	i, ri := d.c.opts.Rules.LookupIndexes(id, d.scope)
	if ri < 0 {
		return i
	}
	if d.reviewMode {
		return ri
	}
	d.reviewRows = append(d.reviewRows, ri)
	if i < 0 {
		d.reviewOnly = true
		return ri
	}
	return i
}

// optionalRule looks up a rule that the rules in force may leave out: its value and
// row, or ok false (and no error) when no row applies.
func (d *hoistData) optionalRule(id string) (v float64, row int, ok bool, err error) {
	v, row, ok, err = d.peekRule(id)
	if ok {
		d.rules = append(d.rules, row)
	}
	return v, row, ok, err
}

// peekRule is optionalRule without recording the use (a check deciding whether it
// applies at all).
func (d *hoistData) peekRule(id string) (v float64, row int, ok bool, err error) {
	i := d.lookupRule(id)
	if i < 0 {
		return 0, -1, false, nil
	}
	if v, err = d.c.opts.Rules.ValueAt(i); err != nil {
		return 0, -1, false, err
	}
	return v, i, true, nil
}

// optionalWord looks up a word rule that the rules in force may not have ("" when no
// row applies).
func (d *hoistData) optionalWord(id string) (string, int) {
	i := d.lookupRule(id)
	if i < 0 {
		return "", -1
	}
	d.rules = append(d.rules, i)
	return strings.ToLower(strings.TrimSpace(d.c.opts.Rules.Rules[i].Value)), i
}

// reviewPart looks up a rule that judges one part of a check and whose row may be a
// review limit (provenance "memory, low": design.md Revision 2, "Review limits"): the
// verified row where the rules in force have one, recorded as used; without one, ok
// false. A review row is noted (reviewRows) without making the whole check one judged
// against review rows only (reviewOnly stays as it was), so the check's other parts keep
// their verdict and the review prepares the check once more with this part; in review
// mode the review row is returned. ok false, no error, when no row applies at all.
func (d *hoistData) reviewPart(id string) (v float64, row int, ok bool, err error) {
	t := d.c.opts.Rules
	i, ri := t.LookupIndexes(id, d.scope)
	if d.reviewMode && ri >= 0 {
		i = ri
	} else if ri >= 0 {
		d.reviewRows = append(d.reviewRows, ri)
	}
	if i < 0 {
		return 0, -1, false, nil
	}
	if v, err = t.ValueAt(i); err != nil {
		return 0, -1, false, err
	}
	d.rules = append(d.rules, i)
	return v, i, true, nil
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
	i := d.lookupRule(id)
	if i < 0 {
		return 0, -1, d.noRow(id)
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
	i := d.lookupRule(id)
	if i < 0 {
		return "", -1, d.noRow(id)
	}
	d.rules = append(d.rules, i)
	return strings.ToLower(strings.TrimSpace(t.Rules[i].Value)), i, nil
}

// noRow is the error for a rule no row of the rules in force applies to: on a hoist
// whose duty group is not known, the missing Duty group (the rows are by group), else the
// table's own message.
func (d *hoistData) noRow(id string) error {
	t := d.c.opts.Rules
	if d.scope.Group == 0 {
		return &Error{Kind: Missing, Field: "duty_group", Asset: d.a.ID,
			Err: fmt.Errorf("needs Duty group: the %s rules give %s by duty group", t.Profile, id)}
	}
	return t.NoRowError(id, d.scope)
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
			if e.Kind != HeaderProblem && e.Kind != Unitless { // said once, with the header, not on every row
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
	h.GearboxPeakTorqueNm, _ = d.num("gearbox_peak_torque")
	h.MotorPowerW, _ = d.num("motor_power")
	h.MotorSpeedRPM, _ = d.num("motor_speed")
	h.PeakTorqueRatio = d.numRule("motor_peak_torque", "default.peak_torque_ratio", "motor peak torque %g × rated")
	h.MotorInertiaKgM2, _ = d.num("motor_inertia")
	h.BrakeTorqueNm, _ = d.num("brake_torque")
	h.BrakeOnDrum = d.text("brake_location") == "drum"
	h.Brakes = int(d.numDefault("brakes", 1, ""))
	d.scope.Nums["brakes"] = float64(h.Brakes)
	h.BrakeDelayS = d.numRule("brake_delay", "default.brake_delay", "brake delay %g s")
	h.ComponentWLLKg, _ = d.num("component_wll")
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
			// A value the verdicts rest on that no certificate gives: listed with the
			// defaults (design.md Revision 2); a certificate value always wins.
			d.defaults = append(d.defaults, fmt.Sprintf("rope MBF %.1f kN derived from grade and construction (EN 12385-4), no certificate value in the register", h.RopeMBFN/1000))
		}
	}
	d.h = h
	d.plausibility()
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
		d.defaults = append(d.defaults, defaultText(format, ruleID, v))
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
