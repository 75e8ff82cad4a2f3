package xlsxout

import (
	"bytes"
	"math"
	"regexp"
	"strconv"
	"time"
	"unicode/utf16"
	"unicode/utf8"
)

// This file formats cell values for the streamed sheets exactly as excelize v2.11.1's
// StreamWriter does (cell.go, lib.go, date.go there), so that the cells read back the
// same: numbers, dates, text (escaped, length-limited, xml:space) and formula values.

// maxCellChars is the spreadsheet's limit on a cell's text, in UTF-16 code units
// (excelize.TotalCellChars); longer text is cut there, as excelize does.
const maxCellChars = 32767

// cutCellText cuts s to maxCellChars UTF-16 code units (excelize's truncateUTF16Units).
func cutCellText(s string) string {
	if len(s) <= maxCellChars { // a UTF-8 byte never makes more than one UTF-16 unit
		return s
	}
	n := 0
	for i, r := range s {
		if n += utf16.RuneLen(r); n > maxCellChars {
			return s[:i]
		}
	}
	return s
}

// needsPreserve reports whether text starts or ends with a tab, line feed, carriage
// return or space, which xml:space="preserve" must keep (excelize's trimCellValue).
func needsPreserve(s string) bool {
	if s == "" {
		return false
	}
	for _, c := range [...]byte{'\t', '\n', '\r', ' '} {
		if s[0] == c || s[len(s)-1] == c {
			return true
		}
	}
	return false
}

// appendEscaped appends s escaped as encoding/xml.EscapeText does: the five markup
// characters as &#34; &#39; &amp; &lt; &gt;, tab and carriage return as character
// references, and every rune XML 1.0 does not allow (and every invalid UTF-8 byte) as
// U+FFFD. A line feed is kept as a line feed when keepNewline is set (excelize's inline
// strings), else written &#xA; (its formulas and values).
func appendEscaped(b []byte, s string, keepNewline bool) []byte {
	last := 0
	for i := 0; i < len(s); {
		c := s[i]
		var esc string
		width := 1
		if c < utf8.RuneSelf {
			switch c {
			case '"':
				esc = "&#34;"
			case '\'':
				esc = "&#39;"
			case '&':
				esc = "&amp;"
			case '<':
				esc = "&lt;"
			case '>':
				esc = "&gt;"
			case '\t':
				esc = "&#x9;"
			case '\n':
				if keepNewline {
					i++
					continue
				}
				esc = "&#xA;"
			case '\r':
				esc = "&#xD;"
			default:
				if c >= 0x20 {
					i++
					continue
				}
				esc = "\uFFFD"
			}
		} else {
			var r rune
			r, width = utf8.DecodeRuneInString(s[i:])
			if inXMLRange(r) && !(r == utf8.RuneError && width == 1) {
				i += width
				continue
			}
			esc = "\uFFFD"
		}
		b = append(b, s[last:i]...)
		b = append(b, esc...)
		i += width
		last = i
	}
	return append(b, s[last:]...)
}

// inXMLRange reports whether r is a character XML 1.0 allows.
func inXMLRange(r rune) bool {
	return r == 0x09 || r == 0x0A || r == 0x0D ||
		r >= 0x20 && r <= 0xD7FF ||
		r >= 0xE000 && r <= 0xFFFD ||
		r >= 0x10000 && r <= 0x10FFFF
}

// appendCellText appends text as excelize writes an inline string's <t> content: cut to
// the cell limit, escaped (line feeds kept) and with literal _xHHHH_ sequences escaped
// as _x005F_xHHHH_ so that no reader decodes them. It reports whether the text needs
// xml:space="preserve".
func appendCellText(b []byte, s string) ([]byte, bool) {
	s = cutCellText(s)
	start := len(b)
	b = appendEscaped(b, s, true)
	if bytes.Contains(b[start:], []byte("_x")) {
		m := bstrMarshal(string(b[start:]))
		b = append(b[:start], m...)
	}
	return b, needsPreserve(s)
}

