// Package colreport is the column report of a register: how each of its columns was
// read (as which of ours, in which unit, or passed through, or refused and why), which
// of ours it lacks with the checks each would unlock, and the notes of the read. It is
// printed by 'hoistfleet columns REGISTER' as text or JSON.
package colreport

import (
	"encoding/json"
	"fmt"
	"io"
	"sort"
	"strings"
	"text/tabwriter"

	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
	"hoistfleet/io/units"
)

// Column is one column of the register.
type Column struct {
	Column   string `json:"column"` // spreadsheet letter
	Title    string `json:"title"`  // as written
	Status   string `json:"status"` // "read", "passed through" or "refused"
	Key      string `json:"key,omitempty"`
	Header   string `json:"header,omitempty"`    // our column's header
	Unit     string `json:"unit,omitempty"`      // the unit it is read in
	UnitFrom string `json:"unit_from,omitempty"` // "header", "units row", "columns file", "none" (not read)
	Reason   string `json:"reason,omitempty"`    // why refused, or a note on how it is read
}

// Missing is one of our columns the register does not have.
type Missing struct {
	Key      string   `json:"key"`
	Header   string   `json:"header"`
	Need     string   `json:"need"`    // schema need: required, checks, optional
	Default  string   `json:"default"` // what applies without it
	NeededBy []string `json:"needed_by"`
	Unlocks  []string `json:"unlocks"` // checks whose other needs the register has
}

// Report is the column report.
type Report struct {
	File      string    `json:"file"`
	Sheet     string    `json:"sheet"`
	HeaderRow int       `json:"header_row"`
	Columns   []Column  `json:"columns"`
	Missing   []Missing `json:"missing"`
	Notes     []string  `json:"notes"`
}

// Build makes the report from the header as read (read the rows first: the notes of
// the rows left out, blank markers and date orders come at the end).
func Build(h *fleet.Header) Report {
	rep := Report{File: h.File, Sheet: h.Sheet, HeaderRow: h.Row, Columns: []Column{}, Missing: []Missing{}, Notes: []string{}}
	byCol := map[int][]*fleet.Error{} // problems located at a header cell
	for _, p := range h.Problems {
		if p.Cell.Row == h.Row && p.Cell.Col > 0 {
			byCol[p.Cell.Col] = append(byCol[p.Cell.Col], p)
			continue
		}
		rep.Notes = append(rep.Notes, p.Error())
	}
	present := map[string]bool{}
	for _, c := range h.Columns {
		col := Column{Column: fleet.ColumnName(c.Index + 1), Title: c.Title}
		var reasons []string
		for _, p := range byCol[c.Index+1] {
			reasons = append(reasons, p.Err.Error())
		}
		switch {
		case c.Key == "" && c.Mapped != "" && len(reasons) == 0:
			col.Status = "passed through"
			reasons = append(reasons, "ignored, as "+c.Mapped+" says")
		case c.Key == "" && len(reasons) > 0:
			col.Status = "refused"
		case c.Key == "":
			col.Status = "passed through"
			if len(reasons) == 0 {
				col.Reason = "not a column of ours: written to the results as given"
			}
		default:
			present[c.Key] = true
			sc, _ := schema.ColumnByKey(c.Key)
			col.Key, col.Header, col.Status = c.Key, sc.Header, "read"
			_, titleUnit, _ := units.SplitHeader(c.Title)
			switch {
			case sc.Quantity == "" || sc.Quantity == "ratio" && c.Unit == "":
			case c.Unit == "":
				col.UnitFrom = "none"
			case c.UnitFrom != "":
				col.Unit, col.UnitFrom = c.Unit, c.UnitFrom
			case titleUnit == "":
				col.Unit, col.UnitFrom = c.Unit, "units row"
			default:
				col.Unit, col.UnitFrom = c.Unit, "header"
			}
			if len(reasons) > 0 {
				for _, p := range byCol[c.Index+1] {
					if p.Kind != fleet.Other {
						col.Status = "refused"
					}
				}
			}
		}
		if c.Key != "" && c.Mapped != "" {
			reasons = append([]string{"as " + c.Mapped + " says"}, reasons...)
		}
		if len(reasons) > 0 {
			col.Reason = strings.Join(reasons, "; ")
		}
		rep.Columns = append(rep.Columns, col)
	}
	defs := fleet.Definitions()
	for _, sc := range schema.Columns() {
		if present[sc.Key] {
			continue
		}
		m := Missing{Key: sc.Key, Header: sc.Header, Need: string(sc.Need), Default: schema.DefaultText(sc), NeededBy: []string{}, Unlocks: []string{}}
		for _, d := range defs {
			if !contains(d.Needs, sc.Key) {
				continue
			}
			m.NeededBy = append(m.NeededBy, d.ID)
			others := true
			for _, k := range d.Needs {
				others = others && (k == sc.Key || present[k])
			}
			if others {
				m.Unlocks = append(m.Unlocks, d.ID)
			}
		}
		rep.Missing = append(rep.Missing, m)
	}
	// The missing columns that unlock most checks first, then those needed by most.
	sort.SliceStable(rep.Missing, func(i, j int) bool {
		a, b := rep.Missing[i], rep.Missing[j]
		if len(a.Unlocks) != len(b.Unlocks) {
			return len(a.Unlocks) > len(b.Unlocks)
		}
		return len(a.NeededBy) > len(b.NeededBy)
	})
	return rep
}

