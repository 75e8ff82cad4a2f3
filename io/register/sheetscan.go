package register

import (
	"archive/zip"
	"bytes"
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"path"
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
	scanTail  = 16
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
}

// window looks at one window (the carried-over tail, then the chunk): it counts the
// formulas and returns where "mergeCell" starts in it, -1 when it does not.
func (s *sheetScan) window(win []byte, tail int) int {
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
	return bytes.Index(win, tagMergeCell)
}

// scanSheet returns the sheet's merged cells and counts its formula cells. Merged cells
// are listed after the sheet's data, so the whole sheet XML is looked at, as bytes
// (without XML parsing), up to its <mergeCells> element, which is then read; formula
// elements are counted on the way. inMemory returns the part's XML when the workbook
// already holds it unzipped (excelize keeps sheets below its unzip limit in memory), so
// that it is not inflated a second time; nil means it must be read from the zip.
func scanSheet(zr *zip.Reader, sheet string, inMemory func(part string) []byte) ([]mergeRange, formulaCells, error) {
	part, err := sheetPart(zr, sheet)
	if err != nil || part == "" {
		return nil, formulaCells{}, err
	}
	var zf *zip.File
	for _, f := range zr.File {
		if strings.EqualFold(f.Name, part) {
			zf = f
			break
		}
	}
	if zf == nil {
		return nil, formulaCells{}, nil
	}
	if inMemory != nil {
		if b := inMemory(zf.Name); b != nil {
			m, fc := scanSheetBytes(b)
			return m, fc, nil
		}
	}
	rc, err := zf.Open()
	if err != nil {
		return nil, formulaCells{}, fmt.Errorf("worksheet %s: %w", part, err)
	}
	defer rc.Close()
	m, fc, err := scanSheetStream(rc)
	if err != nil {
		return nil, fc, fmt.Errorf("worksheet %s: %w", part, err)
	}
	return m, fc, nil
}

// scanSheetBytes is the scan of a sheet's XML held in memory, window by window as
// scanSheetStream sees it.
func scanSheetBytes(b []byte) ([]mergeRange, formulaCells) {
	var s sheetScan
	for start := 0; start < len(b); start += scanChunk {
		lo := max(start-scanTail, 0)
		end := min(start+scanChunk, len(b))
		if i := s.window(b[lo:end], start-lo); i >= 0 {
			return parseMerges(b[lo+max(i-scanTail, 0) : min(len(b), end+maxMerges)]), s.fc
		}
	}
	return nil, s.fc
}

// scanSheetStream is the scan of a sheet's XML read from r, through one reused buffer.
func scanSheetStream(r io.Reader) ([]mergeRange, formulaCells, error) {
	var s sheetScan
	buf := make([]byte, scanTail+scanChunk)
	tail := 0
	for {
		n, err := io.ReadFull(r, buf[tail:tail+scanChunk])
		if n == 0 {
			if err == io.EOF || err == nil {
				return nil, s.fc, nil
			}
			return nil, s.fc, err
		}
		if err != nil && err != io.ErrUnexpectedEOF {
			return nil, s.fc, err
		}
		win := buf[:tail+n]
		if i := s.window(win, tail); i >= 0 {
			rest, err := io.ReadAll(io.LimitReader(r, maxMerges))
			if err != nil {
				return nil, s.fc, err
			}
			return parseMerges(append(win[max(i-scanTail, 0):len(win):len(win)], rest...)), s.fc, nil
		}
		if errors.Is(err, io.ErrUnexpectedEOF) {
			return nil, s.fc, nil
		}
		keep := min(scanTail, n)
		copy(buf, buf[tail+n-keep:tail+n])
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

// sheetPart finds the zip part of a sheet from xl/workbook.xml and its relationships.
func sheetPart(zr *zip.Reader, sheet string) (string, error) {
	var wb struct {
		Sheets []struct {
			Name  string     `xml:"name,attr"`
			Attrs []xml.Attr `xml:",any,attr"`
		} `xml:"sheets>sheet"`
	}
	var rels struct {
		Rel []struct {
			ID     string `xml:"Id,attr"`
			Target string `xml:"Target,attr"`
		} `xml:"Relationship"`
	}
	if err := decodePart(zr, "xl/workbook.xml", &wb); err != nil {
		return "", err
	}
	if err := decodePart(zr, "xl/_rels/workbook.xml.rels", &rels); err != nil {
		return "", err
	}
	for _, s := range wb.Sheets {
		if s.Name != sheet {
			continue
		}
		for _, a := range s.Attrs {
			if a.Name.Local != "id" {
				continue
			}
			for _, r := range rels.Rel {
				if r.ID == a.Value {
					if strings.HasPrefix(r.Target, "/") {
						return strings.TrimPrefix(r.Target, "/"), nil
					}
					return path.Join("xl", r.Target), nil
				}
			}
		}
	}
	return "", nil
}

func decodePart(zr *zip.Reader, name string, v any) error {
	for _, f := range zr.File {
		if !strings.EqualFold(f.Name, name) {
			continue
		}
		rc, err := f.Open()
		if err != nil {
			return fmt.Errorf("%s: %w", name, err)
		}
		defer rc.Close()
		if err := xml.NewDecoder(io.LimitReader(rc, 64<<20)).Decode(v); err != nil {
			return fmt.Errorf("%s: %w", name, err)
		}
		return nil
	}
	return nil
}
