package calc_test

// Tests of duty classification, life, inspection and rope-wear checks are black-box
// (package calc_test): they use only the exported API the lead codes against.

import (
	"errors"
	"math"
	"strings"
	"testing"

	"hoistfleet/calc"
)

// approxEqual reports whether got and want agree within absTol or within relTol of the
// larger magnitude (the rule of gonum's scalar.EqualWithinAbsOrRel); two NaNs agree.
func approxEqual(got, want, absTol, relTol float64) bool {
	if math.IsNaN(got) || math.IsNaN(want) {
		return math.IsNaN(got) && math.IsNaN(want)
	}
	d := math.Abs(got - want)
	return d <= absTol || d <= relTol*math.Max(math.Abs(got), math.Abs(want))
}

// rangeField returns the Field of a *calc.RangeError, or fails the test.
func rangeField(t *testing.T, err error) string {
	t.Helper()
	var re *calc.RangeError
	if !errors.As(err, &re) {
		t.Fatalf("error = %v (%T), want *calc.RangeError", err, err)
	}
	return re.Field
}

func TestSpectrumFactor(t *testing.T) {
	tests := []struct {
		class  int
		want   float64
		wantOK bool
	}{
		// standards.md: ISO 4301-1 km of L1…L4, memory high.
		{1, 0.125, true},
		{2, 0.25, true},
		{3, 0.5, true},
		{4, 1.0, true},
		{0, 0, false},
		{5, 0, false},
		{-1, 0, false},
	}
	for _, tt := range tests {
		got, ok := calc.SpectrumFactor(tt.class)
		if ok != tt.wantOK || (ok && !approxEqual(got, tt.want, 0, 1e-15)) {
			t.Errorf("SpectrumFactor(%d) = %v, %v; want %v, %v", tt.class, got, ok, tt.want, tt.wantOK)
		}
	}
}

func TestSpectrumClass(t *testing.T) {
	tests := []struct {
		name string
		km   float64
		want int
	}{
		// Class limits: standards.md ISO 4301-1 km 0.125 / 0.25 / 0.5 / 1.0 (memory high);
		// a class's nominal factor is its upper limit.
		{"L1 upper limit", 0.125, 1},
		{"just above L1", 0.1251, 2},
		{"L2 upper limit", 0.25, 2},
		{"just above L2", 0.2501, 3},
		{"L3 upper limit", 0.5, 3},
		{"just above L3", 0.5001, 4},
		{"L4 upper limit", 1.0, 4},
		{"light", 0.01, 1},
		// km summed from a spectrum with rounding: 0.1+0.1+0.05 ≠ 0.25 in binary.
		{"rounded sum on L2 limit", 0.1 + 0.1 + 0.05, 2},
		{"zero", 0, 0},
		{"negative", -0.1, 0},
		{"above 1 (load above P_max)", 1.01, 0},
		{"NaN", math.NaN(), 0},
		// FEM 9.511 cube root k, converted: k = 0.50 is the L1 limit (standards.md, seen):
		// 0.5³ = 0.125 exactly.
		{"FEM k 0.50", calc.KmFromCubicMean(0.50), 1},
		// Two-step spectrum, computed by hand from km = Σ (P_i/P_max)³ t_i/T: full load
		// 10 % of the time, half load 90 %: 0.1 + 0.125·0.9 = 0.2125 → L2.
		{"two-step spectrum", 1*1*1*0.1 + 0.5*0.5*0.5*0.9, 2},
	}
	for _, tt := range tests {
		if got := calc.SpectrumClass(tt.km); got != tt.want {
			t.Errorf("%s: SpectrumClass(%v) = %d, want %d", tt.name, tt.km, got, tt.want)
		}
	}
}

