package register

import (
	"fmt"
	"io"
	"strconv"
	"strings"
	"time"

	"hoistfleet/fleet"
)

// Dates as spreadsheets write them. ISO 8601 (2026-03-25) and, in a workbook, date
// serials are read by parseDate. Other text is read here:
//
//   - numbers with / . or - between them: 2026/03/25 (year first), 25/03/2026 and
//     25.03.2026 (day first), 03/25/2026 (month first). Which of day and month comes first
//     is the column's date order: --date-order, else the order its own unambiguous cells
//     show (a first number above 12 can only be a day); a cell that reads both ways
//     (03/04/2026) in a column with no such evidence is refused, asking for --date-order.
//   - month names, English: 25-Mar-26, 25 March 2026, March 25, 2026, Mar 25 2026.
//   - a month and a year (Mar 2026, 03/2026): the first of the month, the stricter reading
//     for a date something was last done (it makes it older), and said so.
//   - a whole number 10000 to 2958465 in a CSV date column: a spreadsheet date serial of
//     the 1900 date system (10000 is 1927-05-18; a year such as 2026 is refused).
//   - two-digit years as spreadsheet programs read them: 00–29 are 2000–2029, 30–99
//     1930–1999 (Microsoft, "How Excel works with two-digit year numbers"), said so.

// DateOrder is the order of day and month in dates written with numbers only.
type DateOrder string

// Date orders (--date-order).
const (
	DateOrderAuto DateOrder = ""    // from each column's own unambiguous dates
	DMY           DateOrder = "dmy" // 25/03/2026
	MDY           DateOrder = "mdy" // 03/25/2026
	YMD           DateOrder = "ymd" // 26/03/25 (a two-digit year first); 2026/03/25 is read in every order
)

// ParseDateOrder reads --date-order.
func ParseDateOrder(s string) (DateOrder, error) {
	switch o := DateOrder(strings.ToLower(strings.TrimSpace(s))); o {
	case DateOrderAuto, DMY, MDY, YMD:
		return o, nil
	}
	return "", fmt.Errorf("date order %q: want dmy, mdy or ymd", s)
}

// dateShape is what a date cell's text says about the order of day and month.
type dateShape uint8

const (
	shapeOther  dateShape = iota // no evidence: ISO, a month name, not a date
	shapeDMY                     // only day first reads: 25/03/2026
	shapeMDY                     // only month first reads: 03/25/2026
	shapeEither                  // both read, differently: 03/04/2026
)

// textDate is a date read from text by readTextDate.
type textDate struct {
	t         time.Time
	shape     dateShape
	twoDigit  bool // the year was written with two digits
	monthOnly bool // no day: the first of the month
	serial    bool // a spreadsheet date serial in a CSV file
}

var monthNames = [12]string{"january", "february", "march", "april", "may", "june", "july", "august", "september", "october", "november", "december"}

// monthOf reads an English month name or its abbreviation ("Mar", "Sept", "March").
func monthOf(tok string) (time.Month, bool) {
	t := strings.ToLower(strings.TrimSuffix(tok, "."))
	if len(t) < 3 {
		return 0, false
	}
	for i, m := range monthNames {
		if strings.HasPrefix(m, t) || (t == "sept" && i == 8) {
			return time.Month(i + 1), true
		}
	}
	return 0, false
}

// dateTokens splits a date's text at spaces, commas, slashes, points and hyphens;
// seps are the separators between numbers ("/", ".", "-", " ").
func dateTokens(s string) (toks []string, seps string) {
	start := -1
	for i := 0; i <= len(s); i++ {
		sep := i == len(s) || strings.IndexByte(" ,/.-", s[i]) >= 0
		if !sep {
			if start < 0 {
				start = i
			}
			continue
		}
		if start >= 0 {
			toks = append(toks, s[start:i])
			start = -1
		}
		if i < len(s) && s[i] != ',' && !strings.ContainsRune(seps, rune(s[i])) {
			seps += string(s[i])
		}
	}
	return toks, seps
}

// fullYear reads a year of 4 digits, or 2 as a spreadsheet program reads them.
func fullYear(tok string) (y int, twoDigit, ok bool) {
	n, err := strconv.Atoi(tok)
	if err != nil || n < 0 {
		return 0, false, false
	}
	switch len(tok) {
	case 4:
		return n, false, true
	case 2:
		if n < 30 {
			return 2000 + n, true, true
		}
		return 1900 + n, true, true
	}
	return 0, false, false
}

