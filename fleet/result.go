package fleet

import "hoistfleet/calc"

// CheckResult is one check of one hoist.
type CheckResult struct {
	ID          string
	Status      Status
	Demand      float64 // NaN when not computed
	Capacity    float64 // NaN when not computed
	Unit        string  // unit of Demand and Capacity: SI, or "d", "h", "deg", "1"
	Utilisation float64 // Demand / Capacity, NaN when not computed
	Margin      float64 // 1 − Utilisation, NaN when not computed
	// LimitRatedLoadKg is the rated load at which the check just reaches its limit
	// (utilisation 1), NaN for checks that do not depend on the load or were not run.
	LimitRatedLoadKg float64
	Rule             string // the rule applied, in words: "Zp ≥ 5.6 (M6)"
	Source           string // its published source and provenance label
	Message          string // why unchecked / error, or a note
	Figures          []calc.Figure
	Steps            []calc.Step
	// LoadDependent marks checks that enter the maximum permissible rated load.
	LoadDependent bool
	// RequiredCapacity is what the check would need to pass (capacity × utilisation, in
	// the unit of Capacity), for a failing load-dependent check; NaN otherwise.
	RequiredCapacity float64
	// Review is the check judged against a review limit (a rule row recalled with low
	// confidence: design.md Revision 2), where one applies; ReviewRule is "" otherwise.
	// Exceeding it makes the check at worst marginal, never fail.
	ReviewUtilisation        float64
	ReviewRule, ReviewSource string
}

// Rating is the maximum permissible rated load of one hoist (design.md Revision 2,
// "Component rating and the rating cap").
type Rating struct {
	MaxRatedLoadKg float64 // NaN when none can be given
	GoverningCheck string  // the check (or cap: RatedLoadCap) that sets it
	Note           string  // why null, or which cap applied
	// MechanismCapacityKg is the smallest limiting rated load over the load-dependent
	// checks of the mechanism (all but component-rating); NaN when no rating can be
	// given. It may exceed the nameplate: MaxRatedLoadKg never does without a Component WLL.
	MechanismCapacityKg float64
}

// RatedLoadCap is the governing-check token when the register's own rated load caps
// the rating (no Component WLL given): design.md's contract name.
const RatedLoadCap = "rated-load-cap"

// Evaluation is the set of checks of one hoist at one rated load, with its verdict.
type Evaluation struct {
	RatedLoadKg float64
	// Coverage is how many of the hoist's checks its data let run.
	Coverage   Coverage
	Status     Status
	WorstCheck string  // the check with the smallest margin
	MinMargin  float64 // over pass / marginal / fail checks, NaN when none
	Checks     []CheckResult
	// Action is what to do, in plain words with the numbers ("Derate to 10.4 t, or fit
	// holding brakes of at least 452 N m"); "" when the hoist passes.
	Action string
}

// Result is everything hoistfleet says about one register row.
type Result struct {
	Asset *Asset
	Evaluation
	Rating
	// Gaps are the columns the hoist lacks that its checks need, one per column and
	// check, in check order (nil when it lacks none).
	Gaps         []Gap
	Messages     []string // located problems and notes, in the order found
	DefaultsUsed []string // e.g. "hook block mass 0 kg"
	Derived      []string // values derived rather than given, e.g. "duty group M5 derived from T5 L2"
	// Proposed is the evaluation at the proposed rated load (a Proposed rated load cell,
	// or --rated-load-factor), nil when there is none.
	Proposed *Evaluation
	// Change is what changed since the baseline (check --baseline), nil without one.
	Change *Change
	// Prepared is whatever the Sink's Prepare made of this result (see Sink), for its
	// Write; nil when the Sink prepares nothing.
	Prepared any

	rules []int // rows of the rule table the checks used, counted for the audit sheet

	// figs holds the checks' figures and spare the proposed evaluation (Proposed points
	// to it); both are reused when Run recycles the Result (Checker.recycle).
	figs  *calc.FigureBuf
	spare Evaluation
}

// Check returns the named check of the current evaluation, or nil.
func (e *Evaluation) Check(id string) *CheckResult {
	for i := range e.Checks {
		if e.Checks[i].ID == id {
			return &e.Checks[i]
		}
	}
	return nil
}

// Coverage is how many of a hoist's checks could be run on its data (issue 14: a sparse
// register's verdict rests on few checks, and every output says how few).
type Coverage struct {
	// Run counts the checks evaluated: pass, marginal, fail, or an information result.
	Run int `json:"run"`
	// Possible counts the checks that apply to the hoist: all but "not applicable".
	Possible int `json:"possible"`
}

// Gap is one register column a hoist lacks (blank, or given without a unit) that one of
// its checks needs: the check is unchecked for want of it.
type Gap struct {
	Key   string // the schema column
	Check string // the check it would let run
	// Alone is set when this is the only column the check lacks: filling it in runs
	// the check.
	Alone bool
	// Unitless is set when the column is in the register but gives no unit.
	Unitless bool
}
