package register

import (
	"strings"
	"testing"
	"time"

	"hoistfleet/fleet"
)

func day(y int, m time.Month, d int) time.Time { return time.Date(y, m, d, 0, 0, 0, 0, time.UTC) }

// TestReadTextDate: each layout, in each order. Two-digit years follow the spreadsheet
// rule (Microsoft, "How Excel works with two-digit year numbers": 00–29 → 2000–2029,
// 30–99 → 1930–1999); date serials the 1900 date system (Microsoft, "Date systems in
// Excel": 45292 is 2024-01-01).
func TestReadTextDate(t *testing.T) {
	tests := []struct {
		text  string
		order DateOrder
		want  time.Time // zero: refused
		shape dateShape
		msg   string // part of the refusal
	}{
		{"25/03/2026", DateOrderAuto, day(2026, 3, 25), shapeDMY, ""},
		{"25.03.2026", DateOrderAuto, day(2026, 3, 25), shapeDMY, ""},
		{"25-03-2026", DateOrderAuto, day(2026, 3, 25), shapeDMY, ""},
		{"03/25/2026", DateOrderAuto, day(2026, 3, 25), shapeMDY, ""},
		{"3/4/2026", DateOrderAuto, time.Time{}, shapeEither, "3 April 2026 (day first) or March 4, 2026 (month first)"},
		{"3/4/2026", DMY, day(2026, 4, 3), shapeEither, ""},
		{"3/4/2026", MDY, day(2026, 3, 4), shapeEither, ""},
		{"04/04/2026", DateOrderAuto, day(2026, 4, 4), shapeOther, ""}, // the same either way
		{"25/03/2026", MDY, time.Time{}, shapeDMY, "not a date with the month first (--date-order mdy)"},
		{"03/25/2026", DMY, time.Time{}, shapeMDY, "not a date with the day first (--date-order dmy)"},
		{"2026/03/25", MDY, day(2026, 3, 25), shapeOther, ""},
		{"2026.03.25", DateOrderAuto, day(2026, 3, 25), shapeOther, ""},
		{"26/03/25", YMD, day(2026, 3, 25), shapeOther, ""},
		{"25/03/26", DateOrderAuto, day(2026, 3, 25), shapeDMY, ""},
		{"25/03/30", DateOrderAuto, day(1930, 3, 25), shapeDMY, ""},
		{"25-Mar-26", DateOrderAuto, day(2026, 3, 25), shapeOther, ""},
		{"25 March 2026", DateOrderAuto, day(2026, 3, 25), shapeOther, ""},
		{"March 25, 2026", DateOrderAuto, day(2026, 3, 25), shapeOther, ""},
		{"Mar 25 2026", DateOrderAuto, day(2026, 3, 25), shapeOther, ""},
		{"2026-Mar-25", DateOrderAuto, day(2026, 3, 25), shapeOther, ""},
		{"Sept 1, 2025", DateOrderAuto, day(2025, 9, 1), shapeOther, ""},
		{"Mar 2026", DateOrderAuto, day(2026, 3, 1), shapeOther, ""},
		{"03/2026", DateOrderAuto, day(2026, 3, 1), shapeOther, ""},
		{"45292", DateOrderAuto, day(2024, 1, 1), shapeOther, ""},
		{"31/02/2025", DateOrderAuto, time.Time{}, shapeOther, "there is no such day, whether the day or the month comes first"},
		{"30-Feb-26", DateOrderAuto, time.Time{}, shapeOther, "there is no day 30 in February 2026"},
		{"2026", DateOrderAuto, time.Time{}, shapeOther, "YYYY-MM-DD"}, // a year is no date serial
		{"13/13/2026", DateOrderAuto, time.Time{}, shapeOther, "no such day"},
		{"25/03-2026", DateOrderAuto, time.Time{}, shapeOther, "YYYY-MM-DD"},
		{"next March", DateOrderAuto, time.Time{}, shapeOther, "YYYY-MM-DD"},
		{"25/03/2026 10:00", DateOrderAuto, time.Time{}, shapeOther, "YYYY-MM-DD"},
	}
	for _, tt := range tests {
		td, msg := readTextDate(tt.text, tt.order, true)
		if tt.want.IsZero() {
			if msg == "" || !strings.Contains(msg, tt.msg) {
				t.Errorf("%q (%q): read as %v, message %q; want a refusal with %q", tt.text, tt.order, td.t, msg, tt.msg)
			}
		} else if msg != "" || !td.t.Equal(tt.want) {
			t.Errorf("%q (%q): %v %q, want %v", tt.text, tt.order, td.t, msg, tt.want)
		}
		if td.shape != tt.shape {
			t.Errorf("%q: shape %d, want %d", tt.text, td.shape, tt.shape)
		}
	}
	// In a workbook a whole number is parseDate's serial (the workbook's date system),
	// never this one.
	if _, msg := readTextDate("45292", DateOrderAuto, false); msg == "" {
		t.Errorf("a workbook's text 45292 read as a serial of the 1900 system")
	}
}

