// Package pdfrecord writes one hoist's calculation record as a PDF for an engineer to
// check and sign: a title block (site, hoist, register file and its SHA-256, rules,
// tool, as-of date, revision, and prepared / checked / approved fields left blank), a
// table of every check with its utilisation bar, the rating diagram, the emergency stop
// and the runaway plotted, the inputs, each check's working as io/record gives it, the
// verdict, at a proposed load the working again with what would have to change, what the
// record does not check, and the caution. Its texts come from io/record, so the PDF says
// what the text record says.
package pdfrecord

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"
	"time"

	"codeberg.org/go-pdf/fpdf"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"hoistfleet/fleet"
	"hoistfleet/io/record"
)

// Write writes the PDF record of r to w. h is the register's header, info the run's
// settings (InputSHA256 as known), ev evaluates the hoist at other loads for the rating
// diagram (a fleet.Checker; nil leaves the diagram out). It fails, writing nothing, when
// a text holds a character the embedded fonts cannot print.
func Write(w io.Writer, r *fleet.Result, h *fleet.Header, info *fleet.RunInfo, ev Evaluator) error {
	p, err := layout(r, h, info, ev)
	if err != nil {
		return err
	}
	if err := p.pdf.Error(); err != nil {
		return fmt.Errorf("pdfrecord: %w", err)
	}
	var b bytes.Buffer
	if err := p.pdf.Output(&b); err != nil {
		return fmt.Errorf("pdfrecord: %w", err)
	}
	_, err = w.Write(b.Bytes())
	return err
}

// layout lays the record out in a new document, every text checked against its font.
func layout(r *fleet.Result, h *fleet.Header, info *fleet.RunInfo, ev Evaluator) (*printer, error) {
	p, err := newPrinter(info)
	if err != nil {
		return nil, err
	}
	p.record(r, h, info, ev)
	return p, p.err
}

const (
	pageW, margin = 210.0, 15.0
	textW         = pageW - 2*margin
	bodyPt        = 9.0
	smallPt       = 7.5
)

type printer struct {
	pdf              *fpdf.Fpdf
	sans, bold, mono *face
	cur              *face
	err              error
	images           int
	plotFonts        map[string]bool // the plots' font families registered with pdf
}

func newPrinter(info *fleet.RunInfo) (*printer, error) {
	p := &printer{plotFonts: map[string]bool{}}
	var err error
	if p.sans, err = newFace("dejavu", "", sansTTF); err != nil {
		return nil, err
	}
	if p.bold, err = newFace("dejavu", "B", sansBoldTTF); err != nil {
		return nil, err
	}
	if p.mono, err = newFace("dejavumono", "", monoTTF); err != nil {
		return nil, err
	}
	pdf := fpdf.New("P", "mm", "A4", "")
	pdf.AddUTF8FontFromBytes("dejavu", "", sansTTF)
	pdf.AddUTF8FontFromBytes("dejavu", "B", sansBoldTTF)
	pdf.AddUTF8FontFromBytes("dejavumono", "", monoTTF)
	pdf.SetMargins(margin, margin, margin)
	pdf.SetAutoPageBreak(true, margin+5)
	pdf.AliasNbPages("{nb}")
	pdf.SetCreator(info.Tool+" "+info.Version, true)
	if !info.Started.IsZero() {
		pdf.SetCreationDate(info.Started)
		pdf.SetModificationDate(info.Started)
	} else {
		pdf.SetCreationDate(time.Unix(0, 0).UTC())
		pdf.SetModificationDate(time.Unix(0, 0).UTC())
	}
	p.pdf = pdf
	p.font(p.sans, bodyPt)
	return p, nil
}

// font selects a face and size.
func (p *printer) font(f *face, pt float64) {
	p.cur = f
	p.pdf.SetFont(f.family, f.style, pt)
}

// ok checks that the current font can print s; the first character it cannot is the
// record's error.
func (p *printer) ok(s string) string {
	if r, bad := p.cur.missing(s); bad && p.err == nil {
		p.err = fmt.Errorf("pdfrecord: the PDF's font cannot print the character %q (U+%04X) in %q: use --format text or md for this record", r, r, s)
	}
	return s
}

// lh is the line height for pt.
func lh(pt float64) float64 { return pt * 0.3528 * 1.3 }

