package calc_test

import (
	"strings"
	"testing"
	"time"

	"hoistfleet/calc"
)

// TestInspectionDueCalendar checks the calendar arithmetic. The due dates and day counts
// are Gregorian-calendar facts counted by hand (month lengths; 2024 is a leap year,
// 2026 and 2027 are not); the month-end roll-over is the documented AddDate convention.
// Intervals of 12, 6 and 3 months are the ASME B30.16 periodic intervals for normal,
// heavy and severe service (standards.md, seen), supplied by the caller's rules.
func TestInspectionDueCalendar(t *testing.T) {
	tests := []struct {
		name     string
		last     time.Time
		months   int
		nextDue  string
		interval float64
	}{
		{"mid-month quarterly", date(2026, 1, 15), 3, "2026-04-15", 16 + 28 + 31 + 15},
		{"yearly, no leap day", date(2025, 3, 1), 12, "2026-03-01", 365},
		{"yearly across 2024-02-29", date(2023, 3, 1), 12, "2024-03-01", 366},
		{"yearly to the day before a leap day", date(2023, 2, 28), 12, "2024-02-28", 365},
		// Month end is clamped to the shorter month's last day: 31 January + 1 month is
		// 28 February 2026 (the earlier, stricter due date).
		{"Jan 31 + 1 month", date(2026, 1, 31), 1, "2026-02-28", 28},
		// In a leap year, 29 February.
		{"Jan 31 + 1 month, leap year", date(2024, 1, 31), 1, "2024-02-29", 29},
		// A leap day + 12 months is 28 February 2025.
		{"leap day + 12 months", date(2024, 2, 29), 12, "2025-02-28", 365},
		{"Aug 31 + 6 months", date(2026, 8, 31), 6, "2027-02-28", 30 + 31 + 30 + 31 + 31 + 28},
		{"Dec 31 semiannual into a leap year", date(2023, 12, 31), 6, "2024-06-30", 31 + 29 + 31 + 30 + 31 + 30},
	}
	for _, tt := range tests {
		o, err := calc.InspectionDue(tt.last, tt.last, tt.months)
		if err != nil {
			t.Errorf("%s: %v", tt.name, err)
			continue
		}
		if due, _ := figText(o, "next_due"); due != tt.nextDue {
			t.Errorf("%s: next_due %s, want %s", tt.name, due, tt.nextDue)
		}
		if !approxEqual(o.Capacity, tt.interval, 0, 0) || !approxEqual(o.Figure("interval_days"), tt.interval, 0, 0) {
			t.Errorf("%s: interval %v d, want %v d", tt.name, o.Capacity, tt.interval)
		}
		// Inspected on the as-of date: nothing used.
		if o.Demand != 0 || o.Utilisation != 0 {
			t.Errorf("%s: inspected today gives demand %v, u %v; want 0", tt.name, o.Demand, o.Utilisation)
		}
	}
}

func TestInspectionDueStatus(t *testing.T) {
	last := date(2025, 6, 10) // yearly: due 2026-06-10, 365 days
	tests := []struct {
		name    string
		asOf    time.Time
		since   float64
		u       float64
		overdue float64
		toDue   float64
		noteHas string
	}{
		// As of exactly the due date: not overdue (u = 1, which the caller's band reads as
		// marginal, never fail).
		{"on the due date", date(2026, 6, 10), 365, 1, 0, 0, "due 2026-06-10"},
		{"day before", date(2026, 6, 9), 364, 364.0 / 365, 0, 1, "due"},
		{"day after", date(2026, 6, 11), 366, 366.0 / 365, 1, 0, "overdue by 1 days"},
		// 2026-06-10 to 2027-06-10 is 365 days (no 29 February between).
		{"a year late", date(2027, 6, 10), 730, 2, 365, 0, "overdue by 365"},
		{"half way", date(2025, 12, 9), 182, 182.0 / 365, 0, 183, "next"},
	}
	for _, tt := range tests {
		o, err := calc.InspectionDue(last, tt.asOf, 12)
		if err != nil {
			t.Errorf("%s: %v", tt.name, err)
			continue
		}
		for _, c := range []struct {
			what      string
			got, want float64
		}{
			{"demand", o.Demand, tt.since},
			{"days_since_last", o.Figure("days_since_last"), tt.since},
			{"utilisation", o.Utilisation, tt.u},
			{"days_overdue", o.Figure("days_overdue"), tt.overdue},
			{"days_to_due", o.Figure("days_to_due"), tt.toDue},
		} {
			if !approxEqual(c.got, c.want, 1e-12, 1e-12) {
				t.Errorf("%s: %s = %v, want %v", tt.name, c.what, c.got, c.want)
			}
		}
		if (tt.overdue > 0) != (o.Utilisation > 1) {
			t.Errorf("%s: overdue %v but utilisation %v", tt.name, tt.overdue, o.Utilisation)
		}
		if o.Unit != "d" || !strings.Contains(o.Note, tt.noteHas) {
			t.Errorf("%s: unit %q note %q (want it to contain %q)", tt.name, o.Unit, o.Note, tt.noteHas)
		}
	}
}