func TestCubicMeanConversion(t *testing.T) {
	// standards.md: FEM 9.511 limits k = 0.50 / 0.63 / 0.80 / 1.00 (seen) correspond to the
	// ISO km limits 0.125 / 0.25 / 0.5 / 1 (memory high) through k = ∛km, within 0.01
	// (∛0.5 = 0.794 against the printed 0.80; computed).
	for _, c := range []struct{ km, femLimit float64 }{{0.125, 0.50}, {0.25, 0.63}, {0.5, 0.80}, {1, 1.00}} {
		if k := calc.CubicMeanFromKm(c.km); !approxEqual(k, c.femLimit, 0.01, 0) {
			t.Errorf("∛%v = %v, want %v within 0.01", c.km, k, c.femLimit)
		}
		if back := calc.KmFromCubicMean(calc.CubicMeanFromKm(c.km)); !approxEqual(back, c.km, 0, 1e-12) {
			t.Errorf("round trip of km %v = %v", c.km, back)
		}
	}
	// Documented divergence: FEM k = 0.80 is still L3 in FEM 9.511, but 0.8³ = 0.512 > 0.5
	// and the tool, deciding on km, reads L4 (the heavier class).
	if got := calc.SpectrumClass(calc.KmFromCubicMean(0.80)); got != 4 {
		t.Errorf("SpectrumClass(0.8³) = %d, want 4 (ISO km convention)", got)
	}
}

func TestUtilisationClass(t *testing.T) {
	// standards.md: ISO 4301-1 / FEM 9.511 class of utilisation, upper limits in hours:
	// T0 200 (memory), T1 400 … T8 50 000 (seen); T9 open-ended above 50 000 h (memory).
	limits := []float64{200, 400, 800, 1600, 3200, 6300, 12500, 25000, 50000}
	for i, lim := range limits {
		if got := calc.UtilisationClass(lim); got != i {
			t.Errorf("UtilisationClass(%v) = T%d, want T%d (upper limit inclusive)", lim, got, i)
		}
		if got := calc.UtilisationClass(lim * 1.0001); got != i+1 {
			t.Errorf("UtilisationClass(%v) = T%d, want T%d (just above the limit)", lim*1.0001, got, i+1)
		}
	}
	for _, tt := range []struct {
		h    float64
		want int
	}{
		{0, 0},
		{1e7, 9}, // T9 has no upper limit
		{-1, -1},
		{math.NaN(), -1},
		{6300.0000000001, 5}, // within 1e-9 relative of the T5 limit: on it
	} {
		if got := calc.UtilisationClass(tt.h); got != tt.want {
			t.Errorf("UtilisationClass(%v) = %d, want %d", tt.h, got, tt.want)
		}
	}
}

func TestMechanismGroup(t *testing.T) {
	// standards.md: the ISO 4301-1:1986 table, copied cell by cell (seen for T1–T7,
	// memory elsewhere); "–" corners clamped to M1 (light) or M8 (heavy), memory medium.
	table := [4][10]string{
		//  T0    T1    T2    T3    T4    T5    T6    T7    T8    T9
		{"–", "–", "M1", "M2", "M3", "M4", "M5", "M6", "M7", "M8"}, // L1
		{"–", "M1", "M2", "M3", "M4", "M5", "M6", "M7", "M8", "–"}, // L2
		{"M1", "M2", "M3", "M4", "M5", "M6", "M7", "M8", "–", "–"}, // L3
		{"M2", "M3", "M4", "M5", "M6", "M7", "M8", "–", "–", "–"},  // L4
	}
	cells := 0
	for li, row := range table {
		for tc, cell := range row {
			l := li + 1
			g, clamped := calc.MechanismGroup(tc, l)
			if cell == "–" {
				// Light corner (top left) clamps to M1, heavy corner (right) to M8.
				want := 8
				if tc <= 2 {
					want = 1
				}
				if g != want || !clamped {
					t.Errorf("MechanismGroup(T%d, L%d) = M%d, clamped %v; want M%d clamped", tc, l, g, clamped, want)
				}
			} else {
				if name := calc.DutyGroupName(g); name != cell || clamped {
					t.Errorf("MechanismGroup(T%d, L%d) = %s, clamped %v; want %s unclamped", tc, l, name, clamped, cell)
				}
			}
			cells++
		}
	}
	if cells != 40 {
		t.Fatalf("checked %d cells, want 40", cells)
	}
	for _, bad := range [][2]int{{-1, 1}, {10, 1}, {3, 0}, {3, 5}} {
		if g, c := calc.MechanismGroup(bad[0], bad[1]); g != 0 || c {
			t.Errorf("MechanismGroup(%d, %d) = %d, %v; want 0, false", bad[0], bad[1], g, c)
		}
	}
}

