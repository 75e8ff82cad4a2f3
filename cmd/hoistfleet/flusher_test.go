package main

import (
	"bytes"
	"crypto/sha256"
	"errors"
	"io"
	"sync/atomic"
	"testing"
	"time"

	"hoistfleet/io/outbuf"
)

// TestFlusher: every byte reaches the file in order, a sync is requested for each
// flushEvery bytes written (merged when one is still running), and a sync error is
// returned by Close.
func TestFlusher(t *testing.T) {
	out, want := sha256.New(), sha256.New()
	var syncs atomic.Int64
	f := newFlusher(out, func() error { syncs.Add(1); return nil })
	chunk := bytes.Repeat([]byte("0123456789abcdef"), 4096) // 64 KiB
	total := 0
	for i := 0; total < 3*flushEvery+len(chunk); i++ {
		chunk[i%len(chunk)]++ // every write differs, so order matters to the hash
		want.Write(chunk)
		n, err := f.Write(chunk)
		if err != nil || n != len(chunk) {
			t.Fatalf("write: %d, %v", n, err)
		}
		total += n
	}
	if err := f.Close(); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(out.Sum(nil), want.Sum(nil)) {
		t.Errorf("the file's %d bytes differ from those written", total)
	}
	if n := syncs.Load(); n < 1 || n > 3 {
		t.Errorf("%d syncs for %d bytes, want 1 to 3 (one per %d bytes, merged when busy)", n, total, flushEvery)
	}
	if err := f.Close(); err != nil { // a second Close is harmless
		t.Fatal(err)
	}

	boom := errors.New("disk full")
	g := newFlusher(io.Discard, func() error { return boom })
	for range flushEvery / len(chunk) {
		g.Write(chunk)
	}
	if err := g.Close(); !errors.Is(err, boom) {
		t.Errorf("Close after a failed sync: %v, want %v", err, boom)
	}
}

// TestFlusherBytesInOrder: writes of every size, some larger than a chunk, reach the file
// as one stream in order, the last partial chunk included.
func TestFlusherBytesInOrder(t *testing.T) {
	out, want := sha256.New(), sha256.New()
	f := newFlusher(out, func() error { return nil })
	sizes := []int{1, 7, 64 << 10, chunkSize - 3, chunkSize, 2*chunkSize + 5, 0, 12345}
	for i, n := range sizes {
		var pattern [251]byte // a prime length, so no two writes line up alike
		for j := range pattern {
			pattern[j] = byte(i*31 + j*7)
		}
		p := bytes.Repeat(pattern[:], n/len(pattern)+1)[:n]
		want.Write(p)
		if m, err := f.Write(p); m != n || err != nil {
			t.Fatalf("write %d bytes: %d, %v", n, m, err)
		}
	}
	if err := f.Close(); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(out.Sum(nil), want.Sum(nil)) {
		t.Error("the file's bytes differ from those written, in order")
	}
	if _, err := f.Write([]byte("late")); !errors.Is(err, errFlusherClosed) {
		t.Errorf("write after Close: %v, want %v", err, errFlusherClosed)
	}
}

// TestFlusherAbsorbsWrites: the flusher tells the CSV and JSONL writers that it takes
// small writes cheaply (outbuf.Absorber), so they hand it each hoist's bytes from a
// buffer they reuse as soon as Write returns: what reaches the file is what each Write
// was given, though the caller overwrites it at once.
func TestFlusherAbsorbsWrites(t *testing.T) {
	out, want := sha256.New(), sha256.New()
	f := newFlusher(out, func() error { return nil })
	if !outbuf.Absorbs(f) {
		t.Fatal("the flusher does not say it absorbs writes")
	}
	p := make([]byte, 8<<10) // about a hoist of long-form CSV
	for i := 0; i < 3*chunkSize/len(p); i++ {
		for j := range p {
			p[j] = byte(i + j*3)
		}
		want.Write(p)
		if _, err := f.Write(p); err != nil {
			t.Fatal(err)
		}
		clear(p) // the writer reuses its buffer
	}
	if err := f.Close(); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(out.Sum(nil), want.Sum(nil)) {
		t.Error("the file's bytes differ from those written: the flusher kept a caller's buffer")
	}
}

// gate is a writer that blocks until released, counting what it was given.
type gate struct {
	open chan struct{}
	n    atomic.Int64
}

