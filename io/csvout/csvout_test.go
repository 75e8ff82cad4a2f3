package csvout

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"hoistfleet/calc"
	"hoistfleet/fleet"
)

var nan = math.NaN()

// fixture builds results by hand; its numbers are chosen, not produced by the tool.
func fixture() []*fleet.Result {
	a := &fleet.Asset{Row: 2, ID: "H-01", Fields: map[string]fleet.Value{"site": {State: fleet.OK, Text: "North, yard \"B\""}}}
	b := &fleet.Asset{Row: 3, ID: "=1+2", Fields: map[string]fleet.Value{"site": {State: fleet.OK, Text: "@SUM(A1)"}}}
	c := &fleet.Asset{Row: 4, ID: "-H3", Blank: true}
	r1 := &fleet.Result{Asset: a,
		Evaluation: fleet.Evaluation{RatedLoadKg: 5000, Status: fleet.StatusPass, WorstCheck: "brake-holding", MinMargin: 0.12,
			Checks: []fleet.CheckResult{
				{ID: "rope-design-factor", Status: fleet.StatusPass, Demand: 5.6, Capacity: 7, Unit: "1", Utilisation: 0.8, Margin: 0.2,
					LimitRatedLoadKg: 6250, Rule: "Zp ≥ 5.6 (M6)", Source: "ISO 4308-1 (seen)",
					Figures: []calc.Figure{{Name: "rope_tension_n", Value: 25000, Unit: "N"}, {Name: "reeving_efficiency", Value: 0.99}}},
				{ID: "inspection-due", Status: fleet.StatusPass, Demand: 100, Capacity: 365, Unit: "d", Utilisation: 100.0 / 365, Margin: 1 - 100.0/365,
					LimitRatedLoadKg: nan, Figures: []calc.Figure{{Name: "next_due", Value: nan, Text: "2027-03-01"}}},
				{ID: "runaway", Status: fleet.StatusInfo, Demand: nan, Capacity: nan, Utilisation: nan, Margin: nan, LimitRatedLoadKg: nan,
					Message: "+ released brake: free fall", Figures: []calc.Figure{{Name: "fall_energy_j", Value: math.Inf(1)}}},
			}},
		Rating: fleet.Rating{MaxRatedLoadKg: 6480.5, GoverningCheck: "brake-holding"}}
	r2 := &fleet.Result{Asset: b,
		Evaluation: fleet.Evaluation{RatedLoadKg: 2000, Status: fleet.StatusFail, WorstCheck: "drum-ratio", MinMargin: -0.12,
			Checks: []fleet.CheckResult{
				{ID: "drum-ratio", Status: fleet.StatusFail, Demand: 20, Capacity: 16, Unit: "1", Utilisation: 1.12, Margin: -0.12, LimitRatedLoadKg: nan, Message: "-drum too small"},
				{ID: "motor-torque", Status: fleet.StatusPass, Demand: 50, Capacity: 100, Unit: "N m", Utilisation: 0.5, Margin: 0.5, LimitRatedLoadKg: 4000}}},
		Rating:   fleet.Rating{MaxRatedLoadKg: nan},
		Proposed: &fleet.Evaluation{RatedLoadKg: 2500, Status: fleet.StatusFail, Checks: []fleet.CheckResult{{ID: "drum-ratio", Status: fleet.StatusFail, Utilisation: 1.12}}},
	}
	r3 := &fleet.Result{Asset: c, Evaluation: fleet.Evaluation{Status: fleet.StatusError, MinMargin: nan}, Rating: fleet.Rating{MaxRatedLoadKg: nan},
		Messages: []string{"Register!4:4: empty row", "no asset id"}}
	return []*fleet.Result{r1, r2, r3}
}