// makeDate builds a date, false when the day does not exist in the month.
func makeDate(y int, m time.Month, d int) (time.Time, bool) {
	if m < 1 || m > 12 || d < 1 || y < 1 || y > 9999 {
		return time.Time{}, false
	}
	t := time.Date(y, m, d, 0, 0, 0, 0, time.UTC)
	return t, t.Day() == d && t.Month() == m
}

// readTextDate reads a date that is not ISO 8601 in the given order of day and month
// (DateOrderAuto: the cell's own shape decides, and a cell that reads both ways is
// refused). msg explains a refusal.
func readTextDate(text string, order DateOrder, csv bool) (textDate, string) {
	s := strings.TrimSpace(text)
	if csv && isDigits(s) && len(s) >= 5 && len(s) <= 7 {
		x, _ := strconv.Atoi(s)
		if x >= 10000 && x <= 2958465 {
			t, msg := serialDate(float64(x), false)
			return textDate{t: t, serial: true}, msg
		}
	}
	toks, seps := dateTokens(s)
	if len(toks) < 2 || len(toks) > 3 {
		return textDate{}, want
	}
	// A month name.
	mi := -1
	for i, tk := range toks {
		if !isDigits(tk) {
			if _, ok := monthOf(tk); !ok || mi >= 0 {
				return textDate{}, want
			}
			mi = i
		}
	}
	if mi >= 0 {
		m, _ := monthOf(toks[mi])
		var nums []string
		for i, tk := range toks {
			if i != mi {
				nums = append(nums, tk)
			}
		}
		if len(nums) == 1 { // Mar 2026
			y, two, ok := fullYear(nums[0])
			if !ok || two || mi != 0 {
				return textDate{}, want
			}
			t, _ := makeDate(y, m, 1)
			return textDate{t: t, monthOnly: true}, ""
		}
		var dayTok, yearTok string
		switch {
		case len(nums[0]) == 4: // 2026-Mar-25
			yearTok, dayTok = nums[0], nums[1]
		case mi == 0 || mi == 1: // Mar 25 2026, 25-Mar-26
			dayTok, yearTok = nums[0], nums[1]
		default:
			return textDate{}, want
		}
		y, two, ok := fullYear(yearTok)
		d, err := strconv.Atoi(dayTok)
		if !ok || err != nil || len(dayTok) > 2 {
			return textDate{}, want
		}
		t, ok := makeDate(y, m, d)
		if !ok {
			return textDate{}, fmt.Sprintf("there is no day %d in %s %d; %s", d, m, y, want)
		}
		return textDate{t: t, twoDigit: two}, ""
	}
	// Numbers only, one kind of separator.
	if len(seps) != 1 || seps == " " {
		return textDate{}, want
	}
	if len(toks) == 2 { // 03/2026
		mo, err := strconv.Atoi(toks[0])
		y, two, ok := fullYear(toks[1])
		if err != nil || !ok || two || len(toks[0]) > 2 {
			return textDate{}, want
		}
		t, ok := makeDate(y, time.Month(mo), 1)
		if !ok {
			return textDate{}, want
		}
		return textDate{t: t, monthOnly: true}, ""
	}
	a, errA := strconv.Atoi(toks[0])
	b, errB := strconv.Atoi(toks[1])
	if errA != nil || errB != nil || len(toks[1]) > 2 {
		return textDate{}, want
	}
	if len(toks[0]) == 4 || (order == YMD && len(toks[0]) == 2) { // 2026/03/25
		y, two, ok := fullYear(toks[0])
		d, err := strconv.Atoi(toks[2])
		if !ok || err != nil || len(toks[2]) > 2 {
			return textDate{}, want
		}
		t, ok := makeDate(y, time.Month(b), d)
		if !ok {
			return textDate{}, want
		}
		return textDate{t: t, twoDigit: two}, ""
	}
	if len(toks[0]) > 2 {
		return textDate{}, want
	}
	y, two, ok := fullYear(toks[2])
	if !ok {
		return textDate{}, want
	}
	dmy, okD := makeDate(y, time.Month(b), a)
	mdy, okM := makeDate(y, time.Month(a), b)
	td := textDate{twoDigit: two}
	switch {
	case okD && okM && dmy.Equal(mdy): // 04/04/2026
		td.t = dmy
		return td, ""
	case okD && okM:
		td.shape = shapeEither
	case okD:
		td.shape = shapeDMY
	case okM:
		td.shape = shapeMDY
	default:
		return textDate{}, "there is no such day, whether the day or the month comes first; " + want
	}
	switch {
	case order == DMY && okD, order != MDY && td.shape == shapeDMY:
		td.t = dmy
		return td, ""
	case order == MDY && okM, order != DMY && td.shape == shapeMDY:
		td.t = mdy
		return td, ""
	case order == DMY:
		return td, "not a date with the day first (--date-order dmy)"
	case order == MDY:
		return td, "not a date with the month first (--date-order mdy)"
	}
	return td, fmt.Sprintf("it reads as %s (day first) or %s (month first), and the column has no date that settles which (a day above 12): give --date-order dmy or mdy, or write it as YYYY-MM-DD",
		dmy.Format("2 January 2006"), mdy.Format("January 2, 2006"))
}

