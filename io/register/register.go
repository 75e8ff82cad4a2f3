// Package register reads a hoist register, a CSV file or a sheet of an XLSX workbook
// with one header row and one hoist a row, and yields its rows as fleet.Assets with every
// known column converted to SI. It implements fleet.Source.
//
// The header is found in the first rows (HeaderScanRows; find.go): the row whose cells
// name the most schema columns, with at least the asset id and one other; Options give
// it instead. Each header cell is matched to the column schema (schema.Columns) by its
// title, ignoring case, spaces and punctuation, against the schema's key, header and
// synonyms; the unit in brackets at its end, or in a units row under the header, is
// converted with package units. A column of a physical quantity whose unit is written
// nowhere is not read in an assumed unit (cellunit.go). Rows that are not hoists (blank,
// totals, repeated header rows) are left out and noted (rows.go); dates are read as
// spreadsheets write them (dates.go). For example, with the header
//
//	Asset ID,Rated load [lb],Rope diameter (in),Maintenance contractor
//
// the row
//
//	H-7,4000,0.5,Tarnwick Lift Services
//
// gives Get("rated_load").Num = 1814.3695 (kg), Get("rope_diameter").Num = 0.0127
// (m), and passes "Maintenance contractor" through untouched (Column.Key "").
//
// Bad input never stops the reader and never drops a row: a cell that cannot be read is
// a Bad Value whose Err (a *fleet.Error with Cell, Field, Kind and Asset) says where and
// why, e.g.
//
//	Register!F14: asset H-042: "twelve" is not a number in [t]
//
// A header problem (an ambiguous unit, a duplicated column) is listed in
// Header.Problems and makes that column's non-empty cells Bad in every row. Row problems
// (a short or long row, a duplicated or missing asset id, an empty row) are listed in
// Asset.Problems. Next returns an error only when the file itself cannot be read further.
//
// The reader streams: memory does not grow with the number of rows, except for the set
// of asset ids seen (to report duplicates).
package register

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
	"hoistfleet/io/units"
)

// rawRow is one row as the file gives it.
type rawRow struct {
	cells []string
	// formats are the number format codes of an XLSX row's number cells ("" General;
	// nil when every cell is General), for the text columns read as shown.
	formats []string
	row     int             // spreadsheet row number (CSV: line of the record's start)
	syntax  *csvSyntaxError // CSV: the record could not be read past field len(cells)
	merged  []*fleet.Error  // XLSX: the row's cells hidden by merged cells above them
	short   bool            // CSV: any other number of fields than the header's is a shape problem
	hidden  bool            // XLSX: the row is hidden or filtered out
}

// rowSource gives the rows after the header. next returns io.EOF after the last row.
// The cells slice of a row may be reused by the next call (its strings are not).
type rowSource interface {
	next() (rawRow, error)
	close() error
}

// Reader reads a register. Build it with NewCSV or NewXLSX; it implements fleet.Source.
// A Reader is not safe for concurrent use.
type Reader struct {
	header *fleet.Header
	specs  []colSpec
	d      dialect
	src    rowSource
	sheet  string
	known  int               // columns the schema knows: the fields of every row
	idCol  int               // index of the asset id column, -1 when absent
	ids    *idSet            // asset id → row where first seen
	index  int               // next Asset.Index
	free   chan *fleet.Asset // Assets handed back by Recycle, to be reused

	// Blank rows are left out: a run of them is noted only when a non-blank row shows
	// it is inside the data, not the sheet's trailing rows.
	pendStart, pendN int
	err              error // sticky: io.EOF or a read error

	skipped  [skipKinds]rowList // rows left out, by why
	unitsRow []string           // the units row under the header, to know its repeats
	finished bool               // the notes of the end are written
	headRows int                // rows read up to the header (and its units row)
	reeve    reeving            // the parts-of-line and rope-ends columns ("4/1")

	replay     []rawRow     // rows read with the header search, after the header: returned first
	sumRows    map[int]bool // XLSX: rows holding a formula that sums a column (totals rows)
	hiddenCols map[int]bool // XLSX: hidden columns (1-based)
	colMap     *ColumnMap   // --columns: what register columns are, where the file says
	dateCols   []int        // the columns of dates (their order of day and month is looked for)
	srcDone    bool         // the source has ended (looking ahead), with srcErr
	srcErr     error
	headerRow  int // the header's spreadsheet row
}

