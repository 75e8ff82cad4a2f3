package register

import "testing"

// TestFormatNumber: numbers as a spreadsheet shows them with their number format. The
// rules are ISO/IEC 29500-1 §18.8.31 numFmts (seen: up to four sections, positive;
// negative; zero; text; its example "$"#,##0.00) and the digit placeholders as
// Microsoft's format-code reference states them (seen: 0 shows a digit or a zero, #
// a digit or nothing, extra integer digits are all shown, the fraction is rounded to
// the placeholders); each expected text is computed by hand from those rules.
func TestFormatNumber(t *testing.T) {
	for _, tc := range []struct {
		raw, code, want string
		ok              bool
	}{
		{"125", "00000", "00125", true},              // issue 14: the id shown 00125
		{"125", `"HX-"0000`, "HX-0125", true},        // a literal prefix
		{"125", `\H\X\-0000`, "HX-0125", true},       // escaped literals
		{"1234567", "000-0000", "123-4567", true},    // literal between placeholders
		{"34567", "000-0000", "003-4567", true},      // zeros fill the leftmost placeholders
		{"123456789", "0000", "123456789", true},     // extra digits all shown
		{"1234.5", `"$"#,##0.00`, "$1,234.50", true}, // §18.8.31's example format
		{"1234567.891", "#,##0.00", "1,234,567.89", true},
		{"0.5", "0%", "50%", true},
		{"2.5", "0", "3", true},   // half away from zero
		{"-2.5", "0", "-3", true}, // one section: the sign is shown
		{"-12", "0;(0)", "(12)", true},
		{"0", "0;(0);\"zero\"", "zero", true},
		{"7.1", "000.0", "007.1", true},
		{"8.9", "#.000", "8.900", true},
		{"0.631", "0.#", "0.6", true},
		{"3", "0.##", "3.", true}, // no fraction digit shown: the point stays (from memory: Excel and LibreOffice show "3.")
		{"42", "[Red]0000", "0042", true},
		{"42", "General", "", false},
		{"42", "@", "", false},
		{"45000", "yyyy-mm-dd", "", false},
		{"1200", "0.0E+00", "", false},
		{"1200", "#,##0,", "", false}, // scaled by a thousand
		{"1200", "[>=100]0;0.0", "", false},
		{"abc", "00000", "", false},
	} {
		got, ok := formatNumber(tc.raw, tc.code)
		if got != tc.want || ok != tc.ok {
			t.Errorf("formatNumber(%q, %q) = %q, %v; want %q, %v", tc.raw, tc.code, got, ok, tc.want, tc.ok)
		}
	}
}
