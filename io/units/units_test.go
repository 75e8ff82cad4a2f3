package units

import (
	"errors"
	"math"
	"strings"
	"testing"

	"hoistfleet/calc/approx"
)

// NIST SP 811 (2008) appendix B prints inexact factors to 7 significant digits.
const nist7 = 5e-7

func TestFactorNIST(t *testing.T) {
	tests := []struct {
		quantity, unit string
		want, relTol   float64
		source         string
	}{
		// Exact definitions.
		{"length", "ft", 0.3048, 1e-15, "NIST SP 811 B.9: foot = 3.048 E-01 m, exact"},
		{"length", "in", 0.0254, 1e-15, "NIST SP 811 B.9: inch = 2.54 E-02 m, exact"},
		{"length", "mm", 0.001, 1e-15, "SI prefix"},
		{"length", "cm", 0.01, 1e-15, "SI prefix"},
		{"mass", "lb", 0.45359237, 1e-15, "NIST SP 811 B.9: pound (avoirdupois) = 4.535 923 7 E-01 kg, exact"},
		{"mass", "t", 1000, 1e-15, "NIST SP 811 B.9: ton, metric = 1 E+03 kg"},
		{"mass", "tonne", 1000, 1e-15, "NIST SP 811 B.9: tonne = 1 E+03 kg"},
		{"mass", "g", 0.001, 1e-15, "SI prefix"},
		{"mass", "short ton", 907.18474, 1e-15, "NIST SP 811 B.9: ton, short (2000 lb) = 9.071 847 E+02 kg (exact: 2000 × 0.45359237)"},
		{"mass", "long ton", 1016.0469088, 1e-15, "NIST SP 811 B.9: ton, long (2240 lb) = 1.016 047 E+03 kg (exact: 2240 × 0.45359237)"},
		{"force", "kgf", 9.80665, 1e-15, "NIST SP 811 B.9: kilogram-force = 9.806 65 E+00 N, exact"},
		{"force", "kN", 1000, 1e-15, "SI prefix"},
		{"force", "tf", 9806.65, 1e-15, "NIST SP 811 B.9: ton-force (metric) = 9.806 65 E+03 N"},
		{"speed", "ft/min", 0.00508, 1e-15, "NIST SP 811 B.9: foot per minute = 5.08 E-03 m/s, exact"},
		{"speed", "m/min", 1.0 / 60, 1e-15, "definition of the minute"},
		{"acceleration", "ft/s2", 0.3048, 1e-15, "NIST SP 811 B.9: foot per second squared = 3.048 E-01 m/s², exact"},
		{"time", "min", 60, 1e-15, "NIST SP 811 B.9: minute = 6 E+01 s"},
		{"time", "h", 3600, 1e-15, "NIST SP 811 B.9: hour = 3.6 E+03 s"},
		{"time", "ms", 0.001, 1e-15, "SI prefix"},
		{"power", "PS", 735.49875, 1e-15, "NIST SP 811 B.9: horsepower (metric) = 7.354 988 E+02 W; 75 kgf m/s exact"},
		{"torque", "kgf m", 9.80665, 1e-15, "NIST SP 811 B.9: kilogram-force meter = 9.806 65 E+00 N m"},
		{"ratio", "%", 0.01, 1e-15, "definition of per cent"},
		{"ratio", "", 1, 0, "a pure number"},
		// Seven-digit NIST values.
		{"force", "lbf", 4.448222, nist7, "NIST SP 811 B.9: pound-force = 4.448 222 E+00 N"},
		{"force", "lb", 4.448222, nist7, "design.md: lb in a force column means lbf; NIST SP 811 B.9 pound-force"},
		{"force", "kip", 4448.222, nist7, "NIST SP 811 B.9: kip (1 kip = 1000 lbf) = 4.448 222 E+03 N"},
		{"power", "hp", 745.6999, nist7, "NIST SP 811 B.9: horsepower (550 ft·lbf/s) = 7.456 999 E+02 W"},
		{"torque", "lbf ft", 1.355818, nist7, "NIST SP 811 B.9: pound-force foot = 1.355 818 E+00 N m"},
		{"torque", "lb ft", 1.355818, nist7, "design.md: lb ft in a torque column is lbf ft; NIST SP 811 B.9"},
		{"torque", "lbf in", 0.1129848, nist7, "NIST SP 811 B.9: pound-force inch = 1.129 848 E-01 N m"},
		{"inertia", "lb ft2", 0.04214011, nist7, "NIST SP 811 B.9: pound foot squared = 4.214 011 E-02 kg m²"},
		{"inertia", "lb in2", 2.926397e-4, nist7, "NIST SP 811 B.9: pound inch squared = 2.926 397 E-04 kg m²"},
		{"inertia", "slug ft2", 14.59390 * 0.09290304, nist7, "NIST SP 811 B.9: slug = 1.459 390 E+01 kg × ft² 9.290 304 E-02 m² (computed)"},
		{"stress", "psi", 6.894757e-3, nist7, "NIST SP 811 B.9: psi = 6.894 757 E+03 Pa = 6.894 757 E-03 N/mm²"},
		{"stress", "ksi", 6.894757, nist7, "NIST SP 811 B.9: ksi = 6.894 757 E+06 Pa"},
		{"stress", "MPa", 1, 1e-15, "1 MPa = 1 N/mm²"},
		{"rotational_speed", "rad/s", 1 / 0.1047198, nist7, "NIST SP 811 B.9: revolution per minute = 1.047 198 E-01 rad/s"},
		{"rotational_speed", "rpm", 1, 0, "kept in rev/min"},
		{"angle", "rad", 1 / 1.745329e-2, nist7, "NIST SP 811 B.9: degree = 1.745 329 E-02 rad"},
		// GD² = 4 J (J in kg m², GD² in kgf m² numerically equal to kg m² of mass × diameter²).
		{"inertia", "GD2 kgf m2", 0.25, 1e-15, "GD² = 4 J: definition of the diameter of gyration D = 2 × radius of gyration"},
		{"inertia", "GD2 N m2", 0.25 / 9.80665, 1e-15, "GD² in N m² = 4 J g_n; g_n = 9.80665 (NIST SP 811)"},
		{"inertia", "GD2 lb ft2", 0.04214011 / 4, nist7, "GD² = 4 J; NIST SP 811 B.9 pound foot squared"},
	}
	for _, tt := range tests {
		got, err := Factor(tt.quantity, tt.unit)
		if err != nil {
			t.Errorf("Factor(%q, %q): %v (want %v, %s)", tt.quantity, tt.unit, err, tt.want, tt.source)
			continue
		}
		if !approx.Equal(got, tt.want, 0, tt.relTol) {
			t.Errorf("Factor(%q, %q) = %.12g, want %.12g (%s)", tt.quantity, tt.unit, got, tt.want, tt.source)
		}
	}
}

