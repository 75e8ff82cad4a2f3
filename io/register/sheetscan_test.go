package register

import (
	"archive/zip"
	"bytes"
	"fmt"
	"io"
	"reflect"
	"strings"
	"testing"
)

// sheetZip is a minimal workbook zip holding one sheet "S" with the given XML.
func sheetZip(t testing.TB, sheet string) *zip.Reader {
	t.Helper()
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	for name, body := range map[string]string{
		"xl/workbook.xml":            `<workbook xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships"><sheets><sheet name="S" sheetId="1" r:id="rId1"/></sheets></workbook>`,
		"xl/_rels/workbook.xml.rels": `<Relationships><Relationship Id="rId1" Target="worksheets/sheet1.xml"/></Relationships>`,
		"xl/worksheets/sheet1.xml":   sheet,
	} {
		w, err := zw.Create(name)
		if err != nil {
			t.Fatal(err)
		}
		_, _ = io.WriteString(w, body)
	}
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	zr, err := zip.NewReader(bytes.NewReader(buf.Bytes()), int64(buf.Len()))
	if err != nil {
		t.Fatal(err)
	}
	return zr
}

// boundarySheet is a sheet XML whose marker (formula cells, or the merged cells) starts
// at offset from the first window boundary, after six formula cells of both kinds.
func boundarySheet(offset int, mergesAtBoundary bool) string {
	var b strings.Builder
	b.WriteString(`<worksheet><sheetData><row r="1">`)
	for i, f := range []string{`<f>1</f>`, `<f t="shared" si="0">2</f>`, `<f>3</f>`, `<f t="shared" si="0"/>`, `<f>5</f>`, `<f ca="1">6</f>`} {
		fmt.Fprintf(&b, `<c r="%c2">%s<v>%d</v></c>`, 'A'+i, f, i)
	}
	b.WriteString(`</row>`)
	for b.Len() < scanChunk+offset-40 {
		b.WriteString(`<row r="3"><c r="A3"><v>1</v></c></row>`)
	}
	for b.Len() < scanChunk+offset {
		b.WriteByte(' ')
	}
	if !mergesAtBoundary {
		b.WriteString(`<f>7</f><f t="shared">8</f><c r="Z9"><f>9</f></c>`)
		for range 3000 {
			b.WriteString(`<row r="4"><c r="A4"><f>x</f><v>1</v></c><c r="B4"><f ref="B4">y</f></c></row>`)
		}
	}
	b.WriteString(`</sheetData><mergeCells count="2"><mergeCell ref="A5:A7"/><mergeCell ref="C5:D5"/></mergeCells></worksheet>`)
	return b.String()
}

// The merged cells and formula cells of the boundary sheets as the first pass of commit
// f7400a6 found them (its verbatim copy, refScanSheet, was the oracle of these tests up
// to commit 555520e). Its first formula cells are in the order it searched a window,
// every "<f>" before every "<f ", and a "<f>" outside a cell counts for the cell before
// it: when the whole "<f>" of "<f>7</f>" lies in the first window (offset <= -3) the
// list holds it, as A3.
var boundaryMerges = []mergeRange{{ref: "A5:A7", r1: 5, c1: 1, r2: 7, c2: 1}, {ref: "C5:D5", r1: 5, c1: 3, r2: 5, c2: 4}}

func boundaryFormulas(offset int, mergesAtBoundary bool) formulaCells {
	switch {
	case mergesAtBoundary:
		return formulaCells{n: 6, first: []string{"A2", "C2", "E2", "B2", "D2"}}
	case offset <= -3:
		return formulaCells{n: 6009, first: []string{"A2", "C2", "E2", "A3", "B2"}}
	}
	return formulaCells{n: 6009, first: []string{"A2", "C2", "E2", "B2", "D2"}}
}

// TestScanSheetMatchesReference: the first pass finds the merged cells, formula count
// and first formula cells the reference pass found (boundaryFormulas), whether it reads
// the sheet from the zip or from memory, with the markers at every offset around a
// window boundary.
func TestScanSheetMatchesReference(t *testing.T) {
	for _, merges := range []bool{false, true} {
		for offset := -24; offset <= 24; offset++ {
			xml := boundarySheet(offset, merges)
			zr := sheetZip(t, xml)
			wm, wf := boundaryMerges, boundaryFormulas(offset, merges)
			for _, mem := range []bool{false, true} {
				var inMemory func(string) []byte
				if mem {
					inMemory = func(part string) []byte {
						if part != "xl/worksheets/sheet1.xml" {
							t.Fatalf("part %q", part)
						}
						return []byte(xml)
					}
				}
				m, f, err := scanTest(t, zr, inMemory)
				if err != nil || !reflect.DeepEqual(m, wm) || !sameFormulaCount(f, wf) {
					t.Fatalf("merges at boundary %v, offset %d, in memory %v: %v %+v %v, reference %v %+v",
						merges, offset, mem, m, f, err, wm, wf)
				}
			}
		}
	}
}

// TestScanSheetSmallAndEmpty: sheets shorter than a window and than the carried tail
// give what the reference pass gave (nil where it returned nil).
func TestScanSheetSmallAndEmpty(t *testing.T) {
	for _, tc := range []struct {
		xml string
		wm  []mergeRange
		wf  formulaCells
	}{
		{"", nil, formulaCells{}},
		{"<f>", nil, formulaCells{n: 1}},
		{"<f ", nil, formulaCells{n: 1}},
		{`<c r="A1"><f>1</f></c>`, nil, formulaCells{n: 1, first: []string{"A1"}}},
		{`<mergeCell ref="A1:B1"/>`, []mergeRange{{ref: "A1:B1", r1: 1, c1: 1, r2: 1, c2: 2}}, formulaCells{}},
		{strings.Repeat("x", scanChunk) + "<f>", nil, formulaCells{n: 1}},
	} {
		xml, wm, wf := tc.xml, tc.wm, tc.wf
		zr := sheetZip(t, xml)
		for _, mem := range []bool{false, true} {
			var inMemory func(string) []byte
			if mem {
				inMemory = func(string) []byte { return []byte(xml) }
			}
			m, f, err := scanTest(t, zr, inMemory)
			if err != nil || !reflect.DeepEqual(m, wm) || !sameFormulaCount(f, wf) {
				t.Fatalf("%.20q in memory %v: %v %+v %v, reference %v %+v", xml, mem, m, f, err, wm, wf)
			}
		}
	}
}

// sameFormulaCount compares what the reference scan finds: the formula count and the
// first references (the hidden columns and totals rows are tested on their own).
func sameFormulaCount(f, ref formulaCells) bool {
	return f.n == ref.n && reflect.DeepEqual(f.first, ref.first)
}

// scanTest is the first pass over the test zip's sheet, from the zip or, with inMemory,
// from the bytes it gives.
func scanTest(t *testing.T, zr *zip.Reader, inMemory func(string) []byte) ([]mergeRange, formulaCells, error) {
	zf := zr.File[sheetIndex(t, zr)]
	if inMemory != nil {
		m, f := scanSheetBytes(inMemory(zf.Name))
		return m, f, nil
	}
	return scanPart(zf, DefaultLimits)
}
