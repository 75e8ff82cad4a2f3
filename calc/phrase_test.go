package calc

import (
	"strconv"
	"testing"
)

// TestRadiusPhrase: the ready-made notes are exactly what assembling them gives, for
// every layer count, inside and beyond the table.
func TestRadiusPhrase(t *testing.T) {
	assemble := func(tr dynTrain, k int, prefix string) string {
		switch {
		case tr.nr == 1:
			return prefix + "single layer, r_1"
		case k == 0:
			return prefix + "first layer, r_1"
		}
		return prefix + "outer layer " + strconv.Itoa(tr.layers) + ", r_L"
	}
	tables := []struct {
		prefix string
		table  *[phraseLayers]string
	}{{"", radiusWordsOf}, {accelGovernsAt, accelGovernsAtOf}, {stopGovernsAt, stopGovernsAtOf}}
	for layers := 1; layers <= phraseLayers+3; layers++ {
		tr := dynTrain{layers: layers, nr: 2}
		if layers == 1 {
			tr.nr = 1
		}
		for k := range tr.nr {
			for _, tb := range tables {
				if got, want := tr.radiusPhrase(k, tb.prefix, tb.table), assemble(tr, k, tb.prefix); got != want {
					t.Errorf("%d layers, radius %d: %q, want %q", layers, k, got, want)
				}
			}
			if got, want := tr.radiusWords(k), assemble(tr, k, ""); got != want {
				t.Errorf("radiusWords, %d layers, radius %d: %q, want %q", layers, k, got, want)
			}
		}
	}
}
