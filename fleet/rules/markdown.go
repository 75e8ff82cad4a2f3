package rules

import "strings"

// Markdown is a rule table as a markdown table, rows in table order. An Origin
// column is added when some rows come from elsewhere than the built-in profile.
func Markdown(t *Table) string {
	mixed := false
	for _, r := range t.Rules {
		if r.Origin != "built-in "+t.Profile {
			mixed = true
			break
		}
	}
	var b strings.Builder
	head := []string{"Rule", "Groups", "When", "Value", "Unit", "Source", "Provenance", "Note"}
	if mixed {
		head = append(head, "Origin")
	}
	MarkdownRow(&b, head)
	b.WriteString("|" + strings.Repeat("---|", len(head)) + "\n")
	for _, r := range t.Rules {
		row := []string{"`" + r.ID + "`", r.Groups, r.When, r.Value, r.Unit, r.Source, r.Provenance, r.Note}
		if mixed {
			row = append(row, r.Origin)
		}
		MarkdownRow(&b, row)
	}
	return b.String()
}

// MarkdownRow writes one markdown table row, each cell made safe: pipes escaped, line
// breaks as spaces.
func MarkdownRow(b *strings.Builder, cells []string) {
	b.WriteString("|")
	for _, c := range cells {
		b.WriteString(" ")
		b.WriteString(strings.TrimSpace(strings.NewReplacer("\r\n", " ", "\n", " ", "\r", " ", "|", `\|`).Replace(c)))
		b.WriteString(" |")
	}
	b.WriteString("\n")
}
