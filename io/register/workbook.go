package register

import (
	"archive/zip"
	"bytes"
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"path"
	"strconv"
	"strings"
)

// markupGuard passes XML through and fails once more than limit bytes pass without a
// '<': one text (a cell's, or the whitespace between two elements) or one tag longer than
// that. encoding/xml gathers a whole text or tag in memory before returning it, so
// without the guard one 1.2 GB inline string costs gigabytes; with it, the read stops
// after limit bytes. The test is a byte search: '<' starts every tag and never appears
// unescaped in a text or an attribute value.
type markupGuard struct {
	r     io.Reader
	limit int64
	gap   int64 // bytes since the last '<'
	err   error
}

// errLongText is what markupGuard fails with.
type errLongText struct{ limit int64 }

func (e *errLongText) Error() string {
	return fmt.Sprintf("more than %s of text or markup without a break: longer than any cell may be (the limit is %s)", size(e.limit), size(e.limit))
}

func (g *markupGuard) Read(b []byte) (int, error) {
	if g.err != nil {
		return 0, g.err
	}
	n, err := g.r.Read(b)
	p := b[:n]
	if i := bytes.LastIndexByte(p, '<'); i >= 0 {
		// The gap before the first '<' in p, then the one after the last; gaps between
		// two '<' inside p are at most len(p), which a read of our buffers keeps small.
		first := int64(bytes.IndexByte(p, '<'))
		if g.gap+first > g.limit || int64(len(p)) > g.limit && longGap(p, g.limit) {
			g.err = &errLongText{g.limit}
			return n, g.err
		}
		g.gap = int64(len(p) - 1 - i)
	} else {
		g.gap += int64(n)
	}
	if g.gap > g.limit {
		g.err = &errLongText{g.limit}
		return n, g.err
	}
	return n, err
}

// longGap reports whether p holds more than limit bytes between two '<'.
func longGap(p []byte, limit int64) bool {
	for {
		i := bytes.IndexByte(p, '<')
		if i < 0 {
			return int64(len(p)) > limit
		}
		if int64(i) > limit {
			return true
		}
		p = p[i+1:]
	}
}

// newDecoder is the strict XML decoder every part is read with. A document type
// declaration is refused (no worksheet has one; its entities would be a way to make the
// text read differ from what the spreadsheet shows).
func newDecoder(r io.Reader) *xml.Decoder {
	d := xml.NewDecoder(r)
	d.Strict = true
	return d
}

// errDoctype refuses a DOCTYPE in a part.
var errDoctype = errors.New("the XML has a document type declaration (<!DOCTYPE …>), which no spreadsheet program writes: refused")

// workbookInfo is what the reader needs of xl/workbook.xml and its relationships.
type workbookInfo struct {
	sheets   []sheetEntry
	date1904 bool
	sst      string // part name of the shared strings ("" none)
	styles   string // part name of the styles ("" none)
}

type sheetEntry struct {
	name  string
	part  string // zip part name, "" when the relationship is missing
	state string // "", "visible", "hidden", "veryHidden"
}

// maxSmallPart bounds the parts read whole: the workbook, its relationships, the styles.
const maxSmallPart = 64 << 20

// relTarget resolves a relationship target of xl/workbook.xml to a part name.
func relTarget(target string) string {
	if strings.HasPrefix(target, "/") {
		return path.Clean(strings.TrimPrefix(target, "/"))
	}
	return path.Join("xl", target)
}

// readWorkbook reads xl/workbook.xml and xl/_rels/workbook.xml.rels.
func readWorkbook(parts map[string]*zip.File) (workbookInfo, error) {
	var wi workbookInfo
	var wb struct {
		Pr struct {
			Date1904 string `xml:"date1904,attr"`
		} `xml:"workbookPr"`
		Sheets []struct {
			Name  string     `xml:"name,attr"`
			State string     `xml:"state,attr"`
			Attrs []xml.Attr `xml:",any,attr"`
		} `xml:"sheets>sheet"`
	}
	var rels struct {
		Rel []struct {
			ID     string `xml:"Id,attr"`
			Type   string `xml:"Type,attr"`
			Target string `xml:"Target,attr"`
		} `xml:"Relationship"`
	}
	if err := decodeSmall(parts, "xl/workbook.xml", &wb); err != nil {
		return wi, err
	}
	if err := decodeSmall(parts, "xl/_rels/workbook.xml.rels", &rels); err != nil {
		return wi, err
	}
	wi.date1904 = wb.Pr.Date1904 == "1" || wb.Pr.Date1904 == "true"
	byID := map[string]string{}
	for _, r := range rels.Rel {
		byID[r.ID] = relTarget(r.Target)
		switch {
		case strings.HasSuffix(r.Type, "/sharedStrings"):
			wi.sst = relTarget(r.Target)
		case strings.HasSuffix(r.Type, "/styles"):
			wi.styles = relTarget(r.Target)
		}
	}
	if wi.sst == "" && parts["xl/sharedstrings.xml"] != nil {
		wi.sst = "xl/sharedStrings.xml"
	}
	if wi.styles == "" && parts["xl/styles.xml"] != nil {
		wi.styles = "xl/styles.xml"
	}
	for _, s := range wb.Sheets {
		e := sheetEntry{name: s.Name, state: s.State}
		for _, a := range s.Attrs {
			if a.Name.Local == "id" {
				e.part = byID[a.Value]
			}
		}
		wi.sheets = append(wi.sheets, e)
	}
	return wi, nil
}

