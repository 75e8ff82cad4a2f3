package register

import (
	"errors"
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

// Sentinels wrapped by the errors of Bad values, for errors.Is.
var (
	ErrNotNumber  = errors.New("not a number")
	ErrNotWhole   = errors.New("not a whole number")
	ErrNotDate    = errors.New("not a date")
	ErrNotAllowed = errors.New("not an allowed value")
	ErrOutOfRange = errors.New("out of range")
	ErrUnit       = errors.New("unit not usable")
	ErrSyntax     = errors.New("CSV syntax error")
)

// Sentinels lists the sentinels above: the errors a reader error may match with
// errors.Is (for the register dumps, io/register/regdump).
func Sentinels() []error {
	return []error{ErrNotNumber, ErrNotWhole, ErrNotDate, ErrNotAllowed, ErrOutOfRange, ErrUnit, ErrSyntax}
}

// cellError is a message for the user that also matches a sentinel with errors.Is.
type cellError struct {
	msg  string
	kind error
}

func (e *cellError) Error() string { return e.msg }
func (e *cellError) Unwrap() error { return e.kind }

// dialect says how the cells of a register are written.
type dialect struct {
	decimalComma bool // semicolon-separated CSV: "12,5" is 12.5
	xlsx         bool // raw XLSX values: date columns may hold date serials
	date1904     bool // the workbook uses the 1904 date system
}

// colSpec is what the reader knows about one column of the register.
type colSpec struct {
	known     bool          // the schema knows the column
	col       schema.Column // the schema column when known
	field     int           // its index in schema.Columns() (fleet.Asset.Values)
	factor    float64       // cell × factor = SI
	unitLabel string        // unit in messages ("t", "%"), "" for none
	minSI     float64
	maxSI     float64
	enumKeys  []string // normalized col.Values
	enumSelf  []bool   // col.Values[i] as written matches col.Values[i]
	headerErr string   // non-empty: the column's header is unusable; every non-empty cell is Bad

	// Blank markers ("-", "n/a", "TBC") read as empty: how many, the first and where.
	blankN    int
	blankText string
	blankAt   fleet.CellRef

	dates dateNotes // a date column's order of day and month, and what it read
	// mapDates is the date order a columns file gives the column ("" none).
	mapDates DateOrder

	// A text column's number cells read as shown (their number format applied), and
	// those whose format this reader does not render (read as stored): how many, the
	// first and where.
	shownN, unshownN         int
	shownFirst, unshownFirst [3]string // stored value, format code, shown text
	shownAt, unshownAt       fleet.CellRef

	noUnit    bool          // a physical quantity whose unit is written nowhere: plain numbers are not read
	headerRow int           // the header's row, for messages
	cellUnits cellUnitNotes // cells read in the unit they carry

	// Set by prepare from the above, for the per-cell conversion.
	kind   cellKind // col.Kind
	lo, hi float64  // an SI value outside [lo, hi] fails checkRange (±Inf: no bound)
}

// parse reads one cell of the column: the Value in SI for a known column and the Cell
// as given for pass-through. asset is the row's asset id, for the error.
func (s *colSpec) parse(raw string, d dialect, ref fleet.CellRef, asset string) (fleet.Value, fleet.Cell) {
	var v fleet.Value
	var c fleet.Cell
	if !s.known {
		v.Raw, v.Cell = raw, ref
		c.Text, c.IsNumber = raw, isPlainNumber(strings.TrimSpace(raw))
		return v, c
	}
	s.fill(raw, d, ref, asset, &v, &c)
	return v, c
}

// fill is parse for a known column, writing the Value and the Cell in place: v and c
// must be zero (as in a new Asset's slices), and only the fields that differ from zero
// are written (a cleared slice costs less than whole structs written one by one).
func (s *colSpec) fill(raw string, d dialect, ref fleet.CellRef, asset string, v *fleet.Value, c *fleet.Cell) {
	v.Cell = ref
	if raw == "" {
		return
	}
	v.Raw, c.Text = raw, raw
	text := trimSpace(raw)
	kind := s.kind
	if (kind == kindNumber || kind == kindInteger) && s.fillNumber(text, d, v, c) {
		return
	}
	var num numberCell
	switch kind {
	case kindNumber, kindInteger:
		num = readNumber(text, d)
		c.IsNumber = num.plain
	case kindText, kindDate:
	default:
		c.IsNumber = isPlainNumber(text)
	}
	if text == "" {
		return
	}
	if s.blankMarker(text) {
		if s.blankN == 0 {
			s.blankText, s.blankAt = text, ref
		}
		s.blankN++
		return
	}
	bad := func(k fleet.Kind, sentinel error, format string, args ...any) {
		v.State = fleet.Bad
		v.Err = &fleet.Error{Kind: k, Asset: asset, Cell: ref, Field: s.col.Key,
			Err: &cellError{msg: fmt.Sprintf(format, args...), kind: sentinel}}
	}
	if s.headerErr != "" {
		bad(fleet.HeaderProblem, ErrUnit, "%s", s.headerErr)
		return
	}
	switch kind {
	case kindNumber, kindInteger:
		x, hint, ok := num.x, num.hint, num.ok
		factor := s.factor
		if !ok && s.col.Quantity == "ratio" && strings.HasSuffix(text, "%") {
			// A per cent sign in the cell is explicit: 95 % is 0.95 whatever the header says.
			x, hint, ok = parseNumber(strings.TrimSpace(strings.TrimSuffix(text, "%")), d)
			factor = 0.01
		}
		ownUnit := false
		if !ok {
			if cx, cf, msg, handled := s.cellUnit(text, d); handled {
				if msg != "" {
					bad(fleet.Invalid, ErrUnit, "%q %s", text, msg)
					return
				}
				x, factor, ok, ownUnit = cx, cf, true, true
			}
		}
		if !ok {
			bad(fleet.Invalid, ErrNotNumber, "%q is not a number%s%s", text, s.in(), hint)
			return
		}
		if s.noUnit && !ownUnit {
			v.State = fleet.Bad
			v.Err = &fleet.Error{Kind: fleet.Unitless, Asset: asset, Cell: ref, Field: s.col.Key,
				Err: &cellError{msg: fmt.Sprintf("%q is not read: the %s column gives no unit (header %s)", text, s.col.Header, fleet.CellRef{Sheet: ref.Sheet, Row: s.headerRow, Col: ref.Col}), kind: ErrUnit}}
			return
		}
		if kind == kindInteger && x != math.Trunc(x) {
			bad(fleet.Invalid, ErrNotWhole, "%q is not a whole number%s", text, s.in())
			return
		}
		si := x * factor
		if math.IsInf(si, 0) {
			bad(fleet.OutOfRange, ErrOutOfRange, "%q is too large%s", text, s.in())
			return
		}
		v.Num = si
		if ownUnit {
			s.noteCellUnit(ref, text, si)
		}
		if msg := s.checkRange(si); msg != "" {
			bad(fleet.OutOfRange, ErrOutOfRange, "%q is out of range%s: %s", text, s.in(), msg) // keeps its Num
			return
		}
		v.State = fleet.OK
	case kindDate:
		t, msg := parseDate(text, d)
		if msg != "" {
			t, msg = s.textDateOr(text, d, ref, msg)
		}
		if msg != "" {
			bad(fleet.Invalid, ErrNotDate, "%q is not a date: %s", text, msg)
			return
		}
		v.Date, v.State = t, fleet.OK
		c.IsDate, c.Date = true, t
	case kindEnum:
		if s.col.Key == "load_spectrum" && mayBeNumber(text) {
			if _, _, ok := parseNumber(text, d); ok {
				bad(fleet.Invalid, ErrNotAllowed, "%q is a number: the load spectrum is a class L1 to L4; for a factor km use the Spectrum factor column", text)
				return
			}
		}
		val, ok := s.matchEnum(text)
		if !ok {
			bad(fleet.Invalid, ErrNotAllowed, "%q is not one of %s", text, strings.Join(s.col.Values, ", "))
			return
		}
		v.Text, v.State = val, fleet.OK
	case kindBool:
		switch strings.ToLower(text) {
		case "yes", "y", "true", "1":
			v.Text = "yes"
		case "no", "n", "false", "0":
			v.Text = "no"
		default:
			bad(fleet.Invalid, ErrNotAllowed, "%q is not yes or no", text)
			return
		}
		v.State = fleet.OK
	default: // text
		v.Text, v.State = text, fleet.OK
	}
}

// mayBeNumber is false for text that parseNumber cannot read in any dialect: a number
// starts with a sign, a digit or a decimal separator.
func mayBeNumber(text string) bool {
	if text == "" {
		return false
	}
	c := text[0]
	return c >= '0' && c <= '9' || c == '+' || c == '-' || c == '.' || c == ','
}

// trimSpace is strings.TrimSpace, without the call for text that starts and ends with a
// printable ASCII character (most cells).
func trimSpace(s string) string {
	if n := len(s); n > 0 && s[0] > ' ' && s[0] < 0x7f && s[n-1] > ' ' && s[n-1] < 0x7f {
		return s
	}
	return strings.TrimSpace(s)
}

// numberCell is a number column's cell read once: whether it is written as a plain
// number (Cell.IsNumber) and its value as parseNumber reads it.
type numberCell struct {
	plain bool
	x     float64
	hint  string
	ok    bool
}

// readNumber is isPlainNumber(text) and parseNumber(text, d) in one pass over the text
// for a number without a comma, a point that may be a thousands separator or a unit (the
// common case); other text takes the two functions.
func readNumber(text string, d dialect) numberCell {
	if text == "" {
		return numberCell{}
	}
	nb := scanNumber(text) // the syntax has no comma
	if nb.syntax && (!d.decimalComma || strings.IndexByte(text, '.') < 0 || !matchThousandsPoint(text)) {
		x, err := nb.float(text)
		if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
			return numberCell{plain: err == nil && nb.plain}
		}
		return numberCell{plain: nb.plain, x: x, ok: true}
	}
	x, hint, ok := parseNumber(text, d)
	return numberCell{plain: isPlainNumber(text), x: x, hint: hint, ok: ok}
}

