package register

import (
	"archive/zip"
	"bytes"
	"errors"
	"fmt"
	"io"
	"regexp"
	"strconv"
	"strings"

	"github.com/xuri/excelize/v2"
)

// formulaCells counts the cells of a sheet that hold a formula, and keeps the first few
// references, found by the same pass over the sheet XML that looks for merged cells.
type formulaCells struct {
	n     int
	first []string
	// hiddenCols are the sheet's hidden columns (1-based), from its <cols> element.
	hiddenCols map[int]bool
	colsSeen   bool // the part of the XML before <sheetData> has been looked at
	// sumRows are the rows holding a formula that adds up a column (SUM over a range of
	// several rows, SUBTOTAL, AGGREGATE): a totals row, not a hoist.
	sumRows map[int]bool
	// disordered: the rows are not stored in increasing order (rowOrder).
	disordered bool
}

// maxSumRows bounds the totals rows remembered.
const maxSumRows = 4096

var (
	fnSum       = []byte("SUM(")
	fnSubtotal  = []byte("SUBTOTAL(")
	fnAggregate = []byte("AGGREGATE(")
	tagFormEnd  = []byte("</f>")
)

// sumAt notes the row of the formula element starting at win[at] when the formula adds
// up a column: SUM over a range of several rows, SUBTOTAL or AGGREGATE (the first
// function of the formula, or one inside it). A formula whose text runs past the window
// is not looked at (the window is 256 KiB; a totals row has several such cells).
func (fc *formulaCells) sumAt(win []byte, at int) {
	if len(fc.sumRows) >= maxSumRows {
		return
	}
	gt := bytes.IndexByte(win[at:min(len(win), at+256)], '>')
	if gt < 0 || win[at+gt-1] == '/' { // <f …/>: a shared formula's other cells
		return
	}
	body := win[at+gt+1:]
	end := bytes.Index(body[:min(len(body), 1024)], tagFormEnd)
	if end < 0 {
		return
	}
	body = body[:end]
	sum := false
	if i := bytes.Index(body, fnSum); i >= 0 && (i == 0 || !isLetter(body[i-1])) && spansRows(body[i+len(fnSum):]) {
		sum = true
	}
	sum = sum || bytes.Contains(body, fnSubtotal) || bytes.Contains(body, fnAggregate)
	if !sum {
		return
	}
	k := bytes.LastIndex(win[:at], attrCellRef)
	if k < 0 {
		return
	}
	ref := win[k+len(attrCellRef):]
	e := bytes.IndexByte(ref, '"')
	if e <= 0 || e > 12 {
		return
	}
	if _, row, err := excelize.CellNameToCoordinates(string(ref[:e])); err == nil {
		if fc.sumRows == nil {
			fc.sumRows = map[int]bool{}
		}
		fc.sumRows[row] = true
	}
}

func isLetter(c byte) bool { return c|0x20 >= 'a' && c|0x20 <= 'z' }

var (
	tagSheetData = []byte("<sheetData")
	colHidden    = regexp.MustCompile(`<(?:\w+:)?col\b[^>]*>`)
	attrMin      = regexp.MustCompile(`\bmin="(\d+)"`)
	attrMax      = regexp.MustCompile(`\bmax="(\d+)"`)
	attrHidden   = regexp.MustCompile(`\bhidden="(1|true)"`)
)

// cols reads the hidden columns from the <col> elements before <sheetData> (they come
// first in a worksheet).
func (fc *formulaCells) cols(win []byte) {
	end := bytes.Index(win, tagSheetData)
	if end < 0 {
		if len(win) < scanChunk {
			return // not yet: wait for the start of the data (a huge <cols> is not read)
		}
		end = len(win)
	}
	fc.colsSeen = true
	for _, m := range colHidden.FindAll(win[:end], -1) {
		if !attrHidden.Match(m) {
			continue
		}
		lo, hi := attrMin.FindSubmatch(m), attrMax.FindSubmatch(m)
		if lo == nil || hi == nil {
			continue
		}
		a, _ := strconv.Atoi(string(lo[1]))
		b, _ := strconv.Atoi(string(hi[1]))
		for c := max(a, 1); c <= min(b, 16384, a+1024); c++ {
			if fc.hiddenCols == nil {
				fc.hiddenCols = map[int]bool{}
			}
			fc.hiddenCols[c] = true
		}
	}
}

