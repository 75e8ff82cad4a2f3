package xlsxout

import (
	"strconv"
	"time"

	"github.com/xuri/excelize/v2"
)

// sheetStream writes one big worksheet (Register, Checks, Checks 2, …) as SpreadsheetML
// straight into a spool: rows are formatted into a buffer, which is handed over to be
// deflated whenever it fills, so memory stays the same whatever the number of rows. Cells are
// written as excelize's StreamWriter wrote them (cellxml.go): inline strings, numbers,
// dates as serial numbers, formula cells with a cached string value.
//
// The part is: the worksheet element, sheetPr (fit to page), sheetViews with the frozen
// pane, cols with the widths, sheetData with the rows in ascending order, autoFilter,
// then the page setup (printOptions, pageMargins, pageSetup, headerFooter: print.go).
// There is no dimension element: it is optional, and readers count the rows themselves
// (excelize's StreamWriter leaves the placeholder A1 there).
//
// A cell's reference (r="B7") is optional (ECMA-376 Part 1, 18.3.1.4): a cell without
// one is in the column after the cell before it. Rows keep their r; a cell gets one only
// after a gap of more than maxFill columns, and a shorter gap is filled with empty <c/>
// cells, so every reader (Excel, LibreOffice, excelize's iterator and its full reader,
// openpyxl) places every cell alike. A reference repeated in every cell, its row number
// changing from row to row, was the largest part of the compressed sheets: leaving it
// out took the Checks sheet from 3.5 to about 1.8 KB a hoist (deflate, best speed).
//
// What it beats: excelize's StreamWriter, which reflects on every cell and buffers 16–32
// MiB per sheet. BenchmarkFloorStreamWrite, the StreamWriter writing as many plain cells
// as BenchmarkXLSXWrite's 10 000 hoists (no styles, no Summary or Audit sheet), takes
// 2.30× the CPU time of the whole workbook written here (3 interleaved runs, 2026-12-05)
// and allocates 312 MB in 17.1 million allocations against 33 MB in 0.60 million.
type sheetStream struct {
	sp   *spool
	buf  []byte
	cols []string // column letters: cols[0] = "A"
	row  []byte   // the current row's number, in digits
	next int      // the column a cell without a reference would be in
	page *pageSetup
	err  error
}

// maxFill is the longest gap in a row filled with empty cells; after a longer one the
// next cell gets its reference.
const maxFill = 4

// frozenPane is a sheet's frozen top-left part: ySplit rows and xSplit columns, the
// first scrollable cell and the active pane ("bottomLeft", "bottomRight").
type frozenPane struct {
	xSplit, ySplit int
	topLeft        string
	active         string
}

// flushAt is how much XML is formatted before it is deflated.
const flushAt = 128 << 10

// newSheetStream starts a worksheet in a new spool in dir, with its pane, column
// widths (widths[0] is column A's) and page setup (nil for none).
func newSheetStream(dir string, p frozenPane, widths []float64, page *pageSetup) (*sheetStream, error) {
	sp, err := newSpool(dir, flushAt+64<<10)
	if err != nil {
		return nil, err
	}
	s := &sheetStream{sp: sp, buf: sp.buffer(), page: page}
	s.buf = append(s.buf, `<?xml version="1.0" encoding="UTF-8"?>`+"\n"+
		`<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"`+
		` xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships">`...)
	s.buf = page.appendSheetPr(s.buf)
	s.buf = append(s.buf, `<sheetViews><sheetView workbookViewId="0"><pane`...)
	if p.xSplit > 0 {
		s.buf = append(s.buf, ` xSplit="`...)
		s.buf = strconv.AppendInt(s.buf, int64(p.xSplit), 10)
		s.buf = append(s.buf, '"')
	}
	if p.ySplit > 0 {
		s.buf = append(s.buf, ` ySplit="`...)
		s.buf = strconv.AppendInt(s.buf, int64(p.ySplit), 10)
		s.buf = append(s.buf, '"')
	}
	s.buf = append(s.buf, ` topLeftCell="`...)
	s.buf = append(s.buf, p.topLeft...)
	s.buf = append(s.buf, `" activePane="`...)
	s.buf = append(s.buf, p.active...)
	s.buf = append(s.buf, `" state="frozen"/></sheetView></sheetViews>`...)
	if len(widths) > 0 {
		s.buf = append(s.buf, `<cols>`...)
		for i, w := range widths {
			s.buf = append(s.buf, `<col min="`...)
			s.buf = strconv.AppendInt(s.buf, int64(i+1), 10)
			s.buf = append(s.buf, `" max="`...)
			s.buf = strconv.AppendInt(s.buf, int64(i+1), 10)
			s.buf = append(s.buf, `" width="`...)
			s.buf = strconv.AppendFloat(s.buf, w, 'f', -1, 64)
			s.buf = append(s.buf, `" customWidth="1"/>`...)
		}
		s.buf = append(s.buf, `</cols>`...)
	}
	s.buf = append(s.buf, `<sheetData>`...)
	s.colName(len(widths))
	return s, nil
}

