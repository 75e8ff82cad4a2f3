// Package units reads the units written in a register's header and converts them to
// the SI units hoistfleet computes in.
//
// A header carries its unit in square or round brackets at the end:
//
//	"Rated load [t]"          → title "Rated load",     unit "t"
//	"Rope diameter (in)"      → title "Rope diameter",  unit "in"
//	"Motor inertia GD2 [kgf m2]" → title "Motor inertia", unit "GD2 kgf m2"
//	"Site"                    → title "Site",           unit ""
//
// Factor gives the number to multiply a cell by to obtain the SI value of its quantity:
// Factor("mass", "lb") = 0.45359237 (kg per lb). Every factor is exact, from NIST SP 811
// (2008), appendix B, or from SI prefixes; the constants below name their source.
//
// Three quantities keep a customary unit instead of the SI one, because the rules and
// the calculations use it: rotational speed is kept in rev/min, angles in degrees, and
// stress (rope grade) in N/mm² (= MPa). A ratio is kept as a pure number: 160 % → 1.6.
//
// Ambiguous units are refused with a message saying what to write instead, never
// guessed: a bare "ton" (short ton 907.18474 kg or long ton 1016.0469088 kg), "T", a
// bare "lb" in a torque column, a "t" in a force column, and the GD² units (kgf m², N m²)
// unless the header says GD2.
package units

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"unicode"
)

// Exact conversion factors, NIST SP 811 (2008) appendix B, as listed in the project's
// standards.md "Units" section.
const (
	StandardGravity = 9.80665                          // g_n, m/s² (exact, by definition)
	Foot            = 0.3048                           // m per ft (exact)
	Inch            = 0.0254                           // m per in (exact)
	Pound           = 0.45359237                       // kg per lb (avoirdupois, exact)
	PoundForce      = 4.4482216152605                  // N per lbf = Pound × g_n (exact)
	Horsepower      = 745.69987158227022               // W per hp (550 ft·lbf/s)
	MetricHP        = 735.49875                        // W per PS / CV (75 kgf·m/s, exact)
	Slug            = 14.59390293720636                // kg per slug = lbf·s²/ft
	PoundFoot2      = 0.0421401100938048               // kg·m² per lb·ft² = Pound × Foot²
	PoundForceFoot  = 1.3558179483314004               // N·m per lbf·ft = PoundForce × Foot
	ShortTon        = 2000 * Pound                     // kg (907.18474, exact)
	LongTon         = 2240 * Pound                     // kg (1016.0469088, exact)
	KilogramForce   = StandardGravity                  // N per kgf (exact)
	Hour            = 3600                             // s per h (exact, NIST SP 811 B.9)
	PSI             = PoundForce / (Inch * Inch) / 1e6 // N/mm² per lbf/in² (6.894757293168361e-3)
	RadPerSecondRPM = 60 / (2 * math.Pi)               // rev/min per rad/s
	DegreesPerRad   = 180 / math.Pi                    // deg per rad
	slugFoot2       = Slug * Foot * Foot               // kg·m² per slug·ft² (= lbf·ft·s²)
	poundInch2      = Pound * Inch * Inch              // kg·m² per lb·in²
	poundForceInch  = PoundForce * Inch                // N·m per lbf·in
	gd2PerJ         = 4                                // GD² = 4 J (D = 2 × radius of gyration)
)

// order is the order quantities are listed and searched in.
var order = []string{"mass", "force", "length", "power", "torque", "inertia", "speed",
	"acceleration", "rotational_speed", "angle", "time", "stress", "energy", "ratio"}

// Quantities the register's schema uses, with the unit Factor converts to.
var siUnits = map[string]string{
	"mass":             "kg",
	"force":            "N",
	"length":           "m",
	"power":            "W",
	"torque":           "N m",
	"inertia":          "kg m2",
	"speed":            "m/s",
	"acceleration":     "m/s2",
	"rotational_speed": "rev/min",
	"angle":            "deg",
	"time":             "s",
	"stress":           "N/mm2",
	"energy":           "J",
	"ratio":            "1",
}

