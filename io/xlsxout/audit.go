package xlsxout

import (
	"strconv"
	"time"

	"hoistfleet/fleet"
)

// auditFit is how many characters of Calibri 11 fit a line of each rules-table column
// (its width less a little).
var auditFit = [...]int{24, 14, 9, 9, 14, 50, 13, 11, 6, 40}

// writeAudit builds the Audit sheet: cautions first, then the run, header problems and
// the rules in force.
func (w *Writer) writeAudit(info *fleet.RunInfo) error {
	sw := &sheetWriter{f: w.f, sheet: SheetAudit}
	st := w.st
	sw.width(1, 1, 26)
	sw.width(2, 2, 16)
	sw.width(3, 4, 10)
	sw.width(5, 5, 16)
	sw.width(6, 6, 50)
	sw.width(7, 7, 14)
	sw.width(8, 8, 12)
	sw.width(9, 9, 6)
	sw.width(10, 10, 40)
	sw.noGrid()
	sw.setPrint(&pageSetup{paper: w.paper, landscape: true, fitWidth: 1, header: w.header, footer: w.footer}, 0)

	r := 1
	sw.str(1, r, "Cautions", st.heading)
	r++
	cautions := info.Cautions
	if len(cautions) == 0 {
		cautions = []string{fleet.Caution}
	}
	for _, c := range cautions {
		sw.str(1, r, c, st.caution)
		sw.merge(1, r, 10, r)
		sw.height(r, float64(16*(1+len(c)/150)))
		r++
	}
	r++

	sw.str(1, r, "Run", st.heading)
	r++
	ts := func(t time.Time, layout string) string {
		if t.IsZero() {
			return ""
		}
		return t.Format(layout)
	}
	kv := [][2]string{
		{"Tool", info.Tool},
		{"Version", info.Version},
		{"Command", info.Command},
		{"Input", info.Input},
		{"Input SHA-256", info.InputSHA256},
		{"Sheet", info.Sheet},
		{"Columns file", info.ColumnsFile},
		{"As of", ts(info.AsOf, "2006-01-02")},
		// To the nanosecond: start and finish in the same second would be one shared
		// string, and the workbook's shared strings would differ from run to run in
		// number, not only in the times (issue 16: byte-reproducible apart from the times).
		{"Started", ts(info.Started, time.RFC3339Nano)},
		{"Finished", ts(info.Finished, time.RFC3339Nano)},
		{"Rule profile", info.Profile},
		{"User rules file", info.RulesFile},
		{"Marginal band", strconv.FormatFloat(info.MarginalBand*100, 'f', -1, 64) + " %"},
		{"Rated load factor", ""},
		{"Workers", ""},
		{"Rows", ""},
	}
	if !info.Started.IsZero() && !info.Finished.IsZero() {
		kv = append(kv, [2]string{"Run time", info.Finished.Sub(info.Started).Round(time.Millisecond).String()})
	}
	for i := range kv {
		if (kv[i][0] == "User rules file" || kv[i][0] == "Columns file") && kv[i][1] == "" {
			kv[i][1] = "none"
		}
	}
	for _, p := range kv {
		sw.str(1, r, p[0], st.bold)
		switch p[0] {
		case "Rated load factor":
			if info.RatedLoadFactor > 0 {
				sw.set(2, r, info.RatedLoadFactor, 0)
			} else {
				sw.str(2, r, "none", 0)
			}
		case "Workers":
			sw.set(2, r, info.Workers, 0)
		case "Rows":
			sw.set(2, r, info.Rows, 0)
		default:
			sw.str(2, r, p[1], 0)
			sw.merge(2, r, 10, r)
		}
		r++
	}
	r++

	if w.h != nil && len(w.h.Problems) > 0 {
		sw.str(1, r, "Header problems", st.heading)
		r++
		for _, p := range w.h.Problems {
			sw.str(1, r, p.Error(), 0)
			r++
		}
		r++
	}

	sw.str(1, r, "Rules in force", st.heading)
	r++
	for i, h := range []string{"Rule", "Value", "Unit", "Groups", "Condition", "Source", "Provenance", "Origin", "Uses", "Note"} {
		sw.str(1+i, r, h, st.th)
	}
	r++
	for _, u := range info.Rules {
		for i, v := range []string{u.ID, u.Value, u.Unit, u.Groups, u.When, u.Source, u.Provenance, u.Origin} {
			sw.str(1+i, r, v, st.wrap)
		}
		sw.set(9, r, u.Uses, st.wrap)
		sw.str(10, r, u.Note, st.wrap)
		// wrapped cells get the height of their longest text (not every reader sizes
		// rows itself): lines of about 1.1 characters a unit of column width
		lines := 1
		for i, v := range []string{u.ID, u.Value, u.Unit, u.Groups, u.When, u.Source, u.Provenance, u.Origin, "", u.Note} {
			lines = max(lines, (len([]rune(v))+auditFit[i]-1)/auditFit[i])
		}
		if lines > 1 {
			sw.height(r, float64(15*lines))
		}
		r++
	}
	if len(info.Rules) == 0 {
		sw.str(1, r, "no rules were reported for this run", st.subtitle)
	}
	return sw.err
}
