package xlsxout

import (
	"fmt"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/xuri/excelize/v2"
)

// Printing (issue 17): every sheet has a page setup. The paper is Options.Paper; wide
// sheets print landscape; Checks, Summary and Audit fit the page width; the Register is
// spread over as many pages across as keep its text at PrintMinScale or more, with its
// header row and its Asset ID column repeated on every page (the _xlnm.Print_Titles
// defined name), pages numbered across before down. Every page has a header with the
// sheet's and the register's name and a footer "page N of M".

// Paper sizes (Options.Paper).
const (
	PaperA4     = "a4"
	PaperLetter = "letter"
)

// paperCode is the SpreadsheetML paperSize of a paper (ECMA-376 Part 1, 18.3.1.63:
// 1 Letter, 9 A4); "" is A4.
func paperCode(p string) (int, error) {
	switch strings.ToLower(p) {
	case PaperA4, "":
		return 9, nil
	case PaperLetter:
		return 1, nil
	}
	return 0, fmt.Errorf("paper %q: want a4 or letter", p)
}

// paperWidthPt is the paper's long side (landscape width) in points: A4 297 mm, Letter
// 11 in (ISO 216; ANSI/ASME Y14.1), 1 pt = 1/72 in.
func paperWidthPt(code int) float64 {
	if code == 1 {
		return 11 * 72
	}
	return 297 / 25.4 * 72
}

// Page margins in inches (pageMargins is in inches): narrow at the sides, room above and
// below for the header and the footer.
const (
	marginSide   = 0.4
	marginTop    = 0.6
	marginBottom = 0.6
	marginHF     = 0.25
)

// PrintMinScale is the smallest print scale the Register is given: it is spread over
// enough pages across that its 11 pt text prints at 6.6 pt or larger.
const PrintMinScale = 0.6

// colWidthPt is the printed width of a column of w characters (ECMA-376 Part 1,
// 18.3.1.13: pixels = trunc(((256 w + trunc(128/7))/256) 7); Calibri 11's maximum
// digit width is 7 px) at 96 px an inch, in points.
func colWidthPt(w float64) float64 { return (w*7 + 5) * 0.75 }

// pagesAcross is how many landscape pages across the columns of the given widths need to
// print at minScale or more, the repeated column (width rep, 0 for none) on each page.
func pagesAcross(widths []float64, rep float64, code int) int {
	total := 0.0
	for _, w := range widths {
		total += colWidthPt(w)
	}
	avail := paperWidthPt(code) - 2*marginSide*72
	per := avail/PrintMinScale - colWidthPt(rep)
	if rep == 0 {
		per = avail / PrintMinScale
	}
	if per <= 0 {
		return 1
	}
	n := int(total/per) + 1
	return max(n, 1)
}

// pageSetup is a sheet's page setup, written by sheetStream for the streamed sheets.
type pageSetup struct {
	paper        int
	landscape    bool
	fitWidth     int  // pages across; 0: no fitting (print at 100 %)
	overThenDown bool // number pages across before down
	gridLines    bool
	header       string // oddHeader, in the header/footer code (&A, &P, &N, && …)
	footer       string
}

// hfText escapes s for the header/footer code, where & starts a code: && is a
// literal ampersand.
func hfText(s string) string { return strings.ReplaceAll(s, "&", "&&") }

// headerFooter returns the header and footer of every page: the sheet (&A) and the
// register on the left, the tool on the right; the as-of date on the left of the
// footer and "page N of M" in its centre. Excel limits each to 255 characters: a
// register name that would pass that is cut.
func headerFooter(input, asOf string) (header, footer string) {
	name := filepath.Base(input)
	if input == "" || input == "-" {
		name = "register from standard input"
	}
	if r := []rune(name); len(r) > 120 {
		name = string(r[:119]) + "…"
	}
	header = `&L&"-,Bold"&A&"-,Regular" · ` + hfText(name) + `&RHoist fleet check`
	footer = "&Cpage &P of &N"
	if asOf != "" {
		footer = "&Las of " + hfText(asOf) + footer
	}
	return header, footer
}

