package sinktest

import (
	"math"
	"math/rand/v2"
	"strings"

	"hoistfleet/calc"
	"hoistfleet/fleet"
)

// Random results for the differential tests: texts made of the characters that matter
// to CSV (separators, quotes, line ends, formula starts, spaces, multi-byte runes and
// invalid UTF-8) and numbers at the edges of float formatting.

var TextPieces = []string{"", "a", "H-01", "pass", ",", ";", "\t", " ", "\"", "\r", "\n", "\r\n", "=", "+", "-", "@", "'",
	"é", "€", "≥", "²", "°", "\uFFFD", "\xff", "\xe2\x82", "0", "1.5", "e", "n/a", "; ", "a=b", "Zp ≥ 5.6 (M6)",
	"ISO 4308-1 (edition not recorded), coefficient h1, drums [memory, medium]", "\u2028", "\u2029", "<", ">", "&", "\\", "\x00", "\x1f", "\x7f"}

// RandText joins up to 6 random pieces.
func RandText(rng *rand.Rand) string {
	n := rng.IntN(7)
	var sb strings.Builder
	for range n {
		sb.WriteString(TextPieces[rng.IntN(len(TextPieces))])
	}
	return sb.String()
}

// pickText is RandText most of the time and one of a few fixed texts otherwise, so that
// the writer's caches see repeats as well as new texts.
func pickText(rng *rand.Rand, fixed ...string) string {
	if rng.IntN(3) > 0 && len(fixed) > 0 {
		return fixed[rng.IntN(len(fixed))]
	}
	return RandText(rng)
}

var EdgeFloats = []float64{0, math.Copysign(0, -1), 1, -1, 0.1, 0.2, 1.0 / 3, 2.0 / 3, 100.0 / 365, 9.80665, 6480.5, 1e-4, 1e-5, 9.99e-5,
	1e-6, 9.99e-7, 1e-7, 1.5e-9, 123456, 999999, 1e6, 1e6 - 0.5, -999999, -1e6, 123456789, 1e15, 1e20, 1e21, 1e22, 1e-300,
	math.SmallestNonzeroFloat64, 2.2250738585072014e-308, math.MaxFloat64, -math.MaxFloat64, 1 << 53, 1<<53 + 2,
	0.30000000000000004, 16257.708885941633, 1.2777814192843628e-05, math.NaN(), math.Inf(1), math.Inf(-1)}

// RandFloat is an edge value, a whole number, or random bits.
func RandFloat(rng *rand.Rand) float64 {
	switch rng.IntN(5) {
	case 0:
		return EdgeFloats[rng.IntN(len(EdgeFloats))]
	case 1:
		return float64(rng.IntN(4_000_000) - 2_000_000)
	case 2:
		return math.Float64frombits(rng.Uint64())
	case 3:
		return rng.NormFloat64() * math.Pow(10, float64(rng.IntN(30)-15))
	}
	return math.Round(rng.Float64()*1e6) / math.Pow(10, float64(rng.IntN(8)))
}

func randStatus(rng *rand.Rand) fleet.Status {
	if rng.IntN(50) == 0 {
		return fleet.Status(6 + rng.IntN(3)) // not a known status: written as Status(n)
	}
	return fleet.Status(rng.IntN(6))
}

