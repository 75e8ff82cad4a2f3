package units

import (
	"math"
	"testing"
)

// FuzzSplitHeaderAndFactor: the header parser and the unit table never panic, a factor is
// always finite and positive, and every refusal has a message.
func FuzzSplitHeaderAndFactor(f *testing.F) {
	for _, s := range []string{"Rated load [t]", "Rope diameter (in)", "Motor inertia GD2 [kgf m2]", "x [ton]", "[(]", "a (b [c])", "Brake torque [lbf·ft]", "Speed [m/s²]", ")", "GD²"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, h string) {
		title, unit, err := SplitHeader(h)
		if err != nil && err.Error() == "" {
			t.Fatal("empty error message")
		}
		if len(title) > len(h) {
			t.Fatalf("title %q longer than the header %q", title, h)
		}
		_ = Normalize(title)
		for _, q := range Quantities() {
			for _, u := range []string{unit, h} {
				x, err := Factor(q, u)
				switch {
				case err != nil && err.Error() == "":
					t.Fatalf("Factor(%q, %q): empty error message", q, u)
				case err == nil && (!(x > 0) || math.IsInf(x, 0)):
					t.Fatalf("Factor(%q, %q) = %v", q, u, x)
				}
			}
		}
	})
}
