package rules

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"sync"
	"testing"
)

// approxEqual reports whether got is within absTol or relTol·max(|got|,|want|) of want
// (the rule of gonum's scalar.EqualWithinAbsOrRel).
func approxEqual(got, want, absTol, relTol float64) bool {
	if got == want {
		return true
	}
	d := math.Abs(got - want)
	return d <= absTol || d <= relTol*math.Max(math.Abs(got), math.Abs(want))
}

func mustProfile(t *testing.T, name string) *Table {
	t.Helper()
	tb, err := Profile(name)
	if err != nil {
		t.Fatalf("Profile(%q): %v", name, err)
	}
	return tb
}

// inch is the international inch, 0.0254 m exactly (NIST SP 811, appendix B).
const inch = 0.0254

func TestEmbeddedRowsAreComplete(t *testing.T) {
	for _, p := range Profiles() {
		tb := mustProfile(t, p)
		if len(tb.Rules) == 0 {
			t.Fatalf("%s: no rules", p)
		}
		for _, r := range tb.Rules {
			where := fmt.Sprintf("%s:%d %s", r.Origin, r.Line, r.ID)
			if r.Origin != "built-in "+p {
				t.Errorf("%s: origin %q", where, r.Origin)
			}
			if strings.TrimSpace(r.Source) == "" {
				t.Errorf("%s: no source", where)
			}
			if got, err := normProvenance(r.Provenance); err != nil || got != r.Provenance {
				t.Errorf("%s: provenance %q not a standards.md label (%v)", where, r.Provenance, err)
			}
			if _, known := knownRules[r.ID]; !known {
				t.Errorf("%s: built-in row with an id the checks do not know", where)
			}
			if r.Unit != "" {
				v, err := r.ValueSI()
				if err != nil || math.IsNaN(v) {
					t.Errorf("%s: ValueSI: %v", where, err)
				}
			}
			// A value recalled from memory must say so in its label (design.md: "Values
			// recalled from memory are marked so").
			if strings.Contains(strings.ToLower(r.Note), "not verified") && !strings.HasPrefix(r.Provenance, "memory") &&
				!strings.HasPrefix(r.Provenance, "common practice") {
				t.Errorf("%s: note says not verified but provenance is %q", where, r.Provenance)
			}
		}
	}
}

// Every rule the checks need must resolve for every mechanism group in both profiles,
// for the conditions the schema's defaults supply.
func TestEveryCheckRuleResolves(t *testing.T) {
	base := Scope{Attrs: map[string]string{"special": "none", "control": "none", "service": "normal",
		"records": "none", "test": "static", "grooved": "yes"}, Nums: map[string]float64{"brakes": 1, "d_mm": 10}}
	needed := []string{"rope.design_factor", "rope.basis", "drum.h1", "sheave.h2", "drum.dead_wraps",
		"fleet_angle.max_grooved", "fleet_angle.max_plain", "fleet_angle.min", "hoist_speed.tolerance",
		"brake.factor", "brake.each", "default.sheave_efficiency", "default.gear_efficiency",
		"default.peak_torque_ratio", "default.brake_delay", "default.acceleration", "default.design_years",
		"default.working_days", "life.duration_h", "life.record_factor", "inspection.interval_months",
		"load_test.factor", "load_test.proposed_factor", "brake.basis", "brake.each_factor", "rope_wear.basis", "rope_wear.max_reduction", "rope_wear.broken_wires_lay",
		"rope_wear.broken_wires_strand"}
	for _, p := range Profiles() {
		tb := mustProfile(t, p)
		for g := 1; g <= 8; g++ {
			s := base
			s.Group = g
			for _, id := range needed {
				if _, ok := tb.Lookup(id, s); !ok {
					t.Errorf("%s M%d: no row for %s", p, g, id)
				}
			}
		}
		// brake_stop.max_distance: no source in standards.md sets one, so no profile has it.
		if r, ok := tb.Lookup("brake_stop.max_distance", Scope{Group: 5}); ok {
			t.Errorf("%s: brake_stop.max_distance present (%v) without a published source", p, r)
		}
	}
}

