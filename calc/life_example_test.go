package calc_test

import (
	"fmt"
	"time"

	"hoistfleet/calc"
)

// A 2m (M5) hoist with an hour counter and a log (X = 1.2), light-medium spectrum L2
// (km 0.25), 4 000 h on the meter five years after commissioning.
func ExampleDesignLife() {
	g, _, _ := calc.ParseDutyGroup("2m")
	km, _ := calc.SpectrumFactor(2)
	o, err := calc.DesignLife(calc.LifeInput{
		OperatingHours:    4000,
		Km:                km,
		RecordFactor:      1.2,
		FullLoadDurationH: calc.FullLoadDuration(g),
		Commissioned:      time.Date(2020, 1, 1, 0, 0, 0, 0, time.UTC),
		AsOf:              time.Date(2025, 1, 1, 0, 0, 0, 0, time.UTC),
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, f := range o.Figures {
		if f.Text != "" {
			fmt.Printf("%s %s\n", f.Name, f.Text)
		} else {
			fmt.Printf("%s %.4g %s\n", f.Name, f.Value, f.Unit)
		}
	}
	fmt.Printf("S/D = %.0f/%.0f h = %.2f\n", o.Demand, o.Capacity, o.Utilisation)
	// Output:
	// used_h 1200 h
	// remaining_h 400 h
	// remaining_operating_h 1333 h
	// usage_rate_h_per_day 2.189 h/day
	// overhaul_due 2026-09-02
	// counted_from commissioning
	// period_h 4000 h
	// S/D = 1200/1600 h = 0.75
}

// The same hoist after a general overhaul on 2023-01-01 with the hour meter at 3 000 h:
// FEM 9.755's used part S restarts there, so T = 4 000 − 3 000 = 1 000 h and
// S = 1.2 × 0.25 × 1 000 = 300 h of the class's 1 600 h (hand arithmetic); the usage rate
// is counted over the 731 days since the overhaul (2024 is a leap year): 1.368 h/day.
func ExampleDesignLife_overhaul() {
	g, _, _ := calc.ParseDutyGroup("2m")
	km, _ := calc.SpectrumFactor(2)
	o, err := calc.DesignLife(calc.LifeInput{
		OperatingHours:    4000,
		Km:                km,
		RecordFactor:      1.2,
		FullLoadDurationH: calc.FullLoadDuration(g),
		Commissioned:      time.Date(2020, 1, 1, 0, 0, 0, 0, time.UTC),
		AsOf:              time.Date(2025, 1, 1, 0, 0, 0, 0, time.UTC),
		Overhaul:          time.Date(2023, 1, 1, 0, 0, 0, 0, time.UTC),
		HoursAtOverhaul:   3000,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(o.Note)
	fmt.Printf("counted from %s: T = %.0f h, S/D = %.0f/%.0f h = %.4g, rate %.4g h/day\n",
		o.Figures[5].Text, o.Figure("period_h"), o.Demand, o.Capacity, o.Utilisation, o.Figure("usage_rate_h_per_day"))
	// Output:
	// S counted from the general overhaul of 2023-01-01 (hour meter 3000 h then): 1000 h since, against a full D again: check the period the overhaul report allows
	// counted from overhaul 2023-01-01: T = 1000 h, S/D = 300/1600 h = 0.1875, rate 1.368 h/day
}

// Deriving the duty group from usage: 20 cycles an hour of 5 m at 10 m/min over 8 h
// days, with 250 working days a year for 10 years from the rule table.
func ExampleDeriveDuty() {
	d, err := calc.DeriveDuty(calc.Usage{
		CyclesPerHour: 20, MeanLiftM: 5, HoursPerDay: 8, SpeedMPerMin: 10,
		WorkingDaysPerYear: 250, DesignYears: 10,
		Km: 0.25,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(calc.DutyGroupName(d.Group), calc.FEMClassName(d.Group))
	fmt.Println(d.Basis)
	// Output:
	// M6 3m
	// running time 2·N·H·T/(V·60) = 2.66667 h/day × 250 days a year × 10 years = 6666.67 h → T6; km 0.25 → L2; ISO 4301-1 T6/L2 → M6
}

// An inspection on a one-month interval last done on 31 January: the due date is the
// last day of the short February.
func ExampleInspectionDue() {
	last := time.Date(2026, 1, 31, 0, 0, 0, 0, time.UTC)
	asOf := time.Date(2026, 3, 10, 0, 0, 0, 0, time.UTC)
	o, err := calc.InspectionDue(last, asOf, 1)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%.0f of %.0f %s, u = %.3f\n", o.Demand, o.Capacity, o.Unit, o.Utilisation)
	fmt.Println(o.Note)
	// Output:
	// 38 of 28 d, u = 1.357
	// periodic inspection overdue by 10 days (due 2026-02-28)
}

// A 1/2 in rope under the ASME B30.2-2005 diameter table, with broken wires counted.
func ExampleRopeWear() {
	const inch = 0.0254
	band, _ := calc.AsmeB302DiameterBand(0.5 * inch)
	o, err := calc.RopeWear(calc.WearInput{
		NominalM:      0.5 * inch,
		MeasuredM:     0.48 * inch,
		MaxReductionM: band,
		BrokenWires:   4, MaxBrokenWires: 12,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("reduction %.3f of %.3f mm, discard at %.3f mm\n", o.Demand*1000, o.Capacity*1000, o.Figure("discard_diameter_m")*1000)
	fmt.Printf("u = max(%.2f, %.2f) = %.2f\n", o.Figure("diameter_utilisation"), o.Figure("broken_wires_utilisation"), o.Utilisation)
	// Output:
	// reduction 0.508 of 0.794 mm, discard at 11.906 mm
	// u = max(0.64, 0.33) = 0.64
}
