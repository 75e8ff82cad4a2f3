package csvout

// The field encoding and the number formatting of the writer of commit f7400a6 (before
// the fast path), kept verbatim with their identifiers prefixed "ref": checkField
// (TestFieldRoundTripRandom and the fuzz target FuzzField, which cannot compare with
// golden files) compares each field's encoding with it, and BenchmarkAppendNum times
// refAppendNum. The rest of that writer is gone; its outputs are the golden files in
// testdata/golden.

import (
	"math"
	"strconv"
)

// refWriter holds the options the field encoding reads (the writer kept much more).
type refWriter struct {
	opts Options
}

// refAppendNum appends f in the shortest form that reads back to the same float64, or
// nothing for NaN and ±Inf.
func refAppendNum(b []byte, f float64) []byte {
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return b
	}
	return strconv.AppendFloat(b, f, 'g', -1, 64)
}

// refNeedsGuard reports whether a text field would be read as a formula by a spreadsheet:
// it starts with =, +, -, @, tab or carriage return.
func refNeedsGuard(s string) bool {
	if s == "" {
		return false
	}
	switch s[0] {
	case '=', '+', '-', '@', '\t', '\r':
		return true
	}
	return false
}

func (w *refWriter) appendText(b []byte, s string) []byte {
	return w.appendField(b, s, refNeedsGuard(s))
}

// appendField appends a text field, with a leading apostrophe when guard is set, quoted
// as encoding/csv quotes: when it holds the separator, a quote, CR or LF, or starts with
// a space or tab.
func (w *refWriter) appendField(b []byte, s string, guard bool) []byte {
	if !w.needsQuotes(s, guard) {
		if guard {
			b = append(b, '\'')
		}
		return append(b, s...)
	}
	b = append(b, '"')
	if guard {
		b = append(b, '\'')
	}
	for i := 0; i < len(s); i++ {
		if s[i] == '"' {
			b = append(b, '"', '"')
		} else {
			b = append(b, s[i])
		}
	}
	return append(b, '"')
}

func (w *refWriter) needsQuotes(s string, guard bool) bool {
	if s == "" {
		return false
	}
	if !guard && (s[0] == ' ' || s[0] == '\t') {
		return true
	}
	for _, r := range s {
		if r == w.opts.Comma || r == '"' || r == '\r' || r == '\n' {
			return true
		}
	}
	return false
}
