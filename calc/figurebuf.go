package calc

// FigureBuf is memory for the figures of many Outcomes: a bulk run gives each hoist's
// checks one (Hoist.Figs, LifeInput.Figs, WearInput.Figs, and the figs argument of the
// Numbers variants) and reuses it for a later hoist once nothing reads the earlier
// hoist's figures any more, so that the figures of a million hoists are not each a new
// allocation for the garbage collector. A nil *FigureBuf gives every Outcome a slice of
// its own, as before; the figures are the same either way.
type FigureBuf struct {
	figs []Figure
}

// figureBlock is the size of a new block, in figures: a hoist's checks make about 90.
const figureBlock = 128

// take returns a copy of fs in b's memory (a new slice when b is nil). The copy's
// capacity is its length, so an append to it cannot run into a later Outcome's figures.
// When the current block is full a new one is started; slices already handed out keep
// the old one.
func (b *FigureBuf) take(fs []Figure) []Figure {
	if b == nil {
		return append([]Figure(nil), fs...)
	}
	if cap(b.figs)-len(b.figs) < len(fs) {
		b.figs = make([]Figure, 0, max(figureBlock, 2*cap(b.figs), len(fs)))
	}
	start := len(b.figs)
	b.figs = append(b.figs, fs...)
	return b.figs[start:len(b.figs):len(b.figs)]
}

// Reset makes all of b's memory free for new figures. Every slice b handed out since the
// last Reset must be out of use: its contents will be overwritten. (The old figures are
// not cleared: they hold only constant names and units and a few date texts, which the
// next hoist's figures overwrite.)
func (b *FigureBuf) Reset() { b.figs = b.figs[:0] }
