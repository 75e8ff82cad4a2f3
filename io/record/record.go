// Package record writes one hoist's calculation record: its inputs with the register's
// units and in SI, every check's rule and source, the formulas with the numbers
// substituted step by step, the results, the rating and the cautions — what an engineer
// reads, checks by hand and signs. It writes plain text or Markdown.
package record

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strconv"
	"strings"

	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
)

// Format is the record's layout.
type Format int

// Formats.
const (
	Text Format = iota
	Markdown
)

// siUnit is the SI unit a quantity's Value.Num is in (fleet.Value).
var siUnit = map[string]string{
	"mass": "kg", "force": "N", "length": "m", "power": "W", "torque": "N m", "inertia": "kg m²",
	"speed": "m/s", "acceleration": "m/s²", "rotational_speed": "rpm", "angle": "deg", "time": "s",
	"stress": "N/mm²", "ratio": "1",
}

// Write writes the record of r. h is the register's header; info the run's settings.
func Write(w io.Writer, r *fleet.Result, h *fleet.Header, info *fleet.RunInfo, f Format) error {
	bw := bufio.NewWriter(w)
	p := &printer{w: bw, md: f == Markdown}
	p.record(r, h, info)
	return bw.Flush()
}

type printer struct {
	w  *bufio.Writer
	md bool
}

func (p *printer) line(format string, a ...any) { fmt.Fprintf(p.w, format+"\n", a...) }

func (p *printer) heading(level int, s string) {
	if p.md {
		p.line("%s %s\n", strings.Repeat("#", level), s)
		return
	}
	p.line("%s", s)
	ch := "="
	if level > 1 {
		ch = "-"
	}
	p.line("%s\n", strings.Repeat(ch, len([]rune(s))))
}

func (p *printer) table(header []string, rows [][]string) {
	if p.md {
		p.line("| %s |", strings.Join(header, " | "))
		seps := make([]string, len(header))
		for i := range seps {
			seps[i] = "---"
		}
		p.line("|%s|", strings.Join(seps, "|"))
		for _, r := range rows {
			esc := make([]string, len(r))
			for i, c := range r {
				esc[i] = strings.ReplaceAll(c, "|", "\\|")
			}
			p.line("| %s |", strings.Join(esc, " | "))
		}
		p.line("")
		return
	}
	widths := make([]int, len(header))
	for _, r := range append([][]string{header}, rows...) {
		for i, c := range r {
			if n := len([]rune(c)); i < len(widths) && n > widths[i] {
				widths[i] = n
			}
		}
	}
	pr := func(r []string) {
		var b strings.Builder
		for i, c := range r {
			b.WriteString("  ")
			b.WriteString(c)
			if i < len(r)-1 {
				b.WriteString(strings.Repeat(" ", widths[i]-len([]rune(c))))
			}
		}
		p.line("%s", strings.TrimRight(b.String(), " "))
	}
	pr(header)
	for _, r := range rows {
		pr(r)
	}
	p.line("")
}

func (p *printer) bullets(items []string) {
	for _, s := range items {
		if p.md {
			p.line("- %s", s)
		} else {
			p.line("  - %s", s)
		}
	}
	p.line("")
}

// Num formats a number for a record: 4 significant figures, no exponent for everyday
// magnitudes, "—" for NaN.
func Num(v float64) string {
	switch {
	case math.IsNaN(v):
		return "—"
	case math.IsInf(v, 1):
		return "∞"
	case math.IsInf(v, -1):
		return "−∞"
	case v == 0:
		return "0"
	}
	a := math.Abs(v)
	if a >= 1e-3 && a < 1e7 {
		s := strconv.FormatFloat(v, 'f', max(0, 3-int(math.Floor(math.Log10(a)))), 64)
		if strings.Contains(s, ".") {
			s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
		}
		return s
	}
	return strconv.FormatFloat(v, 'g', 4, 64)
}

func kg(v float64) string {
	if math.IsNaN(v) {
		return "—"
	}
	return strconv.FormatFloat(v, 'f', 1, 64) + " kg"
}

