package xlsxout

import (
	"strconv"
	"strings"

	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
)

// SheetData is the data completeness sheet: what the verdicts rest on, and which register
// columns would let more checks run (issue 14: which data to collect first).
const SheetData = "Data"

// writeData builds the Data sheet from the summary's coverage: one row per column the
// hoists lack, the column that alone would let the most checks run first.
func (w *Writer) writeData(s *fleet.Summary) error {
	sw := &sheetWriter{f: w.f, sheet: SheetData}
	st := w.st
	sw.width(1, 1, 28)
	sw.width(2, 2, 10)
	sw.width(3, 6, 15)
	sw.width(7, 7, 60)
	sw.noGrid()
	sw.setPrint(&pageSetup{paper: w.paper, landscape: true, fitWidth: 1, header: w.header, footer: w.footer}, 0)

	fc := &s.Coverage
	sw.str(1, 1, "Data completeness", st.title)
	sw.height(1, 26)
	sw.str(1, 2, fc.Sentence(), st.subtitle)
	r := 4
	gaps := fc.Sorted()
	if len(gaps) == 0 {
		sw.str(1, r, "No check went unchecked for want of a register column.", 0)
		return sw.err
	}
	sw.str(1, r, "Columns to collect, most useful first", st.heading)
	r++
	for i, h := range []string{"Column", "Unit", "Hoists lacking it", "of them without a unit", "Check results waiting on it", "of them on it alone", "Checks that need it"} {
		sw.str(1+i, r, h, st.th)
	}
	sw.height(r, 32)
	head := r
	r++
	for _, g := range gaps {
		name, unit := g.Key, ""
		if c, ok := schema.ColumnByKey(g.Key); ok {
			name, unit = c.Header, c.Unit
		}
		sw.str(1, r, name, 0)
		sw.str(2, r, unit, 0)
		sw.set(3, r, g.Hoists, st.intMid)
		sw.set(4, r, g.Unitless, st.intMid)
		sw.set(5, r, g.Waiting, st.intMid)
		sw.set(6, r, g.Unlocks, st.intMid)
		checks := strings.Join(g.Checks, ", ")
		sw.str(7, r, checks, st.wrap)
		if lines := wrappedLines(checks, 56); lines > 1 { // about 56 characters a line at width 60
			sw.height(r, float64(15*lines))
		}
		r++
	}
	r++
	sw.str(1, r, "A check needing several missing columns runs once all of them are filled in: "+
		"'on it alone' counts the check results held back by this column only. A column given without a unit "+
		"is not read (no unit is guessed): write its unit in the header, as 'SWL [t]'.", st.wrap)
	sw.merge(1, r, 7, r)
	sw.height(r, 32)
	if sw.err == nil {
		sw.err = printTitles(w.f, SheetData, "$"+strconv.Itoa(head)+":$"+strconv.Itoa(head))
	}
	return sw.err
}
