package register

import (
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"

	"hoistfleet/fleet"
	"hoistfleet/io/units"
)

// Options change how a register is read. The zero value reads as documented: the header
// is found in the first HeaderScanRows rows.
type Options struct {
	// HeaderRow is the spreadsheet row (1-based) that holds the column titles; 0 finds it.
	HeaderRow int
	// DateOrder is the order of day and month in dates written with numbers only
	// (25/03/2026); "" infers it for each column from its own unambiguous dates.
	DateOrder DateOrder
	// Columns, when set, maps register columns the synonyms do not cover (--columns
	// FILE); its entries win over the synonyms.
	Columns *ColumnMap
}

// HeaderScanRows is how many rows from the top of a sheet (or CSV file) are searched for
// the header row.
const HeaderScanRows = 30

// headerScore is what one candidate row's cells name.
type headerScore struct {
	row     int
	keys    []string // schema keys the row's cells name, in column order, each once
	hasID   bool
	nonText int // cells that are numbers or dates: a header has few
}

// maxHeaderCells is how many cells of a row are matched when looking for the header: a
// register has a few dozen columns, and a row of thousands (a cut file, a binary) is no
// header worth the time.
const maxHeaderCells = 512

// scoreHeader matches the cells of one row against the schema as buildHeader would.
func scoreHeader(index *schemaIdx, m *ColumnMap, cells []string, row int) headerScore {
	sc := headerScore{row: row}
	seen := map[string]bool{}
	if len(cells) > maxHeaderCells {
		cells = cells[:maxHeaderCells]
	}
	for _, raw := range cells {
		trimmed := strings.TrimSpace(raw)
		if trimmed == "" {
			continue
		}
		if isPlainNumber(trimmed) || isISODate(trimmed) {
			sc.nonText++
			continue
		}
		key := matchTitle(index, m, raw)
		if key == "" || seen[key] {
			continue
		}
		seen[key] = true
		sc.keys = append(sc.keys, key)
		if key == "asset_id" {
			sc.hasID = true
		}
	}
	return sc
}

// matchTitle is the schema key a header cell names ("" for none or several), as
// buildHeader reads it: the columns file's entry for it, else the title without its
// unit, else the whole text.
func matchTitle(index *schemaIdx, m *ColumnMap, raw string) string {
	if e := m.lookup(raw); e != nil {
		return e.key
	}
	title, _, splitErr := units.SplitHeader(raw)
	key, ambiguous := index.match(title)
	if key == "" && ambiguous == "" && splitErr == nil {
		key, _ = index.match(strings.TrimSpace(raw))
	}
	return key
}

// findHeader reads the first rows from r.src, finds the header row among them (or takes
// opt.HeaderRow), builds the header from it and keeps the rows after it for Next. The
// rows above the header (a title block, "prepared by" lines, blank rows) are not hoists:
// they are noted once in the header's problems. A units row directly under the header
// gives units to the columns whose title has none.
func (r *Reader) findHeader(file string, opt Options) error {
	limit := HeaderScanRows
	if opt.HeaderRow > 0 {
		limit = opt.HeaderRow + 1 // and the row under it: a units row?
	}
	var rows []rawRow
	for {
		rr, err := r.src.next()
		if err == io.EOF {
			break
		}
		if err != nil {
			return err
		}
		rr.cells = append([]string(nil), rr.cells...)
		rr.formats = append([]string(nil), rr.formats...)
		rows = append(rows, rr)
		if rr.row >= limit {
			break
		}
	}
	if len(rows) == 0 || (opt.HeaderRow == 0 && allBlank(rows)) {
		what := "the file"
		if r.d.xlsx {
			what = "the sheet"
		}
		return fmt.Errorf("%s is empty: no row holds the column titles", what)
	}
	at := -1
	if opt.HeaderRow > 0 {
		for i, rr := range rows {
			if rr.row == opt.HeaderRow {
				at = i
			}
		}
		if at < 0 {
			return fmt.Errorf("--header-row %d: the register has no row %d (its last row is %d)", opt.HeaderRow, opt.HeaderRow, rows[len(rows)-1].row)
		}
	} else {
		index := schemaIndex()
		best, closest := 0, 0 // keys named by the header so far, by the closest row
		bestAt := -1
		for i, rr := range rows {
			if rr.syntax != nil {
				continue
			}
			sc := scoreHeader(index, opt.Columns, rr.cells, rr.row)
			if sc.hasID && len(sc.keys) >= 2 && len(sc.keys) > best && sc.nonText <= len(sc.keys) {
				best, at = len(sc.keys), i
			}
			if len(sc.keys) > closest {
				closest, bestAt = len(sc.keys), i
			}
		}
		if at < 0 {
			for _, rr := range rows {
				if rr.syntax != nil {
					// The first non-blank row cannot be read: it may be the header.
					return fmt.Errorf("the header row cannot be read: %s", rr.syntax.message())
				}
				if !isBlank(rr.cells) {
					break
				}
			}
			return noHeaderError(index, opt.Columns, rows, bestAt)
		}
	}
	hdr := rows[at]
	if hdr.syntax != nil {
		return fmt.Errorf("the header row cannot be read: %s", hdr.syntax.message())
	}
	r.colMap = opt.Columns
	if err := r.buildHeader(file, hdr.cells, hdr.row); err != nil {
		return err
	}
	for _, i := range r.dateCols {
		if s := &r.specs[i]; s.mapDates != DateOrderAuto {
			s.dates.order = s.mapDates
		} else {
			s.dates.order = opt.DateOrder
		}
	}
	for _, e := range opt.Columns.unused() {
		r.header.Problems = append(r.header.Problems, &fleet.Error{Kind: fleet.Other, Cell: fleet.CellRef{Sheet: r.sheet, Row: hdr.row},
			Err: fmt.Errorf("%s maps %q, but no column of the header row is titled so: that entry is not used", e.where(opt.Columns.File), e.title)})
	}

	if at > 0 {
		r.noteAbove(rows[:at], hdr.row)
	}
	rest := rows[at+1:]
	r.headRows = at + 1
	if len(rest) > 0 && rest[0].syntax == nil && rest[0].row == hdr.row+1 && r.applyUnitsRow(rest[0]) {
		r.unitsRow = rest[0].cells
		r.headRows++
		rest = rest[1:]
	}
	r.replay = rest
	for i := range r.specs {
		if s := &r.specs[i]; s.noUnit {
			r.header.Problems = append(r.header.Problems, &fleet.Error{Kind: fleet.Unitless, Field: s.col.Key,
				Cell: fleet.CellRef{Sheet: r.sheet, Row: hdr.row, Col: i + 1}, Err: errors.New(s.unitlessProblem(r.header.Columns[i]))})
		}
	}
	return nil
}

