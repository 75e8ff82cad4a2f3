package csvout

import (
	"math"
	"strconv"

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

// appendG appends f as strconv.AppendFloat(b, f, 'g', -1, 64) does, with a fast path for
// whole numbers below 1e6 in magnitude: 'g' writes those without an exponent or a
// point, exactly as strconv.AppendInt does (except -0, which 'g' writes as "-0").
func appendG(b []byte, f float64) []byte {
	if f == math.Trunc(f) && f > -1e6 && f < 1e6 && (f != 0 || !math.Signbit(f)) {
		return strconv.AppendInt(b, int64(f), 10)
	}
	return strconv.AppendFloat(b, f, 'g', -1, 64)
}

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

// numCache is outbuf.NumCache formatting as appendG does.
type numCache struct{ outbuf.NumCache }

// appendG appends f as the package-level appendG does, remembering the result. f must
// be finite.
func (c *numCache) appendG(b []byte, f float64) []byte { return c.Append(b, f, appendG) }

// appendNum is the package-level appendNum through the cache.
func (c *numCache) appendNum(b []byte, f float64) []byte {
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return b
	}
	return c.appendG(b, f)
}
