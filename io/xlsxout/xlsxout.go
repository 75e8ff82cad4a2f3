// Package xlsxout writes hoistfleet's results workbook (design.md, "The results"):
//
//   - Summary: the fleet at a glance, built from fleet.Summary in End: counts by status
//     as coloured tiles, by site (table and stacked bar chart), the smallest-margin
//     distribution (column chart), hoists by governing check (bar chart), counts by check,
//     the worst hoists (linked to their Register row), overdue inspections, flags,
//     re-rating changes and the status legend.
//   - Register: every column and row of the register exactly as given, then the results:
//     Status, Action, Governing check, Max rated load [the register's rated-load unit], Min margin,
//     Worst check, Messages, Defaults used, a link to the hoist's first row in Checks,
//     Checks run ("3 of 18": the checks its data let run of those that apply), and per check (fleet.CheckIDs) its status and utilisation; with a proposed rated load
//     also Proposed status, Verdict changes and Proposed action. Status cells are filled with Palette,
//     the header is frozen and the sheet has an auto-filter.
//   - Checks: long form, one row per hoist, load case and check, for pivot tables.
//   - Data: data completeness — what the verdicts rest on, and per register column the
//     hoists lack, how many lack it and which checks it would let run, most useful first.
//   - Audit: the cautions first, then the run (tool, version, command, input and its
//     SHA-256, as-of date, times, rules, marginal band, workers, rows) and every rule in
//     force with its value, groups, condition, source, provenance, origin and uses.
//
// Register and Checks (and Checks 2, … when Checks is full) are written as results
// arrive by hoistfleet's own worksheet writer (sheetxml.go), which formats the sheet XML
// the way excelize's StreamWriter does and deflates it as it goes (on a goroutine per
// sheet) into a temporary file per sheet (in Options.TmpDir), so memory does not grow
// with the register. In End,
// excelize builds the rest of the workbook — Summary and Audit with its normal API,
// styles, the workbook part, relationships, content types and an empty placeholder for
// each streamed sheet — and writes it through a zip writer of ours that puts each
// streamed sheet's compressed entry where excelize writes its placeholder (zipswap.go).
// End and Abort remove the temporary files.
//
// Nothing from the register can become a live formula: register text is written as
// text cells, numbers as numbers, dates as dates. The only formulas in the workbook are
// hoistfleet's own HYPERLINK("#'Checks'!A123", …) cells in the Register's link column:
// a streamed sheet cannot carry hyperlink relationships per cell without keeping them
// all in memory (and a sheet holds at most 65 529), so a formula link keeps memory
// bounded. The Summary's links to Register rows are ordinary cell hyperlinks.
package xlsxout

import (
	"archive/zip"
	"compress/flate"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet"
	"hoistfleet/io/cite"
)

// Sheet names.
const (
	SheetSummary  = "Summary"
	SheetRegister = "Register"
	SheetChecks   = "Checks"
	SheetAudit    = "Audit"
)

// Options customise a Writer.
type Options struct {
	// TopN caps the Summary's hoist lists (worst, overdue, flags, changes); 0 shows
	// every hoist the fleet.Summary kept.
	TopN int
	// TmpDir is where the streamed sheets are compressed to temporary files until End;
	// "" is the system default.
	TmpDir string
	// Paper is the paper every sheet is set up to print on: PaperA4 or PaperLetter
	// ("" is A4).
	Paper string
}

// ChecksColumns are the Checks sheet's headers.
var ChecksColumns = []string{"Row", "Asset ID", "Site", "Load case", "Check", "Status", "Demand", "Capacity", "Unit",
	"Utilisation", "Margin", "Limit rated load [kg]", "Rule", "Source", "Message", "Key figures"}

var checksWidths = []float64{7, 14, 16, 10, 20, 11, 12, 12, 7, 11, 10, 13, 32, 36, 40, 60}

