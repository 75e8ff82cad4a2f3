package blank

import (
	"encoding/csv"
	"fmt"
	"io"
	"strconv"
	"strings"
	"time"
	"unicode/utf16"

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
)

// Sheet names of the XLSX template. The register is the first sheet, so that a reader
// taking the first sheet finds it.
const (
	RegisterSheet = "Register"
	NotesSheet    = "Notes"
)

// DataRows is how many rows below the header carry data validation.
const DataRows = 5000

// Excel's limits on a data validation's input message (ECMA-376 §18.3.1.32: prompt and
// promptTitle; Excel refuses longer ones).
const (
	maxPromptTitle = 32
	maxPrompt      = 255
)

// example is one invented hoist — our own figures, no real product — in the schema's
// default units: a 5 t, M5 electric wire rope hoist, 4 parts of line on a twin-grooved
// drum (n_e = 2), 10 mm 6x36 IWRC 2160 rope (EN 12385-4: 10² × 2160 × 0.356 / 1000 =
// 76.9 kN), D/d = 21, motor 5.5 kW at 1440 rpm through a 95:1 gear giving 5.0 m/min.
// Text and enum values are strings, numbers float64, dates "YYYY-MM-DD".
var example = map[string]any{
	"asset_id":                  "EX-001",
	"site":                      "Example site",
	"location":                  "Bay 2, column C4",
	"description":               "Example row (invented hoist): replace or delete",
	"duty_group":                "M5",
	"service":                   "normal",
	"rated_load":                5.0,
	"hook_block_mass":           60.0,
	"parts_of_line":             4.0,
	"rope_ends":                 2.0,
	"sheave_efficiency":         0.98,
	"deflection_sheaves":        0.0,
	"rope_diameter":             10.0,
	"rope_mbf":                  76.9,
	"rope_grade":                2160.0,
	"rope_construction":         "6x36 IWRC",
	"rope_reference_diameter":   10.3,
	"rope_measured_diameter":    10.1,
	"rope_broken_wires":         0.0,
	"rope_fitted":               "2023-06-01",
	"drum_diameter":             210.0,
	"rope_layers":               1.0,
	"drum_grooves":              44.0,
	"drum_grooved":              "yes",
	"lift_height":               12.0,
	"sheave_diameter":           250.0,
	"fleet_angle":               1.0,
	"drum_inertia":              1.5,
	"drum_mass":                 120.0,
	"gear_ratio":                95.0,
	"gear_efficiency":           0.94,
	"gear_backdrive_efficiency": 0.92,
	"gearbox_rated_torque":      8000.0,
	"motor_power":               5.5,
	"motor_speed":               1440.0,
	"motor_peak_torque":         200.0,
	"motor_inertia":             0.035,
	"brake_torque":              60.0,
	"brake_location":            "motor",
	"brakes":                    1.0,
	"brake_delay":               0.2,
	"control_braking":           "electrical",
	"hoist_speed":               5.0,
	"lowering_speed":            5.0,
	"acceleration":              0.2,
	"operating_hours":           2400.0,
	"load_spectrum":             "L2",
	"usage_records":             "meter and log",
	"commissioned":              "2019-04-01",
	"last_inspection":           "2026-06-15",
	"last_load_test":            "2019-04-01",
	"test_load":                 6.25,
	"test_type":                 "static",
	"component_wll":             6.3,
	"limiter_fitted":            "yes",
	"limiter_last_test":         "2026-06-15",
	"limiter_setting":           110.0,
	"upper_limit_fitted":        "yes",
	"lower_limit_fitted":        "yes",
	"limit_last_test":           "2026-06-15",
	"motor_duty_factor":         40.0,
	"motor_starts":              240.0,
	"brake_friction_work":       10.0,
	"special_service":           "none",
}

// column is one template column: the schema column and the unit in its header.
type column struct {
	schema.Column
	unit   string // header unit ("" none)
	header string // header text with unit
}