// para writes a paragraph wrapped to the text width.
func (p *printer) para(f *face, pt float64, s string) {
	p.font(f, pt)
	p.pdf.MultiCell(textW, lh(pt), p.ok(s), "", "L", false)
}

// indented writes a paragraph indented by in mm.
func (p *printer) indented(f *face, pt, in float64, s string) {
	p.font(f, pt)
	p.pdf.SetX(margin + in)
	p.pdf.MultiCell(textW-in, lh(pt), p.ok(s), "", "L", false)
}

func (p *printer) gap(mm float64) { p.pdf.Ln(mm) }

func (p *printer) heading(level int, s string) {
	pt := map[int]float64{1: 15, 2: 12, 3: 9.5}[level]
	need := 25.0
	if level == 3 {
		need = 15
	}
	p.needSpace(need)
	p.gap(map[int]float64{1: 0, 2: 3, 3: 2}[level])
	p.font(p.bold, pt)
	p.pdf.MultiCell(textW, lh(pt), p.ok(s), "", "L", false)
	if level <= 2 {
		y := p.pdf.GetY()
		p.pdf.SetDrawColor(0x90, 0x90, 0x90)
		p.pdf.SetLineWidth(0.2)
		p.pdf.Line(margin, y+0.5, pageW-margin, y+0.5)
		p.gap(2)
	}
	p.font(p.sans, bodyPt)
}

// needSpace starts a new page unless mm of height remain on this one.
func (p *printer) needSpace(mm float64) {
	_, ph := p.pdf.GetPageSize()
	if p.pdf.GetY()+mm > ph-margin-5 {
		p.pdf.AddPage()
	}
}

// cellStyle gives a cell (row, column) its fill colour, when ok.
type cellStyle func(row, col int) (r, g, b int, ok bool)

// table draws a table with wrapped cells; the header repeats on a new page. style, when
// set, fills cells; after, when set, draws on a row once it is placed (y and height of
// the row, in mm).
func (p *printer) table(widths []float64, header []string, rows [][]string, pt float64, style cellStyle, after ...func(row int, y, height float64)) {
	h := lh(pt)
	var drawRow func(cells []string, f *face, isHeader bool, row int)
	drawRow = func(cells []string, f *face, isHeader bool, row int) {
		p.font(f, pt)
		lines := make([][]string, len(cells))
		n := 1
		for i, c := range cells {
			lines[i] = p.pdf.SplitText(p.ok(c), widths[i])
			if len(lines[i]) == 0 {
				lines[i] = []string{""}
			}
			n = max(n, len(lines[i]))
		}
		height := float64(n)*h + 1
		_, ph := p.pdf.GetPageSize()
		if p.pdf.GetY()+height > ph-margin-5 {
			p.pdf.AddPage()
			if !isHeader && header != nil {
				drawRow(header, p.bold, true, -1)
				p.font(f, pt)
			}
		}
		x, y := margin, p.pdf.GetY()
		for i := range cells {
			fill := false
			if isHeader {
				p.pdf.SetFillColor(0xe8, 0xea, 0xed)
				fill = true
			} else if style != nil {
				if r, g, b, ok := style(row, i); ok {
					p.pdf.SetFillColor(r, g, b)
					fill = true
				}
			}
			p.pdf.SetDrawColor(0xb0, 0xb0, 0xb0)
			p.pdf.SetLineWidth(0.1)
			mode := "D"
			if fill {
				mode = "FD"
			}
			p.pdf.Rect(x, y, widths[i], height, mode)
			p.pdf.SetXY(x, y+0.5)
			p.pdf.MultiCell(widths[i], h, strings.Join(lines[i], "\n"), "", "L", false)
			x += widths[i]
		}
		if !isHeader {
			for _, f := range after {
				f(row, y, height)
			}
		}
		p.pdf.SetXY(margin, y+height)
	}
	p.needSpace(3 * h)
	if header != nil {
		drawRow(header, p.bold, true, -1)
	}
	for i, r := range rows {
		drawRow(r, p.sans, false, i)
	}
	p.font(p.sans, bodyPt)
	p.gap(2)
}

