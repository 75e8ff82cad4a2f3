package register

// The reader's row path of commit dafac1f, without the per-hoist CSV speed-ups:
// NewCSV over encoding/csv, its csvSource, Next and asset, kept verbatim under ref* names
// (asset converting each cell with refParse, the reference conversion) as the oracle of
// reader_diff_test.go. It stays because the fuzz target FuzzReaderMatchesReference
// compares with it (a fuzz target's inputs have no golden output). It is not used by
// the reader.

import (
	"context"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"

	"hoistfleet/fleet"
)

// refReader is the Reader of commit dafac1f: a Reader whose duplicate check is a map.
type refReader struct {
	*Reader
	refIDs map[string]int // asset id → row where first seen
}

// refNewCSV is NewCSV of commit dafac1f, with the front end (csvStream: encoding, line
// ends, separator, NUL bytes) and its notes shared with NewCSV.
func refNewCSV(r io.Reader, name string) (*refReader, error) {
	file := displayName(name)
	text, sep, notes, err := csvStream(r)
	if err != nil {
		return nil, fileError(file, err)
	}
	cr := refNewCSVReader(text, sep)
	rd := &Reader{sheet: file, d: dialect{decimalComma: sep == ';'}, src: &refCSVSource{r: cr}}
	if err := rd.findHeader(file, Options{}); err != nil {
		return nil, fileError(file, err)
	}
	for _, n := range notes {
		rd.header.Problems = append(rd.header.Problems, &fleet.Error{Kind: fleet.Other, Cell: fleet.CellRef{Sheet: file}, Err: errors.New(n)})
	}
	return &refReader{Reader: rd, refIDs: map[string]int{}}, nil
}

func refNewCSVReader(r io.Reader, sep rune) *csv.Reader {
	cr := csv.NewReader(r)
	cr.Comma = sep
	cr.FieldsPerRecord = -1
	cr.LazyQuotes = false
	cr.ReuseRecord = true
	return cr
}

// refCSVSource yields the records after the header.
type refCSVSource struct {
	r        *csv.Reader
	n        int // fields in the header
	row      int // spreadsheet row of the last record returned
	lastLine int // file line on which the last record ended
	buf      []string
}

// refRecordEndLine is the file line on which the record just read ends: the line its last
// field starts on, plus the line breaks inside that (quoted) field.
func refRecordEndLine(r *csv.Reader, rec []string) int {
	if len(rec) == 0 {
		return 0
	}
	line, _ := r.FieldPos(len(rec) - 1)
	return line + strings.Count(rec[len(rec)-1], "\n")
}

func (s *refCSVSource) next() (rawRow, error) {
	rec, err := s.r.Read()
	if err == io.EOF {
		return rawRow{}, io.EOF
	}
	var pe *csv.ParseError
	if err != nil && !errors.As(err, &pe) {
		return rawRow{}, err
	}
	// The record's fields are substrings of one string per record (encoding/csv), so the
	// cells the Asset keeps cost no copy; the slice itself is the source's, reused.
	s.buf = append(s.buf[:0], rec...)
	cells := decodeFields(s.buf)
	rr := rawRow{cells: cells, short: true}
	var start, end int
	if pe != nil {
		rr.syntax = &csvSyntaxError{pe}
		start, end = pe.StartLine, pe.Line
	} else {
		start, _ = s.r.FieldPos(0)
		end = refRecordEndLine(s.r, rec)
	}
	// Blank lines between records (encoding/csv skips them) are empty spreadsheet rows.
	blanks := max(start-s.lastLine-1, 0)
	s.row += 1 + blanks
	s.lastLine = end
	rr.row = s.row
	return rr, nil
}

func (s *refCSVSource) close() error { return nil }

// refNext is Next, building each Asset with refAsset: the rows that are hoists are
// chosen by the same nextData.
func (r *refReader) refNext(ctx context.Context) (*fleet.Asset, error) {
	rr, err := r.nextData(ctx)
	if err != nil {
		return nil, err
	}
	return r.refAsset(rr), nil
}