// in is the " in [t]" part of a message, "" for a column without a unit.
func (s *colSpec) in() string {
	if s.unitLabel == "" || s.noUnit {
		return ""
	}
	return " in [" + s.unitLabel + "]"
}

// checkRange compares an SI value with the schema's range (given in the column's default
// unit, converted to SI); the message shows the range in the column's own unit.
func (s *colSpec) checkRange(si float64) string {
	const tol = 1e-9 // unit conversions must not move a value across a bound
	lo := s.col.HasMin && si < s.minSI-tol*math.Abs(s.minSI)
	hi := s.col.HasMax && si > s.maxSI+tol*math.Abs(s.maxSI)
	if !lo && !hi {
		return ""
	}
	show := func(x float64) string { return strconv.FormatFloat(x/s.factor, 'g', 6, 64) }
	u := ""
	if s.unitLabel != "" {
		u = " " + s.unitLabel
	}
	switch {
	case s.col.HasMin && s.col.HasMax:
		return fmt.Sprintf("%s must be %s to %s%s", s.col.Header, show(s.minSI), show(s.maxSI), u)
	case s.col.HasMin:
		return fmt.Sprintf("%s must be at least %s%s", s.col.Header, show(s.minSI), u)
	}
	return fmt.Sprintf("%s must be at most %s%s", s.col.Header, show(s.maxSI), u)
}