var (
	_ fleet.Source   = (*Reader)(nil)
	_ fleet.Recycler = (*Reader)(nil)
)

// recycleDepth is how many handed-back Assets a Reader keeps for reuse: enough for the
// results in flight in fleet.Run's reorder buffer on a small machine; more are dropped.
const recycleDepth = 256

// Recycle takes back an Asset this Reader returned, whose memory (the Asset, its Values
// and Cells) a later row may then reuse; the caller must hold no reference to them. It
// is safe to call from another goroutine than Next (fleet.Recycler).
func (r *Reader) Recycle(a *fleet.Asset) {
	if a == nil {
		return
	}
	select {
	case r.free <- a:
	default: // full: let the collector have it
	}
}

// newAsset returns a zeroed Asset with n Cells, reusing a recycled one when there is one.
// Its Values, when reused, come back in values (cleared), for a row that has values.
func (r *Reader) newAsset(n int) (a *fleet.Asset, values []fleet.Value) {
	select {
	case old := <-r.free:
		cells, vals := old.Cells, old.Values
		if cap(cells) >= n {
			cells = cells[:n]
			clear(cells)
		} else {
			cells = make([]fleet.Cell, n)
		}
		if len(vals) == schema.ColumnCount() {
			clear(vals)
		} else {
			vals = nil
		}
		*old = fleet.Asset{Cells: cells}
		return old, vals
	default:
		return &fleet.Asset{Cells: make([]fleet.Cell, n)}, nil
	}
}

// Header returns the register's header as read.
func (r *Reader) Header() *fleet.Header { return r.header }

// Next returns the next hoist row, or io.EOF after the last. A bad cell is a Bad Value
// in the Asset, not an error; an error means the file cannot be read further. Next checks
// ctx before reading. Rows that are not hoists (blank rows, totals rows, repeated header
// and units rows) are left out and listed once, at the end, in the header's problems.
func (r *Reader) Next(ctx context.Context) (*fleet.Asset, error) {
	rr, err := r.nextData(ctx)
	if err != nil {
		return nil, err
	}
	return r.asset(rr), nil
}

// nextData returns the next row that is a hoist, noting the rows skipped on the way.
func (r *Reader) nextData(ctx context.Context) (rawRow, error) {
	if err := ctx.Err(); err != nil {
		return rawRow{}, err
	}
	if r.err != nil {
		return rawRow{}, r.err
	}
	for n := 1; ; n++ {
		rr, err := r.nextRow()
		if err != nil {
			// At the end, blank rows still pending are the sheet's trailing empty rows.
			r.err = err
			if err == io.EOF {
				r.finish()
			}
			return rawRow{}, err
		}
		if n%4096 == 0 {
			if err := ctx.Err(); err != nil {
				return rawRow{}, err
			}
		}
		if r.sumRows != nil && r.sumRows[rr.row] {
			// A column sum: a totals row, even when its formulas were never calculated.
			r.flushBlank()
			r.skipped[skipTotals] = r.skipped[skipTotals].add(rr.row, rr.row, firstText(rr.cells))
			continue
		}
		if rr.syntax == nil && isBlank(rr.cells) {
			if r.pendN == 0 {
				r.pendStart = rr.row
			}
			r.pendN++
			continue
		}
		r.flushBlank()
		if rr.syntax == nil {
			if why := r.notHoist(rr); why != skipNone {
				r.skipped[why] = r.skipped[why].add(rr.row, rr.row, firstText(rr.cells))
				continue
			}
		}
		if r.dateCols != nil {
			r.scanDates(rr)
		}
		return rr, nil
	}
}

// flushBlank notes the blank rows pending as inside the table: a row follows them.
func (r *Reader) flushBlank() {
	if r.pendN > 0 {
		r.skipped[skipBlank] = r.skipped[skipBlank].add(r.pendStart, r.pendStart+r.pendN-1, "")
		r.pendN = 0
	}
}

