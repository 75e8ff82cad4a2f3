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
	"time"

	"hoistfleet/calc"
	"hoistfleet/fleet/rules"
	"hoistfleet/fleet/schema"
)

// Options configure a run. The zero value is not usable: Rules is required.
type Options struct {
	Rules           *rules.Table
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
	// Baseline, when set, is an earlier run: each result says what changed since
	// (Result.Change) and the summary lists the changes and the hoists removed.
	Baseline *Baseline
}

// Checker evaluates hoists against the rules in force. It is safe for concurrent use.
type Checker struct {
	opts    Options
	columns []schema.Column // the schema, read once
	specs   []checkSpec     // the checks, built once
	keys    keyIndex        // schema key → index in columns
	texts   sync.Map        // ruleSet → ruleText: the rule and source text of a set of rows
	reviews sync.Map        // ruleSet → reviewText: the texts of a set of review rows
	ropes   ropeCache       // rope construction text → what calc reads from it
	scratch sync.Pool       // *scratch, reused from one Check to the next
	results sync.Pool       // *Result, recycled by Run once written (recycle)
	// attention are the weights of the summary's attention order (rules attention.*).
	attention AttentionWeights
}

// ruleSet names up to eight rows of the rule table (indices, unused slots −1): the rows
// one check used for one hoist.
type ruleSet [8]int32

type ruleText struct{ rule, source string }

// ruleSetOf returns rows as a ruleSet, with ok false when there are too many to fit.
func ruleSetOf(rows []int) (key ruleSet, ok bool) {
	key = ruleSet{-1, -1, -1, -1, -1, -1, -1, -1}
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
	attention, err := NewAttentionWeights(opts.Rules)
	if err != nil {
		return nil, err
	}
	c := &Checker{opts: opts, columns: schema.Columns(), attention: attention}
	keys := make([]string, len(c.columns))
	for i, col := range c.columns {
		keys[i] = col.Key
	}
	c.keys = newKeyIndex(keys)
	c.specs = make([]checkSpec, len(definitions))
	for i, def := range definitions {
		s := &c.specs[i]
		s.Definition = def
		s.needsAt, s.usesAt = c.indices(def.Needs), c.indices(def.Uses)
		s.needsLayeredAt = s.needsAt
		if def.NeedsOuterLayer {
			s.needsLayeredAt = c.indices(join(def.Needs, []string{"rope_diameter"}))
		}
	}
	return c, nil
}