// colName returns column col's letters (1 = "A").
func (s *sheetStream) colName(col int) string {
	for len(s.cols) < col {
		n, err := excelize.ColumnNumberToName(len(s.cols) + 1)
		if err != nil && s.err == nil { // callers keep within excelize.MaxColumns
			s.err = err
		}
		s.cols = append(s.cols, n)
	}
	return s.cols[col-1]
}

// startRow opens row r; height > 0 sets a custom height in points.
func (s *sheetStream) startRow(r int, height float64) {
	s.row = strconv.AppendInt(s.row[:0], int64(r), 10)
	s.buf = append(s.buf, `<row r="`...)
	s.buf = append(s.buf, s.row...)
	s.buf = append(s.buf, '"')
	if height > 0 {
		s.buf = append(s.buf, ` ht="`...)
		s.buf = strconv.AppendFloat(s.buf, height, 'f', -1, 64)
		s.buf = append(s.buf, `" customHeight="1"`...)
	}
	s.buf = append(s.buf, '>')
	s.next = 1
}

// endRow closes the row and deflates the buffer when it is full.
func (s *sheetStream) endRow() error {
	s.buf = append(s.buf, `</row>`...)
	if len(s.buf) >= flushAt {
		return s.flush()
	}
	return s.err
}

// flush hands the buffer to the spool's deflater and takes an empty one.
func (s *sheetStream) flush() error {
	if s.err != nil {
		s.buf = s.buf[:0]
		return s.err
	}
	s.buf, s.err = s.sp.submit(s.buf)
	return s.err
}

// open starts a cell: <c s="3" t="…">, with r="B7" after a long gap (see sheetStream).
// preserve puts xml:space on the cell. Cells come in ascending columns.
func (s *sheetStream) open(col, style int, typ string, preserve bool) {
	ref := col != s.next
	if gap := col - s.next; gap > 0 && gap <= maxFill {
		for range gap {
			s.buf = append(s.buf, `<c/>`...)
		}
		ref = false
	}
	s.next = col + 1
	s.buf = append(s.buf, `<c`...)
	if preserve {
		s.buf = append(s.buf, ` xml:space="preserve"`...)
	}
	if ref {
		s.buf = append(s.buf, ` r="`...)
		s.buf = append(s.buf, s.colName(col)...)
		s.buf = append(s.buf, s.row...)
		s.buf = append(s.buf, '"')
	}
	if style != 0 {
		s.buf = append(s.buf, ` s="`...)
		s.buf = strconv.AppendInt(s.buf, int64(style), 10)
		s.buf = append(s.buf, '"')
	}
	if typ != "" {
		s.buf = append(s.buf, ` t="`...)
		s.buf = append(s.buf, typ...)
		s.buf = append(s.buf, '"')
	}
	s.buf = append(s.buf, '>')
}