// TestInspectionDueDatesNotInstants: a date is a calendar date in its own location; a
// late-evening time west of Greenwich is still that day.
func TestInspectionDueDatesNotInstants(t *testing.T) {
	west := time.FixedZone("UTC-5", -5*3600)
	last := time.Date(2026, 1, 15, 23, 30, 0, 0, west) // 2026-01-16 04:30 UTC
	asOf := time.Date(2026, 4, 15, 8, 0, 0, 0, time.UTC)
	o, err := calc.InspectionDue(last, asOf, 3)
	if err != nil {
		t.Fatal(err)
	}
	if due, _ := figText(o, "next_due"); due != "2026-04-15" || o.Figure("days_overdue") != 0 || !approxEqual(o.Utilisation, 1, 0, 1e-15) {
		t.Errorf("next_due %s, overdue %v, u %v; want 2026-04-15, 0, 1", due, o.Figure("days_overdue"), o.Utilisation)
	}
}

func TestInspectionDueErrors(t *testing.T) {
	tests := []struct {
		name       string
		last, asOf time.Time
		months     int
		field      string
	}{
		{"no last inspection", time.Time{}, date(2026, 1, 1), 12, "last_inspection"},
		{"no as-of", date(2026, 1, 1), time.Time{}, 12, ""},
		{"zero interval", date(2025, 1, 1), date(2026, 1, 1), 0, "service"},
		{"inspected in the future", date(2026, 2, 1), date(2026, 1, 1), 12, "last_inspection"},
	}
	for _, tt := range tests {
		_, err := calc.InspectionDue(tt.last, tt.asOf, tt.months)
		if err == nil {
			t.Errorf("%s: no error", tt.name)
			continue
		}
		if f := rangeField(t, err); f != tt.field {
			t.Errorf("%s: field %q, want %q", tt.name, f, tt.field)
		}
	}
}

