package register

import (
	"archive/zip"
	"bytes"
	"io"
	"testing"
)

// BenchmarkScanSheet: the first pass over the sheet for merged and formula cells, against
// BenchmarkFloorInflateSheet (unzipping the sheet XML to nowhere) on the same workbook.
func BenchmarkScanSheet(b *testing.B) {
	data := benchXLSX(b)
	zr, err := zip.NewReader(bytes.NewReader(data), int64(len(data)))
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for b.Loop() {
		if _, _, err := scanPart(zr.File[sheetIndex(b, zr)], DefaultLimits); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*benchRows), "ns/row")
}

func BenchmarkFloorInflateSheet(b *testing.B) {
	data := benchXLSX(b)
	zr, err := zip.NewReader(bytes.NewReader(data), int64(len(data)))
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for b.Loop() {
		f, err := zr.Open("xl/worksheets/sheet1.xml")
		if err != nil {
			b.Fatal(err)
		}
		if _, err := io.Copy(io.Discard, f); err != nil {
			b.Fatal(err)
		}
		f.Close()
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*benchRows), "ns/row")
}

// sheetIndex is the index of the first worksheet's zip entry.
func sheetIndex(tb testing.TB, zr *zip.Reader) int {
	for i, f := range zr.File {
		if f.Name == "xl/worksheets/sheet1.xml" {
			return i
		}
	}
	tb.Fatal("no xl/worksheets/sheet1.xml")
	return -1
}