// want is the message for text that is no date.
const want = "write it as YYYY-MM-DD (ISO 8601)"

// dateNotes is what a date column read, for its notes: the evidence for its order and
// the readings that are said once.
type dateNotes struct {
	order            DateOrder // --date-order, "" to infer
	dmyAt, mdyAt     fleet.CellRef
	dmyText, mdyText string
	twoDigit         counted // two-digit years
	monthOnly        counted // dates without a day
	serial           counted // spreadsheet date serials in a CSV file
	textDates        counted // dates read from text other than ISO 8601
	lookedAhead      bool    // the reader has looked ahead for evidence once (rows later come by anyway)
}

// inferred is the column's order: the option, else the one its evidence shows.
func (n *dateNotes) inferred() DateOrder {
	switch {
	case n.order != DateOrderAuto:
		return n.order
	case !n.dmyAt.IsZero() && n.mdyAt.IsZero():
		return DMY
	case !n.mdyAt.IsZero() && n.dmyAt.IsZero():
		return MDY
	}
	return DateOrderAuto
}

// evidence notes what one cell says about the column's order.
func (n *dateNotes) evidence(shape dateShape, ref fleet.CellRef, text string) {
	switch {
	case shape == shapeDMY && n.dmyAt.IsZero():
		n.dmyAt, n.dmyText = ref, text
	case shape == shapeMDY && n.mdyAt.IsZero():
		n.mdyAt, n.mdyText = ref, text
	}
}

// settled reports whether more evidence cannot change how an ambiguous cell is read.
func (n *dateNotes) settled() bool {
	return n.order != DateOrderAuto || !n.dmyAt.IsZero() && !n.mdyAt.IsZero()
}

// fillTextDate reads a date column's cell that parseDate could not: text in another
// layout. It returns the date, or the message of a refusal.
func (s *colSpec) fillTextDate(text string, d dialect, ref fleet.CellRef) (time.Time, string) {
	n := &s.dates
	order := n.inferred()
	td, msg := readTextDate(text, order, !d.xlsx)
	if msg == "" || td.shape == shapeEither {
		n.evidence(td.shape, ref, text)
	}
	if msg != "" {
		if s.mapDates != DateOrderAuto && s.mapDates == order {
			// The order is the columns file's, not the command line's.
			msg = strings.Replace(msg, "(--date-order "+string(order)+")", "(the columns file's date order "+string(order)+")", 1)
		}
		if td.shape == shapeEither && !n.dmyAt.IsZero() && !n.mdyAt.IsZero() && n.order == DateOrderAuto {
			msg = fmt.Sprintf("it reads both ways, and the column has dates with the day first (%q at %s) and with the month first (%q at %s): give --date-order dmy or mdy, or write it as YYYY-MM-DD",
				n.dmyText, n.dmyAt, n.mdyText, n.mdyAt)
		}
		return time.Time{}, msg
	}
	n.textDates.add(true, ref)
	n.twoDigit.add(td.twoDigit, ref)
	n.monthOnly.add(td.monthOnly, ref)
	n.serial.add(td.serial, ref)
	return td.t, ""
}

// counted is how many cells of a column had something to say once, and where the first was.
type counted struct {
	n     int
	first fleet.CellRef
}

// add counts the cell at ref when it has the reading.
func (c *counted) add(has bool, ref fleet.CellRef) {
	if !has {
		return
	}
	if c.n == 0 {
		c.first = ref
	}
	c.n++
}

// textDateOr is a date cell parseDate refused with msg, read as text in another layout
// when it is one; msg stays when the cell is no date in any layout.
func (s *colSpec) textDateOr(text string, d dialect, ref fleet.CellRef, msg string) (time.Time, string) {
	t, m := s.fillTextDate(text, d, ref)
	switch {
	case m == "":
		return t, ""
	case m != want:
		return time.Time{}, m
	}
	return time.Time{}, msg
}

