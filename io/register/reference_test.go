package register

// The reader's per-cell conversion of commit f7400a6, without the per-row speed-ups,
// kept verbatim under ref* names as the oracle of the differential tests in
// diff_test.go and, through refNext, reader_diff_test.go. It stays because the fuzz
// targets FuzzCellMatchesReference and FuzzReaderMatchesReference compare with it, and
// a fuzz target's inputs have no golden output. It is not used by the reader.

import (
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"
	"time"

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
	"hoistfleet/io/units"
)

// parse reads one cell of the column: the Value in SI for a known column and the Cell
// as given for pass-through. asset is the row's asset id, for the error.
func (s *colSpec) refParse(raw string, d dialect, ref fleet.CellRef, asset string) (fleet.Value, fleet.Cell) {
	text := strings.TrimSpace(raw)
	c := fleet.Cell{Text: raw}
	v := fleet.Value{Raw: raw, Cell: ref}
	if !s.known {
		c.IsNumber = refIsPlainNumber(text)
		return v, c
	}
	kind := s.col.Kind
	c.IsNumber = kind != schema.Text && kind != schema.Date && refIsPlainNumber(text)
	if text == "" || s.blankMarker(text) { // issue 14: blank markers read as empty
		return v, c
	}
	bad := func(k fleet.Kind, sentinel error, format string, args ...any) (fleet.Value, fleet.Cell) {
		v.State = fleet.Bad
		v.Err = &fleet.Error{Kind: k, Asset: asset, Cell: ref, Field: s.col.Key,
			Err: &cellError{msg: fmt.Sprintf(format, args...), kind: sentinel}}
		return v, c
	}
	if s.headerErr != "" {
		return bad(fleet.HeaderProblem, ErrUnit, "%s", s.headerErr)
	}
	switch kind {
	case schema.Number, schema.Integer:
		x, hint, ok := refParseNumber(text, d)
		factor := s.factor
		if !ok && s.col.Quantity == "ratio" && strings.HasSuffix(text, "%") {
			// A per cent sign in the cell is explicit: 95 % is 0.95 whatever the header says.
			x, hint, ok = refParseNumber(strings.TrimSpace(strings.TrimSuffix(text, "%")), d)
			factor = 0.01
		}
		ownUnit := false
		if !ok { // issue 14: a value with its unit in the cell, shared with the reader
			if cx, cf, msg, handled := s.cellUnit(text, d); handled {
				if msg != "" {
					return bad(fleet.Invalid, ErrUnit, "%q %s", text, msg)
				}
				x, factor, ok, ownUnit = cx, cf, true, true
			}
		}
		if !ok {
			return bad(fleet.Invalid, ErrNotNumber, "%q is not a number%s%s", text, s.in(), hint)
		}
		if s.noUnit && !ownUnit { // issue 14: no unit anywhere, no number read
			v.State = fleet.Bad
			v.Err = &fleet.Error{Kind: fleet.Unitless, Asset: asset, Cell: ref, Field: s.col.Key,
				Err: &cellError{msg: fmt.Sprintf("%q is not read: the %s column gives no unit (header %s)", text, s.col.Header, fleet.CellRef{Sheet: ref.Sheet, Row: s.headerRow, Col: ref.Col}), kind: ErrUnit}}
			return v, c
		}
		if kind == schema.Integer && x != math.Trunc(x) {
			return bad(fleet.Invalid, ErrNotWhole, "%q is not a whole number%s", text, s.in())
		}
		si := x * factor
		if math.IsInf(si, 0) {
			return bad(fleet.OutOfRange, ErrOutOfRange, "%q is too large%s", text, s.in())
		}
		v.Num = si
		if msg := s.checkRange(si); msg != "" {
			return bad(fleet.OutOfRange, ErrOutOfRange, "%q is out of range%s: %s", text, s.in(), msg)
		}
		v.State = fleet.OK
	case schema.Date:
		t, msg := refParseDate(text, d)
		if msg != "" { // issue 14: dates in other layouts, shared with the reader
			t, msg = s.textDateOr(text, d, ref, msg)
		}
		if msg != "" {
			return bad(fleet.Invalid, ErrNotDate, "%q is not a date: %s", text, msg)
		}
		v.Date, v.State = t, fleet.OK
		c.IsDate, c.Date = true, t
	case schema.Enum:
		if s.col.Key == "load_spectrum" {
			if _, _, ok := refParseNumber(text, d); ok {
				return bad(fleet.Invalid, ErrNotAllowed, "%q is a number: the load spectrum is a class L1 to L4; for a factor km use the Spectrum factor column", text)
			}
		}
		val, ok := s.refMatchEnum(text)
		if !ok {
			return bad(fleet.Invalid, ErrNotAllowed, "%q is not one of %s", text, strings.Join(s.col.Values, ", "))
		}
		v.Text, v.State = val, fleet.OK
	case schema.Bool:
		switch strings.ToLower(text) {
		case "yes", "y", "true", "1":
			v.Text = "yes"
		case "no", "n", "false", "0":
			v.Text = "no"
		default:
			return bad(fleet.Invalid, ErrNotAllowed, "%q is not yes or no", text)
		}
		v.State = fleet.OK
	default: // text
		v.Text, v.State = text, fleet.OK
	}
	return v, c
}