func allBlank(rows []rawRow) bool {
	for _, rr := range rows {
		if rr.syntax != nil || !isBlank(rr.cells) {
			return false
		}
	}
	return true
}

// noHeaderError says what was looked for, where, and what came closest.
func noHeaderError(index *schemaIdx, m *ColumnMap, rows []rawRow, bestAt int) error {
	first, last := rows[0].row, rows[len(rows)-1].row
	var b strings.Builder
	fmt.Fprintf(&b, "no header row found in rows %d to %d: looked for a row of column titles naming the asset id (%s) and at least one other column of the register (Rated load, Rope diameter, Motor power, … : 'hoistfleet help columns' lists them)",
		first, last, idTitles(index))
	if bestAt >= 0 {
		sc := scoreHeader(index, m, rows[bestAt].cells, rows[bestAt].row)
		var names []string
		for _, k := range sc.keys {
			c, _ := index.col(k)
			names = append(names, c.Header)
		}
		switch {
		case !sc.hasID:
			fmt.Fprintf(&b, "; the closest, row %d, names %s but no asset id", sc.row, strings.Join(names, ", "))
		default:
			fmt.Fprintf(&b, "; the closest, row %d, names only the asset id: a register needs at least one other of its columns", sc.row)
		}
	} else {
		b.WriteString("; no row names any of them")
	}
	b.WriteString(". Give the header's row with --header-row N, say which column is which with --columns FILE, or rename the columns")
	return errors.New(b.String())
}

// idTitles lists the titles an asset id column is recognised by.
func idTitles(index *schemaIdx) string {
	c, _ := index.col("asset_id")
	names := append([]string{c.Header}, c.Synonyms...)
	if len(names) > 6 {
		names = append(names[:6], "…")
	}
	return strings.Join(names, ", ")
}

// noteAbove notes the rows above the header once: they are not read.
func (r *Reader) noteAbove(rows []rawRow, header int) {
	var shown string
	for _, rr := range rows {
		for _, c := range rr.cells {
			if t := strings.TrimSpace(c); t != "" {
				shown = strconv.Quote(clip(t, 40))
				break
			}
		}
		if shown != "" {
			break
		}
	}
	what := "blank"
	if shown != "" {
		what = "a title block, " + shown + " …"
	}
	r.header.Problems = append(r.header.Problems, &fleet.Error{Kind: fleet.Other,
		Cell: fleet.CellRef{Sheet: r.sheet, Row: rows[0].row},
		Err: fmt.Errorf("the header is row %d: rows %d to %d above it (%s) are not hoists and were not read",
			header, rows[0].row, rows[len(rows)-1].row, what)})
}

