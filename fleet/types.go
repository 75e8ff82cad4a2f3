// Package fleet is hoistfleet's domain and batch pipeline: the Asset read from a
// register row, the Result of checking it, the one error type that locates every
// problem, and the pipeline that reads, checks in a bounded worker pool and writes in
// register order. Readers and writers (packages under io/) import fleet; fleet imports
// calc and templates only.
package fleet

import (
	"encoding/json"
	"fmt"
	"strings"
	"time"

	"hoistfleet/fleet/schema"
)

// Status is a check's or a hoist's verdict.
type Status int

// Statuses. Do not reorder: the order of the first five is the precedence of a hoist's
// overall status (a higher value is worse); Info never counts.
const (
	StatusPass Status = iota
	StatusMarginal
	StatusUnchecked
	StatusError
	StatusFail
	StatusInfo
)

var statusNames = [...]string{"pass", "marginal", "unchecked", "error", "fail", "info"}

func (s Status) String() string {
	if int(s) < len(statusNames) {
		return statusNames[s]
	}
	return fmt.Sprintf("Status(%d)", int(s))
}

// ParseStatus reads a status word.
func ParseStatus(s string) (Status, bool) {
	for i, n := range statusNames {
		if n == s {
			return Status(i), true
		}
	}
	return 0, false
}

// MarshalJSON writes the status word.
func (s Status) MarshalJSON() ([]byte, error) { return json.Marshal(s.String()) }

// Worse reports whether s ranks above t in fail > error > unchecked > marginal > pass.
// Info ranks below pass.
func (s Status) Worse(t Status) bool { return s.rank() > t.rank() }

func (s Status) rank() int {
	if s == StatusInfo {
		return -1
	}
	return int(s)
}

// Statuses lists the statuses a hoist can have, worst first.
var Statuses = []Status{StatusFail, StatusError, StatusUnchecked, StatusMarginal, StatusPass}

// Kind classifies an Error.
type Kind int

// Error kinds. New kinds go at the end.
const (
	Other         Kind = iota
	Invalid            // a cell that cannot be read as what its column holds
	Missing            // a required value is absent
	OutOfRange         // a value outside its column's range or a formula's validity
	Calc               // a calculation could not be completed
	IO                 // a file could not be read or written
	Internal           // a broken invariant: a bug
	Duplicate          // a duplicated asset id
	Shape              // a row of a different shape, an empty row
	HeaderProblem      // a cell unusable because its column's header is (an unknown unit, say)
	Implausible        // a value implausible beside the hoist's others: a unit slip, most likely
	Unitless           // a number in a column whose unit is written nowhere: not read, the checks needing it unchecked
	Conflict           // rows that contradict each other: a crane id at two sites
)

var kindNames = [...]string{"error", "invalid", "missing", "out of range", "calculation error", "I/O error", "internal error", "duplicate", "row shape", "header problem", "implausible value", "no unit", "conflict"}

func (k Kind) String() string {
	if int(k) < len(kindNames) {
		return kindNames[k]
	}
	return fmt.Sprintf("Kind(%d)", int(k))
}

// CellRef locates a cell: Sheet!C14. Row and Col are 1-based; Col 0 means the whole row,
// Row 0 means no row (the file or sheet). For a CSV register Sheet is the file's base name.
type CellRef struct {
	Sheet string
	Row   int
	Col   int
}

func (c CellRef) String() string {
	switch {
	case c.Row == 0 && c.Col == 0:
		return c.Sheet
	case c.Col == 0:
		return fmt.Sprintf("%s!%d:%d", c.Sheet, c.Row, c.Row)
	case c.Row == 0:
		name := ColumnName(c.Col) // "" outside 1..16384: "Sheet!:"
		return fmt.Sprintf("%s!%s:%s", c.Sheet, name, name)
	}
	name, ok := CellName(c.Col, c.Row)
	if !ok {
		return fmt.Sprintf("%s!R%dC%d", c.Sheet, c.Row, c.Col)
	}
	return c.Sheet + "!" + name
}

// IsZero reports whether the reference is unset.
func (c CellRef) IsZero() bool { return c == CellRef{} }

// Error is every problem hoistfleet reports, located where it can be. Only the fields
// that are set are printed, in the order cell, asset, op, message:
//
//	Register!F14: asset H-042: not a number in [t]: "twelve"
type Error struct {
	Op    string  // the operation, e.g. "calc.BrakeStop" (optional)
	Kind  Kind    //
	Asset string  // asset id (optional)
	Cell  CellRef // where (optional)
	Field string  // schema key of the column (optional)
	Err   error   // the underlying problem
}

func (e *Error) Error() string {
	var parts []string
	if !e.Cell.IsZero() {
		parts = append(parts, e.Cell.String())
	}
	if e.Asset != "" {
		parts = append(parts, "asset "+e.Asset)
	}
	if e.Op != "" {
		parts = append(parts, e.Op)
	}
	if e.Err != nil {
		parts = append(parts, e.Err.Error())
	} else {
		parts = append(parts, e.Kind.String())
	}
	return strings.Join(parts, ": ")
}