// The derived constants follow from the exact definitions (NIST SP 811 B.9 notes: the
// pound-force is the pound times g_n; the slug is 1 lbf s²/ft).
func TestDerivedIdentities(t *testing.T) {
	tests := []struct {
		name      string
		got, want float64
	}{
		{"lbf = lb × g_n", PoundForce, Pound * StandardGravity},
		{"lbf ft = lbf × ft", PoundForceFoot, PoundForce * Foot},
		{"lb ft² = lb × ft²", PoundFoot2, Pound * Foot * Foot},
		{"slug = lbf s²/ft", Slug, PoundForce / Foot},
		{"hp = 550 ft lbf/s", Horsepower, 550 * PoundForceFoot},
		{"PS = 75 kgf m/s", MetricHP, 75 * StandardGravity},
		{"g_n = 32.17404856 ft/s² (standards.md, computed)", StandardGravity / Foot, 32.17404856},
	}
	for _, tt := range tests {
		if !approx.Equal(tt.got, tt.want, 0, 1e-9) {
			t.Errorf("%s: %.17g vs %.17g", tt.name, tt.got, tt.want)
		}
	}
}

// Every accepted unit is found again under its displayed name, and every spelling of the
// same unit gives the same factor.
func TestSpellings(t *testing.T) {
	for _, q := range Quantities() {
		if SI(q) == "" {
			t.Errorf("quantity %q has no SI unit", q)
		}
		for _, name := range Accepted(q) {
			f, err := Factor(q, name)
			if err != nil || !(f > 0) || math.IsInf(f, 0) {
				t.Errorf("Factor(%q, %q) = %v, %v", q, name, f, err)
			}
			// A value converted to SI and back is the value (round trip).
			for _, v := range []float64{1, 12.5, 0.001, 7e5} {
				if back := v * f / f; !approx.Equal(back, v, 0, 1e-15) {
					t.Errorf("round trip %q %q: %v → %v", q, name, v, back)
				}
			}
		}
		if si, err := Factor(q, SI(q)); err != nil || si != 1 {
			t.Errorf("Factor(%q, SI %q) = %v, %v; want 1", q, SI(q), si, err)
		}
	}
	same := []struct {
		quantity string
		units    []string
	}{
		{"inertia", []string{"kg m2", "kg·m²", "kg*m^2", "KG M2", "kgm2", "kg.m2", "kg m^2"}},
		{"torque", []string{"N m", "Nm", "N·m", "N.m", "nm", "NM", "m N"}},
		{"torque", []string{"lbf ft", "lbf·ft", "ft lbf", "ft-lbf", "lb ft", "ft lb", "LBF FT"}},
		{"acceleration", []string{"m/s2", "m/s²", "m/s^2", "M/S2", "m/s/s"}},
		{"rotational_speed", []string{"rpm", "r/min", "rev/min", "RPM", "min-1", "min^-1", "1/min", "r.p.m."}},
		{"angle", []string{"deg", "°", "degrees", "DEG"}},
		{"mass", []string{"short ton", "Short Ton", "short  ton", "shortton"}},
		{"force", []string{"kN", "KN", "kn"}},
		{"stress", []string{"N/mm2", "N/mm²", "MPa", "Mpa", "n/mm2"}},
		{"inertia", []string{"GD2 kgf m2", "GD² kgf·m²", "gd2 kgf m2", "GD^2 kg m2"}},
	}
	for _, s := range same {
		want, err := Factor(s.quantity, s.units[0])
		if err != nil {
			t.Fatalf("Factor(%q, %q): %v", s.quantity, s.units[0], err)
		}
		for _, u := range s.units[1:] {
			got, err := Factor(s.quantity, u)
			if err != nil || got != want {
				t.Errorf("Factor(%q, %q) = %v, %v; want %v as for %q", s.quantity, u, got, err, want, s.units[0])
			}
		}
	}
}

