package units

import (
	"errors"
	"fmt"
	"regexp"
	"strings"
	"unicode"
)

// gd2Token finds a GD² marker in a header title: "GD2", "GD²", "GD^2", "(GD2)".
var gd2Token = regexp.MustCompile(`(?i)[(\[]?\bGD\s*(?:2|²|\^2)[)\]]?`)

// ErrHeader is wrapped by SplitHeader's errors.
var ErrHeader = errors.New("header")

// SplitHeader splits a header cell into its title and the unit written in square or
// round brackets at its end. Surrounding space is trimmed from both.
//
//	"Rated load [t]"              → "Rated load", "t"
//	"Rope diameter (in)"          → "Rope diameter", "in"
//	"Sheave efficiency (max) [%]" → "Sheave efficiency (max)", "%"
//	"Site"                        → "Site", ""
//
// A GD² marker in the title ("Motor inertia GD2 [kgf m2]", "Drum inertia (GD²) [kg m2]")
// is taken out of the title and put in front of the unit ("GD2 kgf m2"), so that Factor
// converts GD² to the moment of inertia (J = GD²/4).
//
// An unclosed bracket at the end ("Rated load [t") or empty brackets ("Rated load []")
// are errors; the title returned is then the text before the bracket, so that the caller
// can still say which column is at fault.
func SplitHeader(h string) (title, unit string, err error) {
	s := strings.TrimSpace(h)
	title = s
	if s == "" {
		return "", "", nil
	}
	last := s[len(s)-1]
	if last == ']' || last == ')' {
		open := byte('[')
		if last == ')' {
			open = '('
		}
		depth, at := 0, -1
		for i := len(s) - 1; i >= 0; i-- {
			switch s[i] {
			case last:
				depth++
			case open:
				depth--
			}
			if depth == 0 {
				at = i
				break
			}
		}
		if at < 0 {
			return strings.TrimSpace(s[:len(s)-1]), "", fmt.Errorf("%w: %q: the closing %q has no opening %q", ErrHeader, s, string(last), string(open))
		}
		title = strings.TrimSpace(s[:at])
		unit = strings.TrimSpace(s[at+1 : len(s)-1])
		if unit == "" {
			return title, "", fmt.Errorf("%w: %q: empty brackets: write the unit inside them or remove them", ErrHeader, s)
		}
	} else if i := strings.LastIndexAny(s, "[("); i >= 0 && !strings.ContainsAny(s[i:], "])") {
		return strings.TrimSpace(s[:i]), "", fmt.Errorf("%w: %q: the bracket %q is not closed", ErrHeader, s, string(s[i]))
	}
	if loc := gd2Token.FindStringIndex(title); loc != nil {
		title = strings.TrimSpace(strings.Join(strings.Fields(title[:loc[0]]+" "+title[loc[1]:]), " "))
		if !strings.HasPrefix(norm(unit), "GD2") {
			unit = strings.TrimSpace("GD2 " + unit)
		}
	}
	return title, unit, nil
}

// Normalize returns the key header titles are matched on: letters and digits only,
// lower case, with "²"/"³" read as "2"/"3". "Rope MBF", "rope-mbf", "ROPE_MBF" and
// "Rope  M.B.F." all give "ropembf".
func Normalize(title string) string {
	var b strings.Builder
	b.Grow(len(title))
	for _, c := range title {
		switch {
		case c == '²':
			b.WriteByte('2')
		case c == '³':
			b.WriteByte('3')
		case unicode.IsLetter(c) || unicode.IsDigit(c):
			b.WriteRune(unicode.ToLower(c))
		}
	}
	return b.String()
}
