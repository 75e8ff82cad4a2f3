package register

import (
	"archive/zip"
	"context"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"

	"hoistfleet/fleet"
	"hoistfleet/io/units"
)

// SheetAll is the --sheet value that reads every sheet of a workbook.
const SheetAll = "all"

// SheetColumnTitle is the title of the column AllSheets adds to the combined header: the
// sheet each row is on (row numbers repeat from sheet to sheet).
const SheetColumnTitle = "Register sheet"

// AllSheets reads every sheet of a workbook that has a recognisable header, one after
// the other, as one register (--sheet all): a site's hoists on one sheet, another site's
// on the next. Sheets without a header (a cover, a summary, notes) are skipped and
// listed. Its header is the sheets' headers combined: the first sheet's columns, then
// each column of a later sheet that is new (combineKey: the same column of ours in the
// same unit is one column, whatever each sheet titles it), then a "Register sheet" column
// naming each row's sheet; every row's cells are placed under their own columns. On a
// sheet without a Site column the sheet's name is the site (and its cell in the Site
// column), and said so.
type AllSheets struct {
	file    string
	sheets  []string
	readers []*Reader
	places  [][]int // per reader: its column i → the combined column
	noSite  []bool  // per reader: the sheet has no Site column
	siteCol int     // the combined header's (first) Site column, -1 when none
	header  *fleet.Header
	copied  []int // per reader: its header problems copied so far
	count   []int // per reader: the rows it gave
	cur     int
	// seen is where each asset id was first met on an earlier sheet, by id and site:
	// an id may repeat from site to site, not within one.
	seen map[[2]string]string
	// notes are the read's own notes (sheets read and skipped, sites from sheet names),
	// also in the combined header's problems.
	notes []*fleet.Error
}

// NewXLSXAllSheets opens every sheet of the workbook at path that has a recognisable
// header. It fails when none has one, naming each sheet and why.
func NewXLSXAllSheets(path string, opt Options) (*AllSheets, error) {
	file := displayName(path)
	names, err := sheetNames(path)
	if err != nil {
		return nil, fileError(file, err)
	}
	s := &AllSheets{file: file}
	var skipped []string
	var hidden []string
	for _, sn := range names {
		name := sn.name
		r, err := NewXLSXFileOptions(path, name, opt)
		if err != nil {
			why := strings.TrimPrefix(err.Error(), file+": ")
			skipped = append(skipped, fmt.Sprintf("%q (%s)", name, clip(why, 160)))
			continue
		}
		s.sheets = append(s.sheets, name)
		s.readers = append(s.readers, r)
		if sn.hidden {
			hidden = append(hidden, name)
		}
	}
	if len(s.readers) == 0 {
		return nil, fmt.Errorf("%s: --sheet all: no sheet has a recognisable header: %s", file, strings.Join(skipped, "; "))
	}
	s.combine()
	read := fmt.Sprintf("%d sheets read", len(s.sheets))
	if len(s.sheets) == 1 {
		read = "1 sheet read"
	}
	note := fmt.Errorf("--sheet all: %s (%s)", read, quoteAll(s.sheets))
	if len(skipped) > 0 {
		note = fmt.Errorf("%v; skipped, no recognisable header: %s", note, strings.Join(skipped, "; "))
	}
	s.note(&fleet.Error{Kind: fleet.Other, Err: note})
	if len(hidden) > 0 {
		s.note(&fleet.Error{Kind: fleet.Other, Err: fmt.Errorf("--sheet all: the workbook hides %s: read all the same, as hidden rows are (unhide or delete a sheet that is not the register's)", quoteAll(hidden))})
	}
	s.count = make([]int, len(s.readers))
	return s, nil
}

func quoteAll(list []string) string {
	q := make([]string, len(list))
	for i, s := range list {
		q[i] = fmt.Sprintf("%q", s)
	}
	return strings.Join(q, ", ")
}

// combineKey is what makes two sheets' columns one column of the combined header: the
// same column of ours in the same unit (whatever each sheet titles it: "Plant No" and
// "Asset ID"; "SWL" with a units row "t" and "SWL [t]"), or for a column that is not ours,
// the same title. The same field in two units stays two columns, each shown in its unit.
func combineKey(c fleet.Column) string {
	if c.Key != "" {
		return "key\x00" + c.Key + "\x00" + strconv.FormatFloat(c.Factor, 'g', -1, 64) + "\x00" + strings.ToLower(c.Unit)
	}
	return "title\x00" + units.Normalize(c.Title)
}

// combine builds the combined header (combineKey).
func (s *AllSheets) combine() {
	first := s.readers[0].Header()
	h := &fleet.Header{File: first.File, Sheet: SheetAll, Row: first.Row}
	at := map[string]int{}
	s.places = make([][]int, len(s.readers))
	s.noSite = make([]bool, len(s.readers))
	s.copied = make([]int, len(s.readers))
	for k, r := range s.readers {
		rh := r.Header()
		hasSite := false
		for _, c := range rh.Columns {
			hasSite = hasSite || c.Key == "site"
			key := combineKey(c)
			j, ok := at[key]
			if !ok || strings.TrimSpace(c.Title) == "" {
				j = len(h.Columns)
				at[key] = j
				c.Index = j
				h.Columns = append(h.Columns, c)
			}
			s.places[k] = append(s.places[k], j)
		}
		s.noSite[k] = !hasSite
	}
	h.Columns = append(h.Columns, fleet.Column{Index: len(h.Columns), Title: SheetColumnTitle, Factor: 1})
	s.siteCol = -1
	for i, c := range h.Columns {
		if c.Key == "site" {
			s.siteCol = i
			break
		}
	}
	s.header = h
	for k, no := range s.noSite {
		if no {
			s.note(&fleet.Error{Kind: fleet.Other, Cell: fleet.CellRef{Sheet: s.sheets[k], Row: s.readers[k].Header().Row},
				Err: fmt.Errorf("sheet %q has no Site column: its name is each of its hoists' site", s.sheets[k])})
		}
	}
	for k := range s.readers {
		s.copyProblems(k)
	}
}

