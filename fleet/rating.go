package fleet

import (
	"math"
	"strconv"
	"strings"

	"hoistfleet/calc"
)

// limitFunc is the quantity whose root is the check's limiting rated load: utilisation
// − 1, or for a check without a limit (brake-stop with no distance rule) the margin to
// being unable to stop: +1 when the brakes cannot stop the load, −1 when they can.
func limitFunc(p preparedCheck) func(h calc.Hoist) (float64, bool) {
	return func(h calc.Hoist) (float64, bool) {
		h.SkipRecord, h.SkipDetail = true, true // the search needs numbers only
		o, err := p.run(h)
		if err != nil {
			return 0, false
		}
		if o.Verdict == calc.Fail {
			return 1, true
		}
		if o.Verdict == calc.Info || math.IsNaN(o.Utilisation) {
			if p.spec.InfoLimit != "" {
				return -1, true
			}
			return 0, false
		}
		return o.Utilisation - 1, true
	}
}

// maxSearchKg bounds the rated-load search: no drum hoist in a register carries more.
const maxSearchKg = 1e7

// noLoadKg stands in for an empty hook where the checks cannot evaluate one (no hook block
// and no inertia: nothing to move): far below the 0.1 kg the rating is given to.
const noLoadKg = 1e-3

// limitLoad is the rated load at which the check reaches its limit (design.md: closed form
// where linear, bisection otherwise, floored to 0.1 kg). NaN when the limit is not
// reached below maxSearchKg or cannot be evaluated; 0 when the check fails at no load.
//
// The search starts from the hoist's own rated load: a check that passes there is
// followed upwards to the load where it stops passing, one that fails there downwards.
// Not every check is monotonic in the load over the whole range (with a drum brake the
// rotor's share of an emergency stop is largest for the lightest load), so the bracket
// around the actual rating is the one that matters.
func (c *Checker) limitLoad(h calc.Hoist, p preparedCheck, o calc.Outcome) float64 {
	if p.closedLimit != nil {
		if v := p.closedLimit(h); !math.IsNaN(v) {
			if v > maxSearchKg {
				return math.NaN() // as the search: not reached below maxSearchKg
			}
			return floorTenth(v)
		}
	}
	f := limitFunc(p)
	// atNoLoad evaluates the check with no rated load on the hook. A train with no hook
	// block and no inertia has nothing to move then, and the checks refuse it: a load far
	// below the 0.1 kg resolution stands in for it.
	atNoLoad := func() (float64, bool) {
		if f0, ok := f(h.WithRatedLoad(0)); ok {
			return f0, true
		}
		return f(h.WithRatedLoad(noLoadKg))
	}
	if p.spec.Linear && !math.IsNaN(o.Utilisation) && h.RatedLoadKg > 0 {
		f0, ok := atNoLoad()
		if !ok {
			return math.NaN()
		}
		if f0 > 0 {
			return 0
		}
		// Utilisation is affine in the rated load: u(m) = u(0) + m (u(m_L) − u(0)) / m_L.
		u0, u1 := f0+1, o.Utilisation
		slope := (u1 - u0) / h.RatedLoadKg
		if slope <= 0 {
			return math.NaN()
		}
		return floorTenth((1 - u0) / slope)
	}
	fr, ok := f(h)
	if !ok {
		return math.NaN()
	}
	var lo, hi float64
	if fr <= 0 {
		// Passes at the rated load: bracket upwards.
		lo, hi = h.RatedLoadKg, math.Min(math.Max(2*h.RatedLoadKg, 100), maxSearchKg)
		for {
			fh, ok := f(h.WithRatedLoad(hi))
			if !ok {
				return math.NaN()
			}
			if fh > 0 {
				break
			}
			if hi >= maxSearchKg { // as the closed forms: no limit below maxSearchKg
				return math.NaN()
			}
			lo = hi
			hi = math.Min(2*hi, maxSearchKg)
		}
	} else {
		// Fails at the rated load: the limit lies below it, if anywhere.
		f0, ok := atNoLoad()
		if !ok {
			return math.NaN()
		}
		if f0 > 0 {
			return 0
		}
		lo, hi = 0, h.RatedLoadKg
	}
	g := func(m float64) (float64, bool) { return f(h.WithRatedLoad(m)) }
	lo, hi, ok = rootIllinois(g, lo, hi)
	if !ok {
		return math.NaN()
	}
	// The root lies in [lo, hi], at most 0.01 kg wide: at most one 0.1 kg step falls
	// inside, and the answer is that step when the check still passes there.
	v := floorTenth(lo)
	if c := floorTenth(hi); c > v {
		if fc, ok := g(c); ok && fc <= 0 {
			v = c
		}
	}
	return v
}