func TestLoadTest(t *testing.T) {
	tests := []struct {
		name                string
		rated, test, factor float64
		covered, u          float64
	}{
		// Static test at 1.25 × rated (Machinery Directive 2006/42/EC Annex I 4.1.2.3;
		// standards.md, law, memory high): 12 500 kg covers 10 000 kg exactly.
		{"static at 125 %", 10000, 12500, 1.25, 10000, 1},
		// Dynamic test at 1.1 × (same source): 11 000 kg covers 10 000 kg.
		{"dynamic at 110 %", 10000, 11000, 1.1, 10000, 1},
		// Re-rating to 11 000 kg after a 12 500 kg static test: 11 000 / 10 000 = 1.1,
		// a new test is needed.
		{"proposed above cover", 11000, 12500, 1.25, 10000, 1.1},
		// US cranes: test at 100 % to 125 % of rated (29 CFR 1910.179(k)(2); standards.md,
		// law): a rule factor of 1 means the test load itself is covered.
		{"factor 1", 5000, 5000, 1, 5000, 1},
		{"light test", 2000, 1250, 1.25, 1000, 2},
	}
	for _, tt := range tests {
		o, err := calc.LoadTest(tt.rated, tt.test, tt.factor)
		if err != nil {
			t.Errorf("%s: %v", tt.name, err)
			continue
		}
		for _, c := range []struct {
			what      string
			got, want float64
		}{
			{"demand", o.Demand, tt.rated},
			{"capacity", o.Capacity, tt.covered},
			{"covered_rated_load_kg", o.Figure("covered_rated_load_kg"), tt.covered},
			{"utilisation", o.Utilisation, tt.u},
			{"test_load_ratio", o.Figure("test_load_ratio"), tt.test / tt.rated},
		} {
			if !approxEqual(c.got, c.want, 1e-9, 1e-12) {
				t.Errorf("%s: %s = %v, want %v", tt.name, c.what, c.got, c.want)
			}
		}
		if o.Unit != "kg" || (tt.u > 1) != strings.Contains(o.Note, "new load test") {
			t.Errorf("%s: unit %q note %q", tt.name, o.Unit, o.Note)
		}
	}
	// Utilisation is linear in the rated load (demand ∝ m_L, capacity fixed).
	a, _ := calc.LoadTest(3000, 12500, 1.25)
	b, _ := calc.LoadTest(6000, 12500, 1.25)
	if !approxEqual(b.Utilisation, 2*a.Utilisation, 0, 1e-12) {
		t.Errorf("utilisation not linear in rated load: %v, %v", a.Utilisation, b.Utilisation)
	}

	for _, bad := range []struct {
		name                string
		rated, test, factor float64
		field               string
	}{
		{"no rated load", 0, 12500, 1.25, "rated_load"},
		{"no test load", 10000, 0, 1.25, "test_load"},
		{"negative test load", 10000, -1, 1.25, "test_load"},
		{"factor below 1", 10000, 12500, 0.8, "test_type"},
	} {
		_, err := calc.LoadTest(bad.rated, bad.test, bad.factor)
		if err == nil {
			t.Errorf("%s: no error", bad.name)
			continue
		}
		if f := rangeField(t, err); f != bad.field {
			t.Errorf("%s: field %q, want %q", bad.name, f, bad.field)
		}
	}
}

// TestComponentRating (design.md Revision 2): the rated load against the Component WLL,
// the lowest rating of hook, block, trolley and structure; u = m_L / WLL, reaching 1 at
// m_L = WLL (the limiting rated load). Values invented; arithmetic exact.
func TestComponentRating(t *testing.T) {
	for _, tc := range []struct {
		rated, wll, u float64
		note          bool
	}{
		{5000, 6300, 5000.0 / 6300, false}, // below the WLL
		{6300, 6300, 1, false},             // at it: u = 1, not a fail
		{7000, 6300, 7000.0 / 6300, true},  // above it: fails, with a note
		{0, 6300, 0, false},                // the empty hook
	} {
		o, err := calc.ComponentRating(calc.Hoist{RatedLoadKg: tc.rated, ComponentWLLKg: tc.wll})
		if err != nil {
			t.Fatal(err)
		}
		if o.Utilisation != tc.u || o.Demand != tc.rated || o.Capacity != tc.wll || o.Unit != "kg" || (o.Note != "") != tc.note {
			t.Errorf("%g kg against %g kg: u %g, demand %g, capacity %g %s, note %q; want u %g", tc.rated, tc.wll, o.Utilisation, o.Demand, o.Capacity, o.Unit, o.Note, tc.u)
		}
	}
	if _, err := calc.ComponentRating(calc.Hoist{RatedLoadKg: 5000}); err == nil {
		t.Error("no Component WLL: want a range error")
	}
}