// spansRows reports whether a SUM's first argument is a range over several rows:
// "E2:E40)" yes, "B4:D4)" and "B4,C4)" no.
func spansRows(args []byte) bool {
	end := bytes.IndexAny(args, ",;)")
	if end < 0 {
		end = min(len(args), 32)
	}
	a, b, ok := strings.Cut(strings.ReplaceAll(string(args[:end]), "$", ""), ":")
	if !ok {
		return false
	}
	if i := strings.LastIndexByte(a, '!'); i >= 0 {
		a = a[i+1:]
	}
	_, r1, err1 := excelize.CellNameToCoordinates(a)
	_, r2, err2 := excelize.CellNameToCoordinates(b)
	return err1 == nil && err2 == nil && r1 != r2
}

// maxFormulaRefs is how many formula cells a message names.
const maxFormulaRefs = 5

// The sheet XML is looked at in windows of scanChunk bytes, each with the last scanTail
// bytes of the one before (a tag split across two windows is whole in the second).
const (
	scanChunk = 256 << 10
	scanTail  = 256
	maxMerges = 64 << 20 // what is read after the first <mergeCell, at most
)

var (
	tagFormula     = []byte("<f")
	tagFormulaBare = []byte("<f>")
	tagFormulaAttr = []byte("<f ")
	tagMergeCell   = []byte("mergeCell")
	attrCellRef    = []byte(`<c r="`)
)

// scan counts the formula elements (<f> or <f …>) that start in win at or after from,
// and notes the reference of the cell each belongs to when the window holds it. While
// references are still wanted, a window's <f> elements are noted before its <f …> ones
// (the order the messages have always listed them in); after that, one byte search per
// window counts both.
func (fc *formulaCells) scan(win []byte, from int) {
	if len(fc.first) >= maxFormulaRefs {
		fc.count(win, from)
		return
	}
	for _, pat := range [][]byte{tagFormulaBare, tagFormulaAttr} {
		for i := 0; ; {
			j := bytes.Index(win[i:], pat)
			if j < 0 {
				break
			}
			at := i + j
			i = at + len(pat)
			if at < from {
				continue
			}
			fc.n++
			fc.sumAt(win, at)
			if len(fc.first) < maxFormulaRefs {
				if k := bytes.LastIndex(win[:at], attrCellRef); k >= 0 {
					ref := win[k+len(attrCellRef):]
					if e := bytes.IndexByte(ref, '"'); e > 0 && e < 12 {
						fc.first = append(fc.first, string(ref[:e]))
					}
				}
			}
		}
	}
}

// count counts the <f> and <f …> elements that start in win at or after from.
func (fc *formulaCells) count(win []byte, from int) {
	for i := 0; ; {
		j := bytes.Index(win[i:], tagFormula)
		if j < 0 {
			return
		}
		at := i + j
		i = at + len(tagFormula)
		if at >= from && i < len(win) && (win[i] == '>' || win[i] == ' ') {
			fc.n++
			fc.sumAt(win, at)
		}
	}
}

// sheetScan is the state of the first pass over a sheet's XML.
type sheetScan struct {
	fc    formulaCells
	first bool // no window seen yet
	rows  rowOrder
	gap   int64 // bytes since the last '<'
	limit int64 // the most bytes allowed without a '<' (Limits.MaxCellText; 0 no limit)
	long  bool  // the limit was passed
}

