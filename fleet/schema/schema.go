// Package schema is the register's column schema: each column's key, header, synonyms,
// quantity, default unit, kind, default or need, description and valid range, parsed
// from templates/columns.csv. It is the single source of truth for the parser, the
// blank template, --help and README's column table.
package schema

import (
	"encoding/csv"
	"fmt"
	"strconv"
	"strings"
	"sync"

	"hoistfleet/templates"
)

// Kind is how a column's cells are read.
type Kind string

// Column kinds.
const (
	Text    Kind = "text"
	Number  Kind = "number"
	Integer Kind = "integer"
	Date    Kind = "date"
	Enum    Kind = "enum"
	Bool    Kind = "bool"
)

// Need says what a missing value costs.
type Need string

// Needs.
const (
	NeedID       Need = "id"       // the asset id: a row without it is reported
	NeedRequired Need = "required" // most checks are unchecked without it
	NeedChecks   Need = "checks"   // the checks that use it are unchecked without it
	NeedOptional Need = "optional" // a default applies, or the checks using it are skipped
)

// Column is one row of the schema.
type Column struct {
	Key         string   // stable snake_case key, used in code and JSON
	Header      string   // canonical header text (without unit)
	Synonyms    []string // other header texts the trade uses
	Quantity    string   // physical quantity ("" for text, counts, dates, enums)
	Unit        string   // default unit of the quantity as written in headers
	Kind        Kind
	Need        Need
	Default     string  // "" none; a literal; "rule:KEY" from the rule table; "=KEY" another column
	Min, Max    float64 // valid range in Unit (NaN-free: HasMin/HasMax tell)
	HasMin      bool
	HasMax      bool
	Values      []string // allowed values of an enum or bool column
	Description string
}

// HeaderWithUnit is the header as the template writes it: "Rated load [t]".
func (c Column) HeaderWithUnit(unit string) string {
	if unit == "" {
		unit = c.Unit
	}
	if c.Quantity == "" && c.Unit == "" || unit == "" || unit == "1" {
		return c.Header
	}
	return c.Header + " [" + unit + "]"
}

var (
	schemaOnce  sync.Once
	schema      []Column
	schemaIndex map[string]int // key → position in schema
	schemaErr   error
)

func loadSchema() {
	schema, schemaErr = parseColumns(templates.ColumnsCSV)
	schemaIndex = make(map[string]int, len(schema))
	for i, c := range schema {
		schemaIndex[c.Key] = i
	}
}

// mustSchema loads the embedded schema once.
func mustSchema() {
	schemaOnce.Do(loadSchema)
	if schemaErr != nil {
		panic("schema: embedded templates/columns.csv: " + schemaErr.Error())
	}
}

// ColumnCount is len(Columns()), without the copy.
func ColumnCount() int {
	mustSchema()
	return len(schema)
}

// ColumnIndex returns the position of the column with that key in Columns().
func ColumnIndex(key string) (int, bool) {
	mustSchema()
	i, ok := schemaIndex[key]
	return i, ok
}

// Columns returns the register schema in template order. The embedded table is checked
// by the package tests; a malformed table is a programming error.
func Columns() []Column {
	mustSchema()
	out := make([]Column, len(schema))
	copy(out, schema)
	return out
}

// ColumnByKey returns the column with that key.
func ColumnByKey(key string) (Column, bool) {
	if i, ok := ColumnIndex(key); ok {
		return schema[i], true // schema is loaded by ColumnIndex
	}
	return Column{}, false
}

func parseColumns(text string) ([]Column, error) {
	r := csv.NewReader(strings.NewReader(text))
	recs, err := r.ReadAll()
	if err != nil {
		return nil, err
	}
	if len(recs) < 2 {
		return nil, fmt.Errorf("no columns")
	}
	want := []string{"key", "header", "synonyms", "quantity", "unit", "kind", "need", "default", "min", "max", "values", "description"}
	if strings.Join(recs[0], ",") != strings.Join(want, ",") {
		return nil, fmt.Errorf("header is %q, want %q", recs[0], want)
	}
	split := func(s string) []string {
		if s == "" {
			return nil
		}
		return strings.Split(s, "|")
	}
	var cols []Column
	for i, rec := range recs[1:] {
		c := Column{Key: rec[0], Header: rec[1], Synonyms: split(rec[2]), Quantity: rec[3], Unit: rec[4],
			Kind: Kind(rec[5]), Need: Need(rec[6]), Default: rec[7], Values: split(rec[10]), Description: rec[11]}
		if rec[8] != "" {
			v, err := strconv.ParseFloat(rec[8], 64)
			if err != nil {
				return nil, fmt.Errorf("line %d: min: %w", i+2, err)
			}
			c.Min, c.HasMin = v, true
		}
		if rec[9] != "" {
			v, err := strconv.ParseFloat(rec[9], 64)
			if err != nil {
				return nil, fmt.Errorf("line %d: max: %w", i+2, err)
			}
			c.Max, c.HasMax = v, true
		}
		switch c.Kind {
		case Text, Number, Integer, Date, Enum, Bool:
		default:
			return nil, fmt.Errorf("line %d: unknown kind %q", i+2, c.Kind)
		}
		cols = append(cols, c)
	}
	return cols, nil
}