func TestFactorRefusals(t *testing.T) {
	tests := []struct {
		quantity, unit string
		ambiguous      bool
		wantMsg        string // the whole message, or a prefix ending in "…"
	}{
		{"mass", "ton", true, "ton is ambiguous: write short ton or long ton"},
		{"mass", "Ton", true, "ton is ambiguous: write short ton or long ton"},
		{"mass", "tons", true, "tons is ambiguous: write short ton or long ton"},
		{"mass", "T", true, "T is ambiguous (tonne, short ton or long ton): write t or tonne for 1000 kg, or short ton or long ton"},
		{"force", "ton", true, "ton is ambiguous: write kN, tf (tonne-force) or kip"},
		{"force", "t", true, "t is a mass, not a force: write tf (tonne-force), kN or kgf"},
		{"force", "kg", true, "kg is a mass, not a force: write kgf (kilogram-force) or N"},
		{"force", "mN", true, "mN: mind the case, a force takes N, daN, kN, MN, lbf, kip, kgf or tf"},
		{"torque", "lb", true, "lb is not a torque: write lbf ft (lb ft is read as lbf ft) or lbf in"},
		{"torque", "lbf", true, "lbf is a force, not a torque: write lbf ft or lbf in"},
		{"torque", "kg m", true, "kg m is ambiguous: write kgf m (kilogram-force metre) or N m"},
		{"inertia", "kgf m2", true, `kgf m2 is the unit of GD² (4 × the moment of inertia): if the column holds GD², write GD2 in the header, e.g. "Motor inertia GD2 [kgf m2]"; a moment of inertia is in kg m2`},
		{"inertia", "kgf·m²", true, `kgf m2 is the unit of GD²…`},
		{"inertia", "GD2", true, "GD2 needs its unit: write GD2 kgf m2, GD2 kg m2, GD2 N m2 or GD2 lb ft2"},
		{"mass", "GD2 kg m2", true, "GD2 kg m2: GD2 applies only to a moment of inertia; a mass takes kg, g, t, tonne, lb, short ton or long ton"},
		{"mass", "psi", false, "psi is a unit of stress, not of mass: write one of kg, g, t, tonne, lb, short ton or long ton"},
		{"speed", "min", false, "min is a unit of time, not of speed: write one of m/s, m/min, mm/s, km/h, ft/min or ft/s"},
		{"length", "furlong", false, `unknown unit "furlong" for a length: write one of mm, cm, m, in or ft`},
		{"mass", "", false, "no unit given for a mass: write one of kg, g, t, tonne, lb, short ton or long ton"},
		{"rotational_speed", "Hz", false, `unknown unit "Hz" for a rotational speed: write one of rpm, rev/s or rad/s`},
		{"stress", "mPa", true, "mPa: mind the case, a stress takes N/mm2, MPa, psi or ksi"},
	}
	for _, tt := range tests {
		f, err := Factor(tt.quantity, tt.unit)
		var ue *Error
		if !errors.As(err, &ue) {
			t.Errorf("Factor(%q, %q) = %v, %v; want a *units.Error", tt.quantity, tt.unit, f, err)
			continue
		}
		msg := err.Error()
		if p, ok := strings.CutSuffix(tt.wantMsg, "…"); ok {
			if !strings.HasPrefix(msg, p) {
				t.Errorf("Factor(%q, %q) error:\ngot  %s\nwant %s", tt.quantity, tt.unit, msg, tt.wantMsg)
			}
		} else if msg != tt.wantMsg {
			t.Errorf("Factor(%q, %q) error:\ngot  %s\nwant %s", tt.quantity, tt.unit, msg, tt.wantMsg)
		}
		if ue.Ambiguous != tt.ambiguous || ue.Quantity != tt.quantity {
			t.Errorf("Factor(%q, %q): Ambiguous %v Quantity %q", tt.quantity, tt.unit, ue.Ambiguous, ue.Quantity)
		}
	}
	if _, err := Factor("luminance", "cd/m2"); !errors.Is(err, ErrUnknownQuantity) {
		t.Errorf("unknown quantity: %v", err)
	}
}

