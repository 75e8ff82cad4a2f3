package fleet

import (
	"errors"
	"fmt"
	"math"
	"strconv"

	"hoistfleet/calc"
)

// CheckKind says what a check judges.
type CheckKind uint8

const (
	// Mechanical checks judge the mechanism itself: rope, drum, motor, gearbox, brakes,
	// life, wear, and the hazard figures (runaway, shaft load).
	Mechanical CheckKind = iota
	// Records checks judge records and data consistency: the periodic inspection, the
	// load test, the declared hoist speed. The summary's worst list puts a hoist whose
	// status comes from a mechanical check first.
	Records
)

// Definition is everything hoistfleet knows about one check apart from its engineering,
// which is the calc function its prepare returns. The table of definitions
// (Definitions) is the only place a check is declared: CheckIDs, the summary's lists,
// the calculation record and the coverage tests (every check has rule rows in both
// profiles, a README entry and an outside reference test) are derived from it.
type Definition struct {
	ID   string
	Kind CheckKind
	// Needs are the schema keys the check cannot run without: a Bad cell makes it
	// error, an empty one unchecked.
	Needs []string
	// NeedsOuterLayer: with more than one rope layer the check also needs the rope
	// diameter, which places the outer layer.
	NeedsOuterLayer bool
	// Uses are optional keys with defaults: a Bad cell makes the check error, an empty
	// one takes the default (reported).
	Uses []string
	// Rules are the rule ids the check looks up; each has a row in both built-in
	// profiles. OptionalRules are looked up when the rules in force have a row (a user
	// rule file may add one); without it the check behaves as documented in Rule.
	Rules, OptionalRules []string
	// LoadDependent checks enter the maximum permissible rated load; Linear ones have a
	// utilisation affine in the rated load and are solved in closed form, the others by
	// bracketed root finding (or their own closed form, set by prepare).
	LoadDependent, Linear bool
	// NullsRating: when this load-independent check fails, the hoist has no rating.
	NullsRating bool
	// Optional: unchecked when a value it needs is missing, and then it neither sets the
	// hoist's status nor stops the rating (component-rating without a Component WLL).
	Optional bool
	// CapsRating: the check's limit caps the rating but is not part of the mechanism's
	// capacity (component-rating: the rating of hook, block, trolley and structure).
	CapsRating bool
	// NoBand: pass up to utilisation 1, no marginal band (a load test at exactly the
	// required test load covers the rating); such a check sets the smallest margin and
	// the worst check only when it fails.
	NoBand bool
	// Rule and Source describe the limit of a check that used no rule-table row (its
	// limit is the register's own rating of the component, or it has none).
	Rule, Source string
	// InfoLimit is set for a check that is information when the rules give it no limit
	// but still fails outright (brake-stop: brakes that cannot stop the load). Its
	// limiting rated load is the load where it starts to fail, and InfoLimit says, for
	// the calculation record, what that load means.
	InfoLimit string
	// OverdueList: a fail is an overdue examination (the summary counts and lists it).
	// FlagList: a fail or marginal is listed among the summary's condition flags.
	OverdueList, FlagList bool
	// Reference names the calc tests that check this check's engineering against
	// outside values (standards tables, handbook examples, limiting cases).
	Reference []string

	// applicable reports whether the check applies at all (false: info "not applicable").
	applicable func(d *hoistData) (bool, string)
	// prepare looks up the rules and returns the function to evaluate at any hoist state
	// with the rule rows it used; an error makes the check unchecked.
	prepare func(d *hoistData) (run func(h calc.Hoist) (calc.Outcome, error), rules []int, err error)
	// advise says what to do about a fail or a marginal, in plain words with the number
	// that makes it concrete ("derate to 10.4 t, or …"); nil: the check's id and message.
	advise func(in adviceInput) advice
	// afterCheck, when set, adds to the hoist's messages once the check has run at the
	// rated load.
	afterCheck func(d *hoistData, cr *CheckResult)
}

// definitions is the table of checks, in presentation order. It is never modified.
var definitions = checkDefinitions()

// CheckIDs lists every check in the order results show them. The ids are a contract
// (design.md): extend, never rename.
var CheckIDs = func() []string {
	ids := make([]string, len(definitions))
	for i, d := range definitions {
		ids[i] = d.ID
	}
	return ids
}()

// Definitions returns the checks' definitions in presentation order (a copy).
func Definitions() []Definition { return append([]Definition(nil), definitions...) }

// DefinitionOf returns the definition of the check with the given id.
func DefinitionOf(id string) (Definition, bool) {
	for _, d := range definitions {
		if d.ID == id {
			return d, true
		}
	}
	return Definition{}, false
}

// definitionAt returns the definition of the check with the given id, which a result
// usually lists k-th; a check id outside the table gets the zero Definition.
func definitionAt(k int, id string) *Definition {
	if k < len(definitions) && definitions[k].ID == id {
		return &definitions[k]
	}
	for i := range definitions {
		if definitions[i].ID == id {
			return &definitions[i]
		}
	}
	return &Definition{ID: id}
}

var loadNeeds = []string{"rated_load"}

// reevingUses are the optional inputs of every rope-tension calculation.
var reevingUses = []string{"hook_block_mass", "parts_of_line", "rope_ends", "sheave_efficiency", "deflection_sheaves", "special_service"}

// driveUses are the optional inputs of the drive-train calculations.
var driveUses = join(reevingUses, []string{"rope_layers", "gear_efficiency", "gear_backdrive_efficiency", "motor_peak_torque", "acceleration"})

// brakeUses are the optional inputs of the brake calculations.
var brakeUses = join(driveUses, []string{"brake_location", "brakes", "brake_delay", "control_braking", "lowering_speed"})

