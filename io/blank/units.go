// Package blank writes hoistfleet's blank register: the header row generated from the
// column schema (schema.Columns) with units in square brackets, one example row of
// an invented hoist, and — in the XLSX form — an input message on every header cell,
// data validation on the data rows (lists for enum and yes/no columns, number ranges
// converted to the header's unit) and a Notes sheet listing every column and the
// caution. Units are SI ("si", the schema's default units) or US customary ("us").
//
// The package is named blank, not template, so that it does not clash with
// text/template.
package blank

import (
	"fmt"
	"math"

	"hoistfleet/fleet/schema"
)

// Unit systems accepted by HeaderUnit, WriteXLSX and WriteCSV.
const (
	SI = "si"
	US = "us"
)

// usUnit maps a schema default unit to the US customary unit the US template writes.
// Units without an entry (rpm, deg, s, h, %, N/mm2) are written as in SI: they are used
// unchanged in US practice, or (N/mm2 for the rope grade) have no US unit the register
// reader understands.
var usUnit = map[string]string{
	"t":     "lb",
	"kg":    "lb",
	"kN":    "lbf",
	"N":     "lbf",
	"mm":    "in",
	"m":     "ft",
	"N m":   "lbf ft",
	"kW":    "hp",
	"kg m2": "lb ft2",
	"m/min": "ft/min",
	"m/s2":  "ft/s2",
}

// toSI is each header unit's size in SI base units (kg, N, m, N m, W, kg m², m/s,
// m/s²). Exact per NIST SP 811 appendix B: lb = 0.45359237 kg, lbf = 4.4482216152605 N,
// in = 0.0254 m, ft = 0.3048 m, hp (550 ft lbf/s) = 745.69987158227022 W,
// lbf ft = 1.3558179483314004 N m, lb ft² = 0.0421401100938048 kg m².
var toSI = map[string]float64{
	"t":      1000,
	"kg":     1,
	"lb":     0.45359237,
	"kN":     1000,
	"N":      1,
	"lbf":    4.4482216152605,
	"mm":     0.001,
	"m":      1,
	"in":     0.0254,
	"ft":     0.3048,
	"N m":    1,
	"lbf ft": 1.3558179483314004,
	"kW":     1000,
	"hp":     745.69987158227022,
	"kg m2":  1,
	"lb ft2": 0.0421401100938048,
	"m/min":  1.0 / 60,
	"ft/min": 0.3048 / 60,
	"m/s2":   1,
	"ft/s2":  0.3048,
}

// HeaderUnit is the unit the template writes in column c's header for the unit system
// ("si" or "us"); "" for a column without a unit.
func HeaderUnit(c schema.Column, units string) (string, error) {
	switch units {
	case SI:
		return c.Unit, nil
	case US:
		if u, ok := usUnit[c.Unit]; ok && c.Quantity != "" {
			return u, nil
		}
		return c.Unit, nil
	}
	return "", fmt.Errorf("units %q: expected %s or %s", units, SI, US)
}

// convert expresses v, given in unit from, in unit to. Units without a factor (the
// same unit on both sides, or a unit the template does not change) pass v through.
func convert(v float64, from, to string) float64 {
	if from == to {
		return v
	}
	f, ok1 := toSI[from]
	t, ok2 := toSI[to]
	if !ok1 || !ok2 {
		return v
	}
	return v * f / t
}

// roundSig rounds v to n significant digits (for example values shown in US units).
func roundSig(v float64, n int) float64 {
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return v
	}
	mag := math.Floor(math.Log10(math.Abs(v)))
	p := math.Pow(10, float64(n-1)-mag)
	return math.Round(v*p) / p
}