func (p *printer) record(r *fleet.Result, h *fleet.Header, info *fleet.RunInfo, ev Evaluator) {
	a := r.Asset
	id := a.ID
	if id == "" {
		id = "(no asset id)"
	}
	sha := info.InputSHA256
	p.pdf.SetFooterFunc(func() {
		p.pdf.SetY(-margin + 2)
		p.font(p.sans, 7)
		foot := "hoistfleet calculation record · hoist " + id
		if sha != "" {
			foot += " · register SHA-256 " + sha[:min(12, len(sha))] + "…"
		}
		p.pdf.CellFormat(textW/2+30, 4, p.ok(foot), "", 0, "L", false, 0, "")
		p.pdf.CellFormat(textW/2-30, 4, fmt.Sprintf("page %d of {nb}", p.pdf.PageNo()), "", 0, "R", false, 0, "")
	})
	p.pdf.AddPage()
	p.pdf.SetTitle("Calculation record: hoist "+id, true)

	p.heading(1, "Calculation record: hoist "+id)
	if d := a.Get("description"); d.Text != "" {
		p.para(p.sans, 10, d.Text)
	}
	p.gap(2)
	p.titleBlock(r, h, info)
	p.signOff()
	p.caution()

	p.heading(2, "Verdict")
	for _, l := range record.Action(r) {
		p.para(p.bold, bodyPt, l)
	}
	for _, l := range record.Verdict(r, h) {
		p.para(p.sans, bodyPt, l)
	}
	if r.Proposed != nil {
		p.para(p.bold, bodyPt, fmt.Sprintf("At the proposed rated load %s%s: %s (now %s).", record.Kg(r.Proposed.RatedLoadKg),
			record.RegisterUnit(r.Proposed.RatedLoadKg, h), r.Proposed.Status, r.Status))
	}
	p.changes(r.Checks, "at the rated load", h)

	p.heading(2, fmt.Sprintf("1. Checks at the rated load %s%s", record.Kg(r.RatedLoadKg), record.RegisterUnit(r.RatedLoadKg, h)))
	p.checkTable(r.Checks, h)

	p.plots(r, h, ev)

	p.heading(2, "3. Inputs")
	p.table([]float64{52, 60, 68}, record.InputHeader, record.InputRows(r, h), smallPt+0.5, nil)
	p.list("Defaults applied (assumptions, not register data):", r.DefaultsUsed)
	p.list("Derived values:", r.Derived)
	p.list("Messages:", r.Messages)

	p.heading(2, fmt.Sprintf("4. Working at the rated load %s%s", record.Kg(r.RatedLoadKg), record.RegisterUnit(r.RatedLoadKg, h)))
	p.working("4", r.Checks)

	p.heading(2, "5. Verdict and rating")
	for _, l := range record.Verdict(r, h) {
		p.para(p.sans, bodyPt, l)
	}
	if lim := record.LimitRows(r); len(lim) > 0 {
		p.gap(1)
		p.table([]float64{60, 30, 50}, []string{"Load-dependent check", "Status", "Rated load at its limit"}, lim, bodyPt-0.5, nil)
	}

	next := 6
	if r.Proposed != nil {
		pr := r.Proposed
		p.heading(2, fmt.Sprintf("6. Re-rating to %s%s", record.Kg(pr.RatedLoadKg), record.RegisterUnit(pr.RatedLoadKg, h)))
		var rows [][]string
		for i, c := range pr.Checks {
			rows = append(rows, []string{c.ID, r.Checks[i].Status.String(), c.Status.String(), record.Num(r.Checks[i].Utilisation), record.Num(c.Utilisation)})
		}
		p.table([]float64{52, 25, 25, 39, 39}, []string{"Check", "Now", "Proposed", "Utilisation now", "Utilisation proposed"}, rows, smallPt+0.5,
			func(row, col int) (int, int, int, bool) {
				if col == 2 {
					return statusFill(pr.Checks[row].Status)
				}
				return 0, 0, 0, false
			})
		p.para(p.bold, bodyPt, fmt.Sprintf("Overall at the proposed load: %s (now %s).", pr.Status, r.Status))
		p.changes(pr.Checks, "at the proposed load", h)
		p.heading(2, fmt.Sprintf("7. Working at the proposed load %s%s", record.Kg(pr.RatedLoadKg), record.RegisterUnit(pr.RatedLoadKg, h)))
		p.working("7", pr.Checks)
		next = 8
	}

	p.heading(2, fmt.Sprintf("%d. What this record does not check", next))
	p.para(p.sans, bodyPt, record.NotCheckedIntro)
	for _, s := range record.NotChecked {
		p.indented(p.sans, bodyPt, 4, "• "+s)
	}
	p.gap(3)
	p.caution()
}

