// Package bench_test measures hoistfleet end to end (register reader → fleet.Run →
// results writer) against library floors measured on the same register in the same run:
//
//   - inflate floor: archive/zip reading xl/worksheets/sheet1.xml to io.Discard;
//   - excelize floor: excelize Rows() reading every cell raw (RawCellValue), and the
//     same loop writing every cell to a StreamWriter and saving the workbook;
//   - encoding/csv floor: reading every record and writing it back out.
//
// It lives outside package fleet because the readers and writers under io/ import fleet.
// The register comes from cmd/hoistgen (built once into a temporary directory), or from
// the files named by HOISTFLEET_BENCH_CSV and HOISTFLEET_BENCH_XLSX. HOISTFLEET_BENCH_ROWS
// sets the generated size (default 2000).
//
//	go test ./fleet/bench -run '^$' -bench . -benchtime 3x
package bench_test

import (
	"archive/zip"
	"bytes"
	"context"
	"encoding/csv"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet"
	"hoistfleet/fleet/rules"
	"hoistfleet/io/baseline"
	"hoistfleet/io/csvout"
	"hoistfleet/io/jsonout"
	"hoistfleet/io/register"
	"hoistfleet/io/xlsxout"
)

// asOf matches hoistgen's default --as-of, so inspection dates are realistic.
var asOf = time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC)

var (
	tmpDir   string
	regOnce  sync.Once
	regErr   error
	regRows  int
	csvData  []byte
	xlsxData []byte
)

func TestMain(m *testing.M) {
	code := m.Run()
	if tmpDir != "" {
		os.RemoveAll(tmpDir)
	}
	os.Exit(code)
}

// registers returns the CSV and XLSX registers (the same hoists) and their row count.
func registers(b *testing.B) (csvReg, xlsxReg []byte, rows int) {
	b.Helper()
	regOnce.Do(func() { regErr = loadRegisters() })
	if regErr != nil {
		b.Skip("no register: ", regErr)
	}
	return csvData, xlsxData, regRows
}

func loadRegisters() error {
	csvPath, xlsxPath := os.Getenv("HOISTFLEET_BENCH_CSV"), os.Getenv("HOISTFLEET_BENCH_XLSX")
	if csvPath == "" || xlsxPath == "" {
		rows := 2000
		if s := os.Getenv("HOISTFLEET_BENCH_ROWS"); s != "" {
			n, err := strconv.Atoi(s)
			if err != nil || n < 1 {
				return fmt.Errorf("HOISTFLEET_BENCH_ROWS=%q: want a positive integer", s)
			}
			rows = n
		}
		var err error
		tmpDir, err = os.MkdirTemp("", "hoistfleet-bench-")
		if err != nil {
			return err
		}
		gen := filepath.Join(tmpDir, "hoistgen")
		build := exec.Command("go", "build", "-o", gen, "hoistfleet/cmd/hoistgen")
		if out, err := build.CombinedOutput(); err != nil {
			return fmt.Errorf("building hoistgen: %v\n%s", err, out)
		}
		csvPath, xlsxPath = filepath.Join(tmpDir, "register.csv"), filepath.Join(tmpDir, "register.xlsx")
		for _, p := range []string{csvPath, xlsxPath} {
			cmd := exec.Command(gen, "-n", strconv.Itoa(rows), "-seed", "1", "-o", p)
			if out, err := cmd.CombinedOutput(); err != nil {
				return fmt.Errorf("hoistgen: %v\n%s", err, out)
			}
		}
	}
	var err error
	if csvData, err = os.ReadFile(csvPath); err != nil {
		return err
	}
	if xlsxData, err = os.ReadFile(xlsxPath); err != nil {
		return err
	}
	// Count the data rows of the CSV (the XLSX holds the same hoists).
	r := csv.NewReader(bytes.NewReader(csvData))
	r.ReuseRecord = true
	r.FieldsPerRecord = -1
	n := -1
	for {
		_, err := r.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return fmt.Errorf("counting rows: %w", err)
		}
		n++
	}
	regRows = n
	return nil
}

// countingWriter discards what it is given and counts it.
type countingWriter struct{ n int64 }

func (w *countingWriter) Write(p []byte) (int, error) { w.n += int64(len(p)); return len(p), nil }

func report(b *testing.B, rows int, outBytes int64) {
	b.ReportMetric(float64(rows)*float64(b.N)/b.Elapsed().Seconds(), "rows/s")
	if outBytes > 0 {
		b.ReportMetric(float64(outBytes), "out-bytes")
	}
}

func newChecker(b *testing.B) *fleet.Checker {
	tab, err := rules.Profile("iso")
	if err != nil {
		b.Fatal(err)
	}
	c, err := fleet.NewChecker(fleet.Options{Rules: tab, MarginalBand: 0.10, AsOf: asOf})
	if err != nil {
		b.Fatal(err)
	}
	return c
}

