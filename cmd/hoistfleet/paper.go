package main

import (
	"strings"

	"hoistfleet/io/xlsxout"
)

// resolvePaper returns the paper of `check --paper` (a4 or letter); without the flag,
// the locale's: the first of LC_ALL, LC_PAPER and LANG that is set, letter for a US or
// Canadian locale (en_US, es_US, en_CA, fr_CA, …: the countries where Letter is the
// common paper that the issue names), A4 otherwise (ISO 216, the rest of the world's).
func resolvePaper(flag string, getenv func(string) string) (string, error) {
	switch strings.ToLower(flag) {
	case xlsxout.PaperA4:
		return xlsxout.PaperA4, nil
	case xlsxout.PaperLetter:
		return xlsxout.PaperLetter, nil
	case "":
	default:
		return "", usagef("--paper %q: want a4 or letter", flag)
	}
	for _, v := range []string{"LC_ALL", "LC_PAPER", "LANG"} {
		loc := getenv(v)
		if loc == "" {
			continue
		}
		// language_TERRITORY.codeset@modifier
		loc, _, _ = strings.Cut(loc, ".")
		loc, _, _ = strings.Cut(loc, "@")
		if _, terr, ok := strings.Cut(loc, "_"); ok && (terr == "US" || terr == "CA") {
			return xlsxout.PaperLetter, nil
		}
		return xlsxout.PaperA4, nil
	}
	return xlsxout.PaperA4, nil
}