// Writer is a fleet.Sink writing the results workbook. Errors stick.
type Writer struct {
	out  io.Writer
	opts Options
	f    *excelize.File
	st   *styles
	reg  *sheetStream
	chk  *sheetStream
	// streamed are the finished streamed sheets' spools by sheet name; spools are all
	// of them, for removal
	streamed map[string]*spool
	spools   []*spool
	h        *fleet.Header
	info     *fleet.RunInfo

	paper    int    // the paperSize code
	header   string // every page's header and footer (print.go)
	footer   string
	assetCol int               // the Register's Asset ID column (1 = A), 0 when it has none
	unit     string            // the register's rated-load unit
	perKg    float64           // register unit per kg
	proposed bool              // Proposed columns are present
	nIn      int               // register columns written as given
	nCols    int               // all Register columns
	regRow   int               // last Register row written
	chkRow   int               // last Checks row written
	chkSheet string            // the Checks sheet being written: "Checks", then "Checks 2", … when full
	chkN     int               // how many Checks sheets so far
	sources  map[string]string // check source → its short form (cite.Short)
	maxRows  int               // rows a sheet may hold; 0: the spreadsheet limit (tests set less)
	done     bool
	err      error
}

// New returns a Writer that writes the workbook to w in End.
func New(w io.Writer, opts Options) *Writer { return &Writer{out: w, opts: opts} }

var _ fleet.Sink = (*Writer)(nil)

// Prepare does nothing: the workbook's rows are written in register order by Write.
// Write keeps nothing of a result once it returns (the fleet.Sink contract): the
// summary's lists copy what they show.
func (w *Writer) Prepare(*fleet.Result) {}

func (w *Writer) fail(format string, a ...any) error {
	if w.err == nil {
		w.err = fmt.Errorf("xlsxout: "+format, a...)
	}
	return w.err
}

// Begin creates the workbook, its styles and the two streamed sheets, and writes their
// headers. When it fails it releases what it made (fleet.Run calls no Abort then).
func (w *Writer) Begin(h *fleet.Header, info *fleet.RunInfo) error {
	if w.err != nil {
		return w.err
	}
	if h == nil {
		return w.fail("no header")
	}
	if err := w.begin(h, info); err != nil {
		w.release()
		return err
	}
	return nil
}

func (w *Writer) begin(h *fleet.Header, info *fleet.RunInfo) error {
	w.h, w.info = h, info
	var err error
	if w.paper, err = paperCode(w.opts.Paper); err != nil {
		return w.fail("%w", err)
	}
	asOf, input := "", ""
	if info != nil {
		input = info.Input
		if !info.AsOf.IsZero() {
			asOf = info.AsOf.Format("2006-01-02")
		}
	}
	if input == "" {
		input = h.File
	}
	w.header, w.footer = headerFooter(input, asOf)
	w.f = excelize.NewFile(excelize.Options{TmpDir: w.opts.TmpDir})
	f := w.f
	if err := f.SetSheetName("Sheet1", SheetSummary); err != nil {
		return w.fail("%w", err)
	}
	// Register and Checks are empty placeholders here: their parts are written by
	// sheetStream. Audit is created in End, after any continuation sheets of Checks.
	for _, s := range []string{SheetRegister, SheetChecks} {
		if _, err := f.NewSheet(s); err != nil {
			return w.fail("sheet %s: %w", s, err)
		}
	}
	f.SetActiveSheet(0)
	w.streamed = map[string]*spool{}
	if w.st, err = newStyles(f); err != nil {
		w.err = err
		return err
	}
	w.unit, w.perKg = ratedUnit(h)
	for _, c := range h.Columns {
		if c.Key == "proposed_rated_load" {
			w.proposed = true
		}
	}
	if info != nil && info.RatedLoadFactor > 0 {
		w.proposed = true
	}
	if err := w.beginRegister(); err != nil {
		return err
	}
	w.chkN = 1
	return w.beginChecks(SheetChecks)
}