func TestParseDutyGroup(t *testing.T) {
	tests := []struct {
		in      string
		group   int
		fem, ok bool
	}{
		{"M5", 5, false, true},
		{"m5", 5, false, true},
		{" M 8 ", 8, false, true},
		{"M1", 1, false, true},
		// standards.md: FEM 9.511 1Dm 1Cm 1Bm 1Am 2m 3m 4m 5m = M1 … M8 (seen, two sources).
		{"1Dm", 1, true, true},
		{"1Cm", 2, true, true},
		{"1Bm", 3, true, true},
		{"1Am", 4, true, true},
		{"1am", 4, true, true},
		{"2m", 5, true, true},
		{"3M", 6, true, true},
		{"4m", 7, true, true},
		{"5m", 8, true, true},
		{"M0", 0, false, false},
		{"M9", 0, false, false},
		{"M55", 0, false, false},
		{"6m", 0, false, false},
		{"1Em", 0, false, false},
		{"A5", 0, false, false}, // crane group, not a mechanism group
		{"5", 0, false, false},
		{"", 0, false, false},
		{"M", 0, false, false},
		{"M-5", 0, false, false},
	}
	for _, tt := range tests {
		g, fem, ok := calc.ParseDutyGroup(tt.in)
		if g != tt.group || fem != tt.fem || ok != tt.ok {
			t.Errorf("ParseDutyGroup(%q) = %d, %v, %v; want %d, %v, %v", tt.in, g, fem, ok, tt.group, tt.fem, tt.ok)
		}
	}
	for _, g := range []int{0, 9} {
		if calc.DutyGroupName(g) != "" || calc.FEMClassName(g) != "" {
			t.Errorf("names of group %d: %q, %q; want empty", g, calc.DutyGroupName(g), calc.FEMClassName(g))
		}
	}
	// Names round-trip.
	for g := 1; g <= 8; g++ {
		if got, _, _ := calc.ParseDutyGroup(calc.FEMClassName(g)); got != g {
			t.Errorf("FEM class %q parses to %d, want %d", calc.FEMClassName(g), got, g)
		}
		if got, _, _ := calc.ParseDutyGroup(calc.DutyGroupName(g)); got != g {
			t.Errorf("ISO group %q parses to %d, want %d", calc.DutyGroupName(g), got, g)
		}
	}
}

func TestDailyRunningHours(t *testing.T) {
	// standards.md: t = 2·N·H·T/(V·60) h/day (FEM 9.511, seen).
	tests := []struct {
		name       string
		n, h, T, v float64
		want       float64
	}{
		// By hand: 2·20·5·8 / (10·60) = 1600/600 = 2.6667 h/day.
		{"by hand", 20, 5, 8, 10, 8.0 / 3},
		// Limiting case: 30 cycles of 10 m up and down at 10 m/min is 60 min of running an
		// hour, so the hoist runs the whole working day: t = T.
		{"always running", 30, 10, 16, 10, 16},
		// No cycles, no running.
		{"idle", 0, 10, 8, 10, 0},
		// Halving the speed doubles the running time (t ∝ 1/V): 2·20·5·8/(5·60).
		{"half speed", 20, 5, 8, 5, 16.0 / 3},
	}
	for _, tt := range tests {
		if got := calc.DailyRunningHours(tt.n, tt.h, tt.T, tt.v); !approxEqual(got, tt.want, 1e-12, 1e-12) {
			t.Errorf("%s: DailyRunningHours = %v, want %v", tt.name, got, tt.want)
		}
	}
	for _, bad := range [][4]float64{{20, 5, 8, 0}, {20, 5, 8, -1}, {-1, 5, 8, 10}, {20, -5, 8, 10}} {
		if got := calc.DailyRunningHours(bad[0], bad[1], bad[2], bad[3]); !math.IsNaN(got) {
			t.Errorf("DailyRunningHours(%v) = %v, want NaN", bad, got)
		}
	}
}