func TestLookupValues(t *testing.T) {
	num := func(kv ...any) map[string]float64 {
		m := map[string]float64{}
		for i := 0; i < len(kv); i += 2 {
			m[kv[i].(string)] = kv[i+1].(float64)
		}
		return m
	}
	attr := func(kv ...string) map[string]string {
		m := map[string]string{}
		for i := 0; i < len(kv); i += 2 {
			m[kv[i]] = kv[i+1]
		}
		return m
	}
	tests := []struct {
		name, profile, id string
		scope             Scope
		want              float64 // in the unit of ValueSI
		text              string  // for word rules
	}{
		// standards.md: ISO 4308-1 Zp running ropes M1..M8, seen.
		{"Zp M1", "iso", "rope.design_factor", Scope{Group: 1}, 3.15, ""},
		{"Zp M4", "iso", "rope.design_factor", Scope{Group: 4}, 4.0, ""},
		{"Zp M5", "iso", "rope.design_factor", Scope{Group: 5}, 4.5, ""},
		{"Zp M6", "iso", "rope.design_factor", Scope{Group: 6}, 5.6, ""},
		{"Zp M8", "iso", "rope.design_factor", Scope{Group: 8}, 9.0, ""},
		{"ISO basis", "iso", "rope.basis", Scope{Group: 5}, 0, "hoisting"},
		// standards.md: 29 CFR 1910.179(h)(2) design factor 5, law; hot metal 8, memory medium.
		{"US DF", "us", "rope.design_factor", Scope{Group: 5, Attrs: attr("special", "none")}, 5, ""},
		{"US DF hot metal", "us", "rope.design_factor", Scope{Group: 5, Attrs: attr("special", "Hot Metal")}, 8, ""},
		{"US DF unknown group", "us", "rope.design_factor", Scope{}, 5, ""},
		{"US basis", "us", "rope.basis", Scope{}, 0, "static"},
		// standards.md: ISO 4308-1 h1 M5 18, h2 M6 22.4 (memory, medium).
		{"h1 M5", "iso", "drum.h1", Scope{Group: 5}, 18, ""},
		{"h2 M6", "iso", "sheave.h2", Scope{Group: 6}, 22.4, ""},
		{"h1 M7 US uses ISO", "us", "drum.h1", Scope{Group: 7}, 22.4, ""},
		// standards.md: 29 CFR 1910.179(h)(2) two wraps, law.
		{"dead wraps", "us", "drum.dead_wraps", Scope{Group: 3}, 2, ""},
		// standards.md: Wire Rope Users Manual 2 / 1.5 / 0.5 deg, seen.
		{"fleet grooved", "iso", "fleet_angle.max_grooved", Scope{}, 2, ""},
		{"fleet plain", "us", "fleet_angle.max_plain", Scope{}, 1.5, ""},
		{"fleet min", "iso", "fleet_angle.min", Scope{}, 0.5, ""},
		// standards.md: 29 CFR 1910.179(f)(2) 125 %, 100 % mechanical, 100 % each with two brakes, law.
		{"US brake", "us", "brake.factor", Scope{Attrs: attr("control", "none"), Nums: num("brakes", 1.0)}, 1.25, ""},
		{"US brake electrical", "us", "brake.factor", Scope{Attrs: attr("control", "electrical"), Nums: num("brakes", 1.0)}, 1.25, ""},
		{"US brake mechanical", "us", "brake.factor", Scope{Attrs: attr("control", "mechanical"), Nums: num("brakes", 1.0)}, 1.0, ""},
		{"US two brakes", "us", "brake.factor", Scope{Attrs: attr("control", "none"), Nums: num("brakes", 2.0)}, 1.0, ""},
		{"US two brakes each", "us", "brake.each", Scope{Attrs: attr("control", "none"), Nums: num("brakes", 2.0)}, 0, "yes"},
		{"US one brake each", "us", "brake.each", Scope{Attrs: attr("control", "none"), Nums: num("brakes", 1.0)}, 0, "no"},
		// ISO: the verified floor 1.25 on the static torque (2006/42/EC Annex I 4.1.2.3,
		// static test coefficient; standards.md memory high); EN 14492-2 1.6 (memory
		// low) is a review row, found only by LookupIndexes (TestReviewRows).
		{"ISO brake", "iso", "brake.factor", Scope{Group: 5}, 1.25, ""},
		{"ISO brake basis", "iso", "brake.basis", Scope{Group: 5}, 0, "static"},
		{"US brake basis", "us", "brake.basis", Scope{Group: 5}, 0, "hoisting"},
		// standards.md: FEM 9.755 D, seen: 1Am (M4) 800 h, 2m (M5) 1 600 h, 5m (M8) 12 500 h.
		{"D M4", "iso", "life.duration_h", Scope{Group: 4}, 800, ""},
		{"D M5", "iso", "life.duration_h", Scope{Group: 5}, 1600, ""},
		{"D M8", "us", "life.duration_h", Scope{Group: 8}, 12500, ""},
		// standards.md: record-keeping factor X 1.2 / 1.4 / 1.5, common practice.
		{"X meter and log", "iso", "life.record_factor", Scope{Attrs: attr("records", "meter and log")}, 1.2, ""},
		{"X log", "iso", "life.record_factor", Scope{Attrs: attr("records", "log")}, 1.4, ""},
		{"X none", "us", "life.record_factor", Scope{Attrs: attr("records", "none")}, 1.5, ""},
		// standards.md: ASME B30.16 periodic inspection 12 / 6 / 3 months, seen.
		{"insp normal", "us", "inspection.interval_months", Scope{Attrs: attr("service", "normal")}, 12, ""},
		{"insp heavy", "us", "inspection.interval_months", Scope{Attrs: attr("service", "heavy")}, 6, ""},
		{"insp severe", "iso", "inspection.interval_months", Scope{Attrs: attr("service", "SEVERE")}, 3, ""},
		// standards.md: 2006/42/EC Annex I 4.1.2.3 static 1.25, dynamic 1.1 (memory high);
		// 29 CFR 1910.179(k)(2) not more than 125 % (law).
		{"test static", "iso", "load_test.factor", Scope{Attrs: attr("test", "static")}, 1.25, ""},
		{"test dynamic", "iso", "load_test.factor", Scope{Attrs: attr("test", "dynamic")}, 1.1, ""},
		// US: the current rating needs a test at ≥ 100 % (ASME B30.2, memory medium); a
		// proposed one ≥ 125 % (OSHA letter of 3 January 1989: "should not be rated in
		// excess of 80 percent of the test load", read).
		{"test US", "us", "load_test.factor", Scope{Attrs: attr("test", "dynamic")}, 1.0, ""},
		{"test US proposed", "us", "load_test.proposed_factor", Scope{Attrs: attr("test", "static")}, 1.25, ""},
		{"test ISO proposed", "iso", "load_test.proposed_factor", Scope{Attrs: attr("test", "static")}, 1.25, ""},
		// standards.md: ISO 4309:2010 10 % / 7.5 % / 5 %, memory medium.
		{"wear FC", "iso", "rope_wear.max_reduction", Scope{Attrs: attr("rope", "fibre core")}, 0.10, ""},
		{"wear IWRC", "iso", "rope_wear.max_reduction", Scope{Attrs: attr("rope", "steel core")}, 0.075, ""},
		{"wear RR", "iso", "rope_wear.max_reduction", Scope{Attrs: attr("rope", "rotation resistant")}, 0.05, ""},
		{"wear unknown type takes strictest", "iso", "rope_wear.max_reduction", Scope{}, 0.05, ""},
		{"wear basis ISO", "iso", "rope_wear.basis", Scope{}, 0, "reference"},
		{"wear basis US", "us", "rope_wear.basis", Scope{}, 0, "nominal"},
		// standards.md: B30.2 / B30.16 broken wires 12 per lay, 4 per strand, seen.
		{"wires lay", "us", "rope_wear.broken_wires_lay", Scope{}, 12, ""},
		{"wires strand", "us", "rope_wear.broken_wires_strand", Scope{}, 4, ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			tb := mustProfile(t, tt.profile)
			r, ok := tb.Lookup(tt.id, tt.scope)
			if !ok {
				t.Fatalf("Lookup(%s) found nothing", tt.id)
			}
			if tt.text != "" {
				if r.Value != tt.text {
					t.Fatalf("Lookup(%s) = %q, want %q", tt.id, r.Value, tt.text)
				}
				return
			}
			got, err := r.ValueSI()
			if err != nil {
				t.Fatal(err)
			}
			if !approxEqual(got, tt.want, 0, 1e-12) {
				t.Errorf("Lookup(%s) = %v (%s), want %v", tt.id, got, r, tt.want)
			}
		})
	}
}

