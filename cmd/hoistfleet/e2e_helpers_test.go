package main

// Helpers for the end-to-end tests of the command (e2e_*_test.go). They run the command
// in-process through run(ctx, args, Streams), which is what main calls, and read what it
// wrote with libraries independent of the code under test: encoding/csv for the
// registers, encoding/json into plain maps for the JSON lines, excelize and
// archive/zip for the workbook.

import (
	"archive/zip"
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/csv"
	"encoding/hex"
	"encoding/json"
	"html"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"hoistfleet/templates"
)

// cmdResult is one run of the command.
type cmdResult struct {
	code exitCode
	out  string
	err  string
}

// runCmd runs the command with args, standard input stdin, and returns its exit code
// and what it printed.
func runCmd(t *testing.T, stdin string, args ...string) cmdResult {
	t.Helper()
	return runCmdCtx(t, context.Background(), stdin, args...)
}

func runCmdCtx(t *testing.T, ctx context.Context, stdin string, args ...string) cmdResult {
	t.Helper()
	var out, errb bytes.Buffer
	code := run(ctx, args, Streams{In: strings.NewReader(stdin), Out: &out, Err: &errb})
	return cmdResult{code: code, out: out.String(), err: errb.String()}
}

// mustExit fails the test unless the run ended with want.
func (r cmdResult) mustExit(t *testing.T, want exitCode, what string) {
	t.Helper()
	if r.code != want {
		t.Fatalf("%s: exit %d, want %d\nstdout:\n%s\nstderr:\n%s", what, r.code, want, clip(r.out), clip(r.err))
	}
}

func clip(s string) string {
	if len(s) > 3000 {
		return s[:3000] + "\n…"
	}
	return s
}

func sha256File(t *testing.T, path string) string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	s := sha256.Sum256(b)
	return hex.EncodeToString(s[:])
}

// demoFile returns the embedded demo register name (demo-si.csv or demo-us.csv).
func demoFile(t *testing.T, name string) []byte {
	t.Helper()
	_, files, err := templates.DemoRegisters()
	if err != nil {
		t.Fatal(err)
	}
	b, ok := files[name]
	if !ok {
		t.Fatalf("no demo register %s", name)
	}
	return b
}

