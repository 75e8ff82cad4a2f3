package fleet

import (
	"cmp"
	"math"
	"slices"
	"strconv"
	"strings"

	"hoistfleet/calc"
)

// RequiredCapacity is what a failing or marginal check with a utilisation would need to
// pass at the load it was evaluated at: its capacity × utilisation, in the check's unit
// (utilisation = demand / capacity for every check with a limit, so that is the demand
// expressed as a capacity). NaN when the check has no utilisation.
func RequiredCapacity(cr *CheckResult) float64 {
	if math.IsNaN(cr.Utilisation) || math.IsInf(cr.Utilisation, 0) || math.IsNaN(cr.Capacity) {
		return math.NaN()
	}
	return cr.Capacity * cr.Utilisation
}

// adviceInput is what a check's advice reads: the check as evaluated.
type adviceInput struct {
	cr *CheckResult
}

func (in adviceInput) fig(name string) float64 { return calc.FigureValue(in.cr.Figures, name) }

func (in adviceInput) figText(name string) string {
	for _, f := range in.cr.Figures {
		if f.Name == name {
			return f.Text
		}
	}
	return ""
}

// advice is one check's share of a hoist's action: a text, or a remedy that is the
// alternative to derating the hoist to its rating ("derate to 10.4 t, or <remedy>"); the
// remedies of several checks share the one derating.
type advice struct {
	text, remedy string
}

func say(text string) advice { return advice{text: text} }

// orDerate is the advice "derate to the rating, or <remedy>".
func orDerate(remedy string) advice { return advice{remedy: remedy} }

// action is what to do about a hoist evaluated as e, in plain words: the advice of each
// check at the hoist's status (errors with failures too: a register fix is as urgent),
// smallest margin first, without repeats, the remedies that are alternatives to derating
// gathered behind one "derate to <rating>, or". "" for a hoist that passes.
func (c *Checker) action(e *Evaluation, rating float64) string {
	if e.Status == StatusPass || e.Status == StatusInfo {
		return ""
	}
	type item struct {
		advice
		margin float64
		rank   int
	}
	var items []item
	for i := range e.Checks {
		cr := &e.Checks[i]
		rank := -1
		switch {
		case cr.Status == e.Status:
			rank = 0
		case e.Status == StatusFail && cr.Status == StatusError:
			rank = 1
		}
		if rank < 0 {
			continue
		}
		a := c.advice(i, cr)
		if a == (advice{}) {
			continue
		}
		m := cr.Margin
		if math.IsNaN(m) {
			m = math.Inf(-1) // a fail without a margin (brakes that cannot stop) comes first
		}
		items = append(items, item{a, m, rank})
	}
	slices.SortStableFunc(items, func(x, y item) int {
		if x.rank != y.rank {
			return x.rank - y.rank
		}
		return cmp.Compare(x.margin, y.margin)
	})
	var parts, remedies, add []string
	derateAt, addAt := -1, -1
	for _, it := range items {
		switch {
		case strings.HasPrefix(it.text, addPrefix):
			// The columns unchecked checks need, gathered into one list.
			if addAt < 0 {
				addAt = len(parts)
				parts = append(parts, "")
			}
			for _, col := range strings.Split(strings.TrimPrefix(it.text, addPrefix), ", ") {
				if !slices.Contains(add, col) {
					add = append(add, col)
				}
			}
		case it.remedy != "":
			if derateAt < 0 {
				derateAt = len(parts)
				parts = append(parts, "")
			}
			if !slices.Contains(remedies, it.remedy) {
				remedies = append(remedies, it.remedy)
			}
		case !slices.Contains(parts, it.text):
			parts = append(parts, it.text)
		}
	}
	if addAt >= 0 {
		parts[addAt] = addPrefix + strings.Join(add, ", ")
	}
	if derateAt >= 0 {
		d := strings.Join(remedies, ", and ")
		if !math.IsNaN(rating) && rating > 0 {
			d = "derate to " + tonnes(rating) + ", or " + d
		}
		parts[derateAt] = d
	}
	s := strings.Join(parts, "; ")
	if s != "" {
		s = strings.ToUpper(s[:1]) + s[1:]
	}
	return s
}