// The ASME B30.2-2005 diameter-reduction bands (standards.md, seen): ≤ 5/16 in: 1/64 in;
// ≤ 1/2 in: 1/32; ≤ 3/4 in: 3/64; ≤ 1-1/8 in: 1/16; ≤ 1-1/2 in: 3/32. Diameters are
// given in inches and converted as the register reader would (in = 0.0254 m, NIST SP
// 811), so that an edge suffers the rounding of a real conversion.
func TestUSWearBandEdges(t *testing.T) {
	tb := mustProfile(t, "us")
	tests := []struct {
		dIn       float64 // nominal diameter [in]
		wantIn    float64 // max reduction [in]; 0 → expect the flat ratio
		wantRatio float64
	}{
		{0.25, 1.0 / 64, 0},
		{5.0 / 16, 1.0 / 64, 0}, // exactly on the edge: the lower band
		{5.0/16 + 0.001, 1.0 / 32, 0},
		{0.5, 1.0 / 32, 0},
		{0.5 + 1e-4, 3.0 / 64, 0},
		{0.75, 3.0 / 64, 0},
		{1.0, 1.0 / 16, 0},
		{1.125, 1.0 / 16, 0},
		{1.25, 3.0 / 32, 0},
		{1.5, 3.0 / 32, 0},
		{1.75, 0, 0.05}, // beyond the 2005 table: flat 5 % (memory, low-medium)
	}
	for _, tt := range tests {
		dM := tt.dIn * inch
		s := Scope{Group: 5, Nums: map[string]float64{"d_mm": dM * 1000}}
		r, ok := tb.Lookup("rope_wear.max_reduction", s)
		if !ok {
			t.Errorf("d = %v in: no row", tt.dIn)
			continue
		}
		got, err := r.ValueSI()
		if err != nil {
			t.Fatal(err)
		}
		if tt.wantIn > 0 {
			if r.Dimension() != "length" || !approxEqual(got, tt.wantIn*inch, 0, 1e-12) {
				t.Errorf("d = %v in: got %v m (%s), want %v in = %v m", tt.dIn, got, r, tt.wantIn, tt.wantIn*inch)
			}
			f, _ := r.Float()
			if !approxEqual(f, tt.wantIn, 0, 1e-12) {
				t.Errorf("d = %v in: Float() = %v, want %v (in, not converted)", tt.dIn, f, tt.wantIn)
			}
		} else if r.Dimension() != "ratio" || !approxEqual(got, tt.wantRatio, 0, 1e-12) {
			t.Errorf("d = %v in: got %v %s, want ratio %v", tt.dIn, got, r.Unit, tt.wantRatio)
		}
	}
}

