package calc

import "math"

// Plausibility bounds: ranges outside which a register value is almost certainly a unit
// slip (a force in N in a kN column, a power in W in a kW column), not a real hoist. They
// are deliberately wide: they spot slips by factors of ten and more, they do not judge a
// design. The checks that use such a value report an error naming the likely unit.

// MBFPerD2Range is the range of a steel wire rope's minimum breaking force divided by
// its nominal diameter squared [N/m²]. EN 12385-4: F_min = d² R K / 1000 kN (d in mm, R in
// N/mm²), with K 0.293–0.359 for the stranded constructions in the project's standards
// notes and grades 1770–2160 N/mm² (seen), so F_min / d² = 0.52–0.78 kN/mm². Rotation-
// resistant and compacted ropes and grades from 1370 to 2450 N/mm² widen that to about
// K 0.28–0.45 (memory, low); the range is that widened band halved below and doubled above:
// 0.5 × 0.28 × 1370 = 192 N/mm² to 2 × 0.45 × 2450 = 2205 N/mm² (common practice, no
// published source: a band for spotting slips).
func MBFPerD2Range() (lo, hi float64) { return 0.5 * 0.28 * 1370e6, 2 * 0.45 * 2450e6 }

// MaxPowerRatio is the largest plausible ratio of a hoist motor's rated power to the
// power that lifts the rated load and hook block at the rated speed, m g v (no losses, so
// the ratio is overstated rather than understated). Hoist motors are sized at about
// 1.1–2 × m g v / η; a ratio over 100 means the power, the rated load or the speed is in
// the wrong unit (common practice, no published source).
const MaxPowerRatio = 100

// MaxDrumRatio is the largest plausible drum pitch diameter over rope diameter, D/d.
// ISO 4308-1 asks for h1 = 11.2–25 (M1–M8, memory, medium); drums are seldom built above
// D/d 40. Over 100, the drum or the rope diameter is in the wrong unit (common practice,
// no published source).
const MaxDrumRatio = 100

// MaxBrakeRatio is the largest plausible ratio of one holding brake's rated torque to the
// motor's rated torque M_r = P/ω for a brake on the motor shaft. Brakes are sized at about
// 1.25–3 × M_r; over 50, the brake torque or the motor data is in the wrong unit (common
// practice, no published source).
const MaxBrakeRatio = 50

// SlipFactor returns the power of ten by which a value v lies outside [lo, hi]: the
// factor f (10, 100, 1000, …) such that v / f (above) or v × f (below) is nearest the
// range's geometric middle, or 1 when v is inside the range or not a positive number.
// A message can then say "check the unit: v / f?".
func SlipFactor(v, lo, hi float64) float64 {
	if !(v > 0) || math.IsInf(v, 0) || (v >= lo && v <= hi) {
		return 1
	}
	mid := math.Sqrt(lo * hi)
	return math.Pow(10, math.Round(math.Abs(math.Log10(v/mid))))
}

// BrakeWorkRange bounds one brake's permitted friction work per stop [J]: the smallest
// industrial hoist brakes are rated for some hundreds of joules a stop, the largest for
// some megajoules (common practice, no published source): 50 J to 100 MJ, widened, so
// that a value in J written in a kJ column (or kJ in a J column) is caught.
func BrakeWorkRange() (lo, hi float64) { return 50, 100e6 }