// unit is one accepted spelling family of a unit.
type unit struct {
	name     string   // as shown in messages and accepted lists
	spelling []string // normalized spellings (see norm) that mean it
	factor   float64
}

// table lists the accepted units of each quantity, in the order they are shown.
var table = map[string][]unit{
	"mass": {
		{"kg", []string{"kg", "kilogram", "kilograms"}, 1},
		{"g", []string{"g", "gram", "grams"}, 1e-3},
		{"t", []string{"t", "metricton", "metrictonne"}, 1000},
		{"tonne", []string{"tonne", "tonnes"}, 1000},
		{"lb", []string{"lb", "lbs", "lbm", "pound", "pounds"}, Pound},
		{"short ton", []string{"shortton", "shorttons", "uston"}, ShortTon},
		{"long ton", []string{"longton", "longtons", "ukton", "imperialton"}, LongTon},
	},
	"force": {
		{"N", []string{"N", "newton", "newtons"}, 1},
		{"daN", []string{"daN"}, 10},
		{"kN", []string{"kN"}, 1e3},
		{"MN", []string{"MN"}, 1e6},
		{"lbf", []string{"lbf", "lb", "lbs"}, PoundForce},
		{"kip", []string{"kip", "kips", "klbf"}, 1000 * PoundForce},
		{"kgf", []string{"kgf", "kp"}, KilogramForce},
		{"tf", []string{"tf", "tonneforce"}, 1000 * KilogramForce},
	},
	"length": {
		{"mm", []string{"mm", "millimetre", "millimeter", "millimetres", "millimeters"}, 1e-3},
		{"cm", []string{"cm"}, 1e-2},
		{"m", []string{"m", "metre", "meter", "metres", "meters"}, 1},
		{"in", []string{"in", "inch", "inches"}, Inch},
		{"ft", []string{"ft", "foot", "feet"}, Foot},
	},
	"power": {
		{"W", []string{"W", "watt", "watts"}, 1},
		{"kW", []string{"kW"}, 1e3},
		{"hp", []string{"hp", "bhp"}, Horsepower},
		{"PS", []string{"PS", "CV", "metrichp", "ch"}, MetricHP},
	},
	"torque": {
		{"N m", []string{"Nm", "mN"}, 1},
		{"daN m", []string{"daNm"}, 10},
		{"kN m", []string{"kNm"}, 1e3},
		{"lbf ft", []string{"lbfft", "lbft", "ftlbf", "ftlb", "lbsft", "ftlbs"}, PoundForceFoot},
		{"lbf in", []string{"lbfin", "lbin", "inlbf", "inlb", "lbsin", "inlbs"}, poundForceInch},
		{"kgf m", []string{"kgfm", "kpm", "mkgf", "mkp"}, KilogramForce},
	},
	"inertia": {
		{"kg m2", []string{"kgm2", "m2kg"}, 1},
		{"lb ft2", []string{"lbft2", "lbmft2", "lbsft2", "ft2lb"}, PoundFoot2},
		{"lb in2", []string{"lbin2", "lbmin2", "in2lb"}, poundInch2},
		{"slug ft2", []string{"slugft2"}, slugFoot2},
		{"GD2 kgf m2", []string{"GD2kgfm2", "GD2kgm2", "GD2kpm2"}, 1.0 / gd2PerJ},
		{"GD2 N m2", []string{"GD2Nm2"}, 1 / (gd2PerJ * StandardGravity)},
		{"GD2 lb ft2", []string{"GD2lbft2", "GD2lbfft2"}, PoundFoot2 / gd2PerJ},
	},
	"speed": {
		{"m/s", []string{"m/s", "mps"}, 1},
		{"m/min", []string{"m/min", "mpm"}, 1.0 / 60},
		{"mm/s", []string{"mm/s"}, 1e-3},
		{"km/h", []string{"km/h", "kph"}, 1 / 3.6},
		{"ft/min", []string{"ft/min", "fpm", "feet/min"}, Foot / 60},
		{"ft/s", []string{"ft/s", "feet/s"}, Foot},
	},
	"acceleration": {
		{"m/s2", []string{"m/s2", "m/s/s"}, 1},
		{"ft/s2", []string{"ft/s2", "ft/s/s"}, Foot},
	},
	"rotational_speed": {
		{"rpm", []string{"rpm", "r/min", "rev/min", "1/min", "min-1", "U/min"}, 1},
		{"rev/s", []string{"rev/s", "r/s", "rps", "1/s", "s-1"}, 60},
		{"rad/s", []string{"rad/s"}, RadPerSecondRPM},
	},
	"angle": {
		{"deg", []string{"deg", "degree", "degrees", "°"}, 1},
		{"rad", []string{"rad", "radian", "radians"}, DegreesPerRad},
	},
	"time": {
		{"s", []string{"s", "sec", "secs", "second", "seconds"}, 1},
		{"ms", []string{"ms", "msec"}, 1e-3},
		{"min", []string{"min", "mins", "minute", "minutes"}, 60},
		{"h", []string{"h", "hr", "hrs", "hour", "hours"}, Hour},
	},
	"stress": {
		{"N/mm2", []string{"N/mm2", "Nmm-2"}, 1},
		{"MPa", []string{"MPa", "Mpa", "MPA"}, 1},
		{"psi", []string{"psi", "lbf/in2", "lb/in2"}, PSI},
		{"ksi", []string{"ksi"}, 1000 * PSI},
	},
	"energy": {
		{"J", []string{"J", "joule", "joules", "Nm"}, 1},
		{"kJ", []string{"kJ", "kNm"}, 1e3},
		{"MJ", []string{"MJ"}, 1e6},
		{"Wh", []string{"Wh"}, Hour},
		{"kWh", []string{"kWh"}, 1e3 * Hour},
		{"ft lbf", []string{"ftlbf", "lbfft", "ftlb", "lbft"}, PoundForceFoot},
	},
	"ratio": {
		{"1", []string{"", "1", "-"}, 1},
		{"%", []string{"%", "percent", "pct"}, 0.01},
	},
}

