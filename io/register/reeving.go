package register

import (
	"fmt"
	"strconv"
	"strings"

	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
)

// Reeving written as registers write it: "4/1", "4/2", "8/2" is parts of line / rope ends
// on the drum (4/2: four falls, a twin-grooved drum taking both rope ends). A cell of
// that form in the parts-of-line column gives both; where the register has its own rope
// ends column, that column is read and a disagreement is reported on the hoist.

// reeving is what the reader knows of the two columns.
type reeving struct {
	partsCol  int     // the parts-of-line column, -1 when absent
	endsCol   int     // the rope-ends column, -1 when absent
	endsField int     // rope ends' index in Asset.Values
	ends      colSpec // rope ends' conversion, for a register without its column
	n         int     // cells read as parts/ends
	at        fleet.CellRef
	text      string
}

// setupReeving finds the two columns once the header is read.
func (r *Reader) setupReeving() {
	r.reeve = reeving{partsCol: -1, endsCol: -1}
	for i, s := range r.specs {
		switch s.col.Key {
		case "parts_of_line":
			r.reeve.partsCol = i
		case "rope_ends":
			r.reeve.endsCol = i
		}
	}
	if c, ok := schema.ColumnByKey("rope_ends"); ok {
		r.reeve.endsField, _ = schema.ColumnIndex("rope_ends")
		r.reeve.ends = colSpec{known: true, col: c, factor: 1, minSI: c.Min, maxSI: c.Max}
		r.reeve.ends.prepare()
	}
}

// splitReeving reads "n/e" (spaces allowed around the slash): two whole numbers.
func splitReeving(text string) (n, e string, ok bool) {
	a, b, found := strings.Cut(strings.TrimSpace(text), "/")
	a, b = strings.TrimSpace(a), strings.TrimSpace(b)
	if !found || !isDigits(a) || !isDigits(b) || len(a) > 3 || len(b) > 2 {
		return "", "", false
	}
	return a, b, true
}

// fillReeving reads a parts-of-line cell written "n/e" into the Asset: parts of line
// n, and rope ends e unless the register has a rope-ends column (which is then compared).
// It reports false, writing nothing, for a cell of another form.
func (r *Reader) fillReeving(raw string, ref fleet.CellRef, a *fleet.Asset) bool {
	n, e, ok := splitReeving(raw)
	if !ok {
		return false
	}
	s := &r.specs[r.reeve.partsCol]
	v, c := &a.Values[s.field], &a.Cells[ref.Col-1]
	s.fill(n, r.d, ref, a.ID, v, c)
	v.Raw, c.Text, c.IsNumber = raw, raw, false
	ends, _ := strconv.Atoi(e)
	if r.reeve.endsCol < 0 {
		ev := &a.Values[r.reeve.endsField]
		var ec fleet.Cell
		r.reeve.ends.fill(e, r.d, ref, a.ID, ev, &ec)
		ev.Raw = raw
	} else if i := r.reeve.endsCol; i < len(a.Cells) {
		a.Problems = append(a.Problems, &fleet.Error{Kind: fleet.Other, Asset: a.ID, Cell: ref, Field: "rope_ends",
			Err: fmt.Errorf("reeving %q gives %d rope ends; the Rope ends column %s is read", raw, ends, fleet.CellRef{Sheet: ref.Sheet, Row: ref.Row, Col: i + 1})})
	}
	if r.reeve.n == 0 {
		r.reeve.at, r.reeve.text = ref, raw
	}
	r.reeve.n++
	return true
}

// reevingNote is the note on cells read as parts/ends, "" for none.
func (r *Reader) reevingNote() string {
	if r.reeve.n == 0 {
		return ""
	}
	n, e, _ := splitReeving(r.reeve.text)
	return fmt.Sprintf("Parts of line: %d cells written as parts/rope ends read as both (%q at %s: %s parts of line on %s rope ends)", r.reeve.n, r.reeve.text, r.reeve.at, n, e)
}
