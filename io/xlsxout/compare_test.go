package xlsxout

import (
	"archive/zip"
	"bytes"
	"context"
	"errors"
	"io"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet"
	"hoistfleet/fleet/rules"
	"hoistfleet/io/register"
	"hoistfleet/templates"
)

// demoResults checks a demo register (templates.DemoRegisters) hoist by hoist with the
// given profile; factor > 0 re-rates every hoist (Proposed columns).
func demoResults(t *testing.T, name, profile string, factor float64) (*fleet.Header, *fleet.RunInfo, []*fleet.Result) {
	t.Helper()
	_, files, err := templates.DemoRegisters()
	if err != nil {
		t.Fatal(err)
	}
	src, err := register.NewCSV(bytes.NewReader(files[name]), name)
	if err != nil {
		t.Fatal(err)
	}
	defer src.Close()
	tab, err := rules.Profile(profile)
	if err != nil {
		t.Fatal(err)
	}
	asOf := time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC)
	c, err := fleet.NewChecker(fleet.Options{Rules: tab, MarginalBand: 0.1, AsOf: asOf, RatedLoadFactor: factor})
	if err != nil {
		t.Fatal(err)
	}
	var rs []*fleet.Result
	for i := 0; ; i++ {
		a, err := src.Next(context.Background())
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			t.Fatal(err)
		}
		a.Index = i
		rs = append(rs, c.Check(a))
	}
	if len(rs) == 0 {
		t.Fatalf("%s: no hoists", name)
	}
	info := runInfo()
	info.RatedLoadFactor = factor
	return src.Header(), info, rs
}

// writeNew writes rs with the Writer (Summary and Audit included).
func writeNew(t *testing.T, h *fleet.Header, info *fleet.RunInfo, rs []*fleet.Result, opts Options, maxRows int) []byte {
	t.Helper()
	var buf bytes.Buffer
	w := New(&buf, opts)
	w.maxRows = maxRows
	if err := w.Begin(h, info); err != nil {
		t.Fatal(err)
	}
	s := fleet.NewSummary(10)
	for _, r := range rs {
		if err := w.Write(r); err != nil {
			t.Fatal(err)
		}
		s.Add(r)
	}
	if err := w.End(s, info); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// streamedSheets are the sheets the streamed path writes: Register and every Checks sheet.
func streamedSheets(f *excelize.File) []string {
	var out []string
	for _, s := range f.GetSheetList() {
		if s == SheetRegister || s == SheetChecks || regexp.MustCompile(`^Checks \d+$`).MatchString(s) {
			out = append(out, s)
		}
	}
	return out
}

// cellDump lists every cell of a sheet as excelize reads it back — reference, type,
// style id, raw value, formula — over the rows read and one column and row beyond, and
// the sheet's layout: panes, column widths, header row height, filter.
func cellDump(t *testing.T, f *excelize.File, sheet string) []string {
	t.Helper()
	rows, err := f.GetRows(sheet)
	if err != nil {
		t.Fatal(err)
	}
	nc := 0
	for _, r := range rows {
		nc = max(nc, len(r))
	}
	var out []string
	for r := 1; r <= len(rows)+1; r++ {
		for c := 1; c <= nc+1; c++ {
			ref := cellName(c, r)
			v, err1 := f.GetCellValue(sheet, ref)
			typ, err2 := f.GetCellType(sheet, ref)
			sid, err3 := f.GetCellStyle(sheet, ref)
			fm, err4 := f.GetCellFormula(sheet, ref)
			if err := errors.Join(err1, err2, err3, err4); err != nil {
				t.Fatalf("%s!%s: %v", sheet, ref, err)
			}
			if v == "" && typ == excelize.CellTypeUnset && sid == 0 && fm == "" {
				continue
			}
			out = append(out, ref+"\tt="+strconv.Itoa(int(typ))+"\ts="+strconv.Itoa(sid)+"\tv="+strconv.Quote(v)+"\tf="+strconv.Quote(fm))
		}
	}
	p, err := f.GetPanes(sheet)
	if err != nil {
		t.Fatal(err)
	}
	out = append(out, "panes "+strconv.Quote(strings.Join([]string{strconv.FormatBool(p.Freeze), strconv.Itoa(p.XSplit),
		strconv.Itoa(p.YSplit), p.TopLeftCell, p.ActivePane}, " ")))
	for c := 1; c <= nc+1; c++ {
		wd, err := f.GetColWidth(sheet, cellName(c, 1)[:len(cellName(c, 1))-1])
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, "width "+strconv.Itoa(c)+" "+strconv.FormatFloat(wd, 'g', -1, 64))
	}
	ht, err := f.GetRowHeight(sheet, 1)
	if err != nil {
		t.Fatal(err)
	}
	out = append(out, "height 1 "+strconv.FormatFloat(ht, 'g', -1, 64))
	return out
}

