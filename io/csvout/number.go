package csvout

import (
	"math"

	"hoistfleet/fleet"
	"hoistfleet/io/outbuf"
)

// appendNum appends f in the shortest form that reads back to the same float64, or
// nothing for NaN and ±Inf.
func appendNum(b []byte, f float64) []byte {
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return b
	}
	return appendG(b, f)
}

// appendNum appends f as appendNum does, copying its text from earlier in the hoist
// when f was written there.
func (e *encoder) appendNum(b []byte, f float64) []byte {
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return b
	}
	return e.nums.AppendShortest(b, f, 'g')
}

// appendG appends f as strconv.AppendFloat(b, f, 'g', -1, 64) does.
func appendG(b []byte, f float64) []byte { return outbuf.AppendShortest(b, f, 'g') }

// AppendFigures appends c's figures as "name=value; name=value": numbers in shortest
// round-trip form (NaN and ±Inf as "n/a"), text figures as written.
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
