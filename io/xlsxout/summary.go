package xlsxout

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet"
)

// sheetWriter wraps the normal API for a small sheet: the first error sticks.
type sheetWriter struct {
	f     *excelize.File
	sheet string
	err   error
}

func (s *sheetWriter) ref(col, row int) string {
	c, err := excelize.CoordinatesToCellName(col, row)
	if err != nil && s.err == nil {
		s.err = err
	}
	return c
}

// set writes v (nil for none) with style (0 for none) at col, row.
func (s *sheetWriter) set(col, row int, v any, style int) {
	if s.err != nil {
		return
	}
	ref := s.ref(col, row)
	if v != nil {
		if f, ok := v.(float64); ok && (math.IsNaN(f) || math.IsInf(f, 0)) {
			v = nil
		}
	}
	if v != nil {
		if s.err = s.f.SetCellValue(s.sheet, ref, v); s.err != nil {
			return
		}
	}
	if style != 0 {
		s.err = s.f.SetCellStyle(s.sheet, ref, ref, style)
	}
}

// str writes a text cell. SetCellStr never makes a formula of it.
func (s *sheetWriter) str(col, row int, v string, style int) {
	if s.err != nil {
		return
	}
	ref := s.ref(col, row)
	if v != "" {
		if s.err = s.f.SetCellStr(s.sheet, ref, v); s.err != nil {
			return
		}
	}
	if style != 0 {
		s.err = s.f.SetCellStyle(s.sheet, ref, ref, style)
	}
}

func (s *sheetWriter) merge(c1, r1, c2, r2 int) {
	if s.err == nil {
		s.err = s.f.MergeCell(s.sheet, s.ref(c1, r1), s.ref(c2, r2))
	}
}

func (s *sheetWriter) link(col, row int, location string) {
	if s.err == nil {
		s.err = s.f.SetCellHyperLink(s.sheet, s.ref(col, row), location, "Location")
	}
}

func (s *sheetWriter) height(row int, h float64) {
	if s.err == nil {
		s.err = s.f.SetRowHeight(s.sheet, row, h)
	}
}

func (s *sheetWriter) width(c1, c2 int, w float64) {
	if s.err != nil {
		return
	}
	a, _ := excelize.ColumnNumberToName(c1)
	b, _ := excelize.ColumnNumberToName(c2)
	s.err = s.f.SetColWidth(s.sheet, a, b, w)
}

func (s *sheetWriter) chart(cell string, c *excelize.Chart) {
	if s.err == nil {
		s.err = s.f.AddChart(s.sheet, cell, c)
	}
}

// noGrid hides the gridlines on screen.
func (s *sheetWriter) noGrid() {
	if s.err == nil {
		no := false
		s.err = s.f.SetSheetView(s.sheet, 0, &excelize.ViewOptions{ShowGridLines: &no})
	}
}

// quoted returns the sheet name quoted for a reference: 'Summary'.
func quoted(sheet string) string { return "'" + sheet + "'" }

func absRange(sheet string, c1, r1, c2, r2 int) string {
	a, _ := excelize.CoordinatesToCellName(c1, r1, true)
	b, _ := excelize.CoordinatesToCellName(c2, r2, true)
	return quoted(sheet) + "!" + a + ":" + b
}

func title(t string) excelize.ChartTitle {
	return excelize.ChartTitle{Paragraph: []excelize.RichTextRun{{Text: t, Font: &excelize.Font{Bold: true, Size: 12, Color: inkColour}}}}
}

// inkColour is the charts' text: near black, so that axis labels and titles print
// legibly (the default axis text is a pale grey).
const inkColour = "1B2A3A"

// axis is a chart axis with legible labels.
func axis(a excelize.ChartAxis) excelize.ChartAxis {
	a.Font = excelize.Font{Color: inkColour, Size: 10}
	return a
}

func legend(pos string) excelize.ChartLegend {
	return excelize.ChartLegend{Position: pos, Font: &excelize.Font{Color: inkColour, Size: 10}}
}

