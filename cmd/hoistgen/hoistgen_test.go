package main

import (
	"bytes"
	"encoding/csv"
	"errors"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/spf13/pflag"
	"github.com/xuri/excelize/v2"

	"hoistfleet/calc/approx"
	"hoistfleet/fleet/schema"
)

var asOf = time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC)

func genCSV(t *testing.T, rows int, seed uint64, units string) []byte {
	t.Helper()
	var buf bytes.Buffer
	cfg := config{Rows: rows, Seed: seed, Output: "-", Units: units, Sheet: "Register", AsOf: asOf}
	if err := generate(cfg, &buf, false); err != nil {
		t.Fatalf("generate: %v", err)
	}
	return buf.Bytes()
}

func readCSV(t *testing.T, b []byte) [][]string {
	t.Helper()
	recs, err := csv.NewReader(bytes.NewReader(b)).ReadAll()
	if err != nil {
		t.Fatalf("read back: %v", err)
	}
	return recs
}

func TestSameSeedSameBytes(t *testing.T) {
	for _, units := range []string{"si", "us"} {
		a := genCSV(t, 300, 1, units)
		b := genCSV(t, 300, 1, units)
		if !bytes.Equal(a, b) {
			t.Errorf("%s: seed 1 gave two different registers", units)
		}
		c := genCSV(t, 300, 2, units)
		if bytes.Equal(a, c) {
			t.Errorf("%s: seeds 1 and 2 gave the same register", units)
		}
	}
	// a longer run starts with the shorter one: row i depends only on the seed and i's predecessors
	short, long := genCSV(t, 50, 9, "si"), genCSV(t, 100, 9, "si")
	if !bytes.HasPrefix(long, short) {
		t.Error("the first 50 rows of a 100-row register differ from a 50-row register of the same seed")
	}
}

func TestRowCount(t *testing.T) {
	for _, n := range []int{0, 1, 37, 1000} {
		recs := readCSV(t, genCSV(t, n, 3, "si"))
		if len(recs) != n+1 {
			t.Fatalf("n=%d: %d records, want %d (header + rows)", n, len(recs), n+1)
		}
		ids := map[string]bool{}
		for i, r := range recs[1:] {
			if len(r) != len(recs[0]) {
				t.Fatalf("n=%d row %d: %d fields, header has %d", n, i+2, len(r), len(recs[0]))
			}
			if ids[r[0]] {
				t.Fatalf("n=%d: duplicated asset id %q", n, r[0])
			}
			ids[r[0]] = true
		}
	}
}

// TestHeadersMatchSchema: every generated header is a schema column with a unit of its
// quantity (or one of the two pass-through columns), in schema order, and every column
// the checks need is there.
func TestHeadersMatchSchema(t *testing.T) {
	cols := schema.Columns()
	order := map[string]int{}
	for i, c := range cols {
		order[c.Key] = i
	}
	for _, units := range []string{"si", "us"} {
		header := readCSV(t, genCSV(t, 1, 1, units))[0]
		fl, err := fields(units)
		if err != nil {
			t.Fatal(err)
		}
		last := -1
		present := map[string]bool{}
		for i, f := range fl {
			if header[i] != f.Header {
				t.Fatalf("%s: column %d is %q, field says %q", units, i+1, header[i], f.Header)
			}
			if f.Key == "" {
				if f.Header != "Maintenance contractor" && f.Header != "Generator note" {
					t.Errorf("%s: unexpected pass-through column %q", units, f.Header)
				}
				continue
			}
			c, ok := schema.ColumnByKey(f.Key)
			if !ok {
				t.Fatalf("%s: %q is not a schema key", units, f.Key)
			}
			want := c.HeaderWithUnit(f.Unit)
			if units == "si" {
				want = c.HeaderWithUnit("") // the schema's default unit
			}
			if header[i] != want {
				t.Errorf("%s: header %q, want %q", units, header[i], want)
			}
			if order[f.Key] <= last {
				t.Errorf("%s: %q out of schema order", units, header[i])
			}
			last = order[f.Key]
			present[f.Key] = true
		}
		for _, c := range cols {
			if (c.Need == schema.NeedID || c.Need == schema.NeedRequired || c.Need == schema.NeedChecks) && !present[c.Key] {
				t.Errorf("%s: column %q, needed by the checks, is not generated", units, c.Header)
			}
		}
	}
	// the US headers use US customary units
	header := strings.Join(readCSV(t, genCSV(t, 1, 1, "us"))[0], "|")
	for _, h := range []string{"Rated load [lb]", "Rope diameter [in]", "Motor power [hp]", "Hoist speed [ft/min]",
		"Brake torque [lbf ft]", "Motor inertia [lb ft2]", "Drum diameter [in]", "Lift height [ft]", "Rope MBF [lbf]"} {
		if !strings.Contains(header, h) {
			t.Errorf("us header lacks %q", h)
		}
	}
}