// notes are the date column's notes for the header's problems, said once.
func (s *colSpec) dateNoteList() []string {
	n := &s.dates
	var out []string
	if n.textDates.n > 0 {
		switch {
		case n.order != DateOrderAuto && s.mapDates != DateOrderAuto:
			out = append(out, fmt.Sprintf("dates written with numbers read in the order %s (the columns file)", n.order))
		case n.order != DateOrderAuto:
			out = append(out, fmt.Sprintf("dates written with numbers read in the order %s (--date-order)", n.order))
		case !n.dmyAt.IsZero() && n.mdyAt.IsZero():
			out = append(out, fmt.Sprintf("dates read with the day first, as the column's own dates show (%q at %s)", n.dmyText, n.dmyAt))
		case !n.mdyAt.IsZero() && n.dmyAt.IsZero():
			out = append(out, fmt.Sprintf("dates read with the month first, as the column's own dates show (%q at %s)", n.mdyText, n.mdyAt))
		}
	}
	if n.twoDigit.n > 0 {
		out = append(out, fmt.Sprintf("%d two-digit years (first at %s) read as spreadsheet programs read them: 00–29 as 2000–2029, 30–99 as 1930–1999", n.twoDigit.n, n.twoDigit.first))
	}
	if n.monthOnly.n > 0 {
		out = append(out, fmt.Sprintf("%d dates without a day (first at %s) read as the first of the month, the stricter reading for a date something was last done", n.monthOnly.n, n.monthOnly.first))
	}
	if n.serial.n > 0 {
		out = append(out, fmt.Sprintf("%d whole numbers (first at %s) read as spreadsheet date serials (1900 date system)", n.serial.n, n.serial.first))
	}
	return out
}

// isISOShaped is a quick test for text parseDate reads: 4 digits and a hyphen.
func isISOShaped(t string) bool {
	return len(t) >= 10 && t[4] == '-' && t[0] >= '0' && t[0] <= '9'
}

// scanDates looks at a row's date cells before it is converted: the evidence each gives
// of its column's order of day and month. A cell that reads both ways in a column with
// no evidence yet makes the reader look ahead for some.
func (r *Reader) scanDates(rr rawRow) {
	for _, i := range r.dateCols {
		if i >= len(rr.cells) {
			continue
		}
		s := &r.specs[i]
		if s.dates.settled() {
			continue
		}
		t := trimSpace(rr.cells[i])
		if t == "" || isISOShaped(t) {
			continue
		}
		td, _ := readTextDate(t, DateOrderAuto, !r.d.xlsx)
		ref := fleet.CellRef{Sheet: r.sheet, Row: rr.row, Col: i + 1}
		s.dates.evidence(td.shape, ref, t)
		if td.shape == shapeEither && s.dates.inferred() == DateOrderAuto && !s.dates.lookedAhead {
			s.dates.lookedAhead = true
			r.lookAhead(i)
		}
	}
}

// maxLookAhead bounds the rows held while looking for a column's date order.
const maxLookAhead = 200_000

// lookAhead reads rows ahead, held for Next, until one settles column i's order of day
// and month, the file ends or maxLookAhead rows are held.
func (r *Reader) lookAhead(i int) {
	s := &r.specs[i]
	look := func(rr rawRow) {
		if i < len(rr.cells) && rr.syntax == nil {
			if t := trimSpace(rr.cells[i]); t != "" && !isISOShaped(t) {
				td, _ := readTextDate(t, DateOrderAuto, !r.d.xlsx)
				s.dates.evidence(td.shape, fleet.CellRef{Sheet: r.sheet, Row: rr.row, Col: i + 1}, t)
			}
		}
	}
	for _, rr := range r.replay { // the rows already held come next
		if s.dates.inferred() != DateOrderAuto {
			return
		}
		look(rr)
	}
	for len(r.replay) < maxLookAhead && s.dates.inferred() == DateOrderAuto && !r.srcDone {
		rr, err := r.src.next()
		if err != nil {
			if err != io.EOF {
				err = r.located(err)
			}
			r.srcDone, r.srcErr = true, err
			return
		}
		rr.cells = append([]string(nil), rr.cells...)
		rr.formats = append([]string(nil), rr.formats...)
		r.replay = append(r.replay, rr)
		look(rr)
	}
}