// nextRow is the next row after the header: those the header search read, then the
// source's.
func (r *Reader) nextRow() (rawRow, error) {
	if len(r.replay) > 0 {
		rr := r.replay[0]
		r.replay[0] = rawRow{}
		r.replay = r.replay[1:]
		return rr, nil
	}
	if r.srcDone {
		return rawRow{}, r.srcErr
	}
	rr, err := r.src.next()
	if err != nil && err != io.EOF {
		err = r.located(err)
	}
	return rr, err
}

// located names the file in an error of the source (which names the sheet, row and
// cell): the register cannot be read further.
func (r *Reader) located(err error) error {
	if r.header == nil || r.header.File == "" {
		return err
	}
	var fe *fleet.Error
	if errors.As(err, &fe) && strings.HasPrefix(fe.Error(), r.header.File+": ") {
		return err
	}
	return fileError(r.header.File, err)
}

// Close releases the file (an XLSX workbook's temporary files).
func (r *Reader) Close() error {
	if r.src == nil {
		return nil
	}
	err := r.src.close()
	r.src = nil
	return err
}

func isBlank(cells []string) bool {
	for _, c := range cells {
		if strings.TrimSpace(c) != "" {
			return false
		}
	}
	return true
}

// asset builds the Asset of one row.
func (r *Reader) asset(rr rawRow) *fleet.Asset {
	n := len(r.specs)
	a, values := r.newAsset(n)
	a.Index, a.Row = r.index, rr.row
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
	if rr.formats != nil {
		rr.cells = r.asShown(rr)
	}
	if r.idCol >= 0 && r.idCol < len(rr.cells) {
		a.ID = trimSpace(rr.cells[r.idCol])
	}
	a.Values = values
	if a.Values == nil {
		a.Values = fleet.NewValues()
	}
	readable := len(rr.cells)
	if rr.syntax != nil {
		a.Problems = append(a.Problems, &fleet.Error{Kind: fleet.Invalid, Asset: a.ID,
			Cell: fleet.CellRef{Sheet: r.sheet, Row: rr.row, Col: min(readable+1, max(n, 1))},
			Err:  &cellError{msg: rr.syntax.message(), kind: ErrSyntax}})
	}
	for i := range r.specs {
		s := &r.specs[i]
		raw := ""
		if i < len(rr.cells) {
			raw = rr.cells[i]
		}
		if !s.known {
			if raw != "" {
				a.Cells[i] = fleet.Cell{Text: raw, IsNumber: isPlainNumber(trimSpace(raw))}
			}
			continue
		}
		ref := fleet.CellRef{Sheet: r.sheet, Row: rr.row, Col: i + 1}
		if rr.syntax != nil && i >= readable {
			a.Values[s.field] = fleet.Value{State: fleet.Bad, Cell: ref, Err: &fleet.Error{
				Kind: fleet.Invalid, Asset: a.ID, Cell: ref, Field: s.col.Key,
				Err: &cellError{msg: "not read: " + rr.syntax.message(), kind: ErrSyntax}}}
			continue
		}
		if i == r.reeve.partsCol && strings.IndexByte(raw, '/') >= 0 && r.fillReeving(raw, ref, a) {
			continue
		}
		s.fill(raw, r.d, ref, a.ID, &a.Values[s.field], &a.Cells[i])
	}
	for _, p := range rr.merged {
		p.Asset = a.ID
		a.Problems = append(a.Problems, p)
	}
	if rr.hidden {
		a.Hidden = true
		a.Problems = append(a.Problems, &fleet.Error{Kind: fleet.Other, Asset: a.ID, Cell: rowRef,
			Err: fmt.Errorf("row %d is hidden or filtered out in the register: checked all the same, and marked hidden", rr.row)})
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
		if first, dup := r.ids.first(a.ID, rr.row); dup {
			a.Problems = append(a.Problems, &fleet.Error{Kind: fleet.Duplicate, Asset: a.ID, Field: "asset_id",
				Cell: fleet.CellRef{Sheet: r.sheet, Row: rr.row, Col: r.idCol + 1},
				Err:  fmt.Errorf("asset id %q is already used in row %d", a.ID, first)})
		}
	}
	return a
}