// TestDateColumnOrder: a column's order comes from its own unambiguous dates, even when
// they come after the ambiguous ones; a column without evidence refuses its ambiguous
// dates, and so does a column whose dates disagree.
func TestDateColumnOrder(t *testing.T) {
	const reg = "Asset ID,Site,Last inspection,Commissioned,Last load test\n" +
		"H-1,A,03/04/2026,03/04/2020,03/04/2025\n" + // row 2: every cell reads both ways
		"H-2,A,2026-01-05,2019-07-01,11/05/2025\n" +
		"H-3,A,25/03/2026,Mar 2019,05/13/2025\n" + // day first in C, month first in E
		"H-4,A,,\"Dec 25, 19\",\n"
	r := csvString(t, reg)
	as := readAll(t, r)
	if len(as) != 4 {
		t.Fatalf("%d hoists", len(as))
	}
	// Last inspection: 25/03/2026 (row 4) shows day first, so row 2's 03/04/2026 is 3 April.
	if v := as[0].Get("last_inspection"); v.State != fleet.OK || !v.Date.Equal(day(2026, 4, 3)) {
		t.Errorf("H-1 last inspection %+v, want 2026-04-03 (day first, from row 4)", v)
	}
	// Commissioned: no evidence (ISO, a month, a two-digit year): 03/04/2020 is refused.
	if got := errText(as[0].Get("commissioned")); got != `reg.csv!D2: asset H-1: "03/04/2020" is not a date: it reads as 3 April 2020 (day first) or March 4, 2020 (month first), and the column has no date that settles which (a day above 12): give --date-order dmy or mdy, or write it as YYYY-MM-DD` {
		t.Errorf("H-1 commissioned: %s", got)
	}
	if v := as[2].Get("commissioned"); !v.Date.Equal(day(2019, 3, 1)) {
		t.Errorf("H-3 commissioned %+v, want 2019-03-01 (the first of the month)", v)
	}
	// A month name with a two-digit year.
	if v := as[3].Get("commissioned"); !v.Date.Equal(day(2019, 12, 25)) {
		t.Errorf("H-4 commissioned %+v", v)
	}
	// Last load test: 11/05/2025 reads both ways, 05/13/2025 only month first: mdy.
	if v := as[0].Get("last_load_test"); !v.Date.Equal(day(2025, 3, 4)) {
		t.Errorf("H-1 last load test %+v, want 2025-03-04 (month first, from row 4)", v)
	}
	if v := as[1].Get("last_load_test"); !v.Date.Equal(day(2025, 11, 5)) {
		t.Errorf("H-2 last load test %+v, want 2025-11-05", v)
	}
	for _, want := range []string{
		`reg.csv!C1: Last inspection: dates read with the day first, as the column's own dates show ("25/03/2026" at reg.csv!C4)`,
		`reg.csv!E1: Last load test: dates read with the month first, as the column's own dates show ("05/13/2025" at reg.csv!E4)`,
		`reg.csv!D1: Commissioned: 1 dates without a day (first at reg.csv!D4) read as the first of the month, the stricter reading for a date something was last done`,
		`reg.csv!D1: Commissioned: 1 two-digit years (first at reg.csv!D5) read as spreadsheet programs read them: 00–29 as 2000–2029, 30–99 as 1930–1999`,
	} {
		hasProblem(t, r, want)
	}

	// Two columns' evidence never mixes, but one column's can disagree.
	mixed := "Asset ID,Site,Last inspection\nH-1,A,25/03/2026\nH-2,A,03/25/2026\nH-3,A,03/04/2026\n"
	as = readAll(t, csvString(t, mixed))
	if got := errText(as[2].Get("last_inspection")); !strings.Contains(got, `the column has dates with the day first ("25/03/2026" at reg.csv!C2) and with the month first ("03/25/2026" at reg.csv!C3): give --date-order dmy or mdy`) {
		t.Errorf("mixed column: %s", got)
	}
	if v := as[0].Get("last_inspection"); !v.Date.Equal(day(2026, 3, 25)) {
		t.Errorf("an unambiguous date in a mixed column is still read: %+v", v)
	}

	// --date-order settles it.
	r, err := NewCSVOptions(strings.NewReader(mixed), "reg.csv", Options{DateOrder: MDY})
	if err != nil {
		t.Fatal(err)
	}
	as = readAll(t, r)
	if v := as[2].Get("last_inspection"); !v.Date.Equal(day(2026, 3, 4)) {
		t.Errorf("--date-order mdy: %+v", v)
	}
	if got := errText(as[0].Get("last_inspection")); !strings.Contains(got, "not a date with the month first (--date-order mdy)") {
		t.Errorf("--date-order mdy, 25/03/2026: %s", got)
	}
	hasProblem(t, r, "reg.csv!C1: Last inspection: dates written with numbers read in the order mdy (--date-order)")
}

func TestParseDateOrder(t *testing.T) {
	for in, want := range map[string]DateOrder{"": DateOrderAuto, "dmy": DMY, "MDY": MDY, " ymd ": YMD} {
		if got, err := ParseDateOrder(in); err != nil || got != want {
			t.Errorf("%q: %q %v", in, got, err)
		}
	}
	if _, err := ParseDateOrder("dym"); err == nil {
		t.Errorf("dym accepted")
	}
}