// ratedUnit returns the rated-load column's unit and the factor from kg to it
// (Column.Factor converts the column's unit to kg). Without a usable column: kg.
func ratedUnit(h *fleet.Header) (string, float64) {
	for _, c := range h.Columns {
		if c.Key != "rated_load" || !(c.Factor > 0) {
			continue
		}
		switch {
		case c.Unit != "":
			return c.Unit, 1 / c.Factor
		case c.Factor == 1:
			return "kg", 1
		case c.Factor == 1000:
			return "t", 1.0 / 1000
		}
	}
	return "kg", 1
}

// registerResultHeaders are the Register's result columns, after the register's own.
func (w *Writer) registerResultHeaders() []string {
	hs := []string{"Status", "Action", "Governing check", "Max rated load [" + w.unit + "]", "Min margin", "Worst check",
		"Messages", "Defaults used", "Checks", "Checks run"}
	for _, id := range fleet.CheckIDs {
		hs = append(hs, id+" status", id+" utilisation")
	}
	if w.proposed {
		hs = append(hs, "Proposed status", "Verdict changes", "Proposed action")
	}
	return hs
}

// keyWidths are Register widths for the text columns whose content is longer than
// their header.
var keyWidths = map[string]float64{"asset_id": 14, "site": 18, "location": 18, "description": 30}

var resultWidths = []float64{11, 50, 20, 14, 10, 20, 40, 30, 10, 11}

func (w *Writer) beginRegister() error {
	w.nIn = len(w.h.Columns)
	res := w.registerResultHeaders()
	w.nCols = w.nIn + len(res)
	if w.nCols > excelize.MaxColumns {
		return w.fail("register: %d columns, more than a sheet holds (%d)", w.nCols, excelize.MaxColumns)
	}
	pane := frozenPane{ySplit: 1, topLeft: "A2", active: "bottomLeft"}
	if w.nIn > 0 && w.h.Columns[0].Key == "asset_id" {
		pane = frozenPane{xSplit: 1, ySplit: 1, topLeft: "B2", active: "bottomRight"}
	}
	widths := make([]float64, 0, w.nCols)
	for i, c := range w.h.Columns {
		if c.Key == "asset_id" && w.assetCol == 0 {
			w.assetCol = i + 1
		}
		width, ok := keyWidths[c.Key]
		if !ok {
			width = clamp(float64(len([]rune(c.Title)))*1.1+2, 10, 30)
		}
		widths = append(widths, width)
	}
	for i, hd := range res {
		width := 12.0
		if i < len(resultWidths) {
			width = resultWidths[i]
		} else if strings.HasSuffix(hd, " status") {
			width = clamp(float64(len(hd))*0.6, 10, 18)
		}
		widths = append(widths, width)
	}
	rep := 0.0
	if w.assetCol > 0 {
		rep = widths[w.assetCol-1]
	}
	page := &pageSetup{paper: w.paper, landscape: true, fitWidth: pagesAcross(widths, rep, w.paper),
		overThenDown: true, gridLines: true, header: w.header, footer: w.footer}
	sw, err := w.newStream(pane, widths, page)
	if err != nil {
		return w.fail("register: %w", err)
	}
	w.reg = sw
	sw.startRow(1, 45)
	for i, c := range w.h.Columns {
		sw.str(i+1, inputHeader(c), w.st.hdrIn)
	}
	for i, hd := range res {
		sw.str(w.nIn+i+1, hd, w.st.hdrOut)
	}
	if err := sw.endRow(); err != nil {
		return w.fail("register header: %w", err)
	}
	w.regRow = 1
	return nil
}

// newStream starts a streamed sheet in a spool of its own.
func (w *Writer) newStream(pane frozenPane, widths []float64, page *pageSetup) (*sheetStream, error) {
	sw, err := newSheetStream(w.opts.TmpDir, pane, widths, page)
	if err != nil {
		return nil, err
	}
	w.spools = append(w.spools, sw.sp)
	return sw, nil
}