// addPrefix starts the advice of an unchecked check: the columns to add to the register.
const addPrefix = "add to the register: "

// advice is one check's share of the action: the definition's words for a fail or a
// marginal, the cell to fix for an error, the columns to add for an unchecked check.
func (c *Checker) advice(i int, cr *CheckResult) advice {
	switch cr.Status {
	case StatusError:
		return say("fix the register: " + cr.Message)
	case StatusUnchecked:
		return say(addPrefix + strings.TrimPrefix(cr.Message, "needs "))
	case StatusFail, StatusMarginal:
		if advise := c.specs[i].advise; advise != nil {
			return advise(adviceInput{cr})
		}
		msg := ""
		if cr.Message != "" {
			msg = ": " + cr.Message
		}
		return say(cr.ID + " " + cr.Status.String() + msg)
	}
	return advice{}
}

// designFixed is the advice for a marginal check of a quantity fixed by the design (drum
// and sheave ratios, drum capacity): nothing to do now.
func designFixed(what string, in adviceInput) advice {
	return say("no action for " + what + " (" + num3(in.cr.Capacity) + " against " + num3(in.cr.Demand) + " required, fixed by the design); note it at the next modification")
}

// nearLimit is the advice for a marginal load-dependent check: keep to the rated load.
func nearLimit(what string, in adviceInput) advice {
	return say("keep to the rated load: " + what + " at " + percent(in.cr.Utilisation) + " of its limit")
}

// overLimit is the advice for a load-dependent check: derate, or the remedy with the
// capacity it needs (capacity × utilisation, divided by scale for the unit named) against
// what it has; near its limit, keep to the rated load.
func overLimit(what, remedy, unit string, scale float64) func(in adviceInput) advice {
	return func(in adviceInput) advice {
		if in.cr.Status == StatusMarginal {
			return nearLimit(what, in)
		}
		if !(in.cr.Utilisation > 1) {
			// Failed on a rule, not on its capacity (no control braking means, say):
			// more capacity would not help, the rule's own words say what would.
			return say(ruleFailure(in.cr))
		}
		return orDerate(remedy + " " + up3(RequiredCapacity(in.cr)/scale) + " " + unit + " (has " + num3(in.cr.Capacity/scale) + " " + unit + ")")
	}
}

// tonnes is a load in tonnes to three significant figures, rounded down (a rating is
// never rounded up): 10 422.3 kg → "10.4 t".
func tonnes(kg float64) string {
	t := kg / 1000
	if t <= 0 || math.IsNaN(t) || math.IsInf(t, 0) {
		return strconv.FormatFloat(t, 'g', 3, 64) + " t"
	}
	scale := math.Pow(10, 2-math.Floor(math.Log10(t)))
	return strconv.FormatFloat(math.Floor(t*scale+1e-9)/scale, 'f', -1, 64) + " t"
}

// num3 is a number to three significant figures, without an exponent: 5000 → "5000",
// 0.0123456 → "0.0123".
func num3(v float64) string {
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return strconv.FormatFloat(v, 'g', 3, 64)
	}
	scale := math.Pow(10, 2-math.Floor(math.Log10(math.Abs(v))))
	return strconv.FormatFloat(math.Round(v*scale)/scale, 'f', -1, 64)
}

// up3 is a needed capacity to three significant figures, rounded up (a requirement is
// never rounded down): 368.6 → "369".
func up3(v float64) string {
	if v <= 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return num3(v)
	}
	scale := math.Pow(10, 2-math.Floor(math.Log10(v)))
	return strconv.FormatFloat(math.Ceil(v*scale-1e-9)/scale, 'f', -1, 64)
}

// percent is a fraction as a percentage to three significant figures.
func percent(f float64) string { return num3(f*100) + " %" }

// ruleFailure is a check's failure in its own words, for a fail that no capacity cures:
// the part of its message after "FAIL: ", or the whole message.
func ruleFailure(cr *CheckResult) string {
	msg := cr.Message
	if i := strings.Index(msg, "FAIL: "); i >= 0 {
		msg = msg[i+len("FAIL: "):]
	}
	if msg == "" {
		return cr.ID + " fails"
	}
	return cr.ID + ": " + msg
}
