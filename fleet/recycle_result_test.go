package fleet

import (
	"context"
	"fmt"
	"strings"
	"testing"
	"time"
)

// renderingSink renders each Result to text when it is written, the moment a real Sink
// reads it.
type renderingSink struct {
	texts []string
}

func (k *renderingSink) Begin(*Header, *RunInfo) error { return nil }
func (k *renderingSink) Prepare(*Result)               {}
func (k *renderingSink) Write(r *Result) error {
	k.texts = append(k.texts, renderResult(r))
	return nil
}
func (k *renderingSink) End(*Summary, *RunInfo) error { return nil }
func (k *renderingSink) Abort()                       {}

// renderResult is everything a Sink reads of r, as text: NaNs print as NaN, so equal
// results render equal.
func renderResult(r *Result) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s row %d %v %q %v %+v\n", r.Asset.ID, r.Asset.Row, r.Status, r.WorstCheck, r.MinMargin, r.Rating)
	fmt.Fprintf(&b, "%q %q %q\n", r.Messages, r.DefaultsUsed, r.Derived)
	for _, c := range r.Checks {
		fmt.Fprintf(&b, "%+v\n", c)
	}
	if r.Proposed != nil {
		fmt.Fprintf(&b, "proposed %v %v\n", r.Proposed.RatedLoadKg, r.Proposed.Status)
		for _, c := range r.Proposed.Checks {
			fmt.Fprintf(&b, "%+v\n", c)
		}
	}
	return b.String()
}

// TestRecycledResultsAreWrittenIntact: Run recycles each Result (its checks, figures,
// proposed evaluation and rule rows) for a later hoist. Every result must still reach the
// Sink exactly as a Check of its own gives it (a fresh Checker, nothing recycled), for a
// register mixing hoists with different checks, figures and a proposed load.
func TestRecycledResultsAreWrittenIntact(t *testing.T) {
	const n = 400
	protos := []*Asset{
		winchA(t).asset(),
		winchB(t).asset(),
		winchA(t).num("proposed_rated_load", 6000).asset(),
		winchB(t).num("rope_measured_diameter", 0.0118).asset(),
	}
	gen := func(i int) *Asset {
		a := *protos[i%len(protos)]
		a.ID = fmt.Sprintf("%s-%03d", a.ID, i)
		a.Row = i + 2
		return &a
	}
	sink := &renderingSink{}
	src := &fakeSource{h: testHeader(), n: n, gen: gen, t: t}
	if _, err := runWithin(t, 60*time.Second, context.Background(), src, sink, checkerWith(t, 4, 16), &RunInfo{}, nil); err != nil {
		t.Fatal(err)
	}
	if len(sink.texts) != n {
		t.Fatalf("%d results written, want %d", len(sink.texts), n)
	}
	fresh := checkerWith(t, 1, 1)
	for i := range n {
		a := gen(i)
		a.Index = i
		if want := renderResult(fresh.Check(a)); sink.texts[i] != want {
			t.Fatalf("row %d written differently through Run:\n%s\nits own Check:\n%s", i, sink.texts[i], want)
		}
	}
}

// TestCheckReusesARecycledResult: a new Result has no figure memory of its own (a kept
// Result must not hold a whole block); a recycled one gets it, and its memory is what
// the next Check fills. sync.Pool may drop an item (the race detector drops one in four
// on purpose), so the test asks for reuse at least once in 20 tries.
func TestCheckReusesARecycledResult(t *testing.T) {
	c := isoChecker(t)
	a := winchA(t).num("proposed_rated_load", 6000).asset()
	if r := c.Check(a); r.figs != nil {
		t.Error("a new Result has figure memory of its own")
	}
	for range 20 {
		r := c.Check(a)
		checks := &r.Checks[0]
		if r.Proposed != &r.spare {
			t.Fatal("the proposed evaluation is not kept in the Result's own memory")
		}
		c.recycle(r)
		if len(r.Checks) != 0 || r.Proposed != nil || r.Asset != nil {
			t.Fatalf("a recycled Result still holds its hoist: %d checks, proposed %v, asset %v", len(r.Checks), r.Proposed, r.Asset)
		}
		figs := r.figs
		if figs == nil {
			t.Fatal("a recycled Result has no figure memory")
		}
		again := c.Check(a)
		if again == r && &again.Checks[0] == checks && again.figs == figs {
			return
		}
	}
	t.Error("Check never reused a recycled Result in 20 tries")
}