func randChecks(rng *rand.Rand, n int) []fleet.CheckResult {
	cs := make([]fleet.CheckResult, n)
	for i := range cs {
		c := &cs[i]
		c.ID = pickText(rng, fleet.CheckIDs...)
		c.Status = randStatus(rng)
		c.Demand, c.Capacity, c.Utilisation, c.Margin, c.LimitRatedLoadKg = RandFloat(rng), RandFloat(rng), RandFloat(rng), RandFloat(rng), RandFloat(rng)
		c.Unit = pickText(rng, "1", "N m", "W", "m", "d", "deg")
		c.Rule = pickText(rng, "drum.h1 = 16 (M4)", "steady hoisting torque ≤ rated motor torque M_r = P / ω_m")
		c.Source = pickText(rng, "ISO 4308-1 (edition not recorded), coefficient h1, drums [memory, medium]", "29 CFR 1910.179(h)(2); ASME B30.2 [law]")
		if rng.IntN(3) == 0 {
			c.Message = RandText(rng)
		}
		for range rng.IntN(8) {
			f := calc.Figure{Name: pickText(rng, "rope_tension_n", "drum_ratio", "radius_m"), Value: RandFloat(rng)}
			if rng.IntN(6) == 0 {
				f.Text = RandText(rng)
			}
			c.Figures = append(c.Figures, f)
		}
		if rng.IntN(10) == 0 && len(c.Figures) > 1 {
			c.Figures = append(c.Figures, c.Figures[0]) // a repeated name
		}
		c.LoadDependent = rng.IntN(2) == 0
		c.RequiredCapacity, c.ReviewUtilisation = RandFloat(rng), RandFloat(rng)
		if rng.IntN(4) == 0 {
			c.ReviewRule = pickText(rng, "brake.factor = 1.6, brake.basis = hoisting", RandText(rng))
			c.ReviewSource = pickText(rng, "EN 14492-2 (power driven hoists), holding brake; edition not recorded [memory, low]", RandText(rng))
		}
	}
	return cs
}

func randTexts(rng *rand.Rand) []string {
	if rng.IntN(3) == 0 {
		return nil
	}
	s := make([]string, rng.IntN(4))
	for i := range s {
		s[i] = RandText(rng)
	}
	return s
}

// RandomResults returns n random results, rows counting from 2.
func RandomResults(seed uint64, n int) []*fleet.Result {
	rng := rand.New(rand.NewPCG(seed, 1))
	rs := make([]*fleet.Result, n)
	for i := range rs {
		a := &fleet.Asset{Index: i, Row: i + 2, ID: pickText(rng, "H-01", "G0000001")}
		switch rng.IntN(4) {
		case 0:
		case 1:
			a.Fields = map[string]fleet.Value{"site": {State: fleet.Bad, Text: "not written"}}
		default:
			a.Fields = map[string]fleet.Value{"site": {State: fleet.OK, Text: pickText(rng, "Millbrook Coil Centre", "North, yard \"B\"")}}
		}
		r := &fleet.Result{Asset: a,
			Evaluation: fleet.Evaluation{RatedLoadKg: RandFloat(rng), Status: randStatus(rng), WorstCheck: pickText(rng, fleet.CheckIDs...),
				MinMargin: RandFloat(rng)},
			Rating:       fleet.Rating{MaxRatedLoadKg: RandFloat(rng), MechanismCapacityKg: RandFloat(rng), GoverningCheck: pickText(rng, fleet.CheckIDs...), Note: pickText(rng, "")},
			Messages:     randTexts(rng),
			DefaultsUsed: randTexts(rng),
			Derived:      randTexts(rng),
		}
		if rng.IntN(8) > 0 {
			r.Checks = randChecks(rng, rng.IntN(20))
		}
		if rng.IntN(3) == 0 {
			p := &fleet.Evaluation{RatedLoadKg: RandFloat(rng), Status: randStatus(rng), WorstCheck: pickText(rng, fleet.CheckIDs...), MinMargin: RandFloat(rng)}
			if rng.IntN(2) == 0 && len(r.Checks) > 0 {
				p.Checks = append([]fleet.CheckResult(nil), r.Checks[:rng.IntN(len(r.Checks))]...)
				for j := range p.Checks {
					p.Checks[j].Status = randStatus(rng)
					p.Checks[j].Utilisation = RandFloat(rng)
				}
			} else {
				p.Checks = randChecks(rng, rng.IntN(4))
			}
			r.Proposed = p
		}
		rs[i] = r
	}
	return rs
}