func TestSplitHeader(t *testing.T) {
	tests := []struct {
		in, title, unit string
		err             string
	}{
		{"Rated load [t]", "Rated load", "t", ""},
		{"Rope diameter (in)", "Rope diameter", "in", ""},
		{"  Hoist speed  [ m/min ] ", "Hoist speed", "m/min", ""},
		{"Site", "Site", "", ""},
		{"", "", "", ""},
		{"Sheave efficiency (max) [%]", "Sheave efficiency (max)", "%", ""},
		{"Rated load\n[t]", "Rated load", "t", ""},
		{"Drum inertia [kg·m²]", "Drum inertia", "kg·m²", ""},
		{"Speed [m/(min)]", "Speed", "m/(min)", ""},
		{"Motor inertia GD2 [kgf m2]", "Motor inertia", "GD2 kgf m2", ""},
		{"Drum inertia (GD²) [kg m2]", "Drum inertia", "GD2 kg m2", ""},
		{"Motor inertia [GD2 kgf m2]", "Motor inertia", "GD2 kgf m2", ""},
		{"Motor inertia GD2", "Motor inertia", "GD2", ""},
		{"Rated load [t", "Rated load", "", `header: "Rated load [t": the bracket "[" is not closed`},
		{"Rated load t]", "Rated load t", "", `header: "Rated load t]": the closing "]" has no opening "["`},
		{"Rated load []", "Rated load", "", `header: "Rated load []": empty brackets: write the unit inside them or remove them`},
	}
	for _, tt := range tests {
		title, unit, err := SplitHeader(tt.in)
		if title != tt.title || unit != tt.unit {
			t.Errorf("SplitHeader(%q) = %q, %q; want %q, %q", tt.in, title, unit, tt.title, tt.unit)
		}
		switch {
		case tt.err == "" && err != nil:
			t.Errorf("SplitHeader(%q): unexpected error %v", tt.in, err)
		case tt.err != "" && (err == nil || err.Error() != tt.err):
			t.Errorf("SplitHeader(%q) error:\ngot  %v\nwant %s", tt.in, err, tt.err)
		case tt.err != "" && !errors.Is(err, ErrHeader):
			t.Errorf("SplitHeader(%q): error does not wrap ErrHeader", tt.in)
		}
	}
}

func TestNormalize(t *testing.T) {
	groups := [][]string{
		{"Rope MBF", "rope-mbf", "ROPE_MBF", "Rope  M.B.F.", "ropembf", " rope mbf "},
		{"Gear back-drive efficiency", "gear backdrive efficiency", "GEAR_BACK_DRIVE_EFFICIENCY"},
		{"Drum inertia (kg m²)", "drum inertia kg m2"},
	}
	for _, g := range groups {
		want := Normalize(g[0])
		for _, s := range g[1:] {
			if got := Normalize(s); got != want {
				t.Errorf("Normalize(%q) = %q, want %q (as %q)", s, got, want, g[0])
			}
		}
	}
	if Normalize("Rope MBF") != "ropembf" {
		t.Errorf("Normalize(Rope MBF) = %q", Normalize("Rope MBF"))
	}
	if Normalize("Rated load") == Normalize("Rated loads") {
		t.Error("different words must stay different")
	}
}