// TestValueSI covers every rule unit; the factors come from io/units (tested there
// against NIST SP 811), so this checks which units convert and which are kept.
func TestValueSI(t *testing.T) {
	tests := []struct {
		value, unit string
		want        float64
	}{
		{"1", "in", 0.0254},               // NIST SP 811: in = 0.0254 m exactly
		{"1", "ft", 0.3048},               // NIST SP 811: ft = 0.3048 m exactly
		{"32.17404856", "ft/s2", 9.80665}, // NIST SP 811: g_n in ft/s² (derived)
		{"9.80665", "m/s2", 9.80665},
		{"25", "mm", 0.025},
		{"2.5", "m", 2.5},
		{"12.5", "%", 0.125},
		{"1.25", "1", 1.25},
		{"0.3", "s", 0.3},
		{"1600", "h", 1600}, // hours kept: FEM 9.755 durations are in hours
		{"12", "months", 12},
		{"5", "years", 5},
		{"250", "d/year", 250},
		{"240", "1/h", 240}, // starts an hour kept: motor ratings count them so
		{"40", "kg", 40},
		{"5", "t", 5000}, // NIST SP 811: metric ton = 1000 kg
		{"2", "deg", 2},
	}
	covered := map[string]bool{}
	for _, tt := range tests {
		covered[tt.unit] = true
		r := Rule{ID: "x.test", Value: tt.value, Unit: tt.unit}
		got, err := r.ValueSI()
		if err != nil {
			t.Errorf("%s %s: %v", tt.value, tt.unit, err)
			continue
		}
		if !approxEqual(got, tt.want, 0, 1e-9) {
			t.Errorf("%s %s = %v, want %v", tt.value, tt.unit, got, tt.want)
		}
	}
	for _, u := range RuleUnits() {
		if !covered[u] {
			t.Errorf("rule unit %q: no case in TestValueSI", u)
		}
	}
	if _, err := (Rule{ID: "rope.basis", Value: "static"}).Float(); err == nil {
		t.Error("Float of a word: no error")
	}
	if _, err := (Rule{ID: "x.a", Value: "1", Unit: "furlong"}).ValueSI(); err == nil {
		t.Error("ValueSI with an unknown unit: no error")
	}
}

