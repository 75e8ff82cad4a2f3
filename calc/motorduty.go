package calc

import (
	"math"
	"strconv"
	"strings"
)

// MotorDutyInput is what the motor-duty check reads. A NaN field is not known.
type MotorDutyInput struct {
	// RatedDutyFactor is the motor's rated cyclic duration factor (intermittent duty
	// S3), as a fraction (0.4 for 40 % ED); RatedStarts its rated starts per hour [1/h].
	RatedDutyFactor, RatedStarts float64
	// RequiredDutyFactor and RequiredStarts are what the mechanism group asks of the
	// motor (FEM 9.683, from the rules) [fraction, 1/h].
	RequiredDutyFactor, RequiredStarts float64
	// StartsPerHour is the register's count of the hoist's starts per hour [1/h];
	// CyclesPerHour its hoisting cycles per hour [1/h]; StartsPerCycle the fewest starts
	// one cycle takes (2: one to hoist, one to lower; from the rules).
	StartsPerHour, CyclesPerHour, StartsPerCycle float64
	SkipRecord                                   bool
	Figs                                         *FigureBuf
}

// MotorDuty is the motor-duty check: the hoist motor's intermittent rating against what
// its mechanism group asks and against how often it is started.
//
//	z_act = max(starts per hour, c · cycles per hour)              [1/h]  (what is known)
//	u_ED  = ED_req / ED_rated        u_zreq = z_req / z_rated       (the group's requirement)
//	u_z   = z_act / z_rated                                         (the motor's own rating)
//	utilisation = the largest of those that can be formed; demand and capacity are the
//	governing pair's (unit "1" for ED, "1/h" for starts)
//
// with c the fewest starts in a hoisting cycle (2: hoist, then lower; inching adds more,
// so c · cycles is a lower bound of the starts). Starts counted in the register that are
// fewer than c · cycles are raised to it, and the note says so.
//
// ED_req and z_req by mechanism group follow FEM 9.683 (selection of hoist motors):
// 1Bm 25 % / 150, 1Am 30 % / 180, 2m 40 % / 240, 3m 50 % / 300, 4m and 5m 60 % / 360 starts
// an hour (memory, low: in the rule tables as review limits until read in the document).
// The motor's rating is its nameplate's (the register).
//
// Verdict: by the governing ratio: ByUtilisation for the starts run (the marginal band
// applies), WithoutBand for the group's requirements (minimum ratings: met however
// closely); Info when no ratio can be formed (nothing verified to judge: the fleet's
// review of the group's requirement may still make it marginal).
// Figures: rated_duty_factor, required_duty_factor, rated_starts_per_hour,
// required_starts_per_hour, starts_per_hour (z_act), starts_utilisation (u_z).
//
// It returns a *RangeError for a rated duty factor outside (0, 1], rated starts ≤ 0, or
// negative starts or cycles.
func MotorDuty(in MotorDutyInput) (Outcome, error) {
	switch {
	case !math.IsNaN(in.RatedDutyFactor) && !(in.RatedDutyFactor > 0 && in.RatedDutyFactor <= 1):
		return Outcome{}, &RangeError{Field: "motor_duty_factor", Msg: "motor duty factor must be in (0, 100] % ED (got " + dutyNum(in.RatedDutyFactor*100) + " %)"}
	case !math.IsNaN(in.RatedStarts) && !(in.RatedStarts > 0) || math.IsInf(in.RatedStarts, 0):
		return Outcome{}, &RangeError{Field: "motor_starts", Msg: "motor rated starts per hour must be > 0 (got " + dutyNum(in.RatedStarts) + ")"}
	case in.StartsPerHour < 0 || math.IsInf(in.StartsPerHour, 0):
		return Outcome{}, &RangeError{Field: "starts_per_hour", Msg: "starts per hour must be ≥ 0 (got " + dutyNum(in.StartsPerHour) + ")"}
	case in.CyclesPerHour < 0 || math.IsInf(in.CyclesPerHour, 0):
		return Outcome{}, &RangeError{Field: "cycles_per_hour", Msg: "cycles per hour must be ≥ 0 (got " + dutyNum(in.CyclesPerHour) + ")"}
	}
	rec := !in.SkipRecord
	o := Outcome{Demand: math.NaN(), Capacity: math.NaN(), Unit: "1", Utilisation: math.NaN(), Verdict: Info}
	var notes []string

	// The hoist's starts: the register's count, never below c per cycle.
	act := in.StartsPerHour
	if fromCycles := in.StartsPerCycle * in.CyclesPerHour; !math.IsNaN(fromCycles) {
		switch {
		case math.IsNaN(act):
			act = fromCycles
			notes = append(notes, dutyNum(act)+" starts an hour from "+dutyNum(in.CyclesPerHour)+" cycles: a lower bound (inching adds more)")
			if rec {
				o.Steps = append(o.Steps, Step{Symbol: "z_act", Formula: "c · cycles per hour", Numbers: dutyNum(in.StartsPerCycle) + " × " + dutyNum(in.CyclesPerHour), Value: act, Unit: "1/h"})
			}
		case act < fromCycles:
			notes = append(notes, "the register's "+dutyNum(act)+" starts an hour are fewer than "+dutyNum(in.StartsPerCycle)+" a cycle at "+dutyNum(in.CyclesPerHour)+" cycles an hour: "+dutyNum(fromCycles)+" used")
			act = fromCycles
			if rec {
				o.Steps = append(o.Steps, Step{Symbol: "z_act", Formula: "max(starts per hour, c · cycles per hour)", Numbers: "max(" + dutyNum(in.StartsPerHour) + ", " + dutyNum(in.StartsPerCycle) + " × " + dutyNum(in.CyclesPerHour) + ")", Value: act, Unit: "1/h"})
			}
		}
	}
	// The group's requirements are minimum ratings: met however closely (WithoutBand);
	// the starts run against the motor's rating take the marginal band.
	parts := [...]struct {
		sym            string
		demand, rating float64
		unit, what     string
		verdict        Verdict
	}{
		{"u_ED", in.RequiredDutyFactor, in.RatedDutyFactor, "1", "duty factor the group asks", WithoutBand},
		{"u_zreq", in.RequiredStarts, in.RatedStarts, "1/h", "starts per hour the group asks", WithoutBand},
		{"u_z", act, in.RatedStarts, "1/h", "starts per hour run", ByUtilisation},
	}
	for _, p := range parts {
		u := p.demand / p.rating
		if math.IsNaN(u) {
			continue
		}
		if rec {
			o.Steps = append(o.Steps, Step{Symbol: p.sym, Formula: p.what + " / the motor's rating", Numbers: motorDutyNum(p.demand, p.unit) + " / " + motorDutyNum(p.rating, p.unit), Value: u, Unit: "1"})
		}
		if math.IsNaN(o.Utilisation) || u > o.Utilisation {
			o.Demand, o.Capacity, o.Unit, o.Utilisation, o.Verdict = p.demand, p.rating, p.unit, u, p.verdict
		}
		if u > 1+1e-9 {
			notes = append(notes, p.what+" "+motorDutyNum(p.demand, p.unit)+" exceed the motor's "+motorDutyNum(p.rating, p.unit))
		}
	}
	if o.Verdict == Info {
		notes = append(notes, "nothing verified to compare: no starts or cycles per hour to set against the motor's rated starts, and no verified requirement of the duty group in the rules in force")
	}
	o.Note = strings.Join(notes, "; ")
	o.Figures = in.Figs.take([]Figure{
		{Name: "rated_duty_factor", Value: in.RatedDutyFactor, Unit: "1"},
		{Name: "required_duty_factor", Value: in.RequiredDutyFactor, Unit: "1"},
		{Name: "rated_starts_per_hour", Value: in.RatedStarts, Unit: "1/h"},
		{Name: "required_starts_per_hour", Value: in.RequiredStarts, Unit: "1/h"},
		{Name: "starts_per_hour", Value: act, Unit: "1/h"},
		{Name: "starts_utilisation", Value: act / in.RatedStarts, Unit: "1"},
	})
	return o, nil
}

// motorDutyNum writes a duty factor as a percentage and a rate as a number an hour.
func motorDutyNum(v float64, unit string) string {
	if unit == "1" {
		return strconv.FormatFloat(v*100, 'g', 4, 64) + " % ED"
	}
	return dutyNum(v) + "/h"
}