func (g *gate) Write(p []byte) (int, error) {
	<-g.open
	g.n.Add(int64(len(p)))
	return len(p), nil
}

// TestFlusherAbsorbsABlockedFile: while the file does not take writes, the flusher
// accepts up to maxChunks−1 chunks without making the caller wait; then it waits.
func TestFlusherAbsorbsABlockedFile(t *testing.T) {
	g := &gate{open: make(chan struct{})}
	f := newFlusher(g, func() error { return nil })
	chunk := make([]byte, chunkSize)
	done := make(chan int)
	go func() {
		n := 0
		for range maxChunks + 2 {
			f.Write(chunk)
			n++
			done <- n
		}
	}()
	for want := 1; want < maxChunks; want++ {
		select {
		case n := <-done:
			if n != want {
				t.Fatalf("write %d returned, want %d", n, want)
			}
		case <-time.After(10 * time.Second):
			t.Fatalf("write %d of a chunk waited on a blocked file; want %d writes absorbed", want, maxChunks-1)
		}
	}
	select {
	case n := <-done:
		// With one chunk taken by the blocked writer and maxChunks in all, write
		// maxChunks can still fill the last free one; beyond that it must wait.
		if n > maxChunks {
			t.Fatalf("write %d returned with the file blocked: the flusher holds too much", n)
		}
	case <-time.After(50 * time.Millisecond):
	}
	close(g.open)
	for n := range done {
		if n == maxChunks+2 {
			break
		}
	}
	if err := f.Close(); err != nil {
		t.Fatal(err)
	}
	if got := g.n.Load(); got != int64((maxChunks+2)*chunkSize) {
		t.Errorf("file got %d bytes, want %d", got, (maxChunks+2)*chunkSize)
	}
}

// failing is a writer that fails from its second write on.
type failing struct{ calls int }

var errDiskFull = errors.New("no space left on device")

func (w *failing) Write(p []byte) (int, error) {
	if w.calls++; w.calls > 1 {
		return 0, errDiskFull
	}
	return len(p), nil
}

// TestFlusherWriteErrorSticks: a failed write to the file is returned by a later Write
// and by Close, and the caller never waits forever.
func TestFlusherWriteErrorSticks(t *testing.T) {
	f := newFlusher(&failing{}, func() error { return nil })
	chunk := make([]byte, chunkSize)
	var err error
	for i := 0; i < 100 && err == nil; i++ {
		_, err = f.Write(chunk)
	}
	if !errors.Is(err, errDiskFull) {
		t.Errorf("Write after a failed file write: %v, want %v", err, errDiskFull)
	}
	if err := f.Close(); !errors.Is(err, errDiskFull) {
		t.Errorf("Close after a failed file write: %v, want %v", err, errDiskFull)
	}
}

// TestFlusherAbortWritesNothingMore: after Abort, chunks still queued and the partial one
// are dropped, not written; a write in progress finishes; Close then reports the abort.
func TestFlusherAbortWritesNothingMore(t *testing.T) {
	g := &gate{open: make(chan struct{})}
	f := newFlusher(g, func() error { return nil })
	chunk := make([]byte, chunkSize)
	for range 3 { // one taken by the blocked writer, two queued
		if _, err := f.Write(chunk); err != nil {
			t.Fatal(err)
		}
	}
	f.Write([]byte("partial"))
	done := make(chan struct{})
	go func() { f.Abort(); close(done) }()
	for deadline := time.Now().Add(10 * time.Second); f.firstErr() == nil; time.Sleep(time.Millisecond) {
		if time.Now().After(deadline) { // Abort must mark the flusher before it waits on the file
			close(g.open)
			t.Fatal("Abort did not mark the flusher as abandoned while a write was blocked")
		}
	}
	close(g.open)
	select {
	case <-done:
	case <-time.After(10 * time.Second):
		t.Fatal("Abort did not return")
	}
	if got := g.n.Load(); got > chunkSize {
		t.Errorf("the file got %d bytes after Abort, want at most the one chunk being written (%d)", got, chunkSize)
	}
	if err := f.Close(); !errors.Is(err, errFlusherAborted) {
		t.Errorf("Close after Abort: %v, want %v", err, errFlusherAborted)
	}
}
