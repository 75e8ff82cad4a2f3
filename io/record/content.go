package record

import (
	"fmt"
	"math"
	"path/filepath"
	"strconv"
	"strings"

	"hoistfleet/calc"
	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
)

// This file builds the record's content (texts and tables) independently of the layout,
// so that every layout (text, Markdown, io/pdfrecord's PDF) says the same thing in the
// same words.

// InputRows is the inputs table: one row per register column that has something, with
// the column's title, the cell as given and the value as read (in SI, hours columns in
// hours).
func InputRows(r *fleet.Result, h *fleet.Header) [][]string {
	a := r.Asset
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
		if given == "" && col.Key != "" && givenElsewhere(a, h, col.Key, i) {
			// Several sheets read as one register (--sheet all) can give a column of ours
			// under two titles (two units): the hoist's value belongs to the one its
			// sheet filled in.
			continue
		}
		rows = append(rows, []string{col.Title, given, si})
	}
	return rows
}

// InputHeader is the header of InputRows' table.
var InputHeader = []string{"Register column", "Given", "Read as (SI)"}

// StepLines is one step of a check's working as the record prints it: the formula, the
// numbers substituted (when they differ from the formula) and the result with its unit,
// "m = m_L + m_H", "= 12500 + 260", "= 12760 kg". A step whose result is not a number (a
// date) gives it in the numbers line.
func StepLines(s calc.Step) []string {
	unit := ""
	if s.Unit != "" && s.Unit != "1" {
		unit = " " + s.Unit
	}
	lhs := s.Symbol + " = " + s.Formula
	if math.IsNaN(s.Value) && s.Numbers != "" {
		return []string{lhs, "= " + s.Numbers}
	}
	out := []string{lhs}
	if s.Numbers != "" && s.Numbers != s.Formula {
		out = append(out, "= "+s.Numbers)
	}
	return append(out, "= "+Num(s.Value)+unit)
}

// CheckTitle is "rope-design-factor: pass (utilisation 0.5346, margin 46.5 %)".
func CheckTitle(c *fleet.CheckResult) string {
	title := c.ID + ": " + c.Status.String()
	if !math.IsNaN(c.Utilisation) {
		title += fmt.Sprintf(" (utilisation %s, margin %s)", Num(c.Utilisation), Pct(c.Margin))
	}
	return title
}

// CheckBasis is what a check was judged by, before its working: "Rule: …", "Source: …"
// and "Note: …" (each when there is one).
func CheckBasis(c *fleet.CheckResult) []string {
	var out []string
	if c.Rule != "" {
		out = append(out, "Rule: "+c.Rule, "Source: "+c.Source)
	}
	if c.ReviewRule != "" {
		// design.md Revision 2: a review limit (a rule recalled with low confidence) is
		// shown with its utilisation; it never makes the check fail.
		out = append(out, "Review limit (not verified, at worst marginal): "+c.ReviewRule+", utilisation "+Num(c.ReviewUtilisation)+"; source "+c.ReviewSource)
	}
	if c.Message != "" {
		out = append(out, "Note: "+c.Message)
	}
	return out
}