func columns(units string) ([]column, error) {
	var out []column
	for _, c := range schema.Columns() {
		u, err := HeaderUnit(c, units)
		if err != nil {
			return nil, err
		}
		out = append(out, column{Column: c, unit: u, header: c.HeaderWithUnit(u)})
	}
	return out, nil
}

// Headers is the template's header row for the unit system ("si" or "us").
func Headers(units string) ([]string, error) {
	cols, err := columns(units)
	if err != nil {
		return nil, err
	}
	out := make([]string, len(cols))
	for i, c := range cols {
		out[i] = c.header
	}
	return out, nil
}

// exampleValue is the example hoist's value for c: a string, a float64 in the header's
// unit (rounded to 5 significant digits when converted), a time.Time for a date, or nil.
func exampleValue(c column) (any, error) {
	v, ok := example[c.Key]
	if !ok {
		return nil, nil
	}
	switch x := v.(type) {
	case float64:
		if c.unit != c.Unit {
			return roundSig(convert(x, c.Quantity, c.Unit, c.unit), 5), nil
		}
		return x, nil
	case string:
		if c.Kind == schema.Date {
			d, err := time.Parse("2006-01-02", x)
			if err != nil {
				return nil, fmt.Errorf("example %s: %w", c.Key, err)
			}
			return d, nil
		}
		return x, nil
	}
	return nil, fmt.Errorf("example %s: unexpected %T", c.Key, v)
}

func formatValue(v any) string {
	switch x := v.(type) {
	case nil:
		return ""
	case float64:
		return strconv.FormatFloat(x, 'f', -1, 64)
	case time.Time:
		return x.Format("2006-01-02")
	case string:
		return x
	}
	return fmt.Sprint(v)
}

// WriteCSV writes the blank register as CSV (comma separated, UTF-8): the header row
// and the example row.
func WriteCSV(w io.Writer, units string) error {
	cols, err := columns(units)
	if err != nil {
		return err
	}
	cw := csv.NewWriter(w)
	head := make([]string, len(cols))
	row := make([]string, len(cols))
	for i, c := range cols {
		head[i] = c.header
		v, err := exampleValue(c)
		if err != nil {
			return err
		}
		row[i] = formatValue(v)
	}
	if err := cw.Write(head); err != nil {
		return fmt.Errorf("template CSV: %w", err)
	}
	if err := cw.Write(row); err != nil {
		return fmt.Errorf("template CSV: %w", err)
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return fmt.Errorf("template CSV: %w", err)
	}
	return nil
}

// Header fills (our own palette): what a missing value costs.
var needFill = map[schema.Need]string{
	schema.NeedID:       "F2C28B", // amber: the row is reported without it
	schema.NeedRequired: "F2C28B",
	schema.NeedChecks:   "B9D3E8", // pale blue: the checks using it are unchecked without it
	schema.NeedOptional: "DCE3D5", // sage: a default applies or nothing depends on it
}

// WriteXLSX writes the blank register as an XLSX workbook: sheet "Register" (header
// row with units, frozen, each header cell with an input message; one example row;
// data validation on rows 2 to DataRows+1) and sheet "Notes" (the caution and every
// column's header, meaning, default, accepted values and synonyms).
func WriteXLSX(w io.Writer, units string) error {
	cols, err := columns(units)
	if err != nil {
		return err
	}
	f := excelize.NewFile()
	defer f.Close()
	if err := f.SetSheetName("Sheet1", RegisterSheet); err != nil {
		return fmt.Errorf("template: %w", err)
	}
	if err := writeRegister(f, cols); err != nil {
		return fmt.Errorf("template: %s sheet: %w", RegisterSheet, err)
	}
	if _, err := f.NewSheet(NotesSheet); err != nil {
		return fmt.Errorf("template: %w", err)
	}
	if err := writeNotes(f, cols, units); err != nil {
		return fmt.Errorf("template: %s sheet: %w", NotesSheet, err)
	}
	f.SetActiveSheet(0)
	if err := f.Write(w); err != nil {
		return fmt.Errorf("template: writing workbook: %w", err)
	}
	return nil
}