func join(lists ...[]string) []string {
	var out []string
	for _, l := range lists {
		out = append(out, l...)
	}
	return out
}

// prepareFunc is a check's prepare.
type prepareFunc = func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error)

// withRule prepares a check whose calc function takes one rule value.
func withRule(id string, run func(h calc.Hoist, v float64) (calc.Outcome, error)) prepareFunc {
	return func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
		v, r, err := d.rule(id)
		if err != nil {
			return nil, nil, err
		}
		return func(h calc.Hoist) (calc.Outcome, error) { return run(h, v) }, d.usedRows(r), nil
	}
}

// noRule prepares a check whose limit comes from the register, not the rules.
func noRule(run func(h calc.Hoist) (calc.Outcome, error)) prepareFunc {
	return func(*hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) { return run, nil, nil }
}

// closedForm prepares a check without rules whose limiting rated load has a closed form.
func closedForm(run func(h calc.Hoist) (calc.Outcome, error), limit func(h calc.Hoist) float64) prepareFunc {
	return func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
		d.closedLimit = limit
		return run, nil, nil
	}
}

// checkDefinitions returns the table of checks in presentation order.
func checkDefinitions() []Definition {
	return []Definition{
		{ID: "rope-design-factor", Kind: Mechanical, LoadDependent: true, Linear: true,
			advise: func(in adviceInput) advice {
				ft := in.fig("design_tension_n")
				if in.cr.Status == StatusMarginal {
					return say("keep to the rated load: rope design factor " + num3(in.cr.Capacity) + " against " + num3(in.cr.Demand) + " required")
				}
				return orDerate("fit a rope with a minimum breaking force of at least " + up3(in.cr.Demand*ft/1000) + " kN (has " + num3(in.cr.Capacity*ft/1000) + " kN)")
			},
			Needs: join(loadNeeds, []string{"rope_mbf"}), Uses: join(reevingUses, []string{"rope_grade", "rope_construction", "duty_group"}),
			Rules:     []string{"rope.design_factor", "rope.basis"},
			Reference: []string{"TestRopeDesignFactor", "TestRopeTensionWRUMLeadLine", "TestRopeDesignFactorStaticBasis29CFR"},
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				z, rz, err := d.rule("rope.design_factor")
				if err != nil {
					return nil, nil, err
				}
				basis, rb, err := d.ruleWord("rope.basis")
				if err != nil {
					return nil, nil, err
				}
				static := basis == "static"
				return func(h calc.Hoist) (calc.Outcome, error) { return calc.RopeDesignFactor(h, z, static) }, d.usedRows(rz, rb), nil
			}},
		{ID: "drum-ratio", Kind: Mechanical, NullsRating: true,
			advise: func(in adviceInput) advice {
				if in.cr.Status == StatusMarginal {
					return designFixed("the drum's D/d", in)
				}
				return say("drum too small for the rope: D/d " + num3(in.cr.Capacity) + " against " + num3(in.cr.Demand) + " required; no rating can be given until the manufacturer or a competent person approves the drum and rope")
			},
			Needs: []string{"drum_diameter", "rope_diameter"}, Uses: []string{"duty_group"},
			Rules:     []string{"drum.h1"},
			Reference: []string{"TestDrumAndSheaveRatio"},
			prepare:   withRule("drum.h1", calc.DrumRatio)},
		{ID: "sheave-ratio", Kind: Mechanical, NullsRating: true,
			advise: func(in adviceInput) advice {
				if in.cr.Status == StatusMarginal {
					return designFixed("the sheaves' D/d", in)
				}
				return say("sheave too small for the rope: D/d " + num3(in.cr.Capacity) + " against " + num3(in.cr.Demand) + " required; no rating can be given until the manufacturer or a competent person approves the sheave and rope")
			},
			Needs: []string{"sheave_diameter", "rope_diameter"}, Uses: []string{"duty_group"},
			Rules:     []string{"sheave.h2"},
			Reference: []string{"TestDrumAndSheaveRatio"},
			applicable: func(d *hoistData) (bool, string) {
				if d.h.Parts <= d.h.RopeEnds && d.h.DeflectionSheaves == 0 && d.isMissing("sheave_diameter") {
					return false, "no running sheaves (single part per rope end, no deflection sheaves)"
				}
				return true, ""
			},
			prepare: withRule("sheave.h2", calc.SheaveRatio)},
		{ID: "drum-capacity", Kind: Mechanical, NullsRating: true,
			advise: func(in adviceInput) advice {
				if in.cr.Status == StatusMarginal {
					return designFixed("the drum's rope capacity", in)
				}
				return say("the rope does not fit the drum at full lift with the dead wraps (" + num3(in.cr.Demand) + " m of rope for " + num3(in.cr.Capacity) + " m of grooves and layers): shorten the lift or have the drum checked")
			},
			Needs: []string{"drum_diameter", "rope_diameter", "lift_height", "drum_grooves"}, Uses: []string{"parts_of_line", "rope_ends", "rope_layers"},
			Rules:     []string{"drum.dead_wraps"},
			Reference: []string{"TestDrumCapacity"},
			prepare:   withRule("drum.dead_wraps", calc.DrumCapacity)},
		{ID: "fleet-angle", Kind: Mechanical, NullsRating: true,
			advise: func(in adviceInput) advice {
				if in.cr.Status == StatusMarginal {
					return say("no action for the fleet angle (" + num3(in.cr.Demand) + "°, fixed by the layout); note it at the next modification")
				}
				return say("fleet angle " + num3(in.cr.Demand) + "° over the " + num3(in.cr.Capacity) + "° limit: realign the drum and sheaves")
			},
			Needs: []string{"fleet_angle"}, Uses: []string{"drum_grooved"},
			Rules:     []string{"fleet_angle.max_grooved", "fleet_angle.max_plain", "fleet_angle.min"},
			Reference: []string{"TestFleetAngle"},
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				id := "fleet_angle.max_grooved"
				if !d.h.Grooved {
					id = "fleet_angle.max_plain"
				}
				mx, r1, err := d.rule(id)
				if err != nil {
					return nil, nil, err
				}
				mn, r2, err := d.rule("fleet_angle.min")
				if err != nil {
					return nil, nil, err
				}
				return func(h calc.Hoist) (calc.Outcome, error) { return calc.FleetAngle(h, mx, mn) }, d.usedRows(r1, r2), nil
			}},
		{ID: "motor-torque", Kind: Mechanical, LoadDependent: true, Linear: true, NeedsOuterLayer: true,
			advise: overLimit("steady motor torque", "fit a motor rated at least", "N m", 1),
			Needs:  join(loadNeeds, []string{"drum_diameter", "gear_ratio", "motor_power", "motor_speed"}), Uses: driveUses,
			Rule: "steady hoisting torque ≤ rated motor torque M_r = P / ω_m", Source: "motor rating from the register; statics of the drive train (textbook)",
			Reference: []string{"TestMotorTorqueHand", "TestUSCustomaryHoist"},
			prepare:   noRule(calc.MotorTorque)},
		{ID: "motor-power", Kind: Mechanical, LoadDependent: true, Linear: true, NeedsOuterLayer: true,
			advise: overLimit("steady motor power", "fit a motor rated at least", "kW", 1000),
			Needs:  join(loadNeeds, []string{"hoist_speed", "motor_power", "drum_diameter"}), Uses: driveUses,
			Rule: "steady hoisting power ≤ rated motor power P", Source: "motor rating from the register; P = m g v / η (textbook identity)",
			Reference: []string{"TestMotorPower"},
			prepare:   noRule(calc.MotorPower)},
		{ID: "hoist-speed", Kind: Records, NullsRating: true,
			advise: func(in adviceInput) advice {
				return say("fix the register: declared hoist speed " + num3(in.fig("declared_speed_m_s")*60) + " m/min, the drive gives " + num3(in.fig("calculated_speed_m_s")*60) + " m/min (motor speed, gear ratio, drum, reeving)")
			},
			Needs: []string{"motor_speed", "drum_diameter", "gear_ratio", "hoist_speed"}, Uses: []string{"parts_of_line", "rope_ends"},
			Rules:     []string{"hoist_speed.tolerance"},
			Reference: []string{"TestHoistSpeed"},
			prepare:   withRule("hoist_speed.tolerance", calc.HoistSpeed),
			afterCheck: func(d *hoistData, cr *CheckResult) {
				if cr.Status != StatusFail {
					return
				}
				if vc := calc.FigureValue(cr.Figures, "calculated_speed_m_s"); !math.IsNaN(vc) {
					d.messages = append(d.messages, fmt.Sprintf("the declared hoist speed %.3g m/min disagrees with the drive's %.3g m/min (motor speed, gear ratio, drum, reeving): motor-power, brake-stop and runaway use the declared speed, so check the register before trusting them",
						d.h.HoistSpeedMS*60, vc*60))
				}
			}},
		{ID: "motor-accel-torque", Kind: Mechanical, LoadDependent: true, NeedsOuterLayer: true,
			advise: overLimit("accelerating torque", "lower the design acceleration or fit a motor with a peak torque of at least", "N m", 1),
			Needs:  join(loadNeeds, []string{"drum_diameter", "gear_ratio", "motor_power", "motor_speed", "drum_inertia", "motor_inertia"}), Uses: driveUses,
			Rule: "accelerating torque ≤ peak motor torque p M_r", Source: "Newton's second law for load, drum and rotor; peak torque ratio from the register or the rule default",
			Reference: []string{"TestMotorAccelTorqueByHand", "TestTorqueLimitsKg"},
			prepare:   closedForm(calc.MotorAccelTorque, calc.MotorAccelTorqueLimitKg)},
		// Optional: a register without the gear unit's rating leaves the check unchecked
		// without holding back the hoist's status or rating (as before, when it was "not
		// applicable"), but it counts in the coverage and the Data sheet as a gap.
		{ID: "gearbox-torque", Kind: Mechanical, LoadDependent: true, NeedsOuterLayer: true, Optional: true,
			advise: overLimit("gearbox torque", "fit a gear unit rated at least", "N m", 1),
			Needs:  join(loadNeeds, []string{"gearbox_rated_torque", "drum_diameter", "gear_ratio", "drum_inertia", "motor_inertia", "brake_torque"}), Uses: join(brakeUses, []string{"gearbox_peak_torque"}),
			Rules:     []string{"gearbox.peak_factor"},
			Reference: []string{"TestGearboxTorque", "TestGearboxPeakRating", "TestTorqueLimitsKg"},
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				// Steady and accelerating torque against the rated torque, the emergency
				// stop's momentary torque against the peak rating, or the rated torque ×
				// gearbox.peak_factor without one (design.md Revision 2).
				pf, r, err := d.rule("gearbox.peak_factor")
				if err != nil {
					return nil, nil, err
				}
				d.closedLimit = func(h calc.Hoist) float64 { return calc.GearboxTorqueLimitKg(h, pf) }
				return func(h calc.Hoist) (calc.Outcome, error) { return calc.GearboxTorque(h, pf) }, d.usedRows(r), nil
			}},
		{ID: "brake-holding", Kind: Mechanical, LoadDependent: true, Linear: true, NeedsOuterLayer: true,
			advise: overLimit("holding brake demand", "fit holding brakes of at least", "N m", 1),
			Needs:  join(loadNeeds, []string{"brake_torque", "drum_diameter", "gear_ratio"}), Uses: brakeUses,
			Rules:         []string{"brake.factor", "brake.basis", "brake.each", "brake.each_factor"},
			OptionalRules: []string{"brake.needs_control_braking", "brake.min_brakes"},
			Rule:          "brake factor × rated-load torque at the brake ≤ brake capacity; with two or more brakes each alone holds the rated load",
			Source:        "the rule table's brake rows",
			Reference:     []string{"TestBrakeHolding", "TestBrakeHoldingRevision2"},
			prepare:       prepareBrakeHolding},
		{ID: "brake-stop", Kind: Mechanical, LoadDependent: true, NeedsOuterLayer: true,
			advise: func(in adviceInput) advice {
				switch {
				case math.IsNaN(in.cr.Utilisation):
					return say("take out of service: the brakes cannot stop the lowering rated load")
				case in.cr.Status == StatusMarginal:
					return nearLimit("stopping distance", in)
				}
				return orDerate("brakes that stop within " + num3(in.cr.Capacity) + " m (" + num3(in.cr.Demand) + " m now)")
			},
			Needs: join(loadNeeds, []string{"brake_torque", "drum_diameter", "gear_ratio", "drum_inertia", "motor_inertia", "hoist_speed"}), Uses: join(brakeUses, []string{"rope_mbf"}),
			OptionalRules: []string{"brake_stop.max_distance"},
			Rule:          "information: no stopping-distance limit in the rules in force; fails only when the brakes cannot stop the load",
			Source:        "Newton's second law (emergency stop while lowering)",
			InfoLimit:     "Rated load above which the brakes can no longer stop the lowering load (a_b = 0)",
			Reference:     []string{"TestBrakeStopAgainstIntegration", "TestBrakeStopWorkedHoists", "TestBrakeStopLimitKg"},
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				lim := math.NaN()
				var rules []int
				v, i, ok, err := d.optionalRule("brake_stop.max_distance")
				if err != nil {
					return nil, nil, err
				}
				if ok {
					lim, rules = v, d.usedRows(i)
				}
				if len(rules) == 0 {
					d.closedLimit = calc.BrakeStopLimitKg
				}
				return func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeStop(h, lim) }, rules, nil
			}},
		{ID: "runaway", Kind: Mechanical, NeedsOuterLayer: true,
			Needs: join(loadNeeds, []string{"drum_diameter", "gear_ratio", "drum_inertia", "motor_inertia", "hoist_speed"}), Uses: join(driveUses, []string{"lowering_speed", "motor_speed"}),
			Rule: "information: no limit", Source: "Newton's second law (brake released, motor unpowered)",
			Reference: []string{"TestRunawayTextbook", "TestRunawayEnergyBalance", "ExampleRunaway"},
			prepare:   noRule(calc.Runaway)},
		{ID: "shaft-load", Kind: Mechanical,
			Needs: join(loadNeeds, []string{"drum_mass"}), Uses: reevingUses,
			Rule: "information: no limit", Source: "statics: drum weight plus rope pull",
			Reference: []string{"TestShaftLoad"},
			prepare:   noRule(calc.ShaftLoad)},
		{ID: "design-life", Kind: Mechanical, NullsRating: true, FlagList: true,
			advise: func(in adviceInput) advice {
				if in.cr.Status == StatusMarginal {
					return say("plan the general overhaul: " + num3(in.cr.Demand) + " h of the class's " + num3(in.cr.Capacity) + " h used (FEM 9.755)")
				}
				return say("general overhaul due: " + num3(in.cr.Demand) + " h of the class's " + num3(in.cr.Capacity) + " h used (FEM 9.755)")
			},
			Needs: []string{"operating_hours"}, Uses: []string{"duty_group", "load_spectrum", "spectrum_factor", "usage_records", "commissioned", "last_overhaul", "overhaul_hours"},
			Rules:     []string{"life.duration_h", "life.record_factor"},
			Reference: []string{"TestDesignLife", "TestFullLoadDurationAgainstISO4301", "TestDesignLifeAfterOverhaul", "ExampleDesignLife_overhaul"},
			prepare:   prepareDesignLife},
		{ID: "inspection-due", Kind: Records, OverdueList: true,
			advise: func(in adviceInput) advice {
				if in.cr.Status == StatusMarginal {
					return say("book the periodic inspection: due " + in.figText("next_due"))
				}
				return say("examine now: periodic inspection " + num3(in.fig("days_overdue")) + " days overdue")
			},
			Needs: []string{"last_inspection"}, Uses: []string{"service", "next_inspection", "inspection_interval"},
			Rules:     []string{"inspection.interval_months"},
			Reference: []string{"TestInspectionDueCalendar"},
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				months, r, err := d.rule("inspection.interval_months")
				if err != nil {
					return nil, nil, err
				}
				last := d.a.Get("last_inspection").Date
				asOf := d.c.opts.AsOf
				interval := int(math.Round(months))
				own, hasOwn := d.num("inspection_interval")
				if due := d.a.Get("next_inspection").Date; !due.IsZero() || hasOwn {
					skip := !d.c.opts.Record
					return func(h calc.Hoist) (calc.Outcome, error) {
						if hasOwn && own != math.Trunc(own) {
							return calc.Outcome{}, &calc.RangeError{Field: "inspection_interval", Msg: fmt.Sprintf("inspection interval %g is not a whole number of months", own)}
						}
						return calc.InspectionDueSchedule(last, due, int(own), asOf, interval, skip, h.Figs)
					}, d.usedRows(r), nil
				}
				if d.c.opts.Record {
					return func(calc.Hoist) (calc.Outcome, error) {
						return calc.InspectionDue(last, asOf, interval)
					}, d.usedRows(r), nil
				}
				return func(h calc.Hoist) (calc.Outcome, error) {
					return calc.InspectionDueNumbers(last, asOf, interval, h.Figs)
				}, d.usedRows(r), nil
			}},
		{ID: "load-test", Kind: Records, NoBand: true, FlagList: true,
			advise: func(in adviceInput) advice {
				return say("load test before using " + tonnes(in.cr.Demand) + ": the last test covers " + tonnes(in.cr.Capacity))
			},
			Needs: join(loadNeeds, []string{"test_load"}), Uses: []string{"test_type", "proposed_rated_load"},
			Rules:     []string{"load_test.factor", "load_test.proposed_factor"},
			Reference: []string{"TestLoadTest"},
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				// The current rating is judged by load_test.factor; a proposed rating above
				// it by load_test.proposed_factor (US: a rating at most 80 % of the test
				// load, OSHA's letter of 3 January 1989; design.md Revision 2).
				f, r, err := d.rule("load_test.factor")
				if err != nil {
					return nil, nil, err
				}
				fp, rp, err := d.rule("load_test.proposed_factor")
				if err != nil {
					return nil, nil, err
				}
				test, _ := d.num("test_load")
				rated, record := d.h.RatedLoadKg, d.c.opts.Record
				return func(h calc.Hoist) (calc.Outcome, error) {
					factor := f
					if h.RatedLoadKg > rated {
						factor = fp
					}
					if record {
						return calc.LoadTest(h.RatedLoadKg, test, factor)
					}
					return calc.LoadTestNumbers(h.RatedLoadKg, test, factor, h.Figs)
				}, d.usedRows(r, rp), nil
			}},
		{ID: "rope-wear", Kind: Mechanical, NullsRating: true, FlagList: true,
			advise: func(in adviceInput) advice {
				verb := "discard the rope"
				if in.cr.Status == StatusMarginal {
					verb = "examine the rope more often"
				}
				lay, strand, dia := in.fig("broken_wires_utilisation"), in.fig("strand_broken_wires_utilisation"), in.fig("diameter_utilisation")
				bw := lay
				if math.IsNaN(bw) || strand > bw {
					bw = strand
				}
				if !math.IsNaN(bw) && !(dia >= bw) {
					// Broken wires govern (or were the only criterion): the governing count
					// and its discard count are the check's demand and capacity.
					where := "in one lay"
					if bw == strand {
						where = "in one strand in one lay"
					}
					return say(verb + ": " + num3(in.cr.Demand) + " broken wires " + where + " (discard at " + num3(in.cr.Capacity) + ")")
				}
				return say(verb + ": diameter down " + percent(in.fig("reduction_fraction")) + " (limit " + percent(in.cr.Capacity/in.fig("base_diameter_m")) + ")")
			},
			Needs: []string{"rope_diameter"}, Uses: []string{"rope_measured_diameter", "rope_broken_wires", "rope_broken_wires_strand", "rope_reference_diameter", "rope_construction", "rope_fitted"},
			Rules:     []string{"rope_wear.basis", "rope_wear.max_reduction", "rope_wear.broken_wires_lay", "rope_wear.broken_wires_strand"},
			Reference: []string{"TestIso4309UniformDecrease", "TestAsmeB302DiameterBand", "TestRopeWear"},
			prepare:   prepareRopeWear},
		{ID: "overload-limiter", Kind: Records, FlagList: true,
			advise: func(in adviceInput) advice {
				switch {
				case math.IsNaN(in.cr.Utilisation):
					return say("fit an overload limiter (required from " + tonnes(in.fig("required_from_kg")) + ")")
				case in.cr.Unit == "1" || in.cr.ReviewUtilisation > 1+utilisationTolerance && in.fig("days_overdue") == 0:
					return say("have the overload limiter's trip setting checked: " + percent(in.fig("trip_setting")) + " of the rated load (at most " + percent(limiterMax(in)) + ")")
				case in.cr.Status == StatusMarginal:
					return say("book the overload limiter test: due " + in.figText("next_due"))
				}
				return say("test the overload limiter: " + num3(in.fig("days_overdue")) + " days overdue")
			},
			Needs: loadNeeds, Uses: []string{"limiter_fitted", "limiter_last_test", "limiter_setting", "service"},
			Rules: []string{"limiter.test_interval_months", "limiter.max_setting"}, OptionalRules: []string{"limiter.required_from"},
			Rule:      "information: the rules in force require no overload limiter",
			Source:    "no limiter.required_from row in the rules in force",
			Reference: []string{"TestOverloadLimiter", "TestLimiterTripSetting", "TestInspectionDueCalendar"},
			applicable: func(d *hoistData) (bool, string) {
				if !d.isMissing("limiter_fitted") || !(d.h.RatedLoadKg > 0) {
					// A limiter said fitted or not; or a rated load not known, so whether
					// the rules require one is not known either: the check needs it.
					return true, ""
				}
				if from, _, ok, err := d.peekRule("limiter.required_from"); err == nil && ok && d.h.RatedLoadKg >= from {
					return true, ""
				}
				return false, "the rules in force require no overload limiter at this rated load, and the register does not say whether one is fitted"
			},
			prepare: prepareOverloadLimiter},
		// NoBand: a hoist rated at exactly its Component WLL is the ordinary case, not a
		// near miss (pass up to utilisation 1, as load-test).
		{ID: "component-rating", Kind: Mechanical, LoadDependent: true, Linear: true, Optional: true, CapsRating: true, NoBand: true,
			advise: func(in adviceInput) advice {
				if math.IsNaN(in.cr.Utilisation) { // a proposed load without a Component WLL
					return say("have hook, block, trolley and structure rated (Component WLL) before using the proposed load")
				}
				return orDerate("hook, block, trolley and structure rated for " + tonnes(in.cr.Demand) + " (Component WLL " + tonnes(in.cr.Capacity) + ")")
			},
			Needs:     join(loadNeeds, []string{"component_wll"}),
			Rule:      "rated (or proposed) load ≤ Component WLL, the lowest rating of hook, block, trolley and structure",
			Source:    "component rating from the register (design.md Revision 2)",
			Reference: []string{"TestComponentRating"},
			prepare:   noRule(calc.ComponentRating)},
		{ID: "limit-devices", Kind: Records, FlagList: true, Optional: true,
			advise: func(in adviceInput) advice {
				switch {
				case math.IsNaN(in.cr.Utilisation) && in.fig("upper_fitted") == 0:
					return say("fit an upper limit device before further use")
				case math.IsNaN(in.cr.Utilisation):
					return say("fit a lower limit device (the rules require one)")
				case in.cr.Status == StatusMarginal:
					return say("book the limit device test: due " + in.figText("next_due"))
				}
				return say("test the limit devices: " + num3(in.fig("days_overdue")) + " days overdue")
			},
			Needs: []string{"upper_limit_fitted"}, Uses: []string{"lower_limit_fitted", "limit_last_test", "service"},
			Rules:     []string{"limit.upper_required", "limit.lower_required", "limit.test_interval_months"},
			Reference: []string{"TestLimitDevices", "TestInspectionDueCalendar"},
			prepare:   prepareLimitDevices},
		{ID: "motor-duty", Kind: Mechanical, Optional: true,
			advise: func(in adviceInput) advice {
				if in.cr.Status == StatusMarginal {
					if in.cr.ReviewUtilisation > 1+utilisationTolerance {
						return say("have the motor's rating checked against the duty group: " + in.cr.Message)
					}
					return say("keep the starts down: " + num3(in.fig("starts_per_hour")) + " an hour of the motor's " + num3(in.fig("rated_starts_per_hour")))
				}
				if in.cr.Unit == "1/h" && in.fig("starts_utilisation") > 1+utilisationTolerance {
					return say("cut the starts to the motor's " + num3(in.fig("rated_starts_per_hour")) + " an hour (" + num3(in.fig("starts_per_hour")) + " now), or fit a motor rated for them")
				}
				return say("fit a motor rated for the duty: " + in.cr.Message)
			},
			Uses:      []string{"motor_duty_factor", "motor_starts", "starts_per_hour", "cycles_per_hour", "duty_group"},
			Rules:     []string{"motor.starts_per_cycle", "motor.min_duty_factor", "motor.min_starts"},
			Reference: []string{"TestMotorDuty"},
			prepare:   prepareMotorDuty},
		// Load-dependent: the energy grows with the load, so a failing brake-energy limits
		// the rating. Without the brakes' permitted friction work it is information, and
		// its limit is the load the brakes can just stop (as brake-stop's).
		{ID: "brake-energy", Kind: Mechanical, Optional: true, NeedsOuterLayer: true, LoadDependent: true,
			InfoLimit: "Rated load above which the brakes can no longer stop the lowering load (without the brakes' permitted friction work, brake-energy's only limit)",
			advise: func(in adviceInput) advice {
				switch {
				case math.IsNaN(in.cr.Utilisation):
					return say("take out of service: the brakes cannot stop the lowering rated load")
				case in.cr.Status == StatusMarginal:
					return say("have the brake maker confirm the brakes take up to " + up3(in.fig("energy_per_brake_j")/1000) + " kJ each in an emergency stop at the rated load (rated " + num3(in.fig("permitted_work_j")/1000) + " kJ)")
				}
				return orDerate("fit holding brakes rated for at least " + up3(RequiredCapacity(in.cr)*in.fig("permitted_work_j")/in.cr.Capacity/1000) + " kJ a stop each (" + num3(in.fig("permitted_work_j")/1000) + " kJ now), or have the brake maker confirm the brakes take " + up3(in.fig("energy_per_brake_j")/1000) + " kJ a stop")
			},
			Needs: join(loadNeeds, []string{"brake_torque", "drum_diameter", "gear_ratio", "drum_inertia", "motor_inertia", "hoist_speed"}), Uses: join(brakeUses, []string{"brake_friction_work"}),
			Rules:     []string{"brake_energy.factor"},
			Reference: []string{"TestBrakeEnergyBalance", "TestBrakeEnergyLimit"},
			prepare: func(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
				f, r, err := d.rule("brake_energy.factor")
				if err != nil {
					return nil, nil, err
				}
				w, _ := d.num("brake_friction_work") // not given: 0, no limit
				if !(w > 0) {
					// Information: its limit is the load the brakes can just stop, which
					// brake-stop's closed form gives (no search through the stop).
					d.closedLimit = calc.BrakeStopLimitKg
				}
				return func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeEnergy(h, w, f) }, d.usedRows(r), nil
			}},
	}
}

