package fleet

import (
	"errors"
	"math"
	"strconv"
	"strings"

	"hoistfleet/calc"
)

// plausibility marks register values that are implausible beside the hoist's other
// values — almost certainly a unit slip (a force in N in a kN column, a power in W in a
// kW column, a zero where physics needs a positive number) — as unreadable, so that every
// check using them reports an error naming the likely unit instead of passing on them
// (calc's plausibility bounds). Values derived or defaulted are not judged.
func (d *hoistData) plausibility() {
	h := &d.h
	// Rope MBF against the rope diameter (EN 12385-4 band).
	if v := d.given("rope_mbf"); v != nil && h.RopeDiameterM > 0 {
		lo, hi := calc.MBFPerD2Range()
		d2 := h.RopeDiameterM * h.RopeDiameterM
		if f := calc.SlipFactor(h.RopeMBFN, lo*d2, hi*d2); f > 1 {
			d.implausible("rope_mbf", v, f, h.RopeMBFN > hi*d2,
				"is outside what a "+num3(h.RopeDiameterM*1000)+" mm steel wire rope can have ("+num3(lo*d2/1000)+" to "+num3(hi*d2/1000)+" kN, EN 12385-4 grades and constructions, widened)")
		}
	}
	// Drum against rope diameter.
	if v := d.given("drum_diameter"); v != nil && h.RopeDiameterM > 0 && h.DrumDiameterM/h.RopeDiameterM > calc.MaxDrumRatio {
		d.implausible("drum_diameter", v, 1, true,
			"gives D/d = "+num3(h.DrumDiameterM/h.RopeDiameterM)+" with the "+num3(h.RopeDiameterM*1000)+" mm rope, over "+num3(calc.MaxDrumRatio)+": check the units of Drum diameter and Rope diameter")
	}
	// Motor power against the power that lifts the rated load at the rated speed.
	if v := d.given("motor_power"); v != nil && h.RatedLoadKg > 0 && h.HoistSpeedMS > 0 {
		need := (h.RatedLoadKg + h.HookBlockKg) * h.G * h.HoistSpeedMS
		if r := h.MotorPowerW / need; r > calc.MaxPowerRatio {
			d.implausible("motor_power", v, 1, true,
				"is "+num3(r)+" × the "+num3(need/1000)+" kW that lifts the rated load at the rated speed (over "+num3(calc.MaxPowerRatio)+" ×): check the units of Motor power, Rated load and Hoist speed")
		}
	}
	// One brake's torque against the motor's rated torque, for a brake on the motor shaft.
	if v := d.given("brake_torque"); v != nil && !h.BrakeOnDrum && h.MotorPowerW > 0 && h.MotorSpeedRPM > 0 {
		mr := h.MotorPowerW / (h.MotorSpeedRPM * 2 * math.Pi / 60)
		if r := h.BrakeTorqueNm / mr; r > calc.MaxBrakeRatio {
			d.implausible("brake_torque", v, 1, true,
				"is "+num3(r)+" × the motor's rated torque "+num3(mr)+" N m (over "+num3(calc.MaxBrakeRatio)+" × for a brake on the motor shaft): check the units of Brake torque and Motor power, and Brake location")
		}
	}
	// One brake's permitted friction work a stop: zero is no rating, and a value far
	// outside what brakes are rated for is a unit slip (J in a kJ column).
	if v := d.given("brake_friction_work"); v != nil {
		lo, hi := calc.BrakeWorkRange()
		switch {
		case !(v.Num > 0):
			d.implausible("brake_friction_work", v, 1, false, "is not a positive number: a brake's permitted friction work a stop is; leave the cell blank if it is not known")
		case v.Num < lo || v.Num > hi:
			// The slip to expect is J for kJ (or kJ for J): a factor of 1000.
			d.implausible("brake_friction_work", v, 1000, v.Num > hi,
				"is outside what hoist brakes are rated for ("+num3(lo)+" J to "+num3(hi/1e6)+" MJ a stop)")
		}
	}
	// Zeros where physics needs a positive number.
	for _, key := range [...]string{"drum_inertia", "motor_inertia"} {
		if v := d.given(key); v != nil && v.Num == 0 {
			d.implausible(key, v, 1, false, "is zero: a rotating body has inertia; write the value from the maker's data")
		}
	}
}

// given returns the register's readable value of key, or nil.
func (d *hoistData) given(key string) *Value {
	if v := d.field(key); v != nil && v.State == OK {
		return v
	}
	return nil
}

// implausible marks key's value as unreadable with the reason, and a guess at the slip:
// the value as written divided (high) or multiplied by factor.
func (d *hoistData) implausible(key string, v *Value, factor float64, high bool, why string) {
	i, ok := d.c.keys.lookup(key)
	if !ok || d.bad[i] != nil {
		return
	}
	msg := "implausible value " + strconv.Quote(strings.TrimSpace(v.Raw)) + ": it " + why
	if raw, err := strconv.ParseFloat(strings.TrimSpace(v.Raw), 64); err == nil && factor > 1 {
		guess := raw / factor
		if !high {
			guess = raw * factor
		}
		msg += "; check the unit: " + num3(guess) + "?"
	}
	e := &Error{Kind: Implausible, Cell: v.Cell, Field: key, Asset: d.a.ID, Err: errors.New(msg)}
	d.bad[i] = e
	d.messages = append(d.messages, e.Error())
}
