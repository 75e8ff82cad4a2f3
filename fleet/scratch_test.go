package fleet

import "testing"

// TestTextMemoMatchesChecker: through a scratch's memo, every set of two to four rule rows
// gets the texts Checker.ruleTexts builds, on first and on repeated look-ups, with sets
// enough to fill the memo and collide in it (reused slots must not answer for another set).
func TestTextMemoMatchesChecker(t *testing.T) {
	c := isoChecker(t)
	s := c.getScratch()
	defer c.putScratch(s)
	d := &s.d
	d.reset(c, &Asset{})
	n := len(c.opts.Rules.Rules)
	if n < 8 {
		t.Fatalf("rule table has %d rows; the test needs more", n)
	}
	var sets [][]int
	for i := 0; i < n; i++ {
		sets = append(sets, []int{i, (i + 1) % n}, []int{(i + 3) % n, i, (i + 5) % n}, []int{i, (i + 2) % n, (i + 4) % n, (i + 7) % n})
	}
	for round := range 2 {
		for _, rows := range sets {
			gotRule, gotSource := d.ruleTexts(rows)
			wantRule, wantSource := c.ruleTexts(rows)
			if gotRule != wantRule || gotSource != wantSource {
				t.Fatalf("round %d, rows %v: memo gave (%q, %q), want (%q, %q)", round, rows, gotRule, gotSource, wantRule, wantSource)
			}
		}
	}
	if len(sets) <= len(d.texts) {
		t.Fatalf("only %d sets for a memo of %d: no collisions tested", len(sets), len(d.texts))
	}
}
