package register

import (
	"errors"
	"fmt"
	"strconv"
	"strings"

	"hoistfleet/fleet"
)

// skipKind is why a row under the header is not a hoist.
type skipKind uint8

const (
	skipNone   skipKind = iota
	skipBlank           // an empty row inside the table
	skipTotals          // a totals row: "Total", "Summe", … in its first cell, or a column sum
	skipHeader          // the header repeated (a page break in an export)
	skipUnits           // the units row repeated under a repeated header
	skipKinds           // the number of kinds
)

// skipWhat says, for the note, what the rows of each kind are: one row, several.
var skipWhat = [skipKinds][2]string{
	skipBlank:  {"is empty: skipped", "are empty: skipped"},
	skipTotals: {"is a totals row, not a hoist: left out", "are totals rows, not hoists: left out"},
	skipHeader: {"is the header repeated, not a hoist: left out", "are the header repeated, not hoists: left out"},
	skipUnits:  {"is the units row repeated, not a hoist: left out", "are the units row repeated, not hoists: left out"},
}

// maxListed is how many rows (or runs of rows) a note names.
const maxListed = 8

// rowList is the rows of one kind left out: a count, and the first runs with the first
// cell's text of each.
type rowList struct {
	n     int
	runs  [][2]int
	texts []string
}

// add notes rows from to to (inclusive), text the first cell's text ("" none).
func (l rowList) add(from, to int, text string) rowList {
	l.n += to - from + 1
	if k := len(l.runs); k > 0 && l.runs[k-1][1] == from-1 && text == "" {
		l.runs[k-1][1] = to
		return l
	}
	if len(l.runs) < maxListed {
		l.runs = append(l.runs, [2]int{from, to})
		l.texts = append(l.texts, text)
	}
	return l
}

func (l rowList) String() string {
	var parts []string
	for i, r := range l.runs {
		s := strconv.Itoa(r[0])
		if r[1] > r[0] {
			s += "–" + strconv.Itoa(r[1])
		}
		if l.texts[i] != "" {
			s += " (" + strconv.Quote(clip(l.texts[i], 30)) + ")"
		}
		parts = append(parts, s)
	}
	listed := 0
	for _, r := range l.runs {
		listed += r[1] - r[0] + 1
	}
	if l.n > listed {
		parts = append(parts, fmt.Sprintf("and %d more", l.n-listed))
	}
	return strings.Join(parts, ", ")
}

// firstText is the row's first non-empty cell, trimmed.
func firstText(cells []string) string {
	for _, c := range cells {
		if t := trimSpace(c); t != "" {
			return t
		}
	}
	return ""
}

// totalWords are what the first cell of a totals row says, normalized (letters only,
// lower case): English, German, Dutch, French, Spanish.
var totalWords = map[string]bool{
	"total": true, "totals": true, "grandtotal": true, "subtotal": true, "sum": true,
	"summe": true, "gesamt": true, "gesamtsumme": true, "insgesamt": true, "zwischensumme": true,
	"totaal": true, "subtotaal": true, "som": true, "totale": true, "suma": true,
}

// isTotalLabel reports whether a row's first cell is a totals label: "Total", "TOTAL:",
// "Summe", "Grand total", or such a word followed by words without digits ("Total
// rated load"). A cell with digits ("SUM-01") is an id, not a label.
func isTotalLabel(text string) bool {
	if len(text) > 40 || strings.ContainsAny(text, "0123456789") {
		return false
	}
	var buf [48]byte
	n, ok := normalizeASCII(buf[:0], text)
	if !ok {
		return false
	}
	if totalWords[string(n)] {
		return true
	}
	first := text
	if i := strings.IndexAny(text, " :\t"); i > 0 {
		first = text[:i]
	}
	m, _ := normalizeASCII(buf[:0], first)
	return first != text && totalWords[string(m)]
}

// notHoist says why a non-blank row under the header is not a hoist, skipNone when it is
// one.
func (r *Reader) notHoist(rr rawRow) skipKind {
	first := firstText(rr.cells)
	if first == "" {
		return skipNone
	}
	if c := first[0]; (c|0x20 == 't' || c|0x20 == 's' || c|0x20 == 'g' || c|0x20 == 'i' || c|0x20 == 'z') && isTotalLabel(first) {
		return skipTotals
	}
	if r.idCol >= 0 {
		id := ""
		if r.idCol < len(rr.cells) {
			id = trimSpace(rr.cells[r.idCol])
		}
		if id != "" && strings.EqualFold(id, trimSpace(r.header.Columns[r.idCol].Title)) && r.repeatsHeader(rr.cells) {
			return skipHeader
		}
		if id == "" && r.unitsRow != nil && sameCells(rr.cells, r.unitsRow) {
			return skipUnits
		}
	}
	return skipNone
}

