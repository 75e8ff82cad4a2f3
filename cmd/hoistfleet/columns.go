package main

import (
	"fmt"
	"strings"

	"hoistfleet/fleet/schema"
)

// columnsHelp is "hoistfleet help columns", generated from the column schema.
func columnsHelp() string {
	var b strings.Builder
	b.WriteString("hoistfleet columns REGISTER [--format text|json] [--sheet NAME] [--header-row N] [--date-order dmy|mdy|ymd] [--columns FILE]\n")
	b.WriteString("prints how a register's columns are read (as which of ours, in which unit; passed through;\n")
	b.WriteString("refused and why), which of ours it lacks with the checks each would unlock, and how its\n")
	b.WriteString("rows were read. Below: the columns hoistfleet reads.\n\n")
	b.WriteString("The register: one header row (found in the first 30 rows, or --header-row N), then one\n")
	b.WriteString("hoist per row. Headers match ignoring case, spaces and punctuation; units go in brackets,\n")
	b.WriteString("Rated load [t], Rope diameter (in), or in a units row under the header. A column of a\n")
	b.WriteString("physical quantity without a unit anywhere is not read (a cell may carry its own: 5 t).\n")
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
