package register

import (
	"bytes"
	"context"
	"encoding/csv"
	"fmt"
	"io"
	"strconv"
	"testing"

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
)

const benchRows = 20000

// benchRegister returns a 40-column register (the first 40 schema columns, values inside
// each column's range) as a header and rows of cells; dates are ISO text in CSV and
// serials in XLSX.
func benchRegister(xlsx bool) ([]string, [][]any) {
	cols := schema.Columns()[:40]
	header := make([]string, len(cols))
	for i, c := range cols {
		header[i] = c.HeaderWithUnit("")
	}
	rows := make([][]any, benchRows)
	for r := range rows {
		row := make([]any, len(cols))
		for i, c := range cols {
			switch c.Kind {
			case schema.Number, schema.Integer:
				x := 1.0
				switch {
				case c.HasMin && c.HasMax:
					x = (c.Min + c.Max) / 2
				case c.HasMin:
					x = c.Min + 1 + float64(r%7)
				}
				if c.Kind == schema.Integer {
					x = float64(int(x))
				}
				row[i] = x
			case schema.Date:
				if xlsx {
					row[i] = 45000 + r%400
				} else {
					row[i] = "2023-05-17"
				}
			case schema.Enum:
				row[i] = c.Values[r%len(c.Values)]
			case schema.Bool:
				row[i] = "yes"
			default:
				row[i] = fmt.Sprintf("%s %d", c.Key, r)
			}
		}
		rows[r] = row
	}
	return header, rows
}

func benchCSV(b *testing.B) []byte {
	b.Helper()
	header, rows := benchRegister(false)
	var buf bytes.Buffer
	w := csv.NewWriter(&buf)
	_ = w.Write(header)
	rec := make([]string, len(header))
	for _, row := range rows {
		for i, v := range row {
			switch x := v.(type) {
			case float64:
				rec[i] = strconv.FormatFloat(x, 'g', -1, 64)
			default:
				rec[i] = fmt.Sprint(x)
			}
		}
		_ = w.Write(rec)
	}
	w.Flush()
	return buf.Bytes()
}

func benchXLSX(b *testing.B) []byte {
	b.Helper()
	header, rows := benchRegister(true)
	f := excelize.NewFile()
	defer f.Close()
	_ = f.SetSheetDimension("Sheet1", "")
	sw, err := f.NewStreamWriter("Sheet1")
	if err != nil {
		b.Fatal(err)
	}
	h := make([]any, len(header))
	for i, s := range header {
		h[i] = s
	}
	if err := sw.SetRow("A1", h); err != nil {
		b.Fatal(err)
	}
	for r, row := range rows {
		cell, _ := excelize.CoordinatesToCellName(1, r+2)
		if err := sw.SetRow(cell, row); err != nil {
			b.Fatal(err)
		}
	}
	if err := sw.Flush(); err != nil {
		b.Fatal(err)
	}
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		b.Fatal(err)
	}
	return buf.Bytes()
}

func drain(b *testing.B, r *Reader) {
	b.Helper()
	n := 0
	for {
		_, err := r.Next(context.Background())
		if err == io.EOF {
			break
		}
		if err != nil {
			b.Fatal(err)
		}
		n++
	}
	if n != benchRows {
		b.Fatalf("%d rows", n)
	}
}

// openBenchCSV returns a reader of the benchmark register, its header checked.
func openBenchCSV(b *testing.B, data []byte) *Reader {
	r, err := NewCSV(bytes.NewReader(data), "bench.csv")
	if err != nil {
		b.Fatal(err)
	}
	if len(r.Header().Problems) != 0 {
		b.Fatal(r.Header().Problems)
	}
	return r
}

func BenchmarkReadCSV(b *testing.B) {
	data := benchCSV(b)
	b.SetBytes(int64(len(data)))
	b.ResetTimer()
	for b.Loop() {
		drain(b, openBenchCSV(b, data))
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*benchRows), "ns/row")
}