func prepareOverloadLimiter(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
	from, row, ok, err := d.optionalRule("limiter.required_from")
	if err != nil {
		return nil, nil, err
	}
	if !ok {
		from = math.NaN()
	}
	rows := d.rowBuf[:0]
	if ok {
		rows = append(rows, row)
	}
	in := calc.LimiterInput{RequiredFromKg: from, AsOf: d.c.opts.AsOf, SkipRecord: !d.c.opts.Record}
	switch {
	case d.isMissing("limiter_fitted"): // applicable: the rules require one at this load
		return nil, nil, &Error{Kind: Missing, Field: "limiter_fitted", Err: errors.New("needs Overload limiter (yes or no): the rules require one from " + strconv.FormatFloat(from, 'f', -1, 64) + " kg of rated load")}
	case d.text("limiter_fitted") == "yes":
		in.Fitted = true
		in.LastTest = d.a.Get("limiter_last_test").Date
		if in.LastTest.IsZero() {
			return nil, nil, &Error{Kind: Missing, Field: "limiter_last_test", Err: errors.New("needs Limiter last tested: the date of the overload limiter's last test")}
		}
		months, r, err := d.rule("limiter.test_interval_months")
		if err != nil {
			return nil, nil, err
		}
		in.IntervalMonths = int(math.Round(months))
		rows = append(rows, r)
		in.Setting, in.MaxSetting = math.NaN(), math.NaN()
		if s, ok := d.num("limiter_setting"); ok {
			in.Setting = s
			// The largest trip setting may be a review limit (it is in the built-in
			// profiles): then the review judges the setting alone (SettingOnly).
			v, r, ok, err := d.reviewPart("limiter.max_setting")
			if err != nil {
				return nil, nil, err
			}
			if ok {
				in.MaxSetting, in.SettingOnly = v, d.reviewMode
				rows = append(rows, r)
			}
		}
	}
	d.rowBuf = rows // keep a grown buffer
	return func(h calc.Hoist) (calc.Outcome, error) {
		in := in
		in.RatedLoadKg, in.Figs = h.RatedLoadKg, h.Figs
		return calc.OverloadLimiter(in)
	}, rows, nil
}

