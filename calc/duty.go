package calc

// Duty classification of hoisting mechanisms: ISO 4301-1:1986 and FEM 9.511.
//
// Conventions fixed here (standards.md "Duty classification"):
//
//   - The load spectrum is carried as the ISO factor km = Σ (P_i/P_max)³ · (t_i/T), a number
//     in (0, 1]. FEM 9.511 writes the cube root k = ∛km; convert with KmFromCubicMean
//     and CubicMeanFromKm. Classes are decided on km with the ISO limits 0.125 / 0.25 /
//     0.5 / 1.0. The FEM limits on k, 0.50 / 0.63 / 0.80 / 1.00, are close to but not
//     exactly those cube roots (∛0.125 = 0.500, ∛0.25 = 0.630, ∛0.5 = 0.794), so for k in
//     (0.794, 0.80] FEM reads L3 where the ISO limit on km reads L4; this tool reads L4
//     (the heavier class).
//   - Classes are small integers: utilisation class T0…T9 is 0…9, load spectrum class
//     L1…L4 is 1…4, mechanism group M1…M8 is 1…8 (FEM 1Dm…5m are the same 1…8).

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// dutyLimitTol is the relative tolerance at class limits: a value within one part in 10⁹
// of a limit counts as on it, so that a km summed from a spectrum or an hour total
// converted between units does not jump a class through rounding.
const dutyLimitTol = 1e-9

// spectrumFactors are the nominal ISO 4301-1 spectrum factors km of L1…L4, which are also
// the classes' upper limits (standards.md: ISO 4301-1, memory high).
var spectrumFactors = [...]float64{0.125, 0.25, 0.5, 1.0}

// utilisationLimits are the upper limits of total duration of use of T0…T8, hours
// (standards.md: ISO 4301-1 / FEM 9.511; T0 memory, T1–T8 seen). T9 is open-ended above
// 50 000 h.
var utilisationLimits = [...]float64{200, 400, 800, 1600, 3200, 6300, 12500, 25000, 50000}

// SpectrumFactor returns the nominal spectrum factor km of ISO 4301-1 load spectrum class
// L1…L4 (class 1…4): 0.125, 0.25, 0.5, 1.0. ok is false for any other class.
// Source: ISO 4301-1:1986 (standards.md, memory high).
func SpectrumFactor(class int) (km float64, ok bool) {
	if class < 1 || class > len(spectrumFactors) {
		return 0, false
	}
	return spectrumFactors[class-1], true
}

// SpectrumClass returns the ISO 4301-1 load spectrum class (1…4 for L1…L4) of a spectrum
// factor km = Σ (P_i/P_max)³ · (t_i/T): L1 km ≤ 0.125, L2 ≤ 0.25, L3 ≤ 0.5, L4 ≤ 1.
// A km within one part in 10⁹ of a limit counts as on it (the lighter class). It returns
// 0 when km is not in (0, 1] (NaN included): km > 1 would need loads above P_max.
//
// FEM 9.511 states the same classes on the cube root k = ∛km with limits 0.50 / 0.63 /
// 0.80 / 1.00; convert with KmFromCubicMean first (see the package note on the band
// 0.794 < k ≤ 0.80).
func SpectrumClass(km float64) int {
	if !(km > 0 && km <= 1*(1+dutyLimitTol)) {
		return 0
	}
	for i, lim := range spectrumFactors {
		if km <= lim*(1+dutyLimitTol) {
			return i + 1
		}
	}
	return 0
}

// KmFromCubicMean converts the FEM 9.511 cubic mean load factor k to the ISO 4301-1
// spectrum factor km = k³ (k in [0, 1]).
func KmFromCubicMean(k float64) float64 { return k * k * k }

// CubicMeanFromKm converts the ISO 4301-1 spectrum factor km to the FEM 9.511 cubic mean
// load factor k = ∛km.
func CubicMeanFromKm(km float64) float64 { return math.Cbrt(km) }

// UtilisationClass returns the ISO 4301-1 class of utilisation (0…9 for T0…T9) of a total
// duration of use in hours: T0 ≤ 200 h, T1 ≤ 400, T2 ≤ 800, T3 ≤ 1 600, T4 ≤ 3 200,
// T5 ≤ 6 300, T6 ≤ 12 500, T7 ≤ 25 000, T8 ≤ 50 000, T9 above 50 000 h (open-ended).
// A total within one part in 10⁹ of a limit counts as on it. It returns −1 for a negative
// or NaN total. Source: ISO 4301-1:1986, FEM 9.511 (standards.md: T1–T8 seen, T0 and the
// open end of T9 memory).
func UtilisationClass(totalHours float64) int {
	if !(totalHours >= 0) {
		return -1
	}
	for i, lim := range utilisationLimits {
		if totalHours <= lim*(1+dutyLimitTol) {
			return i
		}
	}
	return len(utilisationLimits) // T9
}

