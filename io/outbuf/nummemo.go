package outbuf

import "math"

// numMemoBits sets the size of a NumMemo: 1<<numMemoBits slots of 16 bytes.
const numMemoBits = 9

// NumMemo remembers where the numbers of the output being built were written, so that
// a number that comes again (a check's capacity repeated as one of its figures, a rope
// tension that several checks list: about a quarter of a hoist's numbers) is copied
// from there instead of formatted again. It holds no text of its own, only places in
// the buffer, keyed by the bits of the float64 (so 0 and -0, or two numbers one bit
// apart, are never taken for each other), and Reset forgets everything in constant
// time: it is meant to be reset for each hoist.
//
// The caller promises that, between two Resets, every call gets the same buffer (the one
// the previous call returned, grown only by appending) and that the bytes appended stay
// as they are; a caller that rewrites or drops bytes already appended must Reset first.
// A remembered place beyond the end of the buffer is ignored. The zero value is ready;
// it is not safe for concurrent use.
type NumMemo struct {
	gen  uint16 // the current generation; a slot is live when its tag is gen+1
	slot [1 << numMemoBits]numSlot
}

type numSlot struct {
	bits uint64 // the float64's bits
	off  uint32 // where its text starts in the buffer
	n    uint8  // the length of its text
	tag  uint16 // the generation that wrote it, plus one: 0 in an empty slot
}

// Reset forgets every number remembered.
func (m *NumMemo) Reset() {
	m.gen++
	if m.gen == math.MaxUint16 { // tags would wrap to 0: start afresh
		clear(m.slot[:])
		m.gen = 0
	}
}

// AppendShortest appends f as the package's AppendShortest does, copying its text from
// where this memo saw it written since the last Reset when it can. Whole numbers written
// as their digits are formatted again, which costs less than finding them. Between two
// Resets, a memo must be used with one format only.
func (m *NumMemo) AppendShortest(b []byte, f float64, format byte) []byte {
	if isPlainWhole(f, format) {
		return appendWhole(b, f)
	}
	bits := math.Float64bits(f)
	s := &m.slot[(bits*0x9E3779B97F4A7C15)>>(64-numMemoBits)]
	tag := m.gen + 1
	if s.tag == tag && s.bits == bits {
		if end := int(s.off) + int(s.n); end <= len(b) {
			return append(b, b[s.off:end]...)
		}
	}
	start := len(b)
	b = appendFraction(b, f, format)
	if n := len(b) - start; n <= math.MaxUint8 && start <= math.MaxUint32 {
		*s = numSlot{bits: bits, off: uint32(start), n: uint8(n), tag: tag}
	}
	return b
}