// limiterMax is the largest trip setting the overload-limiter check was judged against:
// the verified one, or the review limit's.
func limiterMax(in adviceInput) float64 {
	if v := in.fig("max_trip_setting"); !math.IsNaN(v) {
		return v
	}
	if u := in.cr.ReviewUtilisation; u > 0 {
		return in.fig("trip_setting") / u
	}
	return math.NaN()
}

func prepareLimitDevices(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
	up, r1, err := d.ruleWord("limit.upper_required")
	if err != nil {
		return nil, nil, err
	}
	low, r2, err := d.ruleWord("limit.lower_required")
	if err != nil {
		return nil, nil, err
	}
	rows := append(d.rowBuf[:0], r1, r2)
	in := calc.LimitDeviceInput{UpperFitted: d.text("upper_limit_fitted") == "yes", UpperRequired: up == "yes",
		LowerRequired: low == "yes", LowerFitted: d.text("lower_limit_fitted") == "yes", AsOf: d.c.opts.AsOf, SkipRecord: !d.c.opts.Record}
	in.LowerKnown = !d.isMissing("lower_limit_fitted")
	if in.LowerRequired && !in.LowerKnown {
		return nil, nil, &Error{Kind: Missing, Field: "lower_limit_fitted", Err: errors.New("needs Lower limit device (yes or no): the rules require one")}
	}
	fails := (in.UpperRequired && !in.UpperFitted) || (in.LowerRequired && !in.LowerFitted)
	if !fails && (in.UpperFitted || in.LowerFitted) {
		in.LastTest = d.a.Get("limit_last_test").Date
		if in.LastTest.IsZero() {
			return nil, nil, &Error{Kind: Missing, Field: "limit_last_test", Err: errors.New("needs Limit devices last tested: the date of the limit devices' last test")}
		}
		months, r, err := d.rule("limit.test_interval_months")
		if err != nil {
			return nil, nil, err
		}
		in.IntervalMonths = int(math.Round(months))
		rows = append(rows, r)
	}
	d.rowBuf = rows // keep a grown buffer
	return func(h calc.Hoist) (calc.Outcome, error) {
		in := in
		in.Figs = h.Figs
		return calc.LimitDevices(in)
	}, rows, nil
}

