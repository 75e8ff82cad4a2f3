package register

import (
	"bytes"
	"compress/gzip"
	"context"
	"flag"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
	"hoistfleet/io/register/regdump"
	"hoistfleet/templates"
)

// The golden dumps in testdata/golden are every field of every Asset (and the Header)
// that the reader of commit f7400a6 (without the per-row speed-ups) returns for the
// registers below, written by it with -update-golden. TestGoldenDumps compares the
// current reader against them, so a faster path that changes a single message, state,
// number bit or cell flag fails.
var updateGolden = flag.Bool("update-golden", false, "rewrite testdata/golden from the current reader")

var (
	goldenOnce sync.Once
	goldenIn   map[string]goldenInput
)

// goldenInputs returns the registers the dumps are made of: name → (file bytes, is XLSX).
// They are made once (the workbooks take a while under -race) and shared: the tests only
// read them.
func goldenInputs(t testing.TB) map[string]goldenInput {
	t.Helper()
	goldenOnce.Do(func() { goldenIn = makeGoldenInputs(t) })
	if goldenIn == nil {
		t.Fatal("the golden inputs could not be made: see the first test that asked for them")
	}
	return goldenIn
}

func makeGoldenInputs(t testing.TB) map[string]goldenInput {
	t.Helper()
	in := map[string]goldenInput{}
	names, demo, err := templates.DemoRegisters()
	if err != nil {
		t.Fatal(err)
	}
	for _, n := range names {
		in["demo/"+n] = goldenInput{data: demo[n]}
		in["demo/"+strings.TrimSuffix(n, ".csv")+".xlsx"] = goldenInput{data: csvToXLSX(t, demo[n]), xlsx: true}
	}
	for _, dir := range []string{"../../testdata", "testdata"} {
		files, err := filepath.Glob(filepath.Join(dir, "*.csv"))
		if err != nil {
			t.Fatal(err)
		}
		for _, f := range files {
			b, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			in["files/"+filepath.Base(f)] = goldenInput{data: b}
		}
	}
	header, rows := generatedRegister(1, 150)
	in["generated/comma.csv"] = goldenInput{data: generatedCSV(header, rows, ',')}
	in["generated/semicolon.csv"] = goldenInput{data: generatedCSV(header, rows, ';')}
	in["generated/register.xlsx"] = goldenInput{data: generatedXLSX(t, header, rows), xlsx: true}
	return in
}

type goldenInput struct {
	data []byte
	xlsx bool
}

func TestGoldenDumps(t *testing.T) {
	for name, in := range goldenInputs(t) {
		t.Run(name, func(t *testing.T) {
			got := dumpRegister(t, name, in)
			file := filepath.Join("testdata", "golden", strings.NewReplacer("/", "_", ".", "_").Replace(name)+".txt.gz")
			if *updateGolden {
				writeGz(t, file, got)
				return
			}
			sameDump(t, got, readGz(t, file), "")
		})
	}
}

// sameDump fails the test at the first line where two dumps differ (how says in what
// circumstance the first was made).
func sameDump(t testing.TB, got, want, how string) {
	t.Helper()
	if got == want {
		return
	}
	g, w := strings.Split(got, "\n"), strings.Split(want, "\n")
	for i := range min(len(g), len(w)) {
		if g[i] != w[i] {
			t.Fatalf("line %d differs%s:\n got  %s\n want %s", i+1, how, g[i], w[i])
		}
	}
	t.Fatalf("%d lines%s, want %d", len(g), how, len(w))
}

// TestRecycledAssetsMatchGolden: Assets built in recycled memory (each handed back as
// soon as it is read, so each row reuses the previous row's Asset, Values and Cells) are
// the same as fresh ones: nothing of an earlier row survives into a later one.
func TestRecycledAssetsMatchGolden(t *testing.T) {
	for name, in := range goldenInputs(t) {
		t.Run(name, func(t *testing.T) {
			sameDump(t, dumpRegisterWith(t, name, in, true), dumpRegister(t, name, in), " with recycling")
		})
	}
}