func (w *Writer) beginChecks(sheet string) error {
	w.chkSheet = sheet
	page := &pageSetup{paper: w.paper, landscape: true, fitWidth: 1, gridLines: true, header: w.header, footer: w.footer}
	sw, err := w.newStream(frozenPane{ySplit: 1, topLeft: "A2", active: "bottomLeft"}, checksWidths, page)
	if err != nil {
		return w.fail("checks: %w", err)
	}
	w.chk = sw
	sw.startRow(1, 30)
	for i, c := range ChecksColumns {
		sw.str(i+1, c, w.st.hdrOut)
	}
	if err := sw.endRow(); err != nil {
		return w.fail("checks header: %w", err)
	}
	w.chkRow = 1
	return nil
}

// Write streams r's rows to Checks and its row to Register.
func (w *Writer) Write(r *fleet.Result) error {
	if w.err != nil {
		return w.err
	}
	if w.reg == nil || w.done {
		return w.fail("Write outside Begin … End")
	}
	if r == nil || r.Asset == nil {
		return w.fail("result without an asset")
	}
	site := ""
	if v := r.Asset.Get("site"); v.State == fleet.OK {
		site = v.Text
	}
	// A hoist's check rows stay on one sheet: when they would pass the spreadsheet's row
	// limit (1 048 576), the long form continues on "Checks 2", "Checks 3", …
	need := len(r.Checks)
	if r.Proposed != nil {
		need += len(r.Proposed.Checks)
	}
	limit := w.maxRows
	if limit == 0 {
		limit = excelize.TotalRows
	}
	if w.chkRow+need > limit {
		if err := w.rollChecks(); err != nil {
			return err
		}
	}
	first := 0
	if len(r.Checks) > 0 {
		first = w.chkRow + 1
	}
	if err := w.writeChecks(r, site, "rated", r.Checks); err != nil {
		return err
	}
	if r.Proposed != nil {
		if first == 0 && len(r.Proposed.Checks) > 0 {
			first = w.chkRow + 1
		}
		if err := w.writeChecks(r, site, "proposed", r.Proposed.Checks); err != nil {
			return err
		}
	}
	return w.writeRegister(r, first)
}

// finishChecks sets the filter of the Checks sheet being written and finishes it.
func (w *Writer) finishChecks() error {
	if err := w.finishStream(w.chkSheet, w.chk, len(ChecksColumns), w.chkRow); err != nil {
		return w.fail("checks: %w", err)
	}
	return nil
}

// finishStream ends a streamed sheet with an auto-filter over its columns and rows
// (at least two rows: a filter needs one under the header). The filter is also set on
// excelize's placeholder, which gives the workbook its _xlnm._FilterDatabase name.
func (w *Writer) finishStream(sheet string, sw *sheetStream, cols, rows int) error {
	lastCol, err := excelize.ColumnNumberToName(max(cols, 1))
	if err != nil {
		return err
	}
	last := strconv.Itoa(max(rows, 2))
	if err := w.f.AutoFilter(sheet, "A1:"+lastCol+last, nil); err != nil {
		return fmt.Errorf("filter: %w", err)
	}
	if err := sw.finish("$A$1:$" + lastCol + "$" + last); err != nil {
		return err
	}
	w.streamed[sheet] = sw.sp
	return nil
}

// rollChecks closes the full Checks sheet and starts the next one.
func (w *Writer) rollChecks() error {
	if err := w.finishChecks(); err != nil {
		return err
	}
	w.chkN++
	name := SheetChecks + " " + strconv.Itoa(w.chkN)
	if _, err := w.f.NewSheet(name); err != nil {
		return w.fail("checks: %w", err)
	}
	return w.beginChecks(name)
}