// sheetXML returns a worksheet part of a workbook by sheet name, through the workbook's
// relationships.
func sheetXML(t *testing.T, b []byte, sheet string) string {
	t.Helper()
	parts := zipParts(t, b)
	m, err := sheetParts(func(name string) ([]byte, bool) { s, ok := parts[name]; return []byte(s), ok })
	if err != nil {
		t.Fatal(err)
	}
	part := m[sheet]
	s, ok := parts[part]
	if !ok {
		t.Fatalf("no part %s for sheet %s", part, sheet)
	}
	return s
}

// between returns the part of s from the first from to the end of the first to after it.
func between(s, from, to string) string {
	i := strings.Index(s, from)
	if i < 0 {
		return ""
	}
	j := strings.Index(s[i:], to)
	if j < 0 {
		return ""
	}
	return s[i : i+j+len(to)]
}

// compareStreamed fails unless the streamed sheets of got and want hold the same cells
// (value, type, style id, formula), layout and auto-filter, and byte-identical sheetData.
func compareStreamed(t *testing.T, got, want []byte) {
	t.Helper()
	fg, fw := open(t, got), open(t, want)
	sg, sw := streamedSheets(fg), streamedSheets(fw)
	if strings.Join(sg, ",") != strings.Join(sw, ",") {
		t.Fatalf("streamed sheets %v, want %v", sg, sw)
	}
	for _, sheet := range sg {
		dg, dw := cellDump(t, fg, sheet), cellDump(t, fw, sheet)
		bad := 0
		for i := 0; i < max(len(dg), len(dw)) && bad < 10; i++ {
			var g, w string
			if i < len(dg) {
				g = dg[i]
			}
			if i < len(dw) {
				w = dw[i]
			}
			if g != w {
				t.Errorf("%s: got  %s\n%s: want %s", sheet, g, sheet, w)
				bad++
			}
		}
		xg, xw := sheetXML(t, got, sheet), sheetXML(t, want, sheet)
		if a, b := between(xg, "<sheetData>", "</sheetData>"), between(xw, "<sheetData>", "</sheetData>"); a != b || a == "" {
			t.Errorf("%s: sheetData differs (%d bytes, want %d)", sheet, len(a), len(b))
		}
		re := regexp.MustCompile(`<autoFilter ref="([^"]+)"`)
		if a, b := re.FindStringSubmatch(xg), re.FindStringSubmatch(xw); a == nil || b == nil || a[1] != b[1] {
			t.Errorf("%s: autoFilter %v, want %v", sheet, a, b)
		}
	}
	dn := func(f *excelize.File) string {
		var s []string
		for _, d := range f.GetDefinedName() {
			s = append(s, d.Name+"|"+d.Scope+"|"+d.RefersTo)
		}
		return strings.Join(s, "\n")
	}
	if a, b := dn(fg), dn(fw); a != b {
		t.Errorf("defined names\n%s\nwant\n%s", a, b)
	}
}

// TestSameCellsAsStreamWriter: Register and Checks hold exactly the cells excelize's
// StreamWriter writes (legacyWriter), for the demo registers, the fixture's edge
// cases and a Checks roll-over.
func TestSameCellsAsStreamWriter(t *testing.T) {
	type input struct {
		name    string
		h       *fleet.Header
		info    *fleet.RunInfo
		rs      []*fleet.Result
		maxRows int
	}
	var ins []input
	for _, d := range []struct {
		file, profile string
		factor        float64
	}{{"demo-si.csv", "iso", 0}, {"demo-us.csv", "us", 0}, {"demo-si.csv", "iso", 1.25}} {
		h, info, rs := demoResults(t, d.file, d.profile, d.factor)
		ins = append(ins, input{d.file + "/" + d.profile + "/" + strconv.FormatFloat(d.factor, 'g', -1, 64), h, info, rs, 0})
	}
	ins = append(ins, input{"fixture", header("t", 1000), runInfo(), fixture(), 0},
		input{"synthetic roll-over", header("lb", 0.45359237), runInfo(), synthetic(12), 40})
	for _, in := range ins {
		t.Run(in.name, func(t *testing.T) {
			want, err := legacyBuild(in.h, in.info, in.rs, in.maxRows)
			if err != nil {
				t.Fatal(err)
			}
			got := writeNew(t, in.h, in.info, in.rs, Options{}, in.maxRows)
			compareStreamed(t, got, want)
		})
	}
}

func zipParts(t *testing.T, b []byte) map[string]string {
	t.Helper()
	z, err := zip.NewReader(bytes.NewReader(b), int64(len(b)))
	if err != nil {
		t.Fatal(err)
	}
	parts := map[string]string{}
	for _, zf := range z.File {
		rc, err := zf.Open()
		if err != nil {
			t.Fatal(err)
		}
		data, err := io.ReadAll(rc) // checks the CRC-32 at EOF
		rc.Close()
		if err != nil {
			t.Fatalf("%s: %v", zf.Name, err)
		}
		parts[zf.Name] = string(data)
	}
	return parts
}
