package register

import (
	"bytes"
	"context"
	"encoding/csv"
	"errors"
	"io"
	"math"
	"strconv"
	"strings"
	"testing"

	"hoistfleet/calc/approx"
	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
)

// FuzzParseCell: the cell parser never panics; a Bad value always carries a located,
// typed error; an OK number is finite and reads back from its own formatting.
func FuzzParseCell(f *testing.F) {
	for _, s := range []string{"12.5", "12,5", "1,250", "twelve", "M5", "1Am", "L2", "0.5", "2024-02-29", "45292", "yes", "95%", "#DIV/0!", "1e308", "-0", " 7 "} {
		f.Add(s, uint8(0), false, false)
		f.Add(s, uint8(6), true, true)
	}
	cols := schema.Columns()
	f.Fuzz(func(t *testing.T, raw string, pick uint8, comma, xlsx bool) {
		col := cols[int(pick)%len(cols)]
		r := &Reader{sheet: "R"}
		if err := r.buildHeader("f", []string{col.HeaderWithUnit("")}, 1); err != nil {
			t.Fatal(err)
		}
		s := &r.specs[0]
		if !s.known {
			t.Fatalf("schema header %q not matched", col.HeaderWithUnit(""))
		}
		d := dialect{decimalComma: comma, xlsx: xlsx}
		ref := fleet.CellRef{Sheet: "R", Row: 2, Col: 1}
		v, c := s.parse(raw, d, ref, "A-1")
		if c.Text != raw || v.Raw != raw || v.Cell != ref {
			t.Fatalf("cell as given lost: %+v %+v", c, v)
		}
		switch v.State {
		case fleet.Empty:
			if t2 := strings.TrimSpace(raw); t2 != "" && !s.blankMarker(t2) {
				t.Fatalf("%q read as empty", raw)
			}
		case fleet.Bad:
			if v.Err == nil || v.Err.Cell != ref || v.Err.Field != col.Key || v.Err.Asset != "A-1" || v.Err.Err == nil || v.Err.Error() == "" {
				t.Fatalf("Bad without a located error: %+v", v.Err)
			}
		case fleet.OK:
			if col.Kind == schema.Number || col.Kind == schema.Integer {
				if math.IsNaN(v.Num) || math.IsInf(v.Num, 0) {
					t.Fatalf("%q → %v", raw, v.Num)
				}
				// Round trip: the value in the column's unit, formatted, reads back.
				back := strconv.FormatFloat(v.Num/s.factor, 'g', -1, 64)
				v2, _ := s.parse(back, dialect{}, ref, "A-1")
				if v2.State != fleet.OK || !approx.Equal(v2.Num, v.Num, 1e-300, 1e-12) {
					t.Fatalf("%q → %v → %q → %+v", raw, v.Num, back, v2)
				}
			}
			if col.Kind == schema.Enum || col.Kind == schema.Bool {
				allowed := col.Values
				if col.Kind == schema.Bool {
					allowed = []string{"yes", "no"}
				}
				found := false
				for _, a := range allowed {
					found = found || a == v.Text
				}
				if !found {
					t.Fatalf("%q → %q, not an allowed value", raw, v.Text)
				}
			}
		}
	})
}

// FuzzCSV: the CSV reader never panics and never loses or invents a row: it returns one
// Asset per record encoding/csv sees after the header, or a clear error.
func FuzzCSV(f *testing.F) {
	for _, s := range []string{
		"Asset ID,Rated load [t]\nH-1,5\n",
		"Asset ID;Rated load [t]\nH-1;12,5\n;\n",
		"\xef\xbb\xbfAsset ID,Site\nH-1,S\xfcd\n",
		"\xff\xfeA\x00,\x00B\x00\n\x001\x00,\x002\x00\n\x00",
		"a,b\n\"x\ny\",2\nbad\"quote,3\n\"open,4\n",
		"Asset ID\n\n\nH-1\nH-1\n",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, b []byte) {
		r, err := NewCSV(bytes.NewReader(b), "f.csv")
		if err != nil {
			var fe *fleet.Error
			if !errors.As(err, &fe) || !strings.HasPrefix(err.Error(), "f.csv: ") {
				t.Fatalf("unclear error %T %v", err, err)
			}
			return
		}
		n, ncol, lastRow := 0, len(r.Header().Columns), 0
		for {
			a, err := r.Next(context.Background())
			if err == io.EOF {
				break
			}
			if err != nil {
				t.Fatalf("Next: %v", err)
			}
			if a.Index != n || len(a.Cells) != ncol || a.Row < lastRow {
				t.Fatalf("asset %d: index %d, %d cells for %d columns, row %d after %d", n, a.Index, len(a.Cells), ncol, a.Row, lastRow)
			}
			lastRow = a.Row
			n++
		}
		// The oracle: encoding/csv on the same decoded text, same separator.
		text, sep, _, err := csvStream(bytes.NewReader(b))
		if err != nil {
			t.Fatal(err)
		}
		cr := csv.NewReader(text)
		cr.Comma, cr.FieldsPerRecord = sep, -1
		records := 0
		for {
			_, err := cr.Read()
			var pe *csv.ParseError
			if err == io.EOF || (err != nil && !errors.As(err, &pe)) {
				break
			}
			records++
		}
		// Every record is a hoist or a row the reader says it left out (the header and
		// what is above it, blank, totals and repeated header rows).
		if n+r.RowsLeftOut() != records {
			t.Fatalf("%d assets and %d rows left out for %d records", n, r.RowsLeftOut(), records)
		}
	})
}