// TestInspectionDueRegister: the register's own next due date governs when it is earlier
// than the rules' (a six-monthly schedule against a 12-month rule), never when it is
// later. Dates counted by hand on the Gregorian calendar: last 2026-03-01; the rules'
// 12 months give 2027-03-01; a register date of 2026-09-01 is 184 days after the last
// (Mar 31 + Apr 30 + May 31 + Jun 30 + Jul 31 + Aug 31 = 184), and as of 2026-12-01 the
// inspection is 91 days overdue (Sep 30 + Oct 31 + Nov 30), 275 days after the last.
func TestInspectionDueRegister(t *testing.T) {
	last, asOf := date(2026, 3, 1), date(2026, 12, 1)
	o, err := calc.InspectionDueRegister(last, date(2026, 9, 1), asOf, 12, false, nil)
	if err != nil {
		t.Fatal(err)
	}
	if o.Demand != 275 || o.Capacity != 184 || o.Figure("days_overdue") != 91 || !(o.Utilisation > 1) {
		t.Errorf("register earlier: demand %g capacity %g overdue %g u %g, want 275, 184, 91, > 1", o.Demand, o.Capacity, o.Figure("days_overdue"), o.Utilisation)
	}
	if !strings.Contains(o.Note, "register's next due date governs") || !strings.Contains(o.Note, "2027-03-01") {
		t.Errorf("note %q does not say the register's date governs over 2027-03-01", o.Note)
	}
	// A later register date is not used: the rules' 12 months stand (as of 2026-12-01:
	// 275 of 365 days).
	later, err := calc.InspectionDueRegister(last, date(2027, 6, 1), asOf, 12, true, nil)
	if err != nil {
		t.Fatal(err)
	}
	plain, _ := calc.InspectionDue(last, asOf, 12)
	if later.Demand != plain.Demand || later.Capacity != plain.Capacity || !strings.Contains(later.Note, "later than the rules' interval allows") {
		t.Errorf("register later: %g/%g %q, want the rules' %g/%g and a note", later.Demand, later.Capacity, later.Note, plain.Demand, plain.Capacity)
	}
	if _, err := calc.InspectionDueRegister(last, date(2026, 2, 1), asOf, 12, true, nil); err == nil {
		t.Error("a next due date before the last inspection was accepted")
	}
}

// TestInspectionDueSchedule: the register's own interval in months, counted by hand on
// the calendar. Last 2026-03-01, as of 2026-12-01: a 6-month interval falls due
// 2026-09-01 (184 days: March 31 + April 30 + May 31 + June 30 + July 31 + August 31),
// 91 days overdue (September 30 + October 31 + November 30), as a register next due date
// of 2026-09-01 would; a next due date earlier still governs over the interval; a
// 24-month interval is later than the rules' 12 and is not used.
func TestInspectionDueSchedule(t *testing.T) {
	last, asOf := date(2026, 3, 1), date(2026, 12, 1)
	six, err := calc.InspectionDueSchedule(last, time.Time{}, 6, asOf, 12, false, nil)
	if err != nil {
		t.Fatal(err)
	}
	if six.Capacity != 184 || six.Figure("days_overdue") != 91 || !strings.Contains(six.Note, "the register's 6-month interval governs") ||
		six.Figure("register_interval_months") != 6 {
		t.Errorf("6 months: capacity %g overdue %g note %q, want 184, 91, the interval governs", six.Capacity, six.Figure("days_overdue"), six.Note)
	}
	both, err := calc.InspectionDueSchedule(last, date(2026, 8, 1), 6, asOf, 12, true, nil)
	if err != nil {
		t.Fatal(err)
	}
	// 2026-08-01 is 153 days after 2026-03-01 (184 − 31), 122 days overdue (91 + 31).
	if both.Capacity != 153 || both.Figure("days_overdue") != 122 || !strings.Contains(both.Note, "register's next due date governs") {
		t.Errorf("date before the interval: capacity %g overdue %g note %q, want 153, 122, the date governs", both.Capacity, both.Figure("days_overdue"), both.Note)
	}
	long, err := calc.InspectionDueSchedule(last, time.Time{}, 24, asOf, 12, true, nil)
	if err != nil {
		t.Fatal(err)
	}
	if long.Capacity != 365 || !strings.Contains(long.Note, "the register's 24-month interval (2028-03-01) is later than the rules' interval allows") {
		t.Errorf("24 months: capacity %g note %q, want the rules' 365 days and a note", long.Capacity, long.Note)
	}
	if _, err := calc.InspectionDueSchedule(last, date(2026, 1, 1), 6, asOf, 12, true, nil); err == nil {
		t.Error("a next due date before the last inspection was accepted")
	}
}
