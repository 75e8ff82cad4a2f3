package main

import (
	"fmt"
	"math"
	"strconv"
	"time"

	"hoistfleet/fleet/schema"
	"hoistfleet/io/units"
)

// cell is one generated value: a number (in the SI unit io/units converts to,
// units.SI: kg, m, N, W, N m, kg m², m/s, m/s², s; rev/min, deg, N/mm² and a ratio as
// they are; converted to the header's unit at write time), a text, or empty.
type cell struct {
	num   float64
	isNum bool
	text  string
}

func num(x float64) cell { return cell{num: x, isNum: true} }
func txt(s string) cell  { return cell{text: s} }
func date(t time.Time) cell {
	if t.IsZero() {
		return cell{}
	}
	return cell{text: t.Format("2006-01-02")}
}

// field is one generated column: a schema column (Key set) or a pass-through one.
type field struct {
	Key    string  // schema key, "" for a pass-through column
	Header string  // header text as written, with its unit
	Unit   string  // unit written in the header ("" for none)
	factor float64 // SI value of one Unit (units.Factor)
	get    func(h *hoist) cell
}

// extractors maps the schema keys the generator fills to their values.
var extractors = map[string]func(h *hoist) cell{
	"asset_id":           func(h *hoist) cell { return txt(h.ID) },
	"site":               func(h *hoist) cell { return txt(h.Site) },
	"location":           func(h *hoist) cell { return txt(h.Location) },
	"description":        func(h *hoist) cell { return txt(h.Description) },
	"duty_group":         func(h *hoist) cell { return txt(fmt.Sprintf("M%d", h.Group)) },
	"service":            func(h *hoist) cell { return txt(h.Service) },
	"rated_load":         func(h *hoist) cell { return num(h.RatedLoadKg) },
	"hook_block_mass":    func(h *hoist) cell { return num(h.HookBlockKg) },
	"parts_of_line":      func(h *hoist) cell { return num(float64(h.Parts)) },
	"rope_ends":          func(h *hoist) cell { return num(float64(h.Ends)) },
	"sheave_efficiency":  func(h *hoist) cell { return num(h.SheaveEff) },
	"deflection_sheaves": func(h *hoist) cell { return num(0) },
	"rope_diameter":      func(h *hoist) cell { return num(h.RopeDiaM) },
	"rope_mbf":           func(h *hoist) cell { return num(h.RopeMBFN) },
	"rope_grade":         func(h *hoist) cell { return num(h.GradeNmm2) },
	"rope_construction":  func(h *hoist) cell { return txt(h.Construction) },
	"rope_measured_diameter": func(h *hoist) cell {
		return num(h.MeasuredDiaM)
	},
	"rope_broken_wires": func(h *hoist) cell { return num(float64(h.BrokenWires)) },
	"rope_fitted":       func(h *hoist) cell { return date(h.RopeFitted) },
	"drum_diameter":     func(h *hoist) cell { return num(h.DrumDiaM) },
	"rope_layers":       func(h *hoist) cell { return num(float64(h.Layers)) },
	"drum_grooves":      func(h *hoist) cell { return num(float64(h.Grooves)) },
	"drum_grooved": func(h *hoist) cell {
		if h.Grooved {
			return txt("yes")
		}
		return txt("no")
	},
	"lift_height": func(h *hoist) cell { return num(h.LiftM) },
	"sheave_diameter": func(h *hoist) cell {
		if h.SheaveDiaM == 0 {
			return cell{}
		}
		return num(h.SheaveDiaM)
	},
	"fleet_angle":     func(h *hoist) cell { return num(h.FleetDeg) },
	"drum_inertia":    func(h *hoist) cell { return num(h.DrumInertia) },
	"drum_mass":       func(h *hoist) cell { return num(h.DrumMassKg) },
	"gear_ratio":      func(h *hoist) cell { return num(h.GearRatio) },
	"gear_efficiency": func(h *hoist) cell { return num(h.GearEff) },
	"gear_backdrive_efficiency": func(h *hoist) cell {
		if math.IsNaN(h.GearBackEff) {
			return cell{}
		}
		return num(h.GearBackEff)
	},
	"gearbox_rated_torque": func(h *hoist) cell { return num(h.GearboxNm) },
	"motor_power":          func(h *hoist) cell { return num(h.MotorW) },
	"motor_speed":          func(h *hoist) cell { return num(h.MotorRPM) },
	"motor_peak_torque":    func(h *hoist) cell { return num(h.PeakRatio) },
	"motor_inertia":        func(h *hoist) cell { return num(h.MotorInertia) },
	"brake_torque":         func(h *hoist) cell { return num(h.BrakeNm) },
	"brake_location":       func(h *hoist) cell { return txt("motor") },
	"brakes":               func(h *hoist) cell { return num(float64(h.Brakes)) },
	"brake_delay":          func(h *hoist) cell { return num(h.BrakeDelayS) },
	"control_braking":      func(h *hoist) cell { return txt(h.ControlBrake) },
	"hoist_speed":          func(h *hoist) cell { return num(h.HoistSpeedMS) },
	"acceleration":         func(h *hoist) cell { return num(h.AccelMS2) },
	"operating_hours":      func(h *hoist) cell { return num(h.Hours * units.Hour) },
	"load_spectrum":        func(h *hoist) cell { return txt(h.Spectrum) },
	"usage_records":        func(h *hoist) cell { return txt(h.Records) },
	"commissioned":         func(h *hoist) cell { return date(h.Commissioned) },
	"last_inspection":      func(h *hoist) cell { return date(h.LastInspected) },
	"last_load_test":       func(h *hoist) cell { return date(h.LastTest) },
	"test_load":            func(h *hoist) cell { return num(h.TestLoadKg) },
	"test_type":            func(h *hoist) cell { return txt(h.TestType) },
	"component_wll":        func(h *hoist) cell { return num(h.ComponentWLL) },
	"special_service":      func(h *hoist) cell { return txt("none") },
	// A limiter on every hoist, tested at its periodic inspection (no random draw, so
	// the other columns of a seed stay as they were).
	"limiter_fitted":    func(h *hoist) cell { return txt("yes") },
	"limiter_last_test": func(h *hoist) cell { return date(h.LastInspected) },
	// An upper limit device on every hoist, tested with the limiter; a motor rated for its
	// group's FEM 9.683 duty as the rule tables recall it (invented data; no random draw).
	"upper_limit_fitted": func(h *hoist) cell { return txt("yes") },
	"limit_last_test":    func(h *hoist) cell { return date(h.LastInspected) },
	"motor_duty_factor":  func(h *hoist) cell { return num(genDutyFactor[h.Group-1]) },
	"motor_starts":       func(h *hoist) cell { return num(genStarts[h.Group-1]) },
	"proposed_rated_load": func(h *hoist) cell {
		if h.ProposedKg == 0 {
			return cell{}
		}
		return num(h.ProposedKg)
	},
}