// note adds one of the read's own notes.
func (s *AllSheets) note(e *fleet.Error) {
	s.notes = append(s.notes, e)
	s.header.Problems = append(s.header.Problems, e)
}

// Notes are the read's own notes: the sheets read and skipped, the sites taken from sheet
// names (each sheet's own notes are in its header: SheetHeaders).
func (s *AllSheets) Notes() []*fleet.Error { return s.notes }

// copyProblems copies reader k's header problems not copied yet (a reader adds notes
// while it reads, until the end).
func (s *AllSheets) copyProblems(k int) {
	ps := s.readers[k].Header().Problems
	s.header.Problems = append(s.header.Problems, ps[s.copied[k]:]...)
	s.copied[k] = len(ps)
}

// SheetHeaders returns each sheet's own header as read (for a column report per sheet).
func (s *AllSheets) SheetHeaders() []*fleet.Header {
	hs := make([]*fleet.Header, len(s.readers))
	for i, r := range s.readers {
		hs[i] = r.Header()
	}
	return hs
}

// Header returns the combined header.
func (s *AllSheets) Header() *fleet.Header { return s.header }

// Next returns the next hoist of the current sheet, then of the next, io.EOF after the
// last sheet's last.
func (s *AllSheets) Next(ctx context.Context) (*fleet.Asset, error) {
	for s.cur < len(s.readers) {
		a, err := s.readers[s.cur].Next(ctx)
		if errors.Is(err, io.EOF) {
			s.copyProblems(s.cur)
			if s.count[s.cur] == 0 {
				s.note(&fleet.Error{Kind: fleet.Other, Cell: fleet.CellRef{Sheet: s.sheets[s.cur], Row: s.readers[s.cur].Header().Row},
					Err: fmt.Errorf("sheet %q has a header and no hoist under it", s.sheets[s.cur])})
			}
			s.cur++
			continue
		}
		if err != nil {
			return nil, err
		}
		s.count[s.cur]++
		return s.place(a), nil
	}
	return nil, io.EOF
}

// place puts a's cells under the combined header's columns, names its sheet and, on a
// sheet without a Site column, makes the sheet's name its site.
func (s *AllSheets) place(a *fleet.Asset) *fleet.Asset {
	k, sheet := s.cur, s.sheets[s.cur]
	cells := make([]fleet.Cell, len(s.header.Columns))
	for i, c := range a.Cells {
		if i < len(s.places[k]) {
			cells[s.places[k][i]] = c
		}
	}
	cells[len(cells)-1] = fleet.Cell{Text: sheet}
	a.Cells, a.Sheet = cells, sheet
	if s.noSite[k] && !a.Blank {
		_ = a.Set("site", fleet.Value{State: fleet.OK, Text: sheet, Raw: sheet, Cell: fleet.CellRef{Sheet: sheet, Row: a.Row}})
		if s.siteCol >= 0 {
			cells[s.siteCol] = fleet.Cell{Text: sheet} // the site the note says it takes
		}
	}
	if a.ID != "" {
		key := [2]string{a.ID, a.Get("site").Text}
		where := fmt.Sprintf("%s!%d:%d", sheet, a.Row, a.Row)
		if s.seen == nil {
			s.seen = map[[2]string]string{}
		}
		if first, ok := s.seen[key]; ok && !strings.HasPrefix(first, sheet+"!") {
			a.Problems = append(a.Problems, &fleet.Error{Kind: fleet.Duplicate, Asset: a.ID, Field: "asset_id",
				Cell: fleet.CellRef{Sheet: sheet, Row: a.Row},
				Err:  fmt.Errorf("asset id %q at site %q is already used on another sheet (%s)", a.ID, key[1], first)})
		} else if !ok {
			s.seen[key] = where
		}
	}
	return a
}

// Close closes every sheet's reader.
func (s *AllSheets) Close() error {
	var errs []error
	for _, r := range s.readers {
		errs = append(errs, r.Close())
	}
	return errors.Join(errs...)
}

// sheetNames lists a workbook's sheets in their order, from xl/workbook.xml.
func sheetNames(path string) ([]sheetName, error) {
	zr, err := zip.OpenReader(path)
	if err != nil {
		return nil, err
	}
	defer zr.Close()
	parts, err := zipParts(&zr.Reader)
	if err != nil {
		return nil, err
	}
	wi, err := readWorkbook(parts)
	if err != nil {
		return nil, err
	}
	sheets := make([]sheetName, len(wi.sheets))
	for i, sh := range wi.sheets {
		sheets[i] = sheetName{name: sh.name, hidden: sh.state == "hidden" || sh.state == "veryHidden"}
	}
	if len(sheets) == 0 {
		return nil, errors.New("the workbook lists no sheet")
	}
	return sheets, nil
}

// sheetName is a sheet of a workbook, and whether the workbook hides it.
type sheetName struct {
	name   string
	hidden bool
}
