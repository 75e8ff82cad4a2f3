package register

import (
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// formatNumber renders a number cell's stored value (raw, as in <v>) with its number
// format code as a spreadsheet shows it, for the text columns (an asset id 125 formatted
// 00000 shows, and is read, as "00125"). It covers the number formats of ECMA-376 Part
// 1, 18.8.31 (numFmts) made of digit placeholders (0 # ?), a decimal point, thousands
// separators, a percent sign, literal text ("…", \c, and - ( ) / : + space $ and the
// like), colours and locale tags, in up to four sections (positive; negative; zero;
// text). ok is false for what it does not render (General and @, whose display depends
// on the column width or is the stored value; dates and times; fractions; scientific
// notation; conditions; scaling by trailing commas): the caller reads the stored value
// and says so.
//
// Rounding is half away from zero, as spreadsheet programs display.
func formatNumber(raw, code string) (string, bool) {
	x, err := strconv.ParseFloat(strings.TrimSpace(raw), 64)
	if err != nil || math.IsInf(x, 0) || math.IsNaN(x) || code == "" || strings.EqualFold(code, "General") {
		return "", false
	}
	sections := splitSections(code)
	sec, neg := sections[0], false
	switch {
	case x < 0 && len(sections) >= 2:
		sec, x = sections[1], -x
	case x < 0:
		neg, x = true, -x
	case x == 0 && len(sections) >= 3:
		sec = sections[2]
	}
	out, ok := renderSection(x, sec)
	if !ok {
		return "", false
	}
	if neg && strings.ContainsAny(out, "123456789") {
		out = "-" + out
	}
	return out, true
}

// splitSections splits a format code at the semicolons outside quotes and escapes.
func splitSections(code string) []string {
	var out []string
	start, quoted := 0, false
	for i := 0; i < len(code); i++ {
		switch c := code[i]; {
		case c == '"':
			quoted = !quoted
		case quoted:
		case c == '\\':
			i++
		case c == ';':
			out = append(out, code[start:i])
			start = i + 1
		}
	}
	return append(out, code[start:])
}

// fmtToken is one element of a format section: a digit placeholder ('0', '#', '?'), or
// literal text (ph == 0).
type fmtToken struct {
	ph  byte
	lit string
}

// renderSection renders x ≥ 0 with one section of a format code.
func renderSection(x float64, sec string) (string, bool) {
	var intPart, fracPart []fmtToken
	inFrac, percent, thousands, seenPh := false, false, false, false
	add := func(t fmtToken) {
		if inFrac {
			fracPart = append(fracPart, t)
		} else {
			intPart = append(intPart, t)
		}
	}
	for i := 0; i < len(sec); i++ {
		c := sec[i]
		switch {
		case c == '"':
			j := strings.IndexByte(sec[i+1:], '"')
			if j < 0 {
				return "", false
			}
			add(fmtToken{lit: sec[i+1 : i+1+j]})
			i += j + 1
		case c == '\\':
			if i+1 >= len(sec) {
				return "", false
			}
			_, n := firstRune(sec[i+1:])
			add(fmtToken{lit: sec[i+1 : i+1+n]})
			i += n
		case c == '[':
			j := strings.IndexByte(sec[i:], ']')
			if j < 0 {
				return "", false
			}
			tag := sec[i+1 : i+j]
			if !isColour(tag) && !strings.HasPrefix(tag, "$") {
				return "", false // a condition ([>=100]) or elapsed time ([h])
			}
			if strings.HasPrefix(tag, "$") { // [$€-407]: the currency text before the '-'
				cur, _, _ := strings.Cut(tag[1:], "-")
				add(fmtToken{lit: cur})
			}
			i += j
		case c == '_': // a space as wide as the next character
			if i+1 < len(sec) {
				i++
			}
			add(fmtToken{lit: " "})
		case c == '*': // repeat the next character to fill the cell: nothing here
			if i+1 < len(sec) {
				i++
			}
		case c == '0' || c == '#' || c == '?':
			add(fmtToken{ph: c})
			seenPh = true
		case c == '.':
			if inFrac {
				return "", false
			}
			inFrac = true
		case c == ',':
			// A thousands separator between placeholders; after the last one it scales.
			if !inFrac && seenPh && i+1 < len(sec) && strings.ContainsRune("0#?", rune(sec[i+1])) {
				thousands = true
				continue
			}
			return "", false
		case c == '%':
			percent = true
			add(fmtToken{lit: "%"})
		case strings.IndexByte("$-+/():!^&'~{}<>= ", c) >= 0:
			add(fmtToken{lit: string(c)})
		case c >= 0x80:
			_, n := firstRune(sec[i:])
			add(fmtToken{lit: sec[i : i+n]})
			i += n - 1
		default:
			return "", false // dates, times, exponents, fractions, @, General
		}
	}
	if !seenPh { // literal text only ("zero", "-"): shown as it stands
		var b strings.Builder
		for _, t := range intPart {
			b.WriteString(t.lit)
		}
		return b.String(), !inFrac && b.Len() > 0
	}
	if percent {
		x *= 100
	}
	decimals := 0
	for _, t := range fracPart {
		if t.ph != 0 {
			decimals++
		}
	}
	if decimals > 15 || x >= 1e15 {
		return "", false
	}
	p := math.Pow10(decimals)
	x = math.Floor(x*p+0.5) / p
	digits := strconv.FormatFloat(x, 'f', decimals, 64)
	ip, fp, _ := strings.Cut(digits, ".")
	if ip == "0" {
		ip = ""
	}
	var out strings.Builder
	out.WriteString(renderInt(ip, intPart, thousands))
	if inFrac {
		out.WriteByte('.') // shown even when no fraction digit is ("0.##": 3 is "3.")
		out.WriteString(renderFrac(fp, fracPart))
	}
	return out.String(), true
}

// renderInt fills the integer part's placeholders with digits from the right; digits
// beyond the placeholders go before the first one.
func renderInt(digits string, toks []fmtToken, thousands bool) string {
	if thousands && len(digits) > 3 {
		var b strings.Builder
		for i, d := range digits {
			if i > 0 && (len(digits)-i)%3 == 0 {
				b.WriteByte(',')
			}
			b.WriteRune(d)
		}
		digits = b.String()
	}
	out := make([]string, len(toks))
	d := len(digits)
	first := -1
	for i := len(toks) - 1; i >= 0; i-- {
		t := toks[i]
		if t.ph == 0 {
			out[i] = t.lit
			continue
		}
		first = i
		switch {
		case d > 0:
			// A separator inserted by grouping travels with its digit.
			start := d - 1
			if start > 0 && digits[start-1] == ',' {
				start--
			}
			out[i] = digits[start:d]
			d = start
		case t.ph == '0':
			out[i] = "0"
		case t.ph == '?':
			out[i] = " "
		}
	}
	if d > 0 && first >= 0 {
		out[first] = digits[:d] + out[first]
	}
	return strings.Join(out, "")
}

// renderFrac fills the fraction's placeholders from the left; trailing zeros of '#'
// placeholders are not shown.
func renderFrac(digits string, toks []fmtToken) string {
	out := make([]string, len(toks))
	k := 0
	lastShown := -1
	for i, t := range toks {
		if t.ph == 0 {
			out[i] = t.lit
			continue
		}
		dg := byte('0')
		if k < len(digits) {
			dg = digits[k]
		}
		k++
		out[i] = string(dg)
		if dg != '0' || t.ph != '#' {
			lastShown = i
		}
	}
	for i := len(toks) - 1; i > lastShown; i-- {
		if toks[i].ph == '#' {
			out[i] = ""
		} else if toks[i].ph == '?' && out[i] == "0" {
			out[i] = " "
		}
	}
	return strings.Join(out, "")
}

func isColour(tag string) bool {
	switch strings.ToLower(tag) {
	case "black", "blue", "cyan", "green", "magenta", "red", "white", "yellow":
		return true
	}
	return strings.HasPrefix(strings.ToLower(tag), "color")
}

func firstRune(s string) (rune, int) { return utf8.DecodeRuneInString(s) }