// caseSensitive lists lower-cased spellings that must be written with the right case:
// their case-folded form means something else (mN millinewton, T tesla or "ton",
// mPa millipascal, mJ millijoule) or collides with another unit of the same quantity.
var caseSensitive = map[string]bool{"mn": true, "t": true, "mpa": true, "mj": true}

// refusal is a spelling that is refused in a quantity, with the reason.
type refusal struct{ spelling, msg string }

// refused lists the units refused per quantity ("*" for every quantity): ambiguous, or a
// different quantity that people write by mistake. The message says what to write.
var refused = map[string][]refusal{
	"*": {
		{"ton", "ton is ambiguous: write short ton or long ton"},
		{"tons", "tons is ambiguous: write short ton or long ton"},
		{"T", "T is ambiguous (tonne, short ton or long ton): write t or tonne for 1000 kg, or short ton or long ton"},
	},
	"force": {
		{"t", "t is a mass, not a force: write tf (tonne-force), kN or kgf"},
		{"kg", "kg is a mass, not a force: write kgf (kilogram-force) or N"},
		{"ton", "ton is ambiguous: write kN, tf (tonne-force) or kip"},
		{"tons", "tons is ambiguous: write kN, tf (tonne-force) or kip"},
		{"tonf", "tonf is ambiguous (short, long or metric ton-force): write kN, tf (tonne-force) or kip"},
	},
	"torque": {
		{"lb", "lb is not a torque: write lbf ft (lb ft is read as lbf ft) or lbf in"},
		{"lbf", "lbf is a force, not a torque: write lbf ft or lbf in"},
		{"N", "N is a force, not a torque: write N m"},
		{"kgm", "kg m is ambiguous: write kgf m (kilogram-force metre) or N m"},
	},
	"inertia": {
		{"kgfm2", "kgf m2 is the unit of GD² (4 × the moment of inertia): if the column holds GD², write GD2 in the header, e.g. \"Motor inertia GD2 [kgf m2]\"; a moment of inertia is in kg m2"},
		{"kpm2", "kp m2 is the unit of GD² (4 × the moment of inertia): if the column holds GD², write GD2 in the header, e.g. \"Motor inertia GD2 [kgf m2]\"; a moment of inertia is in kg m2"},
		{"Nm2", "N m2 is a unit of GD² (4 × the weight moment of inertia): if the column holds GD², write GD2 in the header, e.g. \"Motor inertia GD2 [N m2]\"; a moment of inertia is in kg m2"},
		{"GD2", "GD2 needs its unit: write GD2 kgf m2, GD2 kg m2, GD2 N m2 or GD2 lb ft2"},
	},
}