// titleBlock is the record's identity: who, what, from which data, by which rules.
func (p *printer) titleBlock(r *fleet.Result, h *fleet.Header, info *fleet.RunInfo) {
	a := r.Asset
	site := a.Get("site").Text
	if loc := a.Get("location").Text; loc != "" {
		site = strings.TrimPrefix(site+", "+loc, ", ")
	}
	sheet := ""
	if s := record.RowSheet(r, h); s != "" && s != filepath.Base(info.Input) {
		sheet = ", sheet " + s
	}
	sha := info.InputSHA256
	if sha == "" {
		sha = "not known"
	}
	rulesFile := "built-in profile"
	if info.RulesFile != "" {
		rulesFile = "built-in profile overridden by the user rule file " + info.RulesFile
	}
	rows := [][]string{
		{"Operator / site", orDash(site)},
		{"Hoist", orDash(a.ID) + " — " + orDash(a.Get("description").Text)},
		{"Register", fmt.Sprintf("%s%s, row %d", info.Input, sheet, a.Row)},
		{"Register SHA-256", sha},
		{"Rules", info.Profile + " (" + rulesFile + ")"},
		{"Tool", info.Tool + " " + info.Version},
		{"As of", info.AsOf.Format("2006-01-02")},
		{"Revision", ""},
	}
	p.table([]float64{38, textW - 38}, []string{"Record of", ""}, rows, bodyPt-0.5, nil)
}

// signOff is the block the people responsible fill in by hand.
func (p *printer) signOff() {
	p.needSpace(40)
	p.font(p.bold, bodyPt-0.5)
	w := []float64{30, 60, 55, 35}
	h := lh(bodyPt)
	x, y := margin, p.pdf.GetY()
	p.pdf.SetFillColor(0xe8, 0xea, 0xed)
	for i, t := range []string{"", "Name", "Signature", "Date"} {
		p.pdf.SetXY(x, y)
		p.pdf.CellFormat(w[i], h+1, t, "1", 0, "L", true, 0, "")
		x += w[i]
	}
	y += h + 1
	for _, role := range []string{"Prepared", "Checked", "Approved"} {
		x = margin
		for i := range w {
			p.pdf.SetXY(x, y)
			t := ""
			if i == 0 {
				t = role
			}
			p.pdf.CellFormat(w[i], 10, t, "1", 0, "L", false, 0, "")
			x += w[i]
		}
		y += 10
	}
	p.pdf.SetXY(margin, y+3)
	p.font(p.sans, bodyPt)
}

func (p *printer) caution() {
	p.needSpace(25)
	p.pdf.SetFillColor(0xfd, 0xf1, 0xe0)
	p.pdf.SetDrawColor(0xd9, 0x8e, 0x04)
	p.font(p.bold, bodyPt)
	p.pdf.MultiCell(textW, lh(bodyPt)+0.5, p.ok("Caution. "+fleet.Caution), "1", "L", true)
	p.font(p.sans, bodyPt)
	p.gap(2)
}

func (p *printer) list(title string, items []string) {
	if len(items) == 0 {
		return
	}
	p.para(p.bold, bodyPt, title)
	for _, s := range items {
		p.indented(p.sans, bodyPt, 4, "• "+s)
	}
	p.gap(1.5)
}

// statusFill is the fill colour of a status cell.
func statusFill(s fleet.Status) (int, int, int, bool) {
	switch s {
	case fleet.StatusPass:
		return 0xd8, 0xef, 0xd9, true
	case fleet.StatusMarginal:
		return 0xfd, 0xe9, 0xb8, true
	case fleet.StatusFail:
		return 0xf6, 0xc9, 0xc9, true
	case fleet.StatusError:
		return 0xe6, 0xd3, 0xf0, true
	case fleet.StatusUnchecked:
		return 0xee, 0xe4, 0xdf, true
	}
	return 0xec, 0xef, 0xf1, true
}

