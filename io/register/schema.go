package register

import (
	"sort"
	"strings"

	"hoistfleet/fleet/schema"
	"hoistfleet/io/units"
)

// schemaIdx finds a schema column from a header title.
type schemaIdx struct {
	byName    map[string]string   // normalized key, header or synonym → key
	ambiguous map[string][]string // normalized names claimed by several keys
	cols      map[string]schema.Column
}

// schemaIndex indexes schema.Columns by the normalized key, header and synonyms.
func schemaIndex() *schemaIdx {
	x := &schemaIdx{byName: map[string]string{}, ambiguous: map[string][]string{}, cols: map[string]schema.Column{}}
	for _, c := range schema.Columns() {
		x.cols[c.Key] = c
		names := append([]string{c.Key, c.Header}, c.Synonyms...)
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

// match returns the key a title names, or the keys it could name when several do.
func (x *schemaIdx) match(title string) (key, ambiguous string) {
	n := units.Normalize(title)
	if n == "" {
		return "", ""
	}
	if keys, ok := x.ambiguous[n]; ok {
		return "", strings.Join(keys, ", ")
	}
	return x.byName[n], ""
}

func (x *schemaIdx) col(key string) (schema.Column, bool) {
	c, ok := x.cols[key]
	return c, ok
}
