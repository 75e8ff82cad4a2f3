package record

import (
	"bytes"
	"math"
	"strings"
	"testing"
	"time"

	"hoistfleet/calc"
	"hoistfleet/fleet"
)

func TestNum(t *testing.T) {
	tests := []struct {
		in   float64
		want string
	}{
		{0, "0"},
		{9.80665, "9.807"},
		{320187.4, "320187"},
		{0.970398, "0.9704"},
		{1.5e-5, "1.5e-05"},
		{-0.25, "-0.25"},
		{math.NaN(), "—"},
		{math.Inf(1), "∞"},
	}
	for _, tt := range tests {
		if got := Num(tt.in); got != tt.want {
			t.Errorf("Num(%v) = %q, want %q", tt.in, got, tt.want)
		}
	}
}

// A record must carry the caution, the rule and its source, the substituted numbers and
// the rating, in both layouts.
func TestWriteRecord(t *testing.T) {
	a := &fleet.Asset{Row: 7, ID: "H-007",
		Cells:  []fleet.Cell{{Text: "H-007"}, {Text: "5", IsNumber: true}},
		Fields: map[string]fleet.Value{"asset_id": {State: fleet.OK, Text: "H-007"}, "rated_load": {State: fleet.OK, Num: 5000}}}
	h := &fleet.Header{Sheet: "Register", Columns: []fleet.Column{{Index: 0, Title: "Asset ID", Key: "asset_id", Factor: 1},
		{Index: 1, Title: "Rated load [t]", Key: "rated_load", Unit: "t", Factor: 1000}}}
	r := &fleet.Result{Asset: a, DefaultsUsed: []string{"hook block mass 0 kg"}}
	r.Status, r.RatedLoadKg, r.MinMargin, r.WorstCheck = fleet.StatusPass, 5000, 0.21, "rope-design-factor"
	r.MaxRatedLoadKg, r.GoverningCheck = 6350.2, "rope-design-factor"
	r.Checks = []fleet.CheckResult{{ID: "rope-design-factor", Status: fleet.StatusPass, Demand: 4.5, Capacity: 5.7, Unit: "1",
		Utilisation: 0.789, Margin: 0.211, LimitRatedLoadKg: 6350.2, LoadDependent: true,
		Rule: "rope.design_factor = 4.5 (M5)", Source: "ISO 4308-1 [seen]",
		Steps: []calc.Step{{Symbol: "W", Formula: "m g", Numbers: "5000 × 9.80665", Value: 49033.25, Unit: "N"}}}}
	info := &fleet.RunInfo{Tool: "hoistfleet", Version: "test", Input: "reg.csv", Profile: "iso", AsOf: time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC)}
	for _, f := range []Format{Text, Markdown} {
		var b bytes.Buffer
		if err := Write(&b, r, h, info, f); err != nil {
			t.Fatal(err)
		}
		out := b.String()
		for _, want := range []string{fleet.Caution, "ISO 4308-1 [seen]", "5000 × 9.80665", "49033", "6350.2 kg", "rope-design-factor",
			"hook block mass 0 kg", "Rated load [t]", "5000 kg", "Checked by"} {
			if !strings.Contains(out, want) {
				t.Errorf("format %d: record lacks %q", f, want)
			}
		}
	}
}
