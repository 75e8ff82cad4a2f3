// Package outbuf holds what the streaming result writers (io/csvout, io/jsonout) share:
// encodings prepared in the pipeline's workers and recycled once written, the shortest
// form of a float64 (AppendShortest, what strconv writes, faster for the numbers of a
// result), a cache of formatted numbers across hoists (NumCache), a schema field read
// by index (TextField), a complete write of a block of output, and the sign (Absorber)
// that the writer below buffers cheaply itself, so the result writers need not gather
// blocks first.
package outbuf

import (
	"io"
	"math"
	"sync"
)

// Prepared makes and recycles the encodings one writer's Prepare leaves in
// fleet.Result.Prepared (see fleet.Sink). Its methods are safe for concurrent use.
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
	e := p.take(v)
	if e == nil {
		return dst, false
	}
	dst = append(dst, *e.b...)
	p.recycle(e)
	return dst, true
}

// WriteOut writes the encoding v to w (WriteAll) and recycles its buffer once w.Write has
// returned, when p made v; ok is false (nothing written) for anything else, which the
// writer then encodes itself. w must not keep the bytes after Write returns (the
// io.Writer contract): the buffer is reused for a later result straight away.
func (p *Prepared) WriteOut(w io.Writer, v any) (ok bool, err error) {
	e := p.take(v)
	if e == nil {
		return false, nil
	}
	err = WriteAll(w, *e.b)
	p.recycle(e)
	return true, err
}

// take returns v as an encoding of p's, or nil.
func (p *Prepared) take(v any) *encoding {
	if e, ok := v.(*encoding); ok && e.owner == p && e.b != nil {
		return e
	}
	return nil
}

// recycle puts e's buffer back in the pool; e is empty after.
func (p *Prepared) recycle(e *encoding) {
	*e.b = (*e.b)[:0]
	p.spare.Put(e.b)
	e.b = nil
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

// Absorber is an io.Writer that takes small writes as cheaply as a buffer in front of it
// would: its Write copies p into a large buffer of its own and returns, and the bytes
// are written out later, elsewhere. cmd/hoistfleet's output file is one (its flusher
// copies every write into 4 MiB chunks that a goroutine of its own writes to the file).
//
// The result writers (io/csvout, io/jsonout) gather their output into blocks of about
// 64 KiB before writing it, so that a file, standard output or a pipe gets few large
// write(2)s. In front of an Absorber that block is a second copy of every byte for
// nothing, so there they hand on each hoist's encoding as it comes, straight from the
// buffer the worker encoded it in (Prepared.WriteOut), and hold nothing between calls.
//
// Like any io.Writer, an Absorber must not keep p after Write returns: the caller reuses
// it at once.
type Absorber interface {
	io.Writer
	// AbsorbsWrites reports whether small writes are cheap; a wrapper answers for the
	// writer it wraps.
	AbsorbsWrites() bool
}

// Absorbs reports whether w is an Absorber that takes small writes cheaply.
func Absorbs(w io.Writer) bool {
	a, ok := w.(Absorber)
	return ok && a.AbsorbsWrites()
}

// numCacheBits sets the size of a NumCache: 1<<numCacheBits entries of 32 bytes.
const numCacheBits = 11

// NumCache remembers the text of recently written numbers, direct-mapped on the bits of
// the float64. A hoist repeats many of its numbers across checks (a rope tension is a
// figure of several checks, a capacity is also a figure) and a fleet repeats its rule
// values, so many numbers are copied rather than formatted again. The zero value is
// ready; it is not safe for concurrent use.
//
// What it beats: formatting every number. jsonout's BenchmarkWriteReal (2000 checked
// hoists from cmd/hoistgen, CPU time, 5 interleaved runs, 2026-12-05) takes 1.36× the
// time without the cache (8.7 → 11.8 µs a hoist).
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