// Error is a unit that cannot be used for a quantity. Its message says what to write.
type Error struct {
	Quantity  string
	Unit      string // as given
	Ambiguous bool   // the unit is refused as ambiguous (or as a likely mistake)
	msg       string
}

func (e *Error) Error() string { return e.msg }

// ErrUnknownQuantity is returned for a quantity the package does not know.
var ErrUnknownQuantity = errors.New("unknown quantity")

// Quantities returns the quantities Factor accepts.
func Quantities() []string { return append([]string(nil), order...) }

// SI returns the unit Factor converts the quantity to ("kg" for mass, "rev/min" for
// rotational speed, "1" for a ratio), or "" for an unknown quantity.
func SI(quantity string) string { return siUnits[quantity] }

// Accepted returns the units accepted for a quantity, in their display spelling.
func Accepted(quantity string) []string {
	us := table[quantity]
	out := make([]string, 0, len(us))
	for _, u := range us {
		out = append(out, u.name)
	}
	return out
}

// Factor returns the number a value written in unit must be multiplied by to give the
// quantity in the unit SI(quantity) returns: SI value = cell × Factor.
//
// Matching ignores spaces and accepts "·", "*", "." or a space as the multiplication
// sign and "²", "^2" or "2" as the square: "kg m2", "kg·m²", "kg*m^2" and "KG M2" are the
// same. Case is ignored except where the folded spelling means something else: "MN"
// (meganewton, not mN), "MPa", "t" (tonne; "T" is refused). An empty unit is accepted
// only for a ratio (a pure number).
//
// Sources: NIST SP 811 (2008) appendix B for every non-SI unit (exact values, see the
// constants); hp = 550 ft·lbf/s; PS/CV = 75 kgf·m/s; GD² = 4 J (G the weight in kgf, D
// the diameter of gyration, so GD² in kgf m² is numerically 4 × J in kg m²).
func Factor(quantity, unitText string) (float64, error) {
	us, ok := table[quantity]
	if !ok {
		return 0, fmt.Errorf("%w %q", ErrUnknownQuantity, quantity)
	}
	n := norm(unitText)
	shown := strings.TrimSpace(unitText)
	if n == "" && quantity != "ratio" {
		return 0, &Error{Quantity: quantity, Unit: unitText,
			msg: fmt.Sprintf("no unit given for a %s: write one of %s", describe(quantity), list(quantity))}
	}
	if strings.Contains(n, "GD2") && quantity != "inertia" {
		return 0, &Error{Quantity: quantity, Unit: unitText, Ambiguous: true,
			msg: fmt.Sprintf("%s: GD2 applies only to a moment of inertia; a %s takes %s", shown, describe(quantity), list(quantity))}
	}
	// Exact spelling first, then refusals, then the case-folded spelling.
	if f, ok := lookup(us, n, false); ok {
		return f, nil
	}
	if msg, ok := refusalFor(quantity, n); ok {
		return 0, &Error{Quantity: quantity, Unit: unitText, Ambiguous: true, msg: msg}
	}
	if !caseSensitive[strings.ToLower(n)] {
		if f, ok := lookup(us, n, true); ok {
			return f, nil
		}
	}
	if anyCase(us, n) {
		return 0, &Error{Quantity: quantity, Unit: unitText, Ambiguous: true,
			msg: fmt.Sprintf("%s: mind the case, a %s takes %s", shown, describe(quantity), list(quantity))}
	}
	if other := quantityOf(n, quantity); other != "" {
		return 0, &Error{Quantity: quantity, Unit: unitText,
			msg: fmt.Sprintf("%s is a unit of %s, not of %s: write one of %s", shown, describe(other), describe(quantity), list(quantity))}
	}
	return 0, &Error{Quantity: quantity, Unit: unitText,
		msg: fmt.Sprintf("unknown unit %q for a %s: write one of %s", shown, describe(quantity), list(quantity))}
}

