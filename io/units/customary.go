package units

// usCustomary lists, for the default units of the register's schema that have one, the
// US customary unit that hoistfleet's US register template (io/blank) and the
// synthetic register generator (cmd/hoistgen) write instead. Units without an entry
// (rpm, deg, s, h, %, 1, N/mm2) are written as in SI: they are used unchanged in US
// practice, or (N/mm2 for the rope grade) have no US unit the register reader
// understands.
var usCustomary = []struct{ quantity, si, us string }{
	{"mass", "t", "lb"},
	{"mass", "kg", "lb"},
	{"force", "kN", "lbf"},
	{"force", "N", "lbf"},
	{"length", "mm", "in"},
	{"length", "m", "ft"},
	{"torque", "N m", "lbf ft"},
	{"power", "kW", "hp"},
	{"inertia", "kg m2", "lb ft2"},
	{"speed", "m/min", "ft/min"},
	{"acceleration", "m/s2", "ft/s2"},
	{"energy", "kJ", "ft lbf"},
}

// USCustomary returns the US customary unit written instead of unit, a unit of
// quantity as the schema spells it ("t" → "lb", "m/min" → "ft/min"), and whether
// there is one; without one the unit is written as it is.
func USCustomary(quantity, unit string) (string, bool) {
	for _, c := range usCustomary {
		if c.quantity == quantity && c.si == unit {
			return c.us, true
		}
	}
	return "", false
}

// Convert expresses v, a quantity written in unit from, in unit to: v × Factor(from) /
// Factor(to), or v itself when the two factors are equal (the same unit spelled twice).
func Convert(v float64, quantity, from, to string) (float64, error) {
	f, err := Factor(quantity, from)
	if err != nil {
		return 0, err
	}
	t, err := Factor(quantity, to)
	if err != nil {
		return 0, err
	}
	if f == t {
		return v, nil
	}
	return v * f / t, nil
}
