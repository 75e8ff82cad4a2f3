package csvout

import (
	"strings"
	"unicode/utf8"

	"hoistfleet/io/cite"
)

// NeedsGuard reports whether a text field would be read as a formula by a spreadsheet:
// it starts with =, +, -, @, tab or carriage return.
func NeedsGuard(s string) bool {
	return s != "" && isGuardByte(s[0])
}

func isGuardByte(c byte) bool {
	switch c {
	case '=', '+', '-', '@', '\t', '\r':
		return true
	}
	return false
}

// fieldCoder encodes text fields for one separator: a leading apostrophe when the field
// needs a formula guard, quoted as encoding/csv quotes: when it holds the separator, a
// quote, CR or LF, or starts with a space or tab.
type fieldCoder struct {
	comma string // the separator, UTF-8
	// special marks the bytes that force quoting: '"', CR, LF and an ASCII separator.
	special [256]bool
	// wide is set for a separator outside ASCII, searched for as a substring; runeError
	// for U+FFFD, which also matches every invalid UTF-8 byte, as ranging over a string
	// decodes them.
	wide, runeError bool
}

func newFieldCoder(comma rune) fieldCoder {
	fc := fieldCoder{comma: string(comma)}
	fc.special['"'], fc.special['\r'], fc.special['\n'] = true, true, true
	switch {
	case comma < utf8.RuneSelf:
		fc.special[comma] = true
	case comma == utf8.RuneError:
		fc.runeError = true
	default:
		fc.wide = true
	}
	return fc
}

// hasSpecial reports whether s holds the separator, a quote, CR or LF.
func hasSpecial[T string | []byte](fc *fieldCoder, s T) bool {
	for i := 0; i < len(s); i++ {
		if fc.special[s[i]] {
			return true
		}
	}
	switch {
	case fc.wide:
		return strings.Contains(string(s), fc.comma)
	case fc.runeError:
		return strings.ContainsRune(string(s), utf8.RuneError) // also finds invalid UTF-8
	}
	return false
}

// appendText appends the text field s.
func appendText[T string | []byte](fc *fieldCoder, b []byte, s T) []byte {
	if len(s) == 0 {
		return b
	}
	guard := isGuardByte(s[0])
	if !(!guard && (s[0] == ' ' || s[0] == '\t')) && !hasSpecial(fc, s) {
		if guard {
			b = append(b, '\'')
		}
		return append(b, s...)
	}
	return appendQuoted(b, s, guard)
}

// appendQuoted appends s in quotes, its quotes doubled, with the guard apostrophe inside.
func appendQuoted[T string | []byte](b []byte, s T, guard bool) []byte {
	b = append(b, '"')
	if guard {
		b = append(b, '\'')
	}
	for {
		i := indexQuote(s)
		if i < 0 {
			break
		}
		b = append(b, s[:i+1]...)
		b = append(b, '"')
		s = s[i+1:]
	}
	b = append(b, s...)
	return append(b, '"')
}

func indexQuote[T string | []byte](s T) int {
	for i := 0; i < len(s); i++ {
		if s[i] == '"' {
			return i
		}
	}
	return -1
}

// textCacheMax bounds a textCache; it is emptied when full.
const textCacheMax = 4096

// textCache remembers the encoded form of text that repeats from hoist to hoist: check
// ids, units, rules, sources, sites, status words.
type textCache struct {
	m map[string]string
}

// encode returns the text field s encoded by fc, from the cache when it can.
func (tc *textCache) encode(fc *fieldCoder, s string) string {
	if e, ok := tc.m[s]; ok {
		return e
	}
	e := string(appendText(fc, nil, s))
	if tc.m == nil || len(tc.m) >= textCacheMax {
		tc.m = make(map[string]string, 64)
	}
	tc.m[strings.Clone(s)] = e
	return e
}

// memoWays is how many texts a memo or freeMemo remembers. Texts in one place of the
// record take a few values from hoist to hoist (the rule of one check differs with the
// mechanism class, its message with the layer that governs): remembering the last four
// finds most of them.
const memoWays = 4

// memo is the last texts written in one place of the record (the rule of the third
// check, say) and their encoded forms, the latest first. Texts in one place mostly repeat
// from hoist to hoist, often as the very same string, which compares in constant time.
type memo [memoWays]struct{ s, enc string }

// appendText appends the text field s, encoded by fc, remembering it in m.
func (tc *textCache) appendText(fc *fieldCoder, m *memo, b []byte, s string) []byte {
	if s != m[0].s {
		tc.remember(fc, m, s)
	}
	return append(b, m[0].enc...)
}

// appendSource appends the source field for the check source s: its short form
// (cite.Short), encoded by fc, remembering it in m under s.
func (tc *textCache) appendSource(fc *fieldCoder, m *memo, b []byte, s string) []byte {
	if s != m[0].s {
		tc.rememberAs(fc, m, s, cite.Short)
	}
	return append(b, m[0].enc...)
}

// remember moves s to the front of m, encoded.
func (tc *textCache) remember(fc *fieldCoder, m *memo, s string) { tc.rememberAs(fc, m, s, nil) }

// rememberAs moves s to the front of m with the encoding of as(s) (of s when as is nil).
func (tc *textCache) rememberAs(fc *fieldCoder, m *memo, s string, as func(string) string) {
	j := 1
	for j < len(m)-1 && m[j].s != s {
		j++
	}
	e := m[j]
	if e.s != s {
		t := s
		if as != nil {
			t = as(s)
		}
		e.s, e.enc = s, tc.encode(fc, t)
	}
	copy(m[1:j+1], m[:j])
	m[0] = e
}

// freeMemo is the last free texts (messages) written in one place of the record and
// their encoded forms, each in a buffer of its own, the latest first. Such texts often
// repeat from hoist to hoist but are as often new, so they are not worth a textCache
// entry.
type freeMemo [memoWays]struct {
	s   string
	enc []byte
}

// appendText appends the text field s, encoded by fc, remembering it.
func (m *freeMemo) appendText(fc *fieldCoder, b []byte, s string) []byte {
	if s != m[0].s {
		m.remember(fc, s)
	}
	return append(b, m[0].enc...)
}

// remember moves s to the front of m, encoded (in the buffer of the entry it replaces,
// the oldest, when it is new).
func (m *freeMemo) remember(fc *fieldCoder, s string) {
	j := 1
	for j < len(m)-1 && m[j].s != s {
		j++
	}
	e := m[j]
	if e.s != s {
		e.s, e.enc = s, appendText(fc, e.enc[:0], s)
	}
	copy(m[1:j+1], m[:j])
	m[0] = e
}
