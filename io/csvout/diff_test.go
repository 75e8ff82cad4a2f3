package csvout

import (
	"bytes"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
	"unicode/utf8"

	"hoistfleet/calc"
	"hoistfleet/fleet"
	"hoistfleet/io/sinktest"
)

// The differential tests: the Writer must write exactly the bytes the reference writer
// (reference_test.go) writes, for real registers and for random results, in every
// dialect.

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

// writeBoth writes rs with the Writer and with the reference writer.
func writeBoth(t *testing.T, opts Options, h *fleet.Header, info *fleet.RunInfo, rs []*fleet.Result) (got, want []byte) {
	t.Helper()
	var g, wnt bytes.Buffer
	for _, s := range []fleet.Sink{New(&g, opts), refNew(&wnt, opts)} {
		if err := s.Begin(h, info); err != nil {
			t.Fatal(err)
		}
		for _, r := range rs {
			if err := s.Write(r); err != nil {
				t.Fatal(err)
			}
		}
		if err := s.End(fleet.NewSummary(10), info); err != nil {
			t.Fatal(err)
		}
	}
	return g.Bytes(), wnt.Bytes()
}

// sameBytes fails with the first differing line.
func sameBytes(t *testing.T, got, want []byte) {
	t.Helper()
	if bytes.Equal(got, want) {
		return
	}
	gl, wl := bytes.SplitAfter(got, []byte("\n")), bytes.SplitAfter(want, []byte("\n"))
	for i := range min(len(gl), len(wl)) {
		if !bytes.Equal(gl[i], wl[i]) {
			t.Fatalf("line %d differs:\ngot  %q\nwant %q", i+1, gl[i], wl[i])
		}
	}
	t.Fatalf("got %d lines, want %d", len(gl), len(wl))
}

func TestSameAsReferenceFixture(t *testing.T) {
	for _, o := range dialects {
		t.Run(dialectName(o), func(t *testing.T) {
			got, want := writeBoth(t, o, &fleet.Header{}, &fleet.RunInfo{}, fixture())
			sameBytes(t, got, want)
		})
	}
}

func TestSameAsReferenceRandom(t *testing.T) {
	n := 1000
	if testing.Short() {
		n = 200
	}
	for i, o := range dialects {
		t.Run(dialectName(o), func(t *testing.T) {
			got, want := writeBoth(t, o, &fleet.Header{}, &fleet.RunInfo{}, sinktest.RandomResults(uint64(i), n))
			sameBytes(t, got, want)
		})
	}
}

// TestSameAsReferenceCacheTurnover writes more distinct texts than the text cache holds,
// so that it is emptied and refilled.
func TestSameAsReferenceCacheTurnover(t *testing.T) {
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
	got, want := writeBoth(t, Options{}, &fleet.Header{}, &fleet.RunInfo{}, rs)
	sameBytes(t, got, want)
}

// TestSameAsReferenceRegisters runs fleet over the demo registers and a generated one,
// both writers taking the same results, with and without re-rating.
func TestSameAsReferenceRegisters(t *testing.T) {
	regs := sinktest.DemoRegisters(t)
	if !testing.Short() {
		regs = append(regs, sinktest.GeneratedRegister(t, 400, "si", 3), sinktest.GeneratedRegister(t, 200, "us", 4))
	}
	for _, reg := range regs {
		for _, factor := range []float64{0, 1.25} {
			for _, o := range []Options{{}, {Comma: ';', UseCRLF: true, BOM: true}} {
				t.Run(fmt.Sprintf("%s/factor=%v/%s", reg.Name, factor, dialectName(o)), func(t *testing.T) {
					var got, want bytes.Buffer
					sinktest.RunSinks(t, reg, sinktest.NewChecker(t, "iso", factor), New(&got, o), refNew(&want, o))
					if got.Len() == 0 {
						t.Fatal("nothing written")
					}
					sameBytes(t, got.Bytes(), want.Bytes())
				})
			}
		}
	}
}

// TestSameAsReferenceFigureNames writes hoists whose figure names change in one place
// of the figures field from hoist to hoist: clean, needing quotes, starting with a guard
// byte, empty, and back, with a first figure and later ones, in every dialect.
func TestSameAsReferenceFigureNames(t *testing.T) {
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
		t.Run(dialectName(o), func(t *testing.T) {
			got, want := writeBoth(t, o, &fleet.Header{}, &fleet.RunInfo{}, rs)
			sameBytes(t, got, want)
		})
	}
}

// TestSameAsReferenceRepeatedNumbers writes hoists whose numbers repeat across the
// fields, checks and figures of a hoist (as a check's capacity comes again as one of its
// figures), so that the encoder copies them from earlier in the hoist: numbers that
// differ only in sign (0 and -0) or in the last bit, NaN and infinities among them, and
// figures fields that must be quoted (a text figure with a quote or the separator before
// a repeated number), which moves the numbers already written in the field.
func TestSameAsReferenceRepeatedNumbers(t *testing.T) {
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
		t.Run(dialectName(o), func(t *testing.T) {
			got, want := writeBoth(t, o, &fleet.Header{}, &fleet.RunInfo{}, rs)
			sameBytes(t, got, want)
		})
	}
}

// TestSameAsReferenceTextWays writes texts that cycle in one place of the record
// through more values than the memos of a place remember (rules, sources, units,
// messages and sites), in orders that hit every remembered entry and evict each.
func TestSameAsReferenceTextWays(t *testing.T) {
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
		t.Run(dialectName(o), func(t *testing.T) {
			got, want := writeBoth(t, o, &fleet.Header{}, &fleet.RunInfo{}, rs)
			sameBytes(t, got, want)
		})
	}
}