func TestDeriveDuty(t *testing.T) {
	tests := []struct {
		name    string
		u       calc.Usage
		group   int
		tc, lc  int
		total   float64
		clamped bool
	}{
		// T5 (3 200 < 6 000 ≤ 6 300 h) and L2 → M5 (standards.md ISO 4301-1 table, seen).
		{"given total", calc.Usage{TotalHours: 6000, SpectrumClass: 2}, 5, 5, 2, 6000, false},
		// Daily: 2·20·5·8/(10·60) = 8/3 h/day × 250 d × 10 a = 6 666.7 h (by hand) → T6;
		// km 0.25 → L2; T6/L2 → M6 (table).
		{"from daily running", calc.Usage{CyclesPerHour: 20, MeanLiftM: 5, HoursPerDay: 8, SpeedMPerMin: 10,
			WorkingDaysPerYear: 250, DesignYears: 10, Km: 0.25}, 6, 6, 2, 8.0 / 3 * 2500, false},
		// Class and km agreeing is fine: km 0.4 is L3; 800 h is T2; T2/L3 → M3.
		{"class and km agree", calc.Usage{TotalHours: 800, SpectrumClass: 3, Km: 0.4}, 3, 2, 3, 800, false},
		// T0/L1 is a "–" corner: clamped to M1.
		{"light corner", calc.Usage{TotalHours: 150, SpectrumClass: 1}, 1, 0, 1, 150, true},
		// T9/L4 is a "–" corner: clamped to M8.
		{"heavy corner", calc.Usage{TotalHours: 80000, Km: 1}, 8, 9, 4, 80000, true},
	}
	for _, tt := range tests {
		d, err := calc.DeriveDuty(tt.u)
		if err != nil {
			t.Errorf("%s: %v", tt.name, err)
			continue
		}
		if d.Group != tt.group || d.TClass != tt.tc || d.LClass != tt.lc || d.Clamped != tt.clamped || !approxEqual(d.TotalHours, tt.total, 1e-9, 1e-12) {
			t.Errorf("%s: got M%d T%d L%d %v h clamped %v; want M%d T%d L%d %v h clamped %v",
				tt.name, d.Group, d.TClass, d.LClass, d.TotalHours, d.Clamped, tt.group, tt.tc, tt.lc, tt.total, tt.clamped)
		}
		if !strings.Contains(d.Basis, calc.DutyGroupName(tt.group)) || (tt.clamped != strings.Contains(d.Basis, "clamped")) {
			t.Errorf("%s: basis %q does not name M%d / the clamping", tt.name, d.Basis, tt.group)
		}
		if len(d.Steps) == 0 {
			t.Errorf("%s: no steps", tt.name)
		}
	}

	bad := []struct {
		name  string
		u     calc.Usage
		field string
	}{
		{"no spectrum", calc.Usage{TotalHours: 1000}, "load_spectrum"},
		{"class disagrees with km", calc.Usage{TotalHours: 1000, SpectrumClass: 1, Km: 0.5}, "load_spectrum"},
		{"km above 1", calc.Usage{TotalHours: 1000, Km: 1.2}, "spectrum_factor"},
		{"class 5", calc.Usage{TotalHours: 1000, SpectrumClass: 5}, "load_spectrum"},
		{"no cycles", calc.Usage{MeanLiftM: 5, HoursPerDay: 8, SpeedMPerMin: 10, WorkingDaysPerYear: 250, DesignYears: 10, Km: 0.25}, "cycles_per_hour"},
		{"no speed", calc.Usage{CyclesPerHour: 20, MeanLiftM: 5, HoursPerDay: 8, WorkingDaysPerYear: 250, DesignYears: 10, Km: 0.25}, "hoist_speed"},
		{"no rule days", calc.Usage{CyclesPerHour: 20, MeanLiftM: 5, HoursPerDay: 8, SpeedMPerMin: 10, DesignYears: 10, Km: 0.25}, ""},
		// 40 cycles of 2 × 10 m at 10 m/min need 80 min an hour: impossible.
		{"busier than the clock", calc.Usage{CyclesPerHour: 40, MeanLiftM: 10, HoursPerDay: 8, SpeedMPerMin: 10, WorkingDaysPerYear: 250, DesignYears: 10, Km: 0.25}, "cycles_per_hour"},
		{"25 h a day", calc.Usage{CyclesPerHour: 1, MeanLiftM: 1, HoursPerDay: 25, SpeedMPerMin: 10, WorkingDaysPerYear: 250, DesignYears: 10, Km: 0.25}, "hours_per_day"},
		{"negative total", calc.Usage{TotalHours: -5, Km: 0.25}, ""},
	}
	for _, tt := range bad {
		_, err := calc.DeriveDuty(tt.u)
		if err == nil {
			t.Errorf("%s: no error", tt.name)
			continue
		}
		if f := rangeField(t, err); f != tt.field {
			t.Errorf("%s: error field %q, want %q (%v)", tt.name, f, tt.field, err)
		}
	}
}