// decodeSmall decodes a small part, checked, into v; a missing part leaves v as it is.
func decodeSmall(parts map[string]*zip.File, name string, v any) error {
	zf := parts[strings.ToLower(name)]
	if zf == nil {
		return nil
	}
	b, err := readChecked(zf, maxSmallPart)
	if err != nil {
		return err
	}
	if hasDoctype(b) {
		return fmt.Errorf("%s: %w", name, errDoctype)
	}
	if err := newDecoder(bytes.NewReader(b)).Decode(v); err != nil {
		return fmt.Errorf("%s: %w", name, err)
	}
	return nil
}

func hasDoctype(b []byte) bool {
	head := b[:min(len(b), 4096)]
	return bytes.Contains(head, []byte("<!DOCTYPE")) || bytes.Contains(head, []byte("<!doctype"))
}

// sharedStrings is a workbook's shared-strings table: every string in one block of
// bytes, string i ending at ends[i] (8 bytes a string instead of a string header and an
// allocation: the table can hold millions).
type sharedStrings struct {
	text []byte
	ends []uint32
	part string
}

func (s *sharedStrings) len() int {
	if s == nil {
		return 0
	}
	return len(s.ends)
}

func (s *sharedStrings) at(i int) string {
	start := uint32(0)
	if i > 0 {
		start = s.ends[i-1]
	}
	return string(s.text[start:s.ends[i]])
}

// readSharedStrings reads the shared-strings table, within the limits: its size (checked
// from the directory entry before, and while unzipping), its count, and one string's
// length. A string item is the text of its <t> elements, directly or in rich-text runs
// (<r>), without the phonetic guides (<rPh>); _xHHHH_ escapes are decoded.
func readSharedStrings(zf *zip.File, lim Limits) (*sharedStrings, error) {
	if zf.UncompressedSize64 > uint64(lim.MaxSharedStrings) {
		return nil, fmt.Errorf("the shared-strings table %s unzips to %s, more than the %s limit", zf.Name, size(int64(min(zf.UncompressedSize64, 1<<62))), size(lim.MaxSharedStrings))
	}
	n, err := countItems(zf)
	if err != nil {
		return nil, err
	}
	if n > lim.sharedCount() {
		return nil, fmt.Errorf("%s: %d shared strings, more than the limit of %d (a register of a million rows needs far fewer)", zf.Name, n, lim.sharedCount())
	}
	p, err := openChecked(zf)
	if err != nil {
		return nil, err
	}
	defer p.Close()
	g := &markupGuard{r: p, limit: lim.cellText()}
	d := newDecoder(g)
	sst := &sharedStrings{part: zf.Name, ends: make([]uint32, 0, n), text: make([]byte, 0, min(zf.UncompressedSize64, 1<<20))}
	var cur []byte
	depthSI, inT, inPh := 0, 0, 0
	fail := func(err error) (*sharedStrings, error) {
		return nil, fmt.Errorf("%s, string %d: %w", zf.Name, len(sst.ends)+1, err)
	}
	for {
		tok, err := d.RawToken()
		if err == io.EOF {
			break
		}
		if err != nil {
			return fail(err)
		}
		switch t := tok.(type) {
		case xml.StartElement:
			switch t.Name.Local {
			case "si":
				depthSI++
				cur = cur[:0]
			case "t":
				inT++
			case "rPh":
				inPh++
			}
		case xml.EndElement:
			switch t.Name.Local {
			case "si":
				depthSI--
				if len(sst.ends) >= lim.sharedCount() {
					return nil, fmt.Errorf("%s: more than %d shared strings, the limit (a register of a million rows needs far fewer)", zf.Name, lim.sharedCount()) // countItems missed some (a prefixed name)
				}
				if int64(len(cur)) > lim.cellText() {
					return fail(&errLongText{lim.cellText()})
				}
				sst.text = append(sst.text, unescapeX(cur)...)
				sst.ends = append(sst.ends, uint32(len(sst.text)))
			case "t":
				inT--
			case "rPh":
				inPh--
			}
		case xml.CharData:
			if depthSI > 0 && inT > 0 && inPh == 0 {
				cur = append(cur, t...)
			}
		case xml.Directive:
			return fail(errDoctype)
		}
		if int64(len(sst.text)) > lim.MaxSharedStrings {
			return nil, fmt.Errorf("%s: the shared strings exceed the %s limit", zf.Name, size(lim.MaxSharedStrings))
		}
	}
	if depthSI != 0 || inT != 0 {
		return fail(errors.New("the XML ends inside a string"))
	}
	if err := p.finish(); err != nil {
		return nil, err
	}
	return sst, nil
}