var (
	refThousandsComma = regexp.MustCompile(`^[+-]?\d{1,3}(,\d{3})+(\.\d*)?$`)
	refThousandsPoint = regexp.MustCompile(`^[+-]?[1-9]\d{0,2}(\.\d{3})+$`)
	refNumberWithUnit = regexp.MustCompile(`^[+-]?(\d+[.,]?\d*|[.,]\d+)\s*[^\d\s.,+-][^\d]*$`)
)

// parseNumber reads a decimal number: digits, an optional sign, one decimal point and
// an optional exponent. In the decimal-comma dialect the decimal separator may be a
// comma ("12,5") or a point; a point followed by exactly three digits ("1.250") is
// refused there as it may be a thousands separator. Thousands separators, units in the
// cell, NaN and infinities are refused. hint explains a refusal (": …").
func refParseNumber(t string, d dialect) (x float64, hint string, ok bool) {
	s := t
	hasComma, hasPoint := strings.Contains(s, ","), strings.Contains(s, ".")
	// The common case first: a plain number with a decimal point, and no point that may
	// be a thousands separator.
	if !hasComma && (!d.decimalComma || !hasPoint || !refThousandsPoint.MatchString(s)) && refNumberSyntax(s) {
		x, err := strconv.ParseFloat(s, 64)
		if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
			return 0, "", false
		}
		return x, "", true
	}
	switch {
	case strings.HasPrefix(s, "#"):
		return 0, ": the cell holds a spreadsheet error", false
	case strings.ContainsAny(s, " \u00a0'_") && refIsDigits(strings.NewReplacer(" ", "", "\u00a0", "", "'", "", "_", "").Replace(s)):
		return 0, ": write it without thousands separators", false
	case refNumberWithUnit.MatchString(s):
		return 0, ": write the number only; the unit belongs in the header", false
	case d.decimalComma && hasComma && hasPoint:
		return 0, ": write it without thousands separators", false
	case d.decimalComma && hasComma:
		if strings.Count(s, ",") > 1 {
			return 0, ": write it without thousands separators", false
		}
		s = strings.Replace(s, ",", ".", 1)
	case d.decimalComma && hasPoint && refThousandsPoint.MatchString(s):
		return 0, ": the point may be a thousands separator or a decimal point; write it without thousands separators (1250) or with a decimal comma (1,25)", false
	case hasComma && refThousandsComma.MatchString(s):
		return 0, ": write it without thousands separators", false
	case hasComma:
		return 0, ": use a decimal point", false
	}
	if !refNumberSyntax(s) {
		return 0, "", false
	}
	x, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
		return 0, "", false
	}
	return x, "", true
}