// genDutyFactor and genStarts are a motor's cyclic duration factor (fraction) and rated
// starts an hour by mechanism group M1…M8 (the values of the rule tables' FEM 9.683 rows).
var (
	genDutyFactor = [8]float64{0.15, 0.20, 0.25, 0.30, 0.40, 0.50, 0.60, 0.60}
	genStarts     = [8]float64{90, 120, 150, 180, 240, 300, 360, 360}
)

// passThrough are the generated columns the schema does not know.
var passThrough = []field{
	{Header: "Maintenance contractor", get: func(h *hoist) cell { return txt(h.Contractor) }},
	{Header: "Generator note", get: func(h *hoist) cell { return txt(string(h.Fault)) }},
}

// fields returns the generated columns in schema order followed by the pass-through
// columns, with headers for the unit system ("si" or "us").
func fields(system string) ([]field, error) {
	if system != "si" && system != "us" {
		return nil, fmt.Errorf("units %q: want si or us", system)
	}
	var out []field
	seen := map[string]bool{}
	for _, c := range schema.Columns() {
		get, ok := extractors[c.Key]
		if !ok {
			continue
		}
		seen[c.Key] = true
		unit, factor := "", 0.0
		if c.Quantity != "" {
			unit = c.Unit
			if u, ok := units.USCustomary(c.Quantity, unit); ok && system == "us" {
				unit = u
			}
			f, err := units.Factor(c.Quantity, unit)
			if err != nil {
				return nil, fmt.Errorf("column %s: unit %q has no conversion: %w", c.Key, unit, err)
			}
			factor = f
		}
		out = append(out, field{Key: c.Key, Header: c.HeaderWithUnit(unit), Unit: unit, factor: factor, get: get})
	}
	for k := range extractors {
		if !seen[k] {
			return nil, fmt.Errorf("column %s is not in the register schema", k)
		}
	}
	return append(out, passThrough...), nil
}

// value is the cell as written in the column's unit: numbers converted from SI and
// rounded to 6 significant digits (the SI designs are rounded coarser than that, so SI
// values come out exact).
func (f field) value(h *hoist) cell {
	c := f.get(h)
	if !c.isNum {
		return c
	}
	if f.Unit != "" {
		c.num /= f.factor
	}
	c.num = sig(c.num, 6)
	return c
}

// formatNum writes a number the way the CSV register holds it: plain decimal, no exponent.
func formatNum(x float64) string { return strconv.FormatFloat(x, 'f', -1, 64) }