func writeRegister(f *excelize.File, cols []column) error {
	const sh = RegisterSheet
	styles := map[schema.Need]int{}
	for need, fill := range needFill {
		id, err := f.NewStyle(&excelize.Style{
			Font:      &excelize.Font{Bold: true},
			Fill:      excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{fill}},
			Alignment: &excelize.Alignment{WrapText: true, Vertical: "top"},
			Border:    []excelize.Border{{Type: "bottom", Color: "5A5A5A", Style: 1}},
		})
		if err != nil {
			return err
		}
		styles[need] = id
	}
	dateFmt := "yyyy-mm-dd"
	dateStyle, err := f.NewStyle(&excelize.Style{CustomNumFmt: &dateFmt})
	if err != nil {
		return err
	}
	lastRow := DataRows + 1
	for i, c := range cols {
		col := i + 1
		name, err := excelize.ColumnNumberToName(col)
		if err != nil {
			return err
		}
		head, _ := excelize.CoordinatesToCellName(col, 1)
		if err := f.SetCellStr(sh, head, c.header); err != nil {
			return err
		}
		if err := f.SetCellStyle(sh, head, head, styles[c.Need]); err != nil {
			return err
		}
		width := float64(len([]rune(c.header)) + 3)
		width = min(max(width, 12), 34)
		if err := f.SetColWidth(sh, name, name, width); err != nil {
			return err
		}
		// Input message on the header cell.
		dv := excelize.NewDataValidation(true)
		dv.Sqref = head
		dv.SetInput(fitUTF16(c.header, maxPromptTitle), fitUTF16(prompt(c), maxPrompt))
		if err := f.AddDataValidation(sh, dv); err != nil {
			return err
		}
		// Validation of the data rows.
		rng := fmt.Sprintf("%s2:%s%d", name, name, lastRow)
		if dv, err := dataValidation(c, rng); err != nil {
			return fmt.Errorf("column %s: %w", c.Key, err)
		} else if dv != nil {
			if err := f.AddDataValidation(sh, dv); err != nil {
				return err
			}
		}
		if c.Kind == schema.Date {
			if err := f.SetColStyle(sh, name, dateStyle); err != nil {
				return err
			}
		}
		// The example row.
		v, err := exampleValue(c)
		if err != nil {
			return err
		}
		if v != nil {
			cell, _ := excelize.CoordinatesToCellName(col, 2)
			if err := f.SetCellValue(sh, cell, v); err != nil {
				return err
			}
			if c.Kind == schema.Date {
				if err := f.SetCellStyle(sh, cell, cell, dateStyle); err != nil {
					return err
				}
			}
		}
	}
	if err := f.SetRowHeight(sh, 1, 45); err != nil {
		return err
	}
	return f.SetPanes(sh, &excelize.Panes{Freeze: true, YSplit: 1, TopLeftCell: "A2", ActivePane: "bottomLeft",
		Selection: []excelize.Selection{{SQRef: "A2", ActiveCell: "A2", Pane: "bottomLeft"}}})
}

// prompt is a header cell's input message: meaning, default, unit.
func prompt(c column) string {
	var b strings.Builder
	b.WriteString(c.Description)
	if d := schema.DefaultText(c.Column); d == "—" {
		b.WriteString(" Default: none (optional).")
	} else {
		b.WriteString(" Default: ")
		b.WriteString(d)
		b.WriteString(".")
	}
	if c.unit != "" && c.unit != "1" {
		fmt.Fprintf(&b, " Unit [%s]; another unit of the same quantity may be written in the brackets.", c.unit)
	}
	if r := rangeText(c); r != "" {
		b.WriteString(" ")
		b.WriteString(r)
	}
	return b.String()
}

