// Command hoistfleet checks every hoist in a register of powered drum hoists (electric
// motor, gearbox, rope drum, holding brake, hook block on one or more parts of line)
// against published engineering rules and writes a results workbook.
//
// Usage:
//
//	hoistfleet check REGISTER [-o OUT.xlsx] [--rules iso|us|FILE] [--as-of DATE]
//	                          [--format xlsx|csv|jsonl] [--workers N] [--sheet NAME]
//	                          [--marginal 0.10] [--fail-on fail|marginal|never] [--quiet]
//	                          [--rated-load-factor F] [--header-row N] [--date-order dmy|mdy|ymd]
//	                          [--columns FILE]
//	                          [--baseline PREVIOUS]
//	hoistfleet explain REGISTER --asset ID [--format text|md]   one hoist's calculation record
//	hoistfleet explain REGISTER --all -o DIR                     every hoist's record, one file each
//	hoistfleet columns REGISTER [--format text|json]             how the register's columns are read
//	hoistfleet template [-o FILE] [--units si|us]                a blank register
//	hoistfleet rules [--rules iso|us|FILE] [--format text|md|csv] the rule table in force
//	hoistfleet demo [-o DIR]                                     writes the invented demo registers and checks them
//	hoistfleet help [COMMAND | columns]
//
// Exit status: 0 nothing at or above the --fail-on level, 1 some hoist at or above it,
// 2 usage error, 3 input unreadable or output unwritable.
//
// It is a screening calculation on the data given; it does not replace thorough
// examination by a competent person, the manufacturer's ratings, or local regulations and
// licensed engineering practice, which always prevail.
package main

import (
	"hoistfleet/fleet/schema"
)

const usageText = `hoistfleet checks a register of powered drum hoists and writes a results workbook.

Usage:
  hoistfleet check REGISTER [flags]       check every hoist; write REGISTER-results.xlsx
  hoistfleet explain REGISTER --asset ID  one hoist's calculation record (--all -o DIR: every hoist)
  hoistfleet columns REGISTER             how its columns are read, which are missing and what they unlock
  hoistfleet template [-o FILE]           a blank register to fill in (--units us for US customary)
  hoistfleet rules [--rules iso|us|FILE]  the rule table in force, with every source
  hoistfleet demo [-o DIR]                write the invented demo registers and check them
  hoistfleet help COMMAND                 flags and examples of a command
  hoistfleet help columns                 the register's columns, units and defaults

Examples:
  hoistfleet demo
  hoistfleet check site-hoists.xlsx --as-of 2026-12-01
  hoistfleet check register.csv --rules us --format jsonl -o - | jq .status
  hoistfleet explain register.xlsx --asset H-014 --format md > H-014.md

Exit status: 0 nothing at or above --fail-on (default fail), 1 some hoist at or above it,
2 usage error, 3 input unreadable or output unwritable.

CAUTION: a screening calculation on the data given. It does not replace thorough
examination by a competent person, the manufacturer's ratings, or local regulations and
licensed engineering practice, which always prevail.
`

