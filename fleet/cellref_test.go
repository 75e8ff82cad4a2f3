package fleet

import "testing"

// columnNumber parses column letters (A → 1, AA → 27); 0 for anything else. It is the
// inverse the round-trip test checks ColumnName against: Horner's rule in bijective
// base 26, written independently of ColumnName's repeated division.
func columnNumber(s string) int {
	if s == "" {
		return 0
	}
	n := 0
	for i := 0; i < len(s); i++ {
		if s[i] < 'A' || s[i] > 'Z' {
			return 0
		}
		n = n*26 + int(s[i]-'A') + 1
	}
	return n
}

// Known column names: the single-, two- and three-letter boundaries and the last
// column of a sheet (XFD, ECMA-376 / Excel's specifications and limits).
func TestColumnNameKnown(t *testing.T) {
	for _, tc := range []struct {
		col  int
		want string
	}{
		{1, "A"}, {2, "B"}, {6, "F"}, {26, "Z"},
		{27, "AA"}, {28, "AB"}, {52, "AZ"}, {53, "BA"}, {702, "ZZ"},
		{703, "AAA"}, {704, "AAB"}, {728, "AAZ"}, {729, "ABA"}, {16384, "XFD"},
		// Outside the sheet: no name.
		{0, ""}, {-1, ""}, {16385, ""}, {1 << 40, ""}, {-1 << 40, ""},
	} {
		if got := ColumnName(tc.col); got != tc.want {
			t.Errorf("ColumnName(%d) = %q, want %q", tc.col, got, tc.want)
		}
	}
}

// Every column 1..16384 round-trips through columnNumber, and the names come in
// shortlex order (shorter first, then alphabetical): with the round trip, that makes
// ColumnName the bijective base-26 numbering spreadsheets use.
func TestColumnNameRoundTrip(t *testing.T) {
	prev := ""
	for col := 1; col <= maxColumns; col++ {
		name := ColumnName(col)
		if back := columnNumber(name); back != col {
			t.Fatalf("ColumnName(%d) = %q, which parses back to %d", col, name, back)
		}
		if len(name) < len(prev) || len(name) == len(prev) && name <= prev {
			t.Fatalf("ColumnName(%d) = %q does not follow %q", col, name, prev)
		}
		prev = name
	}
	if prev != "XFD" {
		t.Errorf("last column is %q, want XFD", prev)
	}
}

func TestCellName(t *testing.T) {
	for _, tc := range []struct {
		col, row int
		want     string
		ok       bool
	}{
		{1, 1, "A1", true}, {6, 14, "F14", true}, {28, 7, "AB7", true},
		{16384, 1048576, "XFD1048576", true},
		{0, 1, "", false}, {1, 0, "", false}, {-3, 5, "", false}, {5, -3, "", false},
		{16385, 1, "", false}, {1, 1048577, "", false},
	} {
		got, ok := CellName(tc.col, tc.row)
		if got != tc.want || ok != tc.ok {
			t.Errorf("CellName(%d, %d) = %q, %v; want %q, %v", tc.col, tc.row, got, ok, tc.want, tc.ok)
		}
	}
}

// CellRef.String in each of its forms, including references outside a sheet's limits
// (what a user sees in an error message; the same texts as excelize's
// ColumnNumberToName and CoordinatesToCellName give).
func TestCellRefString(t *testing.T) {
	for _, tc := range []struct {
		ref  CellRef
		want string
	}{
		{CellRef{Sheet: "Register"}, "Register"},
		{CellRef{Sheet: "Register", Row: 14}, "Register!14:14"},
		{CellRef{Sheet: "Register", Col: 6}, "Register!F:F"},
		{CellRef{Sheet: "Register", Col: 16384}, "Register!XFD:XFD"},
		{CellRef{Sheet: "Register", Row: 14, Col: 6}, "Register!F14"},
		{CellRef{Sheet: "Register", Row: 7, Col: 28}, "Register!AB7"},
		{CellRef{Sheet: "r.csv", Row: 1048576, Col: 16384}, "r.csv!XFD1048576"},
		// Outside the limits.
		{CellRef{Sheet: "r.csv", Col: 16385}, "r.csv!:"},
		{CellRef{Sheet: "r.csv", Col: -1}, "r.csv!:"},
		{CellRef{Sheet: "r.csv", Row: 2, Col: 16385}, "r.csv!R2C16385"},
		{CellRef{Sheet: "r.csv", Row: 1048577, Col: 3}, "r.csv!R1048577C3"},
		{CellRef{Sheet: "r.csv", Row: -1, Col: 3}, "r.csv!R-1C3"},
		{CellRef{Sheet: "r.csv", Row: 4, Col: -2}, "r.csv!R4C-2"},
		{CellRef{Sheet: "r.csv", Row: -5}, "r.csv!-5:-5"},
	} {
		if got := tc.ref.String(); got != tc.want {
			t.Errorf("%+v.String() = %q, want %q", tc.ref, got, tc.want)
		}
	}
}
