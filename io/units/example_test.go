package units_test

import (
	"fmt"

	"hoistfleet/io/units"
)

func ExampleSplitHeader() {
	for _, h := range []string{"Rated load [t]", "Rope diameter (in)", "Motor inertia GD2 [kgf m2]", "Site"} {
		title, unit, _ := units.SplitHeader(h)
		fmt.Printf("%q → %q, %q\n", h, title, unit)
	}
	// Output:
	// "Rated load [t]" → "Rated load", "t"
	// "Rope diameter (in)" → "Rope diameter", "in"
	// "Motor inertia GD2 [kgf m2]" → "Motor inertia", "GD2 kgf m2"
	// "Site" → "Site", ""
}

func ExampleFactor() {
	// A 2-ton hoist, rated 4000 lb: 4000 lb × 0.45359237 kg/lb (NIST SP 811).
	f, _ := units.Factor("mass", "lb")
	fmt.Printf("4000 lb = %.4f kg\n", 4000*f)
	// 160 % peak torque is a ratio of 1.6.
	f, _ = units.Factor("ratio", "%")
	fmt.Printf("160 %% = %.2f\n", 160*f)
	// A bare "ton" is refused rather than guessed.
	_, err := units.Factor("mass", "ton")
	fmt.Println(err)
	// Output:
	// 4000 lb = 1814.3695 kg
	// 160 % = 1.60
	// ton is ambiguous: write short ton or long ton
}