var commandHelp = map[string]string{
	"check": `hoistfleet check REGISTER [flags]

Reads the register (XLSX or CSV; - reads CSV from standard input), runs every check on
every hoist and writes the results: an XLSX workbook (Summary, Register, Checks, Data,
Audit sheets), or long-form CSV, or JSON lines. The input is never modified; the output is
written to a temporary file and renamed when complete.

The header is found in the first 30 rows: the row naming the most register columns,
with at least the asset id and one other (title blocks, "prepared by" lines and blank
rows above it are skipped and noted); --header-row N gives it. A units row under the
header gives units to the columns whose title has none. Blank rows, totals rows and
repeated header rows are left out and noted once; blank markers (-, n/a, TBC, ?,
unknown, none) read as empty. Hidden or filtered-out rows are checked and marked
hidden. A file with no recognisable header, or no hoist under it, exits 3.

--sheet all reads every sheet of a workbook that has a recognisable header as one
register (a sheet a site); the others are skipped and listed. A sheet without a Site
column gives its name as its hoists' site.

--columns FILE says which register column is which of ours where the synonyms do not
(another language, a client's own titles): a CSV whose first row is
"register column,column,unit,date order", one register column a row, naming one of ours
by key or header (or "ignore"), optionally its unit and (dates) dmy, mdy or ymd.

Each hoist carries its coverage (the checks its data let run of those that apply); the
summary says what the verdicts rest on, and the Data sheet lists the register columns
the hoists lack, most useful first.

Dates: ISO 8601 (2026-03-25), spreadsheet date cells, and dates as spreadsheets write
them: 25/03/2026, 25.03.2026, 25-Mar-26, March 25, 2026, Mar 2026 (the first of the
month). Which of day and month comes first is --date-order, else what each column's own
unambiguous dates show (25/03/2026 can only be day first), said in the summary; a date
that reads both ways (03/04/2026) in a column with no such evidence is refused.

--baseline PREVIOUS compares with an earlier run (its results workbook or JSON lines):
hoists added and removed, status changes (worse first), ratings that moved by more than
1 %, checks newly failing or cleared, inspections newly overdue, register values changed.
The workbook gets a Changes sheet, each JSON line a "change", the summary a section.
An Exposure column (people below, hazardous load, process critical, low) orders the
attention list by consequence and severity (rules attention.*); a Crane column groups
hoists into cranes, each with its worst hoist's status.

Examples:
  hoistfleet check hoists.xlsx
  hoistfleet check hoists.xlsx --sheet "Site B" -o site-b-results.xlsx
  hoistfleet check hoists.csv --rules us --as-of 2026-12-01 --fail-on marginal
  hoistfleet check hoists.csv --rated-load-factor 1.2        re-rate every hoist by +20 %
  hoistfleet check hoists.csv --rules iso --rules insurer.csv --format jsonl -o results.jsonl
  hoistfleet check export.csv --header-row 5 --date-order dmy
  hoistfleet check kranliste.csv --columns kranliste-columns.csv
  hoistfleet check hoists.xlsx --baseline last-quarter-results.xlsx
`,
	"explain": `hoistfleet explain REGISTER --asset ID [flags]

Writes one hoist's calculation record: inputs as given and in SI, defaults applied, each
check's rule and source, the formulas with numbers substituted, results, the rating and
the cautions, ready to be checked and signed. --format text (default) and md wrap at
100 columns. --format pdf writes a record to sign: a title block with the register's
SHA-256 and blank prepared / checked / approved fields, a table of the checks with
utilisation bars, a rating diagram (each load-dependent check's utilisation against the
rated load), the emergency stop and the runaway plotted, the working, at a proposed load
the working again with what would have to change, and what the record does not check.

Examples:
  hoistfleet explain hoists.xlsx --asset H-014
  hoistfleet explain hoists.xlsx --asset H-014 --format md -o H-014.md
  hoistfleet explain hoists.xlsx --asset H-014 --format pdf -o H-014.pdf
  hoistfleet explain hoists.xlsx --all -o records/
  hoistfleet explain hoists.xlsx --all --format pdf -o records/
`,
	"template": `hoistfleet template [-o FILE] [--units si|us]

Writes a blank register generated from the column schema: headers with units, an input
message on every header, drop-down lists, number ranges, an example row and a notes
sheet. -o register.csv writes CSV.

Examples:
  hoistfleet template -o register.xlsx
  hoistfleet template --units us -o register-us.xlsx
  hoistfleet template -o register.csv
`,
	"rules": `hoistfleet rules [--rules iso|us|FILE] [--format text|md|csv]

Prints the rule table in force: every threshold and default with the duty groups and
conditions it covers, its source and the provenance of its value. A rule file (CSV, or
an XLSX workbook's first sheet, with the same columns) overrides or extends the profile.

Examples:
  hoistfleet rules
  hoistfleet rules --rules us --format md
  hoistfleet rules --rules iso --rules insurer.csv
`,
	"demo": `hoistfleet demo [-o DIR]

Writes the invented demo registers (an SI register and a US-customary one, for a
fictional operator) into DIR (default hoistfleet-demo), checks them as of 2026-12-01 and
writes their results workbooks beside them; the SI register is also checked against the
operator's insurer's rule file (insurer-rules.csv), which adds a stopping-distance limit.
It exits 0: the demo's failures are there on purpose.

Examples:
  hoistfleet demo
  hoistfleet demo -o /tmp/demo --rules us
`,
}

func init() {
	commandHelp["columns"] = columnsHelp()
	commandHelp["columns-md"] = schema.ColumnsMarkdown()
}