func runInfo(name string) *fleet.RunInfo {
	return &fleet.RunInfo{Tool: "hoistfleet", Version: "bench", Command: "bench", Input: name, Profile: "iso",
		AsOf: asOf, Started: time.Now(), Finished: time.Now(), MarginalBand: 0.10, Cautions: []string{fleet.Caution}}
}

// run is one end-to-end run: read, check, write; it returns the bytes written.
func run(b *testing.B, c *fleet.Checker, src *register.Reader, newSink func(io.Writer) fleet.Sink, name string) int64 {
	b.Helper()
	defer src.Close()
	out := &countingWriter{}
	s, err := fleet.Run(context.Background(), src, newSink(out), c, runInfo(name), nil)
	if err != nil {
		b.Fatal(err)
	}
	if s.Total == 0 {
		b.Fatal("no rows")
	}
	return out.n
}

func xlsxSink(w io.Writer) fleet.Sink  { return xlsxout.New(w, xlsxout.Options{}) }
func csvSink(w io.Writer) fleet.Sink   { return csvout.New(w, csvout.Options{}) }
func jsonlSink(w io.Writer) fleet.Sink { return jsonout.New(w, jsonout.Options{}) }

// ---- floors -------------------------------------------------------------------------

// BenchmarkFloorInflateXLSX: unzip the sheet XML and throw it away (the `unzip -p`
// floor): nothing that reads the workbook can be faster.
func BenchmarkFloorInflateXLSX(b *testing.B) {
	_, x, rows := registers(b)
	var n int64
	for b.Loop() {
		zr, err := zip.NewReader(bytes.NewReader(x), int64(len(x)))
		if err != nil {
			b.Fatal(err)
		}
		f, err := zr.Open("xl/worksheets/sheet1.xml")
		if err != nil {
			b.Fatal(err)
		}
		if n, err = io.Copy(io.Discard, f); err != nil {
			b.Fatal(err)
		}
		f.Close()
	}
	b.ReportMetric(float64(n), "xml-bytes")
	report(b, rows, 0)
}

// excelizeRead reads every cell of the first sheet raw and calls row for each row.
func excelizeRead(b *testing.B, x []byte, row func(i int, cells []string)) {
	f, err := excelize.OpenReader(bytes.NewReader(x), excelize.Options{RawCellValue: true})
	if err != nil {
		b.Fatal(err)
	}
	defer f.Close()
	rs, err := f.Rows(f.GetSheetName(0))
	if err != nil {
		b.Fatal(err)
	}
	i := 0
	for rs.Next() {
		cells, err := rs.Columns(excelize.Options{RawCellValue: true})
		if err != nil {
			b.Fatal(err)
		}
		row(i, cells)
		i++
	}
	if err := rs.Close(); err != nil {
		b.Fatal(err)
	}
}

// BenchmarkFloorExcelizeRead: excelize's streaming row reader, every cell, raw.
func BenchmarkFloorExcelizeRead(b *testing.B) {
	_, x, rows := registers(b)
	for b.Loop() {
		cells := 0
		excelizeRead(b, x, func(_ int, c []string) { cells += len(c) })
		if cells == 0 {
			b.Fatal("no cells")
		}
	}
	report(b, rows, 0)
}

// BenchmarkFloorExcelizeReadWrite: the library floor for XLSX → XLSX: read every cell
// raw and write it (a number as a number) to a StreamWriter, then save the workbook.
func BenchmarkFloorExcelizeReadWrite(b *testing.B) {
	_, x, rows := registers(b)
	var outBytes int64
	for b.Loop() {
		out := excelize.NewFile()
		if err := out.SetSheetDimension("Sheet1", ""); err != nil {
			b.Fatal(err)
		}
		sw, err := out.NewStreamWriter("Sheet1")
		if err != nil {
			b.Fatal(err)
		}
		var vals []any
		excelizeRead(b, x, func(i int, cells []string) {
			vals = vals[:0]
			for _, c := range cells {
				if v, err := strconv.ParseFloat(c, 64); err == nil {
					vals = append(vals, v)
				} else {
					vals = append(vals, c)
				}
			}
			cell, _ := excelize.CoordinatesToCellName(1, i+1)
			if err := sw.SetRow(cell, vals); err != nil {
				b.Fatal(err)
			}
		})
		if err := sw.Flush(); err != nil {
			b.Fatal(err)
		}
		w := &countingWriter{}
		if _, err := out.WriteTo(w); err != nil {
			b.Fatal(err)
		}
		out.Close()
		outBytes = w.n
	}
	report(b, rows, outBytes)
}