// The lookup order promised by the doc: most conditions, then narrowest group span,
// then the later row.
func TestLookupSpecificity(t *testing.T) {
	const csvText = `rule,groups,when,value,unit,source,provenance,note
x.a,all,,1,1,test,seen,
x.a,M1-M8,,2,1,test,seen,
x.a,M4-M6,,3,1,test,seen,
x.a,M5,,4,1,test,seen,
x.a,all,service=heavy,5,1,test,seen,
x.a,all,service=heavy and brakes>=2,6,1,test,seen,
x.a,M5,service=heavy,7,1,test,seen,
x.b,all,,1,1,test,seen,
x.b,all,,2,1,test,seen,
x.c,all,records=meter and log,1,1,test,seen,
x.c,all,records=log,2,1,test,seen,
`
	rs, err := ParseRules(strings.NewReader(csvText), "spec.csv")
	if err != nil {
		t.Fatal(err)
	}
	tb, err := NewTable("test", rs)
	if err != nil {
		t.Fatal(err)
	}
	heavy := map[string]string{"service": "heavy"}
	tests := []struct {
		id   string
		s    Scope
		want string
	}{
		{"x.a", Scope{}, "1"},                       // unknown group: only "all"
		{"x.a", Scope{Group: 2}, "2"},               // range beats all
		{"x.a", Scope{Group: 4}, "3"},               // narrower range beats wider
		{"x.a", Scope{Group: 5}, "4"},               // one group beats a range
		{"x.a", Scope{Group: 2, Attrs: heavy}, "5"}, // a condition beats any group span
		{"x.a", Scope{Group: 5, Attrs: heavy}, "7"}, // same conditions: one group beats all
		{"x.a", Scope{Group: 5, Attrs: heavy, Nums: map[string]float64{"brakes": 2}}, "6"}, // two conditions
		{"x.b", Scope{}, "2"}, // tie: the later row
		{"x.c", Scope{Attrs: map[string]string{"records": "Meter and Log"}}, "1"},
		{"x.c", Scope{Attrs: map[string]string{"records": "log"}}, "2"},
	}
	for _, tt := range tests {
		r, ok := tb.Lookup(tt.id, tt.s)
		if !ok || r.Value != tt.want {
			t.Errorf("Lookup(%s, %+v) = %q %v, want %q", tt.id, tt.s, r.Value, ok, tt.want)
		}
	}
	if _, ok := tb.Lookup("x.c", Scope{}); ok {
		t.Error("a condition whose name the scope lacks matched")
	}
}