func (p *printer) record(r *fleet.Result, h *fleet.Header, info *fleet.RunInfo) {
	a := r.Asset
	id := a.ID
	if id == "" {
		id = "(no asset id)"
	}
	p.heading(1, fmt.Sprintf("Calculation record: hoist %s", id))
	sheet := ""
	if h.Sheet != "" && h.Sheet != filepath.Base(info.Input) { // a CSV register has no sheet
		sheet = ", sheet " + h.Sheet
	}
	p.line("Register %s%s, row %d. Rules: %s%s. As of %s. %s %s.", info.Input, sheet, a.Row, info.Profile,
		userRules(info), info.AsOf.Format("2006-01-02"), info.Tool, info.Version)
	p.line("")
	p.line("Status: %s. Action: %s", r.Status, actionText(r.Action))
	if r.Proposed != nil {
		p.line("At the proposed rated load: %s. Action: %s", r.Proposed.Status, actionText(r.Proposed.Action))
	}
	p.line("")
	p.caution()

	p.heading(2, "1. Inputs")
	var rows [][]string
	for i, col := range h.Columns {
		given := ""
		if i < len(a.Cells) {
			given = a.Cells[i].Text
			if a.Cells[i].IsDate && !a.Cells[i].Date.IsZero() {
				given = a.Cells[i].Date.Format("2006-01-02")
			}
		}
		si := ""
		if col.Key != "" {
			v := a.Get(col.Key)
			c, _ := schema.ColumnByKey(col.Key)
			switch {
			case v.State == fleet.Bad:
				si = "unreadable (see messages)"
			case v.State != fleet.OK:
			case c.Quantity == "time" && c.Unit == "h":
				// Hours columns are shown in hours: the checks that use them work in h.
				si = Num(v.Num/3600) + " h"
			case c.Kind == schema.Number || c.Kind == schema.Integer:
				si = Num(v.Num)
				if u := siUnit[c.Quantity]; u != "" && u != "1" {
					si += " " + u
				}
			case c.Kind == schema.Date:
				si = v.Date.Format("2006-01-02")
			default:
				si = v.Text
			}
		}
		if given == "" && si == "" {
			continue
		}
		rows = append(rows, []string{col.Title, given, si})
	}
	p.table([]string{"Register column", "Given", "Read as (SI)"}, rows)
	if len(r.DefaultsUsed) > 0 {
		p.line("Defaults applied (assumptions, not register data):")
		p.bullets(r.DefaultsUsed)
	}
	if len(r.Derived) > 0 {
		p.line("Derived values:")
		p.bullets(r.Derived)
	}
	if len(r.Messages) > 0 {
		p.line("Messages:")
		p.bullets(r.Messages)
	}

	p.heading(2, fmt.Sprintf("2. Checks at the rated load %s%s", kg(r.RatedLoadKg), inRegisterUnit(r.RatedLoadKg, h)))
	for i := range r.Checks {
		p.check(i+1, &r.Checks[i])
	}

	p.heading(2, "3. Verdict and rating")
	p.line("Overall status: %s. Smallest margin: %s (%s).", r.Status, pct(r.MinMargin), orDash(r.WorstCheck))
	if !math.IsNaN(r.MaxRatedLoadKg) {
		p.line("Maximum permissible rated load on the data given: %s%s, governed by %s.", kg(r.MaxRatedLoadKg), inRegisterUnit(r.MaxRatedLoadKg, h), r.GoverningCheck)
	} else {
		p.line("Maximum permissible rated load: not given.")
	}
	if r.Rating.Note != "" {
		p.line("%s.", strings.TrimSuffix(r.Rating.Note, "."))
	}
	var lim [][]string
	for _, c := range r.Checks {
		if c.LoadDependent {
			lim = append(lim, []string{c.ID, c.Status.String(), kg(c.LimitRatedLoadKg)})
		}
	}
	if len(lim) > 0 {
		p.line("")
		p.table([]string{"Load-dependent check", "Status", "Rated load at its limit"}, lim)
	}
	if r.Proposed != nil {
		p.heading(2, fmt.Sprintf("4. Re-rating to %s", kg(r.Proposed.RatedLoadKg)))
		var rr [][]string
		for i, c := range r.Proposed.Checks {
			old := r.Checks[i]
			rr = append(rr, []string{c.ID, old.Status.String(), c.Status.String(), Num(c.Utilisation)})
		}
		p.table([]string{"Check", "Now", "Proposed", "Utilisation (proposed)"}, rr)
		p.line("Overall at the proposed load: %s (now %s).", r.Proposed.Status, r.Status)
		p.line("")
	}
	p.heading(2, "Sign-off")
	p.line("Checked by: ______________________   Date: ____________   Signature: ______________")
	p.line("")
	p.caution()
}