// summaryListMax caps the Summary's hoist lists so that the sheet prints on one page;
// the Register (filtered by Status) has every hoist.
const summaryListMax = 10

func solid(c string) excelize.Fill {
	return excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{c}}
}

// Layout of the Summary sheet: tables in columns A–I, the three charts side by side in
// a band under the status tiles.
const (
	tableCols   = 9
	rowHeightPx = 20
	chartWidth  = 440
	chartHeight = 260
)

// chartCols are the columns the Summary's charts are anchored at.
var chartCols = [...]string{"A", "D", "H"}

func (w *Writer) top(list []fleet.Brief) []fleet.Brief {
	n := summaryListMax
	if w.opts.TopN > 0 && w.opts.TopN < n {
		n = w.opts.TopN
	}
	if len(list) > n {
		return list[:n]
	}
	return list
}

// writeSummary builds the Summary sheet from s.
func (w *Writer) writeSummary(s *fleet.Summary, info *fleet.RunInfo) error {
	sw := &sheetWriter{f: w.f, sheet: SheetSummary}
	st := w.st
	sw.width(1, 1, 30) // site names in the by-site table
	sw.width(2, 2, 11)
	sw.width(3, 3, 30) // site names in the hoist lists
	sw.width(4, 5, 13)
	sw.width(6, 8, 19)
	sw.width(9, 9, 48) // the worst list's Action, wrapped
	sw.width(10, 10, 2)
	sw.noGrid()
	sw.setPrint(&pageSetup{paper: w.paper, landscape: false, fitWidth: 1, header: w.header, footer: w.footer}, 1)

	// Title, run line, caution.
	sw.str(1, 1, "Hoist fleet check", st.title)
	sw.height(1, 26)
	line := fmt.Sprintf("%d hoists", s.Total)
	if info.Input != "" {
		line = info.Input + " · " + line
	}
	if !info.AsOf.IsZero() {
		line += " · as of " + info.AsOf.Format("2006-01-02")
	}
	if info.Profile != "" {
		line += " · rules " + info.Profile
	}
	if info.RulesFile != "" {
		line += " + " + info.RulesFile
	}
	if info.MarginalBand > 0 {
		line += " · marginal band " + strconv.FormatFloat(info.MarginalBand*100, 'f', -1, 64) + " %"
	}
	sw.str(1, 2, line, st.subtitle)
	sw.str(1, 3, fleet.Caution, st.caution)
	sw.merge(1, 3, tableCols, 3)
	sw.height(3, 48)
	sw.str(1, 4, s.Coverage.Sentence()+" What would let more run: the Data sheet.", st.subtitle)

	// Status tiles: label, count, share.
	r := 5
	for i, stt := range fleet.Statuses {
		si := statusIndex(stt)
		sw.str(1+i, r, titleCase(stt.String()), st.tile[si])
		sw.set(1+i, r+1, s.ByStatus[stt], st.tileNum[si])
		if s.Total > 0 {
			sw.set(1+i, r+2, float64(s.ByStatus[stt])/float64(s.Total), st.tilePct)
		}
	}
	sw.str(6, r, "Total", st.tileLabel)
	sw.set(6, r+1, s.Total, st.tileCount)
	sw.height(r+1, 34)
	r += 4
	r = w.summaryCranes(sw, s, r)

	// The charts stand side by side in a band under the tiles, so that the sheet is no
	// wider than its tables and prints on one page at a readable scale.
	// Each chart is anchored at a column that starts past the one before (A at 0 px,
	// D at 512 px, H at 980 px with the widths above; 440 px a chart).
	chartRow, chartN := r, 0
	r += chartHeight/rowHeightPx + 2
	addChart := func(c *excelize.Chart) {
		c.Dimension.Width, c.Dimension.Height = chartWidth, chartHeight
		sw.chart(chartCols[chartN%len(chartCols)]+strconv.Itoa(chartRow), c)
		chartN++
	}

	// By site.
	sw.str(1, r, "Hoists by site", st.heading)
	r++
	hdrRow := r
	sw.str(1, r, "Site", st.th)
	for i, stt := range fleet.Statuses {
		sw.str(2+i, r, titleCase(stt.String()), st.text[statusIndex(stt)])
	}
	sw.str(7, r, "Total", st.th)
	r++
	first := r
	for _, sc := range s.Sites {
		name := sc.Site
		if name == "" {
			name = "(no site)"
		}
		sw.str(1, r, name, 0)
		total := 0
		for i, stt := range fleet.Statuses {
			sw.set(2+i, r, sc.ByStatus[stt], 0)
			total += sc.ByStatus[stt]
		}
		sw.set(7, r, total, st.bold)
		r++
	}
	if len(s.Sites) > 0 {
		var series []excelize.ChartSeries
		for i, stt := range fleet.Statuses {
			series = append(series, excelize.ChartSeries{
				Name:       absRange(SheetSummary, 2+i, hdrRow, 2+i, hdrRow),
				Categories: absRange(SheetSummary, 1, first, 1, r-1),
				Values:     absRange(SheetSummary, 2+i, first, 2+i, r-1),
				Fill:       solid(Palette[statusIndex(stt)].Chart),
			})
		}
		gap := uint(60)
		addChart(&excelize.Chart{Type: excelize.BarStacked, Series: series, Title: title("Hoists by site and status"),
			Legend:    legend("bottom"),
			Dimension: excelize.ChartDimension{Width: 520, Height: uint(min(140+26*len(s.Sites), 600))},
			XAxis:     axis(excelize.ChartAxis{ReverseOrder: true}), YAxis: axis(excelize.ChartAxis{MajorGridLines: true}),
			GapWidth: &gap})
	}
	r++

	r = w.exposureMatrix(sw, s, r)

	// Smallest margins.
	sw.str(1, r, "Smallest margin per hoist", st.heading)
	r++
	sw.str(1, r, "Margin", st.th)
	sw.str(2, r, "Hoists", st.th)
	r++
	first = r
	for i, label := range fleet.MarginBinLabels {
		sw.str(1, r, label, 0)
		sw.set(2, r, s.MarginBins[i], 0)
		r++
	}
	addChart(&excelize.Chart{Type: excelize.Col, Title: title("Hoists by smallest margin"),
		Series: []excelize.ChartSeries{{Name: absRange(SheetSummary, 2, first-1, 2, first-1),
			Categories: absRange(SheetSummary, 1, first, 1, r-1), Values: absRange(SheetSummary, 2, first, 2, r-1),
			Fill: solid(Palette[fleet.StatusInfo].Chart)}},
		Legend:    excelize.ChartLegend{Position: "none"},
		Dimension: excelize.ChartDimension{Width: 520, Height: 240}, XAxis: axis(excelize.ChartAxis{}),
		YAxis: axis(excelize.ChartAxis{MajorGridLines: true})})
	r++

	// Governing checks: what limits the rated load (a load-dependent check, a cap),
	// apart from what blocks any rating (a load-independent check that fails: no rating
	// whatever the load).
	gov := s.GoverningSorted()
	sw.str(1, r, "What limits the rated load", st.heading)
	r++
	sw.str(1, r, "Governing check", st.th)
	sw.str(2, r, "Limits the load", st.th)
	sw.str(3, r, "Blocks any rating", st.th)
	sw.height(r, 30)
	r++
	first = r
	for _, nc := range gov {
		sw.str(1, r, nc.Name, 0)
		if d, ok := fleet.DefinitionOf(nc.Name); ok && d.NullsRating {
			sw.set(3, r, nc.Count, 0)
		} else {
			sw.set(2, r, nc.Count, 0)
		}
		r++
	}
	if len(gov) == 0 {
		sw.str(1, r, "no hoist has a rating", st.subtitle)
		r++
	} else {
		var series []excelize.ChartSeries
		for i, c := range []string{Palette[fleet.StatusInfo].Chart, Palette[fleet.StatusFail].Chart} {
			series = append(series, excelize.ChartSeries{Name: absRange(SheetSummary, 2+i, first-1, 2+i, first-1),
				Categories: absRange(SheetSummary, 1, first, 1, r-1), Values: absRange(SheetSummary, 2+i, first, 2+i, r-1),
				Fill: solid(c)})
		}
		addChart(&excelize.Chart{Type: excelize.BarStacked, Title: title("Hoists by governing check"), Series: series,
			Legend: legend("bottom"),
			XAxis:  axis(excelize.ChartAxis{ReverseOrder: true}), YAxis: axis(excelize.ChartAxis{MajorGridLines: true}),
			Dimension: excelize.ChartDimension{Width: 520, Height: uint(min(130+24*len(gov), 560))}})
	}
	r++

	// Worst hoists.
	load := "Max rated load [" + w.unit + "]"
	sw.str(1, r, "Hoists needing attention first"+more(len(w.top(s.Worst)), s.ByStatus[fleet.StatusFail]+s.ByStatus[fleet.StatusError]+s.ByStatus[fleet.StatusUnchecked]+s.ByStatus[fleet.StatusMarginal]), st.heading)
	r++
	if s.Weighted {
		sw.str(1, r, "Ordered by consequence and severity together: status weight × exposure weight (rules attention.*, common practice), highest first; then status and margin", st.subtitle)
		r++
	}
	heads := []string{"Asset ID", "Row", "Site", "Status", "Min margin", "Worst check", "Governing check", load, "Action"}
	extra := 10 // the columns after Action: Exposure and weight, Crane
	if s.Weighted {
		heads = append(heads, "Exposure", "Weight")
		sw.width(extra, extra, 16)
		sw.width(extra+1, extra+1, 8)
	}
	craneCol := 0
	if len(s.Cranes) > 0 {
		craneCol = len(heads) + 1
		heads = append(heads, "Crane")
		sw.width(craneCol, craneCol, 12)
	}
	for i, h := range heads {
		sw.str(1+i, r, h, st.th)
	}
	r++
	worst := w.top(s.Worst)
	for _, b := range worst {
		// the Action wraps in its column: room for its lines (about 52 characters of
		// Calibri 11 to a line in the 48-wide column), and the row's other cells at the
		// top, beside its first line
		lines := wrappedLines(b.Action, 52)
		at := func(style int) int { return style }
		if lines > 1 {
			sw.height(r, float64(15*lines))
			at = st.topOf
		}
		w.briefRowStyled(sw, r, b, at)
		if s.Weighted {
			e := b.Exposure
			if e == "" {
				e = fleet.ExposureUnstated
			}
			sw.str(extra, r, e, at(0))
			sw.set(extra+1, r, b.Priority, at(0))
		}
		if craneCol > 0 {
			sw.str(craneCol, r, b.Crane, at(0))
		}
		sw.str(4, r, b.Status.String(), at(st.text[statusIndex(b.Status)]))
		sw.set(5, r, b.MinMargin, at(st.pctPlain))
		sw.str(6, r, b.WorstCheck, at(0))
		sw.str(7, r, b.GoverningCheck, at(0))
		sw.set(8, r, roundSig(b.MaxRatedLoadKg*w.perKg), at(st.load))
		sw.str(9, r, b.Action, st.wrap)
		r++
	}
	if len(worst) == 0 {
		sw.str(1, r, "every hoist passes", st.subtitle)
		r++
	}
	r++

	// Overdue inspections.
	sw.str(1, r, fmt.Sprintf("Overdue inspections: %d%s", s.OverdueCount, more(len(w.top(s.Overdue)), s.OverdueCount)), st.heading)
	r++
	if len(s.Overdue) > 0 {
		for i, h := range []string{"Asset ID", "Row", "Site", "Days overdue", "Note"} {
			sw.str(1+i, r, h, st.th)
		}
		r++
		for _, b := range w.top(s.Overdue) {
			w.briefRow(sw, r, b)
			sw.set(4, r, math.Round(b.Days), st.int_)
			sw.str(5, r, clipText(b.Reason, summaryReasonChars-20), 0)
			r++
		}
	}
	r++

	// Flags.
	nflags := 0
	keys := make([]string, 0, len(s.FlagCounts))
	for k, n := range s.FlagCounts {
		keys = append(keys, k)
		nflags += n
	}
	sort.Strings(keys)
	sw.str(1, r, fmt.Sprintf("Flags: %d", nflags), st.heading)
	r++
	for _, k := range keys {
		sw.str(1, r, k, 0)
		sw.set(2, r, s.FlagCounts[k], st.bold)
		r++
	}
	if len(s.Flags) > 0 {
		for i, h := range []string{"Asset ID", "Row", "Site", "Reason"} {
			sw.str(1+i, r, h, st.th)
		}
		r++
		for _, b := range w.top(s.Flags) {
			w.briefRow(sw, r, b)
			sw.str(4, r, clipText(b.Reason, summaryReasonChars), 0)
			r++
		}
	}
	r++

	// Re-rating.
	if s.Rerated > 0 {
		sw.str(1, r, fmt.Sprintf("Re-rating: %d hoists checked at a proposed load, %d change verdict", s.Rerated, s.ChangedCount), st.heading)
		r++
		if len(s.Changed) > 0 {
			for i, h := range []string{"Asset ID", "Row", "Site", "Status now", "At proposed load"} {
				sw.str(1+i, r, h, st.th)
			}
			sw.height(r, 30)
			r++
			for _, b := range w.top(s.Changed) {
				w.briefRow(sw, r, b)
				sw.str(4, r, b.Status.String(), st.text[statusIndex(b.Status)])
				sw.str(5, r, b.NewStatus.String(), st.text[statusIndex(b.NewStatus)])
				r++
			}
		}
		r++
	}

	// Checks by status.
	sw.str(1, r, "Checks by status", st.heading)
	r++
	sw.str(1, r, "Check", st.th)
	order := append(append([]fleet.Status{}, fleet.Statuses...), fleet.StatusInfo)
	for i, stt := range order {
		sw.str(2+i, r, titleCase(stt.String()), st.text[statusIndex(stt)])
	}
	r++
	for _, cc := range s.Checks {
		sw.str(1, r, cc.ID, 0)
		for i, stt := range order {
			if n := cc.ByStatus[stt]; n > 0 {
				sw.set(2+i, r, n, 0)
			}
		}
		r++
	}
	r++

	// Legend.
	sw.str(1, r, "Status colours", st.heading)
	r++
	for _, stt := range order {
		sw.str(1, r, stt.String(), st.text[statusIndex(stt)])
		sw.str(2, r, StatusMeaning[statusIndex(stt)], 0)
		r++
	}
	return sw.err
}

