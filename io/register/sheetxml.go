package register

import (
	"archive/zip"
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"slices"
	"strconv"
	"strings"

	"hoistfleet/fleet"
)

// Spreadsheet bounds (ECMA-376 and every spreadsheet program since Excel 2007): rows
// 1–1 048 576, columns A–XFD (16 384).
const (
	maxSheetRows = 1 << 20
	maxSheetCols = 1 << 14
)

// sheetRow is one row of a sheet as the XML gives it.
type sheetRow struct {
	row     int
	cells   []string
	formats []string // each cell's number format code when not General (nil: all General)
	hidden  bool
}

// sheetReader reads a worksheet's rows from its XML, streaming, with encoding/xml in
// strict mode: every XML error ends the read with an error naming the sheet and the row
// where it broke (excelize's row iterator drops the decoder's error and ends the sheet
// there). Rows and cells are placed by their references, whatever the physical order
// (the caller says, from its first pass over the sheet, whether the rows are in order;
// when not, they are all read and sorted first); a duplicate or impossible reference is
// an error naming the cell. Missing rows are returned empty, as a spreadsheet shows them.
type sheetReader struct {
	file, sheet string
	part        *checkedPart
	dec         *xml.Decoder
	guard       *markupGuard
	sst         *sharedStrings
	styles      styleFormats
	lim         Limits

	emitted int       // the last row number returned
	next    *sheetRow // a row read and not yet returned (rows before it were missing)
	inData  bool      // inside <sheetData>
	ended   bool      // </sheetData> seen
	xmlRow  int       // the last row number read from the XML

	cells   []string // reused for each row
	formats []string
	seen    []uint32 // seen[c] == gen: column c has a cell in the current row
	gen     uint32
	v       []byte // the current cell's <v> text
	is      []byte // the current cell's inline string text

	sorted []sheetRow // rows out of order: all of them, sorted
	pos    int
}

// errSheet is an error reading the sheet, located.
func (s *sheetReader) errAt(row, col int, format string, args ...any) error {
	where := ""
	switch {
	case row > 0 && col > 0:
		if name, ok := fleet.CellName(col, row); ok {
			where = " cell " + name
		} else {
			where = fmt.Sprintf(" row %d", row)
		}
	case row > 0:
		where = fmt.Sprintf(" row %d", row)
	}
	return fmt.Errorf("sheet %q%s: %s", s.sheet, where, fmt.Sprintf(format, args...))
}

// xmlErr wraps an error of the decoder or the zip entry with where it happened.
func (s *sheetReader) xmlErr(err error, row int) error {
	where := "after row " + strconv.Itoa(s.xmlRow)
	if row > 0 {
		where = "in row " + strconv.Itoa(row)
	}
	if s.xmlRow == 0 && row == 0 {
		where = "before its first row"
	}
	var lt *errLongText
	var se *xml.SyntaxError
	switch {
	case errors.As(err, &lt):
		return fmt.Errorf("sheet %q, %s: %w; the sheet is refused (a damaged or crafted file)", s.sheet, where, err)
	case errors.Is(err, errPartCorrupt):
		return fmt.Errorf("sheet %q: %w", s.sheet, err)
	case errors.As(err, &se) && se.Msg != "unexpected EOF":
		return fmt.Errorf("sheet %q, %s: the sheet's XML is broken (line %d: %s): the register is refused rather than read in part; open it in the spreadsheet program and save a new copy", s.sheet, where, se.Line, se.Msg)
	case err == io.EOF || errors.Is(err, io.ErrUnexpectedEOF) || se != nil:
		return fmt.Errorf("sheet %q, %s: the sheet's XML ends before its end (cut short): the register is refused rather than read in part", s.sheet, where)
	}
	return fmt.Errorf("sheet %q, %s: %w", s.sheet, where, err)
}

func newSheetReader(zf *zip.File, file, sheet string, sst *sharedStrings, styles styleFormats, lim Limits, ordered bool) (*sheetReader, error) {
	p, err := openChecked(zf)
	if err != nil {
		return nil, err
	}
	g := &markupGuard{r: p, limit: lim.cellText()}
	s := &sheetReader{file: file, sheet: sheet, part: p, guard: g, dec: newDecoder(g), sst: sst, styles: styles, lim: lim}
	if !ordered {
		if err := s.readSorted(); err != nil {
			_ = p.Close()
			return nil, err
		}
	}
	return s, nil
}