func (p *printer) check(n int, c *fleet.CheckResult) {
	title := fmt.Sprintf("2.%d %s: %s", n, c.ID, c.Status)
	if !math.IsNaN(c.Utilisation) {
		title += fmt.Sprintf(" (utilisation %s, margin %s)", Num(c.Utilisation), pct(c.Margin))
	}
	p.heading(3, title)
	item := "" // Markdown joins consecutive lines into one paragraph: make them items
	if p.md {
		item = "- "
	}
	if c.Rule != "" {
		p.line("%sRule: %s", item, c.Rule)
		p.line("%sSource: %s", item, c.Source)
	}
	if c.Message != "" {
		p.line("%sNote: %s", item, c.Message)
	}
	if len(c.Steps) > 0 {
		p.line("")
		if p.md {
			p.line("```")
		}
		for _, s := range c.Steps {
			unit := ""
			if s.Unit != "" && s.Unit != "1" {
				unit = " " + s.Unit
			}
			lhs := s.Symbol + " = " + s.Formula
			if math.IsNaN(s.Value) && s.Numbers != "" {
				// A step whose result is not a number (a date) carries it in Numbers.
				p.line("  %s\n      = %s", lhs, s.Numbers)
				continue
			}
			if s.Numbers != "" && s.Numbers != s.Formula {
				lhs += "\n      = " + s.Numbers
			}
			p.line("  %s\n      = %s%s", lhs, Num(s.Value), unit)
		}
		if p.md {
			p.line("```")
		}
	}
	if !math.IsNaN(c.Demand) || !math.IsNaN(c.Capacity) {
		p.line("")
		p.line("Result: demand %s, capacity %s [%s].", Num(c.Demand), Num(c.Capacity), c.Unit)
	}
	if c.LoadDependent && !math.IsNaN(c.LimitRatedLoadKg) {
		if def, _ := fleet.DefinitionOf(c.ID); c.Status == fleet.StatusInfo && def.InfoLimit != "" {
			p.line("%s: %s.", def.InfoLimit, kg(c.LimitRatedLoadKg))
		} else {
			p.line("Rated load at which this check reaches its limit: %s.", kg(c.LimitRatedLoadKg))
		}
	}
	var figs []string
	for _, f := range c.Figures {
		v := f.Text
		if v == "" {
			v = Num(f.Value)
			if f.Unit != "" && f.Unit != "1" {
				v += " " + f.Unit
			}
		}
		figs = append(figs, f.Name+" = "+v)
	}
	if len(figs) > 0 {
		p.line("Figures: %s.", strings.Join(figs, "; "))
	}
	p.line("")
}

func (p *printer) caution() {
	if p.md {
		p.line("> **Caution.** %s\n", fleet.Caution)
		return
	}
	p.line("CAUTION: %s\n", fleet.Caution)
}

// inRegisterUnit is " (2.5 t)": a mass in the unit of the register's rated-load column,
// or "" when that unit is kg or unknown.
func inRegisterUnit(kgValue float64, h *fleet.Header) string {
	for _, c := range h.Columns {
		if c.Key == "rated_load" && c.Unit != "" && c.Unit != "kg" && c.Factor > 0 {
			return " (" + Num(kgValue/c.Factor) + " " + c.Unit + ")"
		}
	}
	return ""
}

func userRules(info *fleet.RunInfo) string {
	if info.RulesFile == "" {
		return " (built-in)"
	}
	return " overridden by " + info.RulesFile
}

func pct(m float64) string {
	if math.IsNaN(m) {
		return "—"
	}
	return strconv.FormatFloat(m*100, 'f', 1, 64) + " %"
}

func orDash(s string) string {
	if s == "" {
		return "—"
	}
	return s
}

// actionText is a hoist's action for the record, "none." when it has none.
func actionText(a string) string {
	if a == "" {
		return "none."
	}
	return strings.TrimSuffix(a, ".") + "."
}