// summaryCranes writes the cranes (the register's Crane column) by status, and the cranes
// that do not pass with their hoists; it returns the next free row.
func (w *Writer) summaryCranes(sw *sheetWriter, s *fleet.Summary, r int) int {
	if len(s.Cranes) == 0 {
		return r
	}
	st := w.st
	sw.str(1, r, fmt.Sprintf("Cranes: %d (a crane's status is its worst hoist's; %d hoists)", len(s.Cranes), s.Total), st.heading)
	r++
	by := s.CranesByStatus()
	for i, stt := range fleet.Statuses {
		si := statusIndex(stt)
		sw.str(1+i, r, titleCase(stt.String()), st.text[si])
		sw.set(1+i, r+1, by[stt], st.bold)
	}
	sw.str(6, r, "Total", st.th)
	sw.set(6, r+1, len(s.Cranes), st.bold)
	r += 3
	var bad []fleet.CraneCount
	for _, c := range s.Cranes {
		if c.Status != fleet.StatusPass {
			bad = append(bad, c)
		}
	}
	sort.SliceStable(bad, func(i, j int) bool { return bad[i].Status.Worse(bad[j].Status) })
	if len(bad) == 0 {
		return r
	}
	shown := min(len(bad), summaryListMax)
	sw.str(1, r, "Cranes needing attention"+more(shown, len(bad)), st.heading)
	r++
	for i, h := range []string{"Crane", "Status", "Site", "Hoists"} {
		sw.str(1+i, r, h, st.th)
	}
	r++
	for _, c := range bad[:shown] {
		sw.str(1, r, c.Crane, 0)
		sw.str(2, r, c.Status.String(), st.text[statusIndex(c.Status)])
		sw.str(3, r, strings.Join(c.Sites, " · "), 0)
		sw.str(4, r, strings.Join(c.Hoists, ", "), 0)
		r++
	}
	return r + 1
}

