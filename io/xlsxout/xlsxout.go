// Package xlsxout writes hoistfleet's results workbook (design.md, "The results"):
//
//   - Summary: the fleet at a glance, built from fleet.Summary in End: counts by status
//     as coloured tiles, by site (table and stacked bar chart), the smallest-margin
//     distribution (column chart), hoists by governing check (bar chart), counts by check,
//     the worst hoists (linked to their Register row), overdue inspections, flags,
//     re-rating changes and the status legend.
//   - Register: every column and row of the register exactly as given, then the results:
//     Status, Governing check, Max rated load [the register's rated-load unit], Min margin,
//     Worst check, Messages, Defaults used, a link to the hoist's first row in Checks, and
//     per check (fleet.CheckIDs) its status and utilisation; with a proposed rated load
//     also Proposed status and Verdict changes. Status cells are filled with Palette,
//     the header is frozen and the sheet has an auto-filter.
//   - Checks: long form, one row per hoist, load case and check, for pivot tables.
//   - Audit: the cautions first, then the run (tool, version, command, input and its
//     SHA-256, as-of date, times, rules, marginal band, workers, rows) and every rule in
//     force with its value, groups, condition, source, provenance, origin and uses.
//
// Register and Checks are written with excelize's StreamWriter as results arrive (two
// stream writers on two sheets at once), so memory does not grow with the register;
// rows beyond excelize's in-memory chunk go to temporary files that Abort, or the File's
// Close after End, removes. Summary and Audit are small and use the normal API.
//
// Nothing from the register can become a live formula: register text is written as
// text cells, numbers as numbers, dates as dates. The only formulas in the workbook are
// hoistfleet's own HYPERLINK("#'Checks'!A123", …) cells in the Register's link column:
// excelize's stream writer cannot carry hyperlink relationships per cell without keeping
// them all in memory (and a sheet holds at most 65 529), so a formula link keeps memory
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

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet"
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
	// TmpDir is where excelize spills streamed rows; "" is the system default.
	TmpDir string
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
	reg  *excelize.StreamWriter
	chk  *excelize.StreamWriter
	h    *fleet.Header
	info *fleet.RunInfo

	unit     string  // the register's rated-load unit
	perKg    float64 // register unit per kg
	proposed bool    // Proposed columns are present
	nIn      int     // register columns written as given
	nCols    int     // all Register columns
	regRow   int     // last Register row written
	chkRow   int     // last Checks row written
	chkSheet string  // the Checks sheet being written: "Checks", then "Checks 2", … when full
	chkN     int     // how many Checks sheets so far
	maxRows  int     // rows a sheet may hold; 0: the spreadsheet limit (tests set less)
	row      []any   // reused row buffer
	done     bool
	err      error
}

// New returns a Writer that writes the workbook to w in End.
func New(w io.Writer, opts Options) *Writer { return &Writer{out: w, opts: opts} }

var _ fleet.Sink = (*Writer)(nil)

func (w *Writer) fail(format string, a ...any) error {
	if w.err == nil {
		w.err = fmt.Errorf("xlsxout: "+format, a...)
	}
	return w.err
}

// Begin creates the workbook, its styles and the two streamed sheets, and writes their
// headers.
func (w *Writer) Begin(h *fleet.Header, info *fleet.RunInfo) error {
	if w.err != nil {
		return w.err
	}
	if h == nil {
		return w.fail("no header")
	}
	w.h, w.info = h, info
	w.f = excelize.NewFile(excelize.Options{TmpDir: w.opts.TmpDir})
	f := w.f
	if err := f.SetSheetName("Sheet1", SheetSummary); err != nil {
		return w.fail("%w", err)
	}
	// Audit is created in End, after any continuation sheets of Checks: excelize cannot
	// move sheets once streamed sheets have spilled to temporary files.
	for _, s := range []string{SheetRegister, SheetChecks} {
		if _, err := f.NewSheet(s); err != nil {
			return w.fail("sheet %s: %w", s, err)
		}
	}
	f.SetActiveSheet(0)
	var err error
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
	hs := []string{"Status", "Governing check", "Max rated load [" + w.unit + "]", "Min margin", "Worst check",
		"Messages", "Defaults used", "Checks"}
	for _, id := range fleet.CheckIDs {
		hs = append(hs, id+" status", id+" utilisation")
	}
	if w.proposed {
		hs = append(hs, "Proposed status", "Verdict changes")
	}
	return hs
}

// keyWidths are Register widths for the text columns whose content is longer than
// their header.
var keyWidths = map[string]float64{"asset_id": 14, "site": 18, "location": 18, "description": 30}

var resultWidths = []float64{11, 20, 14, 10, 20, 40, 30, 10}