// TestUSMatchesSI: the US register of a seed is the SI register of the same seed converted
// with the exact NIST SP 811 factors, to the 6 significant digits written.
func TestUSMatchesSI(t *testing.T) {
	// SI value of one written unit, in the SI register's unit (NIST SP 811 appendix B, exact;
	// standards.md "Units", memory high).
	factor := map[[2]string]float64{
		{"t", "lb"}:         0.45359237e-3,
		{"kg", "lb"}:        0.45359237,
		{"mm", "in"}:        25.4,
		{"m", "ft"}:         0.3048,
		{"kN", "lbf"}:       4.4482216152605e-3,
		{"kW", "hp"}:        0.74569987158227022,
		{"N m", "lbf ft"}:   1.3558179483314004,
		{"kg m2", "lb ft2"}: 0.0421401100938048,
		{"m/min", "ft/min"}: 0.3048,
		{"m/s2", "ft/s2"}:   0.3048,
	}
	si, us := readCSV(t, genCSV(t, 400, 11, "si")), readCSV(t, genCSV(t, 400, 11, "us"))
	unit := func(h string) string {
		if i := strings.Index(h, "["); i >= 0 {
			return strings.TrimSuffix(h[i+1:], "]")
		}
		return ""
	}
	checked := 0
	for j := range si[0] {
		su, uu := unit(si[0][j]), unit(us[0][j])
		f := 1.0
		if su != uu {
			var ok bool
			if f, ok = factor[[2]string{su, uu}]; !ok {
				t.Fatalf("column %q → %q: no NIST factor in the test", si[0][j], us[0][j])
			}
		}
		for i := 1; i < len(si); i++ {
			a, b := si[i][j], us[i][j]
			x, errA := strconv.ParseFloat(a, 64)
			y, errB := strconv.ParseFloat(b, 64)
			if errA != nil || errB != nil {
				if a != b {
					t.Fatalf("row %d %q: text differs: %q vs %q", i+1, si[0][j], a, b)
				}
				continue
			}
			// 6 significant digits written: relative rounding up to 5e-6
			if !approx.Equal(y*f, x, 1e-12, 1e-5) {
				t.Fatalf("row %d %q: %s %s = %g %s, want %s", i+1, si[0][j], b, uu, y*f, su, a)
			}
			checked++
		}
	}
	if checked < 400*30 {
		t.Errorf("only %d numeric cells compared", checked)
	}
}

