package main

import (
	"fmt"
	"math"
	"math/rand/v2"
	"time"

	"hoistfleet/io/units"
)

// gn is the standard acceleration of gravity g_n = 9.80665 m/s² (NIST SP 811, exact).
const gn = units.StandardGravity

// fault names the defect seeded into a synthetic hoist ("" for none). The generator writes
// it to a pass-through column so that a reader of the results can see what was intended.
type fault string

const (
	faultNone        fault = ""
	faultRope        fault = "rope one size small"         // rope-design-factor fails
	faultRopeClose   fault = "rope close to its limit"     // rope-design-factor marginal or pass
	faultDrum        fault = "small drum"                  // drum-ratio fails
	faultMotor       fault = "motor under-sized"           // motor-torque, motor-power fail
	faultSpeed       fault = "slow speed entered as rated" // hoist-speed fails
	faultBrake       fault = "brake under-rated"           // brake-holding fails
	faultBrakeClose  fault = "brake close to its limit"    // brake-holding marginal
	faultAccel       fault = "soft start, heavy rotor"     // motor-accel-torque fails
	faultInspection  fault = "inspection overdue"          // inspection-due fails
	faultWorn        fault = "worn rope"                   // rope-wear fails
	faultLife        fault = "past design life"            // design-life fails
	faultFleet       fault = "fleet angle below minimum"   // fleet-angle marginal
	faultInspectSoon fault = "inspection due within weeks" // inspection-due marginal
)

// faultTable is the share of generated hoists that carry each defect; the rest are
// designed clean. About 70 % of rows come out clean.
var faultTable = []struct {
	f fault
	p float64
}{
	{faultRope, 0.03}, {faultRopeClose, 0.03}, {faultDrum, 0.02}, {faultMotor, 0.03},
	{faultSpeed, 0.02}, {faultBrake, 0.02}, {faultBrakeClose, 0.02}, {faultAccel, 0.02},
	{faultInspection, 0.05}, {faultWorn, 0.03}, {faultLife, 0.02}, {faultFleet, 0.02},
	{faultInspectSoon, 0.02},
}

// hoist is one synthetic register row in SI units (kg, m, N, W, N m, kg m², m/s, m/s²);
// motor speed in rev/min, angles in degrees, ratios as fractions (1.6 for 160 %).
type hoist struct {
	ID, Site, Location, Description string

	Group        int    // ISO 4301 mechanism group 1..8
	Service      string // normal | heavy | severe
	RatedLoadKg  float64
	HookBlockKg  float64
	Parts, Ends  int
	SheaveEff    float64
	Construction string  // e.g. "6x36 IWRC"
	GradeNmm2    float64 // rope grade [N/mm²]
	RopeDiaM     float64 // nominal rope diameter d
	RopeMBFN     float64 // EN 12385-4 d² R K, rounded to 0.1 kN
	MeasuredDiaM float64
	BrokenWires  int
	RopeFitted   time.Time

	DrumDiaM    float64 // pitch diameter, first layer
	Layers      int
	Grooves     int
	Grooved     bool
	LiftM       float64
	SheaveDiaM  float64 // 0 when there is no running sheave (one part of line)
	FleetDeg    float64
	DrumInertia float64 // I_d [kg m²]
	DrumMassKg  float64

	GearRatio   float64
	GearEff     float64
	GearBackEff float64 // NaN: not given (= forward)
	GearboxNm   float64 // rated output torque of the gear unit

	MotorW        float64
	MotorRPM      float64
	PeakRatio     float64
	MotorInertia  float64 // J_m [kg m²]
	BrakeNm       float64
	Brakes        int
	BrakeDelayS   float64
	ControlBrake  string // none | mechanical | electrical
	HoistSpeedMS  float64
	AccelMS2      float64
	Hours         float64
	Spectrum      string // L1..L4
	Records       string // meter and log | log | none
	Commissioned  time.Time
	LastInspected time.Time
	LastTest      time.Time
	TestLoadKg    float64
	TestType      string
	ComponentWLL  float64 // kg
	ProposedKg    float64 // 0: none
	Contractor    string
	Fault         fault
}