// writeDemo writes a demo register into dir and returns its path.
func writeDemo(t *testing.T, dir, name string) string {
	t.Helper()
	p := filepath.Join(dir, name)
	if err := os.WriteFile(p, demoFile(t, name), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// copyTestdata copies ../../testdata/NAME into dir, so that no test writes beside the
// repository's own files, and returns the copy's path.
func copyTestdata(t *testing.T, dir, name string) string {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", name))
	if err != nil {
		t.Fatal(err)
	}
	p := filepath.Join(dir, name)
	if err := os.WriteFile(p, b, 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// csvRecords parses a register with encoding/csv: the header and the data records.
// Shape is not enforced (short and long rows are kept).
func csvRecords(t *testing.T, b []byte) (header []string, rows [][]string) {
	t.Helper()
	r := csv.NewReader(bytes.NewReader(b))
	r.FieldsPerRecord = -1
	all, err := r.ReadAll()
	if err != nil {
		t.Fatalf("encoding/csv: %v", err)
	}
	if len(all) == 0 {
		t.Fatal("empty register")
	}
	return all[0], all[1:]
}

// jsonHoist is one line of --format jsonl, decoded into plain maps: the tests look at
// the keys the contract names, not at the writer's structs.
type jsonHoist map[string]any

func parseJSONL(t *testing.T, s string) []jsonHoist {
	t.Helper()
	var out []jsonHoist
	for i, line := range strings.Split(strings.TrimRight(s, "\n"), "\n") {
		if line == "" {
			t.Fatalf("jsonl line %d is empty", i+1)
		}
		var h jsonHoist
		dec := json.NewDecoder(strings.NewReader(line))
		dec.UseNumber()
		if err := dec.Decode(&h); err != nil {
			t.Fatalf("jsonl line %d: %v\n%s", i+1, err, line)
		}
		if dec.More() {
			t.Fatalf("jsonl line %d holds more than one value", i+1)
		}
		out = append(out, h)
	}
	return out
}

func (h jsonHoist) str(key string) string {
	s, _ := h[key].(string)
	return s
}

// num returns a number field; ok is false for null or absence.
func num(v any) (float64, bool) {
	n, ok := v.(json.Number)
	if !ok {
		return math.NaN(), false
	}
	f, err := n.Float64()
	return f, err == nil
}

func (h jsonHoist) checks() []map[string]any {
	arr, _ := h["checks"].([]any)
	out := make([]map[string]any, 0, len(arr))
	for _, c := range arr {
		m, _ := c.(map[string]any)
		out = append(out, m)
	}
	return out
}

func (h jsonHoist) check(id string) map[string]any {
	for _, c := range h.checks() {
		if c["id"] == id {
			return c
		}
	}
	return nil
}

func figures(c map[string]any) map[string]any {
	m, _ := c["figures"].(map[string]any)
	return m
}

// byAsset indexes hoists by asset id (the first of a repeated id).
func byAsset(hs []jsonHoist) map[string]jsonHoist {
	m := map[string]jsonHoist{}
	for _, h := range hs {
		if _, ok := m[h.str("asset_id")]; !ok {
			m[h.str("asset_id")] = h
		}
	}
	return m
}

// openXLSX opens a workbook with excelize.
func openXLSX(t *testing.T, path string) *excelize.File {
	t.Helper()
	f, err := excelize.OpenFile(path)
	if err != nil {
		t.Fatalf("excelize cannot open %s: %v", path, err)
	}
	t.Cleanup(func() { f.Close() })
	return f
}

// sheetRows returns a sheet's rows with raw cell values (numbers as stored, dates as
// serial numbers), each padded to width cells.
func sheetRows(t *testing.T, f *excelize.File, sheet string, width int) [][]string {
	t.Helper()
	rows, err := f.GetRows(sheet, excelize.Options{RawCellValue: true})
	if err != nil {
		t.Fatalf("sheet %s: %v", sheet, err)
	}
	for i := range rows {
		for len(rows[i]) < width {
			rows[i] = append(rows[i], "")
		}
	}
	return rows
}

// colIndex returns the index of the header named name, or -1.
func colIndex(header []string, name string) int {
	for i, h := range header {
		if h == name {
			return i
		}
	}
	return -1
}

// zipFiles returns a workbook's parts by name.
func zipFiles(t *testing.T, path string) map[string][]byte {
	t.Helper()
	zr, err := zip.OpenReader(path)
	if err != nil {
		t.Fatalf("%s is not a zip: %v", path, err)
	}
	defer zr.Close()
	out := map[string][]byte{}
	for _, zf := range zr.File {
		rc, err := zf.Open()
		if err != nil {
			t.Fatal(err)
		}
		var b bytes.Buffer
		if _, err := b.ReadFrom(rc); err != nil {
			t.Fatal(err)
		}
		rc.Close()
		out[zf.Name] = b.Bytes()
	}
	return out
}

var (
	relRe    = regexp.MustCompile(`<Relationship [^>]*>`)
	attrRe   = regexp.MustCompile(`(\w+)="([^"]*)"`)
	sheetRe  = regexp.MustCompile(`<sheet [^>]*>`)
	drawRe   = regexp.MustCompile(`<drawing r:id="([^"]+)"`)
	chartFRe = regexp.MustCompile(`<(?:c:)?val>\s*<(?:c:)?numRef>\s*<(?:c:)?f>([^<]+)</(?:c:)?f>`)
)

func attrs(tag string) map[string]string {
	m := map[string]string{}
	for _, a := range attrRe.FindAllStringSubmatch(tag, -1) {
		m[a[1]] = a[2]
	}
	return m
}

// rels parses a .rels part into id → target, resolved against base (the folder of the
// part the relationships belong to).
func rels(b []byte, base string) map[string]string {
	m := map[string]string{}
	for _, tag := range relRe.FindAllString(string(b), -1) {
		a := attrs(tag)
		target := a["Target"]
		if strings.HasPrefix(target, "/") {
			target = strings.TrimPrefix(target, "/")
		} else {
			target = filepath.ToSlash(filepath.Clean(filepath.Join(base, target)))
		}
		m[a["Id"]] = target
	}
	return m
}

// sheetCharts returns the chart parts drawn on sheet, following workbook.xml → sheet
// part → drawing → charts, as a spreadsheet application does.
func sheetCharts(t *testing.T, parts map[string][]byte, sheet string) []string {
	t.Helper()
	wbRels := rels(parts["xl/_rels/workbook.xml.rels"], "xl")
	var sheetPart string
	for _, tag := range sheetRe.FindAllString(string(parts["xl/workbook.xml"]), -1) {
		a := attrs(tag)
		if a["name"] == sheet {
			sheetPart = wbRels[a["id"]]
		}
	}
	if sheetPart == "" {
		t.Fatalf("workbook.xml has no sheet %q", sheet)
	}
	m := drawRe.FindStringSubmatch(string(parts[sheetPart]))
	if m == nil {
		return nil
	}
	dir, file := filepath.Split(sheetPart)
	sRels := rels(parts[dir+"_rels/"+file+".rels"], strings.TrimSuffix(dir, "/"))
	drawing := sRels[m[1]]
	ddir, dfile := filepath.Split(drawing)
	dRels := rels(parts[ddir+"_rels/"+dfile+".rels"], strings.TrimSuffix(ddir, "/"))
	var charts []string
	for _, target := range dRels {
		if strings.Contains(target, "charts/chart") {
			charts = append(charts, target)
		}
	}
	sort.Strings(charts)
	return charts
}

// rangeNumbers returns the numeric values of the cells a chart reference such as
// 'Summary'!$B$5:$D$7 points to.
func rangeNumbers(t *testing.T, f *excelize.File, ref string) []float64 {
	t.Helper()
	ref = html.UnescapeString(ref)
	i := strings.LastIndex(ref, "!")
	if i < 0 {
		t.Fatalf("chart reference %q has no sheet", ref)
	}
	sheet := strings.Trim(ref[:i], "'")
	cells := strings.Split(strings.ReplaceAll(ref[i+1:], "$", ""), ":")
	c1, r1, err := excelize.CellNameToCoordinates(cells[0])
	if err != nil {
		t.Fatalf("chart reference %q: %v", ref, err)
	}
	c2, r2 := c1, r1
	if len(cells) == 2 {
		if c2, r2, err = excelize.CellNameToCoordinates(cells[1]); err != nil {
			t.Fatalf("chart reference %q: %v", ref, err)
		}
	}
	var out []float64
	for r := r1; r <= r2; r++ {
		for c := c1; c <= c2; c++ {
			name, _ := excelize.CoordinatesToCellName(c, r)
			v, err := f.GetCellValue(sheet, name, excelize.Options{RawCellValue: true})
			if err != nil {
				t.Fatalf("chart reference %q: %v", ref, err)
			}
			if x, err := strconv.ParseFloat(v, 64); err == nil {
				out = append(out, x)
			}
		}
	}
	return out
}

// listDir returns the names in dir, sorted.
func listDir(t *testing.T, dir string) []string {
	t.Helper()
	es, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range es {
		names = append(names, e.Name())
	}
	sort.Strings(names)
	return names
}

// normSpace collapses runs of white space, so wrapped text compares with its source.
func normSpace(s string) string { return strings.Join(strings.Fields(s), " ") }