// errNeedsMotorRating is motor-duty's message without the motor's intermittent rating
// (never modified: made once, not per hoist).
var errNeedsMotorRating = errors.New("needs Motor duty factor, Motor starts per hour")

// prepareMotorDuty reads the motor's intermittent rating and the hoist's starts. The
// group's requirement (FEM 9.683) is looked up as a part of the check that may be a
// review limit (reviewPart): in the built-in profiles it is, so the check's verdict
// rests on the starts run against the motor's rated starts, and the review (run again
// with the requirement alone) makes it marginal at worst.
func prepareMotorDuty(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
	ed, okE := d.num("motor_duty_factor")
	zr, okZ := d.num("motor_starts")
	if !okE && !okZ {
		return nil, nil, &Error{Kind: Missing, Field: "motor_duty_factor", Err: errNeedsMotorRating}
	}
	nan := math.NaN()
	in := calc.MotorDutyInput{RatedDutyFactor: nan, RatedStarts: nan, RequiredDutyFactor: nan, RequiredStarts: nan,
		StartsPerHour: nan, CyclesPerHour: nan, SkipRecord: !d.c.opts.Record}
	c, rc, err := d.rule("motor.starts_per_cycle")
	if err != nil {
		return nil, nil, err
	}
	in.StartsPerCycle = c
	rows := append(d.rowBuf[:0], rc)
	if okE {
		in.RatedDutyFactor = ed
		v, r, ok, err := d.reviewPart("motor.min_duty_factor")
		if err != nil {
			return nil, nil, err
		}
		if ok {
			in.RequiredDutyFactor, rows = v, append(rows, r)
		}
	}
	if okZ {
		in.RatedStarts = zr
		v, r, ok, err := d.reviewPart("motor.min_starts")
		if err != nil {
			return nil, nil, err
		}
		if ok {
			in.RequiredStarts, rows = v, append(rows, r)
		}
	}
	if !d.reviewMode { // the review judges the group's requirement alone
		if v, ok := d.num("starts_per_hour"); ok {
			in.StartsPerHour = v
		}
		if v, ok := d.num("cycles_per_hour"); ok {
			in.CyclesPerHour = v
		}
	}
	d.rowBuf = rows // keep a grown buffer
	return func(h calc.Hoist) (calc.Outcome, error) {
		in := in
		in.Figs = h.Figs
		return calc.MotorDuty(in)
	}, rows, nil
}