// Published values the designs follow (standards.md).
var (
	// zp is the ISO 4308-1 minimum practical design factor Zp of running ropes, M1..M8
	// (standards.md: seen, two copies agree).
	zp = [9]float64{0, 3.15, 3.35, 3.55, 4.0, 4.5, 5.6, 7.1, 9.0}
	// h1 and h2 are ISO 4308-1 minimum D/d of drums and sheaves, M1..M8 (memory, medium).
	h1 = [9]float64{0, 11.2, 12.5, 14, 16, 18, 20, 22.4, 25}
	h2 = [9]float64{0, 12.5, 14, 16, 18, 20, 22.4, 25, 28}
	// lifeHours is the FEM 9.755 theoretical duration at full load, M1..M8 (seen).
	lifeHours = [9]float64{0, 100, 200, 400, 800, 1600, 3200, 6300, 12500}
	// ropeK is the EN 12385-4 minimum breaking force factor K (seen).
	ropeK = map[string]float64{"6x36 IWRC": 0.356, "6x19 FC": 0.330}
)

// Series the designs pick from (catalogue sizes, not standards).
var (
	ratedLoadsT = []float64{0.5, 1, 1.6, 2, 2.5, 3.2, 4, 5, 6.3, 8, 10, 12.5, 16, 20, 25, 32, 40, 50}
	loadWeights = []float64{3, 6, 6, 8, 6, 8, 6, 9, 6, 7, 7, 5, 5, 4, 3, 2, 2, 1}
	ropeSizesMM = []float64{3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 16, 18, 20, 22, 24, 26, 28, 30, 32, 34, 36, 38, 40}
	motorsKW    = []float64{1.5, 2.2, 3, 4, 5.5, 7.5, 11, 15, 18.5, 22, 30, 37, 45, 55, 75, 90, 110}
	// brakesNm is an R10-like series of brake sizes [N m].
	brakesNm = []float64{5, 8, 10, 13, 16, 20, 25, 32, 40, 50, 63, 80, 100, 125, 160, 200, 250, 320, 400, 500,
		630, 800, 1000, 1250, 1600, 2000, 2500, 3200, 4000, 5000}
	sites       = []string{"Harbourside North", "Harbourside South", "Millbrook Coil Centre", "Ravensholm Works", "Quarry Lane Depot", "Eastfield Yard", "Tidewater Terminal", "Kilnmoor Foundry"}
	contractors = []string{"in-house", "Harlow & Venn Lifting", "Northgate Rope Services", "Bayou Rigging Co-op"}
)

// reevingEff is η_R = (1 − η_s^n_e) / (n_e (1 − η_s)) (standards.md "Reeving", memory high).
func reevingEff(etaS float64, ne int) float64 {
	if ne <= 1 || etaS == 1 {
		return 1
	}
	return (1 - math.Pow(etaS, float64(ne))) / (float64(ne) * (1 - etaS))
}

// ropeMBF is the EN 12385-4 minimum breaking force F = d² R K / 1000 [kN] with d in mm and
// R in N/mm², returned in newtons.
func ropeMBF(dMM, grade, k float64) float64 { return dMM * dMM * grade * k }

// roundTo rounds x to a multiple of step.
func roundTo(x, step float64) float64 { return math.Round(x/step) * step }

// ceilTo rounds x up to a multiple of step (with a small allowance for float noise).
func ceilTo(x, step float64) float64 { return math.Ceil(x/step-1e-9) * step }

// sig rounds x to n significant digits.
func sig(x float64, n int) float64 {
	if x == 0 || math.IsNaN(x) || math.IsInf(x, 0) {
		return x
	}
	p := math.Pow(10, float64(n-1)-math.Floor(math.Log10(math.Abs(x))))
	return math.Round(x*p) / p
}

// pick returns an index drawn with the given weights.
func pick(rng *rand.Rand, w []float64) int {
	total := 0.0
	for _, x := range w {
		total += x
	}
	u := rng.Float64() * total
	for i, x := range w {
		if u < x {
			return i
		}
		u -= x
	}
	return len(w) - 1
}

func choose[T any](rng *rand.Rand, xs []T) T { return xs[rng.IntN(len(xs))] }

// days adds n days to t.
func days(t time.Time, n int) time.Time { return t.AddDate(0, 0, n) }

// motorSpeed is a catalogue full-load speed for a 50 Hz induction motor of p poles
// (synchronous speed less a slip that falls with size).
func motorSpeed(poles int, kw float64) float64 {
	sync := 3000.0 / float64(poles/2)
	slip := 0.018
	switch {
	case kw < 4:
		slip = 0.055
	case kw < 15:
		slip = 0.04
	case kw < 45:
		slip = 0.028
	}
	return roundTo(sync*(1-slip), 5)
}