func (w *Writer) writeChecks(r *fleet.Result, site, lc string, cs []fleet.CheckResult) error {
	st, sw := w.st, w.chk
	for i := range cs {
		c := &cs[i]
		si := statusIndex(c.Status)
		w.chkRow++
		sw.startRow(w.chkRow, 0)
		sw.int(1, r.Asset.Row, 0)
		sw.text(2, r.Asset.ID, 0)
		sw.text(3, site, 0)
		sw.str(4, lc, 0)
		sw.str(5, c.ID, 0)
		sw.str(6, c.Status.String(), st.text[si])
		sw.result(7, c.Demand, 0)
		sw.result(8, c.Capacity, 0)
		sw.text(9, c.Unit, 0)
		sw.result(10, c.Utilisation, st.pct[si])
		sw.result(11, c.Margin, st.pctPlain)
		sw.result(12, c.LimitRatedLoadKg, st.kg)
		sw.text(13, c.Rule, 0)
		sw.text(14, w.shortSource(c.Source), 0)
		sw.text(15, c.Message, 0)
		sw.text(16, KeyFigures(c), 0)
		if err := sw.endRow(); err != nil {
			return w.fail("checks row %d: %w", w.chkRow, err)
		}
	}
	return nil
}

func (w *Writer) writeRegister(r *fleet.Result, firstCheck int) error {
	st, sw := w.st, w.reg
	row := r.Asset.Row
	if row <= w.regRow {
		row = w.regRow + 1
	}
	w.regRow = row
	// The Action cells wrap: a row is as tall as its longest action needs, so that the
	// action prints whole (a spreadsheet does not grow a streamed row by itself).
	lines := wrappedLines(r.Action, actionLineChars)
	if r.Proposed != nil && w.proposed {
		lines = max(lines, wrappedLines(r.Proposed.Action, actionLineChars))
	}
	// In a tall row every other cell stands at the top, beside the action's first line.
	height, at := 0.0, func(style int) int { return style }
	if lines > 1 {
		height, at = float64(lines)*15, st.topOf
	}
	sw.startRow(row, height)
	for i, c := range r.Asset.Cells {
		if i >= w.nIn { // cells beyond the header are not part of any column
			break
		}
		w.inputCell(i+1, c, at)
	}
	col := w.nIn
	si := statusIndex(r.Status)
	sw.str(col+1, r.Status.String(), at(st.text[si]))
	sw.text(col+2, r.Action, st.wrap)
	sw.text(col+3, r.GoverningCheck, at(0))
	sw.result(col+4, r.MaxRatedLoadKg*w.perKg, at(st.load))
	sw.result(col+5, r.MinMargin, at(st.pctPlain))
	sw.text(col+6, r.WorstCheck, at(0))
	sw.text(col+7, strings.Join(r.Messages, "; "), at(0))
	sw.text(col+8, strings.Join(r.DefaultsUsed, "; "), at(0))
	if firstCheck > 0 {
		sw.formula(col+9, `HYPERLINK("#'`+w.chkSheet+`'!A`+strconv.Itoa(firstCheck)+`","details")`, "details", st.link)
	}
	if r.Coverage.Possible > 0 {
		sw.str(col+10, strconv.Itoa(r.Coverage.Run)+" of "+strconv.Itoa(r.Coverage.Possible), at(0))
	}
	col += 10
	for _, id := range fleet.CheckIDs {
		if c := r.Check(id); c != nil {
			ci := statusIndex(c.Status)
			sw.str(col+1, c.Status.String(), at(st.text[ci]))
			sw.result(col+2, c.Utilisation, at(st.pct[ci]))
		}
		col += 2
	}
	if w.proposed {
		if p := r.Proposed; p != nil {
			changes := "no"
			if p.Status != r.Status {
				changes = "yes"
			}
			sw.str(col+1, p.Status.String(), at(st.text[statusIndex(p.Status)]))
			sw.str(col+2, changes, at(0))
			sw.text(col+3, p.Action, st.wrap)
		}
	}
	if err := sw.endRow(); err != nil {
		return w.fail("register row %d: %w", row, err)
	}
	return nil
}

// actionLineChars is about how many characters of Calibri 11 fit a line of the Action
// column (width 50).
const actionLineChars = 56

// wrappedLines is how many lines s takes wrapped at about n characters a line, breaking
// at spaces.
func wrappedLines(s string, n int) int {
	if s == "" {
		return 0
	}
	lines, col := 1, 0
	for _, word := range strings.Fields(s) {
		l := utf8.RuneCountInString(word)
		switch {
		case col == 0:
			col = l
		case col+1+l <= n:
			col += 1 + l
		default:
			lines++
			col = l
		}
		for col > n { // a word longer than a line
			lines++
			col -= n
		}
	}
	return lines
}