func prepareDesignLife(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
	if d.group == 0 {
		return nil, nil, &Error{Kind: Missing, Field: "duty_group", Err: errors.New("needs the duty group (or the usage to derive it)")}
	}
	km, ok := d.num("spectrum_factor")
	if !ok {
		if s := d.text("load_spectrum"); len(s) == 2 {
			km, ok = calc.SpectrumFactor(int(s[1] - '0'))
		}
	}
	if !ok {
		return nil, nil, &Error{Kind: Missing, Field: "load_spectrum", Err: errors.New("needs the load spectrum (L1–L4) or the spectrum factor")}
	}
	dur, r1, err := d.rule("life.duration_h")
	if err != nil {
		return nil, nil, err
	}
	x, r2, err := d.rule("life.record_factor")
	if err != nil {
		return nil, nil, err
	}
	hours, _ := d.num("operating_hours")
	in := calc.LifeInput{OperatingHours: hours / 3600, Km: km, RecordFactor: x, FullLoadDurationH: dur,
		Commissioned: d.a.Get("commissioned").Date, AsOf: d.c.opts.AsOf, SkipRecord: !d.c.opts.Record,
		Overhaul: d.a.Get("last_overhaul").Date, HoursAtOverhaul: math.NaN()}
	if oh, ok := d.num("overhaul_hours"); ok {
		in.HoursAtOverhaul = oh / 3600 // the schema reads time in seconds
	}
	return func(h calc.Hoist) (calc.Outcome, error) {
		in := in
		in.Figs = h.Figs
		return calc.DesignLife(in)
	}, d.usedRows(r1, r2), nil
}

