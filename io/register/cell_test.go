package register

import (
	"testing"
	"time"

	"hoistfleet/calc/approx"
)

func TestParseNumber(t *testing.T) {
	point, comma := dialect{}, dialect{decimalComma: true}
	tests := []struct {
		in   string
		d    dialect
		want float64
		ok   bool
		hint string
	}{
		{"12.5", point, 12.5, true, ""},
		{"-0.25", point, -0.25, true, ""},
		{"+3", point, 3, true, ""},
		{"1e3", point, 1000, true, ""},
		{"2.5E-3", point, 0.0025, true, ""},
		{".5", point, 0.5, true, ""},
		{"12,5", point, 0, false, ": use a decimal point"},
		{"1,250", point, 0, false, ": write it without thousands separators"},
		{"1,250.5", point, 0, false, ": write it without thousands separators"},
		{"1 250", point, 0, false, ": write it without thousands separators"},
		{"1'250", point, 0, false, ": write it without thousands separators"},
		{"12 t", point, 0, false, ": write the number only; the unit belongs in the header"},
		{"5kN", point, 0, false, ": write the number only; the unit belongs in the header"},
		{"#N/A", point, 0, false, ": the cell holds a spreadsheet error"},
		{"twelve", point, 0, false, ""},
		{"NaN", point, 0, false, ""},
		{"Inf", point, 0, false, ""},
		{"0x1p-2", point, 0, false, ""},
		{"1_000", point, 0, false, ": write it without thousands separators"},
		{"1e999", point, 0, false, ""},
		{"1.2.3", point, 0, false, ""},
		{"-", point, 0, false, ""},
		// Decimal-comma dialect (semicolon-separated CSV).
		{"12,5", comma, 12.5, true, ""},
		{"-0,98", comma, -0.98, true, ""},
		{"0.98", comma, 0.98, true, ""},
		{"0.125", comma, 0.125, true, ""},
		{"12.5", comma, 12.5, true, ""},
		{"1.250", comma, 0, false, ": the point may be a thousands separator or a decimal point; write it without thousands separators (1250) or with a decimal comma (1,25)"},
		{"1.250,5", comma, 0, false, ": write it without thousands separators"},
		{"1,2,3", comma, 0, false, ": write it without thousands separators"},
	}
	for _, tt := range tests {
		got, hint, ok := parseNumber(tt.in, tt.d)
		if ok != tt.ok || hint != tt.hint || (ok && !approx.Equal(got, tt.want, 0, 1e-15)) {
			t.Errorf("parseNumber(%q, comma %v) = %v, %q, %v; want %v, %q, %v", tt.in, tt.d.decimalComma, got, hint, ok, tt.want, tt.hint, tt.ok)
		}
	}
}

func TestIsPlainNumber(t *testing.T) {
	tests := []struct {
		in   string
		want bool
	}{
		{"0", true}, {"12", true}, {"-3.5", true}, {"0.25", true}, {"1E-3", true}, {"1.5e10", true},
		{"007", false}, {"+5", false}, {".5", false}, {"5.", false}, {"", false}, {"1,5", false},
		{"12 t", false}, {"0x10", false}, {"Inf", false}, {"00.5", false}, {"-007", false},
	}
	for _, tt := range tests {
		if got := isPlainNumber(tt.in); got != tt.want {
			t.Errorf("isPlainNumber(%q) = %v, want %v", tt.in, got, tt.want)
		}
	}
}

func TestParseDate(t *testing.T) {
	csvD, x1900, x1904 := dialect{}, dialect{xlsx: true}, dialect{xlsx: true, date1904: true}
	day := func(y int, m time.Month, d int) time.Time { return time.Date(y, m, d, 0, 0, 0, 0, time.UTC) }
	tests := []struct {
		in   string
		d    dialect
		want time.Time
		ok   bool
	}{
		{"2024-02-29", csvD, day(2024, 2, 29), true}, // leap year
		{"2023-02-29", csvD, time.Time{}, false},     // not a leap year
		{"2024-01-31T08:30:00", csvD, day(2024, 1, 31), true},
		{"2024-01-31T23:30:00+02:00", csvD, day(2024, 1, 31), true}, // the date as written
		{"2024-01-31 08:30", csvD, day(2024, 1, 31), true},
		{"2024-01-31Z", csvD, time.Time{}, false},
		{"2024-1-31", csvD, time.Time{}, false},
		{"31.01.2024", csvD, time.Time{}, false},
		{"45292", csvD, time.Time{}, false}, // a serial is not a date in a CSV file
		// Excel date serials (Microsoft, "Date systems in Excel"): 1900 system serial 1 =
		// 1900-01-01, 61 = 1900-03-01 (60 is the non-existent 1900-02-29), 45292 =
		// 2024-01-01; the 1904 system is 1462 days later: 43830 = 2024-01-01.
		{"1", x1900, day(1900, 1, 1), true},
		{"61", x1900, day(1900, 3, 1), true},
		{"45292", x1900, day(2024, 1, 1), true},
		{"45292.75", x1900, day(2024, 1, 1), true}, // 18:00 the same day
		{"45292.99999999", x1900, day(2024, 1, 2), true},
		{"43830", x1904, day(2024, 1, 1), true},
		{"1", x1904, day(1904, 1, 2), true},
		{"0", x1900, time.Time{}, false},
		{"-5", x1900, time.Time{}, false},
		{"3e9", x1900, time.Time{}, false},
		{"2024-01-31", x1900, day(2024, 1, 31), true}, // a text date in a workbook
	}
	for _, tt := range tests {
		got, msg := parseDate(tt.in, tt.d)
		if (msg == "") != tt.ok || (tt.ok && !got.Equal(tt.want)) {
			t.Errorf("parseDate(%q, %+v) = %v, %q; want %v ok %v", tt.in, tt.d, got, msg, tt.want, tt.ok)
		}
	}
}
