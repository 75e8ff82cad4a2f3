package fleet

import (
	"hoistfleet/fleet/rules"
)

// scratch is the working memory of one Check: the resolved inputs and the prepared
// checks. Nothing in it outlives the Check that used it (Result gets fresh slices or
// copies), so a Checker recycles it to keep the garbage collector's work per hoist down.
type scratch struct {
	d        hoistData
	prepared []preparedCheck
}

func (c *Checker) getScratch() *scratch {
	if s, ok := c.scratch.Get().(*scratch); ok {
		return s
	}
	return &scratch{
		d: hoistData{
			missing: make([]bool, len(c.columns)),
			bad:     make([]*Error, len(c.columns)),
			scope:   rules.Scope{Attrs: make(map[string]string, 8), Nums: make(map[string]float64, 2)},
			rules:   make([]int, 0, 24),
		},
		prepared: make([]preparedCheck, len(c.specs)),
	}
}

// putScratch drops the scratch's references to the hoist (its asset, the closures that
// read it, its Result's figure memory) and keeps it for the next Check.
func (c *Checker) putScratch(s *scratch) {
	clear(s.prepared)
	s.d.a, s.d.closedLimit, s.d.h.Figs = nil, nil, nil
	c.scratch.Put(s)
}

// reset readies d for asset a. The slices a Result takes over (defaults, derived) start
// nil so each hoist gets its own; messages are copied into the Result, rules cloned.
func (d *hoistData) reset(c *Checker, a *Asset) {
	clear(d.missing)
	clear(d.bad)
	clear(d.scope.Attrs)
	clear(d.scope.Nums)
	d.scope.Group = 0 // resolveDuty looks rules up before the group is known
	*d = hoistData{a: a, c: c, missing: d.missing, bad: d.bad, scope: d.scope,
		messages: d.messages[:0], gaps: d.gaps[:0], rules: d.rules[:0], rowBuf: d.rowBuf[:0],
		reviewRows: d.reviewRows[:0]}
}