// str writes v as an inline string cell, even when empty.
func (s *sheetStream) str(col int, v string, style int) {
	s.open(col, style, "inlineStr", false)
	s.buf = append(s.buf, `<is><t`...)
	// the attribute comes before the text, which is only known escaped: write the text,
	// then insert the attribute if it is needed (rare)
	at := len(s.buf)
	s.buf = append(s.buf, '>')
	var preserve bool
	s.buf, preserve = appendCellText(s.buf, v)
	if preserve {
		const attr = ` xml:space="preserve"`
		s.buf = append(s.buf, attr...)
		copy(s.buf[at+len(attr):], s.buf[at:len(s.buf)-len(attr)])
		copy(s.buf[at:], attr)
	}
	s.buf = append(s.buf, `</t></is></c>`...)
}

// text writes v as an inline string cell, or nothing when v is empty.
func (s *sheetStream) text(col int, v string, style int) {
	if v != "" {
		s.str(col, v, style)
	}
}

// num writes a number cell. NaN and ±Inf have no value: nothing is written, or with a
// style an empty cell carrying it (as excelize wrote a styled cell without a value).
func (s *sheetStream) num(col int, v float64, style int) {
	if !finite(v) {
		if style != 0 {
			s.open(col, style, "", false)
			s.buf = append(s.buf, `</c>`...)
		}
		return
	}
	s.open(col, style, "", false)
	s.buf = append(s.buf, `<v>`...)
	s.buf = appendNumber(s.buf, v)
	s.buf = append(s.buf, `</v></c>`...)
}

// result writes a number hoistfleet computed, rounded to Digits significant digits.
func (s *sheetStream) result(col int, v float64, style int) { s.num(col, roundSig(v), style) }

// int writes an integer cell.
func (s *sheetStream) int(col, v, style int) {
	s.open(col, style, "", false)
	s.buf = append(s.buf, `<v>`...)
	s.buf = strconv.AppendInt(s.buf, int64(v), 10)
	s.buf = append(s.buf, `</v></c>`...)
}

// date writes t as a date serial number (1900 date system); a time before 1899-12-31
// has none and is written as RFC 3339 text, as excelize does.
func (s *sheetStream) date(col int, t time.Time, style int) {
	serial, shifted := excelTime(t)
	if serial > 0 {
		s.open(col, style, "", false)
		s.buf = append(s.buf, `<v>`...)
		s.buf = strconv.AppendFloat(s.buf, serial, 'f', -1, 64)
		s.buf = append(s.buf, `</v></c>`...)
		return
	}
	s.open(col, style, "inlineStr", false)
	s.buf = append(s.buf, `<is><t>`...)
	s.buf = shifted.AppendFormat(s.buf, time.RFC3339Nano)
	s.buf = append(s.buf, `</t></is></c>`...)
}

// formula writes a formula cell with its cached string value (t="str").
func (s *sheetStream) formula(col int, f, v string, style int) {
	v = cutCellText(v)
	preserve := needsPreserve(v)
	if containsX(v) {
		v = bstrMarshal(v)
	}
	s.open(col, style, "str", preserve)
	s.buf = append(s.buf, `<f>`...)
	s.buf = appendEscaped(s.buf, f, false)
	s.buf = append(s.buf, `</f>`...)
	if v != "" {
		s.buf = append(s.buf, `<v>`...)
		s.buf = appendEscaped(s.buf, v, false)
		s.buf = append(s.buf, `</v>`...)
	}
	s.buf = append(s.buf, `</c>`...)
}

// finish ends sheetData, adds the auto-filter over ref (e.g. "$A$1:$P$90") and the page
// setup, and closes the spool.
func (s *sheetStream) finish(filterRef string) error {
	s.buf = append(s.buf, `</sheetData><autoFilter ref="`...)
	s.buf = appendEscaped(s.buf, filterRef, false)
	s.buf = append(s.buf, `"/>`...)
	s.buf = s.page.appendPrint(s.buf)
	s.buf = append(s.buf, `</worksheet>`...)
	if err := s.flush(); err != nil {
		return err
	}
	s.buf = nil
	return s.sp.close()
}

func finite(v float64) bool { return v-v == 0 }

func containsX(s string) bool {
	for i := 0; i+1 < len(s); i++ {
		if s[i] == '_' && s[i+1] == 'x' {
			return true
		}
	}
	return false
}
