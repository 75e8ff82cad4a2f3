package rules

import (
	"strings"
	"testing"
)

// cells splits a markdown table row into its cells, honouring escaped pipes.
func cells(line string) []string {
	line = strings.ReplaceAll(line, `\|`, "\x00")
	parts := strings.Split(strings.Trim(line, "|"), "|")
	for i, p := range parts {
		parts[i] = strings.TrimSpace(strings.ReplaceAll(p, "\x00", "|"))
	}
	return parts
}

func TestMarkdown(t *testing.T) {
	for _, p := range Profiles() {
		tb := mustProfile(t, p)
		md := Markdown(tb)
		lines := strings.Split(strings.TrimRight(md, "\n"), "\n")
		if len(lines) != len(tb.Rules)+2 {
			t.Fatalf("%s: %d lines for %d rules", p, len(lines), len(tb.Rules))
		}
		for i, r := range tb.Rules {
			cs := cells(lines[i+2])
			if len(cs) != 8 || cs[0] != "`"+r.ID+"`" || cs[3] != r.Value || cs[6] != r.Provenance {
				t.Errorf("%s line %d: %q", p, i+3, lines[i+2])
			}
		}
	}
	user, err := ParseRules(strings.NewReader("rule,groups,when,value,unit,source,provenance,note\ndrum.h1,M5,,20,1,site rule | rev 2,seen,\n"), "site.csv")
	if err != nil {
		t.Fatal(err)
	}
	md := Markdown(mustProfile(t, "iso").Override(user))
	last := strings.Split(strings.TrimRight(md, "\n"), "\n")
	cs := cells(last[len(last)-1])
	if len(cs) != 9 || cs[8] != "site.csv" || cs[5] != "site rule | rev 2" {
		t.Errorf("override row: %q", last[len(last)-1])
	}
}
