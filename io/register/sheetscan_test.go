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

// TestScanSheetMatchesReference: the first pass finds the same merged cells, formula count
// and first formula cells as the reference pass (refScanSheet), whether it reads the
// sheet from the zip or from memory, with the markers at every offset around a window
// boundary.
func TestScanSheetMatchesReference(t *testing.T) {
	for _, merges := range []bool{false, true} {
		for offset := -24; offset <= 24; offset++ {
			xml := boundarySheet(offset, merges)
			zr := sheetZip(t, xml)
			wm, wf, werr := refScanSheet(zr, "S")
			if werr != nil {
				t.Fatal(werr)
			}
			if len(wm) != 2 || wf.n < 6 {
				t.Fatalf("offset %d: the reference found %v %+v: the test sheet is wrong", offset, wm, wf)
			}
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
				m, f, err := scanSheet(zr, "S", inMemory)
				if err != nil || !reflect.DeepEqual(m, wm) || !reflect.DeepEqual(f, wf) {
					t.Fatalf("merges at boundary %v, offset %d, in memory %v: %v %+v %v, reference %v %+v",
						merges, offset, mem, m, f, err, wm, wf)
				}
			}
		}
	}
}

// TestScanSheetSmallAndEmpty: sheets shorter than a window and than the carried tail.
func TestScanSheetSmallAndEmpty(t *testing.T) {
	for _, xml := range []string{"", "<f>", "<f ", `<c r="A1"><f>1</f></c>`, `<mergeCell ref="A1:B1"/>`, strings.Repeat("x", scanChunk) + "<f>"} {
		zr := sheetZip(t, xml)
		wm, wf, _ := refScanSheet(zr, "S")
		for _, mem := range []bool{false, true} {
			var inMemory func(string) []byte
			if mem {
				inMemory = func(string) []byte { return []byte(xml) }
			}
			m, f, err := scanSheet(zr, "S", inMemory)
			if err != nil || !reflect.DeepEqual(m, wm) || !reflect.DeepEqual(f, wf) {
				t.Fatalf("%.20q in memory %v: %v %+v %v, reference %v %+v", xml, mem, m, f, err, wm, wf)
			}
		}
	}
}
