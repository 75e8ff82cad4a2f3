// Package record writes one hoist's calculation record: its inputs with the register's
// units and in SI, every check's rule and source, the formulas with the numbers
// substituted step by step, the results, the rating and the cautions — what an engineer
// reads, checks by hand and signs. It writes plain text or Markdown, wrapped at Width
// columns. The content (content.go) is shared with io/pdfrecord, which lays the same
// record out as a PDF.
package record

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"hoistfleet/fleet"
)

// Format is the record's layout.
type Format int

// Formats.
const (
	Text Format = iota
	Markdown
)

// Width is the longest line of a text or Markdown record, in characters (runes). A word
// longer than that (a long file name) is broken where it reaches the width.
const Width = 100

// siUnit is the SI unit a quantity's Value.Num is in (fleet.Value).
var siUnit = map[string]string{
	"mass": "kg", "force": "N", "length": "m", "power": "W", "torque": "N m", "inertia": "kg m²",
	"speed": "m/s", "acceleration": "m/s²", "rotational_speed": "rpm", "angle": "deg", "time": "s",
	"stress": "N/mm²", "energy": "J", "ratio": "1",
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

// line prints a formatted text, each of its lines wrapped at Width (Wrap).
func (p *printer) line(format string, a ...any) {
	for _, l := range strings.Split(fmt.Sprintf(format, a...), "\n") {
		for _, w := range Wrap(l, Width) {
			p.w.WriteString(w)
			p.w.WriteByte('\n')
		}
	}
}

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
	p.line("%s\n", strings.Repeat(ch, min(Width, len([]rune(s)))))
}

// table prints a table. In text its columns are padded and, when the table would be wider
// than Width, its widest cells wrapped within their column. In Markdown it is a pipe
// table, or, when a row would be wider than Width, the text layout in a code block.
func (p *printer) table(header []string, rows [][]string) {
	if p.md {
		lines := []string{"| " + strings.Join(header, " | ") + " |"}
		seps := make([]string, len(header))
		for i := range seps {
			seps[i] = "---"
		}
		lines = append(lines, "|"+strings.Join(seps, "|")+"|")
		fits := true
		for _, r := range rows {
			esc := make([]string, len(r))
			for i, c := range r {
				esc[i] = strings.ReplaceAll(c, "|", "\\|")
			}
			l := "| " + strings.Join(esc, " | ") + " |"
			fits = fits && len([]rune(l)) <= Width
			lines = append(lines, l)
		}
		if fits {
			for _, l := range lines {
				p.line("%s", l)
			}
			p.line("")
			return
		}
		p.line("```")
		for _, l := range TextTable(header, rows, Width) {
			p.line("%s", l)
		}
		p.line("```\n")
		return
	}
	for _, l := range TextTable(header, rows, Width) {
		p.line("%s", l)
	}
	p.line("")
}

// TextTable lays a table out in columns two spaces apart, indented two, no line wider
// than width: when the columns do not fit, the widest column is narrowed (to no less
// than 12 characters) until they do, and its cells wrap within it.
func TextTable(header []string, rows [][]string, width int) []string {
	all := append([][]string{header}, rows...)
	widths := make([]int, len(header))
	for _, r := range all {
		for i, c := range r {
			if n := len([]rune(c)); i < len(widths) && n > widths[i] {
				widths[i] = n
			}
		}
	}
	total := func() int {
		t := 0
		for _, w := range widths {
			t += w + 2
		}
		return t
	}
	for total() > width {
		wi := 0
		for i, w := range widths {
			if w >= widths[wi] {
				wi = i
			}
		}
		if widths[wi] <= 12 {
			break
		}
		widths[wi] -= total() - width
		widths[wi] = max(widths[wi], 12)
	}
	var out []string
	for _, r := range all {
		cells := make([][]string, len(r))
		n := 1
		for i, c := range r {
			if i < len(widths) {
				cells[i] = Wrap(c, widths[i])
			} else {
				cells[i] = []string{c}
			}
			n = max(n, len(cells[i]))
		}
		for k := 0; k < n; k++ {
			var b strings.Builder
			for i := range r {
				c := ""
				if k < len(cells[i]) {
					c = cells[i][k]
				}
				b.WriteString("  ")
				b.WriteString(c)
				if i < len(r)-1 && i < len(widths) {
					b.WriteString(strings.Repeat(" ", max(0, widths[i]-len([]rune(c)))))
				}
			}
			out = append(out, strings.TrimRight(b.String(), " "))
		}
	}
	return out
}

