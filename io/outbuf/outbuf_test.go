package outbuf

import (
	"bytes"
	"errors"
	"io"
	"math"
	"math/rand/v2"
	"strconv"
	"sync"
	"testing"
)

// TestPrepared: an encoding goes back to the writer that made it, byte for byte, once;
// anything else (nil, another writer's encoding) is refused and leaves dst unchanged.
// Encodings are made concurrently, as the pipeline's workers do.
func TestPrepared(t *testing.T) {
	var p, other Prepared
	const n = 200
	encs := make([]any, n)
	var wg sync.WaitGroup
	for i := range n {
		wg.Add(1)
		go func() {
			defer wg.Done()
			encs[i] = p.Encode(func(b []byte) []byte { return strconv.AppendInt(append(b, "line "...), int64(i), 10) })
		}()
	}
	wg.Wait()
	var out []byte
	for i, e := range encs {
		var ok bool
		if out, ok = p.AppendTo(out, e); !ok {
			t.Fatalf("encoding %d refused", i)
		}
		out = append(out, '\n')
	}
	var want []byte
	for i := range n {
		want = append(strconv.AppendInt(append(want, "line "...), int64(i), 10), '\n')
	}
	if !bytes.Equal(out, want) {
		t.Errorf("wrote %q…, want %q…", out[:40], want[:40])
	}
	foreign := other.Encode(func(b []byte) []byte { return append(b, "x"...) })
	for _, v := range []any{nil, "text", foreign} {
		if got, ok := p.AppendTo([]byte("dst"), v); ok || string(got) != "dst" {
			t.Errorf("AppendTo(%v) = %q, %v; want dst, false", v, got, ok)
		}
	}
}

type shortWriter struct{}

func (shortWriter) Write(p []byte) (int, error) { return len(p) / 2, nil }

type failWriter struct{}

var errDisk = errors.New("disk full")

func (failWriter) Write(p []byte) (int, error) { return 0, errDisk }

func TestWriteAll(t *testing.T) {
	var b bytes.Buffer
	if err := WriteAll(&b, []byte("abc")); err != nil || b.String() != "abc" {
		t.Errorf("WriteAll: %q, %v", b.String(), err)
	}
	if err := WriteAll(shortWriter{}, []byte("abcd")); !errors.Is(err, io.ErrShortWrite) {
		t.Errorf("short write: %v, want io.ErrShortWrite", err)
	}
	if err := WriteAll(failWriter{}, []byte("abcd")); !errors.Is(err, errDisk) {
		t.Errorf("failed write: %v, want %v", err, errDisk)
	}
}

// watchWriter records each write and checks, before it returns, that the encoding it
// is given has not been handed out for reuse yet: a Prepared.Encode made meanwhile (as a
// worker's would be) must not get the same buffer.
type watchWriter struct {
	p    *Prepared
	got  []string
	errs []error
}

func (w *watchWriter) Write(b []byte) (int, error) {
	w.got = append(w.got, string(b))
	e := w.p.Encode(func(dst []byte) []byte { return append(dst, "other"...) })
	if string(b) != w.got[len(w.got)-1] {
		w.errs = append(w.errs, errors.New("the buffer being written was reused"))
	}
	w.p.AppendTo(nil, e)
	return len(b), nil
}

// TestPreparedWriteOut: WriteOut writes an encoding of its own Prepared once, whole, and
// recycles the buffer only after Write has returned; anything else is refused without a
// write; write errors and short writes are reported as by WriteAll.
func TestPreparedWriteOut(t *testing.T) {
	var p, other Prepared
	w := &watchWriter{p: &p}
	for i := range 50 {
		e := p.Encode(func(b []byte) []byte { return strconv.AppendInt(append(b, "line "...), int64(i), 10) })
		if ok, err := p.WriteOut(w, e); !ok || err != nil {
			t.Fatalf("WriteOut %d: %v, %v", i, ok, err)
		}
		if ok, _ := p.WriteOut(w, e); ok {
			t.Fatalf("encoding %d written twice", i)
		}
		if want := "line " + strconv.Itoa(i); w.got[i] != want {
			t.Fatalf("write %d: %q, want %q", i, w.got[i], want)
		}
	}
	for _, err := range w.errs {
		t.Error(err)
	}
	foreign := other.Encode(func(b []byte) []byte { return append(b, "x"...) })
	for _, v := range []any{nil, "text", foreign} {
		if ok, err := p.WriteOut(failWriter{}, v); ok || err != nil {
			t.Errorf("WriteOut(%v) = %v, %v; want false, nil", v, ok, err)
		}
	}
	for _, tt := range []struct {
		w    io.Writer
		want error
	}{{failWriter{}, errDisk}, {shortWriter{}, io.ErrShortWrite}} {
		e := p.Encode(func(b []byte) []byte { return append(b, "abcd"...) })
		if ok, err := p.WriteOut(tt.w, e); !ok || !errors.Is(err, tt.want) {
			t.Errorf("WriteOut to %T: %v, %v; want true, %v", tt.w, ok, err, tt.want)
		}
	}
}

// absorbing is an Absorber that says what it is told.
type absorbing struct {
	bytes.Buffer
	absorbs bool
}

func (a *absorbing) AbsorbsWrites() bool { return a.absorbs }

func TestAbsorbs(t *testing.T) {
	for _, tt := range []struct {
		w    io.Writer
		want bool
	}{
		{&bytes.Buffer{}, false},
		{io.Discard, false},
		{&absorbing{absorbs: false}, false},
		{&absorbing{absorbs: true}, true},
	} {
		if got := Absorbs(tt.w); got != tt.want {
			t.Errorf("Absorbs(%T %+v) = %v, want %v", tt.w, tt.w, got, tt.want)
		}
	}
}

// TestNumCache: through the cache every number reads as format writes it, for edge
// values and random ones repeated (hits and slot collisions alike), including a format
// whose text is too long to keep.
func TestNumCache(t *testing.T) {
	formats := map[string]func([]byte, float64) []byte{
		"g":    func(b []byte, f float64) []byte { return strconv.AppendFloat(b, f, 'g', -1, 64) },
		"long": func(b []byte, f float64) []byte { return strconv.AppendFloat(b, f, 'f', 30, 64) },
	}
	rng := rand.New(rand.NewPCG(1, 2))
	vals := []float64{0, math.Copysign(0, -1), 1, -1, 0.1, 1e-300, math.MaxFloat64, math.SmallestNonzeroFloat64, math.NaN(), math.Inf(1)}
	for range 5000 {
		vals = append(vals, rng.NormFloat64()*math.Pow(10, float64(rng.IntN(20)-10)))
	}
	for name, format := range formats {
		var c NumCache
		for pass := range 3 {
			for _, f := range vals {
				got := c.Append([]byte("x"), f, format)
				if want := format([]byte("x"), f); !bytes.Equal(got, want) {
					t.Fatalf("%s pass %d: Append(%b) = %s, want %s", name, pass, f, got, want)
				}
			}
		}
	}
}
