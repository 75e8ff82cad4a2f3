package xlsxout

import (
	"math"
	"strconv"
	"strings"
	"time"

	"hoistfleet/fleet"
)

// SheetChanges is the sheet of changes since a baseline (check --baseline: design.md
// Revision 2's contract name).
const SheetChanges = "Changes"

// ChangesColumns are the Changes sheet's table headers (the load columns carry the
// rated-load unit).
func (w *Writer) changesColumns() []string {
	return []string{"Asset ID", "Site", "Row", "Baseline row", "Change", "Baseline status", "Status",
		"Max rated load before [" + w.unit + "]", "Max rated load now [" + w.unit + "]", "Newly failing", "Cleared",
		"Inspection", "Register values changed (column: before → now)"}
}

var changesWidths = []float64{20, 18, 7, 9, 11, 11, 11, 14, 14, 26, 26, 16, 70}

// writeChanges builds the Changes sheet: what the baseline was (from its Audit, or what
// a JSON lines baseline cannot say), how its run differs from this one, the counts, and
// one row per hoist added, removed or changed, worse first.
func (w *Writer) writeChanges(s *fleet.Summary, info *fleet.RunInfo) error {
	sw := &sheetWriter{f: w.f, sheet: SheetChanges}
	st := w.st
	for i, wd := range changesWidths {
		sw.width(i+1, i+1, wd)
	}
	b := s.Baseline
	r := 1
	sw.str(1, r, "Changes since the baseline", st.title)
	sw.height(r, 26)
	r += 2
	orNot := func(v string) string {
		if v == "" {
			return "not recorded in the baseline"
		}
		return v
	}
	asOf := ""
	if !info.AsOf.IsZero() {
		asOf = info.AsOf.Format(time.DateOnly)
	}
	rules := info.Profile
	if info.RulesFile != "" {
		rules += " + " + info.RulesFile
	}
	prevRules := b.Profile
	if b.RulesFile != "" && b.RulesFile != "none" {
		prevRules += " + " + b.RulesFile
	}
	sw.str(1, r, "", st.th)
	sw.str(2, r, "Baseline", st.th)
	sw.merge(2, r, 5, r)
	sw.str(6, r, "This run", st.th)
	sw.merge(6, r, 9, r)
	r++
	for _, kv := range [][3]string{
		{"File", b.File + " (" + b.Format + ")", info.Input},
		{"As of", orNot(b.AsOf), asOf},
		{"Rules", orNot(prevRules), rules},
		{"Input", orNot(b.Input), info.Input},
		{"Input SHA-256", orNot(b.InputSHA256), info.InputSHA256},
		{"Tool version", orNot(b.Version), info.Version},
		{"Baseline file SHA-256", b.FileSHA256, ""},
	} {
		sw.str(1, r, kv[0], st.bold)
		sw.str(2, r, kv[1], 0)
		sw.merge(2, r, 5, r)
		sw.str(6, r, kv[2], 0)
		sw.merge(6, r, 9, r)
		r++
	}
	r++
	notes := b.Differences(info)
	if added, removed := columnChanges(b.Columns, w.h); len(added)+len(removed) > 0 {
		if len(added) > 0 {
			notes = append(notes, "register columns added since the baseline (not compared): "+strings.Join(added, ", "))
		}
		if len(removed) > 0 {
			notes = append(notes, "register columns in the baseline and not in this register (not compared): "+strings.Join(removed, ", "))
		}
	}
	for _, n := range notes {
		sw.str(1, r, "Note: "+n, st.subtitle)
		sw.merge(1, r, len(changesWidths), r)
		r++
	}
	sw.str(1, r, s.ChangeCounts.Words(), st.bold)
	sw.merge(1, r, len(changesWidths), r)
	r += 2

	hdr := r
	for i, h := range w.changesColumns() {
		sw.str(1+i, r, h, st.th)
	}
	sw.height(r, 30)
	r++
	all := s.AllChanges()
	for _, c := range all {
		id := c.AssetID
		sw.str(1, r, id, 0)
		if c.Row > 0 {
			sw.str(1, r, id, st.link)
			sw.link(1, r, quoted(SheetRegister)+"!A"+itoa(c.Row))
			sw.set(3, r, c.Row, 0)
		}
		sw.str(2, r, c.Site, 0)
		if c.PrevRow > 0 {
			sw.set(4, r, c.PrevRow, 0)
		}
		kind := c.Kind
		if c.StatusChange != "" {
			kind = c.StatusChange
		}
		sw.str(5, r, kind, 0)
		if c.Kind != fleet.ChangeAdded {
			sw.str(6, r, c.PrevStatus.String(), st.text[statusIndex(c.PrevStatus)])
		}
		if c.Kind != fleet.ChangeRemoved {
			sw.str(7, r, c.Status.String(), st.text[statusIndex(c.Status)])
		}
		if !math.IsNaN(c.PrevMaxRatedLoadKg) {
			sw.set(8, r, roundSig(c.PrevMaxRatedLoadKg*w.perKg), st.load)
		}
		if !math.IsNaN(c.MaxRatedLoadKg) {
			sw.set(9, r, roundSig(c.MaxRatedLoadKg*w.perKg), st.load)
		}
		sw.str(10, r, strings.Join(c.NewlyFailing, ", "), 0)
		sw.str(11, r, strings.Join(c.Cleared, ", "), 0)
		switch {
		case c.NewlyOverdue:
			sw.str(12, r, "newly overdue", st.text[statusIndex(fleet.StatusFail)])
		case c.OverdueCleared:
			sw.str(12, r, "no longer overdue", st.text[statusIndex(fleet.StatusPass)])
		}
		var ins []string
		for _, in := range c.Inputs {
			ins = append(ins, in.Column+": "+orBlank(in.Old)+" → "+orBlank(in.New))
		}
		sw.str(13, r, strings.Join(ins, "; "), st.wrap)
		if len(c.Inputs) > 1 {
			sw.height(r, float64(15*len(c.Inputs)))
		}
		r++
	}
	if len(all) == 0 {
		sw.str(1, r, "no hoist changed since the baseline", st.subtitle)
		r++
	} else if sw.err == nil {
		last, _ := fleet.CellName(len(changesWidths), r-1)
		first, _ := fleet.CellName(1, hdr)
		if err := w.f.AutoFilter(SheetChanges, first+":"+last, nil); err != nil {
			return err
		}
	}
	// After the filter, which rewrites the sheet's properties (and with them the
	// fit-to-page flag).
	sw.setPrint(&pageSetup{paper: w.paper, landscape: true, fitWidth: 1, header: w.header, footer: w.footer}, 0)
	return sw.err
}

func orBlank(s string) string {
	if s == "" {
		return "(blank)"
	}
	return s
}

func itoa(n int) string { return strconv.Itoa(n) }

// columnChanges lists the register columns this run has that the baseline had not, and
// the reverse (by their headers as the Register shows them). A JSON lines baseline has
// no columns: nothing is listed.
func columnChanges(prev []string, h *fleet.Header) (added, removed []string) {
	if prev == nil || h == nil {
		return nil, nil
	}
	had := map[string]bool{}
	for _, c := range prev {
		had[c] = true
	}
	now := map[string]bool{}
	for _, c := range h.Columns {
		t := c.DisplayTitle()
		now[t] = true
		if !had[t] {
			added = append(added, t)
		}
	}
	for _, c := range prev {
		if !now[c] {
			removed = append(removed, c)
		}
	}
	return added, removed
}