// clip shortens s to at most n runes.
func clip(s string, n int) string {
	if r := []rune(s); len(r) > n {
		return string(r[:n]) + "…"
	}
	return s
}

// unitToken is a units-row cell's unit: the text without surrounding brackets.
func unitToken(cell string) string {
	t := strings.TrimSpace(cell)
	if len(t) >= 2 && (t[0] == '[' && t[len(t)-1] == ']' || t[0] == '(' && t[len(t)-1] == ')') {
		t = strings.TrimSpace(t[1 : len(t)-1])
	}
	return t
}

// isUnit reports whether t is a unit of some quantity, or one refused as ambiguous
// (a bare "ton"): what a units row holds.
func isUnit(t string) bool {
	if t == "" {
		return false
	}
	for _, q := range units.Quantities() {
		if q == "ratio" && t != "%" {
			continue // a ratio takes an empty unit, which every text is not
		}
		_, err := units.Factor(q, t)
		var ue *units.Error
		if err == nil || errors.As(err, &ue) && ue.Ambiguous && !strings.Contains(ue.Error(), "mind the case") {
			return true
		}
	}
	return false
}

// applyUnitsRow reads rr as a units row when it is one: no numbers or dates, nothing in
// the asset id column, and at least one cell under a column of a physical quantity that
// is a unit; every other non-empty cell is a unit or a placeholder ("-", "1", "text").
// Each unit then applies to a column whose title has none; a unit that disagrees with the
// title's makes the column unusable (no guess which is right).
func (r *Reader) applyUnitsRow(rr rawRow) bool {
	if isBlank(rr.cells) || (r.idCol >= 0 && r.idCol < len(rr.cells) && strings.TrimSpace(rr.cells[r.idCol]) != "" && !isUnit(unitToken(rr.cells[r.idCol]))) {
		return false
	}
	unitCells := 0
	for i, c := range rr.cells {
		t := unitToken(c)
		if t == "" {
			continue
		}
		if isPlainNumber(t) && t != "1" || isISODate(t) {
			return false
		}
		dimensional := i < len(r.specs) && r.specs[i].known && r.specs[i].col.Quantity != "" && r.specs[i].col.Quantity != "ratio"
		switch {
		case isUnit(t):
			if dimensional {
				unitCells++
			}
		case t == "-" || t == "1" || t == "–" || isUnitPlaceholder(t):
		default:
			return false
		}
	}
	if unitCells == 0 {
		return false
	}
	var applied []string
	for i, c := range rr.cells {
		if i >= len(r.specs) {
			break
		}
		s := &r.specs[i]
		t := unitToken(c)
		if !s.known || s.col.Quantity == "" || t == "" || !isUnit(t) {
			continue
		}
		col := &r.header.Columns[i]
		ref := fleet.CellRef{Sheet: r.sheet, Row: rr.row, Col: i + 1}
		if col.Unit != "" {
			f, err := units.Factor(s.col.Quantity, t)
			if err != nil || f != s.factor {
				s.headerErr = fmt.Sprintf("header %s says [%s] and the units row %s says %q: make them agree", fleet.CellRef{Sheet: r.sheet, Row: rr.row - 1, Col: i + 1}, col.Unit, ref, t)
				r.header.Problems = append(r.header.Problems, &fleet.Error{Kind: fleet.Invalid, Cell: ref, Field: s.col.Key, Err: errors.New(s.headerErr)})
			}
			continue
		}
		s.headerErr = ""
		s.setUnit(col.Title+" ["+t+"]", t, nil, col)
		s.prepare()
		if s.headerErr != "" {
			s.headerErr = "units row " + ref.String() + " " + s.headerErr
			r.header.Problems = append(r.header.Problems, &fleet.Error{Kind: fleet.Invalid, Cell: ref, Field: s.col.Key, Err: errors.New(s.headerErr)})
			continue
		}
		applied = append(applied, s.col.Header+" ["+t+"]")
	}
	r.header.Problems = append(r.header.Problems, &fleet.Error{Kind: fleet.Other,
		Cell: fleet.CellRef{Sheet: r.sheet, Row: rr.row},
		Err:  fmt.Errorf("row %d is a units row under the header, not a hoist: it gives %s", rr.row, strings.Join(applied, ", "))})
	return true
}

// isUnitPlaceholder is what a units row writes over a column without a unit.
func isUnitPlaceholder(t string) bool {
	switch strings.ToLower(t) {
	case "text", "no.", "no", "nr", "#", "date", "yyyy-mm-dd", "dd/mm/yyyy", "mm/dd/yyyy", "dd.mm.yyyy", "yes/no", "y/n", "n", "qty", "count", "class", "ratio", "", "—", "--", "n/a":
		return true
	}
	return false
}