func TestOverride(t *testing.T) {
	iso := mustProfile(t, "iso")
	user, err := ParseRules(strings.NewReader(`rule,groups,when,value,unit,source,provenance,note
rope.design_factor,m6,,6.0,1,Insurer acceptance criteria 2025,seen,stricter than ISO
brake.factor,all,control=mechanical,1.1,1,Insurer acceptance criteria 2025,seen,
x.insurer.max_age,all,,40,years,Insurer acceptance criteria 2025,seen,
`), "insurer.csv")
	if err != nil {
		t.Fatal(err)
	}
	tb := iso.Override(user)
	r, ok := tb.Lookup("rope.design_factor", Scope{Group: 6})
	if !ok || r.Value != "6.0" || r.Origin != "insurer.csv" || r.Line != 2 {
		t.Errorf("M6 after override: %+v", r)
	}
	// The replaced built-in row is gone, the others stay.
	n := 0
	for _, x := range tb.Rules {
		if x.ID == "rope.design_factor" {
			n++
		}
	}
	if n != 8 {
		t.Errorf("rope.design_factor rows after override = %d, want 8", n)
	}
	if r, _ := tb.Lookup("rope.design_factor", Scope{Group: 5}); r.Value != "4.5" || r.Origin != "built-in iso" {
		t.Errorf("M5 after override: %+v", r)
	}
	// An added, more specific row applies only where its condition holds.
	if r, _ := tb.Lookup("brake.factor", Scope{Attrs: map[string]string{"control": "mechanical"}}); r.Value != "1.1" || r.Origin != "insurer.csv" {
		t.Errorf("brake mechanical: %+v", r)
	}
	if r, _ := tb.Lookup("brake.factor", Scope{Attrs: map[string]string{"control": "none"}}); r.Value != "1.25" {
		t.Errorf("brake none: %+v", r)
	}
	// The original table is unchanged.
	if r, _ := iso.Lookup("rope.design_factor", Scope{Group: 6}); r.Value != "5.6" {
		t.Errorf("Override changed the original table: %+v", r)
	}
	// A user row equal in specificity to a built-in one wins the tie.
	tie, err := ParseRules(strings.NewReader("rule,groups,when,value,unit,source,provenance,note\nrope.design_factor,M6,special=none,7,1,site rule,seen,\n"), "tie.csv")
	if err != nil {
		t.Fatal(err)
	}
	tb2 := iso.Override(tie)
	if r, _ := tb2.Lookup("rope.design_factor", Scope{Group: 6, Attrs: map[string]string{"special": "none"}}); r.Origin != "tie.csv" {
		t.Errorf("tie: %+v", r)
	}
}

