package main

import (
	"io"
	"sync"
)

// flushEvery is how much output a flusher lets the operating system hold before it asks
// for it to be written to disk.
const flushEvery = 32 << 20

// flusher passes writes through to a file and, every flushEvery bytes, has a goroutine of
// its own sync the file, so that the disk writes the results while the hoists are still
// being checked. Without it the sync before the atomic rename (output.commit) writes the
// whole output at the end: 0.8 GB of long-form CSV for 100 000 hoists is a second or more
// of waiting on a disk that could have been writing all along.
//
// Writes never wait for a sync; a sync requested while one runs is merged into the next.
// The first sync error is returned by Close.
type flusher struct {
	w       io.Writer
	sync    func() error
	pending int64
	kick    chan struct{}
	done    chan struct{}
	once    sync.Once
	mu      sync.Mutex
	err     error
}

func newFlusher(w io.Writer, syncFile func() error) *flusher {
	f := &flusher{w: w, sync: syncFile, kick: make(chan struct{}, 1), done: make(chan struct{})}
	go f.loop()
	return f
}

func (f *flusher) loop() {
	defer close(f.done)
	for range f.kick {
		if err := f.sync(); err != nil {
			f.mu.Lock()
			if f.err == nil {
				f.err = err
			}
			f.mu.Unlock()
		}
	}
}

func (f *flusher) Write(p []byte) (int, error) {
	n, err := f.w.Write(p)
	f.pending += int64(n)
	if f.pending >= flushEvery {
		f.pending = 0
		select {
		case f.kick <- struct{}{}:
		default: // a sync is already due: it will cover these bytes too
		}
	}
	return n, err
}

// Close stops the background syncs (waiting for one in progress) and returns the first
// error one of them met. It does not sync what remains: the caller's final sync does.
func (f *flusher) Close() error {
	f.once.Do(func() { close(f.kick) })
	<-f.done
	f.mu.Lock()
	defer f.mu.Unlock()
	return f.err
}