// header builds the Header and the column specs from the header row's cells.
func (r *Reader) buildHeader(file string, titles []string, row int) error {
	r.header = &fleet.Header{File: file, Sheet: r.sheet, Row: row}
	r.headerRow = row
	r.idCol = -1
	r.ids = newIDSet()
	r.free = make(chan *fleet.Asset, recycleDepth)
	if isBlank(titles) {
		return fmt.Errorf("row %d, the header row, is empty: the first row must hold the column titles", row)
	}
	index := schemaIndex()
	firstAt := map[string]int{} // key → column index
	// A hidden column never wins over a visible one that names the same column: the
	// visible one is what the register's keeper sees and maintains.
	visibleAt := map[string]int{} // key → first visible column naming it
	if len(r.hiddenCols) > 0 {
		for i, raw := range titles {
			if k := matchTitle(index, r.colMap, raw); k != "" && !r.hiddenCols[i+1] && visibleAt[k] == 0 {
				visibleAt[k] = i + 1
			}
		}
	}
	var numeric, nonEmpty, matched int
	var mappedRead, mappedIgnored int // columns the columns file names
	// The columns the columns file gives to a register column win over a column whose
	// title only the synonyms match: claimed[key] is the title the file names.
	claimed := map[string]string{}
	for _, raw := range titles {
		if e := r.colMap.lookup(raw); e != nil && e.key != "" {
			claimed[e.key] = raw
		}
	}
	for i, raw := range titles {
		ref := fleet.CellRef{Sheet: r.sheet, Row: row, Col: i + 1}
		col := fleet.Column{Index: i, Title: raw, Factor: 1}
		spec := colSpec{factor: 1, headerRow: row}
		trimmed := strings.TrimSpace(raw)
		if trimmed != "" {
			nonEmpty++
			if isPlainNumber(trimmed) || isISODate(trimmed) {
				numeric++
			}
		}
		title, unit, splitErr := units.SplitHeader(raw)
		key, ambiguous := index.match(title)
		if key == "" && ambiguous == "" && splitErr == nil {
			// "Notes (free text)": the whole text may be the title.
			if k, amb := index.match(trimmed); k != "" || amb != "" {
				key, ambiguous, unit = k, amb, ""
			}
		}
		problem := func(k fleet.Kind, field, format string, args ...any) {
			r.header.Problems = append(r.header.Problems, &fleet.Error{Kind: k, Cell: ref, Field: field,
				Err: fmt.Errorf(format, args...)})
		}
		mapped := r.colMap.lookup(raw)
		if mapped != nil {
			// The columns file says what this column is: it wins over the synonyms.
			mapped.used = true
			key, ambiguous = mapped.key, ""
			where := mapped.where(r.colMap.File)
			col.Mapped = where
			switch {
			case key == "":
				mappedIgnored++
			case mapped.unit != "" && splitErr == nil && unit != "" && !sameUnit(key, unit, mapped.unit):
				problem(fleet.Invalid, key, "%q gives the unit %q, %s gives %q: the column is passed through unread; correct one of them", raw, unit, where, mapped.unit)
				key = ""
			default:
				mappedRead++
				if mapped.unit != "" {
					if unit == "" || splitErr != nil {
						col.UnitFrom = "columns file"
					}
					unit, splitErr = mapped.unit, nil
				}
				spec.mapDates = mapped.dates
			}
		} else if owner, ok := claimed[key]; ok && key != "" {
			sc, _ := index.col(key)
			problem(fleet.Other, "", "%q would be %s by its title, but %s gives %s to %q: passed through unread", raw, sc.Header, r.colMap.File, sc.Header, owner)
			key = ""
		}
		hidden := r.hiddenCols[i+1]
		switch {
		case ambiguous != "":
			problem(fleet.Invalid, "", "%q matches more than one column (%s): it is passed through unread; use the column's own title", raw, ambiguous)
		case key == "":
			// Unknown: passed through.
		case hidden && visibleAt[key] > 0:
			sc, _ := index.col(key)
			vis := fleet.CellRef{Sheet: r.sheet, Row: row, Col: visibleAt[key]}
			problem(fleet.Other, key, "%q is a hidden %s column; the visible one, %s, is read and this hidden copy is passed through unread", raw, sc.Header, vis)
		case firstAt[key] > 0:
			sc, _ := index.col(key)
			first := fleet.CellRef{Sheet: r.sheet, Row: row, Col: firstAt[key]}
			problem(fleet.Invalid, key, "%q is a second %s column (the first is %s): this copy is passed through unread", raw, sc.Header, first)
		default:
			firstAt[key] = i + 1
			matched++
			sc, _ := index.col(key)
			spec.known, spec.col = true, sc
			spec.field, _ = schema.ColumnIndex(key)
			r.known++
			col.Key = key
			spec.setUnit(raw, unit, splitErr, &col)
			spec.prepare()
			if spec.headerErr != "" {
				problem(fleet.Invalid, key, "%s", spec.headerErr)
				spec.headerErr = "header " + ref.String() + " " + spec.headerErr
			} else if spec.col.Quantity == "" && spec.col.Unit != "" && unit == "" {
				problem(fleet.Other, key, "%q gives no unit: read in %s, the column's only unit (write %q to say so)", raw, sc.Unit, sc.HeaderWithUnit(""))
			} else if spec.col.Quantity == "ratio" && sc.Unit == "%" && unit == "" {
				// A percentage column without a unit is read in % (a 1 would be 1 %, not
				// 100 %): said once, so that a column of fractions is noticed.
				problem(fleet.Other, key, "%q gives no unit: read in %% (write %q to say so; a fraction such as 0.4 is not a percentage)", raw, sc.HeaderWithUnit(""))
			} else if spec.col.Quantity == "" && spec.col.Unit == "" && unit != "" && unit != "-" && unit != "1" {
				problem(fleet.Invalid, key, "%q: %s takes no unit; %q is ignored", raw, sc.Header, unit)
			}
			if key == "asset_id" {
				r.idCol = i
			}
			if spec.kind == kindDate {
				r.dateCols = append(r.dateCols, i)
			}
			if hidden {
				problem(fleet.Other, key, "%q is a hidden column: read all the same", raw)
			}
		}
		r.header.Columns = append(r.header.Columns, col)
		r.specs = append(r.specs, spec)
	}
	r.setupReeving()
	rowRef := fleet.CellRef{Sheet: r.sheet, Row: row}
	if mappedRead+mappedIgnored > 0 {
		note := fmt.Sprintf("%s says what %d columns are", r.colMap.File, mappedRead+mappedIgnored)
		if mappedIgnored > 0 {
			note += fmt.Sprintf(" (%d of them passed through unread)", mappedIgnored)
		}
		r.header.Problems = append(r.header.Problems, &fleet.Error{Kind: fleet.Other, Cell: rowRef, Err: errors.New(note)})
	}
	if nonEmpty > 0 && (2*numeric > nonEmpty || (matched == 0 && numeric > 0)) {
		r.header.Problems = append(r.header.Problems, &fleet.Error{Kind: fleet.Invalid, Cell: rowRef,
			Err: fmt.Errorf("the first row looks like data (%d of its %d cells are numbers or dates), not a header: the first row must hold the column titles", numeric, nonEmpty)})
	} else if matched == 0 {
		r.header.Problems = append(r.header.Problems, &fleet.Error{Kind: fleet.Invalid, Cell: rowRef,
			Err: errors.New("no column title matches the register's columns: is the first row the header?")})
	}
	if r.idCol < 0 {
		r.header.Problems = append(r.header.Problems, &fleet.Error{Kind: fleet.Missing, Cell: rowRef, Field: "asset_id",
			Err: errors.New("there is no Asset ID column: rows are identified by their row number only")})
	}
	return nil
}