// checkSpec is a check's definition with its keys as schema indices, for one Checker.
type checkSpec struct {
	Definition
	// needsAt and usesAt are Needs and Uses as schema indices; needsLayeredAt is needsAt
	// for a hoist with more than one rope layer.
	needsAt, needsLayeredAt, usesAt []int
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

// Check evaluates one asset: every check at its rated load (and at the proposed load
// when there is one), the maximum permissible rated load and its governing check.
func (c *Checker) Check(a *Asset) *Result {
	r := c.newResult(a)
	if a.Blank {
		r.Status = StatusUnchecked
		r.MinMargin = math.NaN()
		r.MaxRatedLoadKg = math.NaN()
		r.Rating.Note = "empty row"
		r.Evaluation.Action = "Fill in or delete the empty row"
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
	if !(d.h.RatedLoadKg > 0) {
		r.Evaluation.RatedLoadKg = math.NaN() // no rated load in the register: not 0 kg
	}
	for i := range c.specs {
		if after := c.specs[i].afterCheck; after != nil {
			after(d, &r.Checks[i])
		}
	}
	r.Rating = c.rating(d, prepared, r.Checks)
	r.Evaluation.Action = c.action(&r.Evaluation, r.MaxRatedLoadKg)

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
		e.Action = c.action(&e, r.MaxRatedLoadKg)
		r.spare = e
		r.Proposed = &r.spare
	}
	if len(d.gaps) > 0 {
		r.Gaps = slices.Clone(d.gaps)
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
	// review, when set, is the check prepared against the review rows that apply to it
	// (design.md Revision 2, "Review limits"); reviewOnly: some rule had only a review
	// row, so run itself is judged against review rows. reviewRule and reviewSource name
	// those rows, reviewMsg is what the check says when it exceeds them.
	review                              func(calc.Hoist) (calc.Outcome, error)
	reviewOnly                          bool
	reviewRule, reviewSource, reviewMsg string
}

// badStatus is the status of a check that needs an unreadable value: error, except for
// a value the register gives without a unit, which is data missing (unchecked), not
// data wrong.
func badStatus(e *Error) Status {
	if e.Kind == Unitless {
		return StatusUnchecked
	}
	return StatusError
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
	if d.h.Layers > 1 {
		needs = s.needsLayeredAt
	}
	gapsFrom := len(d.gaps)
	defer func() {
		if p.run != nil || p.status != StatusUnchecked {
			d.gaps = d.gaps[:gapsFrom] // the check runs, or fails on a bad value
		} else if len(d.gaps) == gapsFrom+1 {
			d.gaps[gapsFrom].Alone = true
		}
	}()
	d.noteGaps(s, needs)
	for _, i := range s.usesAt {
		if e := d.bad[i]; e != nil {
			p.status, p.message = badStatus(e), e.Error()
			return p
		}
	}
	missingNeed := false
	for _, i := range needs {
		if e := d.bad[i]; e != nil {
			p.status, p.message = badStatus(e), e.Error()
			return p
		}
		missingNeed = missingNeed || d.missing[i]
	}
	if missingNeed {
		// Every column the check lacks, the duty group included (noteGaps).
		p.status, p.message = StatusUnchecked, "needs "+strings.Join(d.gapHeaders(gapsFrom), ", ")
		return p
	}
	d.reviewRows, d.reviewOnly = d.reviewRows[:0], false
	run, rules, err := s.prepare(d)
	if err != nil {
		var fe *Error
		if errors.As(err, &fe) && fe.Kind == Missing {
			p.status, p.message = StatusUnchecked, fe.Err.Error()
			if _, ok := c.keys.lookup(fe.Field); ok && len(d.gaps) == gapsFrom {
				d.gaps = append(d.gaps, Gap{Key: fe.Field, Check: s.ID})
			}
		} else {
			p.status, p.message = StatusUnchecked, err.Error()
		}
		return p
	}
	p.run = run
	p.closedLimit, d.closedLimit = d.closedLimit, nil
	p.rule, p.source = d.c.ruleTexts(rules)
	if p.rule == "" {
		p.rule, p.source = s.Rule, s.Source
	}
	if len(d.reviewRows) > 0 {
		c.prepareReview(d, s, &p)
	}
	return p
}

// noteGaps notes the columns check s lacks on this hoist: the needed ones that are blank
// and the needed or used ones given without a unit (each unchecks the check). A column
// that is unreadable for another reason makes the check an error, not a gap: then none
// is noted.
func (d *hoistData) noteGaps(s *checkSpec, needs []int) {
	from := len(d.gaps)
	add := func(i int, unitless bool) {
		key := d.c.columns[i].Key
		for _, g := range d.gaps[from:] {
			if g.Key == key {
				return
			}
		}
		d.gaps = append(d.gaps, Gap{Key: key, Check: s.ID, Unitless: unitless})
	}
	for _, i := range s.usesAt {
		if e := d.bad[i]; e != nil {
			if e.Kind != Unitless {
				d.gaps = d.gaps[:from]
				return
			}
			add(i, true)
		}
	}
	for _, i := range needs {
		switch e := d.bad[i]; {
		case e != nil && e.Kind != Unitless:
			d.gaps = d.gaps[:from]
			return
		case e != nil:
			add(i, true)
		case d.missing[i]:
			add(i, false)
		}
	}
	// A check whose rules have rows by duty group only, on a hoist whose group is not
	// known (no Duty group, and none derived), lacks the Duty group too.
	if d.scope.Group == 0 {
		if g, ok := d.c.keys.lookup("duty_group"); ok && d.bad[g] == nil {
			for _, id := range s.Rules {
				if i, ri := d.c.opts.Rules.LookupIndexes(id, d.scope); i < 0 && ri < 0 {
					add(g, false)
					break
				}
			}
		}
	}
}

// gapHeaders are the headers of the columns of the gaps from from on that are blank
// (not those given without a unit: their message says so), for "needs …".
func (d *hoistData) gapHeaders(from int) []string {
	var out []string
	for _, g := range d.gaps[from:] {
		if g.Unitless {
			continue
		}
		if i, ok := d.c.keys.lookup(g.Key); ok {
			out = append(out, d.c.columns[i].Header)
		}
	}
	return out
}

// prepareReview readies the review of a check whose rules have review rows (provenance
// "memory, low": design.md Revision 2, "Review limits"): the check is prepared once more
// with those rows in place of the verified ones. Its verdict and rating stay those of the
// verified rows; exceeding the review rows makes it at worst marginal with a message
// naming them. When a rule has only a review row, the check itself is judged against
// review rows (reviewOnly): then it never fails and does not enter the rating.
func (c *Checker) prepareReview(d *hoistData, s *checkSpec, p *preparedCheck) {
	rt := c.reviewTexts(d.reviewRows)
	p.reviewRule, p.reviewSource, p.reviewMsg = rt.rule, rt.source, rt.msg
	if d.reviewOnly {
		p.reviewOnly = true
		return
	}
	used := len(d.rules)
	d.reviewMode = true
	run, _, err := s.prepare(d)
	d.reviewMode, d.closedLimit = false, nil
	d.rules = append(d.rules[:used], d.reviewRows...) // count the review rows once, not the verified ones again
	if err == nil {
		p.review = run
	}
}

// reviewText is what a check says of the review rows it was judged against.
type reviewText struct{ rule, source, msg string }

// reviewTexts returns the texts of a set of review rows: "id = value" of each, their
// citations, and the message of a check that exceeds them. They repeat from hoist to
// hoist, so they are made once per set.
func (c *Checker) reviewTexts(rows []int) reviewText {
	key, cacheable := ruleSetOf(rows)
	if cacheable {
		if v, ok := c.reviews.Load(key); ok {
			return v.(reviewText)
		}
	}
	t := c.opts.Rules
	var ids, srcs []string
	for _, r := range rows {
		row := &t.Rules[r]
		v := row.ID + " = " + row.Value
		if row.Unit != "" && row.Unit != "1" {
			v += " " + row.Unit
		}
		if !slices.Contains(ids, v) {
			ids = append(ids, v)
		}
		if cite := t.RuleCite(r); !slices.Contains(srcs, cite) {
			srcs = append(srcs, cite)
		}
	}
	rt := reviewText{rule: strings.Join(ids, ", "), source: strings.Join(srcs, "; ")}
	rt.msg = "exceeds " + rt.rule + " (" + rt.source + "), which is not verified: check the document before relying on it"
	if cacheable {
		c.reviews.Store(key, rt)
	}
	return rt
}

// applyReview judges a check that ran against its review limit: the utilisation is
// shown, and exceeding the limit makes a passing check marginal with the message; a
// check judged against review rows only never fails and sets no rating limit.
//
// A check with a review part (hoistData.reviewPart) but nothing verified to judge is
// info; its review still shows, and makes it marginal when exceeded.
func (c *Checker) applyReview(cr *CheckResult, p *preparedCheck, h calc.Hoist) {
	reviewedInfo := cr.Status == StatusInfo && p.review != nil && !p.reviewOnly
	if p.reviewRule == "" || (cr.Status != StatusPass && cr.Status != StatusMarginal && cr.Status != StatusFail && !reviewedInfo) {
		return
	}
	u := cr.Utilisation
	exceeded := cr.Status == StatusFail
	if !p.reviewOnly {
		if p.review == nil {
			return
		}
		hr := h
		hr.SkipRecord, hr.SkipDetail = true, true // the numbers only
		o, err := p.review(hr)
		if err != nil {
			return
		}
		u = o.Utilisation
		exceeded = o.Verdict == calc.Fail || ((o.Verdict == calc.ByUtilisation || o.Verdict == calc.WithoutBand) && u > 1+utilisationTolerance)
	}
	cr.ReviewUtilisation, cr.ReviewRule, cr.ReviewSource = u, p.reviewRule, p.reviewSource
	if p.reviewOnly {
		cr.LimitRatedLoadKg = math.NaN() // the rating search uses the verified rows only
		if cr.Status == StatusFail {
			cr.Status = StatusMarginal
		}
	}
	if !exceeded {
		return
	}
	if cr.Status == StatusPass || reviewedInfo {
		cr.Status = StatusMarginal
	}
	if cr.Message == "" {
		cr.Message = p.reviewMsg
	} else {
		cr.Message += "; " + p.reviewMsg
	}
}

// evaluate runs every prepared check at hoist state h.
// The checks are appended to dst (empty, perhaps with room for them).
func (c *Checker) evaluate(d *hoistData, h calc.Hoist, prepared []preparedCheck, limits bool, dst []CheckResult) Evaluation {
	if dst == nil {
		dst = make([]CheckResult, 0, len(prepared))
	}
	e := Evaluation{RatedLoadKg: h.RatedLoadKg, MinMargin: math.NaN(), Status: StatusPass, Checks: dst}
	for _, p := range prepared {
		cr := CheckResult{ID: p.spec.ID, Demand: math.NaN(), Capacity: math.NaN(), Utilisation: math.NaN(),
			Margin: math.NaN(), LimitRatedLoadKg: math.NaN(), Rule: p.rule, Source: p.source,
			LoadDependent: p.spec.LoadDependent, RequiredCapacity: math.NaN(), ReviewUtilisation: math.NaN()}
		if p.run == nil {
			cr.Status, cr.Message = p.status, p.message
		} else {
			o, err := p.run(h)
			if err != nil {
				cr.Status, cr.Message = StatusError, c.calcError(d, p.spec.ID, err).Error()
			} else {
				c.fill(&cr, o, p.spec.NoBand)
				if limits && p.spec.LoadDependent {
					cr.LimitRatedLoadKg = c.limitLoad(h, p, o)
				}
				c.applyReview(&cr, &p, h)
				if p.spec.LoadDependent && cr.Status == StatusFail {
					// What the check would need to pass: its capacity scaled by the
					// utilisation (= the demand where utilisation is demand / capacity).
					cr.RequiredCapacity = RequiredCapacity(&cr)
				}
			}
		}
		if p.spec.CapsRating && cr.Status == StatusUnchecked && h.RatedLoadKg > d.h.RatedLoadKg {
			// Above the register's rated load with no Component WLL, the hook, block,
			// trolley and structure are not known to carry the load: at best marginal
			// (design.md Revision 2).
			cr.Status = StatusMarginal
			cr.Message = "the proposed " + strconv.FormatFloat(h.RatedLoadKg, 'f', 1, 64) + " kg is above the register's rated load " +
				strconv.FormatFloat(d.h.RatedLoadKg, 'f', 1, 64) + " kg and the register gives no Component WLL: hook, block, trolley and structure must be rated for it"
		}
		e.Checks = append(e.Checks, cr)
		if p.run != nil || p.status != StatusInfo { // not "not applicable"
			e.Coverage.Possible++
			if p.run != nil && cr.Status != StatusError && cr.Status != StatusUnchecked {
				e.Coverage.Run++
			}
		}
		if cr.Status.Worse(e.Status) && !(p.spec.Optional && cr.Status == StatusUnchecked) {
			e.Status = cr.Status
		}
		// A check judged without the marginal band (load-test) can pass at margin 0: it
		// would outrank a genuinely marginal check, so it does not set the smallest margin
		// unless it fails.
		counts := !p.spec.NoBand || cr.Status == StatusFail
		if counts && (cr.Status == StatusPass || cr.Status == StatusMarginal || cr.Status == StatusFail) {
			if !math.IsNaN(cr.Margin) && (math.IsNaN(e.MinMargin) || cr.Margin < e.MinMargin) {
				e.MinMargin = cr.Margin
			}
		}
	}
	e.WorstCheck = worstCheck(e.Checks, prepared)
	return e
}

// worstCheck names the check whose margin is the hoist's smallest margin (design.md
// Revision 2, "Smallest margin"): among the pass / marginal / fail checks that carry a
// margin, the one with the smallest, the worse status first on a tie. A check without a
// utilisation (brakes that cannot stop, an information check) never carries a margin,
// and a check judged without the band (load-test) counts only when it fails, as in
// min_margin. "" when no check carries a margin.
func worstCheck(checks []CheckResult, prepared []preparedCheck) string {
	best, bestMargin, bestStatus := "", math.Inf(1), StatusPass
	for i, c := range checks {
		if c.Status != StatusPass && c.Status != StatusMarginal && c.Status != StatusFail {
			continue
		}
		if prepared[i].spec.NoBand && c.Status != StatusFail {
			continue // judged without the band: a pass at margin 0 is not a near miss
		}
		m := c.Margin
		if math.IsNaN(m) {
			continue
		}
		if best == "" || m < bestMargin || (m == bestMargin && c.Status.Worse(bestStatus)) {
			best, bestMargin, bestStatus = c.ID, m, c.Status
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
	case calc.WithoutBand:
		cr.Status = StatusOf(o.Utilisation, 0)
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

// ruleUses turns use counts into the audit list: every rule in force, sorted by rule id
// (table order within an id).
func ruleUses(t *rules.Table, counts []int) []RuleUse {
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