// exposureMatrix writes the hoists counted by status and exposure (the register's
// Exposure column); it returns the next free row.
func (w *Writer) exposureMatrix(sw *sheetWriter, s *fleet.Summary, r int) int {
	if !s.Weighted {
		return r
	}
	st := w.st
	sw.str(1, r, "Hoists by status and exposure", st.heading)
	r++
	sw.str(1, r, "Status", st.th)
	for i, e := range append(append([]string{}, fleet.Exposures...), fleet.ExposureUnstated) {
		sw.str(2+i, r, e, st.th)
	}
	sw.height(r, 30)
	r++
	for _, stt := range fleet.Statuses {
		si := statusIndex(stt)
		sw.str(1, r, titleCase(stt.String()), st.text[si])
		for i := range s.ExposureCounts {
			n := s.ExposureCounts[i][stt]
			style := 0
			if n > 0 && stt != fleet.StatusPass {
				style = st.text[si]
			}
			sw.set(2+i, r, n, style)
		}
		r++
	}
	if n := s.ExposureCounts[len(fleet.Exposures)]; n != [5]int{} {
		total := 0
		for _, k := range n {
			total += k
		}
		sw.str(1, r, fmt.Sprintf("%d hoists without an exposure are weighted %s (rule attention.unstated_weight)", total,
			strconv.FormatFloat(s.Weights.Unstated, 'g', -1, 64)), st.subtitle)
		r++
	}
	return r + 1
}

