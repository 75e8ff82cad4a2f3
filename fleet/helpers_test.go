package fleet

import (
	"math"
	"strconv"
	"strings"
	"testing"
	"time"

	"hoistfleet/fleet/rules"
	"hoistfleet/fleet/schema"
)

// approxEqual reports whether got is within absTol or relTol × max(|got|, |want|) of want
// (the rule of gonum's scalar.EqualWithinAbsOrRel). Two NaNs are equal.
func approxEqual(got, want, absTol, relTol float64) bool {
	if math.IsNaN(got) || math.IsNaN(want) {
		return math.IsNaN(got) && math.IsNaN(want)
	}
	d := math.Abs(got - want)
	return d <= absTol || d <= relTol*math.Max(math.Abs(got), math.Abs(want))
}

// g is the standard acceleration of gravity, 9.80665 m/s² exactly (NIST SP 811,
// appendix B; standards.md "Units", law/exact). NewChecker uses it when Options.G is 0.
const g = 9.80665

// testSheet is the sheet name the hand-built assets pretend to come from.
const testSheet = "Register"

// asOf is the run date of every hand-built evaluation.
var asOf = time.Date(2026, 6, 1, 0, 0, 0, 0, time.UTC)

// colOf returns the 1-based column of a schema key in a register laid out in schema
// order, so that every hand-built Value has a realistic cell reference.
func colOf(t testing.TB, key string) int {
	t.Helper()
	for i, c := range schema.Columns() {
		if c.Key == key {
			return i + 1
		}
	}
	t.Fatalf("schema has no column %q", key)
	return 0
}

// assetBuilder builds an Asset by hand, one SI value per schema key, the way io/register
// would after conversion (design.md "The register": everything SI float64 internally).
type assetBuilder struct {
	t testing.TB
	a *Asset
}

func newAsset(t testing.TB, row int, id string) *assetBuilder {
	a := &Asset{Row: row, ID: id, Fields: map[string]Value{}}
	b := &assetBuilder{t: t, a: a}
	return b.text("asset_id", id)
}

func (b *assetBuilder) cell(key string) CellRef {
	return CellRef{Sheet: testSheet, Row: b.a.Row, Col: colOf(b.t, key)}
}

func (b *assetBuilder) num(key string, si float64) *assetBuilder {
	b.a.Fields[key] = Value{State: OK, Num: si, Raw: "", Cell: b.cell(key)}
	return b
}

// raw sets a number with the text it was written as in the register.
func (b *assetBuilder) raw(key string, si float64, raw string) *assetBuilder {
	b.a.Fields[key] = Value{State: OK, Num: si, Raw: raw, Cell: b.cell(key)}
	return b
}

func (b *assetBuilder) text(key, s string) *assetBuilder {
	b.a.Fields[key] = Value{State: OK, Text: s, Raw: s, Cell: b.cell(key)}
	return b
}

func (b *assetBuilder) date(key string, d time.Time) *assetBuilder {
	b.a.Fields[key] = Value{State: OK, Date: d, Raw: d.Format("2006-01-02"), Cell: b.cell(key)}
	return b
}

// bad makes the cell unreadable, as the register reader reports it.
func (b *assetBuilder) bad(key, raw, why string) *assetBuilder {
	c := b.cell(key)
	b.a.Fields[key] = Value{State: Bad, Raw: raw, Cell: c,
		Err: &Error{Kind: Invalid, Cell: c, Asset: b.a.ID, Field: key, Err: errString(why)}}
	return b
}

func (b *assetBuilder) drop(key string) *assetBuilder {
	delete(b.a.Fields, key)
	return b
}

func (b *assetBuilder) asset() *Asset { return b.a }

type errString string

func (e errString) Error() string { return string(e) }

// Unit factors, NIST SP 811 (standards.md "Units", exact): t → kg, kN → N, mm → m,
// kW → W, m/min → m/s.
const (
	tonne = 1000.0
	kN    = 1000.0
	mm    = 0.001
	kW    = 1000.0
	mMin  = 1.0 / 60
	hour  = 3600.0
)