// rootIllinois narrows [lo, hi] with f(lo) ≤ 0 < f(hi) to at most 0.01 kg around the
// largest load where f ≤ 0: regula falsi with the Illinois modification (the retained end's value is
// halved when the same end is kept twice), which converges in a handful of evaluations
// for the smooth, nearly linear utilisations of the checks; every tenth step is a plain
// bisection so that a kink or a jump (brakes that cannot stop) still converges.
func rootIllinois(f func(float64) (float64, bool), lo, hi float64) (float64, float64, bool) {
	flo, ok := f(lo)
	if !ok {
		return 0, 0, false
	}
	fhi, ok := f(hi)
	if !ok {
		return 0, 0, false
	}
	side := 0
	for k := 0; hi-lo > 0.01 && k < 200; k++ {
		x := lo - flo*(hi-lo)/(fhi-flo)
		if k%10 == 9 || !(x > lo && x < hi) || math.IsInf(fhi, 0) || math.IsInf(flo, 0) {
			x = (lo + hi) / 2
		}
		// Keep the bracket from collapsing onto one end by less than the tolerance.
		x = math.Min(math.Max(x, lo+0.004), hi-0.004)
		fx, ok := f(x)
		if !ok {
			return 0, 0, false
		}
		if fx > 0 {
			hi, fhi = x, fx
			if side == 1 {
				flo /= 2
			}
			side = 1
		} else {
			lo, flo = x, fx
			if side == -1 {
				fhi /= 2
			}
			side = -1
		}
		// Regula falsi lands next to the root of a nearly linear function at once but
		// closes the bracket from one side only: probe the tolerance beyond the new end.
		if hi-lo > 0.01 {
			probe := lo + 0.01
			if fx > 0 {
				probe = hi - 0.01
			}
			fp, ok := f(probe)
			if !ok {
				return 0, 0, false
			}
			if fp > 0 {
				hi, fhi = probe, fp
			} else {
				lo, flo = probe, fp
			}
		}
	}
	return lo, hi, true
}

func floorTenth(kg float64) float64 { return math.Floor(kg*10+1e-9) / 10 }

// rating is the maximum permissible rated load (design.md Revision 2, "Component rating
// and the rating cap"): the mechanism's capacity is the smallest limit over the
// load-dependent checks but component-rating; null when a load-independent check fails
// or a load-dependent check could not run. The rating is the smaller of that and the
// Component WLL (governing check component-rating) where the register gives one, and
// otherwise of that and the register's rated load (governing rated-load-cap, with a
// note saying what the mechanism would allow).
func (c *Checker) rating(d *hoistData, prepared []preparedCheck, checks []CheckResult) Rating {
	rt := Rating{MaxRatedLoadKg: math.NaN(), MechanismCapacityKg: math.NaN()}
	var notRun []string
	for i, cr := range checks {
		spec := prepared[i].spec
		if spec.NullsRating && cr.Status == StatusFail {
			rt.GoverningCheck = cr.ID
			rt.Note = cr.ID + " fails whatever the load: no rating can be given"
			return rt
		}
		if spec.LoadDependent && (cr.Status == StatusError || cr.Status == StatusUnchecked) && !(spec.Optional && cr.Status == StatusUnchecked) {
			notRun = append(notRun, cr.ID)
		}
		if spec.LoadDependent && cr.Status == StatusFail && math.IsNaN(cr.LimitRatedLoadKg) {
			// Failing at the rated load without a limit found: leaving it out would rate
			// the hoist above a load it already fails at.
			rt.GoverningCheck = cr.ID
			rt.Note = cr.ID + " fails and the load at which it would pass could not be found: no rating can be given"
			return rt
		}
	}
	if len(notRun) > 0 {
		rt.Note = "not rated: " + strings.Join(notRun, ", ") + " could not be checked"
		return rt
	}
	mech, gov := math.NaN(), ""
	capKg, capID := math.NaN(), ""
	for i, cr := range checks {
		if !cr.LoadDependent || math.IsNaN(cr.LimitRatedLoadKg) {
			continue
		}
		if prepared[i].spec.CapsRating {
			capKg, capID = cr.LimitRatedLoadKg, cr.ID
			continue
		}
		if math.IsNaN(mech) || cr.LimitRatedLoadKg < mech {
			mech, gov = cr.LimitRatedLoadKg, cr.ID
		}
	}
	rt.MechanismCapacityKg, rt.MaxRatedLoadKg, rt.GoverningCheck = mech, mech, gov
	if mech == 0 {
		rt.Note = gov + " fails even with no rated load on the hook"
	}
	mechText := strconv.FormatFloat(mech, 'f', 1, 64) + " kg"
	switch {
	case capID != "":
		if math.IsNaN(mech) || capKg < mech {
			rt.MaxRatedLoadKg, rt.GoverningCheck = capKg, capID
			if math.IsNaN(mech) {
				rt.Note = "capped by the Component WLL"
			} else {
				rt.Note = "capped by the Component WLL; the mechanism alone would allow " + mechText
			}
		}
	case d.h.RatedLoadKg > 0 && (math.IsNaN(mech) || d.h.RatedLoadKg < mech):
		rt.MaxRatedLoadKg, rt.GoverningCheck = floorTenth(d.h.RatedLoadKg), RatedLoadCap
		rt.Note = "capped at the register's rated load: hook, block, trolley and structure must be rated (Component WLL) to rate higher"
		if !math.IsNaN(mech) {
			rt.Note = "capped at the register's rated load: the mechanism would allow " + mechText +
				"; hook, block, trolley and structure must be rated (Component WLL) to rate higher"
		}
	}
	return rt
}
