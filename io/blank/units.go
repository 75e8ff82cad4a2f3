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
	"hoistfleet/io/units"
)

// Unit systems accepted by HeaderUnit, WriteXLSX and WriteCSV.
const (
	SI = "si"
	US = "us"
)

// HeaderUnit is the unit the template writes in column c's header for the unit system
// ("si" or "us"); "" for a column without a unit. The US template writes the US
// customary unit io/units gives for the column's default unit (units.USCustomary).
func HeaderUnit(c schema.Column, system string) (string, error) {
	switch system {
	case SI:
		return c.Unit, nil
	case US:
		if u, ok := units.USCustomary(c.Quantity, c.Unit); ok {
			return u, nil
		}
		return c.Unit, nil
	}
	return "", fmt.Errorf("units %q: expected %s or %s", system, SI, US)
}

// convert expresses v, a value of quantity in unit from, in unit to, with io/units'
// exact factors (units.Convert). Units without a factor (a unit the template does not
// change) pass v through.
func convert(v float64, quantity, from, to string) float64 {
	if from == to {
		return v
	}
	x, err := units.Convert(v, quantity, from, to)
	if err != nil {
		return v
	}
	return x
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
