// Package rulesfile reads a user's rule file — their insurer's or jurisdiction's
// acceptance criteria — as CSV or as one sheet of an XLSX workbook, into rule rows that
// override a built-in profile (rules.Table.Override).
//
// The file has the columns of the built-in tables (rules.RuleColumns):
//
//	rule,groups,when,value,unit,source,provenance,note
//	rope.design_factor,M6,,6.0,1,Insurer acceptance criteria 2025 §3,seen,stricter than ISO 4308-1
//
// Every problem is reported with its place: "rules.csv:7: value: …" for CSV,
// "rules.xlsx!D7: value: …" for a workbook (with the sheet, "rules.xlsx[Limits]!D7",
// when the workbook has more than one).
package rulesfile

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"strings"

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet/rules"
)

// MaxSize is the largest rule file read, in bytes.
const MaxSize = 16 << 20

// zipMagic starts every XLSX file (a zip archive's local file header).
var zipMagic = []byte("PK\x03\x04")

// Read reads the rule file called name from r. An XLSX workbook is recognised by its
// zip signature, whatever the name; its sheet named sheet is read (the name compared
// without regard to case), or the first sheet when sheet is "". Anything else is read
// as CSV (comma or semicolon separated, UTF-8), where a sheet name is an error. Rules
// come back with Origin set to name (and ", sheet S" for a workbook) and Line to their
// line or sheet row. Errors from the rows are a rules.RuleErrors.
func Read(name string, r io.Reader, sheet string) ([]rules.Rule, error) {
	data, err := io.ReadAll(io.LimitReader(r, MaxSize+1))
	if err != nil {
		return nil, fmt.Errorf("%s: reading rules: %w", name, err)
	}
	if len(data) > MaxSize {
		return nil, fmt.Errorf("%s: rule file larger than %d MiB", name, MaxSize>>20)
	}
	if bytes.HasPrefix(data, zipMagic) {
		return readXLSX(name, data, sheet)
	}
	if sheet != "" {
		return nil, fmt.Errorf("%s: a sheet (%q) was named but the file is not an XLSX workbook", name, sheet)
	}
	return rules.ParseRules(bytes.NewReader(data), name)
}

func readXLSX(name string, data []byte, sheet string) ([]rules.Rule, error) {
	f, err := excelize.OpenReader(bytes.NewReader(data))
	if err != nil {
		return nil, fmt.Errorf("%s: not a readable XLSX workbook: %w", name, err)
	}
	defer f.Close()
	sheets := f.GetSheetList()
	if len(sheets) == 0 {
		return nil, fmt.Errorf("%s: the workbook has no sheets", name)
	}
	use := sheets[0]
	if sheet != "" {
		use = ""
		for _, s := range sheets {
			if strings.EqualFold(s, sheet) {
				use = s
				break
			}
		}
		if use == "" {
			return nil, fmt.Errorf("%s: no sheet %q (sheets: %s)", name, sheet, strings.Join(sheets, ", "))
		}
	}
	// Raw values: a number is read as stored, not as displayed (a cell showing 0.02 may
	// hold 0.015625).
	rows, err := f.GetRows(use, excelize.Options{RawCellValue: true})
	if err != nil {
		return nil, fmt.Errorf("%s: sheet %s: %w", name, use, err)
	}
	where := name
	if len(sheets) > 1 {
		where = name + "[" + use + "]"
	}
	parsed, err := rules.ParseRuleRecords(rows, where, 1)
	var es rules.RuleErrors
	if errors.As(err, &es) {
		for _, e := range es {
			if e.Col > 0 {
				if cell, cerr := excelize.CoordinatesToCellName(e.Col, e.Line); cerr == nil {
					e.Cell = cell
					continue
				}
			}
			e.Cell = fmt.Sprintf("%d:%d", e.Line, e.Line) // the whole row, as a spreadsheet writes it
		}
		return nil, es
	}
	if err != nil {
		return nil, err
	}
	for i := range parsed {
		parsed[i].Origin = name + ", sheet " + use
	}
	return parsed, nil
}
