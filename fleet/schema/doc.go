package schema

import (
	"hoistfleet/fleet/rules"
	"strconv"
	"strings"
)

// ColumnsMarkdown is README's column table, generated from the schema: one row per
// column with its header and default unit, meaning, default (or what a missing value
// costs) and the other headers accepted for it. Defaults taken from the rule tables are
// shown with the rule id and the value of each built-in profile.
func ColumnsMarkdown() string {
	var b strings.Builder
	b.WriteString("| Header [default unit] | Meaning | Default | Also accepted |\n")
	b.WriteString("|---|---|---|---|\n")
	for _, c := range Columns() {
		row := []string{
			c.HeaderWithUnit(""),
			columnMeaning(c),
			DefaultText(c),
			strings.Join(c.Synonyms, ", "),
		}
		rules.MarkdownRow(&b, row)
	}
	return b.String()
}

// columnMeaning is the description, followed by the accepted values of an enum or bool
// column when the description does not already name them all.
func columnMeaning(c Column) string {
	m := c.Description
	if len(c.Values) == 0 {
		return m
	}
	lower := strings.ToLower(m)
	for _, v := range c.Values {
		if !strings.Contains(lower, strings.ToLower(v)) {
			return m + " One of: " + strings.Join(c.Values, ", ") + "."
		}
	}
	return m
}

// DefaultText says in words what applies when a column's cell is empty: "required",
// "0 kg", "= Hoist speed", "rule default.brake_delay (0.3 s)". The blank template's
// notes and input messages use it too.
func DefaultText(c Column) string {
	switch c.Need {
	case NeedID:
		return "required (identifies the row)"
	case NeedRequired:
		return "required"
	case NeedChecks:
		if c.Default == "" {
			return "required by the checks that use it"
		}
	}
	d := c.Default
	switch {
	case d == "":
		return "—"
	case strings.HasPrefix(d, "rule:"):
		return ruleDefaultText(strings.TrimPrefix(d, "rule:"), c.Unit)
	case strings.HasPrefix(d, "="):
		if o, ok := ColumnByKey(strings.TrimPrefix(d, "=")); ok {
			return "= " + o.Header
		}
		return d
	}
	if c.Quantity != "" && c.Unit != "" && c.Unit != "1" {
		return d + " " + c.Unit
	}
	return d
}

// ruleDefaultText names the rule and its value in each built-in profile, once when the
// profiles agree: "rule default.brake_delay (0.3 s)". A ratio rule feeding a column in
// % is shown in % ("rule default.peak_torque_ratio (160 %)").
func ruleDefaultText(id, colUnit string) string {
	var vals, names []string
	for _, p := range rules.Profiles() {
		t, err := rules.Profile(p)
		if err != nil {
			continue
		}
		r, ok := t.Lookup(id, rules.Scope{})
		if !ok {
			continue
		}
		v := r.Value
		if f, err := r.ValueSI(); err == nil && colUnit == "%" && r.Dimension() == "ratio" {
			v = strconv.FormatFloat(f*100, 'f', -1, 64) + " %"
		} else if r.Unit != "" && r.Unit != "1" {
			v += " " + r.Unit
		}
		vals = append(vals, v)
		names = append(names, p)
	}
	if len(vals) == 0 {
		return "rule " + id
	}
	same := true
	for _, v := range vals[1:] {
		if v != vals[0] {
			same = false
		}
	}
	if same {
		return "rule " + id + " (" + vals[0] + ")"
	}
	parts := make([]string, len(vals))
	for i := range vals {
		parts[i] = names[i] + " " + vals[i]
	}
	return "rule " + id + " (" + strings.Join(parts, ", ") + ")"
}