// window looks at one window (the carried-over tail, then the chunk) starting at offset
// base of the part: it counts the formulas, follows the rows' order and the longest run
// without markup, and returns where "mergeCell" starts in it, -1 when it does not.
func (s *sheetScan) window(win []byte, tail int, base int64) int {
	// Matches starting in the carried-over tail were counted with the previous window
	// unless they ran past its end.
	from := 0
	if tail > 0 {
		from = tail - len(tagFormulaAttr) + 1
	}
	s.fc.scan(win, from)
	if !s.fc.colsSeen {
		s.fc.cols(win)
	}
	s.rows.scan(win, base)
	if s.limit > 0 {
		chunk := win[tail:]
		if i := bytes.LastIndexByte(chunk, '<'); i >= 0 {
			if s.gap+int64(bytes.IndexByte(chunk, '<')) > s.limit || int64(len(chunk)) > s.limit && longGap(chunk, s.limit) {
				s.long = true
			}
			s.gap = int64(len(chunk) - 1 - i)
		} else {
			s.gap += int64(len(chunk))
		}
		s.long = s.long || s.gap > s.limit
	}
	return bytes.Index(win, tagMergeCell)
}

// rowOrder follows the row numbers of a sheet's <row> elements, found as bytes: whether
// they increase (the sheet reader can then stream them) or not (it sorts them).
type rowOrder struct {
	last       int   // the last row number seen
	handled    int64 // the part's offset after the last <row> tag read
	disordered bool  // a row number not above the one before, or a tag that could not be read
}

var nameRow = []byte("row")

// scan reads the row numbers of the <row> (or <x:row>) tags in win, which starts at
// offset base of the part. A tag that runs past the window is read with the next one
// when it starts in the tail carried over; a longer tag makes the order unknown, which
// is treated as out of order.
func (o *rowOrder) scan(win []byte, base int64) {
	if o.disordered {
		return
	}
	for i := 0; ; {
		j := bytes.Index(win[i:], nameRow)
		if j < 0 {
			return
		}
		k := i + j
		i = k + len(nameRow)
		start := tagStart(win, k)
		if start < 0 || base+int64(start) < o.handled {
			continue
		}
		if i >= len(win) {
			return // the next window sees it again (it starts in the tail)
		}
		if c := win[i]; c != ' ' && c != '>' && c != '/' && c != '\t' && c != '\n' && c != '\r' {
			continue
		}
		end := bytes.IndexByte(win[i:], '>')
		if end < 0 {
			if len(win)-start > scanTail {
				o.disordered = true
			}
			return
		}
		tag := win[i : i+end]
		o.handled = base + int64(i+end)
		n := o.last + 1
		if v, ok := attrR(tag); ok {
			n = v
		}
		if n <= o.last {
			o.disordered = true
			return
		}
		o.last = n
	}
}

// tagStart returns where the tag whose name ends at win[k:] ("row") starts: k-1 for
// "<row", the '<' of "<x:row"; -1 when "row" is not an element name there.
func tagStart(win []byte, k int) int {
	if k == 0 {
		return -1
	}
	if win[k-1] == '<' {
		return k - 1
	}
	if win[k-1] != ':' {
		return -1
	}
	for p := k - 2; p >= 0 && p >= k-34; p-- {
		switch c := win[p]; {
		case c == '<':
			if p == k-2 {
				return -1
			}
			return p
		case !isLetter(c) && (c < '0' || c > '9') && c != '_' && c != '-' && c != '.':
			return -1
		}
	}
	return -1
}

// attrR reads the r attribute of a tag's attribute text; ok false when there is none or
// it is not a number (the sheet reader reports that).
func attrR(tag []byte) (int, bool) {
	for i := 0; i+2 < len(tag); i++ {
		if tag[i] != 'r' || tag[i+1] != '=' || i > 0 && tag[i-1] != ' ' && tag[i-1] != '\t' && tag[i-1] != '\n' && tag[i-1] != '\r' {
			continue
		}
		q := tag[i+2]
		if q != '"' && q != '\'' {
			return 0, false
		}
		rest := tag[i+3:]
		e := bytes.IndexByte(rest, q)
		if e < 0 {
			return 0, false
		}
		n, err := strconv.Atoi(string(rest[:e]))
		return n, err == nil
	}
	return 0, false
}

