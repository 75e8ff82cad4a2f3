package templates

import (
	"embed"
	"io/fs"
	"sort"
)

//go:embed demo/*.csv
var demoFS embed.FS

// DemoInsurerRules returns the demo operator's invented insurer acceptance criteria, a
// user rule file that adds a stopping-distance limit and a stricter heavy-service
// inspection interval.
func DemoInsurerRules() ([]byte, error) { return demoFS.ReadFile("demo/insurer-rules.csv") }

// DemoRegisters returns the invented demo registers (file name → contents), in name
// order. The scenario is described in demo/README.md.
func DemoRegisters() ([]string, map[string][]byte, error) {
	names, err := fs.Glob(demoFS, "demo/demo-*.csv")
	if err != nil {
		return nil, nil, err
	}
	sort.Strings(names)
	out := map[string][]byte{}
	var base []string
	for _, n := range names {
		b, err := demoFS.ReadFile(n)
		if err != nil {
			return nil, nil, err
		}
		out[n[len("demo/"):]] = b
		base = append(base, n[len("demo/"):])
	}
	return base, out, nil
}
