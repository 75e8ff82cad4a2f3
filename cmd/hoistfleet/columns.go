package main

import (
	"fmt"
	"strings"

	"hoistfleet/fleet/schema"
)

// columnsHelp is "hoistfleet help columns", generated from the column schema.
func columnsHelp() string {
	var b strings.Builder
	b.WriteString("The register: one header row, then one hoist per row. Headers match ignoring case,\n")
	b.WriteString("spaces and punctuation; units go in brackets: Rated load [t], Rope diameter (in).\n")
	b.WriteString("Unknown columns are passed through untouched.\n\n")
	for _, c := range schema.Columns() {
		fmt.Fprintf(&b, "%s\n", c.HeaderWithUnit(""))
		fmt.Fprintf(&b, "    %s\n", c.Description)
		fmt.Fprintf(&b, "    %s", schema.DefaultText(c))
		if len(c.Synonyms) > 0 {
			fmt.Fprintf(&b, "; also read as: %s", strings.Join(c.Synonyms, ", "))
		}
		b.WriteString("\n")
	}
	return b.String()
}