var (
	thousandsComma = regexp.MustCompile(`^[+-]?\d{1,3}(,\d{3})+(\.\d*)?$`)
	numberWithUnit = regexp.MustCompile(`^[+-]?(\d+[.,]?\d*|[.,]\d+)\s*[^\d\s.,+-][^\d]*$`)
)

// parseNumber reads a decimal number: digits, an optional sign, one decimal point and
// an optional exponent. In the decimal-comma dialect the decimal separator may be a
// comma ("12,5") or a point; a point followed by exactly three digits ("1.250") is
// refused there as it may be a thousands separator. Thousands separators, units in the
// cell, NaN and infinities are refused. hint explains a refusal (": …").
func parseNumber(t string, d dialect) (x float64, hint string, ok bool) {
	s := t
	hasComma, hasPoint := strings.Contains(s, ","), strings.Contains(s, ".")
	// The common case first: a plain number with a decimal point, and no point that may
	// be a thousands separator.
	if nb := scanNumber(s); !hasComma && (!d.decimalComma || !hasPoint || !matchThousandsPoint(s)) && nb.syntax {
		x, err := nb.float(s)
		if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
			return 0, "", false
		}
		return x, "", true
	}
	switch {
	case strings.HasPrefix(s, "#"):
		return 0, ": the cell holds a spreadsheet error", false
	case strings.ContainsAny(s, " \u00a0'_") && isDigits(strings.NewReplacer(" ", "", "\u00a0", "", "'", "", "_", "").Replace(s)):
		return 0, ": write it without thousands separators", false
	case numberWithUnit.MatchString(s):
		return 0, ": write the number only; the unit belongs in the header", false
	case d.decimalComma && hasComma && hasPoint:
		return 0, ": write it without thousands separators", false
	case d.decimalComma && hasComma:
		if strings.Count(s, ",") > 1 {
			return 0, ": write it without thousands separators", false
		}
		s = strings.Replace(s, ",", ".", 1)
	case d.decimalComma && hasPoint && matchThousandsPoint(s):
		return 0, ": the point may be a thousands separator or a decimal point; write it without thousands separators (1250) or with a decimal comma (1,25)", false
	case hasComma && thousandsComma.MatchString(s):
		return 0, ": write it without thousands separators", false
	case hasComma:
		return 0, ": use a decimal point", false
	}
	nb := scanNumber(s)
	if !nb.syntax {
		return 0, "", false
	}
	x, err := nb.float(s)
	if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
		return 0, "", false
	}
	return x, "", true
}

