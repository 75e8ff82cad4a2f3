package jsonout

import (
	"fmt"
	"testing"

	"hoistfleet/fleet"
	"hoistfleet/io/sinktest"
)

// The golden tests: the Writer must write exactly its golden outputs (testdata/golden,
// see sinktest.Golden), for real registers and random results. The goldens were written
// by the writer of commit f7400a6, which encoded with encoding/json, whose verbatim copy
// (reference_test.go, last at commit 555520e) was the oracle of these tests before.

// writeGolden writes rs with the Writer and compares the output with the test's golden
// output.
func writeGolden(t *testing.T, rs []*fleet.Result) {
	t.Helper()
	sinktest.Golden(t, "", sinktest.WriteAll(t, newSink, &fleet.Header{}, &fleet.RunInfo{}, rs))
}

func TestGoldenFixture(t *testing.T) { writeGolden(t, fixture()) }

func TestGoldenRandom(t *testing.T) {
	for seed := range uint64(3) {
		t.Run(fmt.Sprint("seed=", seed), func(t *testing.T) { writeGolden(t, sinktest.RandomResults(seed, 3000)) })
	}
}

// TestGoldenManyFigures covers the figure objects large enough to find
// repeated names with a map.
func TestGoldenManyFigures(t *testing.T) {
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
	writeGolden(t, rs)
}

// TestGoldenCacheTurnover writes more distinct texts than the text cache holds,
// so that it is emptied and refilled.
func TestGoldenCacheTurnover(t *testing.T) {
	rs := sinktest.RandomResults(99, 200)
	for i, r := range rs {
		for j := range r.Checks {
			r.Checks[j].Rule = fmt.Sprintf("rule %d.%d", i, j)
		}
	}
	for range 3 { // 3 × 200 hoists × ~10 checks: well past textCacheMax
		rs = append(rs, rs[:200]...)
	}
	writeGolden(t, rs)
}

// TestGoldenRegisters runs fleet over the demo registers and generated ones, with and
// without re-rating.
func TestGoldenRegisters(t *testing.T) {
	sinktest.GoldenRegisters(t, sinktest.Variant{New: newSink})
}
