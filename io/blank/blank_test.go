package blank

import (
	"bytes"
	"encoding/csv"
	"math"
	"strconv"
	"strings"
	"testing"
	"unicode/utf16"

	"github.com/xuri/excelize/v2"

	"hoistfleet/calc/approx"
	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
)

// convert takes the factors from io/units (tested there against NIST SP 811); here: the
// direction of the conversion, the column's quantity, and units passed through.
func TestConvert(t *testing.T) {
	tests := []struct {
		v                  float64
		quantity, from, to string
		want               float64
	}{
		{1, "mass", "t", "lb", 1000 / 0.45359237},              // NIST SP 811: lb = 0.45359237 kg exactly
		{1, "mass", "lb", "kg", 0.45359237},                    // the other way
		{100, "speed", "ft/min", "m/min", 30.48},               // NIST SP 811: ft = 0.3048 m exactly
		{1, "force", "lb", "N", 4.4482216152605},               // lb in a force column is lbf (design.md)
		{7, "rotational_speed", "rpm", "rpm", 7},               // the same unit
		{7, "rotational_speed", "rpm", "furlong/fortnight", 7}, // not a unit: passed through
	}
	for _, tt := range tests {
		if got := convert(tt.v, tt.quantity, tt.from, tt.to); !approx.Equal(got, tt.want, 0, 1e-12) {
			t.Errorf("convert(%v %s → %s) = %v, want %v", tt.v, tt.from, tt.to, got, tt.want)
		}
	}
	if got := roundSig(11023.113, 5); got != 11023 {
		t.Errorf("roundSig = %v", got)
	}
}

func TestHeadersUS(t *testing.T) {
	si, err := Headers(SI)
	if err != nil {
		t.Fatal(err)
	}
	us, err := Headers(US)
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]string{
		"rated_load":      "Rated load [lb]",
		"hook_block_mass": "Hook block mass [lb]",
		"rope_diameter":   "Rope diameter [in]",
		"rope_mbf":        "Rope MBF [lbf]",
		"drum_diameter":   "Drum diameter [in]",
		"lift_height":     "Lift height [ft]",
		"drum_inertia":    "Drum inertia [lb ft2]",
		"motor_power":     "Motor power [hp]",
		"motor_speed":     "Motor speed [rpm]",
		"brake_torque":    "Brake torque [lbf ft]",
		"hoist_speed":     "Hoist speed [ft/min]",
		"acceleration":    "Acceleration [ft/s2]",
		"fleet_angle":     "Fleet angle [deg]",
		"brake_delay":     "Brake delay [s]",
		"rope_grade":      "Rope grade [N/mm2]",
		"gear_ratio":      "Gear ratio",
	}
	wantSI := map[string]string{"rated_load": "Rated load [t]", "rope_diameter": "Rope diameter [mm]", "motor_power": "Motor power [kW]"}
	for i, c := range schema.Columns() {
		if w, ok := want[c.Key]; ok && us[i] != w {
			t.Errorf("US header %s = %q, want %q", c.Key, us[i], w)
		}
		if w, ok := wantSI[c.Key]; ok && si[i] != w {
			t.Errorf("SI header %s = %q, want %q", c.Key, si[i], w)
		}
	}
	if _, err := Headers("imperial"); err == nil {
		t.Error("Headers(imperial): no error")
	}
}