func (s *sheetReader) close() error { return s.part.Close() }

// read returns the next row (every row number from 1 up to the last row the XML holds),
// or io.EOF after the last. The cells slice is reused by the next call.
func (s *sheetReader) read() (sheetRow, error) {
	if s.sorted != nil {
		return s.readFromSorted()
	}
	if s.next == nil {
		r, err := s.parseRow()
		if err != nil {
			return sheetRow{}, err
		}
		if r.row <= s.emitted {
			if r.row == s.emitted {
				return sheetRow{}, s.errAt(r.row, 0, "two rows are numbered %d: the sheet is damaged; refused rather than one of them dropped", r.row)
			}
			return sheetRow{}, s.errAt(r.row, 0, "row %d comes after row %d in the sheet's XML: out of order", r.row, s.emitted)
		}
		s.next = &r
	}
	s.emitted++
	if s.next.row > s.emitted {
		return sheetRow{row: s.emitted}, nil
	}
	r := *s.next
	s.next = nil
	return r, nil
}

// readSorted reads every row, copied, and sorts them by number; two of the same number
// are an error. The rows held are bounded by the sheet's limits (one row's bytes, the
// number of rows) and by maxSortedBytes of cell text.
func (s *sheetReader) readSorted() error {
	var rows []sheetRow
	var total int64
	for {
		r, err := s.parseRow()
		if err == io.EOF {
			break
		}
		if err != nil {
			return err
		}
		r.cells = slices.Clone(r.cells)
		r.formats = slices.Clone(r.formats)
		for _, c := range r.cells {
			total += int64(len(c)) + 16
		}
		if total > maxSortedBytes {
			return s.errAt(r.row, 0, "the rows of this sheet are not in order in its XML, and it is too large (more than %s of text) to sort in memory: open it in the spreadsheet program and save a new copy", size(maxSortedBytes))
		}
		rows = append(rows, r)
	}
	slices.SortStableFunc(rows, func(a, b sheetRow) int { return a.row - b.row })
	for i := 1; i < len(rows); i++ {
		if rows[i].row == rows[i-1].row {
			return s.errAt(rows[i].row, 0, "two rows are numbered %d: the sheet is damaged; refused rather than one of them dropped", rows[i].row)
		}
	}
	if rows == nil {
		rows = []sheetRow{}
	}
	s.sorted = rows
	return nil
}

// maxSortedBytes bounds the text of a sheet whose rows are out of order (held to sort).
const maxSortedBytes = 512 << 20

func (s *sheetReader) readFromSorted() (sheetRow, error) {
	if s.pos >= len(s.sorted) {
		return sheetRow{}, io.EOF
	}
	s.emitted++
	r := s.sorted[s.pos]
	if r.row > s.emitted {
		return sheetRow{row: s.emitted}, nil
	}
	s.sorted[s.pos] = sheetRow{}
	s.pos++
	return r, nil
}

// parseRow reads the next <row> element of <sheetData>; io.EOF after the last, once the
// rest of the part has been read and checked (well-formed XML, size and CRC-32).
func (s *sheetReader) parseRow() (sheetRow, error) {
	for {
		tok, err := s.dec.Token()
		if err == io.EOF {
			if !s.ended {
				return sheetRow{}, s.xmlErr(io.ErrUnexpectedEOF, 0)
			}
			if err := s.part.finish(); err != nil {
				return sheetRow{}, s.xmlErr(err, 0)
			}
			return sheetRow{}, io.EOF
		}
		if err != nil {
			return sheetRow{}, s.xmlErr(err, 0)
		}
		switch t := tok.(type) {
		case xml.StartElement:
			switch {
			case t.Name.Local == "sheetData":
				s.inData = true
			case t.Name.Local == "row" && s.inData:
				return s.rowElement(t)
			case s.inData:
				return sheetRow{}, s.errAt(0, 0, "unexpected element <%s> in the sheet data after row %d", t.Name.Local, s.xmlRow)
			}
		case xml.EndElement:
			if t.Name.Local == "sheetData" {
				s.inData, s.ended = false, true
			}
		case xml.Directive:
			return sheetRow{}, s.xmlErr(errDoctype, 0)
		}
	}
}