func writeGz(t testing.TB, file, s string) {
	t.Helper()
	var buf bytes.Buffer
	zw, _ := gzip.NewWriterLevel(&buf, gzip.BestCompression)
	_, _ = zw.Write([]byte(s))
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	if err := os.MkdirAll(filepath.Dir(file), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(file, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
}

func readGz(t testing.TB, file string) string {
	t.Helper()
	b, err := os.ReadFile(file)
	if err != nil {
		t.Fatalf("%v (run the test with -update-golden on the reference reader)", err)
	}
	zr, err := gzip.NewReader(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	out, err := io.ReadAll(zr)
	if err != nil {
		t.Fatal(err)
	}
	return string(out)
}

// freshDumps holds dumpRegister's dumps of the golden inputs (by name), which
// TestGoldenDumps and TestRecycledAssetsMatchGolden both compare: each is made once.
var freshDumps sync.Map

// dumpRegister reads a golden input and writes every field of its header and assets.
func dumpRegister(t testing.TB, name string, in goldenInput) string {
	t.Helper()
	if d, ok := freshDumps.Load(name); ok {
		return d.(string)
	}
	d := dumpRegisterWith(t, name, in, false)
	freshDumps.Store(name, d)
	return d
}

// dumpRegisterWith dumps a register; with recycle, each Asset is handed back to the
// Reader (Recycle) as soon as it is dumped, so every later row reuses its memory.
func dumpRegisterWith(t testing.TB, name string, in goldenInput, recycle bool) string {
	t.Helper()
	var r *Reader
	var err error
	if in.xlsx {
		r, err = NewXLSX(bytes.NewReader(in.data), name, "")
	} else {
		r, err = NewCSV(bytes.NewReader(in.data), name)
	}
	var b strings.Builder
	if err != nil {
		fmt.Fprintf(&b, "open error: %v\n", err)
		return b.String()
	}
	defer r.Close()
	var recycleFn func(*fleet.Asset)
	if recycle {
		recycleFn = r.Recycle
	}
	regdump.Read(&b, r, recycleFn, Sentinels())
	return b.String()
}

func dumpAsset(b *strings.Builder, a *fleet.Asset) { regdump.Asset(b, a, Sentinels()) }

func dumpErr(e *fleet.Error) string { return regdump.Err(e, Sentinels()) }

func bits(x float64) string { return regdump.Bits(x) }

// csvToXLSX writes a CSV register's records into a workbook, a field that is a plain
// number as a numeric cell and the rest as text.
func csvToXLSX(t testing.TB, data []byte) []byte {
	t.Helper()
	r, err := NewCSV(bytes.NewReader(data), "x.csv")
	if err != nil {
		t.Fatal(err)
	}
	var rows [][]any
	var titles []any
	for _, c := range r.Header().Columns {
		titles = append(titles, c.Title)
	}
	rows = append(rows, titles)
	for {
		a, err := r.Next(context.Background())
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatal(err)
		}
		row := make([]any, len(a.Cells))
		for i, c := range a.Cells {
			if x, err := strconv.ParseFloat(c.Text, 64); err == nil && plainFloat(c.Text) {
				row[i] = x
			} else {
				row[i] = c.Text
			}
		}
		rows = append(rows, row)
	}
	return book(t, "Register", rows, nil)
}

// generatedRegister makes a reproducible register over every schema column plus two
// unknown ones, mixing good values with the kinds of bad ones registers hold.
func generatedRegister(seed uint64, n int) ([]string, [][]string) {
	rng := rand.New(rand.NewPCG(seed, 7))
	cols := schema.Columns()
	header := []string{}
	for i, c := range cols {
		h := c.HeaderWithUnit("")
		switch {
		case c.Quantity == "mass" && i%2 == 0:
			h = c.HeaderWithUnit("lb")
		case c.Quantity == "length" && i%3 == 0:
			h = c.HeaderWithUnit("in")
		case c.Quantity == "force":
			h = c.HeaderWithUnit("kN")
		case c.Quantity == "ratio":
			h = c.HeaderWithUnit("%")
		}
		header = append(header, h)
	}
	header = append(header, "Maintenance contractor", "Test load [ton]", "Notes (free text)")
	pick := func(list ...string) string { return list[rng.IntN(len(list))] }
	rows := make([][]string, n)
	for r := range rows {
		row := make([]string, len(header))
		for i, c := range cols {
			good := rng.IntN(10) < 7
			switch c.Kind {
			case schema.Number, schema.Integer:
				x := 1.0 + float64(rng.IntN(50))
				switch {
				case c.HasMin && c.HasMax:
					x = c.Min + (c.Max-c.Min)*rng.Float64()
				case c.HasMin:
					x = c.Min + 1 + 100*rng.Float64()
				}
				if c.Kind == schema.Integer {
					x = math.Round(x)
				}
				row[i] = strconv.FormatFloat(x, 'g', 1+rng.IntN(8), 64)
				if !good {
					row[i] = pick("", " ", "twelve", "12,5", "1,250", "1.250", "1 250", "12.5 t", "12.5kg", "#DIV/0!", "#N/A",
						"95%", "95 %", "1e3", "-3", "0", "1e400", "NaN", "Inf", "0x1p3", "1_000", "+7", "007", ".5", "5.", "3.5e", "12,5,0",
						"12.5.0", " 7 ", "1,5e3", "2.5", "-0", "1.2345", "1.234,5", "1'250", "12\u00a0500", "½", "١٢")
				}
			case schema.Date:
				row[i] = fmt.Sprintf("%04d-%02d-%02d", 2015+rng.IntN(12), 1+rng.IntN(12), 1+rng.IntN(28))
				if !good {
					row[i] = pick("", "31/12/2023", "2023-02-30", "2023-13-01", "2024-02-29", "2023-02-29", "2023-06-30T10:00:00Z",
						"2023-06-30 10:00", "2023-06-30T10:00", "2023-06-30T25:00", "2023-06-30x", "45292", "45292.5", "0", "3000000",
						"2023-6-30", "20230630", " 2023-06-30 ", "2023-06-30T10:00:00.123+02:00", "0000-01-01", "9999-12-31")
				}
			case schema.Enum:
				row[i] = c.Values[rng.IntN(len(c.Values))]
				if !good {
					v := c.Values[rng.IntN(len(c.Values))]
					row[i] = pick(strings.ToUpper(v), " "+v+" ", "ISO "+v, "FEM "+v, "iso4301 "+v, "fem9511-"+v, "iso", "X9", "3", "2.5", "Ünknown", v+"!", strings.ReplaceAll(v, "", "-"))
				}
			case schema.Bool:
				row[i] = pick("yes", "no", "Y", "n", "TRUE", "false", "1", "0", "maybe", " yes ", "Yes")
			default:
				row[i] = fmt.Sprintf("%s %d", c.Key, r)
				if !good {
					row[i] = pick("", "  ", "12", "007", "x,y", `say "hi"`, "Travée côté façade", "line\nbreak", " padded ")
				}
			}
		}
		if c := cols[0]; c.Key == "asset_id" {
			row[0] = fmt.Sprintf("H-%03d", r)
			switch rng.IntN(25) {
			case 0:
				row[0] = ""
			case 1:
				row[0] = fmt.Sprintf("H-%03d", max(r-1, 0))
			case 2:
				row[0] = fmt.Sprintf(" H-%03d ", r)
			}
		}
		row[len(cols)] = pick("Crane Care Ltd", "", "12.5", "007")
		row[len(cols)+1] = pick("", "5", "five")
		row[len(cols)+2] = pick("", "note", "1e3")
		switch rng.IntN(40) {
		case 0: // empty row
			for i := range row {
				row[i] = ""
			}
		case 1: // short row
			row = row[:rng.IntN(len(row))]
		case 2: // long row
			row = append(row, "", pick("", "extra", "9"))
		}
		rows[r] = row
	}
	return header, rows
}

func generatedCSV(header []string, rows [][]string, sep byte) []byte {
	var b bytes.Buffer
	write := func(rec []string) {
		for i, f := range rec {
			if i > 0 {
				b.WriteByte(sep)
			}
			if sep == ';' {
				// The decimal-comma dialect: a plain decimal point becomes a comma.
				if x, err := strconv.ParseFloat(f, 64); err == nil && strings.Count(f, ".") == 1 && !math.IsInf(x, 0) && !strings.ContainsAny(f, "eE") {
					f = strings.Replace(f, ".", ",", 1)
				}
			}
			if strings.ContainsAny(f, "\",;\n") {
				f = `"` + strings.ReplaceAll(f, `"`, `""`) + `"`
			}
			b.WriteString(f)
		}
		b.WriteString("\r\n")
	}
	write(header)
	for i, r := range rows {
		if i%50 == 17 {
			b.WriteString("\r\n") // a blank line between records: an empty spreadsheet row
		}
		write(r)
	}
	// A record that breaks RFC 4180, and a last record without a line end.
	b.WriteString("H-bad,5,\"12\"x,7\r\n")
	b.WriteString("H-last,1")
	return b.Bytes()
}

// generatedXLSX writes the register as a workbook: a plain number as a numeric cell, a
// few formulas (with cached values), a merged area below the header, a date column as
// serials, and trailing blank (formatted) rows.
func generatedXLSX(t testing.TB, header []string, rows [][]string) []byte {
	t.Helper()
	all := make([][]any, 0, len(rows)+1)
	h := make([]any, len(header))
	for i, s := range header {
		h[i] = s
	}
	all = append(all, h)
	for _, r := range rows {
		row := make([]any, len(r))
		for i, s := range r {
			switch {
			case s == "":
				row[i] = nil
			case plainFloat(s):
				x, _ := strconv.ParseFloat(s, 64)
				row[i] = x
			case len(s) == 10 && s[4] == '-' && i%2 == 0:
				if d, err := time.Parse("2006-01-02", s); err == nil {
					row[i] = d // a date cell: written as a serial
				} else {
					row[i] = s
				}
			default:
				row[i] = s
			}
		}
		all = append(all, row)
	}
	return book(t, "Register", all, func(f *excelize.File) {
		_ = f.MergeCell("Register", "C20", "C23")
		_ = f.MergeCell("Register", "E40", "F40")
		for _, cell := range []string{"B5", "B9", "D30", "E31", "F32", "G33", "H34"} {
			_ = f.SetCellFormula("Register", cell, "1+1")
		}
		_ = f.SetRowHeight("Register", len(all)+3, 30)
		_ = f.SetRowHeight("Register", len(all)+6, 30)
	})
}

// plainFloat: what the generator writes as a numeric XLSX cell: a finite number without a
// leading "+" or leading zeros (so "007" stays text), as a program formats floats.
func plainFloat(s string) bool {
	x, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsInf(x, 0) || math.IsNaN(x) || strings.HasPrefix(s, "+") || strings.ContainsAny(s, "xXpP_ ") {
		return false
	}
	m := strings.TrimPrefix(s, "-")
	return m != "" && m[0] != '.' && !strings.HasSuffix(m, ".") && (len(m) == 1 || m[0] != '0' || m[1] == '.')
}