// MechanismGroup returns the ISO 4301-1:1986 mechanism group (1…8 for M1…M8) of a class
// of utilisation T0…T9 (tClass 0…9) and a load spectrum class L1…L4 (lClass 1…4).
// The published table (standards.md, seen for T1–T7, memory elsewhere) is
//
//	L \ T  T0 T1 T2 T3 T4 T5 T6 T7 T8 T9
//	L1     –  –  M1 M2 M3 M4 M5 M6 M7 M8
//	L2     –  M1 M2 M3 M4 M5 M6 M7 M8 –
//	L3     M1 M2 M3 M4 M5 M6 M7 M8 –  –
//	L4     M2 M3 M4 M5 M6 M7 M8 –  –  –
//
// in which each step of T or of L is one group: M = T + L − 2. The "–" corners have no
// group in the table; they are clamped to M1 (light corner) or M8 (heavy corner) and
// reported with clamped = true (standards.md, memory medium). group is 0 when tClass or
// lClass is out of range.
func MechanismGroup(tClass, lClass int) (group int, clamped bool) {
	if tClass < 0 || tClass > 9 || lClass < 1 || lClass > 4 {
		return 0, false
	}
	g := tClass + lClass - 2
	switch {
	case g < 1:
		return 1, true
	case g > 8:
		return 8, true
	}
	return g, false
}

// femClasses are the FEM 9.511 mechanism classes in the order of ISO M1…M8
// (standards.md: seen, two sources).
var femClasses = [...]string{"1Dm", "1Cm", "1Bm", "1Am", "2m", "3m", "4m", "5m"}

// ParseDutyGroup reads a duty group: an ISO 4301-1 mechanism group "M1"…"M8" or an FEM
// 9.511 mechanism class "1Dm", "1Cm", "1Bm", "1Am", "2m", "3m", "4m", "5m" (= M1…M8).
// Case, surrounding space and space between the parts are ignored ("m5", " M 5 ",
// "1am"). group is 1…8; fem reports an FEM class; ok is false for anything else.
func ParseDutyGroup(s string) (group int, fem bool, ok bool) {
	if len(s) == 2 && (s[0] == 'M' || s[0] == 'm') && s[1] >= '1' && s[1] <= '8' {
		return int(s[1] - '0'), false, true // the common "M5", without building a string
	}
	t := strings.ToLower(strings.Join(strings.Fields(s), ""))
	if t == "" {
		return 0, false, false
	}
	if t[0] == 'm' {
		n, err := strconv.Atoi(t[1:])
		if err != nil || n < 1 || n > 8 || len(t) != 2 {
			return 0, false, false
		}
		return n, false, true
	}
	for i, c := range femClasses {
		if t == strings.ToLower(c) {
			return i + 1, true, true
		}
	}
	return 0, false, false
}

// DutyGroupName returns "M1"…"M8" for group 1…8, or "" otherwise.
func DutyGroupName(group int) string {
	if group < 1 || group > 8 {
		return ""
	}
	return "M" + strconv.Itoa(group)
}

// FEMClassName returns the FEM 9.511 class "1Dm"…"5m" of group 1…8, or "" otherwise.
func FEMClassName(group int) string {
	if group < 1 || group > 8 {
		return ""
	}
	return femClasses[group-1]
}

// DailyRunningHours is the average daily running time of a hoisting mechanism,
//
//	t = 2 · N · H · T / (V · 60)   [h/day]
//
// with N cycles per hour, H mean lift [m] (each cycle hoists and lowers it, hence 2),
// T working hours a day [h] and V hoisting speed [m/min]. Source: FEM 9.511
// (standards.md, seen). It returns NaN unless V > 0 and N, H, T ≥ 0.
func DailyRunningHours(cyclesPerHour, meanLiftM, hoursPerDay, speedMPerMin float64) float64 {
	if !(speedMPerMin > 0 && cyclesPerHour >= 0 && meanLiftM >= 0 && hoursPerDay >= 0) {
		return math.NaN()
	}
	return 2 * cyclesPerHour * meanLiftM * hoursPerDay / (speedMPerMin * 60)
}

