package csvout

import (
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
	"unicode/utf8"

	"hoistfleet/calc"
	"hoistfleet/fleet"
	"hoistfleet/io/sinktest"
)

// The golden tests: the Writer must write exactly its golden outputs (testdata/golden,
// see sinktest.Golden), for real registers and for random results, in every dialect. The
// goldens were written by the writer of commit f7400a6, without the fast path, whose
// verbatim copy (reference_test.go, last at commit 555520e) was the oracle of these
// tests before.

// dialects are the options compared: the default, the spreadsheet dialects, and
// separators that occur inside numbers, figures and status words, or that are not ASCII.
var dialects = []Options{
	{}, {Comma: ';', UseCRLF: true, BOM: true}, {Comma: '\t'}, {Comma: ' '}, {Proposed: true},
	{Comma: '.'}, {Comma: '0'}, {Comma: 'e'}, {Comma: '='}, {Comma: '-'}, {Comma: 'a'}, {Comma: '/'},
	{Comma: 'é'}, {Comma: '€', Proposed: true}, {Comma: utf8.RuneError}, {Comma: '\x00'}, {Comma: '\x7f'},
}

func dialectName(o Options) string {
	return fmt.Sprintf("comma=%q,crlf=%v,bom=%v,proposed=%v", o.Comma, o.UseCRLF, o.BOM, o.Proposed)
}

// variant is the Writer with opts, named for its subtests.
func variant(opts Options) sinktest.Variant {
	return sinktest.Variant{Name: dialectName(opts), New: func(w io.Writer) fleet.Sink { return New(w, opts) }}
}

// writeGolden writes rs with the Writer and compares the output with the test's golden
// output.
func writeGolden(t *testing.T, opts Options, rs []*fleet.Result) {
	t.Helper()
	sinktest.Golden(t, "", sinktest.WriteAll(t, variant(opts).New, &fleet.Header{}, &fleet.RunInfo{}, rs))
}

func TestGoldenFixture(t *testing.T) {
	for _, o := range dialects {
		t.Run(dialectName(o), func(t *testing.T) { writeGolden(t, o, fixture()) })
	}
}

func TestGoldenRandom(t *testing.T) {
	for i, o := range dialects {
		t.Run(dialectName(o), func(t *testing.T) { writeGolden(t, o, sinktest.RandomResults(uint64(i), 1000)) })
	}
}

// TestGoldenCacheTurnover writes more distinct texts than the text cache holds,
// so that it is emptied and refilled.
func TestGoldenCacheTurnover(t *testing.T) {
	rs := sinktest.RandomResults(99, 200)
	for i, r := range rs {
		if r.Asset.Fields == nil {
			r.Asset.Fields = map[string]fleet.Value{}
		}
		r.Asset.Fields["site"] = fleet.Value{State: fleet.OK, Text: fmt.Sprintf("site %d", i)}
		for j := range r.Checks {
			r.Checks[j].Rule = fmt.Sprintf("rule %d.%d", i, j)
		}
	}
	for range 3 { // 3 × 200 hoists × ~10 checks: well past textCacheMax
		rs = append(rs, rs[:200]...)
	}
	writeGolden(t, Options{}, rs)
}

// TestGoldenRegisters runs fleet over the demo registers and generated ones, with and
// without re-rating, in the default and the spreadsheet dialect.
func TestGoldenRegisters(t *testing.T) {
	sinktest.GoldenRegisters(t, variant(Options{}), variant(Options{Comma: ';', UseCRLF: true, BOM: true}))
}

// TestGoldenFigureNames writes hoists whose figure names change in one place
// of the figures field from hoist to hoist: clean, needing quotes, starting with a guard
// byte, empty, and back, with a first figure and later ones, in every dialect.
func TestGoldenFigureNames(t *testing.T) {
	names := [][]string{
		{"rope_tension_n", "drum_ratio"},
		{"a,b", "drum_ratio"},
		{"rope_tension_n", "q\"uote"},
		{"=sum", ""},
		{"", "line\nbreak"},
		{"rope_tension_n", "drum_ratio"},
		{"rope_tension_n", "drum_ratio", "radius_m"},
		{"rope_tension_n"},
		{"tab\tname", "é;€"},
		{"rope_tension_n", "drum_ratio"},
	}
	var rs []*fleet.Result
	for i, ns := range names {
		c := fleet.CheckResult{ID: "rope-design-factor", Status: fleet.StatusPass, Demand: 5, Capacity: 6.25, Utilisation: 0.8}
		for j, n := range ns {
			c.Figures = append(c.Figures, calc.Figure{Name: n, Value: float64(i) + float64(j)/3})
		}
		rs = append(rs, &fleet.Result{Asset: &fleet.Asset{Row: i + 2, ID: fmt.Sprint("H-", i)},
			Evaluation: fleet.Evaluation{Status: fleet.StatusPass, Checks: []fleet.CheckResult{c, c}}})
	}
	for _, o := range dialects {
		t.Run(dialectName(o), func(t *testing.T) { writeGolden(t, o, rs) })
	}
}