func statusInk(s fleet.Status) (int, int, int) {
	c := map[fleet.Status][3]uint8{fleet.StatusPass: {colPass.R, colPass.G, colPass.B}, fleet.StatusMarginal: {colMarginal.R, colMarginal.G, colMarginal.B},
		fleet.StatusFail: {colFail.R, colFail.G, colFail.B}, fleet.StatusError: {colError.R, colError.G, colError.B},
		fleet.StatusUnchecked: {colUnchecked.R, colUnchecked.G, colUnchecked.B}}[s]
	if c == [3]uint8{} {
		return int(colInfo.R), int(colInfo.G), int(colInfo.B)
	}
	return int(c[0]), int(c[1]), int(c[2])
}

// barFull is the utilisation a full bar stands for; the limit (1) is marked on it.
const barFull = 1.5

// checkTable is the table of all checks, each with a bar of its utilisation.
func (p *printer) checkTable(checks []fleet.CheckResult, h *fleet.Header) {
	w := []float64{30, 15, 17, 24, 20, 74}
	header := []string{"Check", "Status", "Utilis.", "0 — 1 — 1.5", "Rated load at limit", "Rule; source"}
	rows := make([][]string, len(checks))
	for i, c := range checks {
		lim := ""
		if c.LoadDependent && !math.IsNaN(c.LimitRatedLoadKg) {
			lim = record.Kg(c.LimitRatedLoadKg)
		}
		rs := c.Rule
		if c.Source != "" {
			rs += "; " + c.Source
		}
		if c.Rule == "" && c.Message != "" {
			rs = c.Message
		}
		rows[i] = []string{c.ID, c.Status.String(), record.Num(c.Utilisation), "", lim, rs}
	}
	bar := func(row int, y, _ float64) {
		c := checks[row]
		u := c.Utilisation
		if math.IsNaN(u) {
			return
		}
		bx := margin + w[0] + w[1] + w[2] + 1.5
		bw := w[3] - 3
		by := y + 1
		p.pdf.SetFillColor(0xee, 0xee, 0xee)
		p.pdf.Rect(bx, by, bw, 2.6, "F")
		r, g, b := statusInk(c.Status)
		p.pdf.SetFillColor(r, g, b)
		p.pdf.Rect(bx, by, bw*math.Min(math.Max(u, 0), barFull)/barFull, 2.6, "F")
		p.pdf.SetDrawColor(0x21, 0x21, 0x21)
		p.pdf.SetLineWidth(0.3)
		p.pdf.Line(bx+bw/barFull, by-0.6, bx+bw/barFull, by+3.2)
		p.pdf.SetLineWidth(0.1)
	}
	p.table(w, header, rows, 7, func(row, col int) (int, int, int, bool) {
		if col == 1 {
			return statusFill(checks[row].Status)
		}
		return 0, 0, 0, false
	}, bar)
}

// changes lists, for every check that fails with a utilisation, the capacity it would
// need to pass: capacity × utilisation, in the check's unit (fleet.RequiredCapacity).
func (p *printer) changes(checks []fleet.CheckResult, where string, h *fleet.Header) {
	var items []string
	for _, c := range checks {
		if c.Status != fleet.StatusFail {
			continue
		}
		need := fleet.RequiredCapacity(&c)
		if math.IsNaN(need) {
			items = append(items, c.ID+" fails: "+orDash(c.Message)+" (see its working)")
			continue
		}
		items = append(items, fmt.Sprintf("%s: capacity needed %s %s (has %s %s; capacity × utilisation %s)",
			c.ID, record.Num(need), c.Unit, record.Num(c.Capacity), c.Unit, record.Num(c.Utilisation)))
	}
	if len(items) == 0 {
		return
	}
	p.gap(1)
	p.list("What would have to change "+where+" (each failing check's capacity to reach utilisation 1):", items)
}

// working prints each check's basis, steps and results as io/record gives them.
func (p *printer) working(section string, checks []fleet.CheckResult) {
	for i := range checks {
		c := &checks[i]
		p.heading(3, fmt.Sprintf("%s.%d %s", section, i+1, record.CheckTitle(c)))
		for _, l := range record.CheckBasis(c) {
			p.para(p.sans, bodyPt-0.5, l)
		}
		if len(c.Steps) > 0 {
			p.gap(1)
			for _, s := range c.Steps {
				for k, l := range record.StepLines(s) {
					in := 3.0
					if k > 0 {
						in = 9
					}
					p.indented(p.mono, smallPt, in, l)
				}
			}
			p.gap(1)
		}
		for _, l := range record.CheckResults(c) {
			p.para(p.sans, bodyPt-0.5, l)
		}
		p.gap(1)
	}
}