// Usage is what the duty group is derived from. The total duration of use is either
// given (TotalHours > 0) or derived as
//
//	total = t · WorkingDaysPerYear · DesignYears,  t = DailyRunningHours(N, H, T, V)
//
// where the working days a year and the design years come from the rule table (common
// practice, no published source). The spectrum is a class (SpectrumClass 1…4) or a factor
// (Km in (0, 1]); when both are given they must agree.
type Usage struct {
	TotalHours float64 // total duration of use [h]; > 0 takes precedence over the daily inputs

	CyclesPerHour float64 // N, hoisting cycles per hour
	MeanLiftM     float64 // H, mean hook travel per lift [m]
	HoursPerDay   float64 // T, working hours a day [h]
	SpeedMPerMin  float64 // V, hoisting speed [m/min]

	WorkingDaysPerYear float64 // from the rule table [d/a]
	DesignYears        float64 // from the rule table [a]

	SpectrumClass int     // L1…L4 as 1…4; 0 = not given
	Km            float64 // ISO spectrum factor; 0 = not given
}

// DutyDerivation is a mechanism group derived from usage, with the record of how.
type DutyDerivation struct {
	Group      int     // 1…8 for M1…M8
	TClass     int     // 0…9 for T0…T9
	LClass     int     // 1…4 for L1…L4
	TotalHours float64 // total duration of use [h]
	DailyHours float64 // average daily running time [h/day]; NaN when the total was given
	Clamped    bool    // a "–" corner of the ISO 4301-1 table, clamped to M1 or M8
	Basis      string  // the derivation in words, for the record
	Steps      []Step
}

