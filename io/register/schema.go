package register

import (
	"sort"
	"strings"
	"sync"
	"unicode"

	"hoistfleet/fleet/schema"
	"hoistfleet/io/units"
)

// schemaIdx finds a schema column from a header title.
type schemaIdx struct {
	byName    map[string]string   // normalized key, header or synonym → key
	ambiguous map[string][]string // normalized names claimed by several keys
	cols      map[string]schema.Column
}

// schemaIndex returns the index of schema.Columns by the normalized key, header and
// synonyms (and their abbreviations written out), built once: it is never changed.
func schemaIndex() *schemaIdx {
	schemaIndexOnce.Do(func() { theSchemaIndex = buildSchemaIndex() })
	return theSchemaIndex
}

var (
	schemaIndexOnce sync.Once
	theSchemaIndex  *schemaIdx // read only once built
)

func buildSchemaIndex() *schemaIdx {
	x := &schemaIdx{byName: map[string]string{}, ambiguous: map[string][]string{}, cols: map[string]schema.Column{}}
	for _, c := range schema.Columns() {
		x.cols[c.Key] = c
		names := append([]string{c.Key, c.Header}, c.Synonyms...)
		for _, n := range names {
			names = append(names, expandAbbreviations(n))
		}
		for _, n := range names {
			k := units.Normalize(n)
			if k == "" {
				continue
			}
			if prev, ok := x.byName[k]; ok && prev != c.Key {
				x.ambiguous[k] = appendUnique(x.ambiguous[k], prev, c.Key)
				continue
			}
			x.byName[k] = c.Key
		}
	}
	return x
}

func appendUnique(list []string, add ...string) []string {
	for _, a := range add {
		found := false
		for _, l := range list {
			found = found || l == a
		}
		if !found {
			list = append(list, a)
		}
	}
	sort.Strings(list)
	return list
}

// match returns the key a title names, or the keys it could name when several do. The
// title is compared as written, then with the abbreviations registers use expanded
// ("Rope meas. dia" is "rope measured diameter").
func (x *schemaIdx) match(title string) (key, ambiguous string) {
	for i, t := range []string{title, expandAbbreviations(title)} {
		n := units.Normalize(t)
		if n == "" || i == 1 && t == title {
			continue
		}
		if keys, ok := x.ambiguous[n]; ok {
			return "", strings.Join(keys, ", ")
		}
		if k := x.byName[n]; k != "" {
			return k, ""
		}
	}
	return "", ""
}

// abbreviations are the short forms of register headers, lower case without their
// point, and what they stand for.
var abbreviations = map[string]string{
	"dia": "diameter", "diam": "diameter", "ø": "diameter", "⌀": "diameter",
	"ref": "reference", "meas": "measured", "no": "number", "nr": "number", "num": "number",
	"eff": "efficiency", "effy": "efficiency", "pcd": "pitch circle diameter",
	"swl": "safe working load", "wll": "working load limit", "te": "thorough examination",
	"exam": "examination", "insp": "inspection", "max": "maximum", "qty": "quantity",
}

// expandAbbreviations writes a title's abbreviated words out: "Rope Ø" → "rope diameter",
// "No. of falls" → "number of falls", "Gearbox eff." → "gearbox efficiency". Words are
// runs of letters and digits; "Ø" and "⌀" are words of their own.
func expandAbbreviations(title string) string {
	var b strings.Builder
	word := func(w string) {
		if w == "" {
			return
		}
		if b.Len() > 0 {
			b.WriteByte(' ')
		}
		if full, ok := abbreviations[strings.ToLower(w)]; ok {
			w = full
		}
		b.WriteString(w)
	}
	start := -1
	for i, r := range title {
		letter := unicode.IsLetter(r) || unicode.IsDigit(r)
		if r == 'ø' || r == 'Ø' || r == '⌀' {
			if start >= 0 {
				word(title[start:i])
				start = -1
			}
			word("ø")
			continue
		}
		switch {
		case letter && start < 0:
			start = i
		case !letter && start >= 0:
			word(title[start:i])
			start = -1
		}
	}
	if start >= 0 {
		word(title[start:])
	}
	return b.String()
}

func (x *schemaIdx) col(key string) (schema.Column, bool) {
	c, ok := x.cols[key]
	return c, ok
}