// appendSheetPr appends the sheetPr element that lets the page setup fit the sheet to
// its pages (it comes first in a worksheet).
func (p *pageSetup) appendSheetPr(b []byte) []byte {
	if p == nil || p.fitWidth == 0 {
		return b
	}
	return append(b, `<sheetPr><pageSetUpPr fitToPage="1"/></sheetPr>`...)
}

// appendPrint appends printOptions, pageMargins, pageSetup and headerFooter, in the
// order CT_Worksheet gives them (ECMA-376 Part 1, 18.3.1.99: after sheetData and
// autoFilter, before drawing).
func (p *pageSetup) appendPrint(b []byte) []byte {
	if p == nil {
		return b
	}
	if p.gridLines {
		b = append(b, `<printOptions gridLines="1"/>`...)
	}
	b = append(b, `<pageMargins left="`...)
	b = strconv.AppendFloat(b, marginSide, 'f', -1, 64)
	b = append(b, `" right="`...)
	b = strconv.AppendFloat(b, marginSide, 'f', -1, 64)
	b = append(b, `" top="`...)
	b = strconv.AppendFloat(b, marginTop, 'f', -1, 64)
	b = append(b, `" bottom="`...)
	b = strconv.AppendFloat(b, marginBottom, 'f', -1, 64)
	b = append(b, `" header="`...)
	b = strconv.AppendFloat(b, marginHF, 'f', -1, 64)
	b = append(b, `" footer="`...)
	b = strconv.AppendFloat(b, marginHF, 'f', -1, 64)
	b = append(b, `"/><pageSetup paperSize="`...)
	b = strconv.AppendInt(b, int64(p.paper), 10)
	b = append(b, '"')
	if p.fitWidth > 0 {
		b = append(b, ` fitToWidth="`...)
		b = strconv.AppendInt(b, int64(p.fitWidth), 10)
		b = append(b, `" fitToHeight="0"`...)
	}
	if p.overThenDown {
		b = append(b, ` pageOrder="overThenDown"`...)
	}
	if p.landscape {
		b = append(b, ` orientation="landscape"`...)
	} else {
		b = append(b, ` orientation="portrait"`...)
	}
	b = append(b, `/><headerFooter><oddHeader>`...)
	b = appendEscaped(b, p.header, false)
	b = append(b, `</oddHeader><oddFooter>`...)
	b = appendEscaped(b, p.footer, false)
	return append(b, `</oddFooter></headerFooter>`...)
}

// setPrint gives a sheet built with excelize's normal API its page setup: fitWidth pages
// across (0: no fitting), fitHeight pages down (0: as many as needed).
func (s *sheetWriter) setPrint(p *pageSetup, fitHeight int) {
	if s.err != nil {
		return
	}
	orient := "portrait"
	if p.landscape {
		orient = "landscape"
	}
	lo := &excelize.PageLayoutOptions{Size: &p.paper, Orientation: &orient}
	if p.fitWidth > 0 {
		fw, fh := p.fitWidth, fitHeight
		lo.FitToWidth, lo.FitToHeight = &fw, &fh
		yes := true
		if s.err = s.f.SetSheetProps(s.sheet, &excelize.SheetPropsOptions{FitToPage: &yes}); s.err != nil {
			return
		}
	}
	if s.err = s.f.SetPageLayout(s.sheet, lo); s.err != nil {
		return
	}
	side, top, bottom, hf := marginSide, marginTop, marginBottom, marginHF
	if s.err = s.f.SetPageMargins(s.sheet, &excelize.PageLayoutMarginsOptions{Left: &side, Right: &side,
		Top: &top, Bottom: &bottom, Header: &hf, Footer: &hf}); s.err != nil {
		return
	}
	s.err = s.f.SetHeaderFooter(s.sheet, &excelize.HeaderFooterOptions{OddHeader: p.header, OddFooter: p.footer})
}

// printTitles sets the rows and columns repeated on every printed page of sheet:
// refs such as "$A:$A" and "$1:$1" (the _xlnm.Print_Titles name of the sheet).
func printTitles(f *excelize.File, sheet string, refs ...string) error {
	parts := make([]string, len(refs))
	for i, r := range refs {
		parts[i] = quoted(sheet) + "!" + r
	}
	return f.SetDefinedName(&excelize.DefinedName{Name: "_xlnm.Print_Titles", RefersTo: strings.Join(parts, ","), Scope: sheet})
}