// more says how many of n the list of shown leaves out: " (10 shown; all in the
// Register)", or "" when it shows them all.
func more(shown, n int) string {
	if n <= shown {
		return ""
	}
	return fmt.Sprintf(" (the first %d shown; the Register has all %d)", shown, n)
}

// briefRow writes Asset ID (linked to its Register row), Row and Site.
func (w *Writer) briefRow(sw *sheetWriter, r int, b fleet.Brief) {
	w.briefRowStyled(sw, r, b, func(style int) int { return style })
}

// briefRowStyled is briefRow with each cell's style passed through at (topOf for a tall
// row).
func (w *Writer) briefRowStyled(sw *sheetWriter, r int, b fleet.Brief, at func(int) int) {
	id := b.AssetID
	if id == "" {
		id = "(row " + strconv.Itoa(b.Row) + ")"
	}
	sw.str(1, r, id, at(w.st.link))
	if b.Row > 0 {
		sw.link(1, r, quoted(SheetRegister)+"!A"+strconv.Itoa(b.Row))
	}
	sw.set(2, r, b.Row, at(0))
	sw.str(3, r, b.Site, at(0))
}

func titleCase(s string) string {
	if s == "" {
		return s
	}
	return string(s[0]-'a'+'A') + s[1:]
}

// summaryReasonChars is about how many characters of a reason fit the Summary's page
// width from column D: a longer one (a review limit's message runs to 300) spilled past
// the page and made the one-page Summary print at a third of its size. The Register and
// Checks sheets have the whole text.
const summaryReasonChars = 110

// clipText cuts s to at most n characters, ending in "…" when cut.
func clipText(s string, n int) string {
	r := []rune(s)
	if len(r) <= n {
		return s
	}
	return strings.TrimRight(string(r[:n-1]), " ;,") + "…"
}
