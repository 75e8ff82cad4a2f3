package xlsxout

import (
	"fmt"

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet"
)

// Colour is one status's colours: Fill for cells (light, so black text stays readable),
// Chart for chart series (deeper, so bars stand apart on white), Font for text on Fill.
type Colour struct {
	Fill, Chart, Font string // RGB hex without '#'
}

// Palette is hoistfleet's own status palette, indexed by fleet.Status. It is the one
// place the workbook's status colours are defined:
//
//	pass       fill C9E7C1  chart 5EA75A  soft green
//	marginal   fill FFDA8A  chart E6A032  amber
//	unchecked  fill DCDCDC  chart 9A9A9A  grey
//	error      fill DCC7EF  chart 8C5BC2  violet
//	fail       fill F3A097  chart CF3B2E  clear red
//	info       fill D8E9F7  chart 6FA5D5  pale blue
var Palette = [...]Colour{
	fleet.StatusPass:      {Fill: "C9E7C1", Chart: "5EA75A", Font: "1E4620"},
	fleet.StatusMarginal:  {Fill: "FFDA8A", Chart: "E6A032", Font: "5C3B00"},
	fleet.StatusUnchecked: {Fill: "DCDCDC", Chart: "9A9A9A", Font: "333333"},
	fleet.StatusError:     {Fill: "DCC7EF", Chart: "8C5BC2", Font: "3D1E66"},
	fleet.StatusFail:      {Fill: "F3A097", Chart: "CF3B2E", Font: "5E0B04"},
	fleet.StatusInfo:      {Fill: "D8E9F7", Chart: "6FA5D5", Font: "143A5C"},
}

// StatusMeaning says in words what each status means, for the legend.
var StatusMeaning = [...]string{
	fleet.StatusPass:      "utilisation at or below 1 − marginal band: the check passes with margin",
	fleet.StatusMarginal:  "utilisation within the marginal band below the limit: passes, little margin",
	fleet.StatusUnchecked: "a value the check needs is missing: not checked",
	fleet.StatusError:     "a value is unreadable or out of range: see the message",
	fleet.StatusFail:      "utilisation above 1: the limit is exceeded",
	fleet.StatusInfo:      "a hazard figure with no limit: never counts towards the verdict",
}

const (
	headerInFill  = "E4E7EB" // register's own columns
	headerOutFill = "CFE0EE" // columns hoistfleet adds
	linkColour    = "1F5FA8"
	borderColour  = "9AA3AD"
)

// styles holds the style ids of one workbook.
type styles struct {
	hdrIn, hdrOut int
	date          int
	text          [len(Palette)]int // status fill, text
	pct           [len(Palette)]int // status fill, 0.0 %
	pctPlain      int
	load          int // rated load in the register's unit: #,##0.0##
	kg            int // a load in kg: #,##0.0
	link          int
	// summary and audit
	title, subtitle, caution, heading, th, tileLabel, tileCount, tilePct int
	tile                                                                 [len(Palette)]int
	tileNum                                                              [len(Palette)]int
	int_, intMid, wrap, bold                                             int

	f   *excelize.File
	top map[int]int // style → its top-aligned variant (topOf)
}

// topOf returns style id's variant aligned to the top of its cell, made once. Cells in a
// row that a wrapped text makes tall are top-aligned, so that each stands beside the
// text's first line: bottom-aligned, a row's values sat under its action block, next to
// the following row's, on a sheet without gridlines (seen on the Summary in LibreOffice).
func (s *styles) topOf(id int) int {
	if v, ok := s.top[id]; ok {
		return v
	}
	st := &excelize.Style{}
	if id != 0 {
		got, err := s.f.GetStyle(id)
		if err != nil {
			return id
		}
		st = got
	}
	if st.Alignment == nil {
		st.Alignment = &excelize.Alignment{}
	}
	st.Alignment.Vertical = "top"
	v, err := s.f.NewStyle(st)
	if err != nil {
		return id
	}
	s.top[id] = v
	return v
}

