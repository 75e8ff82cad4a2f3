package fleet

import (
	"fmt"
	"math"

	"hoistfleet/fleet/rules"
	"hoistfleet/fleet/schema"
)

// AttentionRuleIDs are the rule ids of the attention order's weights: read by the
// summary, not by a check.
var AttentionRuleIDs = []string{"attention.exposure_weight", "attention.unstated_weight", "attention.status_weight"}

// Exposures are the register's Exposure words (the schema's values), most exposed first
// as the built-in weights rank them; ExposureUnstated labels a hoist whose cell is blank.
var Exposures = func() []string {
	c, ok := schema.ColumnByKey("exposure")
	if !ok {
		return nil
	}
	return c.Values
}()

// ExposureUnstated is the label of a blank Exposure cell in the summary.
const ExposureUnstated = "not stated"

// AttentionWeights are the weights of the attention order, from the rules in force:
// a hoist's priority is StatusWeight(status) × ExposureWeight(exposure), highest first
// (ties keep the order of status, then mechanism before records, then margin).
// Source: hoistfleet's own judgement, "common practice, no published source"
// (templates/rules, rows attention.*); a user rule file overrides them.
type AttentionWeights struct {
	Status   [5]float64 // by Status (pass … fail); pass is 0 unless a rule says otherwise
	Exposure []float64  // by index in Exposures
	Unstated float64    // a blank Exposure cell
	// The rule rows (indices in the table, −1 for none) of each weight, for the audit's
	// use counts.
	statusRow   [5]int
	exposureRow []int
	unstatedRow int
}

// rows returns the rule rows behind a hoist's priority (−1 for none).
func (w *AttentionWeights) rows(st Status, exposure string) (int, int) {
	sr := -1
	if int(st) < len(w.statusRow) {
		sr = w.statusRow[st]
	}
	if i := ExposureIndex(exposure); i < len(w.exposureRow) {
		return sr, w.exposureRow[i]
	}
	return sr, w.unstatedRow
}

// NewAttentionWeights reads the weights from t. A missing row for a status or an
// exposure word, or a value that is not a number ≥ 0, is an error naming the row.
func NewAttentionWeights(t *rules.Table) (AttentionWeights, error) {
	var w AttentionWeights
	row := -1
	get := func(id, name, val string) (float64, error) {
		row = -1
		s := rules.Scope{}
		if name != "" {
			s.Attrs = map[string]string{name: val}
		}
		i := t.LookupIndex(id, s)
		if i < 0 {
			if name == "status" && val == "pass" {
				return 0, nil // a passing hoist needs no attention unless a rule says so
			}
			return 0, fmt.Errorf("rules: no row %s for %s=%s (the attention order needs one)", id, name, val)
		}
		v, err := t.ValueAt(i)
		if err != nil || math.IsNaN(v) || v < 0 {
			return 0, fmt.Errorf("rules: %s for %s=%s: want a weight ≥ 0, got %q", id, name, val, t.Rules[i].Value)
		}
		row = i
		return v, nil
	}
	var err error
	for _, st := range Statuses {
		if w.Status[st], err = get("attention.status_weight", "status", st.String()); err != nil {
			return w, err
		}
		w.statusRow[st] = row
	}
	w.Exposure = make([]float64, len(Exposures))
	w.exposureRow = make([]int, len(Exposures))
	for i, e := range Exposures {
		if w.Exposure[i], err = get("attention.exposure_weight", "exposure", e); err != nil {
			return w, err
		}
		w.exposureRow[i] = row
	}
	if w.Unstated, err = get("attention.unstated_weight", "", ""); err != nil {
		return w, err
	}
	w.unstatedRow = row
	return w, nil
}

// ExposureIndex is the index of an Exposure word in Exposures, or len(Exposures) for a
// blank or unknown one (not stated).
func ExposureIndex(e string) int {
	for i, x := range Exposures {
		if x == e {
			return i
		}
	}
	return len(Exposures)
}

// Priority is a hoist's place in the attention order: status weight × exposure weight.
func (w *AttentionWeights) Priority(st Status, exposure string) float64 {
	if int(st) >= len(w.Status) {
		return 0
	}
	e := w.Unstated
	if i := ExposureIndex(exposure); i < len(w.Exposure) {
		e = w.Exposure[i]
	}
	return w.Status[st] * e
}