// CheckResults is what a check found, after its working: demand and capacity, the rated
// load at its limit and its figures (each when there is one).
func CheckResults(c *fleet.CheckResult) []string {
	var out []string
	if !math.IsNaN(c.Demand) || !math.IsNaN(c.Capacity) {
		out = append(out, fmt.Sprintf("Result: demand %s, capacity %s [%s].", Num(c.Demand), Num(c.Capacity), c.Unit))
	}
	if c.LoadDependent && !math.IsNaN(c.LimitRatedLoadKg) {
		if def, _ := fleet.DefinitionOf(c.ID); c.Status == fleet.StatusInfo && def.InfoLimit != "" {
			out = append(out, fmt.Sprintf("%s: %s.", def.InfoLimit, Kg(c.LimitRatedLoadKg)))
		} else {
			out = append(out, fmt.Sprintf("Rated load at which this check reaches its limit: %s.", Kg(c.LimitRatedLoadKg)))
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
		out = append(out, "Figures: "+strings.Join(figs, "; ")+".")
	}
	return out
}

// RowSheet is the sheet the hoist's row is on: its own (several sheets read as one
// register, --sheet all), else the header's.
func RowSheet(r *fleet.Result, h *fleet.Header) string {
	if r.Asset.Sheet != "" {
		return r.Asset.Sheet
	}
	return h.Sheet
}

// Provenance is the record's opening line: register, sheet, row, rules, as-of date, tool.
func Provenance(r *fleet.Result, h *fleet.Header, info *fleet.RunInfo) string {
	sheet := ""
	if s := RowSheet(r, h); s != "" && s != filepath.Base(info.Input) { // a CSV register has no sheet
		sheet = ", sheet " + s
	}
	s := fmt.Sprintf("Register %s%s, row %d", info.Input, sheet, r.Asset.Row)
	if info.InputSHA256 != "" {
		s += " (SHA-256 " + info.InputSHA256 + ")"
	}
	return s + fmt.Sprintf(". Rules: %s%s. As of %s. %s %s.", info.Profile, RulesOrigin(info),
		info.AsOf.Format("2006-01-02"), info.Tool, info.Version)
}

// Action is the hoist's status and what to do about it (fleet's action), and the same at
// the proposed load: the first thing a record says.
func Action(r *fleet.Result) []string {
	out := []string{fmt.Sprintf("Status: %s. Action: %s", r.Status, actionText(r.Action))}
	if r.Proposed != nil {
		out = append(out, fmt.Sprintf("At the proposed rated load: %s. Action: %s", r.Proposed.Status, actionText(r.Proposed.Action)))
	}
	return out
}

// actionText is a hoist's action for the record, "none." when it has none.
func actionText(a string) string {
	if a == "" {
		return "none."
	}
	return strings.TrimSuffix(a, ".") + "."
}

// Verdict is the hoist's overall status and rating in sentences.
func Verdict(r *fleet.Result, h *fleet.Header) []string {
	out := []string{fmt.Sprintf("Overall status: %s. Smallest margin: %s (%s).", r.Status, Pct(r.MinMargin), orDash(r.WorstCheck))}
	if !math.IsNaN(r.MaxRatedLoadKg) {
		out = append(out, fmt.Sprintf("Maximum permissible rated load on the data given: %s%s, governed by %s.", Kg(r.MaxRatedLoadKg), RegisterUnit(r.MaxRatedLoadKg, h), r.GoverningCheck))
		if !math.IsNaN(r.MechanismCapacityKg) && r.MechanismCapacityKg != r.MaxRatedLoadKg {
			out = append(out, fmt.Sprintf("Mechanism capacity (the smallest limit of the mechanism's checks): %s%s.", Kg(r.MechanismCapacityKg), RegisterUnit(r.MechanismCapacityKg, h)))
		}
	} else {
		out = append(out, "Maximum permissible rated load: not given.")
	}
	if r.Rating.Note != "" {
		out = append(out, strings.TrimSuffix(r.Rating.Note, ".")+".")
	}
	return out
}

// LimitRows is the table of load-dependent checks with the rated load at each one's limit.
func LimitRows(r *fleet.Result) [][]string {
	var lim [][]string
	for _, c := range r.Checks {
		if c.LoadDependent {
			lim = append(lim, []string{c.ID, c.Status.String(), Kg(c.LimitRatedLoadKg)})
		}
	}
	return lim
}

// Kg formats a mass in kg to 0.1 kg (the rating's resolution), "—" for NaN.
// givenElsewhere reports whether a's cell under another column of h with the key is
// filled in.
func givenElsewhere(a *fleet.Asset, h *fleet.Header, key string, except int) bool {
	for j, c := range h.Columns {
		if j != except && c.Key == key && j < len(a.Cells) && a.Cells[j].Text != "" {
			return true
		}
	}
	return false
}

func Kg(v float64) string {
	if math.IsNaN(v) {
		return "—"
	}
	return strconv.FormatFloat(v, 'f', 1, 64) + " kg"
}

// RegisterUnit is " (2.5 t)": a mass in the unit of the register's rated-load column,
// or "" when that unit is kg or unknown.
func RegisterUnit(kgValue float64, h *fleet.Header) string {
	for _, c := range h.Columns {
		if c.Key == "rated_load" && c.Unit != "" && c.Unit != "kg" && c.Factor > 0 {
			return " (" + Num(kgValue/c.Factor) + " " + c.Unit + ")"
		}
	}
	return ""
}

// RulesOrigin is " (built-in)" or " overridden by FILE".
func RulesOrigin(info *fleet.RunInfo) string {
	if info.RulesFile == "" {
		return " (built-in)"
	}
	return " overridden by " + info.RulesFile
}

// Pct formats a margin as a percentage to 0.1 %, "—" for NaN.
func Pct(m float64) string {
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

// NotChecked lists what a calculation record does not check: the parts of a lifting
// installation and the conditions that no check of hoistfleet looks at.
var NotChecked = []string{
	"the hook, its latch and the hook block (bottom block), other than its mass and the Component WLL where given",
	"slings, spreaders and lifting accessories below the hook",
	"rope terminations and anchorages, equaliser sheaves and their pins",
	"the trolley, its wheels and travel drives; the crane's bridge, girders, jib or other structure, and its fatigue",
	"the runway, rails, end stops, supports and foundations",
	"electrical controls, wiring, protective devices, emergency stop circuits and limit switches, except where a check above says otherwise",
	"bearings, shafts, couplings and the gearbox beyond the torques given above (the shaft load is given for their own check)",
	"the condition of any part other than the rope's measured diameter and broken wires: corrosion, wear, deformation, cracks",
	"wind, weather, temperature, hazardous areas and other conditions of use",
}

// NotCheckedIntro introduces NotChecked.
const NotCheckedIntro = "The checks above are of the hoist mechanism on the data given. This record does not check:"