func newStyles(f *excelize.File) (*styles, error) {
	s := &styles{f: f, top: map[int]int{}}
	var err error
	add := func(dst *int, st *excelize.Style) {
		if err != nil {
			return
		}
		if st.Font != nil && st.Font.Family == "" {
			st.Font.Family = "Calibri" // the workbook default; without it some viewers fall back to a serif
		}
		*dst, err = f.NewStyle(st)
	}
	fill := func(c string) excelize.Fill { return excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{c}} }
	bottom := []excelize.Border{{Type: "bottom", Color: borderColour, Style: 1}}
	all := []excelize.Border{{Type: "left", Color: "FFFFFF", Style: 2}, {Type: "right", Color: "FFFFFF", Style: 2}}
	pct := "0.0%"
	date := "yyyy-mm-dd"
	load := "#,##0.0##"
	hdrAlign := &excelize.Alignment{WrapText: true, Vertical: "top"}

	add(&s.hdrIn, &excelize.Style{Font: &excelize.Font{Bold: true}, Fill: fill(headerInFill), Border: bottom, Alignment: hdrAlign})
	add(&s.hdrOut, &excelize.Style{Font: &excelize.Font{Bold: true}, Fill: fill(headerOutFill), Border: bottom, Alignment: hdrAlign})
	add(&s.date, &excelize.Style{CustomNumFmt: &date})
	add(&s.pctPlain, &excelize.Style{CustomNumFmt: &pct})
	add(&s.load, &excelize.Style{CustomNumFmt: &load})
	kg := "#,##0.0"
	add(&s.kg, &excelize.Style{CustomNumFmt: &kg})
	add(&s.link, &excelize.Style{Font: &excelize.Font{Color: linkColour, Underline: "single"}})
	for i, c := range Palette {
		font := &excelize.Font{Color: c.Font, Bold: fleet.Status(i) == fleet.StatusFail}
		add(&s.text[i], &excelize.Style{Fill: fill(c.Fill), Font: font})
		add(&s.pct[i], &excelize.Style{Fill: fill(c.Fill), Font: font, CustomNumFmt: &pct})
		add(&s.tile[i], &excelize.Style{Fill: fill(c.Chart), Border: all, Font: &excelize.Font{Bold: true, Color: "FFFFFF", Size: 12},
			Alignment: &excelize.Alignment{Horizontal: "center"}})
		add(&s.tileNum[i], &excelize.Style{Fill: fill(c.Fill), Border: all, Font: &excelize.Font{Bold: true, Size: 22, Color: c.Font},
			Alignment: &excelize.Alignment{Horizontal: "center", Vertical: "center"}})
	}
	add(&s.title, &excelize.Style{Font: &excelize.Font{Bold: true, Size: 18, Color: "1B2A3A"}})
	add(&s.subtitle, &excelize.Style{Font: &excelize.Font{Color: "4A5866"}})
	add(&s.caution, &excelize.Style{Font: &excelize.Font{Italic: true, Color: "7A2E00"}, Fill: fill("FFF4E5"),
		Alignment: &excelize.Alignment{WrapText: true, Vertical: "top"}})
	add(&s.heading, &excelize.Style{Font: &excelize.Font{Bold: true, Size: 13, Color: "1B2A3A"}, Border: bottom})
	add(&s.th, &excelize.Style{Font: &excelize.Font{Bold: true}, Fill: fill(headerOutFill), Border: bottom,
		Alignment: &excelize.Alignment{WrapText: true, Vertical: "top"}})
	add(&s.tileLabel, &excelize.Style{Font: &excelize.Font{Bold: true, Size: 12}, Fill: fill("5B6B7B"), Border: all,
		Alignment: &excelize.Alignment{Horizontal: "center"}})
	add(&s.tileCount, &excelize.Style{Font: &excelize.Font{Bold: true, Size: 22}, Fill: fill("EEF1F4"), Border: all,
		Alignment: &excelize.Alignment{Horizontal: "center", Vertical: "center"}})
	add(&s.tilePct, &excelize.Style{Font: &excelize.Font{Color: "4A5866"}, CustomNumFmt: &pct, Alignment: &excelize.Alignment{Horizontal: "center"}})
	add(&s.int_, &excelize.Style{NumFmt: 3}) // #,##0
	add(&s.wrap, &excelize.Style{Alignment: &excelize.Alignment{WrapText: true, Vertical: "top"}})
	add(&s.bold, &excelize.Style{Font: &excelize.Font{Bold: true}})
	// A count in a table of words (the Data sheet): centred and on the first line, so that
	// it stands clear of the text beside it.
	add(&s.intMid, &excelize.Style{NumFmt: 3, Alignment: &excelize.Alignment{Horizontal: "center", Vertical: "top"}})
	if err != nil {
		return nil, fmt.Errorf("xlsxout: styles: %w", err)
	}
	return s, nil
}

// statusIndex maps a status to a Palette index, unknown values to unchecked.
func statusIndex(st fleet.Status) int {
	if int(st) < 0 || int(st) >= len(Palette) {
		return int(fleet.StatusUnchecked)
	}
	return int(st)
}