func contains(list []string, s string) bool {
	for _, l := range list {
		if l == s {
			return true
		}
	}
	return false
}

// WriteJSON writes a Report (or any value gathering reports, such as one per sheet) as
// one JSON object.
func WriteJSON(w io.Writer, rep any) error {
	enc := json.NewEncoder(w)
	enc.SetEscapeHTML(false)
	enc.SetIndent("", "  ")
	return enc.Encode(rep)
}

// WriteText writes the report for the terminal.
func WriteText(w io.Writer, rep Report) error {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	p := func(format string, a ...any) { fmt.Fprintf(tw, format, a...) }
	p("Columns of %s (sheet %s), header in row %d\n\n", rep.File, rep.Sheet, rep.HeaderRow)
	p("  col\ttitle\tread as\n")
	for _, c := range rep.Columns {
		as := ""
		switch c.Status {
		case "read":
			as = c.Header
			switch c.UnitFrom {
			case "header":
				as += " [" + c.Unit + "]"
			case "units row":
				as += " [" + c.Unit + "] (unit from the units row)"
			case "columns file":
				as += " [" + c.Unit + "] (unit from the columns file)"
			case "none":
				as += " — NO UNIT: not read"
			}
			if c.Reason != "" {
				as += "; " + c.Reason
			}
		case "passed through":
			as = "passed through (not a column of ours)"
			if c.Reason != "" && !strings.HasPrefix(c.Reason, "not a column of ours") {
				as = "passed through: " + c.Reason
			}
		default:
			as = "REFUSED: " + c.Reason
			if c.Header != "" {
				as = c.Header + " — " + as
			}
		}
		p("  %s\t%s\t%s\n", c.Column, clip(c.Title, 32), as)
	}
	var need, opt []Missing
	for _, m := range rep.Missing {
		if len(m.NeededBy) > 0 {
			need = append(need, m)
		} else {
			opt = append(opt, m)
		}
	}
	if len(need) > 0 {
		p("\nMissing columns the checks need (the most checks unlocked first)\n")
		p("  column\tunlocks\tneeded by\n")
		for _, m := range need {
			p("  %s\t%s\t%s\n", m.Header, orDash(strings.Join(m.Unlocks, ", ")), strings.Join(m.NeededBy, ", "))
		}
	}
	if len(opt) > 0 {
		var names []string
		for _, m := range opt {
			names = append(names, m.Header)
		}
		p("\nOther columns of ours not in the register (defaults apply, or they refine checks): %s\n", strings.Join(names, ", "))
	}
	if len(rep.Notes) > 0 {
		p("\nHow the register was read\n")
		for _, n := range rep.Notes {
			p("  %s\n", n)
		}
	}
	return tw.Flush()
}

func orDash(s string) string {
	if s == "" {
		return "-"
	}
	return s
}

func clip(s string, n int) string {
	if r := []rune(s); len(r) > n {
		return string(r[:n-1]) + "…"
	}
	return s
}
