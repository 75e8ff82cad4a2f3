// Package templates holds hoistfleet's embedded data and nothing else: the register's
// column schema (columns.csv, read by fleet/schema), the rule tables of each profile
// (rules/*.csv, read by fleet/rules) and the invented demo registers (demo/).
package templates

import (
	"embed"
)

// ColumnsCSV is the register's column schema (fleet/schema parses it).
//
//go:embed columns.csv
var ColumnsCSV string

//go:embed rules/*.csv
var rulesFS embed.FS

// RuleTable returns the built-in rule table of a profile ("iso", "us") as CSV.
func RuleTable(profile string) ([]byte, error) { return rulesFS.ReadFile("rules/" + profile + ".csv") }