// scanPart is the first pass over a sheet: its merged cells, formula cells, hidden
// columns and totals rows, whether its rows are in order, and that no run of it without
// markup passes the limit for one cell's text (Limits.MaxCellText: checked here, before
// any row is read, so that a bomb costs a pass over bytes, not an XML parse). Merged
// cells are listed after the sheet's data, so the whole sheet XML is looked at, as bytes
// (without XML parsing), up to its <mergeCells> element, which is then read. The entry
// is read to its end: its size and CRC-32 are checked before any row is used.
func scanPart(zf *zip.File, lim Limits) ([]mergeRange, formulaCells, error) {
	p, err := openChecked(zf)
	if err != nil {
		return nil, formulaCells{}, err
	}
	defer p.Close()
	m, fc, err := scanSheetStream(p, lim.cellText())
	if err == nil {
		err = p.finish()
	}
	return m, fc, err
}

// scanSheetBytes is the scan of a sheet's XML held in memory, window by window as
// scanSheetStream sees it (tests compare the two).
func scanSheetBytes(b []byte) ([]mergeRange, formulaCells) {
	var s sheetScan
	for start := 0; start < len(b); start += scanChunk {
		lo := max(start-scanTail, 0)
		end := min(start+scanChunk, len(b))
		if i := s.window(b[lo:end], start-lo, int64(lo)); i >= 0 {
			s.fc.disordered = s.rows.disordered
			return parseMerges(b[lo+max(i-scanTail, 0) : min(len(b), end+maxMerges)]), s.fc
		}
	}
	s.fc.disordered = s.rows.disordered
	return nil, s.fc
}

// scanSheetStream is the scan of a sheet's XML read from r, through one reused buffer;
// limit is the most bytes allowed without markup (0 none).
func scanSheetStream(r io.Reader, limit int64) ([]mergeRange, formulaCells, error) {
	s := sheetScan{limit: limit}
	buf := make([]byte, scanTail+scanChunk)
	tail := 0
	var base int64
	done := func() formulaCells {
		s.fc.disordered = s.rows.disordered
		return s.fc
	}
	for {
		n, err := io.ReadFull(r, buf[tail:tail+scanChunk])
		if n == 0 {
			if err == io.EOF || err == nil {
				return nil, done(), nil
			}
			return nil, done(), err
		}
		if err != nil && err != io.ErrUnexpectedEOF {
			return nil, done(), err
		}
		win := buf[:tail+n]
		i := s.window(win, tail, base)
		if s.long {
			where := "before its first row"
			if s.rows.last > 0 {
				where = fmt.Sprintf("in or after row %d", s.rows.last)
			}
			return nil, done(), fmt.Errorf("%s: %w; the sheet is refused (a damaged or crafted file)", where, &errLongText{limit})
		}
		if i >= 0 {
			rest, err := io.ReadAll(io.LimitReader(r, maxMerges))
			if err != nil {
				return nil, done(), err
			}
			return parseMerges(append(win[max(i-scanTail, 0):len(win):len(win)], rest...)), done(), nil
		}
		if errors.Is(err, io.ErrUnexpectedEOF) {
			return nil, done(), nil
		}
		keep := min(scanTail, n)
		copy(buf, buf[tail+n-keep:tail+n])
		base += int64(tail + n - keep)
		tail = keep
	}
}

// mergeRange is a merged area of a sheet, 1-based and inclusive.
type mergeRange struct {
	ref            string
	r1, c1, r2, c2 int
}

var mergeRef = regexp.MustCompile(`<(?:\w+:)?mergeCell\b[^>]*?\bref="([A-Za-z]+[0-9]+)(?::([A-Za-z]+[0-9]+))?"`)

func parseMerges(b []byte) []mergeRange {
	var out []mergeRange
	for _, m := range mergeRef.FindAllSubmatch(b, -1) {
		a, z := string(m[1]), string(m[2])
		if z == "" {
			z = a
		}
		c1, r1, err1 := excelize.CellNameToCoordinates(a)
		c2, r2, err2 := excelize.CellNameToCoordinates(z)
		if err1 != nil || err2 != nil {
			continue
		}
		ref := a
		if z != a {
			ref = a + ":" + z
		}
		out = append(out, mergeRange{ref: ref, r1: min(r1, r2), c1: min(c1, c2), r2: max(r1, r2), c2: max(c1, c2)})
	}
	return out
}
