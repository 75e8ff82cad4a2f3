package jsonout

import (
	"math"
	"strconv"
	"strings"
	"unicode/utf8"

	"hoistfleet/io/outbuf"
)

// JSON values written exactly as encoding/json writes them with SetEscapeHTML(false)
// (the differential tests compare them with refWriter, which uses encoding/json).

// safe marks the ASCII bytes written as they are inside a JSON string: printable ASCII
// but '"' and '\\' (with HTML escaping off, <, > and & are written as they are).
var safe = func() (t [utf8.RuneSelf]bool) {
	for c := ' '; c < utf8.RuneSelf; c++ {
		t[c] = c != '"' && c != '\\'
	}
	return t
}()

const hex = "0123456789abcdef"

// appendString appends s as a JSON string: quotes and backslashes escaped, control
// characters as \n, \r, \t, \b, \f or \u00XX, invalid UTF-8 as \ufffd, and U+2028 and
// U+2029 as \u2028 and \u2029, as encoding/json does.
// appendNullString is appendString, or null for "".
func appendNullString(b []byte, s string) []byte {
	if s == "" {
		return append(b, "null"...)
	}
	return appendString(b, s)
}

func appendString(b []byte, s string) []byte {
	b = append(b, '"')
	start := 0
	for i := 0; i < len(s); {
		c := s[i]
		if c < utf8.RuneSelf {
			if safe[c] {
				i++
				continue
			}
			b = append(b, s[start:i]...)
			switch c {
			case '\\', '"':
				b = append(b, '\\', c)
			case '\b':
				b = append(b, '\\', 'b')
			case '\f':
				b = append(b, '\\', 'f')
			case '\n':
				b = append(b, '\\', 'n')
			case '\r':
				b = append(b, '\\', 'r')
			case '\t':
				b = append(b, '\\', 't')
			default:
				b = append(b, '\\', 'u', '0', '0', hex[c>>4], hex[c&0xF])
			}
			i++
			start = i
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && size == 1:
			b = append(b, s[start:i]...)
			b = append(b, `\ufffd`...)
		case r == '\u2028' || r == '\u2029':
			b = append(b, s[start:i]...)
			b = append(b, '\\', 'u', '2', '0', '2', hex[r&0xF])
		default:
			i += size
			continue
		}
		i += size
		start = i
	}
	b = append(b, s[start:]...)
	return append(b, '"')
}

// AppendNumber appends f as encoding/json writes a float64 (shortest representation
// that round-trips, exponent form below 1e-6 and from 1e21), or null for NaN and ±Inf.
func AppendNumber(b []byte, f float64) []byte {
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return append(b, "null"...)
	}
	if abs := math.Abs(f); abs == 0 || abs >= 1e-6 && abs < 1e21 {
		// No exponent; a whole number below 10¹⁵ is its digits (outbuf.AppendShortest).
		return outbuf.AppendShortest(b, f, 'f')
	}
	b = strconv.AppendFloat(b, f, 'e', -1, 64)
	// clean up e-09 to e-9, as encoding/json does
	n := len(b)
	if n >= 4 && b[n-4] == 'e' && b[n-3] == '-' && b[n-2] == '0' {
		b[n-2] = b[n-1]
		b = b[:n-1]
	}
	return b
}

// numCache is outbuf.NumCache formatting as AppendNumber does.
type numCache struct{ outbuf.NumCache }

// appendNumber appends f as AppendNumber does, remembering the result.
func (c *numCache) appendNumber(b []byte, f float64) []byte { return c.Append(b, f, AppendNumber) }

// textCacheMax bounds a textCache; it is emptied when full.
const textCacheMax = 4096

// textCache remembers the JSON form of texts that repeat from hoist to hoist: check ids,
// units, rules, sources, figure names, sites, status words.
type textCache struct {
	m map[string]string
}

// encode returns s as a JSON string, from the cache when it can.
func (tc *textCache) encode(s string) string {
	if e, ok := tc.m[s]; ok {
		return e
	}
	e := string(appendString(nil, s))
	if tc.m == nil || len(tc.m) >= textCacheMax {
		tc.m = make(map[string]string, 64)
	}
	tc.m[strings.Clone(s)] = e
	return e
}

// memo is the last text written in one place of the line (the rule of the third check,
// say) and its JSON form. Texts in one place mostly repeat from hoist to hoist, often as
// the very same string, which compares in constant time.
type memo struct{ s, enc string }

// appendString appends s as a JSON string, remembering it in m.
func (tc *textCache) appendString(m *memo, b []byte, s string) []byte {
	if s != m.s || m.enc == "" {
		m.s, m.enc = s, tc.encode(s)
	}
	return append(b, m.enc...)
}

// freeMemo is the last free text (a message, a note) written in one place of the line
// and its JSON form, in a buffer of its own. Such texts often repeat from hoist to hoist
// but are as often new, so they are not worth a textCache entry.
type freeMemo struct {
	s   string
	enc []byte
}

// appendString appends s as a JSON string, remembering it.
func (m *freeMemo) appendString(b []byte, s string) []byte {
	if s != m.s || m.enc == nil {
		m.s, m.enc = s, appendString(m.enc[:0], s)
	}
	return append(b, m.enc...)
}

// appendNullText appends s as a JSON string, or null when it is empty.
func (m *freeMemo) appendNullText(b []byte, s string) []byte {
	if s == "" {
		return append(b, "null"...)
	}
	return m.appendString(b, s)
}

// appendStrings appends ss as a JSON array of strings ([] when nil), remembering each
// in the memo of its index, which it adds to ms as needed.
func appendStrings(b []byte, ss []string, ms *[]freeMemo) []byte {
	for len(*ms) < len(ss) {
		*ms = append(*ms, freeMemo{})
	}
	b = append(b, '[')
	for i, s := range ss {
		if i > 0 {
			b = append(b, ',')
		}
		b = (*ms)[i].appendString(b, s)
	}
	return append(b, ']')
}