// The US template's and the generator's units: each pair is one quantity in two units the
// reader accepts, and converting between them gives the NIST SP 811 (2008) appendix B
// factor (exact values: lb = 0.45359237 kg, lbf = 4.4482216152605 N, in = 0.0254 m,
// ft = 0.3048 m; hp, lbf ft and lb ft² from those).
func TestUSCustomaryConvert(t *testing.T) {
	tests := []struct {
		quantity, si string
		v, want      float64 // v in the US unit, want in the SI unit
		source       string
	}{
		{"mass", "t", 1, 0.45359237e-3, "NIST SP 811 B.9: pound (avoirdupois) = 0.45359237 kg, exact"},
		{"mass", "kg", 1, 0.45359237, "NIST SP 811 B.9: pound (avoirdupois), exact"},
		{"force", "kN", 1, 4.4482216152605e-3, "NIST SP 811 B.9: pound-force = 4.4482216152605 N, exact"},
		{"force", "N", 1, 4.4482216152605, "NIST SP 811 B.9: pound-force, exact"},
		{"length", "mm", 1, 25.4, "NIST SP 811 B.9: inch = 0.0254 m, exact"},
		{"length", "m", 1, 0.3048, "NIST SP 811 B.9: foot = 0.3048 m, exact"},
		{"torque", "N m", 1, 1.3558179483314004, "NIST SP 811 B.9: pound-force foot = 1.355 818 N m (exact: lbf × ft)"},
		{"power", "kW", 1, 0.74569987158227022, "NIST SP 811 B.9: horsepower (550 ft lbf/s) = 745.6999 W (exact: 550 lbf ft)"},
		{"inertia", "kg m2", 1, 0.0421401100938048, "NIST SP 811 B.9: pound foot squared = 0.04214011 kg m² (exact: lb × ft²)"},
		{"speed", "m/min", 100, 30.48, "NIST SP 811 B.9: foot per minute = 5.08 E-03 m/s, exact"},
		{"acceleration", "m/s2", 32.17404856, 9.80665, "standards.md: g_n = 32.17404856 ft/s² (computed, 10 digits)"},
		{"energy", "kJ", 1, 1.3558179483314004e-3, "NIST SP 811 B.9: foot pound-force = 1.355 818 J (exact: lbf × ft)"},
	}
	tol := func(source string) float64 {
		if strings.Contains(source, "10 digits") {
			return 1e-9
		}
		return 1e-15
	}
	seen := map[[2]string]bool{}
	for _, tt := range tests {
		us, ok := USCustomary(tt.quantity, tt.si)
		if !ok {
			t.Errorf("USCustomary(%q, %q): no US unit", tt.quantity, tt.si)
			continue
		}
		seen[[2]string{tt.quantity, tt.si}] = true
		got, err := Convert(tt.v, tt.quantity, us, tt.si)
		if err != nil || !approx.Equal(got, tt.want, 0, tol(tt.source)) {
			t.Errorf("Convert(%v %s → %s) = %.17g, %v; want %.17g (%s)", tt.v, us, tt.si, got, err, tt.want, tt.source)
		}
		// and back
		back, err := Convert(tt.want, tt.quantity, tt.si, us)
		if err != nil || !approx.Equal(back, tt.v, 0, tol(tt.source)) {
			t.Errorf("Convert(%v %s → %s) = %.17g, %v; want %.17g (%s)", tt.want, tt.si, us, back, err, tt.v, tt.source)
		}
	}
	for _, c := range usCustomary {
		if !seen[[2]string{c.quantity, c.si}] {
			t.Errorf("USCustomary(%q, %q) = %q has no NIST case in this test", c.quantity, c.si, c.us)
		}
	}
	for _, no := range [][2]string{{"rotational_speed", "rpm"}, {"stress", "N/mm2"}, {"time", "h"}, {"ratio", "%"}, {"length", "t"}} {
		if u, ok := USCustomary(no[0], no[1]); ok {
			t.Errorf("USCustomary(%q, %q) = %q; want none (written as in SI)", no[0], no[1], u)
		}
	}
	if got, err := Convert(7, "rotational_speed", "rpm", "rev/min"); err != nil || got != 7 {
		t.Errorf("Convert(7 rpm → rev/min) = %v, %v; want 7 (the same unit)", got, err)
	}
	if _, err := Convert(1, "mass", "lb", "ton"); err == nil {
		t.Error("Convert to a refused unit: no error")
	}
}