// repeatsHeader reports whether a row repeats the header's titles in every column the
// schema knows.
func (r *Reader) repeatsHeader(cells []string) bool {
	for i, s := range r.specs {
		if !s.known {
			continue
		}
		c := ""
		if i < len(cells) {
			c = trimSpace(cells[i])
		}
		if !strings.EqualFold(c, trimSpace(r.header.Columns[i].Title)) {
			return false
		}
	}
	return true
}

func sameCells(a, b []string) bool {
	for i := range max(len(a), len(b)) {
		var x, y string
		if i < len(a) {
			x = trimSpace(a[i])
		}
		if i < len(b) {
			y = trimSpace(b[i])
		}
		if x != y {
			return false
		}
	}
	return true
}

// RowsLeftOut is how many rows (records, for a CSV file) the reader has read and not
// returned as hoists: the header and the rows above it, its units row, the rows left out
// below it and, at the end, the trailing blank rows. With the hoists returned, it counts
// every row read.
func (r *Reader) RowsLeftOut() int {
	n := r.headRows + r.pendN
	for _, l := range r.skipped {
		n += l.n
	}
	return n
}

// finish writes the notes of the whole read once the last row is read: the rows left
// out, and the columns whose cells held blank markers.
func (r *Reader) finish() {
	if r.finished || r.header == nil {
		return
	}
	r.finished = true
	for k := skipBlank; k < skipKinds; k++ {
		l := r.skipped[k]
		if l.n == 0 {
			continue
		}
		word, what := "rows", skipWhat[k][1]
		if l.n == 1 {
			word, what = "row", skipWhat[k][0]
		}
		r.header.Problems = append(r.header.Problems, &fleet.Error{Kind: fleet.Other,
			Cell: fleet.CellRef{Sheet: r.sheet, Row: l.runs[0][0]},
			Err:  fmt.Errorf("%d %s (%s) %s", l.n, word, l.String(), what)})
	}
	if n := r.reevingNote(); n != "" {
		r.header.Problems = append(r.header.Problems, &fleet.Error{Kind: fleet.Other, Cell: r.reeve.at, Field: "parts_of_line", Err: errors.New(n)})
	}
	for _, i := range r.dateCols {
		s := &r.specs[i]
		for _, n := range s.dateNoteList() {
			r.header.Problems = append(r.header.Problems, &fleet.Error{Kind: fleet.Other,
				Cell: fleet.CellRef{Sheet: r.sheet, Row: r.headerRow, Col: i + 1}, Field: s.col.Key,
				Err: fmt.Errorf("%s: %s", s.col.Header, n)})
		}
	}
	for i := range r.specs {
		s := &r.specs[i]
		if n := s.cellUnitNote(); n != "" {
			r.header.Problems = append(r.header.Problems, &fleet.Error{Kind: fleet.Other, Cell: s.cellUnits.at, Field: s.col.Key, Err: errors.New(n)})
		}
	}
	for i := range r.specs {
		s := &r.specs[i]
		for _, n := range s.shownNotes() {
			at := s.shownAt
			if at.IsZero() {
				at = s.unshownAt
			}
			r.header.Problems = append(r.header.Problems, &fleet.Error{Kind: fleet.Other, Cell: at, Field: s.col.Key, Err: errors.New(n)})
		}
	}
	for i := range r.specs {
		s := &r.specs[i]
		if s.blankN == 0 {
			continue
		}
		cells := "cell holds"
		if s.blankN > 1 {
			cells = "cells hold"
		}
		r.header.Problems = append(r.header.Problems, &fleet.Error{Kind: fleet.Other, Cell: s.blankAt, Field: s.col.Key,
			Err: fmt.Errorf("%s: %d %s a blank marker (%s first, at %s): read as empty", s.col.Header, s.blankN, cells, strconv.Quote(s.blankText), s.blankAt)})
	}
}

// isBlankMarker reports whether a cell's text is what registers write for "no value":
// "-", "–", "n/a", "TBC", "?", "unknown", "none", … (case ignored).
func isBlankMarker(text string) bool {
	if len(text) == 0 || len(text) > 9 {
		return false
	}
	switch text[0] { // most cells start otherwise: no comparison at all
	case '-', '?', 0xE2, 'n', 'N', 't', 'T', 'u', 'U':
	default:
		return false
	}
	for _, m := range blankMarkers {
		if len(m) == len(text) && strings.EqualFold(text, m) {
			return true
		}
	}
	return false
}

// blankMarkers are what registers write for "no value".
var blankMarkers = [...]string{"-", "--", "–", "—", "n/a", "n.a.", "na", "tbc", "tba", "tbd", "?", "??", "unknown", "none", "nil", "not known"}

// blankMarker reports whether a known column's cell is a blank marker that is not a
// legal value of the column ("none" is one of Control braking's values). The asset id
// is never blanked: an id "TBC" is reported as it stands.
func (s *colSpec) blankMarker(text string) bool {
	if !isBlankMarker(text) || s.col.Key == "asset_id" {
		return false
	}
	if s.kind == kindEnum {
		if _, ok := s.matchEnum(text); ok {
			return false
		}
	}
	return true
}
