package register

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strings"

	"hoistfleet/fleet/schema"
	"hoistfleet/io/units"
)

// ColumnMap is a columns file (--columns FILE): for a register layout the trade synonyms
// do not cover, it says which register column is which of ours, and optionally the unit
// its values are in and the order of its dates. Insurers keep one per client. It is a
// CSV file whose first row names its columns:
//
//	register column,column,unit,date order
//	Kran-Nr.,asset_id,,
//	Tragfähigkeit,Rated load,t,
//	Letzte Prüfung,last_inspection,,dmy
//	Bemerkung,ignore,,
//
// "register column" is the register's header text (compared ignoring case, spacing and
// punctuation, with or without the unit written in it); "column" is one of ours, by key
// or header (hoistfleet columns lists them), or "ignore" to pass the column through
// unread whatever its title; "unit" (optional) is the unit of a column whose header
// gives none (a header that gives another unit is refused, not overridden); "date order"
// (optional) is dmy, mdy or ymd for a date column. A columns file entry wins over the
// synonyms.
type ColumnMap struct {
	File    string
	entries map[string]*mapEntry // by units.Normalize of the register's title
	order   []*mapEntry
}

// mapEntry is one row of a columns file.
type mapEntry struct {
	line  int
	title string // the register's header text, as the file writes it
	key   string // our column; "" to ignore the register's column
	unit  string
	dates DateOrder
	used  bool
}

// where is the entry's place in the file, for messages: "map.csv line 3".
func (e *mapEntry) where(file string) string { return fmt.Sprintf("%s line %d", file, e.line) }

// mapHeaders are the columns file's own column titles (lower case) and what each is.
var mapHeaders = map[string]string{
	"register column": "title", "register header": "title", "register": "title",
	"column": "key", "hoistfleet column": "key", "our column": "key",
	"unit": "unit", "date order": "dates",
}

// ReadColumnMap reads a columns file named name from r. Every row is checked: an unknown
// column of ours, a unit not of the column's quantity, a date order on a column that is
// no date, or one register column named twice is an error naming the file and line.
func ReadColumnMap(name string, r io.Reader) (*ColumnMap, error) {
	cr := csv.NewReader(r)
	cr.FieldsPerRecord = -1
	cr.TrimLeadingSpace = true
	m := &ColumnMap{File: name, entries: map[string]*mapEntry{}}
	head, err := cr.Read()
	if err == io.EOF {
		return nil, fmt.Errorf("%s: the columns file is empty: its first row is 'register column,column,unit,date order'", name)
	}
	if err != nil {
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	at := map[string]int{}
	for i, h := range head {
		h = strings.ToLower(strings.TrimSpace(strings.TrimPrefix(h, "\ufeff")))
		if f, ok := mapHeaders[h]; ok {
			at[f] = i + 1
		} else if h != "" {
			return nil, fmt.Errorf("%s line 1: %q is not a columns-file column: the first row is 'register column,column,unit,date order' (unit and date order optional)", name, head[i])
		}
	}
	if at["title"] == 0 || at["key"] == 0 {
		return nil, fmt.Errorf("%s line 1: the first row must name 'register column' and 'column' (and optionally 'unit', 'date order'); got %q", name, strings.Join(head, ","))
	}
	field := func(rec []string, f string) string {
		if i := at[f]; i > 0 && i <= len(rec) {
			return strings.TrimSpace(rec[i-1])
		}
		return ""
	}
	keyTaken := map[string]*mapEntry{}
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		line, _ := cr.FieldPos(0)
		if err != nil {
			return nil, fmt.Errorf("%s: %w", name, err)
		}
		e := &mapEntry{line: line, title: field(rec, "title")}
		ours := field(rec, "key")
		if e.title == "" && ours == "" {
			continue // a blank row
		}
		loc := e.where(name)
		if e.title == "" {
			return nil, fmt.Errorf("%s: no register column given for %q", loc, ours)
		}
		n := units.Normalize(e.title)
		if prev, ok := m.entries[n]; ok {
			return nil, fmt.Errorf("%s: register column %q is already mapped on line %d", loc, e.title, prev.line)
		}
		var col schema.Column
		switch strings.ToLower(ours) {
		case "ignore", "-", "none":
		case "":
			return nil, fmt.Errorf("%s: no column of ours given for %q: write one of ours (hoistfleet columns lists them) or 'ignore'", loc, e.title)
		default:
			c, ok := ourColumn(ours)
			if !ok {
				return nil, fmt.Errorf("%s: %q is not one of hoistfleet's columns: write its key or header as 'hoistfleet help columns' lists them (rated_load or Rated load), or 'ignore'", loc, ours)
			}
			if prev, ok := keyTaken[c.Key]; ok {
				return nil, fmt.Errorf("%s: %s is already given by register column %q on line %d", loc, c.Header, prev.title, prev.line)
			}
			col, e.key = c, c.Key
			keyTaken[c.Key] = e
		}
		if u := field(rec, "unit"); u != "" {
			switch {
			case e.key == "":
				return nil, fmt.Errorf("%s: a unit (%q) for a column that is ignored", loc, u)
			case col.Quantity == "":
				return nil, fmt.Errorf("%s: %s takes no unit (got %q)", loc, col.Header, u)
			}
			if _, err := units.Factor(col.Quantity, u); err != nil {
				return nil, fmt.Errorf("%s: %s: %v", loc, col.Header, err)
			}
			e.unit = u
		}
		if d := field(rec, "dates"); d != "" {
			o, err := ParseDateOrder(d)
			if err != nil {
				return nil, fmt.Errorf("%s: %v", loc, err)
			}
			if e.key == "" || col.Kind != schema.Date {
				return nil, fmt.Errorf("%s: a date order (%q) for a column that holds no dates", loc, d)
			}
			e.dates = o
		}
		m.entries[n] = e
		m.order = append(m.order, e)
	}
	if len(m.order) == 0 {
		return nil, errors.New(name + ": the columns file maps no column")
	}
	return m, nil
}

// ourColumn finds one of our columns by key or header (ignoring case and spacing).
func ourColumn(s string) (schema.Column, bool) {
	if c, ok := schema.ColumnByKey(strings.TrimSpace(s)); ok {
		return c, true
	}
	n := units.Normalize(s)
	for _, c := range schema.Columns() {
		if units.Normalize(c.Header) == n || units.Normalize(c.Key) == n {
			return c, true
		}
	}
	return schema.Column{}, false
}

// lookup is the entry for a register header cell: its whole text, or its title without
// the unit written in it. nil for none (and on a nil map).
func (m *ColumnMap) lookup(raw string) *mapEntry {
	if m == nil {
		return nil
	}
	if e := m.entries[units.Normalize(raw)]; e != nil {
		return e
	}
	if title, _, err := units.SplitHeader(raw); err == nil && title != "" {
		return m.entries[units.Normalize(title)]
	}
	return nil
}

// unused are the entries no register column matched, for a note.
func (m *ColumnMap) unused() []*mapEntry {
	var out []*mapEntry
	if m != nil {
		for _, e := range m.order {
			if !e.used {
				out = append(out, e)
			}
		}
	}
	return out
}