var (
	bstrExp       = regexp.MustCompile(`_x[a-fA-F\d]{4}_`)
	bstrEscapeExp = regexp.MustCompile(`x[a-fA-F\d]{4}_`)
)

// bstrMarshal is excelize's bstrMarshal (lib.go, BSD-3-Clause), unchanged: it escapes
// the _xHHHH_ literals in s. Only text containing "_x" comes here.
func bstrMarshal(s string) (result string) {
	matches, l, cursor := bstrExp.FindAllStringSubmatchIndex(s, -1), len(s), 0
	for _, match := range matches {
		result += s[cursor:match[0]]
		subStr := s[match[0]:match[1]]
		if subStr == "_x005F_" {
			cursor = match[1]
			if match[1]+6 <= l && bstrEscapeExp.MatchString(s[match[1]:match[1]+6]) {
				_, err := strconv.Unquote(`"\u` + s[match[1]+1:match[1]+5] + `"`)
				if err == nil {
					result += subStr + "x005F" + subStr
					continue
				}
			}
			result += subStr + "x005F_"
			continue
		}
		if bstrExp.MatchString(subStr) {
			cursor = match[1]
			if _, err := strconv.Unquote(`"\u` + s[match[0]+2:match[1]-1] + `"`); err == nil {
				result += "_x005F" + subStr
				continue
			}
		}
	}
	if cursor < l {
		result += s[cursor:]
	}
	return result
}

// appendNumber appends v as excelize writes a float64 cell: the shortest 'f' form,
// cut (not rounded) after 15 significant digits, Excel's precision. v must be finite.
func appendNumber(b []byte, v float64) []byte {
	start := len(b)
	b = strconv.AppendFloat(b, v, 'f', -1, 64)
	if math.Abs(v) == math.MaxFloat64 {
		return b
	}
	const maxPrec = 15
	str := b[start:]
	decimal := bytes.IndexByte(str, '.')
	significant := 0
	for idx := range str {
		if str[idx] < '0' || str[idx] > '9' || significant == 0 && str[idx] == '0' {
			continue
		}
		significant++
		if significant <= maxPrec {
			continue
		}
		if decimal >= 0 && idx > decimal {
			return bytes.TrimSuffix(b[:start+idx], []byte("."))
		}
		if decimal < 0 {
			decimal = len(str)
		}
		for ; idx < decimal; idx++ {
			str[idx] = '0'
		}
		return b[:start+decimal]
	}
	return b
}

// Excel's 1900 date system, as excelize's date.go has it.
var (
	excelMinTime1900      = time.Date(1899, time.December, 31, 0, 0, 0, 0, time.UTC)
	excelBuggyPeriodStart = time.Date(1900, time.March, 1, 0, 0, 0, 0, time.UTC).Add(-time.Nanosecond)
)

const (
	dayNanoseconds = 24 * time.Hour
	maxDuration    = 290 * 364 * dayNanoseconds
)

// excelTime is excelize's time-to-serial conversion for the 1900 date system (the one a
// new workbook uses): the wall-clock time in t's zone, counted in days, with the
// phantom 1900-02-29. It also returns t shifted by its zone offset, which excelize
// writes as RFC 3339 text when the serial is not positive (before 1899-12-31).
func excelTime(t time.Time) (float64, time.Time) {
	_, offset := t.In(t.Location()).Zone()
	t = t.Add(time.Duration(offset) * time.Second)
	if t.Before(excelMinTime1900) {
		return 0, t
	}
	tt, diff, result := t, t.Sub(excelMinTime1900), 0.0
	for diff >= maxDuration {
		result += float64(maxDuration / dayNanoseconds)
		tt = tt.Add(-maxDuration)
		diff = tt.Sub(excelMinTime1900)
	}
	rem := diff % dayNanoseconds
	result += float64(diff-rem)/float64(dayNanoseconds) + float64(rem)/float64(dayNanoseconds)
	if t.After(excelBuggyPeriodStart) {
		result++
	}
	return result, t
}