func TestParseErrorsAreLocated(t *testing.T) {
	const head = "rule,groups,when,value,unit,source,provenance,note\n"
	tests := []struct {
		name   string
		text   string
		line   int
		column string
		want   string // part of the message
	}{
		{"bad number", head + "drum.h1,M5,,eighteen,1,x,seen,\n", 2, "value", `"eighteen" is not a number`},
		{"decimal comma", head + "drum.h1,M5,,\"18,5\",1,x,seen,\n", 2, "value", "decimal point"},
		{"unknown id", head + "\ndrum.h9,M5,,18,1,x,seen,\n", 3, "rule", `unknown rule id "drum.h9"`},
		{"bad group", head + "drum.h1,M9,,18,1,x,seen,\n", 2, "groups", "M1 to M8"},
		{"backwards range", head + "drum.h1,M5-M2,,18,1,x,seen,\n", 2, "groups", "backwards"},
		{"bad condition name", head + "brake.factor,all,colour=red,1,1,x,seen,\n", 2, "when", `unknown condition name "colour"`},
		{"bad condition value", head + "brake.factor,all,control=hydraulic,1,1,x,seen,\n", 2, "when", "expected one of none, mechanical, electrical"},
		{"condition without operator", head + "brake.factor,all,mechanical,1,1,x,seen,\n", 2, "when", "not a condition"},
		{"numeric condition with text", head + "brake.factor,all,brakes>=two,1,1,x,seen,\n", 2, "when", "expected a number"},
		{"bad unit for id", head + "drum.h1,M5,,18,mm,x,seen,\n", 2, "unit", "does not suit drum.h1"},
		{"missing unit", head + "default.brake_delay,all,,0.3,,x,seen,\n", 2, "unit", "expected a unit of s"},
		{"out of range", head + "default.gear_efficiency,all,,1.2,1,x,seen,\n", 2, "value", "outside the range"},
		{"bad word", head + "rope.basis,all,,dynamic,,x,seen,\n", 2, "value", "expected one of hoisting, static"},
		{"no source", head + "drum.h1,M5,,18,1,,seen,\n", 2, "source", "empty"},
		{"bad provenance", head + "drum.h1,M5,,18,1,x,hearsay,\n", 2, "provenance", "expected one of"},
		{"memory without confidence", head + "drum.h1,M5,,18,1,x,memory,\n", 2, "provenance", "confidence"},
		{"missing column", "rule,groups,when,value,unit,source,note\n", 1, "", `column "provenance" is missing`},
		{"unknown column", "rule,groups,when,value,unit,source,provenance,note,colour\n", 1, "", `unknown column "colour"`},
		{"stray field", head + "drum.h1,M5,,18,1,x,seen,,extra\n", 2, "", "outside the columns"},
		{"comment then error", head + "# a comment\ndrum.h1,M5,,18,1,x,law,\ndrum.h1,M6,,x,1,x,law,\n", 4, "value", "not a number"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := ParseRules(strings.NewReader(tt.text), "rules.csv")
			if err == nil {
				t.Fatal("no error")
			}
			var es RuleErrors
			if !errors.As(err, &es) || len(es) == 0 {
				t.Fatalf("error %v is not a RuleErrors", err)
			}
			e := es[0]
			if e.Line != tt.line || e.Column != tt.column || !strings.Contains(e.Error(), tt.want) {
				t.Errorf("got %q (line %d, column %q), want line %d column %q containing %q", e.Error(), e.Line, e.Column, tt.line, tt.column, tt.want)
			}
			prefix := fmt.Sprintf("rules.csv:%d: ", tt.line)
			if !strings.HasPrefix(e.Error(), prefix) {
				t.Errorf("message %q does not start with %q", e.Error(), prefix)
			}
		})
	}
}

func TestParseRulesDialects(t *testing.T) {
	// Semicolon separator, BOM, header in another order and case, memory label with a colon.
	text := "\uFEFFRule;Value;Unit;Groups;When;Source;Provenance;Note\r\ndrum.h1;18;1;m5;;ISO 4308-1;Memory: Medium;\r\n"
	rs, err := ParseRules(strings.NewReader(text), "semi.csv")
	if err != nil {
		t.Fatal(err)
	}
	if len(rs) != 1 || rs[0].Groups != "M5" || rs[0].Value != "18" || rs[0].Provenance != "memory, medium" || rs[0].Line != 2 {
		t.Errorf("got %+v", rs)
	}
	// Records from a sheet: the first non-empty row is the header; lines count from firstLine.
	recs := [][]string{{}, {"rule", "groups", "when", "value", "unit", "source", "provenance", "note"},
		{"drum.h1", "M5", "", "18", "1", "x", "seen"}, {"drum.h1", "M6", "", "?", "1", "x", "seen"}}
	_, err = ParseRuleRecords(recs, "book.xlsx", 1)
	var es RuleErrors
	if !errors.As(err, &es) || es[0].Line != 4 || es[0].Col != 4 {
		t.Errorf("records: %v", err)
	}
}

func TestLookupConcurrent(t *testing.T) {
	tb := mustProfile(t, "us")
	var wg sync.WaitGroup
	for g := 1; g <= 8; g++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := 0; i < 200; i++ {
				if r, ok := tb.Lookup("rope.design_factor", Scope{Group: g}); !ok || r.Value != "5" {
					t.Errorf("M%d: %+v", g, r)
					return
				}
			}
		}()
	}
	wg.Wait()
}