// BenchmarkFloorCSV: encoding/csv reading every record and writing it back.
func BenchmarkFloorCSV(b *testing.B) {
	c, _, rows := registers(b)
	var outBytes int64
	for b.Loop() {
		r := csv.NewReader(bytes.NewReader(c))
		r.ReuseRecord = true
		w := &countingWriter{}
		cw := csv.NewWriter(w)
		for {
			rec, err := r.Read()
			if err == io.EOF {
				break
			}
			if err != nil {
				b.Fatal(err)
			}
			if err := cw.Write(rec); err != nil {
				b.Fatal(err)
			}
		}
		cw.Flush()
		outBytes = w.n
	}
	report(b, rows, outBytes)
}

// ---- ours ---------------------------------------------------------------------------

// BenchmarkReadXLSX: our register reader alone (unit conversion, validation), every row.
func BenchmarkReadXLSX(b *testing.B) {
	_, x, rows := registers(b)
	for b.Loop() {
		readAll(b, func() (*register.Reader, error) { return register.NewXLSX(bytes.NewReader(x), "register.xlsx", "") })
	}
	report(b, rows, 0)
}

// BenchmarkReadCSV: our register reader alone on the CSV.
func BenchmarkReadCSV(b *testing.B) {
	c, _, rows := registers(b)
	for b.Loop() {
		readAll(b, func() (*register.Reader, error) { return register.NewCSV(bytes.NewReader(c), "register.csv") })
	}
	report(b, rows, 0)
}

func readAll(b *testing.B, open func() (*register.Reader, error)) []*fleet.Asset {
	src, err := open()
	if err != nil {
		b.Fatal(err)
	}
	defer src.Close()
	var all []*fleet.Asset
	for {
		a, err := src.Next(context.Background())
		if err == io.EOF {
			return all
		}
		if err != nil {
			b.Fatal(err)
		}
		all = append(all, a)
	}
}

// sliceSource replays assets already read.
type sliceSource struct {
	h   *fleet.Header
	all []*fleet.Asset
	i   int
}

func (s *sliceSource) Header() *fleet.Header { return s.h }
func (s *sliceSource) Close() error          { return nil }
func (s *sliceSource) Next(ctx context.Context) (*fleet.Asset, error) {
	if s.i == len(s.all) {
		return nil, io.EOF
	}
	s.i++
	return s.all[s.i-1], nil
}

// discardSink takes results and drops them.
type discardSink struct{}

func (discardSink) Begin(*fleet.Header, *fleet.RunInfo) error { return nil }
func (discardSink) Prepare(*fleet.Result)                     {}
func (discardSink) Write(*fleet.Result) error                 { return nil }
func (discardSink) End(*fleet.Summary, *fleet.RunInfo) error  { return nil }
func (discardSink) Abort()                                    {}

// BenchmarkRunCheckOnly: fleet.Run over rows already in memory, results discarded: the
// checking and the pipeline, without reading or writing.
func BenchmarkRunCheckOnly(b *testing.B) {
	c, _, rows := registers(b)
	src, err := register.NewCSV(bytes.NewReader(c), "register.csv")
	if err != nil {
		b.Fatal(err)
	}
	h := src.Header()
	src.Close()
	all := readAll(b, func() (*register.Reader, error) { return register.NewCSV(bytes.NewReader(c), "register.csv") })
	chk := newChecker(b)
	for b.Loop() {
		if _, err := fleet.Run(context.Background(), &sliceSource{h: h, all: all}, discardSink{}, chk, runInfo("register.csv"), nil); err != nil {
			b.Fatal(err)
		}
	}
	report(b, rows, 0)
}

// BenchmarkRunXLSXToXLSX: the whole `hoistfleet check register.xlsx` job in memory.
func BenchmarkRunXLSXToXLSX(b *testing.B) {
	_, x, rows := registers(b)
	chk := newChecker(b)
	var n int64
	for b.Loop() {
		src, err := register.NewXLSX(bytes.NewReader(x), "register.xlsx", "")
		if err != nil {
			b.Fatal(err)
		}
		n = run(b, chk, src, xlsxSink, "register.xlsx")
	}
	report(b, rows, n)
}

// BenchmarkRunXLSXToJSONL: the XLSX reader and the checks, with the cheapest writer.
func BenchmarkRunXLSXToJSONL(b *testing.B) {
	_, x, rows := registers(b)
	chk := newChecker(b)
	var n int64
	for b.Loop() {
		src, err := register.NewXLSX(bytes.NewReader(x), "register.xlsx", "")
		if err != nil {
			b.Fatal(err)
		}
		n = run(b, chk, src, jsonlSink, "register.xlsx")
	}
	report(b, rows, n)
}