func write(t testing.TB, opts Options, h *fleet.Header, rs []*fleet.Result) string {
	t.Helper()
	var buf bytes.Buffer
	w := New(&buf, opts)
	if err := w.Begin(h, &fleet.RunInfo{}); err != nil {
		t.Fatal(err)
	}
	for _, r := range rs {
		if err := w.Write(r); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.End(fleet.NewSummary(10), &fleet.RunInfo{}); err != nil {
		t.Fatal(err)
	}
	return buf.String()
}

func readAll(t *testing.T, s string, comma rune) [][]string {
	t.Helper()
	r := csv.NewReader(strings.NewReader(s))
	r.Comma = comma
	recs, err := r.ReadAll() // also checks every record has the header's field count
	if err != nil {
		t.Fatalf("output is not valid CSV: %v\n%s", err, s)
	}
	return recs
}

func col(name string) int {
	for i, c := range append(append([]string{}, Columns...), ProposedColumns...) {
		if c == name {
			return i
		}
	}
	panic(name)
}

func TestLongForm(t *testing.T) {
	recs := readAll(t, write(t, Options{}, &fleet.Header{}, fixture()), ',')
	if got := strings.Join(recs[0], ","); got != strings.Join(Columns, ",") {
		t.Fatalf("header %q", got)
	}
	// 3 checks + 2 checks + 1 record for the hoist without checks
	if len(recs) != 1+6 {
		t.Fatalf("got %d records, want 7", len(recs))
	}
	r := recs[1]
	if r[col("row")] != "2" || r[col("asset_id")] != "H-01" || r[col("site")] != `North, yard "B"` || r[col("hoist_status")] != "pass" ||
		r[col("check")] != "rope-design-factor" || r[col("unit")] != "1" || r[col("rule")] != "Zp ≥ 5.6 (M6)" {
		t.Errorf("record 1: %q", r)
	}
	if r[col("figures")] != "rope_tension_n=25000; reeving_efficiency=0.99" {
		t.Errorf("figures: %q", r[col("figures")])
	}
	if recs[2][col("figures")] != "next_due=2027-03-01" || recs[3][col("figures")] != "fall_energy_j=n/a" {
		t.Errorf("figures: %q %q", recs[2][col("figures")], recs[3][col("figures")])
	}
	// NaN and ±Inf are empty fields
	for _, k := range []string{"demand", "capacity", "utilisation", "margin", "limit_rated_load_kg"} {
		if recs[3][col(k)] != "" {
			t.Errorf("runaway %s = %q, want empty", k, recs[3][col(k)])
		}
	}
	if recs[4][col("max_rated_load_kg")] != "" {
		t.Errorf("NaN rating written: %q", recs[4][col("max_rated_load_kg")])
	}
	last := recs[6]
	if last[col("check")] != "" || last[col("message")] != "Register!4:4: empty row; no asset id" || last[col("hoist_status")] != "error" {
		t.Errorf("hoist without checks: %q", last)
	}
}

// TestNumbersRoundTrip: every number read back equals the float64 written (shortest
// round-trip formatting, strconv 'g' -1), e.g. 100/365 and g_n = 9.80665 (NIST SP 811).
func TestNumbersRoundTrip(t *testing.T) {
	rs := fixture()
	rs[0].Checks[0].Demand = 9.80665
	recs := readAll(t, write(t, Options{}, &fleet.Header{}, rs), ',')
	for _, tc := range []struct {
		rec  int
		col  string
		want float64
	}{
		{1, "demand", 9.80665},           // NIST SP 811 appendix B: g_n exactly (six digits)
		{2, "utilisation", 0.273973},     // 100 days of a 365-day interval, 0.2739726… to six digits
		{1, "max_rated_load_kg", 6480.5}, // design.md jsonl example value
		{4, "margin", -0.12},             // negative numbers stay numbers
		{5, "limit_rated_load_kg", 4000}, //
		{5, "capacity", 100},             //
		{1, "limit_rated_load_kg", 6250}, //
		{2, "margin", 0.726027},          // 1 − 100/365 = 0.7260273… to six digits
		{4, "utilisation", 1.12},         //
		{5, "utilisation", 0.5},          //
	} {
		s := recs[tc.rec][col(tc.col)]
		got, err := strconv.ParseFloat(s, 64)
		if err != nil || got != tc.want {
			t.Errorf("record %d %s = %q, want %v exactly", tc.rec, tc.col, s, tc.want)
		}
	}
}

// TestFormulaGuard: text fields starting with = + - @ tab CR get a leading apostrophe
// (OWASP "CSV injection" guidance); numbers we format are never guarded.
func TestFormulaGuard(t *testing.T) {
	recs := readAll(t, write(t, Options{}, &fleet.Header{}, fixture()), ',')
	for _, tc := range []struct {
		rec       int
		col, want string
	}{
		{4, "asset_id", "'=1+2"},
		{4, "site", "'@SUM(A1)"},
		{4, "message", "'-drum too small"},
		{3, "message", "'+ released brake: free fall"},
		{6, "asset_id", "'-H3"},
		{4, "margin", "-0.12"}, // a number: no apostrophe
		{1, "asset_id", "H-01"},
	} {
		if got := recs[tc.rec][col(tc.col)]; got != tc.want {
			t.Errorf("record %d %s = %q, want %q", tc.rec, tc.col, got, tc.want)
		}
	}
	for _, s := range []string{"=", "+1", "-x", "@", "\tx", "\rx"} {
		if !NeedsGuard(s) {
			t.Errorf("NeedsGuard(%q) = false", s)
		}
	}
	for _, s := range []string{"", "a=b", " =", "1-2", "'="} {
		if NeedsGuard(s) {
			t.Errorf("NeedsGuard(%q) = true", s)
		}
	}
	// a guarded field that also needs quoting keeps the apostrophe inside the quotes
	rs := fixture()
	rs[0].Asset.ID = "=A1,B1"
	out := write(t, Options{}, &fleet.Header{}, rs[:1])
	if !strings.Contains(out, `"'=A1,B1"`) {
		t.Errorf("quoted guard: %s", out)
	}
}

func TestProposedColumns(t *testing.T) {
	h := &fleet.Header{Columns: []fleet.Column{{Title: "Asset ID", Key: "asset_id"}, {Title: "Proposed rated load [t]", Key: "proposed_rated_load"}}}
	recs := readAll(t, write(t, Options{}, h, fixture()), ',')
	if n := len(recs[0]); n != len(Columns)+len(ProposedColumns) {
		t.Fatalf("header has %d fields", n)
	}
	if r := recs[4]; r[col("proposed_hoist_status")] != "fail" || r[col("proposed_status")] != "fail" || r[col("proposed_utilisation")] != "1.12" {
		t.Errorf("drum-ratio at the proposed load: %q", r)
	}
	if r := recs[5]; r[col("proposed_hoist_status")] != "fail" || r[col("proposed_status")] != "" {
		t.Errorf("a check absent from the proposed evaluation: %q", r)
	}
	if r := recs[1]; r[col("proposed_hoist_status")] != "" {
		t.Errorf("no proposed evaluation: %q", r)
	}
}

func TestDialect(t *testing.T) {
	out := write(t, Options{Comma: ';', UseCRLF: true, BOM: true}, &fleet.Header{}, fixture())
	if !strings.HasPrefix(out, "\xEF\xBB\xBFrow;asset_id;") {
		t.Fatalf("BOM and separator: %q", out[:20])
	}
	if strings.Count(out, "\r\n") != 7 {
		t.Errorf("want 7 CRLF records")
	}
	recs := readAll(t, strings.TrimPrefix(out, "\xEF\xBB\xBF"), ';')
	if recs[1][col("site")] != `North, yard "B"` || recs[1][col("demand")] != "5.6" {
		t.Errorf("semicolon dialect: %q", recs[1])
	}
	w := New(&bytes.Buffer{}, Options{Comma: '"'})
	if err := w.Begin(&fleet.Header{}, nil); err == nil {
		t.Error("a quote as separator must be refused")
	}
}

type failWriter struct{}

func (failWriter) Write(p []byte) (int, error) { return 0, errors.New("disk full") }

func TestErrors(t *testing.T) {
	w := New(failWriter{}, Options{})
	if err := w.Write(fixture()[0]); err == nil {
		t.Error("Write before Begin must fail")
	}
	w = New(failWriter{}, Options{})
	_ = w.Begin(&fleet.Header{}, nil)
	_ = w.Write(fixture()[0])
	if err := w.End(nil, nil); err == nil || !strings.Contains(err.Error(), "disk full") {
		t.Errorf("End = %v", err)
	}
}

func ExampleWriter() {
	w := New(os.Stdout, Options{})
	_ = w.Begin(&fleet.Header{}, &fleet.RunInfo{})
	_ = w.Write(&fleet.Result{Asset: &fleet.Asset{Row: 2, ID: "=H7"},
		Evaluation: fleet.Evaluation{Status: fleet.StatusFail, Checks: []fleet.CheckResult{{ID: "drum-ratio", Status: fleet.StatusFail,
			Demand: 20, Capacity: 16, Unit: "1", Utilisation: 1.25, Margin: -0.25, LimitRatedLoadKg: math.NaN(), Rule: "h1 ≥ 20 (M6)", Source: "ISO 4308-1"}}},
		Rating: fleet.Rating{MaxRatedLoadKg: math.NaN()}})
	_ = w.End(nil, nil)
	// Output:
	// row,asset_id,site,hoist_status,governing_check,max_rated_load_kg,check,status,demand,capacity,unit,utilisation,margin,limit_rated_load_kg,rule,source,message,figures
	// 2,'=H7,,fail,,,drum-ratio,fail,20,16,1,1.25,-0.25,,h1 ≥ 20 (M6),ISO 4308-1,,
}

// benchResults makes n hoists of 18 checks with 3 figures each.
func benchResults(n int) []*fleet.Result {
	rs := make([]*fleet.Result, n)
	for i := range rs {
		cs := make([]fleet.CheckResult, len(fleet.CheckIDs))
		for j, id := range fleet.CheckIDs {
			u := float64((i*31+j*17)%130) / 100
			cs[j] = fleet.CheckResult{ID: id, Status: fleet.StatusPass, Demand: 1234.5678 * u, Capacity: 1234.5678, Unit: "N m",
				Utilisation: u, Margin: 1 - u, LimitRatedLoadKg: 5000 / u, Rule: "M ≤ M_r", Source: "design.md (computed)",
				Figures: []calc.Figure{{Name: "a_n", Value: 1.0 / 3}, {Name: "b_m", Value: 2.5}, {Name: "c_s", Value: 0.125}}}
		}
		rs[i] = &fleet.Result{Asset: &fleet.Asset{Row: i + 2, ID: fmt.Sprintf("H-%05d", i), Fields: map[string]fleet.Value{"site": {State: fleet.OK, Text: "Plant A"}}},
			Evaluation: fleet.Evaluation{Status: fleet.StatusPass, WorstCheck: "motor-torque", MinMargin: 0.1, Checks: cs},
			Rating:     fleet.Rating{MaxRatedLoadKg: 6480.5, GoverningCheck: "motor-torque"}}
	}
	return rs
}

// BenchmarkCSVWrite writes 10 000 hoists × 18 checks.
func BenchmarkCSVWrite(b *testing.B) {
	rs := benchResults(10000)
	b.ResetTimer()
	for range b.N {
		w := New(discard{}, Options{})
		_ = w.Begin(&fleet.Header{}, nil)
		for _, r := range rs {
			if err := w.Write(r); err != nil {
				b.Fatal(err)
			}
		}
		if err := w.End(nil, nil); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkFloorEncodingCSV writes the same fields with encoding/csv and FormatFloat:
// the baseline for BenchmarkCSVWrite.
func BenchmarkFloorEncodingCSV(b *testing.B) {
	rs := benchResults(10000)
	f := func(x float64) string {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return ""
		}
		return strconv.FormatFloat(x, 'g', -1, 64)
	}
	b.ResetTimer()
	for range b.N {
		w := csv.NewWriter(discard{})
		_ = w.Write(Columns)
		rec := make([]string, len(Columns))
		for _, r := range rs {
			for i := range r.Checks {
				c := &r.Checks[i]
				rec = append(rec[:0], strconv.Itoa(r.Asset.Row), r.Asset.ID, r.Asset.Get("site").Text, r.Status.String(), r.GoverningCheck,
					f(r.MaxRatedLoadKg), c.ID, c.Status.String(), f(c.Demand), f(c.Capacity), c.Unit, f(c.Utilisation), f(c.Margin),
					f(c.LimitRatedLoadKg), c.Rule, c.Source, c.Message, string(AppendFigures(nil, c)))
				_ = w.Write(rec)
			}
		}
		w.Flush()
		if err := w.Error(); err != nil {
			b.Fatal(err)
		}
	}
}

type discard struct{}

func (discard) Write(p []byte) (int, error) { return len(p), nil }
