package xlsxout

import (
	"bytes"
	"math"
	"strconv"
	"strings"

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet"
)

// legacyWriter writes Register and Checks through excelize's StreamWriter, fed []any
// rows of excelize.Cell values. It is, for tests only, the reference that the cells of
// the writer's own sheet XML (sheetxml.go: value, type, style id, formula) are compared
// against. Summary and Audit are not written (they do not go through the streamed
// path).
type legacyWriter struct {
	f        *excelize.File
	st       *styles
	reg      *excelize.StreamWriter
	chk      *excelize.StreamWriter
	h        *fleet.Header
	unit     string
	perKg    float64
	proposed bool
	nIn      int
	nCols    int
	regRow   int
	chkRow   int
	chkSheet string
	chkN     int
	maxRows  int
	row      []any
}

func (w *legacyWriter) Begin(h *fleet.Header, info *fleet.RunInfo) error {
	w.h = h
	w.f = excelize.NewFile()
	f := w.f
	if err := f.SetSheetName("Sheet1", SheetSummary); err != nil {
		return err
	}
	for _, s := range []string{SheetRegister, SheetChecks} {
		if _, err := f.NewSheet(s); err != nil {
			return err
		}
	}
	f.SetActiveSheet(0)
	var err error
	if w.st, err = newStyles(f); err != nil {
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

func (w *legacyWriter) registerResultHeaders() []string {
	hs := []string{"Status", "Action", "Governing check", "Max rated load [" + w.unit + "]", "Min margin", "Worst check",
		"Messages", "Defaults used", "Checks"}
	for _, id := range fleet.CheckIDs {
		hs = append(hs, id+" status", id+" utilisation")
	}
	if w.proposed {
		hs = append(hs, "Proposed status", "Verdict changes", "Proposed action")
	}
	return hs
}

func (w *legacyWriter) beginRegister() error {
	f := w.f
	if err := f.SetSheetDimension(SheetRegister, ""); err != nil {
		return err
	}
	sw, err := f.NewStreamWriter(SheetRegister)
	if err != nil {
		return err
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
		return err
	}
	for i, c := range w.h.Columns {
		width, ok := keyWidths[c.Key]
		if !ok {
			width = clamp(float64(len([]rune(c.Title)))*1.1+2, 10, 30)
		}
		if err := sw.SetColWidth(i+1, i+1, width); err != nil {
			return err
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
			return err
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
		return err
	}
	w.regRow = 1
	return nil
}

func (w *legacyWriter) beginChecks(sheet string) error {
	f := w.f
	w.chkSheet = sheet
	if err := f.SetSheetDimension(sheet, ""); err != nil {
		return err
	}
	sw, err := f.NewStreamWriter(sheet)
	if err != nil {
		return err
	}
	w.chk = sw
	if err := sw.SetPanes(&excelize.Panes{Freeze: true, YSplit: 1, TopLeftCell: "A2", ActivePane: "bottomLeft"}); err != nil {
		return err
	}
	for i, width := range checksWidths {
		if err := sw.SetColWidth(i+1, i+1, width); err != nil {
			return err
		}
	}
	row := make([]any, len(ChecksColumns))
	for i, c := range ChecksColumns {
		row[i] = excelize.Cell{Value: c, StyleID: w.st.hdrOut}
	}
	if err := sw.SetRow("A1", row, excelize.RowOpts{Height: 30}); err != nil {
		return err
	}
	w.chkRow = 1
	return nil
}

func (w *legacyWriter) Write(r *fleet.Result) error {
	site := ""
	if v := r.Asset.Get("site"); v.State == fleet.OK {
		site = v.Text
	}
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

func (w *legacyWriter) finishChecks() error {
	lastCol, _ := excelize.ColumnNumberToName(len(ChecksColumns))
	if err := w.f.AutoFilter(w.chkSheet, "A1:"+lastCol+strconv.Itoa(max(w.chkRow, 2)), nil); err != nil {
		return err
	}
	return w.chk.Flush()
}

func (w *legacyWriter) rollChecks() error {
	if err := w.finishChecks(); err != nil {
		return err
	}
	w.chkN++
	name := SheetChecks + " " + strconv.Itoa(w.chkN)
	if _, err := w.f.NewSheet(name); err != nil {
		return err
	}
	return w.beginChecks(name)
}

func (w *legacyWriter) writeChecks(r *fleet.Result, site, lc string, cs []fleet.CheckResult) error {
	st := w.st
	for i := range cs {
		c := &cs[i]
		si := statusIndex(c.Status)
		w.chkRow++
		w.row = append(w.row[:0],
			r.Asset.Row, legacyText(r.Asset.ID), legacyText(site), lc, c.ID,
			excelize.Cell{Value: c.Status.String(), StyleID: st.text[si]},
			legacyNum(c.Demand), legacyNum(c.Capacity), legacyText(c.Unit),
			excelize.Cell{Value: legacyNum(c.Utilisation), StyleID: st.pct[si]},
			excelize.Cell{Value: legacyNum(c.Margin), StyleID: st.pctPlain},
			excelize.Cell{Value: legacyNum(c.LimitRatedLoadKg), StyleID: st.kg},
			legacyText(c.Rule), legacyText(c.Source), legacyText(c.Message), legacyText(KeyFigures(c)))
		cell, _ := excelize.CoordinatesToCellName(1, w.chkRow)
		if err := w.chk.SetRow(cell, w.row); err != nil {
			return err
		}
	}
	return nil
}

func (w *legacyWriter) writeRegister(r *fleet.Result, firstCheck int) error {
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
	w.row = w.row[:w.nIn]
	si := statusIndex(r.Status)
	link := any(nil)
	if firstCheck > 0 {
		link = excelize.Cell{Formula: `HYPERLINK("#'` + w.chkSheet + `'!A` + strconv.Itoa(firstCheck) + `","details")`,
			Value: "details", StyleID: st.link}
	}
	w.row = append(w.row,
		excelize.Cell{Value: r.Status.String(), StyleID: st.text[si]},
		legacyText(r.Action),
		legacyText(r.GoverningCheck),
		excelize.Cell{Value: legacyNum(r.MaxRatedLoadKg * w.perKg), StyleID: st.load},
		excelize.Cell{Value: legacyNum(r.MinMargin), StyleID: st.pctPlain},
		legacyText(r.WorstCheck),
		legacyText(strings.Join(r.Messages, "; ")),
		legacyText(strings.Join(r.DefaultsUsed, "; ")),
		link)
	for _, id := range fleet.CheckIDs {
		c := r.Check(id)
		if c == nil {
			w.row = append(w.row, nil, nil)
			continue
		}
		ci := statusIndex(c.Status)
		w.row = append(w.row, excelize.Cell{Value: c.Status.String(), StyleID: st.text[ci]},
			excelize.Cell{Value: legacyNum(c.Utilisation), StyleID: st.pct[ci]})
	}
	if w.proposed {
		if p := r.Proposed; p != nil {
			changes := "no"
			if p.Status != r.Status {
				changes = "yes"
			}
			w.row = append(w.row, excelize.Cell{Value: p.Status.String(), StyleID: st.text[statusIndex(p.Status)]}, changes, legacyText(p.Action))
		} else {
			w.row = append(w.row, nil, nil, nil)
		}
	}
	cell, _ := excelize.CoordinatesToCellName(1, row)
	return w.reg.SetRow(cell, w.row)
}

func (w *legacyWriter) inputCell(c fleet.Cell) any {
	switch {
	case c.IsDate && !c.Date.IsZero():
		return excelize.Cell{Value: c.Date, StyleID: w.st.date}
	case c.IsNumber:
		if v, err := strconv.ParseFloat(strings.TrimSpace(c.Text), 64); err == nil && !math.IsInf(v, 0) && !math.IsNaN(v) {
			return v
		}
	}
	return legacyText(c.Text)
}

// End finishes both sheets and returns the workbook.
func (w *legacyWriter) End() ([]byte, error) {
	defer w.f.Close()
	lastCol, _ := excelize.ColumnNumberToName(max(w.nCols, 1))
	if err := w.f.AutoFilter(SheetRegister, "A1:"+lastCol+strconv.Itoa(max(w.regRow, 2)), nil); err != nil {
		return nil, err
	}
	if err := w.reg.Flush(); err != nil {
		return nil, err
	}
	if err := w.finishChecks(); err != nil {
		return nil, err
	}
	var buf bytes.Buffer
	if err := w.f.Write(&buf); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

func legacyText(s string) any {
	if s == "" {
		return nil
	}
	return s
}

func legacyNum(v float64) any {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return v
}

// legacyBuild writes rs with the legacy writer.
func legacyBuild(h *fleet.Header, info *fleet.RunInfo, rs []*fleet.Result, maxRows int) ([]byte, error) {
	w := &legacyWriter{maxRows: maxRows}
	if err := w.Begin(h, info); err != nil {
		return nil, err
	}
	for _, r := range rs {
		if err := w.Write(r); err != nil {
			return nil, err
		}
	}
	return w.End()
}