func prepareRopeWear(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
	meas, okm := d.num("rope_measured_diameter")
	bw, okb := d.num("rope_broken_wires")
	bs, oks := d.num("rope_broken_wires_strand")
	if !okm && !okb && !oks {
		return nil, nil, &Error{Kind: Missing, Field: "rope_measured_diameter", Err: errors.New("needs the measured rope diameter or the broken-wire count from the last inspection")}
	}
	in := calc.WearInput{NominalM: d.h.RopeDiameterM, MeasuredM: meas, BrokenWires: -1, StrandBrokenWires: -1,
		Fitted: d.a.Get("rope_fitted").Date, AsOf: d.c.opts.AsOf, SkipRecord: !d.c.opts.Record}
	in.ReferenceM, _ = d.num("rope_reference_diameter")
	if basis, _, err := d.ruleWord("rope_wear.basis"); err == nil && basis == "nominal" {
		// The profile measures the reduction from nominal (ASME B30.2), whatever
		// reference diameter the register gives.
		in.ReferenceM = 0
	}
	if okb {
		in.BrokenWires = int(bw)
	}
	rules := d.rowBuf[:0]
	if okm {
		v, r, err := d.rule("rope_wear.max_reduction")
		if err != nil {
			return nil, nil, err
		}
		rules = append(rules, r)
		if d.c.opts.Rules.Rules[r].Dimension() == "length" {
			in.MaxReductionM = v
		} else {
			in.MaxReductionFraction = v
		}
	}
	if okb {
		v, r, err := d.rule("rope_wear.broken_wires_lay")
		if err != nil {
			return nil, nil, err
		}
		rules = append(rules, r)
		in.MaxBrokenWires = int(v)
	}
	if oks {
		v, r, err := d.rule("rope_wear.broken_wires_strand")
		if err != nil {
			return nil, nil, err
		}
		rules = append(rules, r)
		in.StrandBrokenWires, in.MaxStrandBrokenWires = int(bs), int(v)
	}
	d.rowBuf = rules // keep a grown buffer
	return func(h calc.Hoist) (calc.Outcome, error) {
		in := in
		in.Figs = h.Figs
		return calc.RopeWear(in)
	}, rules, nil
}

