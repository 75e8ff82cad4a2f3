// Package textout prints hoistfleet's short plain-text summary for the terminal: counts
// by status, by site, the worst hoists with their governing check and maximum rated load,
// overdue inspections, flags and re-rating changes. It uses no colour and no terminal
// control codes, so it reads the same in a log file. Columns are aligned with
// text/tabwriter. The output file's path is printed by the caller.
package textout

import (
	"fmt"
	"io"
	"math"
	"sort"
	"strconv"
	"strings"
	"text/tabwriter"

	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
)

// MaxWorst is the most hoists the worst list prints.
const MaxWorst = 10

// MaxGaps is the most missing columns the "data to collect first" list prints.
const MaxGaps = 5

// Summary writes the fleet summary s of the run info to w. info may be nil.
func Summary(w io.Writer, s *fleet.Summary, info *fleet.RunInfo) error {
	if s == nil {
		return fmt.Errorf("textout: no summary")
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	p := func(format string, a ...any) { fmt.Fprintf(tw, format, a...) }

	head := fmt.Sprintf("%d hoists checked", s.Total)
	if s.Total == 1 {
		head = "1 hoist checked"
	}
	var extra []string
	if info != nil {
		if !info.AsOf.IsZero() {
			extra = append(extra, "as of "+info.AsOf.Format("2006-01-02"))
		}
		if info.Profile != "" {
			extra = append(extra, "rules "+info.Profile)
		}
		if info.RulesFile != "" {
			extra = append(extra, "rule file "+info.RulesFile)
		}
		if info.MarginalBand > 0 {
			extra = append(extra, "marginal band "+strconv.FormatFloat(info.MarginalBand*100, 'f', -1, 64)+" %")
		}
	}
	if len(extra) > 0 {
		head += " (" + strings.Join(extra, ", ") + ")"
	}
	p("%s\n", head)
	for _, st := range fleet.Statuses {
		if s.Total > 0 {
			p("  %s\t%d\t%s\n", st, s.ByStatus[st], percent(s.ByStatus[st], s.Total))
		} else {
			p("  %s\t%d\n", st, s.ByStatus[st])
		}
	}

	if s.Coverage.Possible > 0 {
		if err := tw.Flush(); err != nil { // a sentence, not a table row
			return fmt.Errorf("textout: %w", err)
		}
		p("%s\n", s.Coverage.Sentence())
	}
	if len(s.Cranes) > 0 {
		by := s.CranesByStatus()
		var parts []string
		for _, st := range fleet.Statuses {
			parts = append(parts, st.String()+" "+strconv.Itoa(by[st]))
		}
		p("\nCranes\t%d\t(%s; a crane's status is its worst hoist's)\n", len(s.Cranes), strings.Join(parts, ", "))
	}

	if len(s.Sites) > 0 {
		p("\nBy site\tfail\terror\tunchecked\tmarginal\tpass\ttotal\n")
		for _, sc := range s.Sites {
			name := sc.Site
			if name == "" {
				name = "(no site)"
			}
			total := 0
			for _, n := range sc.ByStatus {
				total += n
			}
			p("  %s", name)
			for _, st := range fleet.Statuses {
				p("\t%d", sc.ByStatus[st])
			}
			p("\t%d\n", total)
		}
	}

	if s.Weighted {
		p("\nStatus by exposure")
		for _, e := range fleet.Exposures {
			p("\t%s", e)
		}
		p("\t%s\n", fleet.ExposureUnstated)
		for _, st := range fleet.Statuses {
			p("  %s", st)
			for i := range s.ExposureCounts {
				p("\t%d", s.ExposureCounts[i][st])
			}
			p("\n")
		}
	}

	if len(s.Worst) > 0 {
		n := min(len(s.Worst), MaxWorst)
		cranes := len(s.Cranes) > 0
		if s.Weighted {
			p("\nWorst hoists (consequence and severity: status weight × exposure weight, highest first; then worst status, the mechanism before records, the smallest margin)\n")
		} else {
			p("\nWorst hoists (worst status first, the mechanism before records, then the smallest margin)\n")
		}
		p("  asset\trow\tstatus\tsmallest margin\tworst check\trated load\tmax rated load\tgoverned by")
		if s.Weighted {
			p("\texposure\tweight")
		}
		if cranes {
			p("\tcrane")
		}
		p("\n")
		for _, b := range s.Worst[:n] {
			p("  %s\t%s\t%s\t%s\t%s\t%s\t%s\t%s", orDash(b.AssetID), rowText(b), b.Status, marginText(b.MinMargin),
				orDash(b.WorstCheck), tonnesText(b.RatedLoadKg), tonnesText(b.MaxRatedLoadKg), orDash(b.GoverningCheck))
			if s.Weighted {
				e := b.Exposure
				if e == "" {
					e = fleet.ExposureUnstated
				}
				p("\t%s\t%s", e, strconv.FormatFloat(b.Priority, 'g', 4, 64))
			}
			if cranes {
				p("\t%s", orDash(b.Crane))
			}
			p("\n")
		}
		head := "\nWhat to do, worst hoists first\n"
		for _, b := range s.Worst[:n] {
			if b.Action != "" {
				id := orDash(b.AssetID)
				if b.Sheet != "" {
					id += " (" + b.Sheet + ")"
				}
				p("%s  %s\t%s\n", head, id, b.Action)
				head = ""
			}
		}
	}

	// Lists of untabulated lines: flushed around them so that the tables keep their own
	// column widths.
	list := func(title string, count int, items []string, more string) error {
		if count == 0 {
			return nil
		}
		if err := tw.Flush(); err != nil {
			return fmt.Errorf("textout: %w", err)
		}
		p("\n"+title+"\n", count)
		n := min(len(items), MaxWorst)
		for _, m := range items[:n] {
			p("  %s\n", m)
		}
		if count > n {
			p("  … %d more: "+more+"\n", count-n)
		}
		if err := tw.Flush(); err != nil {
			return fmt.Errorf("textout: %w", err)
		}
		return nil
	}
	if err := list("How the register was read: %d notes", s.NoteCount, s.Notes, "see the Audit sheet or 'hoistfleet columns'"); err != nil {
		return err
	}
	if err := list("Input problems: %d (each affects only its hoist's checks)", s.ProblemCount, s.Problems, "see the Messages column of the results"); err != nil {
		return err
	}
	if gaps := s.Coverage.Sorted(); len(gaps) > 0 {
		p("\nData to collect first (register columns the checks lacked; the Data sheet lists them all)\n")
		p("  column\thoists lacking it\tcheck results waiting on it\tof them on it alone\tchecks\n")
		n := min(len(gaps), MaxGaps)
		for _, g := range gaps[:n] {
			name := g.Key
			if c, ok := schema.ColumnByKey(g.Key); ok {
				name = c.Header
			}
			p("  %s\t%d\t%d\t%d\t%s\n", name, g.Hoists, g.Waiting, g.Unlocks, strings.Join(g.Checks, ", "))
		}
		if len(gaps) > n {
			p("  … %d more columns\n", len(gaps)-n)
		}
	}
	if s.Baseline != nil {
		if err := changes(tw, s, info); err != nil {
			return err
		}
	}
	if s.Hidden > 0 {
		p("\nHidden rows\t%d (hidden or filtered out in the register: checked all the same, marked hidden)\n", s.Hidden)
	}
	p("\nOverdue inspections\t%d\n", s.OverdueCount)
	if len(s.FlagCounts) > 0 {
		keys := make([]string, 0, len(s.FlagCounts))
		for k := range s.FlagCounts {
			keys = append(keys, k)
		}
		sort.Strings(keys)
		for _, k := range keys {
			p("Flagged %s\t%d\n", k, s.FlagCounts[k])
		}
	}
	if s.Rerated > 0 {
		p("Re-rated\t%d\t(%d change verdict)\n", s.Rerated, s.ChangedCount)
	}
	p("\nScreening calculation on the data given: it does not replace examination by a competent person.\n")
	if err := tw.Flush(); err != nil {
		return fmt.Errorf("textout: %w", err)
	}
	return nil
}

// MaxChanges is the most changes the terminal lists (the workbook's Changes sheet and the
// JSON lines have them all).
const MaxChanges = 20

// changes prints the changes since the baseline: what the baseline was, how its run
// differs, the counts, then the changes, worse first.
func changes(tw *tabwriter.Writer, s *fleet.Summary, info *fleet.RunInfo) error {
	if err := tw.Flush(); err != nil {
		return fmt.Errorf("textout: %w", err)
	}
	p := func(format string, a ...any) { fmt.Fprintf(tw, format, a...) }
	b := s.Baseline
	var about []string
	if b.AsOf != "" {
		about = append(about, "as of "+b.AsOf)
	}
	if b.Profile != "" {
		about = append(about, "rules "+b.Profile)
	}
	if b.InputSHA256 != "" {
		about = append(about, "input SHA-256 "+b.InputSHA256[:min(12, len(b.InputSHA256))]+"…")
	}
	head := "\nChanges since " + b.File
	if len(about) > 0 {
		head += " (" + strings.Join(about, ", ") + ")"
	}
	p("%s\n", head)
	for _, d := range b.Differences(info) {
		p("  note: %s\n", d)
	}
	p("  %s\n", s.ChangeCounts.Words())
	all := s.AllChanges()
	n := min(len(all), MaxChanges)
	for _, c := range all[:n] {
		row := "-"
		if c.Row > 0 {
			row = strconv.Itoa(c.Row)
		}
		p("  %s\t%s\t%s\n", orDash(c.AssetID), row, c.Words())
	}
	if len(all) > n {
		p("  … %d more: see the Changes sheet of the workbook or the change field of the JSON lines\n", len(all)-n)
	}
	if err := tw.Flush(); err != nil {
		return fmt.Errorf("textout: %w", err)
	}
	return nil
}

func percent(n, total int) string {
	if total == 0 {
		return ""
	}
	return strconv.FormatFloat(100*float64(n)/float64(total), 'f', 1, 64) + " %"
}

func marginText(m float64) string {
	if math.IsNaN(m) || math.IsInf(m, 0) {
		return "-"
	}
	return strconv.FormatFloat(100*m, 'f', 1, 64) + " %"
}

// tonnesText is a load in tonnes to 0.01 t, rounded down (a rating is never shown
// higher than it is).
func tonnesText(kg float64) string {
	if math.IsNaN(kg) || math.IsInf(kg, 0) {
		return "none"
	}
	return strconv.FormatFloat(math.Floor(kg/10+1e-9)/100, 'f', 2, 64) + " t"
}

func orDash(s string) string {
	if s == "" {
		return "-"
	}
	return s
}

// rowText is a hoist's row for the lists: "7", or "Nord!7" when several sheets are read
// as one register (row numbers repeat from sheet to sheet).
func rowText(b fleet.Brief) string {
	if b.Sheet != "" {
		return b.Sheet + "!" + strconv.Itoa(b.Row)
	}
	return strconv.Itoa(b.Row)
}
