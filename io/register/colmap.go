package register

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strconv"
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
	b, err := io.ReadAll(io.LimitReader(r, maxColumnsFile+1))
	if err != nil {
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	if len(b) > maxColumnsFile {
		return nil, fmt.Errorf("%s: larger than %d bytes: a columns file has a row per register column", name, maxColumnsFile)
	}
	b = bytes.TrimPrefix(b, []byte("\ufeff")) // a spreadsheet's UTF-8 mark
	cr := csv.NewReader(bytes.NewReader(b))
	// A spreadsheet set to a comma decimal separator saves CSV with semicolons: the
	// first line says which (it names the file's columns, so it holds the separator).
	if first, _, _ := bytes.Cut(b, []byte("\n")); bytes.Count(first, []byte(";")) > bytes.Count(first, []byte(",")) {
		cr.Comma = ';'
	}
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
		h = strings.ToLower(strings.TrimSpace(h))
		if f, ok := mapHeaders[h]; ok {
			at[f] = i + 1
		} else if h != "" {
			return nil, fmt.Errorf("%s line 1: %q is not a columns-file column: the first row is 'register column,column,unit,date order' (unit and date order optional)", name, head[i])
		}
	}
	// Every entry is checked, and every fault reported at once (up to maxMapErrors).
	var errs []string
	fault := func(format string, a ...any) {
		if len(errs) < maxMapErrors {
			errs = append(errs, fmt.Sprintf(format, a...))
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
			fault("%s: %v", name, err)
			if _, ok := err.(*csv.ParseError); ok {
				continue
			}
			break
		}
		e := &mapEntry{line: line, title: field(rec, "title")}
		ours := field(rec, "key")
		if e.title == "" && ours == "" {
			continue // a blank row
		}
		loc := e.where(name)
		if e.title == "" {
			fault("%s: no register column given for %q", loc, ours)
			continue
		}
		n := units.Normalize(e.title)
		if prev, ok := m.entries[n]; ok {
			fault("%s: register column %q is already mapped on line %d", loc, e.title, prev.line)
			continue
		}
		var col schema.Column
		switch strings.ToLower(ours) {
		case "ignore", "-", "none":
		case "":
			fault("%s: no column of ours given for %q: write one of ours (hoistfleet columns lists them) or 'ignore'", loc, e.title)
			continue
		default:
			c, ok := ourColumn(ours)
			if !ok {
				fault("%s: %q is not one of hoistfleet's columns: write its key or header as 'hoistfleet help columns' lists them (rated_load or Rated load), or 'ignore'", loc, ours)
				continue
			}
			if prev, ok := keyTaken[c.Key]; ok {
				fault("%s: %s is already given by register column %q on line %d", loc, c.Header, prev.title, prev.line)
				continue
			}
			col, e.key = c, c.Key
			keyTaken[c.Key] = e
		}
		if u := field(rec, "unit"); u != "" {
			switch {
			case e.key == "":
				fault("%s: a unit (%q) for a column that is ignored", loc, u)
				continue
			case col.Quantity == "" && col.Unit == "":
				fault("%s: %s takes no unit (got %q)", loc, col.Header, u)
				continue
			case col.Quantity == "" && !countUnit(col.Unit, u):
				// A count in a fixed unit (an interval in months).
				fault("%s: %s is in %s, not %q", loc, col.Header, col.Unit, u)
				continue
			case col.Quantity != "":
				if _, err := units.Factor(col.Quantity, u); err != nil {
					fault("%s: %s: %v", loc, col.Header, err)
					continue
				}
			}
			e.unit = u
		}
		if d := field(rec, "dates"); d != "" {
			o, err := ParseDateOrder(d)
			if err != nil {
				fault("%s: %v", loc, err)
				continue
			}
			if e.key == "" || col.Kind != schema.Date {
				fault("%s: a date order (%q) for %q, a column that holds no dates", loc, d, e.title)
				continue
			}
			e.dates = o
		}
		m.entries[n] = e
		m.order = append(m.order, e)
	}
	if len(errs) > 0 {
		more := ""
		if len(errs) == maxMapErrors {
			more = "\n(the first " + strconv.Itoa(maxMapErrors) + " faults; correct them and run again for any more)"
		}
		return nil, errors.New(strings.Join(errs, "\n") + more)
	}
	if len(m.order) == 0 {
		return nil, errors.New(name + ": the columns file maps no column")
	}
	return m, nil
}

// maxColumnsFile is the largest columns file read (a row per register column), and
// maxMapErrors the most faults it reports at once.
const (
	maxColumnsFile = 1 << 20
	maxMapErrors   = 20
)

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