// prepareBrakeHolding reads the holding-brake rules (design.md Revision 2, "Holding
// brake" and "US control braking"): the factor and the torque it multiplies, whether it
// applies to each brake, the each-brake factor, and where the rules in force have them,
// the control braking means and the minimum number of brakes.
func prepareBrakeHolding(d *hoistData) (func(calc.Hoist) (calc.Outcome, error), []int, error) {
	var rule calc.BrakeRule
	f, r1, err := d.rule("brake.factor")
	if err != nil {
		return nil, nil, err
	}
	basis, r2, err := d.ruleWord("brake.basis")
	if err != nil {
		return nil, nil, err
	}
	each, r3, err := d.ruleWord("brake.each")
	if err != nil {
		return nil, nil, err
	}
	fe, r4, err := d.rule("brake.each_factor")
	if err != nil {
		return nil, nil, err
	}
	rule.Factor, rule.Static, rule.Each, rule.EachFactor = f, basis == "static", each == "yes", fe
	rows := d.usedRows(r1, r2, r3, r4)
	t := d.c.opts.Rules
	if need, i := d.optionalWord("brake.needs_control_braking"); i >= 0 {
		rows = append(rows, i)
		if need == "yes" && d.scope.Attrs["control"] == "none" {
			rule.ControlBrakingCite = t.RuleCite(i)
		}
	}
	v, i, ok, err := d.optionalRule("brake.min_brakes")
	if err != nil {
		return nil, nil, err
	}
	if ok {
		rows = append(rows, i)
		rule.MinBrakes, rule.MinBrakesCite = int(v), t.RuleCite(i)
	}
	d.rowBuf = rows // keep a grown buffer
	return func(h calc.Hoist) (calc.Outcome, error) { return calc.BrakeHolding(h, rule) }, rows, nil
}
