package jsonout

import (
	"bytes"
	"fmt"
	"testing"

	"hoistfleet/fleet"
	"hoistfleet/io/sinktest"
)

// The differential tests: the Writer must write exactly the bytes the reference writer
// (reference_test.go, encoding/json) writes, for real registers and random results.

// writeBoth writes rs with the Writer and with the reference writer.
func writeBoth(t *testing.T, rs []*fleet.Result) (got, want []byte) {
	t.Helper()
	var g, wnt bytes.Buffer
	for _, s := range []fleet.Sink{New(&g, Options{}), refNew(&wnt, Options{})} {
		if err := s.Begin(&fleet.Header{}, &fleet.RunInfo{}); err != nil {
			t.Fatal(err)
		}
		for _, r := range rs {
			if err := s.Write(r); err != nil {
				t.Fatal(err)
			}
		}
		if err := s.End(fleet.NewSummary(10), &fleet.RunInfo{}); err != nil {
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
			j := 0
			for j < min(len(gl[i]), len(wl[i])) && gl[i][j] == wl[i][j] {
				j++
			}
			t.Fatalf("line %d differs at byte %d:\ngot  …%q\nwant …%q", i+1, j, gl[i][max(j-40, 0):min(j+80, len(gl[i]))], wl[i][max(j-40, 0):min(j+80, len(wl[i]))])
		}
	}
	t.Fatalf("got %d lines, want %d", len(gl), len(wl))
}

func TestSameAsReferenceFixture(t *testing.T) {
	got, want := writeBoth(t, fixture())
	sameBytes(t, got, want)
}

func TestSameAsReferenceRandom(t *testing.T) {
	n := 3000
	if testing.Short() {
		n = 300
	}
	for seed := range uint64(3) {
		got, want := writeBoth(t, sinktest.RandomResults(seed, n))
		sameBytes(t, got, want)
	}
}

// TestSameAsReferenceManyFigures covers the figure objects large enough to find
// repeated names with a map.
func TestSameAsReferenceManyFigures(t *testing.T) {
	rs := sinktest.RandomResults(7, 50)
	for _, r := range rs {
		for j := range r.Checks {
			c := &r.Checks[j]
			for len(c.Figures) > 0 && len(c.Figures) <= dedupMax+5 {
				c.Figures = append(c.Figures, c.Figures...)
				c.Figures[len(c.Figures)-1].Name += "x"
			}
		}
	}
	got, want := writeBoth(t, rs)
	sameBytes(t, got, want)
}

// TestSameAsReferenceCacheTurnover writes more distinct texts than the text cache holds,
// so that it is emptied and refilled.
func TestSameAsReferenceCacheTurnover(t *testing.T) {
	rs := sinktest.RandomResults(99, 200)
	for i, r := range rs {
		for j := range r.Checks {
			r.Checks[j].Rule = fmt.Sprintf("rule %d.%d", i, j)
		}
	}
	for range 3 { // 3 × 200 hoists × ~10 checks: well past textCacheMax
		rs = append(rs, rs[:200]...)
	}
	got, want := writeBoth(t, rs)
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
			t.Run(fmt.Sprintf("%s/factor=%v", reg.Name, factor), func(t *testing.T) {
				var got, want bytes.Buffer
				sinktest.RunSinks(t, reg, sinktest.NewChecker(t, "iso", factor), New(&got, Options{}), refNew(&want, Options{}))
				if got.Len() == 0 {
					t.Fatal("nothing written")
				}
				sameBytes(t, got.Bytes(), want.Bytes())
			})
		}
	}
}