// DeriveDuty derives the ISO 4301-1 mechanism group from usage: total duration of use →
// class of utilisation T (UtilisationClass), spectrum → load spectrum class L
// (SpectrumClass), (T, L) → group (MechanismGroup). It returns a *RangeError naming the
// field when an input is missing, out of range or inconsistent (a running time above the
// working time, a class that disagrees with the factor).
func DeriveDuty(u Usage) (DutyDerivation, error) {
	var d DutyDerivation
	var spec, total string

	// Spectrum.
	switch {
	case u.Km != 0:
		if !(u.Km > 0 && u.Km <= 1*(1+dutyLimitTol)) {
			return d, &RangeError{Field: "spectrum_factor", Msg: fmt.Sprintf("spectrum factor km must be in (0, 1] (got %s)", dutyNum(u.Km))}
		}
		d.LClass = SpectrumClass(u.Km)
		if u.SpectrumClass != 0 && u.SpectrumClass != d.LClass {
			return d, &RangeError{Field: "load_spectrum", Msg: fmt.Sprintf("load spectrum L%d disagrees with spectrum factor km = %s (class L%d)", u.SpectrumClass, dutyNum(u.Km), d.LClass)}
		}
		spec = fmt.Sprintf("km %s → L%d", dutyNum(u.Km), d.LClass)
	case u.SpectrumClass != 0:
		if _, ok := SpectrumFactor(u.SpectrumClass); !ok {
			return d, &RangeError{Field: "load_spectrum", Msg: fmt.Sprintf("load spectrum class must be L1 to L4 (got %d)", u.SpectrumClass)}
		}
		d.LClass = u.SpectrumClass
		spec = fmt.Sprintf("L%d given", d.LClass)
	default:
		return d, &RangeError{Field: "load_spectrum", Msg: "no load spectrum class or spectrum factor to derive the duty group from"}
	}

	// Total duration of use.
	d.DailyHours = math.NaN()
	switch {
	case u.TotalHours > 0:
		d.TotalHours = u.TotalHours
		d.Steps = append(d.Steps, Step{Symbol: "T_total", Formula: "given", Numbers: dutyNum(u.TotalHours), Value: u.TotalHours, Unit: "h"})
		total = fmt.Sprintf("total duration of use %s h given", dutyNum(u.TotalHours))
	case u.TotalHours < 0 || math.IsNaN(u.TotalHours):
		return d, &RangeError{Msg: fmt.Sprintf("total duration of use must be ≥ 0 (got %s)", dutyNum(u.TotalHours))}
	default:
		for _, in := range []struct {
			v     float64
			field string
			what  string
		}{
			{u.CyclesPerHour, "cycles_per_hour", "cycles per hour"},
			{u.MeanLiftM, "mean_lift", "mean lift"},
			{u.HoursPerDay, "hours_per_day", "working hours per day"},
			{u.SpeedMPerMin, "hoist_speed", "hoisting speed"},
			{u.WorkingDaysPerYear, "", "working days a year (rule table)"},
			{u.DesignYears, "", "design years (rule table)"},
		} {
			if !(in.v > 0) || math.IsInf(in.v, 0) {
				return d, &RangeError{Field: in.field, Msg: fmt.Sprintf("%s must be > 0 to derive the duty group (got %s)", in.what, dutyNum(in.v))}
			}
		}
		if u.HoursPerDay > 24 {
			return d, &RangeError{Field: "hours_per_day", Msg: fmt.Sprintf("working hours per day must be ≤ 24 (got %s)", dutyNum(u.HoursPerDay))}
		}
		// Fraction of working time the hoist runs: 2 N H / (60 V) ≤ 1.
		if frac := 2 * u.CyclesPerHour * u.MeanLiftM / (60 * u.SpeedMPerMin); frac > 1*(1+dutyLimitTol) {
			return d, &RangeError{Field: "cycles_per_hour", Msg: fmt.Sprintf("%s cycles an hour of 2 × %s m at %s m/min need %s min of running an hour, more than 60",
				dutyNum(u.CyclesPerHour), dutyNum(u.MeanLiftM), dutyNum(u.SpeedMPerMin), dutyNum(frac*60))}
		}
		d.DailyHours = DailyRunningHours(u.CyclesPerHour, u.MeanLiftM, u.HoursPerDay, u.SpeedMPerMin)
		d.TotalHours = d.DailyHours * u.WorkingDaysPerYear * u.DesignYears
		d.Steps = append(d.Steps,
			Step{Symbol: "t", Formula: "2·N·H·T/(V·60)",
				Numbers: fmt.Sprintf("2·%s·%s·%s/(%s·60)", dutyNum(u.CyclesPerHour), dutyNum(u.MeanLiftM), dutyNum(u.HoursPerDay), dutyNum(u.SpeedMPerMin)),
				Value:   d.DailyHours, Unit: "h/day"},
			Step{Symbol: "T_total", Formula: "t · days a year · years",
				Numbers: fmt.Sprintf("%s·%s·%s", dutyNum(d.DailyHours), dutyNum(u.WorkingDaysPerYear), dutyNum(u.DesignYears)),
				Value:   d.TotalHours, Unit: "h"})
		total = fmt.Sprintf("running time 2·N·H·T/(V·60) = %s h/day × %s days a year × %s years = %s h",
			dutyNum(d.DailyHours), dutyNum(u.WorkingDaysPerYear), dutyNum(u.DesignYears), dutyNum(d.TotalHours))
	}
	d.TClass = UtilisationClass(d.TotalHours)
	total += fmt.Sprintf(" → T%d", d.TClass)

	d.Group, d.Clamped = MechanismGroup(d.TClass, d.LClass)
	g := fmt.Sprintf("ISO 4301-1 T%d/L%d → M%d", d.TClass, d.LClass, d.Group)
	if d.Clamped {
		g += " (outside the table, clamped)"
	}
	d.Basis = total + "; " + spec + "; " + g
	d.Steps = append(d.Steps,
		Step{Symbol: "T class", Formula: "ISO 4301-1 utilisation class of T_total", Numbers: dutyNum(d.TotalHours) + " h", Value: float64(d.TClass), Unit: "T"},
		Step{Symbol: "L class", Formula: "ISO 4301-1 load spectrum class", Numbers: spec, Value: float64(d.LClass), Unit: "L"},
		Step{Symbol: "group", Formula: "ISO 4301-1 table (T, L)", Numbers: fmt.Sprintf("T%d, L%d", d.TClass, d.LClass), Value: float64(d.Group), Unit: "M"})
	return d, nil
}

// dutyNum formats a number for a calculation record: six significant digits, no
// exponent for ordinary magnitudes.
func dutyNum(x float64) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return strconv.FormatFloat(x, 'g', -1, 64)
	}
	r, err := strconv.ParseFloat(strconv.FormatFloat(x, 'g', 6, 64), 64)
	if err != nil {
		r = x
	}
	if a := math.Abs(r); a != 0 && (a < 1e-4 || a >= 1e12) {
		return strconv.FormatFloat(r, 'g', -1, 64)
	}
	return strconv.FormatFloat(r, 'f', -1, 64)
}
