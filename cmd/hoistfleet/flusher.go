package main

import (
	"errors"
	"io"
	"sync"

	"hoistfleet/io/outbuf"
)

// flushEvery is how much output a flusher writes between two requests that the
// operating system write it to disk.
const flushEvery = 32 << 20

// chunkSize and maxChunks bound what a flusher holds that the file has not yet taken:
// at most maxChunks chunks, one being filled and the rest queued or being written.
const (
	chunkSize = 4 << 20
	maxChunks = 6
)

// errFlusherClosed is returned by a Write after Close.
var errFlusherClosed = errors.New("write after the output was closed")

// flusher stands between the result writer and the output file, so that the run never
// waits on the file:
//
//   - Writes are copied into chunks of chunkSize that a goroutine of its own writes to the
//     file in order. A write(2) into the page cache can block for milliseconds (while the
//     file system commits its journal, say); the reorder buffer holds only a few
//     milliseconds of results, so a write that blocked the result writer would stall
//     every worker. Up to maxChunks × chunkSize of output absorbs it.
//   - Every flushEvery bytes a third goroutine calls sync, which asks the operating system
//     to write the file back (writeBackAndDrop; a plain fsync where that is not
//     available), so that the disk writes the results while the hoists are still being
//     checked. Without it the sync before the atomic rename (output.commit) writes the
//     whole output at the end: 0.8 GB of long-form CSV for 100 000 hoists is a second or
//     more of waiting on a disk that could have been writing all along. A call due while
//     one runs is merged into the next.
//
// The first write or sync error is returned by the next Write, and by Close.
//
// A flusher is an outbuf.Absorber: its Write only copies into the current chunk, so the
// CSV and JSONL writers hand it each hoist's bytes straight from the worker's buffer
// instead of first gathering them into 64 KiB blocks of their own (a copy of the whole
// output saved).
type flusher struct {
	w    io.Writer
	sync func() error

	buf       []byte        // the chunk being filled (nil: none yet)
	allocated int           // chunks made so far, at most maxChunks
	full      chan []byte   // chunks to write, in order
	free      chan []byte   // written chunks, for reuse
	written   chan struct{} // closed when the writing goroutine has written everything
	kick      chan struct{} // a sync is due
	synced    chan struct{} // closed when the syncing goroutine has stopped
	once      sync.Once

	mu  sync.Mutex
	err error
}

func newFlusher(w io.Writer, syncFile func() error) *flusher {
	f := &flusher{
		w: w, sync: syncFile,
		full: make(chan []byte, maxChunks), free: make(chan []byte, maxChunks),
		written: make(chan struct{}), kick: make(chan struct{}, 1), synced: make(chan struct{}),
	}
	go f.writeLoop()
	go f.syncLoop()
	return f
}

// fail records err if it is the first error.
func (f *flusher) fail(err error) {
	f.mu.Lock()
	if f.err == nil {
		f.err = err
	}
	f.mu.Unlock()
}

func (f *flusher) firstErr() error {
	f.mu.Lock()
	defer f.mu.Unlock()
	return f.err
}

// writeLoop writes the chunks in order and asks for a sync every flushEvery bytes. After
// an error it goes on taking chunks (so that Write never waits forever) but writes none.
func (f *flusher) writeLoop() {
	defer close(f.written)
	pending := 0
	for chunk := range f.full {
		if f.firstErr() == nil {
			if _, err := f.w.Write(chunk); err != nil {
				f.fail(err)
			}
		}
		pending += len(chunk)
		if pending >= flushEvery {
			pending = 0
			select {
			case f.kick <- struct{}{}:
			default: // a sync is already due: it will cover these bytes too
			}
		}
		f.free <- chunk[:0]
	}
}

func (f *flusher) syncLoop() {
	defer close(f.synced)
	for range f.kick {
		if err := f.sync(); err != nil {
			f.fail(err)
		}
	}
}

// Write copies p into the current chunk, handing each full chunk to the writing
// goroutine. It waits only when maxChunks chunks are waiting to be written.
func (f *flusher) Write(p []byte) (int, error) {
	if err := f.firstErr(); err != nil {
		return 0, err
	}
	if f.full == nil {
		return 0, errFlusherClosed
	}
	n := len(p)
	for len(p) > 0 {
		if f.buf == nil {
			f.buf = f.chunk()
		}
		c := copy(f.buf[len(f.buf):cap(f.buf)], p)
		f.buf, p = f.buf[:len(f.buf)+c], p[c:]
		if len(f.buf) == cap(f.buf) {
			f.full <- f.buf
			f.buf = nil
		}
	}
	return n, nil
}

var _ outbuf.Absorber = (*flusher)(nil)

// AbsorbsWrites reports that a write of any size costs a copy into the current chunk
// (outbuf.Absorber): p is not kept once Write returns.
func (f *flusher) AbsorbsWrites() bool { return true }

// chunk returns an empty chunk: a written one, or a new one while fewer than maxChunks
// exist, or else the next one the writing goroutine frees.
func (f *flusher) chunk() []byte {
	select {
	case c := <-f.free:
		return c
	default:
	}
	if f.allocated < maxChunks {
		f.allocated++
		return make([]byte, 0, chunkSize)
	}
	return <-f.free
}

// errFlusherAborted is the error of a flusher after Abort.
var errFlusherAborted = errors.New("output abandoned")

// Abort stops the flusher without writing what it still holds (chunks queued, the partial
// one): the output is being abandoned. It waits for a write in progress, like Close.
func (f *flusher) Abort() {
	f.fail(errFlusherAborted)
	f.Close()
}

// Close hands over the last partial chunk, waits until everything is written and the
// background syncs have stopped, and returns the first error met. It does not sync what
// remains: the caller's final sync does. Close may be called more than once.
func (f *flusher) Close() error {
	f.once.Do(func() {
		if len(f.buf) > 0 {
			f.full <- f.buf
			f.buf = nil
		}
		close(f.full)
		<-f.written
		close(f.kick)
		<-f.synced
		f.full = nil
	})
	return f.firstErr()
}