// Unwrap returns the underlying error.
func (e *Error) Unwrap() error { return e.Err }

// ValueState says what a register cell held.
type ValueState int

// Value states.
const (
	Empty ValueState = iota // blank cell or column absent
	OK                      // read and converted
	Bad                     // present but unreadable: Err says why
)

// Value is one schema field of one register row, converted to SI.
type Value struct {
	State ValueState
	Num   float64   // number and integer kinds, in SI (kg, N, m, s, W, N m, kg m², m/s, m/s²); s); angles stay in degrees, rotational speed in rev/min; a % becomes a ratio (160 % → 1.6)
	Text  string    // text, enum (canonical lower-case value) and bool ("yes"/"no") kinds
	Date  time.Time // date kind (UTC midnight)
	Raw   string    // the cell as read, for messages
	Cell  CellRef
	Err   *Error // set when State == Bad
}

// Column describes one column of the register as read.
type Column struct {
	Index int    // 0-based position in the row
	Title string // header text as written
	Key   string // schema key, "" for a column the schema does not know (passed through)
	Unit  string // unit as written in the header ("" when none)
	// Factor converts the column's unit to the SI value in Value.Num (SI = cell × Factor);
	// 1 when there is no unit. Writers use it to show results in the register's own units.
	Factor float64
	// UnitFrom is "columns file" when Unit came from a columns file (--columns), ""
	// when it came from the header or a units row under it.
	UnitFrom string
	// Mapped is where a columns file names the column ("map.csv line 3"), "" when the
	// header was matched by the synonyms.
	Mapped string
}

// DisplayTitle is the column's header as the results show it: as written, with the unit
// added in brackets when the register gave it elsewhere (a units row under the header),
// so that no value stands without its unit.
func (c Column) DisplayTitle() string {
	if c.Unit == "" || c.Unit == "1" || strings.Contains(c.Title, "["+c.Unit+"]") || strings.Contains(c.Title, "("+c.Unit+")") {
		return c.Title
	}
	return c.Title + " [" + c.Unit + "]"
}

// Header is the register's header row as read.
type Header struct {
	File    string // input name as given (base name for display)
	Sheet   string // sheet name, or the CSV file's base name
	Row     int    // the header's spreadsheet row (1 unless title rows are above it)
	Columns []Column
	// Problems are header-level messages (an unknown unit, a duplicated column): they
	// make the affected fields Bad in every row. Notes of kind Other say how the register
	// was read (rows left out, a units row, blank markers, date orders); a Source may
	// add them while it reads, until the end.
	Problems []*Error
}

// Cell is one register cell as given, for pass-through to the output.
type Cell struct {
	Text     string // the cell's text (raw value: a number as written, a date as ISO or serial)
	IsNumber bool   // the cell is numeric (XLSX numeric cell, or a CSV field that is a plain number)
	IsDate   bool   // a date column's cell, Date holds it
	Date     time.Time
}

// Asset is one register row.
type Asset struct {
	Index int    // 0-based position among data rows (output order)
	Row   int    // spreadsheet row number (header = 1)
	ID    string // asset id ("" when missing)
	Cells []Cell // every cell as given, aligned with Header.Columns (padded to its length)
	// Values are the schema fields, converted: Values[i] is the field of
	// schema.Columns()[i] (NewValues makes the slice); a short or nil slice reads as
	// Empty. Readers fill Values; Fields is the older keyed form, read when Values is nil.
	Values []Value
	Fields map[string]Value
	// Problems are row-level messages: a duplicated id, a short or long row, an empty row.
	Problems []*Error
	// Sheet is the sheet the row is on, set when several sheets are read as one register
	// (--sheet all); "" otherwise.
	Sheet  string
	Blank  bool // the row has no values at all (kept and reported, not checked)
	Hidden bool // the register row is hidden or filtered out (checked all the same)
}

// Get returns a field's value (Empty when absent).
func (a *Asset) Get(key string) Value {
	if a.Values != nil {
		if i, ok := schema.ColumnIndex(key); ok && i < len(a.Values) {
			return a.Values[i]
		}
		return Value{}
	}
	if a.Fields == nil {
		return Value{}
	}
	return a.Fields[key]
}

// at returns the field of schema column i, whose key is key, without copying it; nil
// when absent (Empty).
func (a *Asset) at(i int, key string) *Value {
	if a.Values != nil {
		if i < len(a.Values) {
			return &a.Values[i]
		}
		return nil
	}
	if v, ok := a.Fields[key]; ok {
		return &v
	}
	return nil
}

// Set stores a field's value by schema key (in Values, made when nil); a key outside the
// schema is an error.
func (a *Asset) Set(key string, v Value) error {
	i, ok := schema.ColumnIndex(key)
	if !ok {
		return fmt.Errorf("fleet: %q is not a schema key", key)
	}
	if a.Values == nil {
		a.Values = NewValues()
	}
	a.Values[i] = v
	return nil
}

// NewValues returns an all-Empty Values slice, one entry per schema column.
func NewValues() []Value { return make([]Value, schema.ColumnCount()) }