// unescapeX decodes the _xHHHH_ escapes OOXML writes for characters XML cannot hold
// (ECMA-376 Part 1, 22.9.2.19 ST_Xstring); _x005F_ escapes an underscore.
func unescapeX(b []byte) []byte {
	if bytes.Index(b, []byte("_x")) < 0 {
		return b
	}
	out := make([]byte, 0, len(b))
	for i := 0; i < len(b); {
		if i+7 <= len(b) && b[i] == '_' && b[i+1] == 'x' && b[i+6] == '_' && isHex4(b[i+2:i+6]) {
			v, _ := strconv.ParseUint(string(b[i+2:i+6]), 16, 32)
			out = append(out, string(rune(v))...)
			i += 7
			continue
		}
		out = append(out, b[i])
		i++
	}
	return out
}

func isHex4(b []byte) bool {
	for _, c := range b {
		if !('0' <= c && c <= '9' || 'a' <= c|0x20 && c|0x20 <= 'f') {
			return false
		}
	}
	return true
}

// styleFormats are the number formats of a workbook's cell styles: for each cellXfs
// index (a cell's s attribute), its number format's code ("" General).
type styleFormats []string

// readStyles reads the cell styles' number formats from the styles part.
func readStyles(parts map[string]*zip.File, name string) (styleFormats, error) {
	if name == "" {
		return nil, nil
	}
	var st struct {
		NumFmts []struct {
			ID   int    `xml:"numFmtId,attr"`
			Code string `xml:"formatCode,attr"`
		} `xml:"numFmts>numFmt"`
		Xfs []struct {
			ID int `xml:"numFmtId,attr"`
		} `xml:"cellXfs>xf"`
	}
	if err := decodeSmall(parts, name, &st); err != nil {
		return nil, err
	}
	custom := map[int]string{}
	for _, f := range st.NumFmts {
		custom[f.ID] = f.Code
	}
	out := make(styleFormats, len(st.Xfs))
	for i, x := range st.Xfs {
		if c, ok := custom[x.ID]; ok {
			out[i] = c
		} else {
			out[i] = builtinFormats[x.ID]
		}
	}
	return out, nil
}

// builtinFormats are the built-in number formats a style may name by id alone
// (ECMA-376 Part 1, 18.8.30 numFmt; the ids below 50 that are not locale-dependent).
var builtinFormats = map[int]string{
	1: "0", 2: "0.00", 3: "#,##0", 4: "#,##0.00", 9: "0%", 10: "0.00%", 11: "0.00E+00",
	12: "# ?/?", 13: "# ??/??", 14: "mm-dd-yy", 15: "d-mmm-yy", 16: "d-mmm", 17: "mmm-yy",
	18: "h:mm AM/PM", 19: "h:mm:ss AM/PM", 20: "h:mm", 21: "h:mm:ss", 22: "m/d/yy h:mm",
	37: "#,##0 ;(#,##0)", 38: "#,##0 ;[Red](#,##0)", 39: "#,##0.00;(#,##0.00)",
	40: "#,##0.00;[Red](#,##0.00)", 45: "mm:ss", 46: "[h]:mm:ss", 47: "mmss.0", 48: "##0.0E+0",
	49: "@",
}

// countItems counts the string items (<si>, <si …>) of a shared-strings part as bytes,
// before any is parsed: a table of millions of tiny strings is refused after one pass
// over its bytes instead of an XML parse (issue 16: 5 million in 211 KB took 59 s and
// 788 MB). The entry is checked (CRC-32, size) on the way.
func countItems(zf *zip.File) (int, error) {
	p, err := openChecked(zf)
	if err != nil {
		return 0, err
	}
	defer p.Close()
	const tail = 3
	buf := make([]byte, tail+256<<10)
	keep, n := 0, 0
	for {
		m, err := io.ReadFull(p, buf[keep:])
		win := buf[:keep+m]
		for i := 0; ; {
			j := bytes.Index(win[i:], []byte("<si"))
			if j < 0 {
				break
			}
			k := i + j + 3
			i = k
			if k < len(win) && (win[k] == '>' || win[k] == ' ' || win[k] == '/') {
				n++
			}
		}
		if err == io.EOF || err == io.ErrUnexpectedEOF {
			break
		}
		if err != nil {
			return 0, err
		}
		keep = min(tail, len(win))
		copy(buf, win[len(win)-keep:])
	}
	return n, p.finish()
}
