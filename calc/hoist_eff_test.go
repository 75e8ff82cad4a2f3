package calc

import (
	"math"
	"testing"
)

// TestWithEfficiencies: the worked-out η_R and η_D are bit for bit what ReevingEff and
// DeflectionEff compute; changing a field they depend on makes them computed afresh, not
// stale; a hoist without rope ends is left alone (no division by zero).
func TestWithEfficiencies(t *testing.T) {
	for _, h := range []Hoist{
		{SheaveEff: 0.98, Parts: 4, RopeEnds: 1},
		{SheaveEff: 0.98, Parts: 4, RopeEnds: 2, DeflectionSheaves: 1},
		{SheaveEff: 0.96, Parts: 8, RopeEnds: 2, DeflectionSheaves: 3},
		{SheaveEff: 1, Parts: 6, RopeEnds: 1},
		{SheaveEff: 0.97, Parts: 1, RopeEnds: 1},
		{SheaveEff: math.NaN(), Parts: 2, RopeEnds: 1},
	} {
		c := h.WithEfficiencies()
		for _, p := range []struct {
			name      string
			got, want float64
		}{
			{"η_R", c.ReevingEff(), h.ReevingEff()},
			{"η_D", c.DeflectionEff(), h.DeflectionEff()},
			{"η_RD", c.RopeSystemEff(), h.RopeSystemEff()},
			{"η_R after a load change", c.WithRatedLoad(1234).ReevingEff(), h.ReevingEff()},
		} {
			if math.Float64bits(p.got) != math.Float64bits(p.want) {
				t.Errorf("%+v: %s = %v with WithEfficiencies, %v without", h, p.name, p.got, p.want)
			}
		}
		// A field η depends on, changed after the values were worked out.
		c.Parts, c.DeflectionSheaves = c.Parts*2, c.DeflectionSheaves+1
		fresh := c
		fresh.eff = nil
		if c.ReevingEff() != fresh.ReevingEff() && !math.IsNaN(fresh.ReevingEff()) {
			t.Errorf("%+v: η_R after changing the parts of line is stale: %v, want %v", h, c.ReevingEff(), fresh.ReevingEff())
		}
		if c.DeflectionEff() != fresh.DeflectionEff() && !math.IsNaN(fresh.DeflectionEff()) {
			t.Errorf("%+v: η_D after adding a deflection sheave is stale: %v, want %v", h, c.DeflectionEff(), fresh.DeflectionEff())
		}
	}
	if h := (Hoist{SheaveEff: 0.98, Parts: 4}).WithEfficiencies(); h.eff != nil {
		t.Error("a hoist without rope ends got worked-out efficiencies")
	}
}