func TestProfileUnknown(t *testing.T) {
	if _, err := Profile("fem"); err == nil || !strings.Contains(err.Error(), "iso, us") {
		t.Errorf("Profile(fem): %v", err)
	}
	a, b := mustProfile(t, "iso"), mustProfile(t, "ISO")
	a.Rules[0].Value = "changed"
	if b.Rules[0].Value == "changed" {
		t.Error("Profile returns shared rows")
	}
	if c := mustProfile(t, "iso"); c.Rules[0].Value == "changed" {
		t.Error("changing a returned table changed the built-in rows")
	}
}

func ExampleTable_Lookup() {
	us, err := Profile("us")
	if err != nil {
		fmt.Println(err)
		return
	}
	s := Scope{Group: 5, Attrs: map[string]string{"control": "mechanical"}, Nums: map[string]float64{"brakes": 1}}
	r, _ := us.Lookup("brake.factor", s)
	fmt.Println(r)
	fmt.Println(r.Cite())
	// Output:
	// brake.factor = 1.0 (all; control=mechanical)
	// 29 CFR 1910.179(f)(2); Cal. Code Regs. tit. 8 §4898(c)(2) [law]
}

// TestReviewRows: a row whose provenance is "memory, low" is a review limit (design.md
// Revision 2): looked up apart from the verified rows, and confirmed by a user row with
// the same rule, groups and when and the provenance seen or law.
func TestReviewRows(t *testing.T) {
	iso := mustProfile(t, "iso")
	s := Scope{Group: 5, Attrs: map[string]string{"control": "none"}}
	for _, tc := range []struct{ id, verified, review string }{
		{"brake.factor", "1.25", "1.6"},       // 2006/42/EC floor; EN 14492-2 (memory, low)
		{"brake.basis", "static", "hoisting"}, // the torque each multiplies
		{"rope.design_factor", "4.5", ""},     // ISO 4308-1 Zp M5, seen: no review row
	} {
		v, r := iso.LookupIndexes(tc.id, s)
		if v < 0 || iso.Rules[v].Value != tc.verified || iso.IsReview(v) {
			t.Errorf("%s: verified row %d, want value %s", tc.id, v, tc.verified)
		}
		switch {
		case tc.review == "" && r >= 0:
			t.Errorf("%s: review row %+v, want none", tc.id, iso.Rules[r])
		case tc.review != "" && (r < 0 || iso.Rules[r].Value != tc.review || !iso.IsReview(r)):
			t.Errorf("%s: review row %d, want value %s", tc.id, r, tc.review)
		}
	}
	for p, want := range map[string]bool{"memory, low": true, "Memory,  low": true, "memory, low-medium": false, "memory, medium": false, "seen": false, "law": false} {
		if got := IsReviewProvenance(p); got != want {
			t.Errorf("IsReviewProvenance(%q) = %v, want %v", p, got, want)
		}
	}
	// A rule file confirming EN 14492-2 (provenance seen) replaces both rows of the same
	// key: the confirmed 1.6 on the hoisting torque is then the verified rule.
	user, err := ParseRules(strings.NewReader(`rule,groups,when,value,unit,source,provenance,note
brake.factor,all,,1.6,1,"EN 14492-2:2019, checked",seen,
brake.basis,all,,hoisting,,"EN 14492-2:2019, checked",seen,
`), "confirmed.csv")
	if err != nil {
		t.Fatal(err)
	}
	tb := iso.Override(user)
	for id, want := range map[string]string{"brake.factor": "1.6", "brake.basis": "hoisting"} {
		v, r := tb.LookupIndexes(id, s)
		if v < 0 || tb.Rules[v].Value != want || tb.Rules[v].Origin != "confirmed.csv" || r >= 0 {
			t.Errorf("%s after confirmation: verified %d, review %d; want the user's %s alone", id, v, r, want)
		}
	}
}