// BenchmarkRunCSVToCSV: `hoistfleet check register.csv --format csv` in memory.
func BenchmarkRunCSVToCSV(b *testing.B) {
	c, _, rows := registers(b)
	chk := newChecker(b)
	var n int64
	for b.Loop() {
		src, err := register.NewCSV(bytes.NewReader(c), "register.csv")
		if err != nil {
			b.Fatal(err)
		}
		n = run(b, chk, src, csvSink, "register.csv")
	}
	report(b, rows, n)
}

// BenchmarkRunCSVToJSONL: `hoistfleet check register.csv --format jsonl` in memory.
func BenchmarkRunCSVToJSONL(b *testing.B) {
	c, _, rows := registers(b)
	chk := newChecker(b)
	var n int64
	for b.Loop() {
		src, err := register.NewCSV(bytes.NewReader(c), "register.csv")
		if err != nil {
			b.Fatal(err)
		}
		n = run(b, chk, src, jsonlSink, "register.csv")
	}
	report(b, rows, n)
}

// TestRegisterFloorsAgree is a smoke test of the benchmark inputs: the CSV and XLSX
// registers hold the same number of rows, read by our reader and by excelize.
func TestRegisterFloorsAgree(t *testing.T) {
	if testing.Short() {
		t.Skip("builds hoistgen")
	}
	regOnce.Do(func() { regErr = loadRegisters() })
	if regErr != nil {
		if strings.Contains(regErr.Error(), "executable file not found") {
			t.Skip(regErr)
		}
		t.Fatal(regErr)
	}
	f, err := excelize.OpenReader(bytes.NewReader(xlsxData), excelize.Options{RawCellValue: true})
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rs, err := f.Rows(f.GetSheetName(0))
	if err != nil {
		t.Fatal(err)
	}
	n := -1
	for rs.Next() {
		n++
	}
	if n != regRows {
		t.Errorf("XLSX has %d data rows, CSV %d", n, regRows)
	}
	src, err := register.NewXLSX(bytes.NewReader(xlsxData), "register.xlsx", "")
	if err != nil {
		t.Fatal(err)
	}
	defer src.Close()
	got := 0
	for {
		_, err := src.Next(context.Background())
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatal(err)
		}
		got++
	}
	if got != regRows {
		t.Errorf("register.NewXLSX read %d rows, want %d", got, regRows)
	}
}

// BenchmarkCheckEach: Checker.Check on each generated hoist in turn, on one goroutine,
// without the pipeline: the checks' own cost per hoist (ns/op is per hoist).
func BenchmarkCheckEach(b *testing.B) {
	c, _, _ := registers(b)
	all := readAll(b, func() (*register.Reader, error) { return register.NewCSV(bytes.NewReader(c), "register.csv") })
	chk := newChecker(b)
	b.ReportAllocs()
	i := 0
	for b.Loop() {
		if r := chk.Check(all[i]); r == nil {
			b.Fatal("nil result")
		}
		if i++; i == len(all) {
			i = 0
		}
	}
}

// BenchmarkRunCSVToJSONLBaseline is BenchmarkRunCSVToJSONL against a baseline: the
// register's own JSON lines, read back by io/baseline (check --baseline): the cost of
// comparing every hoist and of the change objects, measured as a ratio to
// BenchmarkRunCSVToJSONL in the same run.
func BenchmarkRunCSVToJSONLBaseline(b *testing.B) {
	c, _, rows := registers(b)
	src, err := register.NewCSV(bytes.NewReader(c), "register.csv")
	if err != nil {
		b.Fatal(err)
	}
	var prev bytes.Buffer
	if _, err := fleet.Run(context.Background(), src, jsonlSink(&prev), newChecker(b), runInfo("register.csv"), nil); err != nil {
		b.Fatal(err)
	}
	src.Close()
	p := filepath.Join(b.TempDir(), "previous.jsonl")
	if err := os.WriteFile(p, prev.Bytes(), 0o644); err != nil {
		b.Fatal(err)
	}
	bl, err := baseline.Read(p)
	if err != nil {
		b.Fatal(err)
	}
	tab, err := rules.Profile("iso")
	if err != nil {
		b.Fatal(err)
	}
	chk, err := fleet.NewChecker(fleet.Options{Rules: tab, MarginalBand: 0.10, AsOf: asOf, Baseline: bl})
	if err != nil {
		b.Fatal(err)
	}
	var n int64
	for b.Loop() {
		src, err := register.NewCSV(bytes.NewReader(c), "register.csv")
		if err != nil {
			b.Fatal(err)
		}
		n = run(b, chk, src, jsonlSink, "register.csv")
	}
	report(b, rows, n)
}