// rowElement reads one <row> element's cells.
func (s *sheetReader) rowElement(start xml.StartElement) (sheetRow, error) {
	row := s.xmlRow + 1
	hidden := false
	for _, a := range start.Attr {
		switch a.Name.Local {
		case "r":
			n, err := strconv.Atoi(a.Value)
			if err != nil || n < 1 || n > maxSheetRows {
				return sheetRow{}, s.errAt(0, 0, "a row after row %d is numbered %q: not a row number (1 to %d)", s.xmlRow, a.Value, maxSheetRows)
			}
			row = n
		case "hidden":
			hidden = a.Value == "1" || a.Value == "true"
		}
	}
	if row > maxSheetRows {
		return sheetRow{}, s.errAt(0, 0, "more than %d rows", maxSheetRows)
	}
	s.xmlRow = row
	rowStart := s.dec.InputOffset()
	s.cells, s.formats = s.cells[:0], s.formats[:0]
	s.gen++
	col := 0
	anyFormat := false
	for {
		tok, err := s.dec.Token()
		if err != nil {
			return sheetRow{}, s.xmlErr(err, row)
		}
		switch t := tok.(type) {
		case xml.StartElement:
			if t.Name.Local != "c" {
				if err := s.dec.Skip(); err != nil {
					return sheetRow{}, s.xmlErr(err, row)
				}
				continue
			}
			if s.dec.InputOffset()-rowStart > s.lim.rowBytes() {
				return sheetRow{}, s.errAt(row, 0, "the row's XML is longer than %s, the limit for one row: refused (a damaged or crafted file)", size(s.lim.rowBytes()))
			}
			c, err := s.cell(t, row, col)
			if err != nil {
				return sheetRow{}, err
			}
			col = c.col
			if c.col > len(s.seen) {
				s.seen = append(s.seen, make([]uint32, c.col-len(s.seen))...)
			}
			if s.seen[c.col-1] == s.gen {
				name, _ := fleet.CellName(c.col, row)
				return sheetRow{}, s.errAt(row, c.col, "two cells are %s: the sheet is damaged; refused rather than one of them dropped", name)
			}
			s.seen[c.col-1] = s.gen
			if c.text == "" && c.format == "" {
				continue
			}
			for len(s.cells) < c.col {
				s.cells = append(s.cells, "")
				s.formats = append(s.formats, "")
			}
			s.cells[c.col-1] = c.text
			s.formats[c.col-1] = c.format
			anyFormat = anyFormat || c.format != ""
		case xml.EndElement:
			if t.Name.Local == "row" {
				// Trailing empty cells (a style, no value) are not cells of the row.
				n := len(s.cells)
				for n > 0 && s.cells[n-1] == "" {
					n--
				}
				r := sheetRow{row: row, cells: s.cells[:n], hidden: hidden}
				if anyFormat {
					r.formats = s.formats[:n]
				}
				return r, nil
			}
		case xml.Directive:
			return sheetRow{}, s.xmlErr(errDoctype, row)
		}
	}
}

type cellRead struct {
	col    int
	text   string
	format string // the number format code of a number cell, "" General or not a number
}

