package fleet

import "strconv"

// Sheet limits of the XLSX format (ECMA-376; Excel's specifications and limits).
const (
	maxColumns = 16384   // XFD
	maxRows    = 1048576 // rows in a sheet
)

// ColumnName gives the letters of a 1-based column number: 1 → A, 26 → Z, 27 → AA,
// 702 → ZZ, 703 → AAA, 16384 → XFD. It returns "" for a column outside 1..16384.
func ColumnName(col int) string {
	if col < 1 || col > maxColumns {
		return ""
	}
	// At most three letters: 16384 is XFD.
	var b [3]byte
	i := len(b)
	for col > 0 {
		col-- // bijective base 26: A..Z are the digits 1..26
		i--
		b[i] = byte('A' + col%26)
		col /= 26
	}
	return string(b[i:])
}

// CellName gives the A1-style name of a cell from its 1-based column and row, e.g.
// CellName(6, 14) is "F14". ok is false (and the name "") when the column is outside
// 1..16384 or the row outside 1..1048576.
func CellName(col, row int) (name string, ok bool) {
	if row < 1 || row > maxRows {
		return "", false
	}
	letters := ColumnName(col)
	if letters == "" {
		return "", false
	}
	return letters + strconv.Itoa(row), true
}