// bounds is the column's valid range in the header's unit.
func bounds(c column) (lo, hi float64, hasLo, hasHi bool) {
	lo, hi = c.Min, c.Max
	if c.unit != c.Unit {
		lo, hi = convert(lo, c.Quantity, c.Unit, c.unit), convert(hi, c.Quantity, c.Unit, c.unit)
	}
	return lo, hi, c.HasMin, c.HasMax
}

func num(v float64) string { return strconv.FormatFloat(roundSig(v, 6), 'f', -1, 64) }

// rangeText says the accepted values or range in words.
func rangeText(c column) string {
	if len(c.Values) > 0 {
		return "Values: " + strings.Join(c.Values, ", ") + "."
	}
	if c.Kind != schema.Number && c.Kind != schema.Integer {
		return ""
	}
	lo, hi, hasLo, hasHi := bounds(c)
	u := ""
	if c.unit != "" && c.unit != "1" {
		u = " " + c.unit
	}
	kind := "A number"
	if c.Kind == schema.Integer {
		kind = "A whole number"
	}
	switch {
	case hasLo && hasHi:
		return fmt.Sprintf("%s from %s to %s%s.", kind, num(lo), num(hi), u)
	case hasLo:
		return fmt.Sprintf("%s, at least %s%s.", kind, num(lo), u)
	case hasHi:
		return fmt.Sprintf("%s, at most %s%s.", kind, num(hi), u)
	}
	return kind + "."
}

// dataValidation is the validation of a column's data rows: a list for enum and bool
// columns, a range for numbers; nil for text and dates. A value outside is warned
// about, not refused: the register reader is the judge (it accepts synonyms and other
// units), and the warning says why.
func dataValidation(c column, sqref string) (*excelize.DataValidation, error) {
	dv := excelize.NewDataValidation(true)
	dv.Sqref = sqref
	switch c.Kind {
	case schema.Enum, schema.Bool:
		if len(c.Values) == 0 {
			return nil, nil
		}
		if err := dv.SetDropList(c.Values); err != nil {
			return nil, err
		}
	case schema.Number, schema.Integer:
		lo, hi, hasLo, hasHi := bounds(c)
		t := excelize.DataValidationTypeDecimal
		if c.Kind == schema.Integer {
			t = excelize.DataValidationTypeWhole
		}
		var (
			f1, f2 string
			op     excelize.DataValidationOperator
		)
		switch {
		case hasLo && hasHi:
			f1, f2, op = num(lo), num(hi), excelize.DataValidationOperatorBetween
		case hasLo:
			f1, op = num(lo), excelize.DataValidationOperatorGreaterThanOrEqual
		case hasHi:
			f1, op = num(hi), excelize.DataValidationOperatorLessThanOrEqual
		default:
			return nil, nil
		}
		if err := dv.SetRange(f1, f2, t, op); err != nil {
			return nil, err
		}
	default:
		return nil, nil
	}
	dv.SetError(excelize.DataValidationErrorStyleWarning, fitUTF16(c.Header, maxPromptTitle),
		fitUTF16(rangeText(c)+" hoistfleet reports a value it cannot use, with its cell.", maxPrompt))
	return dv, nil
}

// fitUTF16 shortens s to at most n UTF-16 code units (Excel counts in those), ending
// with "…" when cut.
func fitUTF16(s string, n int) string {
	if len(utf16.Encode([]rune(s))) <= n {
		return s
	}
	rs := []rune(s)
	for len(rs) > 0 && len(utf16.Encode(rs))+1 > n {
		rs = rs[:len(rs)-1]
	}
	return strings.TrimRight(string(rs), " ") + "…"
}