// BenchmarkReadCSVRecycled is BenchmarkReadCSV on the path the command takes: every
// Asset is handed back (Recycle) some rows later, as fleet.Run does once a result is
// written, so rows are built in reused memory.
func BenchmarkReadCSVRecycled(b *testing.B) {
	data := benchCSV(b)
	const lag = 64 // Assets in flight, as in fleet.Run's reorder buffer
	b.SetBytes(int64(len(data)))
	b.ResetTimer()
	for b.Loop() {
		r := openBenchCSV(b, data)
		var ring [lag]*fleet.Asset
		n := 0
		for ; ; n++ {
			a, err := r.Next(context.Background())
			if err == io.EOF {
				break
			}
			if err != nil {
				b.Fatal(err)
			}
			r.Recycle(ring[n%lag])
			ring[n%lag] = a
		}
		if n != benchRows {
			b.Fatalf("%d rows", n)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*benchRows), "ns/row")
}

// BenchmarkFloorCSV is the floor: encoding/csv reading every field, no parsing.
func BenchmarkFloorCSV(b *testing.B) {
	data := benchCSV(b)
	b.SetBytes(int64(len(data)))
	b.ResetTimer()
	for b.Loop() {
		cr := csv.NewReader(bytes.NewReader(data))
		cr.ReuseRecord = true
		n := 0
		for {
			rec, err := cr.Read()
			if err == io.EOF {
				break
			}
			if err != nil {
				b.Fatal(err)
			}
			n += len(rec)
		}
		if n != 40*(benchRows+1) {
			b.Fatal(n)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*benchRows), "ns/row")
}

func BenchmarkReadXLSX(b *testing.B) {
	data := benchXLSX(b)
	b.SetBytes(int64(len(data)))
	b.ResetTimer()
	for b.Loop() {
		r, err := NewXLSX(bytes.NewReader(data), "bench.xlsx", "")
		if err != nil {
			b.Fatal(err)
		}
		if len(r.Header().Problems) != 0 {
			b.Fatal(r.Header().Problems)
		}
		drain(b, r)
		_ = r.Close()
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*benchRows), "ns/row")
}

// BenchmarkFloorXLSX is the floor: excelize's Rows iterator in raw mode reading every cell.
func BenchmarkFloorXLSX(b *testing.B) {
	data := benchXLSX(b)
	b.SetBytes(int64(len(data)))
	b.ResetTimer()
	for b.Loop() {
		f, err := excelize.OpenReader(bytes.NewReader(data), excelize.Options{RawCellValue: true})
		if err != nil {
			b.Fatal(err)
		}
		rows, err := f.Rows("Sheet1")
		if err != nil {
			b.Fatal(err)
		}
		n := 0
		for rows.Next() {
			cells, err := rows.Columns()
			if err != nil {
				b.Fatal(err)
			}
			n += len(cells)
		}
		_ = rows.Close()
		_ = f.Close()
		if n != 40*(benchRows+1) {
			b.Fatal(n)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*benchRows), "ns/row")
}

// BenchmarkFloorAssetShape is the floor the exported fleet.Asset sets on any reader: per
// row, the Cells slice and the Values slice holding one Value per known column, nothing
// parsed (compare its ns/row with BenchmarkReadCSV's).
func BenchmarkFloorAssetShape(b *testing.B) {
	header, _ := benchRegister(false)
	r := &Reader{sheet: "bench.csv"}
	if err := r.buildHeader("bench.csv", header, 1); err != nil {
		b.Fatal(err)
	}
	var sink *fleet.Asset
	b.ResetTimer()
	for b.Loop() {
		for row := range benchRows {
			a := &fleet.Asset{Index: row, Row: row + 2, Cells: make([]fleet.Cell, len(r.specs)), Values: fleet.NewValues()}
			for i := range r.specs {
				a.Cells[i].Text = header[i]
				if s := &r.specs[i]; s.known {
					a.Values[s.field] = fleet.Value{State: fleet.OK, Raw: header[i], Cell: fleet.CellRef{Sheet: r.sheet, Row: row + 2, Col: i + 1}}
				}
			}
			sink = a
		}
	}
	_ = sink
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*benchRows), "ns/row")
}