// winchA is a realistic single-layer workshop hoist: 5 t, M5, four parts of line on a
// twin-grooved drum (n_e = 2), 14 mm 6x36 IWRC 1960 rope (EN 12385-4: 14² × 1960 × 0.356
// / 1000 = 136.8 kN, standards.md, computed), 300 mm drum, 7.5 kW 4-pole motor through a
// 113:1 gearbox, one 75 N m motor-shaft brake, 6 m/min. The gear efficiency, peak torque,
// brake delay and acceleration cells are empty so the rule defaults apply.
func winchA(t testing.TB) *assetBuilder {
	return newAsset(t, 7, "WA-07").
		text("site", "North Yard").
		text("duty_group", "M5").
		num("rated_load", 5*tonne).
		num("hook_block_mass", 120).
		num("parts_of_line", 4).
		num("rope_ends", 2).
		num("sheave_efficiency", 0.98).
		num("rope_diameter", 14*mm).
		num("rope_mbf", 136.8*kN).
		text("rope_construction", "6x36 IWRC").
		num("rope_measured_diameter", 13.9*mm).
		num("drum_diameter", 300*mm).
		num("rope_layers", 1).
		num("drum_grooves", 30).
		text("drum_grooved", "yes").
		num("lift_height", 10).
		num("sheave_diameter", 320*mm).
		num("fleet_angle", 1.0).
		num("drum_inertia", 2.0).
		num("drum_mass", 150).
		num("gear_ratio", 113).
		num("gearbox_rated_torque", 12000).
		num("motor_power", 7.5*kW).
		num("motor_speed", 1440).
		num("motor_inertia", 0.05).
		num("brake_torque", 75).
		text("brake_location", "motor").
		num("brakes", 1).
		num("hoist_speed", 6*mMin).
		num("operating_hours", 2000*hour).
		text("load_spectrum", "L2").
		text("usage_records", "meter and log").
		date("last_inspection", time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC)).
		num("test_load", 6.25*tonne).
		text("test_type", "static").
		text("limiter_fitted", "yes").
		date("limiter_last_test", time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC))
}

// winchB is a two-layer, single-fall hoist with a deflection sheave, a drum-mounted pair
// of brakes, a lowering speed above the hoisting speed and every efficiency given: it
// exercises the outer-layer radius r_L and the drum-brake branches.
func winchB(t testing.TB) *assetBuilder {
	return newAsset(t, 8, "WB-08").
		text("site", "South Yard").
		text("duty_group", "M4").
		num("rated_load", 2*tonne).
		num("hook_block_mass", 40).
		num("parts_of_line", 1).
		num("rope_ends", 1).
		num("sheave_efficiency", 0.97).
		num("deflection_sheaves", 1).
		num("rope_diameter", 12*mm).
		num("rope_mbf", 100.5*kN).
		num("drum_diameter", 250*mm).
		num("rope_layers", 2).
		num("drum_grooves", 40).
		num("lift_height", 20).
		num("sheave_diameter", 250*mm).
		num("fleet_angle", 1.5).
		num("drum_inertia", 1.2).
		num("drum_mass", 90).
		num("gear_ratio", 76).
		num("gear_efficiency", 0.95).
		num("gear_backdrive_efficiency", 0.9).
		num("gearbox_rated_torque", 7000).
		num("motor_power", 7.5*kW).
		num("motor_speed", 1450).
		num("motor_peak_torque", 2.0).
		num("motor_inertia", 0.03).
		num("brake_torque", 3000).
		text("brake_location", "drum").
		num("brakes", 2).
		num("brake_delay", 0.2).
		num("hoist_speed", 15*mMin).
		num("lowering_speed", 18*mMin).
		num("acceleration", 0.4)
}

// isoChecker returns a checker with the built-in ISO profile, band 0.10, as of asOf,
// with extra rule rows (CSV lines after the header) laid over it.
func isoChecker(t testing.TB, extraRules ...string) *Checker {
	t.Helper()
	tab, err := rules.Profile("iso")
	if err != nil {
		t.Fatal(err)
	}
	if len(extraRules) > 0 {
		csv := "rule,groups,when,value,unit,source,provenance,note\n" + strings.Join(extraRules, "\n") + "\n"
		user, err := rules.ParseRules(strings.NewReader(csv), "test rules")
		if err != nil {
			t.Fatal(err)
		}
		tab = tab.Override(user)
	}
	c, err := NewChecker(Options{Rules: tab, MarginalBand: 0.10, AsOf: asOf})
	if err != nil {
		t.Fatal(err)
	}
	return c
}

func mustCheck(t testing.TB, r *Result, id string) *CheckResult {
	t.Helper()
	c := r.Check(id)
	if c == nil {
		t.Fatalf("%s: no check %q", r.Asset.ID, id)
	}
	return c
}

// withLoad returns a copy of a with the rated load replaced (kg).
func withLoad(a *Asset, kg float64) *Asset {
	b := *a
	b.Fields = make(map[string]Value, len(a.Fields))
	for k, v := range a.Fields {
		b.Fields[k] = v
	}
	v := b.Fields["rated_load"]
	v.Num = kg
	b.Fields["rated_load"] = v
	return &b
}

func fmtFloat(x float64, prec int) string { return strconv.FormatFloat(x, 'f', prec, 64) }
