// Package outbuf holds what the streaming result writers (io/csvout, io/jsonout) share:
// encodings prepared in the pipeline's workers and recycled once written, the shortest
// form of a float64 (AppendShortest, what strconv writes, faster for the numbers of a
// result), a cache of formatted numbers across hoists (NumCache) and a memo of those
// written in the current one (NumMemo), a schema field read by index (TextField), and
// a complete write of a block of output.
package outbuf

import (
	"io"
	"math"
	"sync"
)

// Prepared makes and recycles the encodings one writer's Prepare leaves in
// fleet.Result.Prepared (see fleet.Preparer). Its methods are safe for concurrent use.
type Prepared struct {
	spare sync.Pool // *[]byte
}

// encoding is a result's bytes, made by the Prepared that owns them.
type encoding struct {
	owner *Prepared
	b     *[]byte
}

// Encode runs encode on a recycled buffer and returns the encoding, for
// fleet.Result.Prepared.
func (p *Prepared) Encode(encode func(dst []byte) []byte) any {
	b, _ := p.spare.Get().(*[]byte)
	if b == nil {
		b = new([]byte)
	}
	*b = encode((*b)[:0])
	return &encoding{owner: p, b: b}
}

// AppendTo appends the encoding v to dst and recycles its buffer, when p made v; ok is
// false (dst unchanged) for anything else, which the writer then encodes itself.
func (p *Prepared) AppendTo(dst []byte, v any) (out []byte, ok bool) {
	e, ok := v.(*encoding)
	if !ok || e.owner != p {
		return dst, false
	}
	dst = append(dst, *e.b...)
	*e.b = (*e.b)[:0]
	p.spare.Put(e.b)
	e.b = nil
	return dst, true
}

// WriteAll writes p to w, reporting a short write without an error as io.ErrShortWrite
// (as bufio does).
func WriteAll(w io.Writer, p []byte) error {
	n, err := w.Write(p)
	if err == nil && n < len(p) {
		err = io.ErrShortWrite
	}
	return err
}

// numCacheBits sets the size of a NumCache: 1<<numCacheBits entries of 32 bytes.
const numCacheBits = 11

// NumCache remembers the text of recently written numbers, direct-mapped on the bits of
// the float64. A hoist repeats many of its numbers across checks (a rope tension is a
// figure of several checks, a capacity is also a figure) and a fleet repeats its rule
// values, so many numbers are copied rather than formatted again. The zero value is
// ready; it is not safe for concurrent use.
type NumCache struct {
	e [1 << numCacheBits]numEntry
}

type numEntry struct {
	bits uint64
	n    uint8 // length of text; 0: empty slot
	text [23]byte
}

// Append appends format(b, f), from the cache when f was formatted lately. format must
// always give the same text for the same bits; a text longer than 23 bytes is not kept.
func (c *NumCache) Append(b []byte, f float64, format func([]byte, float64) []byte) []byte {
	bits := math.Float64bits(f)
	e := &c.e[(bits*0x9E3779B97F4A7C15)>>(64-numCacheBits)]
	if e.n > 0 && e.bits == bits {
		return append(b, e.text[:e.n]...)
	}
	start := len(b)
	b = format(b, f)
	if n := len(b) - start; n <= len(e.text) {
		e.bits, e.n = bits, uint8(n)
		copy(e.text[:], b[start:])
	}
	return b
}