// TestGoldenRepeatedNumbers writes hoists whose numbers repeat across the
// fields, checks and figures of a hoist (as a check's capacity comes again as one of its
// figures), so that the encoder copies them from earlier in the hoist: numbers that
// differ only in sign (0 and -0) or in the last bit, NaN and infinities among them, and
// figures fields that must be quoted (a text figure with a quote or the separator before
// a repeated number), which moves the numbers already written in the field.
func TestGoldenRepeatedNumbers(t *testing.T) {
	pool := []float64{0, math.Copysign(0, -1), 1.5, math.Nextafter(1.5, 2), math.Nextafter(1.5, 1), 1.0 / 3,
		-1.0 / 3, math.NaN(), math.Inf(1), math.Inf(-1), 1e-7, 2.5e20, 123456789.25, 0.5, 16257.708885941633, 6}
	texts := []string{"", "", "", "a\"b", "x,y", "x;y", "=1+2", " lead", "plain"}
	rng := rand.New(rand.NewPCG(11, 12))
	pick := func() float64 { return pool[rng.IntN(len(pool))] }
	var rs []*fleet.Result
	for i := range 300 {
		var cs []fleet.CheckResult
		for range 1 + rng.IntN(6) {
			c := fleet.CheckResult{ID: "rope-design-factor", Status: fleet.StatusPass, Unit: "1",
				Demand: pick(), Capacity: pick(), Utilisation: pick(), Margin: pick(), LimitRatedLoadKg: pick()}
			for j := range rng.IntN(7) {
				f := calc.Figure{Name: fmt.Sprint("f", j), Value: pick()}
				if rng.IntN(4) == 0 {
					f.Text = texts[rng.IntN(len(texts))]
				}
				c.Figures = append(c.Figures, f)
			}
			cs = append(cs, c)
		}
		r := &fleet.Result{Asset: &fleet.Asset{Row: i + 2, ID: fmt.Sprint("H-", i)},
			Evaluation: fleet.Evaluation{Status: fleet.StatusPass, Checks: cs}}
		r.MaxRatedLoadKg = pick()
		if rng.IntN(3) == 0 {
			p := r.Evaluation
			p.Checks = append([]fleet.CheckResult(nil), cs...)
			for j := range p.Checks {
				p.Checks[j].Utilisation = pick()
			}
			r.Proposed = &p
		}
		rs = append(rs, r)
	}
	for _, o := range dialects {
		t.Run(dialectName(o), func(t *testing.T) { writeGolden(t, o, rs) })
	}
}

// TestGoldenTextWays writes texts that cycle in one place of the record
// through more values than the memos of a place remember (rules, sources, units,
// messages and sites), in orders that hit every remembered entry and evict each.
func TestGoldenTextWays(t *testing.T) {
	values := []string{"drum.h1 = 16 (M4)", "drum.h1 = 18 (M5)", "", "x,\"quoted\"", "=guard", "drum.h1 = 20 (M6)", " lead"}
	orders := [][]int{{0, 1, 0, 1}, {0, 1, 2, 3, 4, 5, 6}, {3, 2, 1, 0, 1, 2, 3}, {0, 1, 2, 3, 0, 4, 1, 5, 2, 6, 3}, {6, 6, 5, 6, 4, 6, 3}}
	var rs []*fleet.Result
	row := 2
	for _, order := range orders {
		for rep := range 3 {
			for k, vi := range order {
				s := values[vi]
				s2 := values[(vi+rep+k)%len(values)]
				c := fleet.CheckResult{ID: "drum-ratio", Status: fleet.StatusPass, Unit: s2, Rule: s, Source: s2,
					Message: strings.Clone(s), Demand: 16, Capacity: 18.75}
				a := &fleet.Asset{Row: row, ID: fmt.Sprint("H-", row),
					Fields: map[string]fleet.Value{"site": {State: fleet.OK, Text: s2}}}
				rs = append(rs, &fleet.Result{Asset: a, Evaluation: fleet.Evaluation{Status: fleet.StatusPass,
					Checks: []fleet.CheckResult{c, c}}})
				row++
			}
		}
	}
	for _, o := range dialects {
		t.Run(dialectName(o), func(t *testing.T) { writeGolden(t, o, rs) })
	}
}