// Wrap breaks a line into lines of at most width runes, at spaces. A continuation line
// keeps the line's indentation and the list or quote marker it starts with ("- ", "= ",
// "> ": the text lines up after the marker, a quote's continuation is quoted again); an
// indented line without a marker continues four further in. A word longer than the room
// left is broken at the width. A line that fits is returned as it is.
func Wrap(line string, width int) []string {
	rs := []rune(line)
	if len(rs) <= width {
		return []string{line}
	}
	lead := len(rs) - len([]rune(strings.TrimLeft(line, " ")))
	cont := strings.Repeat(" ", lead)
	rest := string(rs[lead:])
	switch {
	case strings.HasPrefix(rest, "> "):
		cont += "> "
	case strings.HasPrefix(rest, "- "), strings.HasPrefix(rest, "= "):
		cont += "  "
	case lead > 0:
		cont += "    "
	}
	if len([]rune(cont)) > width/2 {
		cont = ""
	}
	var out []string
	var cur []rune
	start := 0 // length of the current line's indentation and marker
	first := true
	prefix := []rune(strings.Repeat(" ", lead))
	for _, word := range strings.Fields(rest) {
		w := []rune(word)
		for {
			if cur == nil {
				cur = append([]rune(nil), prefix...)
				if !first {
					cur = []rune(cont)
				}
				start = len(cur)
			}
			room := width - len(cur)
			if len(cur) > start {
				room-- // the space before the word
			}
			if len(w) <= room {
				if len(cur) > start {
					cur = append(cur, ' ')
				}
				cur = append(cur, w...)
				break
			}
			if len(cur) > start {
				out = append(out, string(cur))
				cur, first = nil, false
				continue
			}
			// A word longer than the line: break it.
			cur = append(cur, w[:room]...)
			w = w[room:]
			out = append(out, string(cur))
			cur, first = nil, false
		}
	}
	if len(cur) > start {
		out = append(out, string(cur))
	}
	return out
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

func (p *printer) record(r *fleet.Result, h *fleet.Header, info *fleet.RunInfo) {
	id := r.Asset.ID
	if id == "" {
		id = "(no asset id)"
	}
	p.heading(1, fmt.Sprintf("Calculation record: hoist %s", id))
	p.line("%s", Provenance(r, h, info))
	p.line("")
	for _, l := range Action(r) {
		p.line("%s", l)
	}
	p.line("")
	p.caution()

	p.heading(2, "1. Inputs")
	p.table(InputHeader, InputRows(r, h))
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

	p.heading(2, fmt.Sprintf("2. Checks at the rated load %s%s", Kg(r.RatedLoadKg), RegisterUnit(r.RatedLoadKg, h)))
	for i := range r.Checks {
		p.check(i+1, &r.Checks[i])
	}

	p.heading(2, "3. Verdict and rating")
	for _, l := range Verdict(r, h) {
		p.line("%s", l)
	}
	if lim := LimitRows(r); len(lim) > 0 {
		p.line("")
		p.table([]string{"Load-dependent check", "Status", "Rated load at its limit"}, lim)
	}
	if r.Proposed != nil {
		p.heading(2, fmt.Sprintf("4. Re-rating to %s", Kg(r.Proposed.RatedLoadKg)))
		var rr [][]string
		for i, c := range r.Proposed.Checks {
			old := r.Checks[i]
			rr = append(rr, []string{c.ID, old.Status.String(), c.Status.String(), Num(c.Utilisation)})
		}
		p.table([]string{"Check", "Now", "Proposed", "Utilisation (proposed)"}, rr)
		p.line("Overall at the proposed load: %s (now %s).", r.Proposed.Status, r.Status)
		p.line("")
	}
	p.heading(2, "What this record does not check")
	p.line("%s", NotCheckedIntro)
	p.bullets(NotChecked)
	p.heading(2, "Sign-off")
	p.line("Revision: ______")
	p.line("")
	item := ""
	if p.md { // consecutive Markdown lines join into one paragraph: make them items
		item = "- "
	}
	for _, role := range []string{"Prepared", "Checked", "Approved"} {
		p.line("%s%-12s ______________________   Signature: ______________________   Date: ____________", item, role+" by:")
	}
	p.line("")
	p.caution()
}

func (p *printer) check(n int, c *fleet.CheckResult) {
	p.heading(3, fmt.Sprintf("2.%d %s", n, CheckTitle(c)))
	item := "" // Markdown joins consecutive lines into one paragraph: make them items
	if p.md {
		item = "- "
	}
	for _, l := range CheckBasis(c) {
		p.line("%s%s", item, l)
	}
	if len(c.Steps) > 0 {
		p.line("")
		if p.md {
			p.line("```")
		}
		for _, s := range c.Steps {
			for k, l := range StepLines(s) {
				if k == 0 {
					p.line("  %s", l)
				} else {
					p.line("      %s", l)
				}
			}
		}
		if p.md {
			p.line("```")
		}
	}
	res := CheckResults(c)
	if len(res) > 0 && strings.HasPrefix(res[0], "Result: ") {
		p.line("")
	}
	for _, l := range res {
		p.line("%s", l)
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