// newHoist designs hoist number idx (0-based) from rng, as of asOf. The design follows
// the same recipe as the demo registers (templates/demo/README.md): rope, drum, motor,
// gear ratio, inertias and brake are sized from the rated load, the group and the speed,
// then the drawn fault, if any, spoils one aspect.
func newHoist(rng *rand.Rand, idx int, asOf time.Time) hoist {
	h := hoist{ID: fmt.Sprintf("G%07d", idx+1), SheaveEff: 0.98, Grooved: true, Layers: 1, Brakes: 1,
		GearBackEff: math.NaN(), ControlBrake: "none", TestType: "static"}
	// fault
	u := rng.Float64()
	for _, ft := range faultTable {
		if u < ft.p {
			h.Fault = ft.f
			break
		}
		u -= ft.p
	}
	h.Site = choose(rng, sites)
	h.Location = fmt.Sprintf("Bay %d", 1+rng.IntN(12))
	h.Group = 3 + pick(rng, []float64{10, 25, 35, 20, 8, 2})
	h.Service = []string{"normal", "heavy", "severe"}[pick(rng, []float64{60, 30, 10})]
	loadT := ratedLoadsT[pick(rng, loadWeights)]
	if h.Group >= 7 && loadT > 16 {
		h.Group = 6 // high-duty process hoists are the lighter ones
	}
	h.RatedLoadKg = loadT * 1000
	switch {
	case loadT < 2:
		h.Parts = 1 + rng.IntN(2)
	case loadT < 10:
		h.Parts = 2 * (1 + rng.IntN(2))
	case loadT < 25:
		h.Parts = 4
	default:
		h.Parts = 4 * (1 + rng.IntN(2))
	}
	h.Ends = 1
	if h.Parts >= 4 && rng.Float64() < 0.25 {
		h.Ends = 2
	}
	ne := h.Parts / h.Ends
	speeds := []float64{4, 5, 6, 8, 10, 12, 16}
	switch {
	case loadT >= 25:
		speeds = speeds[:4]
	case loadT >= 8:
		speeds = speeds[1:6]
	default:
		speeds = speeds[2:]
	}
	vMin := choose(rng, speeds)
	h.HoistSpeedMS = vMin / 60
	h.LiftM = roundTo(4+rng.Float64()*26, 0.5)
	if rng.Float64() < 0.08 {
		h.Layers = 2 + rng.IntN(2)
		h.LiftM = roundTo(20+rng.Float64()*40, 1)
	}
	h.Description = "Electric wire rope hoist"
	if h.Layers > 1 {
		h.Description = "Winch hoist, multi-layer drum"
	}
	h.Construction, h.GradeNmm2 = "6x36 IWRC", 1960
	if rng.Float64() < 0.1 {
		h.Construction, h.GradeNmm2 = "6x19 FC", 1770
	}
	// hook block: a hook alone on one part, a reeved block otherwise
	if h.Parts == 1 {
		h.HookBlockKg = math.Round(0.004*h.RatedLoadKg + 3)
	} else {
		h.HookBlockKg = roundTo(0.02*h.RatedLoadKg+10, 5)
	}
	m := h.RatedLoadKg + h.HookBlockKg
	w := m * gn
	etaR := reevingEff(h.SheaveEff, ne)
	f := w / (float64(h.Parts) * etaR) // ISO 4308 rope tension, one part at the drum
	// rope: smallest size with Zp·F / MBF ≤ 0.8 and a static design factor ≥ 5/0.8 on W/n
	need := math.Max(zp[h.Group]*f, 5*w/float64(h.Parts)) / 0.8
	k := ropeK[h.Construction]
	dMM := ropeSizesMM[len(ropeSizesMM)-1]
	for _, s := range ropeSizesMM {
		if ropeMBF(s, h.GradeNmm2, k) >= need {
			dMM = s
			break
		}
	}
	if h.Fault == faultRope {
		// the largest size that misses Zp by at least 5 %: a spare of the wrong size
		dMM = ropeSizesMM[0]
		for _, s := range ropeSizesMM {
			if ropeMBF(s, h.GradeNmm2, k) < zp[h.Group]*f/1.05 {
				dMM = s
			}
		}
	}
	h.RopeDiaM = dMM / 1000
	h.RopeMBFN = roundTo(ropeMBF(dMM, h.GradeNmm2, k), 100)
	if h.Fault == faultRopeClose {
		// a lower grade rope of the same size, utilisation about 0.9–1.0 where possible
		h.RopeMBFN = roundTo(zp[h.Group]*f/(0.91+0.08*rng.Float64()), 100)
	}
	// drum and sheave
	dd := math.Max(h1[h.Group]/0.86, 18)
	if h.Fault == faultDrum {
		dd = h1[h.Group] * (0.8 + 0.1*rng.Float64())
	}
	h.DrumDiaM = ceilTo(dd*dMM, 5) / 1000
	if h.Parts > 1 {
		h.SheaveDiaM = ceilTo(math.Max(h2[h.Group]/0.86, 18)*dMM, 5) / 1000
	}
	r1 := h.DrumDiaM / 2
	rL := r1 + float64(h.Layers-1)*math.Sqrt(3)/2*h.RopeDiaM
	rope := h.LiftM*float64(ne) + 2*math.Pi*h.DrumDiaM
	perTurn := 0.0
	for j := 1; j <= h.Layers; j++ {
		perTurn += math.Pi * (h.DrumDiaM + 2*float64(j-1)*math.Sqrt(3)/2*h.RopeDiaM)
	}
	h.Grooves = int(math.Ceil(rope/perTurn/0.85)) + 2
	h.FleetDeg = roundTo(0.6+rng.Float64(), 0.1)
	if h.Fault == faultFleet {
		h.FleetDeg = roundTo(0.2+0.2*rng.Float64(), 0.1)
	}
	if h.Layers == 1 && rng.Float64() < 0.05 {
		h.Grooved = false
		h.FleetDeg = math.Min(h.FleetDeg, 1.2)
	}
	// motor: next catalogue size above the steady hoisting power / 0.83
	h.GearEff = 0.94
	if loadT <= 1 && rng.Float64() < 0.2 {
		h.GearEff, h.GearBackEff = 0.62, -0.15 // self-locking worm gear
		h.Description = "Worm-gear hoist (self-locking)"
	}
	pReq := w * h.HoistSpeedMS * (rL / r1) / (etaR * h.GearEff)
	kw := motorsKW[len(motorsKW)-1]
	for _, s := range motorsKW {
		if s*1000 >= pReq/0.83 {
			kw = s
			break
		}
	}
	if h.Fault == faultMotor {
		// a motor 10 % or more below the steady hoisting power; a light hoist whose
		// demand is below the smallest motor was sped up (on an inverter) past it
		over := 1.15 + 0.2*rng.Float64()
		if pReq/1.1 < motorsKW[0]*1000 {
			s := motorsKW[0] * 1000 * over / pReq
			h.HoistSpeedMS *= s
			pReq *= s
		}
		for i := len(motorsKW) - 1; i >= 0; i-- {
			if motorsKW[i]*1000 <= pReq/1.1 {
				kw = motorsKW[i]
				break
			}
		}
	}
	h.MotorW = kw * 1000
	poles := 4
	if kw >= 30 && rng.Float64() < 0.5 {
		poles = 6
	}
	h.MotorRPM = motorSpeed(poles, kw)
	wm := 2 * math.Pi * h.MotorRPM / 60
	i := wm * r1 / (h.HoistSpeedMS * float64(ne))
	if i < 100 {
		h.GearRatio = roundTo(i, 0.01)
	} else {
		h.GearRatio = roundTo(i, 0.1)
	}
	if h.Fault == faultSpeed {
		h.HoistSpeedMS /= 2 // the slow speed of a two-speed motor entered as rated
	}
	h.PeakRatio = 1.6
	if rng.Float64() < 0.2 {
		h.PeakRatio = 2.0
	}
	jm := 1.3 * 0.0035 * math.Pow(kw/1.5, 1.38)
	if poles == 6 {
		jm *= 1.6
	}
	h.AccelMS2 = math.Max(0.05, math.Min(0.3, roundTo(h.HoistSpeedMS, 0.01)))
	h.MotorInertia = sig(jm, 3)
	// drum: welded shell of wall ≈ 0.9 d, length from the grooves, plus gear ring
	wall := math.Max(0.008, 0.9*h.RopeDiaM)
	length := float64(h.Ends*h.Grooves)*1.12*h.RopeDiaM + 6*h.RopeDiaM
	if h.Ends == 2 {
		length += 0.1
	}
	mDrum := 1.45*math.Pi*h.DrumDiaM*length*wall*7850 + 8
	h.DrumMassKg = roundTo(mDrum, 5)
	h.DrumInertia = sig(1.1*mDrum*r1*r1, 3)
	if h.Fault == faultAccel {
		// soft-start motor (peak 120 %), 0.5 m/s² demanded and a heavy brake disc: the rotor
		// inertia is raised until the accelerating torque exceeds the peak by 10 % or more
		h.PeakRatio, h.AccelMS2 = 1.2, 0.5
		a := h.AccelMS2
		mr := h.MotorW / wm
		need := 0.0
		for _, r := range []float64{r1, rL} {
			ad := a * float64(ne) / r
			rest := (float64(h.Ends)*m*(gn+a)*r/(float64(h.Parts)*etaR) + h.DrumInertia*ad) / (h.GearRatio * h.GearEff)
			need = math.Max(need, (1.1*h.PeakRatio*mr-rest)/(h.GearRatio*ad))
		}
		h.MotorInertia = sig(math.Max(3*jm, need*1.02), 3)
	}
	// brake: next series size above 2.2 × the rated-load hoisting torque at the motor
	th := w * rL / (float64(ne) * etaR * h.GearEff * h.GearRatio)
	ratio := 2.2
	switch h.Fault {
	case faultBrake:
		ratio = 0.95 + 0.15*rng.Float64()
	case faultBrakeClose:
		ratio = 1.25 / (0.93 + 0.05*rng.Float64())
	}
	if h.RatedLoadKg >= 40000 && h.Fault == faultNone {
		h.Brakes = 2
		ratio = 1.4
	}
	h.BrakeNm = brakesNm[len(brakesNm)-1]
	for _, b := range brakesNm {
		if b >= ratio*th {
			h.BrakeNm = b
			break
		}
	}
	if h.Fault == faultBrake || h.Fault == faultBrakeClose {
		// an adjustable brake set too low: the setting, not a catalogue size
		h.BrakeNm = roundTo(ratio*th, 0.1)
	}
	h.BrakeDelayS = roundTo(0.15+0.25*rng.Float64(), 0.05)
	if rng.Float64() < 0.15 {
		h.ControlBrake = "electrical"
	}
	// gear unit rated above the brake torque reaching the drum and the accelerating torque
	a := h.AccelMS2
	tq := float64(h.Ends)*m*(gn+a)*rL/(float64(h.Parts)*etaR) + h.DrumInertia*a*float64(ne)/r1
	eg := h.GearEff
	tq = math.Max(tq, float64(h.Brakes)*h.BrakeNm*h.GearRatio/eg)
	h.GearboxNm = sig(tq/0.8, 2)
	// usage and dates
	h.Spectrum = []string{"L1", "L2", "L3"}[pick(rng, []float64{30, 50, 20})]
	h.Records = []string{"meter and log", "log", "none"}[pick(rng, []float64{60, 30, 10})]
	ageDays := 365 + rng.IntN(30*365)
	h.Commissioned = days(asOf, -ageDays)
	x := map[string]float64{"meter and log": 1.2, "log": 1.4, "none": 1.5}[h.Records]
	km := map[string]float64{"L1": 0.125, "L2": 0.25, "L3": 0.5}[h.Spectrum]
	limit := lifeHours[h.Group] / (x * km) // hours at which FEM 9.755 S reaches D
	frac := 0.15 + 0.6*rng.Float64()
	if h.Fault == faultLife {
		frac = 1.05 + 0.5*rng.Float64()
	}
	h.Hours = roundTo(frac*limit, 10)
	interval := map[string]int{"normal": 365, "heavy": 182, "severe": 91}[h.Service]
	back := 10 + rng.IntN(int(0.8*float64(interval)))
	switch h.Fault {
	case faultInspection:
		back = int(float64(interval)*1.1) + rng.IntN(interval)
	case faultInspectSoon:
		back = int(float64(interval) * (0.92 + 0.06*rng.Float64()))
	}
	h.LastInspected = days(asOf, -back)
	h.LastTest = days(h.Commissioned, rng.IntN(20))
	h.TestLoadKg = 1.25 * h.RatedLoadKg
	h.ComponentWLL = h.RatedLoadKg
	fitted := asOf.AddDate(0, 0, -(200 + rng.IntN(2000)))
	if fitted.Before(h.Commissioned) {
		fitted = h.Commissioned
	}
	h.RopeFitted = fitted
	h.MeasuredDiaM = roundTo(h.RopeDiaM*(0.985+0.045*rng.Float64()), 0.0001)
	h.BrokenWires = []int{0, 0, 0, 1, 2, 3}[rng.IntN(6)]
	if h.Fault == faultWorn {
		h.MeasuredDiaM = roundTo(h.RopeDiaM*(0.86+0.04*rng.Float64()), 0.0001)
		h.BrokenWires = 4 + rng.IntN(6)
	}
	if h.Fault == faultNone && rng.Float64() < 0.01 {
		h.ProposedKg = 1.25 * h.RatedLoadKg
	}
	h.Contractor = choose(rng, contractors)
	return h
}