// refAsset is asset of commit dafac1f, converting each cell with refParse.
func (r *refReader) refAsset(rr rawRow) *fleet.Asset {
	n := len(r.specs)
	a := &fleet.Asset{Index: r.index, Row: rr.row, Cells: make([]fleet.Cell, n)}
	r.index++
	rowRef := fleet.CellRef{Sheet: r.sheet, Row: rr.row}
	if rr.syntax == nil && isBlank(rr.cells) {
		a.Blank = true
		for i := range a.Cells {
			if i < len(rr.cells) {
				a.Cells[i].Text = rr.cells[i]
			}
		}
		a.Problems = append(a.Problems, &fleet.Error{Kind: fleet.Shape, Cell: rowRef,
			Err: fmt.Errorf("row %d is empty", rr.row)})
		return a
	}
	if r.idCol >= 0 && r.idCol < len(rr.cells) {
		a.ID = strings.TrimSpace(rr.cells[r.idCol])
	}
	a.Values = fleet.NewValues()
	readable := len(rr.cells)
	if rr.syntax != nil {
		a.Problems = append(a.Problems, &fleet.Error{Kind: fleet.Invalid, Asset: a.ID,
			Cell: fleet.CellRef{Sheet: r.sheet, Row: rr.row, Col: min(readable+1, max(n, 1))},
			Err:  &cellError{msg: rr.syntax.message(), kind: ErrSyntax}})
	}
	for i := range r.specs {
		s := &r.specs[i]
		ref := fleet.CellRef{Sheet: r.sheet, Row: rr.row, Col: i + 1}
		raw := ""
		if i < len(rr.cells) {
			raw = rr.cells[i]
		}
		if rr.syntax != nil && i >= readable {
			if s.known {
				a.Values[s.field] = fleet.Value{State: fleet.Bad, Cell: ref, Err: &fleet.Error{
					Kind: fleet.Invalid, Asset: a.ID, Cell: ref, Field: s.col.Key,
					Err: &cellError{msg: "not read: " + rr.syntax.message(), kind: ErrSyntax}}}
			}
			continue
		}
		if i == r.reeve.partsCol && strings.IndexByte(raw, '/') >= 0 && r.fillReeving(raw, ref, a) {
			continue // issue 14: reeving "4/1", shared with the reader
		}
		v, c := s.refParse(raw, r.d, ref, a.ID)
		a.Cells[i] = c
		if s.known {
			a.Values[s.field] = v
		}
	}
	for _, p := range rr.merged {
		p.Asset = a.ID
		a.Problems = append(a.Problems, p)
	}
	// Shape: a CSV record with another number of fields than the header; an XLSX row
	// with values beyond the header's last column.
	if rr.syntax == nil {
		switch {
		case len(rr.cells) > n && !isBlank(rr.cells[n:]):
			extra := rr.cells[n:]
			var shown []string
			for j, c := range extra {
				if strings.TrimSpace(c) != "" && len(shown) < 3 {
					shown = append(shown, fleet.CellRef{Sheet: r.sheet, Row: rr.row, Col: n + j + 1}.String()+" "+strconv.Quote(c))
				}
			}
			a.Problems = append(a.Problems, &fleet.Error{Kind: fleet.Shape, Asset: a.ID,
				Cell: fleet.CellRef{Sheet: r.sheet, Row: rr.row, Col: n + 1},
				Err: fmt.Errorf("row has %d cells, the header %d: cells beyond the header's last column are not read and not passed through (%s)",
					len(rr.cells), n, strings.Join(shown, ", "))})
		case len(rr.cells) > n && rr.short:
			a.Problems = append(a.Problems, &fleet.Error{Kind: fleet.Shape, Asset: a.ID, Cell: rowRef,
				Err: fmt.Errorf("row has %d cells, the header %d (the extra cells are empty)", len(rr.cells), n)})
		case len(rr.cells) < n && rr.short:
			a.Problems = append(a.Problems, &fleet.Error{Kind: fleet.Shape, Asset: a.ID, Cell: rowRef,
				Err: fmt.Errorf("row has %d cells, the header %d: the missing cells are read as empty", len(rr.cells), n)})
		}
	}
	// Identity.
	switch {
	case r.idCol < 0:
		// Reported once in the header.
	case a.ID == "":
		a.Problems = append(a.Problems, &fleet.Error{Kind: fleet.Missing, Field: "asset_id",
			Cell: fleet.CellRef{Sheet: r.sheet, Row: rr.row, Col: r.idCol + 1},
			Err:  fmt.Errorf("the asset id is missing")})
	default:
		if first, dup := r.refIDs[a.ID]; dup {
			a.Problems = append(a.Problems, &fleet.Error{Kind: fleet.Duplicate, Asset: a.ID, Field: "asset_id",
				Cell: fleet.CellRef{Sheet: r.sheet, Row: rr.row, Col: r.idCol + 1},
				Err:  fmt.Errorf("asset id %q is already used in row %d", a.ID, first)})
		} else {
			r.refIDs[strings.Clone(a.ID)] = rr.row // a clone: the id is a substring of the whole record, which the map would keep alive
		}
	}
	return a
}