// setUnit resolves the column's unit: the header's. A column of a physical quantity
// whose header gives none is read in no unit (noUnit): only cells that carry their own
// unit are read; its range is still the schema's, in the schema's unit.
func (s *colSpec) setUnit(raw, unit string, splitErr error, col *fleet.Column) {
	sc := s.col
	col.Unit = unit
	s.noUnit = false
	if splitErr != nil {
		s.headerErr = fmt.Sprintf("%q: %v", raw, strings.TrimPrefix(splitErr.Error(), "header: "+strconv.Quote(strings.TrimSpace(raw))+": "))
		return
	}
	if sc.Quantity == "" {
		s.minSI, s.maxSI = sc.Min, sc.Max
		if sc.Unit != "" && unit != "" && !countUnit(sc.Unit, unit) {
			// A count in a fixed unit (an interval in months): another unit would be a
			// misread, so the column is refused.
			s.headerErr = fmt.Sprintf("%q: %s is in %s, not %q: write %q", raw, sc.Header, sc.Unit, unit, sc.HeaderWithUnit(""))
		}
		return
	}
	u := unit
	if u == "" {
		u = sc.Unit
	}
	def, err := units.Factor(sc.Quantity, sc.Unit)
	if err != nil {
		def = math.NaN() // a schema unit this package does not know: no range check
	}
	if unit == "" && sc.Quantity != "ratio" {
		s.noUnit = true
		s.factor, col.Factor = def, 1
		s.unitLabel = sc.Unit
		s.minSI, s.maxSI = sc.Min*def, sc.Max*def
		if math.IsNaN(def) {
			s.col.HasMin, s.col.HasMax = false, false
		}
		return
	}
	f, err := units.Factor(sc.Quantity, u)
	if err != nil {
		s.headerErr = fmt.Sprintf("%q: %v", raw, err)
		s.unitLabel = u
		return
	}
	s.factor, col.Factor = f, f
	if u != "1" {
		s.unitLabel = u
	}
	s.minSI, s.maxSI = sc.Min*def, sc.Max*def
	if math.IsNaN(def) {
		s.col.HasMin, s.col.HasMax = false, false
	}
}

