package fleet

// EvaluateAtLoads evaluates asset a at each rated load in loadsKg (kg), as Check
// evaluates a proposed rated load: every check with its status, demand, capacity and
// utilisation at that load, the hoist's status, worst check and smallest margin, but no
// calculation record (no Steps) and no limit-load search (LimitRatedLoadKg NaN). The
// hoist's inputs are resolved once. A blank row gives nil.
//
// A calculation record's rating diagram draws each load-dependent check's utilisation
// against the load from it, so that its curves come from the same checks, rules and
// defaults as the record's numbers.
func (c *Checker) EvaluateAtLoads(a *Asset, loadsKg []float64) []Evaluation {
	if a == nil || a.Blank {
		return nil
	}
	s := c.getScratch()
	defer c.putScratch(s)
	d := &s.d
	c.resolve(a, d)
	prepared := s.prepared
	for i := range c.specs {
		prepared[i] = c.prepare(d, &c.specs[i])
	}
	h := d.h
	h.SkipRecord, h.Figs = true, nil // numbers only; each evaluation gets its own figures
	out := make([]Evaluation, len(loadsKg))
	for i, kg := range loadsKg {
		out[i] = c.evaluate(d, h.WithRatedLoad(kg), prepared, false, nil)
	}
	return out
}
