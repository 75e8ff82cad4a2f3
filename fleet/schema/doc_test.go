package schema

import (
	"flag"
	"fmt"
	"hoistfleet/fleet/rules"
	"os"
	"path/filepath"
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

func TestColumnsMarkdown(t *testing.T) {
	md := ColumnsMarkdown()
	lines := strings.Split(strings.TrimRight(md, "\n"), "\n")
	cols := Columns()
	if len(lines) != len(cols)+2 {
		t.Fatalf("%d lines, want header + rule + %d columns", len(lines), len(cols))
	}
	for i, c := range cols {
		cs := cells(lines[i+2])
		if len(cs) != 4 {
			t.Fatalf("line %d has %d cells: %q", i+3, len(cs), lines[i+2])
		}
		if cs[0] != c.HeaderWithUnit("") {
			t.Errorf("line %d header %q, want %q", i+3, cs[0], c.HeaderWithUnit(""))
		}
		for _, s := range c.Synonyms {
			if !strings.Contains(cs[3], s) {
				t.Errorf("%s: synonym %q missing", c.Key, s)
			}
		}
		if cs[2] == "" {
			t.Errorf("%s: empty default cell", c.Key)
		}
	}
	// Rule-table defaults show the profile value. standards.md: sheave efficiency 0.98 with
	// rolling bearings (seen); design.md: brake delay 0.3 s, peak torque 160 %, common practice.
	for key, want := range map[string]string{
		"sheave_efficiency": "rule default.sheave_efficiency (0.98)",
		"brake_delay":       "rule default.brake_delay (0.3 s)",
		"lowering_speed":    "= Hoist speed",
		"motor_peak_torque": "rule default.peak_torque_ratio (160 %)",
		"rated_load":        "required",
		"hook_block_mass":   "0 kg", // design.md: hook block mass 0, reported
	} {
		c, ok := ColumnByKey(key)
		if !ok {
			t.Errorf("schema has no %s", key)
			continue
		}
		if got := DefaultText(c); got != want {
			t.Errorf("DefaultText(%s) = %q, want %q", key, got, want)
		}
	}
}

var updateReadme = flag.Bool("update-readme", false, "rewrite the generated blocks of ../../README.md (columns, rules)")

// replaceBlock puts content between "<!-- name:begin -->" and "<!-- name:end -->".
func replaceBlock(text, name, content string) (string, error) {
	begin, end := "<!-- "+name+":begin -->\n", "<!-- "+name+":end -->"
	i := strings.Index(text, begin)
	j := strings.Index(text, end)
	if i < 0 || j < i {
		return "", fmt.Errorf("README.md has no %q … %q block", strings.TrimSpace(begin), end)
	}
	return text[:i+len(begin)] + content + text[j:], nil
}

// rulesReadme is the README's rules block: every built-in profile's table.
func rulesReadme() (string, error) {
	var b strings.Builder
	for _, p := range rules.Profiles() {
		tb, err := rules.Profile(p)
		if err != nil {
			return "", err
		}
		fmt.Fprintf(&b, "### Profile `%s`\n\n%s\n", p, rules.Markdown(tb))
	}
	return b.String(), nil
}

// README.md must carry the generated column table verbatim: regenerate it whenever
// columns.csv changes with
//
//	go test ./fleet/schema -run TestReadmeHasColumnTable -update-readme
//
// which rewrites the columns and rules blocks. A missing README fails.
func TestReadmeHasColumnTable(t *testing.T) {
	path := filepath.Join("..", "..", "README.md")
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("README.md: %v (it must contain the output of schema.ColumnsMarkdown())", err)
	}
	readme := strings.ReplaceAll(string(data), "\r\n", "\n")
	if *updateReadme {
		rules, err := rulesReadme()
		if err != nil {
			t.Fatal(err)
		}
		if readme, err = replaceBlock(readme, "columns", ColumnsMarkdown()); err != nil {
			t.Fatal(err)
		}
		if readme, err = replaceBlock(readme, "rules", rules); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, []byte(readme), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	if !strings.Contains(readme, ColumnsMarkdown()) {
		t.Errorf("README.md does not contain the current column table: run go test ./fleet/schema -run TestReadmeHasColumnTable -update-readme")
	}
	// The rules block too: a rule row's value, source or provenance changed in the tables
	// and not in README would mislead a reader of the README.
	rules, err := rulesReadme()
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(readme, rules) {
		t.Errorf("README.md does not contain the current rule tables: run go test ./fleet/schema -run TestReadmeHasColumnTable -update-readme")
	}
}

func TestRulesMarkdown(t *testing.T) {
	for _, p := range rules.Profiles() {
		tb := mustProfile(t, p)
		md := rules.Markdown(tb)
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
	user, err := rules.ParseRules(strings.NewReader("rule,groups,when,value,unit,source,provenance,note\ndrum.h1,M5,,20,1,site rule | rev 2,seen,\n"), "site.csv")
	if err != nil {
		t.Fatal(err)
	}
	md := rules.Markdown(mustProfile(t, "iso").Override(user))
	last := strings.Split(strings.TrimRight(md, "\n"), "\n")
	cs := cells(last[len(last)-1])
	if len(cs) != 9 || cs[8] != "site.csv" || cs[5] != "site rule | rev 2" {
		t.Errorf("override row: %q", last[len(last)-1])
	}
}

func mustProfile(t *testing.T, name string) *rules.Table {
	t.Helper()
	tb, err := rules.Profile(name)
	if err != nil {
		t.Fatal(err)
	}
	return tb
}