func (w *Writer) beginRegister() error {
	f := w.f
	if err := f.SetSheetDimension(SheetRegister, ""); err != nil {
		return w.fail("%w", err)
	}
	sw, err := f.NewStreamWriter(SheetRegister)
	if err != nil {
		return w.fail("register: %w", err)
	}
	w.reg = sw
	w.nIn = len(w.h.Columns)
	res := w.registerResultHeaders()
	w.nCols = w.nIn + len(res)
	panes := &excelize.Panes{Freeze: true, YSplit: 1, TopLeftCell: "A2", ActivePane: "bottomLeft"}
	if w.nIn > 0 && w.h.Columns[0].Key == "asset_id" {
		panes = &excelize.Panes{Freeze: true, XSplit: 1, YSplit: 1, TopLeftCell: "B2", ActivePane: "bottomRight"}
	}
	if err := sw.SetPanes(panes); err != nil {
		return w.fail("register panes: %w", err)
	}
	for i, c := range w.h.Columns {
		width, ok := keyWidths[c.Key]
		if !ok {
			width = clamp(float64(len([]rune(c.Title)))*1.1+2, 10, 30)
		}
		if err := sw.SetColWidth(i+1, i+1, width); err != nil {
			return w.fail("register widths: %w", err)
		}
	}
	for i, hd := range res {
		width := 12.0
		if i < len(resultWidths) {
			width = resultWidths[i]
		} else if strings.HasSuffix(hd, " status") {
			width = clamp(float64(len(hd))*0.6, 10, 18)
		}
		if err := sw.SetColWidth(w.nIn+i+1, w.nIn+i+1, width); err != nil {
			return w.fail("register widths: %w", err)
		}
	}
	row := make([]any, 0, w.nCols)
	for _, c := range w.h.Columns {
		row = append(row, excelize.Cell{Value: c.Title, StyleID: w.st.hdrIn})
	}
	for _, hd := range res {
		row = append(row, excelize.Cell{Value: hd, StyleID: w.st.hdrOut})
	}
	if err := sw.SetRow("A1", row, excelize.RowOpts{Height: 45}); err != nil {
		return w.fail("register header: %w", err)
	}
	w.regRow = 1
	return nil
}