// inputCell writes a register cell as given: a number, a date, or text. Text is always
// a text cell, so "=1+2" from the register stays the string "=1+2". An empty cell is
// not written.
func (w *Writer) inputCell(col int, c fleet.Cell, at func(int) int) {
	switch {
	case c.IsDate && !c.Date.IsZero():
		w.reg.date(col, c.Date, at(w.st.date))
		return
	case c.IsNumber:
		if v, err := strconv.ParseFloat(strings.TrimSpace(c.Text), 64); err == nil && finite(v) {
			w.reg.num(col, v, at(0))
			return
		}
	}
	w.reg.text(col, c.Text, at(0))
}

// shortSource returns the short form of a check's source (cite.Short): the full texts
// are in the Audit sheet. The forms are kept: a check's source takes a few values.
func (w *Writer) shortSource(s string) string {
	if v, ok := w.sources[s]; ok {
		return v
	}
	if w.sources == nil || len(w.sources) >= 4096 {
		w.sources = map[string]string{}
	}
	v := cite.Short(s)
	w.sources[s] = v
	return v
}

// Digits is how many significant digits the workbook gives the numbers hoistfleet
// computes (the register's own numbers are written as given); JSON lines keep the exact
// values.
const Digits = 6

// roundSig returns v rounded to Digits significant digits (NaN and ±Inf as they are).
func roundSig(v float64) float64 {
	if !finite(v) || v == 0 {
		return v
	}
	var buf [32]byte
	r, err := strconv.ParseFloat(string(strconv.AppendFloat(buf[:0], v, 'e', Digits-1, 64)), 64)
	if err != nil { // cannot happen: strconv reads what it writes
		return v
	}
	return r
}

func clamp(v, lo, hi float64) float64 { return math.Max(lo, math.Min(hi, v)) }

// KeyFigures formats a check's figures as "name = value unit; …" with five
// significant figures, text figures as written.
func KeyFigures(c *fleet.CheckResult) string {
	var b strings.Builder
	for i, f := range c.Figures {
		if i > 0 {
			b.WriteString("; ")
		}
		b.WriteString(f.Name)
		b.WriteString(" = ")
		switch {
		case f.Text != "":
			b.WriteString(f.Text)
		default:
			b.WriteString(Sig(f.Value, 5))
			if f.Unit != "" && f.Unit != "1" {
				b.WriteByte(' ')
				b.WriteString(f.Unit)
			}
		}
	}
	return b.String()
}

// Sig formats v with n significant figures, in plain notation from 1e-4 to 1e9 and
// without trailing zeros: Sig(9.80665, 3) = "9.81", Sig(25000, 5) = "25000".
func Sig(v float64, n int) string {
	switch {
	case math.IsNaN(v):
		return "n/a"
	case math.IsInf(v, 1):
		return "∞"
	case math.IsInf(v, -1):
		return "-∞"
	case v == 0:
		return "0"
	}
	a := math.Abs(v)
	if a < 1e-4 || a >= 1e9 {
		return strconv.FormatFloat(v, 'g', n, 64)
	}
	// round to n significant figures first, then decide the decimals
	r, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'g', n, 64), 64)
	dec := n - 1 - int(math.Floor(math.Log10(math.Abs(r))))
	if dec < 0 {
		dec = 0
	}
	s := strconv.FormatFloat(r, 'f', dec, 64)
	if strings.Contains(s, ".") {
		s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	}
	return s
}