func writeNotes(f *excelize.File, cols []column, units string) error {
	const sh = NotesSheet
	bold, err := f.NewStyle(&excelize.Style{Font: &excelize.Font{Bold: true, Size: 13}})
	if err != nil {
		return err
	}
	caution, err := f.NewStyle(&excelize.Style{
		Font:      &excelize.Font{Bold: true, Color: "7A1F1F"},
		Fill:      excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{"FBE9E7"}},
		Alignment: &excelize.Alignment{WrapText: true, Vertical: "top"},
	})
	if err != nil {
		return err
	}
	wrap, err := f.NewStyle(&excelize.Style{Alignment: &excelize.Alignment{WrapText: true, Vertical: "top"}})
	if err != nil {
		return err
	}
	headStyle, err := f.NewStyle(&excelize.Style{Font: &excelize.Font{Bold: true},
		Fill: excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{"DCE3D5"}}})
	if err != nil {
		return err
	}
	system := "SI units"
	if units == US {
		system = "US customary units"
	}
	set := func(cell string, v any, style int) error {
		if err := f.SetCellValue(sh, cell, v); err != nil {
			return err
		}
		if style != 0 {
			return f.SetCellStyle(sh, cell, cell, style)
		}
		return nil
	}
	lines := []struct {
		cell  string
		text  string
		style int
	}{
		{"A1", "hoistfleet register template (" + system + ")", bold},
		{"A2", fleet.Caution, caution},
		{"A4", "One hoist per row on the Register sheet; keep the header row. Units are in the headers' brackets: any unit of the same quantity may be written instead (kg, t, lb; N, kN, lbf; mm, m, in, ft; kW, hp; N m, lbf ft; kg m2, lb ft2; m/min, ft/min; m/s2, ft/s2). Dates as dates or ISO 8601 text (2026-03-31). Columns the schema does not know are kept and passed through. Row 2 is an invented example: replace or delete it.", wrap},
		{"A5", "Header colours: amber = required; blue = the checks that use it are unchecked without it; green = optional (a default applies, or nothing depends on it).", wrap},
	}
	for _, l := range lines {
		if err := set(l.cell, l.text, l.style); err != nil {
			return err
		}
	}
	for _, r := range []int{2, 4, 5} {
		if err := f.MergeCell(sh, fmt.Sprintf("A%d", r), fmt.Sprintf("F%d", r)); err != nil {
			return err
		}
	}
	if err := f.SetRowHeight(sh, 2, 62); err != nil {
		return err
	}
	if err := f.SetRowHeight(sh, 4, 62); err != nil {
		return err
	}
	if err := f.SetRowHeight(sh, 5, 30); err != nil {
		return err
	}
	const first = 7
	head := []any{"Header", "Meaning", "Default", "Needed", "Accepted values", "Also accepted as header"}
	if err := f.SetSheetRow(sh, fmt.Sprintf("A%d", first), &head); err != nil {
		return err
	}
	if err := f.SetCellStyle(sh, fmt.Sprintf("A%d", first), fmt.Sprintf("F%d", first), headStyle); err != nil {
		return err
	}
	need := map[schema.Need]string{
		schema.NeedID:       "required",
		schema.NeedRequired: "required",
		schema.NeedChecks:   "for the checks that use it",
		schema.NeedOptional: "optional",
	}
	for i, c := range cols {
		row := []any{c.header, c.Description, schema.DefaultText(c.Column), need[c.Need], rangeText(c), strings.Join(c.Synonyms, ", ")}
		cell := fmt.Sprintf("A%d", first+1+i)
		if err := f.SetSheetRow(sh, cell, &row); err != nil {
			return err
		}
	}
	last := first + len(cols)
	if err := f.SetCellStyle(sh, fmt.Sprintf("A%d", first+1), fmt.Sprintf("F%d", last), wrap); err != nil {
		return err
	}
	for col, w := range map[string]float64{"A": 28, "B": 60, "C": 30, "D": 16, "E": 30, "F": 50} {
		if err := f.SetColWidth(sh, col, col, w); err != nil {
			return err
		}
	}
	return f.SetPanes(sh, &excelize.Panes{Freeze: true, YSplit: first, TopLeftCell: fmt.Sprintf("A%d", first+1), ActivePane: "bottomLeft"})
}
