package register

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"fmt"
	"io"
	"strings"
	"testing"
)

// BenchmarkRecords reads the benchmark register's records (20 000 rows of 40 fields, no
// quotes) with records, the reader's cut-down fork of encoding/csv, and with encoding/csv
// set up as records reads (FieldsPerRecord -1, ReuseRecord): the fork's doc comment
// quotes the ratio.
func BenchmarkRecords(b *testing.B) {
	data := benchCSV(b)
	count := func(b *testing.B, n int) {
		if n != benchRows+1 {
			b.Fatalf("%d records", n)
		}
	}
	b.Run("records", func(b *testing.B) {
		b.SetBytes(int64(len(data)))
		for b.Loop() {
			r := newRecords(bufio.NewReader(bytes.NewReader(data)), ',')
			n := 0
			for {
				if _, err := r.read(); err == io.EOF {
					break
				} else if err != nil {
					b.Fatal(err)
				}
				n++
			}
			count(b, n)
		}
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*benchRows), "ns/row")
	})
	b.Run("encoding-csv", func(b *testing.B) {
		b.SetBytes(int64(len(data)))
		for b.Loop() {
			cr := csv.NewReader(bufio.NewReader(bytes.NewReader(data)))
			cr.FieldsPerRecord, cr.ReuseRecord = -1, true
			n := 0
			for {
				if _, err := cr.Read(); err == io.EOF {
					break
				} else if err != nil {
					b.Fatal(err)
				}
				n++
			}
			count(b, n)
		}
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*benchRows), "ns/row")
	})
}

// BenchmarkIDSet adds 100 000 distinct asset ids, each a substring of its row as the
// reader has it, to an idSet and to the plain alternative, a map from a copy of the id
// (a substring would keep its whole record alive) to its row: the idSet's doc comment
// quotes the ratio.
func BenchmarkIDSet(b *testing.B) {
	const n = 100000
	rows := make([]string, n)
	for i := range rows {
		rows[i] = fmt.Sprintf("HST-%06d,Site %d,Bay %d,Winch hoist", i*7919%1000003, i%13, i%40)
	}
	id := func(row string) string { return row[:strings.IndexByte(row, ',')] }
	b.Run("idSet", func(b *testing.B) {
		for b.Loop() {
			s := newIDSet()
			for i, r := range rows {
				if _, seen := s.first(id(r), i+2); seen {
					b.Fatal("duplicate")
				}
			}
		}
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*n), "ns/id")
	})
	b.Run("map", func(b *testing.B) {
		for b.Loop() {
			m := map[string]int{}
			for i, r := range rows {
				k := id(r)
				if _, seen := m[k]; seen {
					b.Fatal("duplicate")
				}
				m[strings.Clone(k)] = i + 2
			}
		}
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*n), "ns/id")
	})
}