func TestXLSX(t *testing.T) {
	dir := t.TempDir()
	name := filepath.Join(dir, "reg.xlsx")
	var stderr bytes.Buffer
	if err := run([]string{"-n", "60", "-seed", "4", "-o", name}, &bytes.Buffer{}, &stderr); err != nil {
		t.Fatalf("run: %v", err)
	}
	f, err := excelize.OpenFile(name)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := f.GetRows("Register")
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 61 {
		t.Fatalf("%d rows in the sheet, want 61", len(rows))
	}
	want := readCSV(t, genCSV(t, 60, 4, "si"))
	for i := range want {
		for j := range want[i] {
			got := ""
			if j < len(rows[i]) {
				got = rows[i][j]
			}
			// numbers: compare values, the display may differ in trailing digits
			x, e1 := strconv.ParseFloat(got, 64)
			y, e2 := strconv.ParseFloat(want[i][j], 64)
			if e1 == nil && e2 == nil {
				if !approx.Equal(x, y, 1e-12, 1e-9) {
					t.Fatalf("%d,%d: xlsx %q, csv %q", i+1, j+1, got, want[i][j])
				}
				continue
			}
			if got != want[i][j] {
				t.Fatalf("%d,%d: xlsx %q, csv %q", i+1, j+1, got, want[i][j])
			}
		}
	}
	// rated load is a numeric cell, not text
	typ, err := f.GetCellType("Register", "G2")
	if err != nil {
		t.Fatal(err)
	}
	if typ != excelize.CellTypeNumber && typ != excelize.CellTypeUnset {
		t.Errorf("G2 (rated load) has cell type %v, want a number", typ)
	}
	if !strings.Contains(stderr.String(), "wrote 60 hoists") {
		t.Errorf("stderr %q", stderr.String())
	}
}

func TestRunCSVFile(t *testing.T) {
	dir := t.TempDir()
	name := filepath.Join(dir, "reg.csv")
	if err := run([]string{"--rows=25", "-seed=6", "--units", "us", "-o", name}, &bytes.Buffer{}, &bytes.Buffer{}); err != nil {
		t.Fatalf("run: %v", err)
	}
	b, err := os.ReadFile(name)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(b, genCSV(t, 25, 6, "us")) {
		t.Error("file differs from the generated register of the same seed")
	}
	left, _ := filepath.Glob(filepath.Join(dir, ".*tmp"))
	if len(left) > 0 {
		t.Errorf("temporary files left: %v", left)
	}
}

func TestRunStdout(t *testing.T) {
	var out bytes.Buffer
	if err := run([]string{"-n", "5", "-seed", "2"}, &out, &bytes.Buffer{}); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(out.Bytes(), genCSV(t, 5, 2, "si")) {
		t.Error("standard output differs from the register")
	}
}

func TestRunUsageErrors(t *testing.T) {
	tests := []struct {
		name string
		args []string
	}{
		{"bad extension", []string{"-o", "reg.txt"}},
		{"bad units", []string{"--units", "metric"}},
		{"negative rows", []string{"-n", "-3"}},
		{"bad date", []string{"--as-of", "01/12/2026"}},
		{"unknown flag", []string{"--colour"}},
		{"stray argument", []string{"extra"}},
	}
	for _, tc := range tests {
		err := run(tc.args, &bytes.Buffer{}, &bytes.Buffer{})
		var ue *usageError
		if !errors.As(err, &ue) {
			t.Errorf("%s: err = %v, want a usage error", tc.name, err)
		}
	}
	var stderr bytes.Buffer
	if err := run([]string{"--help"}, &bytes.Buffer{}, &stderr); !errors.Is(err, pflag.ErrHelp) {
		t.Errorf("--help: err = %v, want pflag.ErrHelp", err)
	}
	if !strings.Contains(stderr.String(), "--units") {
		t.Error("--help does not list --units")
	}
}

func TestNormaliseArgs(t *testing.T) {
	got := strings.Join(normaliseArgs([]string{"-seed", "1", "-n", "5", "-units=us", "-o", "x.csv", "--", "-seed"}), " ")
	want := "--seed 1 -n 5 --units=us -o x.csv -- -seed"
	if got != want {
		t.Errorf("got %q, want %q", got, want)
	}
}

func TestWriteFailureLeavesNoFile(t *testing.T) {
	dir := t.TempDir()
	name := filepath.Join(dir, "missing-dir", "reg.csv")
	if err := run([]string{"-n", "3", "-o", name}, &bytes.Buffer{}, &bytes.Buffer{}); err == nil {
		t.Fatal("writing into a missing directory succeeded")
	}
}
