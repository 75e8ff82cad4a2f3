package calc_test

import (
	"fmt"
	"strings"

	"hoistfleet/calc"
)

// A 2 t hoist on two parts of a 12 mm 6×36 IWRC rope of grade 1960, checked against the
// ISO 4308-1 design factor of group M5 (Zp 4.5) and against the static basis of 29 CFR
// 1910.179(h)(2) (5 on W/n).
//
// By hand: MBF = 12² × 1960 × 0.356 = 100 477.44 N (EN 12385-4); W = 2000 × 9.80665 =
// 19 613.3 N; η_R = (1 − 0.98²)/(2 × 0.02) = 0.99; F = 19 613.3/(2 × 0.99) = 9 905.71 N;
// Z = 100 477.44/9 905.71 = 10.1434; u = 4.5/10.1434 = 0.444. Static: W/n = 9 806.65 N,
// Z = 10.2458, u = 5/10.2458 = 0.488.
func ExampleRopeDesignFactor() {
	k, name, ok := calc.RopeK("6x36WS-IWRC")
	if !ok {
		fmt.Println("unknown construction")
		return
	}
	h := calc.Hoist{
		G:             calc.StandardGravity,
		RatedLoadKg:   2000,
		Parts:         2,
		RopeEnds:      1,
		SheaveEff:     0.98,
		RopeDiameterM: 0.012,
		RopeMBFN:      calc.MBFFromGrade(0.012, 1960, k),
	}
	fmt.Printf("%s: MBF %.2f kN\n", name, h.RopeMBFN/1000)

	iso, err := calc.RopeDesignFactor(h, 4.5, false)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, s := range iso.Steps {
		if s.Symbol == "η_R" || s.Symbol == "F" || s.Symbol == "Z_act" {
			line := fmt.Sprintf("%s = %s = %s = %.6g %s", s.Symbol, s.Formula, s.Numbers, s.Value, strings.TrimSuffix(s.Unit, "1"))
			fmt.Println(strings.TrimSpace(line))
		}
	}
	fmt.Printf("ISO 4308-1: design factor %.2f, required %.1f, utilisation %.3f\n", iso.Capacity, iso.Demand, iso.Utilisation)

	us, err := calc.RopeDesignFactor(h, 5, true)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("29 CFR 1910.179: design factor %.2f, required %.0f, utilisation %.3f\n", us.Capacity, us.Demand, us.Utilisation)
	// Output:
	// 6×36 class IWRC: MBF 100.48 kN
	// η_R = (1 − η_s^n_e) / (n_e (1 − η_s)) = (1 − 0.98^2) / (2 (1 − 0.98)) = 0.99
	// F = W / (n η_RD) = 19613.3 / (2 × 0.99) = 9905.71 N
	// Z_act = MBF / F_Z = 100477 / 9905.71 = 10.1434
	// ISO 4308-1: design factor 10.14, required 4.5, utilisation 0.444
	// 29 CFR 1910.179: design factor 10.25, required 5, utilisation 0.488
}

// A drum with 30 grooves per rope end, 400 mm pitch diameter, one layer, 10 m lift on
// two parts: the rope needs 20 m plus two dead wraps (29 CFR 1910.179(h)(2)).
//
// By hand: π D = 1.25664 m; demand 20 + 2 × 1.25664 = 22.513 m; capacity 30 × 1.25664 =
// 37.699 m; turns left at the lowest hook 30 − 20/1.25664 = 14.08.
func ExampleDrumCapacity() {
	h := calc.Hoist{Parts: 2, RopeEnds: 1, SheaveEff: 0.98, DrumDiameterM: 0.4, Layers: 1, Grooves: 30, LiftHeightM: 10}
	o, err := calc.DrumCapacity(h, 2)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("rope per end %.3f m, capacity %.3f m, utilisation %.3f\n", o.Demand, o.Capacity, o.Utilisation)
	fmt.Printf("wraps left at the lowest hook %.2f\n", o.Figure("wraps_left_at_lowest_hook"))
	// Output:
	// rope per end 22.513 m, capacity 37.699 m, utilisation 0.597
	// wraps left at the lowest hook 14.08
}
