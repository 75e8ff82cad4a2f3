package xlsxout

import (
	"fmt"
	"math"
	"sort"
	"strconv"

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

// printWide sets the sheet to print landscape, one page wide, without gridlines on screen.
func (s *sheetWriter) printWide() {
	if s.err != nil {
		return
	}
	land, one, any0, yes, no := "landscape", 1, 0, true, false
	if s.err = s.f.SetPageLayout(s.sheet, &excelize.PageLayoutOptions{Orientation: &land, FitToWidth: &one, FitToHeight: &any0}); s.err != nil {
		return
	}
	if s.err = s.f.SetSheetProps(s.sheet, &excelize.SheetPropsOptions{FitToPage: &yes}); s.err != nil {
		return
	}
	s.err = s.f.SetSheetView(s.sheet, 0, &excelize.ViewOptions{ShowGridLines: &no})
}

// quoted returns the sheet name quoted for a reference: 'Summary'.
func quoted(sheet string) string { return "'" + sheet + "'" }

func absRange(sheet string, c1, r1, c2, r2 int) string {
	a, _ := excelize.CoordinatesToCellName(c1, r1, true)
	b, _ := excelize.CoordinatesToCellName(c2, r2, true)
	return quoted(sheet) + "!" + a + ":" + b
}

func title(t string) excelize.ChartTitle {
	return excelize.ChartTitle{Paragraph: []excelize.RichTextRun{{Text: t, Font: &excelize.Font{Bold: true, Size: 12}}}}
}

func solid(c string) excelize.Fill {
	return excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{c}}
}

// Layout of the Summary sheet: tables in columns A–H, charts stacked from column J.
const (
	tableCols   = 8
	chartCol    = "J"
	rowHeightPx = 20
)

func (w *Writer) top(list []fleet.Brief) []fleet.Brief {
	if w.opts.TopN > 0 && len(list) > w.opts.TopN {
		return list[:w.opts.TopN]
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
	sw.width(9, 9, 3)
	sw.printWide()

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

	chartRow := 5 // next free row for a chart in column J
	addChart := func(c *excelize.Chart) {
		c.Format.OffsetX = 0
		sw.chart(chartCol+strconv.Itoa(chartRow), c)
		chartRow += int(c.Dimension.Height)/rowHeightPx + 2
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
			Legend:    excelize.ChartLegend{Position: "bottom"},
			Dimension: excelize.ChartDimension{Width: 560, Height: uint(min(140+26*len(s.Sites), 900))},
			XAxis:     excelize.ChartAxis{ReverseOrder: true}, YAxis: excelize.ChartAxis{MajorGridLines: true},
			GapWidth: &gap})
	}
	r++

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
		Dimension: excelize.ChartDimension{Width: 560, Height: 260}, YAxis: excelize.ChartAxis{MajorGridLines: true}})
	r++

	// Governing checks.
	gov := s.GoverningSorted()
	sw.str(1, r, "What limits the rated load", st.heading)
	r++
	sw.str(1, r, "Governing check", st.th)
	sw.str(2, r, "Hoists", st.th)
	r++
	first = r
	for _, nc := range gov {
		sw.str(1, r, nc.Name, 0)
		sw.set(2, r, nc.Count, 0)
		r++
	}
	if len(gov) == 0 {
		sw.str(1, r, "no hoist has a rating", st.subtitle)
		r++
	} else {
		addChart(&excelize.Chart{Type: excelize.Bar, Title: title("Hoists by governing check"),
			Series: []excelize.ChartSeries{{Name: absRange(SheetSummary, 2, first-1, 2, first-1),
				Categories: absRange(SheetSummary, 1, first, 1, r-1), Values: absRange(SheetSummary, 2, first, 2, r-1),
				Fill: solid(Palette[fleet.StatusInfo].Chart)}},
			Legend: excelize.ChartLegend{Position: "none"},
			XAxis:  excelize.ChartAxis{ReverseOrder: true}, YAxis: excelize.ChartAxis{MajorGridLines: true},
			Dimension: excelize.ChartDimension{Width: 560, Height: uint(min(100+24*len(gov), 700))}})
	}
	r++

	// Worst hoists.
	load := "Max rated load [" + w.unit + "]"
	sw.str(1, r, "Hoists needing attention first", st.heading)
	r++
	for i, h := range []string{"Asset ID", "Row", "Site", "Status", "Min margin", "Worst check", "Governing check", load, "Action"} {
		sw.str(1+i, r, h, st.th)
	}
	r++
	worst := w.top(s.Worst)
	for _, b := range worst {
		w.briefRow(sw, r, b)
		sw.str(4, r, b.Status.String(), st.text[statusIndex(b.Status)])
		sw.set(5, r, b.MinMargin, st.pctPlain)
		sw.str(6, r, b.WorstCheck, 0)
		sw.str(7, r, b.GoverningCheck, 0)
		sw.set(8, r, b.MaxRatedLoadKg*w.perKg, st.load)
		sw.str(9, r, b.Action, 0)
		r++
	}
	if len(worst) == 0 {
		sw.str(1, r, "every hoist passes", st.subtitle)
		r++
	}
	r++

	// Overdue inspections.
	sw.str(1, r, fmt.Sprintf("Overdue inspections: %d", s.OverdueCount), st.heading)
	r++
	if len(s.Overdue) > 0 {
		for i, h := range []string{"Asset ID", "Row", "Site", "Days overdue", "Note"} {
			sw.str(1+i, r, h, st.th)
		}
		r++
		for _, b := range w.top(s.Overdue) {
			w.briefRow(sw, r, b)
			sw.set(4, r, math.Round(b.Days), st.int_)
			sw.str(5, r, b.Reason, 0)
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
			sw.str(4, r, b.Reason, 0)
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

// briefRow writes Asset ID (linked to its Register row), Row and Site.
func (w *Writer) briefRow(sw *sheetWriter, r int, b fleet.Brief) {
	id := b.AssetID
	if id == "" {
		id = "(row " + strconv.Itoa(b.Row) + ")"
	}
	sw.str(1, r, id, w.st.link)
	if b.Row > 0 {
		sw.link(1, r, quoted(SheetRegister)+"!A"+strconv.Itoa(b.Row))
	}
	sw.set(2, r, b.Row, 0)
	sw.str(3, r, b.Site, 0)
}

func titleCase(s string) string {
	if s == "" {
		return s
	}
	return string(s[0]-'a'+'A') + s[1:]
}
