package cite

import (
	"fmt"
	"testing"

	"hoistfleet/fleet/rules"
)

func TestShort(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"ISO 4308-1 (edition not recorded), minimum practical design factor Zp, running ropes [seen]; ISO 4308-1 (edition not recorded), rope tension in hoisting [memory, medium]",
			"ISO 4308-1 [seen]; ISO 4308-1 [memory, medium]"},
		{"29 CFR 1910.179(h)(2); ASME B30.2 [law]", "29 CFR 1910.179(h)(2); ASME B30.2 [law]"},
		{"Wire Rope Users Manual (Wire Rope Technical Board), fleet angle; edition not recorded [seen]", "Wire Rope Users Manual [seen]"},
		{"Machinery Directive 2006/42/EC, Annex I 4.1.2.3 (static test coefficient) [memory, high]",
			"Machinery Directive 2006/42/EC, Annex I 4.1.2.3 [memory, high]"},
		{"Machinery Directive 2006/42/EC Annex I 4.2.2 (control of loads): lifting machinery with a maximum working load [memory, medium-high]; hoistfleet default (engineering judgement): the limiter is tested [common practice, no published source]",
			"Machinery Directive 2006/42/EC Annex I 4.2.2 [memory, medium-high]; hoistfleet default [common practice, no published source]"},
		{"OSHA interpretation letter, 3 January 1989, on 1910.179(k)(2) [seen]", "OSHA interpretation letter, 3 January 1989 [seen]"},
		{"ASME B30.16, periodic inspection, normal service; edition not recorded [seen]", "ASME B30.16 [seen]"},
		// no provenance label: a method, not a rule's citation, kept whole
		{"Newton's second law for load, drum and rotor; peak torque ratio from the register or the rule default",
			"Newton's second law for load, drum and rotor; peak torque ratio from the register or the rule default"},
		{"statics: drum weight plus rope pull", "statics: drum weight plus rope pull"},
		{"", ""},
		{"[seen]", "[seen]"},
		{"My insurer's guide [seen]", "My insurer's guide [seen]"},
		{"(odd) text [seen]", "(odd) text [seen]"},
	} {
		if got := Short(tc.in); got != tc.want {
			t.Errorf("Short(%q)\n got  %q\n want %q", tc.in, got, tc.want)
		}
	}
}

// TestShortBuiltInRules: every built-in rule's citation keeps its provenance label, is
// no longer than the full citation and starts the way the full text starts (the short form
// is a prefix of the designation, never a rewording).
func TestShortBuiltInRules(t *testing.T) {
	for _, p := range []string{"iso", "us"} {
		tab, err := rules.Profile(p)
		if err != nil {
			t.Fatal(err)
		}
		for _, r := range tab.Rules {
			full := r.Cite()
			s := Short(full)
			label := " [" + r.Provenance + "]"
			if len(s) > len(full) || s[:len(s)-len(label)] != r.Source[:len(s)-len(label)] || s[len(s)-len(label):] != label {
				t.Errorf("%s %s: Short(%q) = %q", p, r.ID, full, s)
			}
		}
	}
}

func ExampleShort() {
	fmt.Println(Short("ISO 4308-1 (edition not recorded), coefficient h1, drums [memory, medium]"))
	// Output: ISO 4308-1 [memory, medium]
}
