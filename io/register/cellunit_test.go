package register

import (
	"errors"
	"math"
	"path/filepath"
	"strings"
	"testing"

	"hoistfleet/calc/approx"
	"hoistfleet/fleet"
)

// TestCellUnits: a value with its unit in the cell is read in that unit when the unit is
// of the column's quantity; two values and comments are refused with a hint. Factors:
// NIST SP 811 (2008) appendix B (exact): lb = 0.45359237 kg; hp (550 ft·lbf/s) =
// 745.69987158227022 W; ft = 0.3048 m.
func TestCellUnits(t *testing.T) {
	r := csvString(t, "Asset ID,Rated load [t],Motor power [kW],Hoist speed [m/min],Parts of line\nH-1,1,1,1,1\n")
	spec := func(key string) *colSpec {
		for i := range r.specs {
			if r.specs[i].col.Key == key {
				return &r.specs[i]
			}
		}
		t.Fatalf("no %s column", key)
		return nil
	}
	tests := []struct {
		key, cell string
		si        float64 // NaN: refused
		msg       string  // part of the refusal
	}{
		{"rated_load", "5 t", 5000, ""},
		{"rated_load", "5000kg", 5000, ""},
		{"rated_load", "1000 lb", 453.59237, ""},
		{"rated_load", "5 T", math.NaN(), `carries the unit "T": T is ambiguous`}, // as in a header
		{"rated_load", "5 ton", math.NaN(), "ton is ambiguous"},
		{"rated_load", "5 m", math.NaN(), "m is a unit of length, not of mass"},
		{"rated_load", "2 x 3.2 t", math.NaN(), "holds two values: write one value per cell"},
		{"rated_load", "5 t (derated to 4 t)", math.NaN(), "holds a comment: write the value only and put the comment in a column of its own (Notes)"},
		{"motor_power", "7.5kW", 7500, ""},
		{"motor_power", "15 hp", 15 * 745.69987158227022, ""},
		{"motor_power", "2x4kW", math.NaN(), "holds two values"},
		{"hoist_speed", "12 m/min", 0.2, ""},
		{"hoist_speed", "40 ft/min", 40 * 0.3048 / 60, ""},
		{"hoist_speed", "8/2 m/min", math.NaN(), "holds two values"},
		{"parts_of_line", "4 falls", math.NaN(), "is not a number"}, // a count takes no unit
	}
	for _, tt := range tests {
		s := spec(tt.key)
		v, _ := s.parse(tt.cell, dialect{}, fleet.CellRef{Sheet: "R", Row: 2, Col: 1}, "H-1")
		if math.IsNaN(tt.si) {
			if v.State != fleet.Bad || !strings.Contains(errText(v), tt.msg) {
				t.Errorf("%s %q: %+v, want refused with %q", tt.key, tt.cell, v, tt.msg)
			}
			continue
		}
		if v.State != fleet.OK || !approx.Equal(v.Num, tt.si, 0, 1e-15) {
			t.Errorf("%s %q: %+v (%s), want %v", tt.key, tt.cell, v, errText(v), tt.si)
		}
	}
}

// TestNoUnitAnywhere: a column of a physical quantity whose unit is written nowhere is
// not read in an assumed unit (testdata/messy-units.csv: "SWL" without a unit).
func TestNoUnitAnywhere(t *testing.T) {
	r := openCSV(t, filepath.Join("..", "..", "..", "testdata", "messy-units.csv"))
	as := readAll(t, r)
	hasProblem(t, r, `messy-units.csv!G1: "SWL" gives no unit, and no units row under the header does: a mass is not read in an assumed unit, so its cells are not read (unless a cell carries its own unit, e.g. "5 t") and the checks that need Rated load are unchecked; write the unit in the header, e.g. "SWL [t]" or "SWL [lb]"`)
	hasProblem(t, r, `messy-units.csv!G2: Rated load: 1 cell carries its own unit, read in it ("5 t" at messy-units.csv!G2 is 5000 kg)`)
	hasProblem(t, r, `messy-units.csv!AG2: Motor power: 2 cells carry their own unit, read in it ("11kW" at messy-units.csv!AG2 is 11000 W)`)
	if len(as) != 4 {
		t.Fatalf("%d hoists", len(as))
	}
	if v := as[0].Get("rated_load"); v.State != fleet.OK || v.Num != 5000 {
		t.Errorf("S-01 rated load %+v, want 5000 kg from \"5 t\"", v)
	}
	v := as[1].Get("rated_load")
	if v.State != fleet.Bad || v.Err.Kind != fleet.Unitless || !errors.Is(v.Err, ErrUnit) ||
		errText(v) != `messy-units.csv!G3: asset S-02: "10" is not read: the Rated load column gives no unit (header messy-units.csv!G1)` {
		t.Errorf("S-02 bare 10 without a unit: %+v", v)
	}
	if v := as[1].Get("motor_power"); !approx.Equal(v.Num, 15*745.69987158227022, 0, 1e-15) {
		t.Errorf("S-02 15 hp: %+v", v)
	}
	for _, c := range []struct {
		i        int
		key, msg string
	}{
		{2, "rated_load", "holds two values"}, {2, "motor_power", "holds two values"}, {2, "hoist_speed", "holds two values"},
		{3, "rated_load", "holds a comment"}, {3, "motor_power", `"7.5 T" carries the unit "T": T is ambiguous`},
	} {
		if got := errText(as[c.i].Get(c.key)); !strings.Contains(got, c.msg) {
			t.Errorf("%s %s: %s, want %q", as[c.i].ID, c.key, got, c.msg)
		}
	}
}
