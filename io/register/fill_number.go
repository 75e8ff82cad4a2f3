package register

import (
	"math"
	"strings"

	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
)

// cellKind is schema.Kind as a small integer, so that the per-cell conversion switches
// on a byte instead of comparing strings.
type cellKind uint8

const (
	kindOther   cellKind = iota // a kind this package does not know: read as text
	kindText                    //
	kindNumber                  //
	kindInteger                 //
	kindDate                    //
	kindEnum                    //
	kindBool                    //
)

func kindOf(k schema.Kind) cellKind {
	switch k {
	case schema.Text:
		return kindText
	case schema.Number:
		return kindNumber
	case schema.Integer:
		return kindInteger
	case schema.Date:
		return kindDate
	case schema.Enum:
		return kindEnum
	case schema.Bool:
		return kindBool
	}
	return kindOther
}

// prepare sets what the per-cell conversion derives from the column once its unit is
// known (setUnit): the kind code and the range bounds of checkRange, with its tolerance,
// as two comparisons.
func (s *colSpec) prepare() {
	const tol = 1e-9 // checkRange's
	s.kind = kindOf(s.col.Kind)
	s.lo, s.hi = math.Inf(-1), math.Inf(1)
	if s.col.HasMin {
		s.lo = s.minSI - tol*math.Abs(s.minSI)
	}
	if s.col.HasMax {
		s.hi = s.maxSI + tol*math.Abs(s.maxSI)
	}
	if s.noUnit {
		// No unit: no plain number is read (fill's general path says why); an empty
		// range sends every cell there.
		s.lo, s.hi = math.Inf(1), math.Inf(-1)
	}
}

// fillNumber is fill's common case for a number column: a decimal number that
// scanNumber reads exactly (no comma, no thousands point, no unit, no per cent sign),
// whole in an integer column, in range, under a usable header. It writes the rest of
// the Value and the Cell (fill has written the cell's text and reference) as fill's
// general path would and reports true; for any other cell it writes nothing and reports
// false. text is the cell without its surrounding spaces.
//
// What it beats: fill's general path for every number. BenchmarkReadCSVRecycled (20 000
// rows of 40 columns, 30 of them numbers, CPU time, interleaved runs, 2026-12-05) takes
// 1.10× the time without it (1.94 → 2.14 µs a row).
func (s *colSpec) fillNumber(text string, d dialect, v *fleet.Value, c *fleet.Cell) bool {
	nb := scanNumber(text)
	if !nb.exact || s.headerErr != "" || d.decimalComma && strings.IndexByte(text, '.') >= 0 {
		return false
	}
	x := nb.x
	if s.kind == kindInteger && x != math.Trunc(x) {
		return false
	}
	si := x * s.factor
	if !(si >= s.lo && si <= s.hi) || math.IsInf(si, 0) {
		return false
	}
	v.Num, v.State = si, fleet.OK
	c.IsNumber = nb.plain
	return true
}