// numberSyntax accepts [+-]digits[.digits][e[+-]digits] with at least one digit before
// the exponent; it refuses what strconv also accepts but a register should not hold:
// hex, underscores, "Inf", "NaN".
func numberSyntax(s string) bool { return scanNumber(s).syntax }

func isDigits(s string) bool {
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
func isPlainNumber(s string) bool {
	_, ok := plainValue(s)
	return ok
}

// plainValue is the value of a plain number (isPlainNumber), ok false for other text.
func plainValue(s string) (float64, bool) {
	nb := scanNumber(s)
	if !nb.syntax || !nb.plain {
		return 0, false
	}
	x, err := nb.float(s)
	return x, err == nil
}

// matchThousandsPoint reports whether s is written with points as thousands separators:
// [+-]?[1-9][0-9]{0,2}(\.[0-9]{3})+, the whole string.
func matchThousandsPoint(s string) bool {
	i, n := 0, len(s)
	if i < n && (s[i] == '+' || s[i] == '-') {
		i++
	}
	if i >= n || s[i] < '1' || s[i] > '9' {
		return false
	}
	lead := i
	for i < n && s[i] >= '0' && s[i] <= '9' {
		i++
	}
	if i-lead > 3 {
		return false
	}
	groups := 0
	for i < n {
		if s[i] != '.' || i+4 > n || !isDigits(s[i+1:i+4]) {
			return false
		}
		i += 4
		groups++
	}
	return groups > 0
}

// parseDate reads an ISO 8601 date (YYYY-MM-DD, optionally followed by a time and a zone,
// which are checked and dropped) or, in an XLSX register, a date serial number of the
// workbook's date system. It returns the date at UTC midnight.
func parseDate(t string, d dialect) (time.Time, string) {
	if d.xlsx {
		if x, ok := plainValue(t); ok {
			return serialDate(x, d.date1904)
		}
	}
	if day, ok := isoDay(t); ok {
		return day, ""
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

// serialDate reads a date serial number of the workbook's date system.
func serialDate(x float64, date1904 bool) (time.Time, string) {
	if x < 1 || x > 2958465 { // 1900-01-01 … 9999-12-31
		return time.Time{}, "a date serial must be 1 to 2958465"
	}
	tm, err := excelize.ExcelDateToTime(x, date1904)
	if err != nil {
		return time.Time{}, err.Error()
	}
	// Serials carry the time of day as a fraction; round to the nearest second first so
	// that 0.99999999 of a day is not read as the day before.
	tm = tm.Round(time.Second)
	return time.Date(tm.Year(), tm.Month(), tm.Day(), 0, 0, 0, 0, time.UTC), ""
}

// matchEnum finds the schema's spelling of an enum value, ignoring case, spaces and
// punctuation. A duty group may carry its system's name: "ISO M5", "FEM 1Am".
func (s *colSpec) matchEnum(text string) (string, bool) {
	if s.enumKeys == nil {
		for _, v := range s.col.Values {
			s.enumKeys = append(s.enumKeys, units.Normalize(v))
		}
		s.enumSelf = make([]bool, len(s.col.Values))
		for i, v := range s.col.Values {
			m, ok := s.matchNormalized(v)
			s.enumSelf[i] = ok && m == v
		}
	}
	// A value written as the schema writes it (the common case) needs no normalizing.
	for i, v := range s.col.Values {
		if text == v && s.enumSelf[i] {
			return v, true
		}
	}
	return s.matchNormalized(text)
}

// matchNormalized is matchEnum comparing normalized text; enumKeys must be set.
func (s *colSpec) matchNormalized(text string) (string, bool) {
	var buf [64]byte
	n, ok := normalizeASCII(buf[:0], text)
	if !ok {
		return s.matchEnumSlow(text)
	}
	if s.col.Key == "duty_group" {
		for _, p := range []string{"iso4301", "iso", "fem9511", "fem"} {
			if len(n) > len(p) && string(n[:len(p)]) == p {
				n = n[len(p):]
				break
			}
		}
	}
	for i, k := range s.enumKeys {
		if k == string(n) {
			return s.col.Values[i], true
		}
	}
	return "", false
}

// normalizeASCII appends units.Normalize(text) to dst when text is ASCII (letters and
// digits kept, lower-cased); ok is false for other text.
func normalizeASCII(dst []byte, text string) ([]byte, bool) {
	for i := 0; i < len(text); i++ {
		c := text[i]
		switch {
		case c >= 0x80:
			return dst, false
		case c >= 'a' && c <= 'z', c >= '0' && c <= '9':
			dst = append(dst, c)
		case c >= 'A' && c <= 'Z':
			dst = append(dst, c+'a'-'A')
		}
	}
	return dst, true
}

// matchEnumSlow is matchEnum for text that is not ASCII.
func (s *colSpec) matchEnumSlow(text string) (string, bool) {
	n := units.Normalize(text)
	if s.col.Key == "duty_group" {
		for _, p := range []string{"iso4301", "iso", "fem9511", "fem"} {
			if m, ok := strings.CutPrefix(n, p); ok && m != "" {
				n = m
				break
			}
		}
	}
	for i, k := range s.enumKeys {
		if k == n {
			return s.col.Values[i], true
		}
	}
	return "", false
}

// isoDay reads a date written exactly YYYY-MM-DD, as time.Parse("2006-01-02", t) would
// (a month 01 to 12, a day that exists in it), without its general layout machinery;
// ok is false for anything else, which parseDate then reads the slow way.
func isoDay(t string) (time.Time, bool) {
	if len(t) != 10 || t[4] != '-' || t[7] != '-' || !isDigits(t[:4]) || !isDigits(t[5:7]) || !isDigits(t[8:]) {
		return time.Time{}, false
	}
	y := int(t[0]-'0')*1000 + int(t[1]-'0')*100 + int(t[2]-'0')*10 + int(t[3]-'0')
	m := time.Month(int(t[5]-'0')*10 + int(t[6]-'0'))
	d := int(t[8]-'0')*10 + int(t[9]-'0')
	if m < time.January || m > time.December || d < 1 {
		return time.Time{}, false
	}
	last := monthDays[m-1]
	if m == time.February && y%4 == 0 && (y%100 != 0 || y%400 == 0) {
		last = 29
	}
	if d > last {
		return time.Time{}, false
	}
	return time.Date(y, m, d, 0, 0, 0, 0, time.UTC), true
}

var monthDays = [12]int{31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31}

// shown is a text column's number cell as the spreadsheet shows it with its number
// format code (numfmt.go), counted for the notes; a format this reader does not render
// leaves the stored value, counted too.
func (s *colSpec) shown(raw, code string, ref fleet.CellRef) string {
	text, ok := formatNumber(raw, code)
	if !ok {
		if s.unshownN == 0 {
			s.unshownFirst, s.unshownAt = [3]string{raw, code, ""}, ref
		}
		s.unshownN++
		return raw
	}
	if text == raw {
		return raw
	}
	if s.shownN == 0 {
		s.shownFirst, s.shownAt = [3]string{raw, code, text}, ref
	}
	s.shownN++
	return text
}

// shownNotes are the notes of a text column's number cells: read as shown, or as stored.
func (s *colSpec) shownNotes() []string {
	var out []string
	plural := func(n int) string {
		if n == 1 {
			return "1 number cell"
		}
		return strconv.Itoa(n) + " number cells"
	}
	if s.shownN > 0 {
		f := s.shownFirst
		out = append(out, fmt.Sprintf("%s: %s read as the spreadsheet shows them, with their number format (%s formatted %s is %s, first at %s)",
			s.col.Header, plural(s.shownN), f[0], strconv.Quote(f[1]), strconv.Quote(f[2]), s.shownAt))
	}
	if s.unshownN > 0 {
		f := s.unshownFirst
		out = append(out, fmt.Sprintf("%s: %s have a number format this reader does not apply (%s, first at %s): read as stored (%s); check them against the spreadsheet",
			s.col.Header, plural(s.unshownN), strconv.Quote(f[1]), s.unshownAt, f[0]))
	}
	return out
}
