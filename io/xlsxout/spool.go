package xlsxout

import (
	"archive/zip"
	"bufio"
	"compress/flate"
	"errors"
	"fmt"
	"hash/crc32"
	"io"
	"os"
	"sync/atomic"
)

// spool is one zip entry compressed ahead of time: the buffers handed to it are
// deflated (at spoolLevel) into a temporary file while their CRC-32 and length are
// counted, so that the finished entry can be copied into the zip as it is
// (zip.Writer.CreateRaw) and no part of it is ever held in memory.
//
// Deflating is the larger part of writing a sheet, so it runs on a goroutine of its own
// while the next buffer is formatted: a few buffers go round between the two (submit
// hands one over and takes back an empty one). close or remove ends the goroutine.
type spool struct {
	file  *os.File
	path  string // the temporary file's name; "" once it is gone from the directory
	crc   uint32 // written by the deflater, read after it has ended
	size  int64  // bytes deflated (uncompressed size)
	csize int64  // compressed bytes, set by close

	work   chan []byte // buffers to deflate, in order
	free   chan []byte // empty buffers
	ended  chan error  // the deflater's result, once
	failed atomic.Bool // the deflater has failed: stop formatting
	closed bool        // work is closed and the deflater has ended
	err    error       // the deflater's result
}

// spoolLevel is the deflate level of the streamed sheets. hoistgen's register, 10 000
// hoists, with cells without references and numbers to six digits (2026-12-05, same
// run, CPU time of the whole check, user + system): best speed (1) 22.4 MB, 3.39 s;
// level 2 16.9 MB, 3.48 s; level 4 14.5 MB, 3.71–3.89 s, the CPU time the workbook
// took before at best speed (3.90 s, 42.9 MB). Level 4 kept the workbook under
// 1.5 KB a hoist (issue 17) until three more checks a hoist (23) made it 1.70 KB; again
// on 10 000 hoistgen hoists (2026-12-06, two interleaved rounds, CPU user + system):
// level 4 1.70 KB a hoist, 2.78–2.81 s; level 5 1.46 KB, 2.95–3.03 s (1.06×); level 6
// 1.39 KB, 3.25–3.31 s (1.17×); level 9 1.31 KB, 5.73 s. Level 5 keeps the target.
const spoolLevel = 5

// spoolBuffers is how many buffers go round: one being formatted, the others queued or
// being deflated.
const spoolBuffers = 3

// newSpool creates the temporary file in dir ("" for the system's) and starts the
// deflater. Where the system lets an open file be removed, the file is removed at
// once, so that nothing is left behind even if the process dies; elsewhere remove
// does it.
func newSpool(dir string, bufSize int) (*spool, error) {
	f, err := os.CreateTemp(dir, "hoistfleet-sheet-*")
	if err != nil {
		return nil, fmt.Errorf("temporary file: %w", err)
	}
	s := &spool{file: f, path: f.Name()}
	if os.Remove(f.Name()) == nil {
		s.path = ""
	}
	out := bufio.NewWriterSize(f, 256<<10)
	fw, err := flate.NewWriter(out, spoolLevel)
	if err != nil { // only for a bad level
		s.closed = true
		s.remove()
		return nil, err
	}
	s.work = make(chan []byte, spoolBuffers)
	s.free = make(chan []byte, spoolBuffers)
	s.ended = make(chan error, 1)
	for range spoolBuffers {
		s.free <- make([]byte, 0, bufSize)
	}
	go s.deflate(fw, out)
	return s, nil
}

// deflate compresses the buffers in order until work is closed, then ends the stream.
// After an error it only returns the buffers.
func (s *spool) deflate(fw *flate.Writer, out *bufio.Writer) {
	var err error
	for b := range s.work {
		if err == nil {
			s.crc = crc32.Update(s.crc, crc32.IEEETable, b)
			s.size += int64(len(b))
			if _, err = fw.Write(b); err != nil {
				s.failed.Store(true)
			}
		}
		s.free <- b[:0]
	}
	if err == nil {
		err = fw.Close()
	}
	if err == nil {
		err = out.Flush()
	}
	s.ended <- err
}

// buffer takes an empty buffer to format into.
func (s *spool) buffer() []byte { return <-s.free }

// submit hands b over to be deflated and returns an empty buffer, waiting while every
// other buffer is still queued. After the deflater has failed it returns an error (its
// cause is reported by close).
func (s *spool) submit(b []byte) ([]byte, error) {
	if s.failed.Load() {
		return b[:0], errors.New("temporary file: write failed")
	}
	s.work <- b
	return <-s.free, nil
}

// close waits until everything submitted is deflated and the stream is ended.
func (s *spool) close() error {
	if s.closed {
		return s.err
	}
	s.closed = true
	close(s.work)
	if err := <-s.ended; err != nil {
		s.err = fmt.Errorf("temporary file: %w", err)
		return s.err
	}
	n, err := s.file.Seek(0, io.SeekCurrent)
	if err != nil {
		s.err = fmt.Errorf("temporary file: %w", err)
		return s.err
	}
	s.csize = n
	return nil
}

// copyTo writes the closed spool into zw as the entry name, already compressed.
func (s *spool) copyTo(zw *zip.Writer, name string) error {
	if !s.closed || s.err != nil || s.file == nil {
		return fmt.Errorf("%s: entry not finished or already removed", name)
	}
	w, err := zw.CreateRaw(&zip.FileHeader{
		Name:               name,
		Method:             zip.Deflate,
		CreatorVersion:     20, // as zip.Writer.Create sets them
		ReaderVersion:      20,
		CRC32:              s.crc,
		CompressedSize64:   uint64(s.csize),
		UncompressedSize64: uint64(s.size),
	})
	if err != nil {
		return fmt.Errorf("%s: %w", name, err)
	}
	if _, err := io.Copy(w, io.NewSectionReader(s.file, 0, s.csize)); err != nil {
		return fmt.Errorf("%s: %w", name, err)
	}
	return nil
}

// remove ends the deflater if it still runs, then closes and deletes the temporary
// file. It may be called more than once.
func (s *spool) remove() {
	if !s.closed {
		s.closed = true
		close(s.work)
		<-s.ended
	}
	if s.file != nil {
		_ = s.file.Close()
		s.file = nil
	}
	if s.path != "" {
		_ = os.Remove(s.path)
		s.path = ""
	}
}