// The example hoist must be a realistic, passing M5 hoist by the published figures
// (standards.md), not by our own code.
func TestExampleIsRealistic(t *testing.T) {
	for k := range example {
		if _, ok := schema.ColumnByKey(k); !ok {
			t.Errorf("example has %q, which is not a schema column", k)
		}
	}
	f := func(k string) float64 { return example[k].(float64) }
	const g = 9.80665 // NIST SP 811 g_n
	d, grade := f("rope_diameter"), f("rope_grade")
	// EN 12385-4: F_min = d² R_r K / 1000 kN, K = 0.356 for 6×36 IWRC (standards.md, seen).
	if mbf := d * d * grade * 0.356 / 1000; !approx.Equal(f("rope_mbf"), mbf, 0.05, 0) {
		t.Errorf("example MBF %v kN, EN 12385-4 gives %v kN", f("rope_mbf"), mbf)
	}
	m := f("rated_load")*1000 + f("hook_block_mass")
	n, e, eta := f("parts_of_line"), f("rope_ends"), f("sheave_efficiency")
	ne := n / e
	etaR := (1 - math.Pow(eta, ne)) / (ne * (1 - eta)) // standards.md reeving efficiency, memory high
	F := m * g / (n * etaR)
	// ISO 4308-1 Zp M5 = 4.5 (standards.md, seen); keep it out of the 10 % marginal band.
	if z := f("rope_mbf") * 1000 / F; z*0.9 < 4.5 {
		t.Errorf("example ISO design factor %.2f, want ≥ 4.5/0.9", z)
	}
	// 29 CFR 1910.179(h)(2): static W/n ≤ 20 % of breaking strength (standards.md, law).
	if z := f("rope_mbf") * 1000 / (m * g / n); z*0.9 < 5 {
		t.Errorf("example US design factor %.2f, want ≥ 5/0.9", z)
	}
	// ISO 4308-1 h1 M5 = 18, h2 M5 = 20 (standards.md, memory medium).
	if r := f("drum_diameter") / d; r*0.9 < 18 {
		t.Errorf("example drum D/d %.1f", r)
	}
	if r := f("sheave_diameter") / d; r*0.9 < 20 {
		t.Errorf("example sheave D/d %.1f", r)
	}
	// Hook speed from motor speed: v = ω r / (i n_e) (design.md hoist-speed), within 10 %.
	omega := 2 * math.Pi * f("motor_speed") / 60
	v := omega * f("drum_diameter") / 2000 / (f("gear_ratio") * ne) * 60
	if !approx.Equal(v, f("hoist_speed"), 0, 0.02) {
		t.Errorf("example hook speed from the drive %.3f m/min, declared %v", v, f("hoist_speed"))
	}
	// Steady hoisting power m g v / η (textbook identity) well under the rating.
	if p := m * g * f("hoist_speed") / 60 / (etaR * f("gear_efficiency")); p > 0.9*f("motor_power")*1000 {
		t.Errorf("example needs %.0f W of a %v kW motor", p, f("motor_power"))
	}
	// Rope length per end plus 2 dead wraps (29 CFR 1910.179(h)(2)) fits the grooves.
	turns := f("lift_height")*ne/(math.Pi*f("drum_diameter")/1000) + 2
	if turns > f("drum_grooves") {
		t.Errorf("example needs %.1f turns, has %v grooves", turns, f("drum_grooves"))
	}
	// Fleet angle inside the Wire Rope Users Manual window 0.5–2 deg (standards.md, seen).
	if a := f("fleet_angle"); a < 0.5 || a > 2 {
		t.Errorf("example fleet angle %v", a)
	}
}

func readBack(t *testing.T, units string) *excelize.File {
	t.Helper()
	var buf bytes.Buffer
	if err := WriteXLSX(&buf, units); err != nil {
		t.Fatal(err)
	}
	f, err := excelize.OpenReader(&buf)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { f.Close() })
	return f
}

func TestWriteXLSX(t *testing.T) {
	for _, units := range []string{SI, US} {
		t.Run(units, func(t *testing.T) {
			f := readBack(t, units)
			if got := f.GetSheetList(); len(got) != 2 || got[0] != RegisterSheet || got[1] != NotesSheet {
				t.Fatalf("sheets %v", got)
			}
			heads, _ := Headers(units)
			cols := schema.Columns()
			dvs, err := f.GetDataValidations(RegisterSheet)
			if err != nil {
				t.Fatal(err)
			}
			bySqref := map[string]*excelize.DataValidation{}
			for _, dv := range dvs {
				bySqref[dv.Sqref] = dv
			}
			for i, c := range cols {
				name, _ := excelize.ColumnNumberToName(i + 1)
				got, _ := f.GetCellValue(RegisterSheet, name+"1")
				if got != heads[i] {
					t.Errorf("%s1 = %q, want %q", name, got, heads[i])
				}
				dv := bySqref[name+"1"]
				if dv == nil || dv.Prompt == nil || dv.PromptTitle == nil || !dv.ShowInputMessage {
					t.Errorf("%s1 (%s): no input message", name, c.Key)
					continue
				}
				if n := len(utf16.Encode([]rune(*dv.Prompt))); n > maxPrompt || n == 0 {
					t.Errorf("%s1: prompt of %d UTF-16 units", name, n)
				}
				if n := len(utf16.Encode([]rune(*dv.PromptTitle))); n > maxPromptTitle {
					t.Errorf("%s1: prompt title of %d UTF-16 units", name, n)
				}
				if !strings.Contains(*dv.Prompt, "Default: ") {
					t.Errorf("%s1: prompt %q names no default", name, *dv.Prompt)
				}
				data := bySqref[name+"2:"+name+strconv.Itoa(DataRows+1)]
				switch c.Kind {
				case schema.Enum, schema.Bool:
					if data == nil || data.Type != "list" {
						t.Errorf("%s (%s): no list validation on the data rows", name, c.Key)
						continue
					}
					for _, v := range c.Values {
						if !strings.Contains(data.Formula1, v) {
							t.Errorf("%s: list %q lacks %q", c.Key, data.Formula1, v)
						}
					}
				case schema.Number, schema.Integer:
					if (c.HasMin || c.HasMax) && data == nil {
						t.Errorf("%s (%s): no range validation", name, c.Key)
					}
				default:
					if data != nil {
						t.Errorf("%s (%s): unexpected validation %+v", name, c.Key, data)
					}
				}
			}
			panes, err := f.GetPanes(RegisterSheet)
			if err != nil || !panes.Freeze || panes.YSplit != 1 {
				t.Errorf("header not frozen: %+v %v", panes, err)
			}
			if id, _ := f.GetCellValue(RegisterSheet, "A2"); id != "EX-001" {
				t.Errorf("example asset id %q", id)
			}
		})
	}
}