func (w *Writer) beginChecks(sheet string) error {
	f := w.f
	w.chkSheet = sheet
	if err := f.SetSheetDimension(sheet, ""); err != nil {
		return w.fail("%w", err)
	}
	sw, err := f.NewStreamWriter(sheet)
	if err != nil {
		return w.fail("checks: %w", err)
	}
	w.chk = sw
	if err := sw.SetPanes(&excelize.Panes{Freeze: true, YSplit: 1, TopLeftCell: "A2", ActivePane: "bottomLeft"}); err != nil {
		return w.fail("checks panes: %w", err)
	}
	for i, width := range checksWidths {
		if err := sw.SetColWidth(i+1, i+1, width); err != nil {
			return w.fail("checks widths: %w", err)
		}
	}
	row := make([]any, len(ChecksColumns))
	for i, c := range ChecksColumns {
		row[i] = excelize.Cell{Value: c, StyleID: w.st.hdrOut}
	}
	if err := sw.SetRow("A1", row, excelize.RowOpts{Height: 30}); err != nil {
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

// finishChecks sets the filter of the Checks sheet being written and flushes it.
func (w *Writer) finishChecks() error {
	lastCol, _ := excelize.ColumnNumberToName(len(ChecksColumns))
	if err := w.f.AutoFilter(w.chkSheet, "A1:"+lastCol+strconv.Itoa(max(w.chkRow, 2)), nil); err != nil {
		return w.fail("checks filter: %w", err)
	}
	if err := w.chk.Flush(); err != nil {
		return w.fail("checks: %w", err)
	}
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
	st := w.st
	for i := range cs {
		c := &cs[i]
		si := statusIndex(c.Status)
		w.chkRow++
		w.row = append(w.row[:0],
			r.Asset.Row, text(r.Asset.ID), text(site), lc, c.ID,
			excelize.Cell{Value: c.Status.String(), StyleID: st.text[si]},
			num(c.Demand), num(c.Capacity), text(c.Unit),
			excelize.Cell{Value: num(c.Utilisation), StyleID: st.pct[si]},
			excelize.Cell{Value: num(c.Margin), StyleID: st.pctPlain},
			excelize.Cell{Value: num(c.LimitRatedLoadKg), StyleID: st.kg},
			text(c.Rule), text(c.Source), text(c.Message), text(KeyFigures(c)))
		cell, _ := excelize.CoordinatesToCellName(1, w.chkRow)
		if err := w.chk.SetRow(cell, w.row); err != nil {
			return w.fail("checks row %d: %w", w.chkRow, err)
		}
	}
	return nil
}

func (w *Writer) writeRegister(r *fleet.Result, firstCheck int) error {
	st := w.st
	row := r.Asset.Row
	if row <= w.regRow {
		row = w.regRow + 1
	}
	w.regRow = row
	w.row = w.row[:0]
	for _, c := range r.Asset.Cells {
		w.row = append(w.row, w.inputCell(c))
	}
	for len(w.row) < w.nIn {
		w.row = append(w.row, nil)
	}
	w.row = w.row[:w.nIn] // cells beyond the header are not part of any column
	si := statusIndex(r.Status)
	link := any(nil)
	if firstCheck > 0 {
		link = excelize.Cell{Formula: `HYPERLINK("#'` + w.chkSheet + `'!A` + strconv.Itoa(firstCheck) + `","details")`,
			Value: "details", StyleID: st.link}
	}
	w.row = append(w.row,
		excelize.Cell{Value: r.Status.String(), StyleID: st.text[si]},
		text(r.GoverningCheck),
		excelize.Cell{Value: num(r.MaxRatedLoadKg * w.perKg), StyleID: st.load},
		excelize.Cell{Value: num(r.MinMargin), StyleID: st.pctPlain},
		text(r.WorstCheck),
		text(strings.Join(r.Messages, "; ")),
		text(strings.Join(r.DefaultsUsed, "; ")),
		link)
	for _, id := range fleet.CheckIDs {
		c := r.Check(id)
		if c == nil {
			w.row = append(w.row, nil, nil)
			continue
		}
		ci := statusIndex(c.Status)
		w.row = append(w.row, excelize.Cell{Value: c.Status.String(), StyleID: st.text[ci]},
			excelize.Cell{Value: num(c.Utilisation), StyleID: st.pct[ci]})
	}
	if w.proposed {
		if p := r.Proposed; p != nil {
			changes := "no"
			if p.Status != r.Status {
				changes = "yes"
			}
			w.row = append(w.row, excelize.Cell{Value: p.Status.String(), StyleID: st.text[statusIndex(p.Status)]}, changes)
		} else {
			w.row = append(w.row, nil, nil)
		}
	}
	cell, _ := excelize.CoordinatesToCellName(1, row)
	if err := w.reg.SetRow(cell, w.row); err != nil {
		return w.fail("register row %d: %w", row, err)
	}
	return nil
}

// inputCell returns a register cell as given: a number, a date, or text. Text is always
// a text cell, so "=1+2" from the register stays the string "=1+2".
func (w *Writer) inputCell(c fleet.Cell) any {
	switch {
	case c.IsDate && !c.Date.IsZero():
		return excelize.Cell{Value: c.Date, StyleID: w.st.date}
	case c.IsNumber:
		if v, err := strconv.ParseFloat(strings.TrimSpace(c.Text), 64); err == nil && !math.IsInf(v, 0) && !math.IsNaN(v) {
			return v
		}
	}
	return text(c.Text)
}

// text returns s, or nil for an empty string (no cell).
func text(s string) any {
	if s == "" {
		return nil
	}
	return s
}

// num returns v, or nil for NaN and ±Inf (an empty cell).
func num(v float64) any {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return v
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
	f := w.f
	lastCol, _ := excelize.ColumnNumberToName(max(w.nCols, 1))
	if err := f.AutoFilter(SheetRegister, "A1:"+lastCol+strconv.Itoa(max(w.regRow, 2)), nil); err != nil {
		return w.fail("register filter: %w", err)
	}
	if err := w.reg.Flush(); err != nil {
		return w.fail("register: %w", err)
	}
	if err := w.finishChecks(); err != nil {
		return err
	}
	if _, err := f.NewSheet(SheetAudit); err != nil { // after every Checks sheet
		return w.fail("sheet %s: %w", SheetAudit, err)
	}
	if err := w.writeSummary(s, info); err != nil {
		return w.fail("summary: %w", err)
	}
	if err := w.writeAudit(info); err != nil {
		return w.fail("audit: %w", err)
	}
	// excelize assembles the whole zip in a bytes.Buffer before writing it out, which for
	// a register of a million hoists is gigabytes. A zip writer of our own, handed to
	// excelize through SetZipWriter, writes every part straight to w.out instead (the
	// buffer excelize passes is left empty), with the fastest deflate level.
	zw := zip.NewWriter(w.out)
	zw.RegisterCompressor(zip.Deflate, func(out io.Writer) (io.WriteCloser, error) {
		return flate.NewWriter(out, flate.BestSpeed)
	})
	f.SetZipWriter(func(io.Writer) excelize.ZipWriter { return zw })
	if err := f.Write(io.Discard); err != nil {
		return w.fail("write: %w", err)
	}
	if err := f.Close(); err != nil {
		return w.fail("close: %w", err)
	}
	return nil
}

// Abort releases the workbook and its temporary files.
func (w *Writer) Abort() {
	if w.f != nil {
		_ = w.f.Close()
	}
	w.done = true
	if w.err == nil {
		w.err = fmt.Errorf("xlsxout: aborted")
	}
}