func isISODate(s string) bool {
	_, msg := parseDate(s, dialect{})
	return msg == ""
}

// sameUnit reports whether two units of our column key's quantity are one and the same
// (a header's "[t]" and a columns file's "tonne").
func sameUnit(key, a, b string) bool {
	sc, ok := schemaIndex().col(key)
	if !ok || sc.Quantity == "" {
		return strings.EqualFold(a, b) || ok && sc.Unit != "" && countUnit(sc.Unit, a) && countUnit(sc.Unit, b)
	}
	fa, errA := units.Factor(sc.Quantity, a)
	fb, errB := units.Factor(sc.Quantity, b)
	return errA == nil && errB == nil && fa == fb
}

// countUnit reports whether a header's unit names a count column's fixed unit: the
// schema's "months" as months, month, mo or mths.
func countUnit(schemaUnit, unit string) bool {
	u := strings.ToLower(strings.TrimSpace(unit))
	if u == strings.ToLower(schemaUnit) {
		return true
	}
	return schemaUnit == "months" && (u == "month" || u == "mo" || u == "mths" || u == "mth")
}

// asShown is a row's cells with the number cells of its text columns (asset id, site, …)
// as the spreadsheet shows them with their number format: an id 125 formatted 00000 is
// "00125". The row's own slice is left as it is (a copy is returned when a cell differs).
func (r *Reader) asShown(rr rawRow) []string {
	cells := rr.cells
	copied := false
	for i := range r.specs {
		s := &r.specs[i]
		if !s.known || s.kind != kindText || i >= len(rr.formats) || i >= len(cells) || rr.formats[i] == "" {
			continue
		}
		text := s.shown(cells[i], rr.formats[i], fleet.CellRef{Sheet: r.sheet, Row: rr.row, Col: i + 1})
		if text == cells[i] {
			continue
		}
		if !copied {
			cells = append([]string(nil), cells...)
			copied = true
		}
		cells[i] = text
	}
	return cells
}