// numberSyntax accepts [+-]digits[.digits][e[+-]digits] with at least one digit before
// the exponent; it refuses what strconv also accepts but a register should not hold:
// hex, underscores, "Inf", "NaN".
func refNumberSyntax(s string) bool {
	i, n := 0, len(s)
	if i < n && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits := 0
	for i < n && s[i] >= '0' && s[i] <= '9' {
		i, digits = i+1, digits+1
	}
	if i < n && s[i] == '.' {
		i++
		for i < n && s[i] >= '0' && s[i] <= '9' {
			i, digits = i+1, digits+1
		}
	}
	if digits == 0 {
		return false
	}
	if i < n && (s[i] == 'e' || s[i] == 'E') {
		i++
		if i < n && (s[i] == '+' || s[i] == '-') {
			i++
		}
		e := 0
		for i < n && s[i] >= '0' && s[i] <= '9' {
			i, e = i+1, e+1
		}
		if e == 0 {
			return false
		}
	}
	return i == n
}

func refIsDigits(s string) bool {
	if s == "" {
		return false
	}
	for i := 0; i < len(s); i++ {
		if s[i] < '0' || s[i] > '9' {
			return false
		}
	}
	return true
}

// isPlainNumber reports whether a cell's text is a number as a spreadsheet or a program
// writes one, so that it can be passed through as a number: it parses, and it reads like
// a number: no leading "+", no leading zeros except "0" and "0.x" (so ids such as "007"
// stay text), no leading or trailing point.
func refIsPlainNumber(s string) bool {
	if s == "" || !refNumberSyntax(s) || s[0] == '+' {
		return false
	}
	m := strings.TrimPrefix(s, "-")
	if m == "" || m[0] == '.' || strings.HasSuffix(m, ".") || strings.Contains(m, ".e") || strings.Contains(m, ".E") {
		return false
	}
	if len(m) > 1 && m[0] == '0' && m[1] != '.' && m[1] != 'e' && m[1] != 'E' {
		return false
	}
	_, err := strconv.ParseFloat(s, 64)
	return err == nil
}

// parseDate reads an ISO 8601 date (YYYY-MM-DD, optionally followed by a time and a zone,
// which are checked and dropped) or, in an XLSX register, a date serial number of the
// workbook's date system. It returns the date at UTC midnight.
func refParseDate(t string, d dialect) (time.Time, string) {
	if d.xlsx && refIsPlainNumber(t) {
		x, _ := strconv.ParseFloat(t, 64)
		if x < 1 || x > 2958465 { // 1900-01-01 … 9999-12-31
			return time.Time{}, "a date serial must be 1 to 2958465"
		}
		tm, err := excelize.ExcelDateToTime(x, d.date1904)
		if err != nil {
			return time.Time{}, err.Error()
		}
		// Serials carry the time of day as a fraction; round to the nearest second
		// first so that 0.99999999 of a day is not read as the day before.
		tm = tm.Round(time.Second)
		return time.Date(tm.Year(), tm.Month(), tm.Day(), 0, 0, 0, 0, time.UTC), ""
	}
	const want = "write it as YYYY-MM-DD (ISO 8601)"
	if len(t) < 10 {
		return time.Time{}, want
	}
	day, err := time.Parse("2006-01-02", t[:10])
	if err != nil {
		return time.Time{}, want
	}
	if rest := t[10:]; rest != "" {
		ok := false
		for _, layout := range []string{"T15:04:05Z07:00", "T15:04:05", "T15:04Z07:00", "T15:04", " 15:04:05", " 15:04", " 15:04:05Z07:00", "T15:04:05.999999999Z07:00"} {
			if _, err := time.Parse(layout, rest); err == nil {
				ok = true
				break
			}
		}
		if !ok {
			return time.Time{}, want + "; the time after the date is not readable"
		}
	}
	return day, ""
}

// matchEnum finds the schema's spelling of an enum value, ignoring case, spaces and
// punctuation. A duty group may carry its system's name: "ISO M5", "FEM 1Am".
func (s *colSpec) refMatchEnum(text string) (string, bool) {
	var enumKeys []string
	for _, v := range s.col.Values {
		enumKeys = append(enumKeys, units.Normalize(v))
	}
	n := units.Normalize(text)
	if s.col.Key == "duty_group" {
		for _, p := range []string{"iso4301", "iso", "fem9511", "fem"} {
			if m, ok := strings.CutPrefix(n, p); ok && m != "" {
				n = m
				break
			}
		}
	}
	for i, k := range enumKeys {
		if k == n {
			return s.col.Values[i], true
		}
	}
	return "", false
}