// refusalFor returns the refusal message for n in quantity, if n is refused there.
func refusalFor(quantity, n string) (string, bool) {
	for _, q := range []string{quantity, "*"} {
		for _, r := range refused[q] {
			if r.spelling == n || (!caseSensitive[strings.ToLower(r.spelling)] && strings.EqualFold(r.spelling, n)) {
				return r.msg, true
			}
		}
	}
	return "", false
}

// anyCase reports whether n matches a spelling of us when case is ignored entirely.
func anyCase(us []unit, n string) bool {
	for _, u := range us {
		for _, s := range u.spelling {
			if strings.EqualFold(s, n) {
				return true
			}
		}
	}
	return false
}

// lookup finds n among the spellings of us; fold ignores case except for the
// case-sensitive spellings.
func lookup(us []unit, n string, fold bool) (float64, bool) {
	for _, u := range us {
		for _, s := range u.spelling {
			if s == n || (fold && !caseSensitive[strings.ToLower(s)] && strings.EqualFold(s, n)) {
				return u.factor, true
			}
		}
	}
	return 0, false
}

// quantityOf returns another quantity that accepts n, "" when none.
func quantityOf(n, not string) string {
	for _, q := range order {
		if q == not || q == "ratio" {
			continue
		}
		if _, ok := lookup(table[q], n, !caseSensitive[strings.ToLower(n)]); ok {
			return q
		}
	}
	return ""
}

func describe(quantity string) string { return strings.ReplaceAll(quantity, "_", " ") }

func list(quantity string) string {
	a := Accepted(quantity)
	if len(a) == 0 {
		return ""
	}
	if len(a) == 1 {
		return a[0]
	}
	return strings.Join(a[:len(a)-1], ", ") + " or " + a[len(a)-1]
}

// norm puts a unit in the form the table uses: no spaces, "²"/"^2" → "2", "·", "*", ".",
// "×" and a hyphen between letters removed (read as multiplication), "°" kept,
// "⁻¹"/"^-1" → "-1".
func norm(s string) string {
	r := strings.NewReplacer(
		"²", "2", "³", "3", "^2", "2", "^3", "3", "^-1", "-1", "⁻¹", "-1", "^-2", "-2", "⁻²", "-2",
		"·", "", "⋅", "", "∙", "", "*", "", "×", "", ".", "",
	)
	s = r.Replace(strings.TrimSpace(s))
	var b strings.Builder
	rs := []rune(s)
	for i, c := range rs {
		if unicode.IsSpace(c) || c == '_' {
			continue
		}
		// A hyphen between letters is a multiplication sign: "ft-lbf", "kN-m".
		if c == '-' && i > 0 && i+1 < len(rs) && unicode.IsLetter(rs[i-1]) && unicode.IsLetter(rs[i+1]) {
			continue
		}
		b.WriteRune(c)
	}
	s = b.String()
	// "GD2" in any case, at the start, marks a GD² column.
	if len(s) >= 3 && strings.EqualFold(s[:3], "gd2") {
		s = "GD2" + s[3:]
	}
	return s
}