// End finishes the streamed sheets, builds Summary and Audit and writes the workbook to
// the Writer's io.Writer.
func (w *Writer) End(s *fleet.Summary, info *fleet.RunInfo) error {
	if w.err != nil {
		return w.err
	}
	if w.reg == nil || w.done {
		return w.fail("End without Begin")
	}
	w.done = true
	if info == nil {
		info = w.info
	}
	if info == nil {
		info = &fleet.RunInfo{}
	}
	if s == nil {
		s = fleet.NewSummary(0)
	}
	defer w.removeSpools()
	f := w.f
	if err := w.finishStream(SheetRegister, w.reg, w.nCols, w.regRow); err != nil {
		return w.fail("register: %w", err)
	}
	if err := w.finishChecks(); err != nil {
		return err
	}
	sheets := []string{SheetData, SheetAudit} // after every Checks sheet
	if s.Baseline != nil {
		sheets = []string{SheetChanges, SheetData, SheetAudit}
	}
	for _, sheet := range sheets {
		if _, err := f.NewSheet(sheet); err != nil {
			return w.fail("sheet %s: %w", sheet, err)
		}
	}
	if err := w.setPrintTitles(); err != nil {
		return w.fail("print titles: %w", err)
	}
	if err := w.writeSummary(s, info); err != nil {
		return w.fail("summary: %w", err)
	}
	if s.Baseline != nil {
		if err := w.writeChanges(s, info); err != nil {
			return w.fail("changes: %w", err)
		}
	}
	if err := w.writeData(s); err != nil {
		return w.fail("data: %w", err)
	}
	if err := w.writeAudit(info); err != nil {
		return w.fail("audit: %w", err)
	}
	// excelize assembles the whole zip in a bytes.Buffer before writing it out. A zip
	// writer of our own, handed to excelize through SetZipWriter, writes every part
	// straight to w.out instead (the buffer excelize passes is left empty), with the
	// fastest deflate level, and the streamed sheets' compressed entries in place of
	// their placeholders.
	zw := zip.NewWriter(w.out)
	zw.RegisterCompressor(zip.Deflate, func(out io.Writer) (io.WriteCloser, error) {
		return flate.NewWriter(out, flate.BestSpeed)
	})
	sz := &swapZip{zw: zw, sheets: w.streamed, read: func(name string) ([]byte, bool) {
		v, ok := f.Pkg.Load(name)
		b, isBytes := v.([]byte)
		return b, ok && isBytes
	}}
	f.SetZipWriter(func(io.Writer) excelize.ZipWriter { return sz })
	if err := f.Write(io.Discard); err != nil {
		return w.fail("write: %w", err)
	}
	if err := f.Close(); err != nil {
		return w.fail("close: %w", err)
	}
	return nil
}

// setPrintTitles repeats the header row of Register and of every Checks sheet on each
// printed page, and the Register's Asset ID column on each page across.
func (w *Writer) setPrintTitles() error {
	refs := []string{"$1:$1"}
	if w.assetCol > 0 {
		c, err := excelize.ColumnNumberToName(w.assetCol)
		if err != nil {
			return err
		}
		refs = append([]string{"$" + c + ":$" + c}, refs...)
	}
	if err := printTitles(w.f, SheetRegister, refs...); err != nil {
		return err
	}
	for i := 1; i <= w.chkN; i++ {
		name := SheetChecks
		if i > 1 {
			name += " " + strconv.Itoa(i)
		}
		if err := printTitles(w.f, name, "$1:$1"); err != nil {
			return err
		}
	}
	return nil
}

// removeSpools removes the streamed sheets' temporary files.
func (w *Writer) removeSpools() {
	for _, sp := range w.spools {
		sp.remove()
	}
	w.spools = nil
}

// release closes the workbook and removes the temporary files.
func (w *Writer) release() {
	if w.f != nil {
		_ = w.f.Close()
	}
	w.removeSpools()
}

// Abort releases the workbook and its temporary files.
func (w *Writer) Abort() {
	w.release()
	w.done = true
	if w.err == nil {
		w.err = fmt.Errorf("xlsxout: aborted")
	}
}

// inputHeader is a register column's header as the Register sheet shows it
// (fleet.Column.DisplayTitle: a baseline's columns are matched by it).
func inputHeader(c fleet.Column) string { return c.DisplayTitle() }
