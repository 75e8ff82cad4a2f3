package csvout

import (
	"math"
	"strconv"

	"hoistfleet/fleet"
)

// Digits is how many significant digits the long form gives a number. Six are more than
// any input of a check is known to (a rope's breaking force, a brake's torque: three or
// four), and the rounding moves a value by at most half a unit in the sixth digit
// (5 × 10⁻⁶ of it, relative). JSON lines keep the exact round-trip form.
const Digits = 6

// appendNum appends f to Digits significant digits, or nothing for NaN and ±Inf.
func appendNum(b []byte, f float64) []byte {
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return b
	}
	return appendG(b, f)
}

// appendNum appends f as appendNum does.
func (e *encoder) appendNum(b []byte, f float64) []byte { return appendNum(b, f) }

// appendG appends f as strconv.AppendFloat(b, f, 'g', Digits, 64) does: Digits
// significant digits without trailing zeros, an exponent below 1e-4 and from 1e6 on
// ("0.637687", "25309.1", "1.03621e-05").
func appendG(b []byte, f float64) []byte { return strconv.AppendFloat(b, f, 'g', Digits, 64) }

// AppendFigures appends c's figures as "name=value; name=value": numbers to Digits
// significant digits (NaN and ±Inf as "n/a"), text figures as written.
func AppendFigures(b []byte, c *fleet.CheckResult) []byte {
	for i, f := range c.Figures {
		if i > 0 {
			b = append(b, "; "...)
		}
		b = append(b, f.Name...)
		b = append(b, '=')
		switch {
		case f.Text != "":
			b = append(b, f.Text...)
		case math.IsNaN(f.Value) || math.IsInf(f.Value, 0):
			b = append(b, "n/a"...)
		default:
			b = appendG(b, f.Value)
		}
	}
	return b
}