// plots draws the rating diagram, the emergency stop and the runaway.
func (p *printer) plots(r *fleet.Result, h *fleet.Header, ev Evaluator) {
	p.needSpace(130)
	p.heading(2, "2. Plots")
	unit, perUnit := "kg", 1.0
	for _, c := range h.Columns {
		if c.Key == "rated_load" && c.Unit == "t" && c.Factor > 0 {
			unit, perUnit = "t", c.Factor
		}
	}
	if d, ok := newRatingDiagram(r, ev); ok {
		if pl, err := ratingPlot(d, unit, perUnit); err == nil {
			p.needSpace(100 + 14)
			p.image(pl, textW, 100)
			p.para(p.sans, smallPt+0.5, "Each load-dependent check's utilisation (Y) at rated loads from 0 to "+
				record.Num(d.LoadsKg[len(d.LoadsKg)-1]/perUnit)+" "+unit+", computed by running the checks at each load. "+
				"The red line is the limit (utilisation 1): the first line to cross it is the check that governs the rating; "+
				"each crossing is that check's rated load at its limit (section 5).")
		} else {
			p.setErr(err)
		}
	} else {
		p.para(p.sans, bodyPt, "Rating diagram: not drawn (no rated load, or no load-dependent check could be evaluated).")
	}
	p.gap(2)
	var stop, run *fleet.CheckResult
	for i := range r.Checks {
		switch r.Checks[i].ID {
		case "brake-stop":
			stop = &r.Checks[i]
		case "runaway":
			run = &r.Checks[i]
		}
	}
	p.needSpace(68 + 14)
	y := p.pdf.GetY()
	half := textW/2 - 2
	if sp, ok := stopProfile(stop); ok {
		var marks []mark
		if len(sp.T) > 2 || !sp.Stops {
			marks = append(marks, mark{at: sp.T[1], label: "brake set", col: colInfo})
		}
		title := "Emergency stop while lowering"
		if pl, err := speedPlot(title, sp, marks, false); err == nil {
			p.imageAt(pl, margin, y, half, 68)
		} else {
			p.setErr(err)
		}
	}
	if rp, vRated, ok := runawayProfile(run); ok {
		var marks []mark
		if !math.IsNaN(vRated) {
			marks = append(marks, mark{at: vRated, horizontal: true, label: "rated hoisting speed", col: colMarginal})
		}
		rp.Distance = math.NaN()
		if rp.Note == "" {
			rp.Note = "brake released, motor off"
		}
		if pl, err := speedPlot("Runaway from rest", rp, marks, true); err == nil {
			p.imageAt(pl, margin+half+4, y, half, 68)
		} else {
			p.setErr(err)
		}
	}
	p.pdf.SetXY(margin, y+70)
	p.para(p.sans, smallPt+0.5, "Left: brake-stop, speed against time from the loss of power: the load speeds up through the brake delay, "+
		"then the brake decelerates it; the shaded area is the stopping distance. Right: runaway, the speed from rest if the "+
		"brake does not act, until the load has fallen the lift height (section 4 gives the figures).")
}

func (p *printer) setErr(err error) {
	if p.err == nil && err != nil {
		p.err = err
	}
}

// image places a plot w × h mm at the current position and moves below it.
func (p *printer) image(pl *plot.Plot, w, h float64) {
	p.needSpace(h + 2)
	y := p.pdf.GetY()
	p.imageAt(pl, margin, y, w, h)
	p.pdf.SetXY(margin, y+h+1)
}

// imageAt draws a plot of w × h mm at (x, y), as vector graphics (canvas).
func (p *printer) imageAt(pl *plot.Plot, x, y, w, h float64) {
	c := newCanvas(p.pdf, x, y, vg.Length(w)*vg.Millimeter, vg.Length(h)*vg.Millimeter, p.plotFonts, &p.images)
	pl.Draw(draw.New(c))
	p.setErr(c.End())
	p.font(p.sans, bodyPt)
}

func orDash(s string) string {
	if s == "" {
		return "—"
	}
	return s
}