// Range validations carry the schema's bounds converted to the header's unit.
func TestRangeValidationsConverted(t *testing.T) {
	find := func(f *excelize.File, key string) *excelize.DataValidation {
		for i, c := range schema.Columns() {
			if c.Key != key {
				continue
			}
			name, _ := excelize.ColumnNumberToName(i + 1)
			dvs, _ := f.GetDataValidations(RegisterSheet)
			for _, dv := range dvs {
				if dv.Sqref == name+"2:"+name+strconv.Itoa(DataRows+1) {
					return dv
				}
			}
		}
		return nil
	}
	parse := func(s string) float64 {
		v, err := strconv.ParseFloat(s, 64)
		if err != nil {
			t.Fatalf("formula %q: %v", s, err)
		}
		return v
	}
	si, us := readBack(t, SI), readBack(t, US)
	tests := []struct {
		f            *excelize.File
		key          string
		op           string
		lo, hi, relT float64
	}{
		// Schema: lift height 0–1000 m; 1000 m = 3280.84 ft (ft = 0.3048 m, NIST SP 811).
		{si, "lift_height", "between", 0, 1000, 0},
		{us, "lift_height", "between", 0, 1000 / 0.3048, 1e-5},
		// Schema: rope diameter 1–120 mm; in = 25.4 mm (NIST SP 811).
		{us, "rope_diameter", "between", 1 / 25.4, 120 / 25.4, 1e-5},
		// Schema: hoist speed 0–1000 m/min → ft/min.
		{us, "hoist_speed", "between", 0, 1000 / 0.3048, 1e-5},
		{si, "rated_load", "greaterThanOrEqual", 0, math.NaN(), 0},
		{si, "parts_of_line", "between", 1, 24, 0},
	}
	for _, tt := range tests {
		dv := find(tt.f, tt.key)
		if dv == nil {
			t.Errorf("%s: no validation", tt.key)
			continue
		}
		if dv.Operator != tt.op {
			t.Errorf("%s: operator %q, want %q", tt.key, dv.Operator, tt.op)
		}
		if !approx.Equal(parse(dv.Formula1), tt.lo, 1e-12, tt.relT) {
			t.Errorf("%s: lower %s, want %v", tt.key, dv.Formula1, tt.lo)
		}
		if !math.IsNaN(tt.hi) && !approx.Equal(parse(dv.Formula2), tt.hi, 1e-12, tt.relT) {
			t.Errorf("%s: upper %s, want %v", tt.key, dv.Formula2, tt.hi)
		}
	}
	if dv := find(si, "parts_of_line"); dv == nil || dv.Type != "whole" {
		t.Errorf("parts of line: %+v", dv)
	}
}

func TestNotesSheet(t *testing.T) {
	f := readBack(t, US)
	rows, err := f.GetRows(NotesSheet)
	if err != nil {
		t.Fatal(err)
	}
	all := ""
	for _, r := range rows {
		all += strings.Join(r, "\t") + "\n"
	}
	if !strings.Contains(all, fleet.Caution) {
		t.Error("Notes sheet lacks the caution")
	}
	heads, _ := Headers(US)
	for i, c := range schema.Columns() {
		found := false
		for _, r := range rows {
			if len(r) >= 3 && r[0] == heads[i] && r[1] == c.Description && r[2] == schema.DefaultText(c) {
				found = true
				break
			}
		}
		if !found {
			t.Errorf("Notes sheet has no row for %s", heads[i])
		}
	}
}

func TestWriteCSV(t *testing.T) {
	var buf bytes.Buffer
	if err := WriteCSV(&buf, US); err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(&buf).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	heads, _ := Headers(US)
	if len(recs) != 2 || strings.Join(recs[0], "|") != strings.Join(heads, "|") {
		t.Fatalf("records %q", recs)
	}
	for i, c := range schema.Columns() {
		v := recs[1][i]
		switch c.Key {
		case "rated_load": // 5 t = 11 023.1 lb (lb = 0.45359237 kg, NIST SP 811)
			x, _ := strconv.ParseFloat(v, 64)
			if !approx.Equal(x, 5000/0.45359237, 0, 1e-4) {
				t.Errorf("rated load %q lb", v)
			}
		case "rope_mbf": // 76.9 kN = 17 288 lbf (lbf = 4.4482216152605 N, NIST SP 811)
			x, _ := strconv.ParseFloat(v, 64)
			if !approx.Equal(x, 76900/4.4482216152605, 0, 1e-4) {
				t.Errorf("MBF %q lbf", v)
			}
		case "commissioned":
			if v != "2019-04-01" {
				t.Errorf("date %q", v)
			}
		case "parts_of_line":
			if v != "4" {
				t.Errorf("parts of line %q", v)
			}
		}
	}
	if err := WriteCSV(&buf, "metric"); err == nil {
		t.Error("WriteCSV(metric): no error")
	}
}
