package register

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"

	"hoistfleet/fleet"
	"hoistfleet/io/units"
)

// Units are never guessed. A column of a physical quantity whose unit is written nowhere
// (not in its header, not in a units row under it) is not read in the schema's default
// unit: its cells are Bad with kind fleet.Unitless, which makes the checks that need them
// unchecked, and the header's problems say so once. A cell that carries its own unit
// ("5 t", "7.5kW", "12 m/min") is read in that unit when it is one of the column's
// quantity, in any column of a physical quantity; a cell holding two values ("2 x 3.2 t",
// "8/2 m/min") or a comment ("5 t (derated to 4 t)") is refused with a hint.

// dimensional reports whether the column holds a physical quantity with a unit (a ratio
// is a pure number, or a per cent written in the cell).
func (s *colSpec) dimensional() bool {
	return s.known && s.col.Quantity != "" && s.col.Quantity != "ratio"
}

// leadingNumber splits text into a decimal number at its start and the rest, trimmed.
// ok is false when text does not start with a number.
func leadingNumber(text string, d dialect) (x float64, rest string, ok bool) {
	i := 0
	if i < len(text) && (text[i] == '+' || text[i] == '-') {
		i++
	}
	digits := 0
	for i < len(text) && text[i] >= '0' && text[i] <= '9' {
		i++
		digits++
	}
	if i < len(text) && (text[i] == '.' || d.decimalComma && text[i] == ',') {
		i++
		for i < len(text) && text[i] >= '0' && text[i] <= '9' {
			i++
			digits++
		}
	}
	if digits == 0 {
		return 0, "", false
	}
	if i < len(text) && (text[i] == 'e' || text[i] == 'E') {
		// An exponent ("1e3 kg"), whole, or no number at all ("3.5e", "1e400").
		j := i + 1
		if j < len(text) && (text[j] == '+' || text[j] == '-') {
			j++
		}
		k := j
		for k < len(text) && text[k] >= '0' && text[k] <= '9' {
			k++
		}
		if k == j {
			return 0, "", false
		}
		i = k
	}
	num := strings.Replace(text[:i], ",", ".", 1)
	x, err := strconv.ParseFloat(num, 64)
	if err != nil || math.IsInf(x, 0) {
		return 0, "", false
	}
	return x, strings.TrimSpace(text[i:]), true
}

// cellUnit reads a number column's cell that parseNumber refused, as a value with its
// unit. handled is false when the cell is not of that shape (it is then "not a number");
// msg, when not empty, is the refusal.
func (s *colSpec) cellUnit(text string, d dialect) (x, factor float64, msg string, handled bool) {
	x, rest, ok := leadingNumber(text, d)
	if !ok || rest == "" || strings.HasPrefix(text, "0x") || strings.HasPrefix(text, "0X") {
		return 0, 0, "", false // a hexadecimal number is not "0 × 1p3"
	}
	if twoValues(rest) {
		return 0, 0, "holds two values: write one value per cell (the number of motors, brakes or falls has a column of its own), with the unit in the header", true
	}
	if r, _ := utf8.DecodeRuneInString(rest); !unicode.IsLetter(r) && r != '°' {
		return 0, 0, "", false // "1,250", "1'250", "12,5": parseNumber's hints say more
	}
	if strings.ContainsAny(rest, "(;[") {
		return 0, 0, "holds a comment: write the value only and put the comment in a column of its own (Notes)", true
	}
	if !s.dimensional() {
		return 0, 0, "", false
	}
	f, err := units.Factor(s.col.Quantity, rest)
	if err != nil {
		var ue *units.Error
		if errors.As(err, &ue) {
			return 0, 0, "carries the unit " + strconv.Quote(rest) + ": " + ue.Error(), true
		}
		return 0, 0, "", false
	}
	return x, f, "", true
}

// twoValues reports whether the text after a cell's first number starts a second value:
// "x 3.2 t", "× 4 kW", "*2", "/2 m/min".
func twoValues(rest string) bool {
	r := strings.TrimSpace(rest)
	for _, p := range []string{"x", "X", "×", "*", "/", "+", "&"} {
		if after, ok := strings.CutPrefix(r, p); ok {
			after = strings.TrimSpace(after)
			if after != "" && (after[0] >= '0' && after[0] <= '9' || after[0] == '.') {
				return true
			}
		}
	}
	return false
}

// cellUnitNotes is what a column read from cells that carry their own unit, for a note.
type cellUnitNotes struct {
	n    int
	at   fleet.CellRef
	text string
	si   float64
}

// noteCellUnit notes one cell read in its own unit.
func (s *colSpec) noteCellUnit(ref fleet.CellRef, text string, si float64) {
	if s.cellUnits.n == 0 {
		s.cellUnits.at, s.cellUnits.text, s.cellUnits.si = ref, text, si
	}
	s.cellUnits.n++
}

// cellUnitNote is the column's note, "" when no cell carried its own unit.
func (s *colSpec) cellUnitNote() string {
	n := &s.cellUnits
	if n.n == 0 {
		return ""
	}
	cells := "cell carries its"
	if n.n > 1 {
		cells = "cells carry their"
	}
	return fmt.Sprintf("%s: %d %s own unit, read in it (%q at %s is %s %s)", s.col.Header, n.n, cells,
		n.text, n.at, strconv.FormatFloat(n.si, 'g', 6, 64), units.SI(s.col.Quantity))
}

// unitlessProblem says once that a column's unit is written nowhere.
func (s *colSpec) unitlessProblem(col fleet.Column) string {
	title := strings.TrimSpace(col.Title)
	// The schema's unit and its US customary counterpart, as the templates write them.
	eg := []string{strconv.Quote(title + " [" + s.col.Unit + "]")}
	if us, ok := units.USCustomary(s.col.Quantity, s.col.Unit); ok && us != s.col.Unit {
		eg = append(eg, strconv.Quote(title+" ["+us+"]"))
	}
	q := strings.ReplaceAll(s.col.Quantity, "_", " ")
	article := "a"
	if q != "" && strings.ContainsRune("aeiou", rune(q[0])) {
		article = "an"
	}
	return fmt.Sprintf("%q gives no unit, and no units row under the header does: %s %s is not read in an assumed unit, so its cells are not read (unless a cell carries its own unit, e.g. \"5 %s\") and the checks that need %s are unchecked; write the unit in the header, e.g. %s",
		title, article, q, s.col.Unit, s.col.Header, strings.Join(eg, " or "))
}