// cell reads one <c> element of row; prev is the column of the cell before it (a cell
// without a reference follows it).
func (s *sheetReader) cell(start xml.StartElement, row, prev int) (cellRead, error) {
	c := cellRead{col: prev + 1}
	typ, style := "", -1
	for _, a := range start.Attr {
		switch a.Name.Local {
		case "r":
			col, r, ok := parseCellRef(a.Value)
			if !ok {
				return c, s.errAt(row, 0, "a cell after column %d is referenced %q: not a cell reference (A1 to XFD1048576)", prev, a.Value)
			}
			if r != row {
				return c, s.errAt(row, 0, "the cell %s is inside row %d: the sheet is damaged", a.Value, row)
			}
			c.col = col
		case "t":
			typ = a.Value
		case "s":
			n, err := strconv.Atoi(a.Value)
			if err != nil || n < 0 {
				return c, s.errAt(row, c.col, "the cell's style %q is not a style number", a.Value)
			}
			style = n
		}
	}
	if c.col > maxSheetCols {
		return c, s.errAt(row, 0, "a cell after column %d is beyond column XFD (16384)", prev)
	}
	// The value: <v>, or an inline string's <is>; a formula's <f> is not read (its
	// cached value is in <v>).
	s.v, s.is = s.v[:0], s.is[:0]
	inV, inIS, inT, inPh, hasIS := false, false, 0, 0, false
	for {
		tok, err := s.dec.Token()
		if err != nil {
			return c, s.xmlErr(err, row)
		}
		switch t := tok.(type) {
		case xml.StartElement:
			switch t.Name.Local {
			case "v":
				inV = true
			case "is":
				inIS, hasIS = true, true
			case "t":
				inT++
			case "rPh":
				inPh++
			case "f":
				if err := s.dec.Skip(); err != nil {
					return c, s.xmlErr(err, row)
				}
			}
		case xml.EndElement:
			switch t.Name.Local {
			case "v":
				inV = false
			case "is":
				inIS = false
			case "t":
				inT--
			case "rPh":
				inPh--
			case "c":
				return s.value(c, typ, style, hasIS, row)
			}
		case xml.CharData:
			switch {
			case inV && !inIS:
				s.v = append(s.v, t...)
			case inIS && inT > 0 && inPh == 0:
				s.is = append(s.is, t...)
			default:
				continue
			}
			if int64(len(s.v)+len(s.is)) > s.lim.cellText() {
				return c, s.xmlErr(&errLongText{s.lim.cellText()}, row)
			}
		case xml.Directive:
			return c, s.xmlErr(errDoctype, row)
		}
	}
}

// value turns the cell's text into what the register reads: a shared string's text, a
// boolean as TRUE or FALSE (as the spreadsheet shows it: never a number), a number or
// any other as stored.
func (s *sheetReader) value(c cellRead, typ string, style int, hasIS bool, row int) (cellRead, error) {
	v := s.v
	switch typ {
	case "s":
		t := strings.TrimSpace(string(v))
		if t == "" {
			return c, nil
		}
		i, err := strconv.Atoi(t)
		if err != nil || i < 0 {
			return c, s.errAt(row, c.col, "the cell refers to shared string %q, which is not a string number: the sheet is damaged", clip(t, 20))
		}
		if i >= s.sst.len() {
			if s.sst == nil {
				return c, s.errAt(row, c.col, "the cell refers to shared string %d, but the workbook has no shared-strings table: the workbook is damaged", i)
			}
			return c, s.errAt(row, c.col, "the cell refers to shared string %d, but the table %s holds %d: the workbook is damaged", i, s.sst.part, s.sst.len())
		}
		c.text = s.sst.at(i)
	case "inlineStr":
		c.text = string(v)
		if hasIS {
			c.text = string(unescapeX(s.is))
		}
	case "b":
		switch strings.TrimSpace(string(v)) {
		case "":
		case "1":
			c.text = "TRUE"
		case "0":
			c.text = "FALSE"
		default:
			return c, s.errAt(row, c.col, "a boolean cell holds %q, not 0 or 1: the sheet is damaged", clip(string(v), 20))
		}
	case "", "n":
		c.text = string(v)
		if style >= 0 && style < len(s.styles) && c.text != "" {
			c.format = s.styles[style]
		}
	case "str", "e", "d":
		c.text = string(v)
	default:
		return c, s.errAt(row, c.col, "the cell's type t=%q is not one of OOXML's (n, s, str, inlineStr, b, e, d)", clip(typ, 20))
	}
	return c, nil
}

// parseCellRef reads an A1 reference: column A–XFD, row 1–1048576, no "$", nothing else.
func parseCellRef(ref string) (col, row int, ok bool) {
	i := 0
	for i < len(ref) && i < 4 {
		ch := ref[i] | 0x20
		if ch < 'a' || ch > 'z' {
			break
		}
		col = col*26 + int(ch-'a'+1)
		i++
	}
	if i == 0 || i == len(ref) || col > maxSheetCols || len(ref)-i > 7 {
		return 0, 0, false
	}
	if ref[i] == '0' {
		return 0, 0, false
	}
	for _, ch := range ref[i:] {
		if ch < '0' || ch > '9' {
			return 0, 0, false
		}
		row = row*10 + int(ch-'0')
	}
	return col, row, row >= 1 && row <= maxSheetRows
}
