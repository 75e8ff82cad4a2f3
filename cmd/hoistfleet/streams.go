package main

import (
	"io"
	"os"
)

// Streams is all the command's I/O, so that tests can run it on buffers.
type Streams struct {
	In       io.Reader
	Out, Err io.Writer
	ErrIsTTY bool
	OutIsTTY bool // standard output is a terminal: no binary output onto it
}

func systemStreams() Streams {
	return Streams{In: os.Stdin, Out: os.Stdout, Err: os.Stderr, ErrIsTTY: isCharDevice(os.Stderr), OutIsTTY: isCharDevice(os.Stdout)}
}

// isCharDevice reports whether f is a character device: a terminal (or /dev/null,
// which is harmless to refuse binary output to only when asked for it on standard output).
func isCharDevice(f *os.File) bool {
	fi, err := f.Stat()
	return err == nil && fi.Mode()&os.ModeCharDevice != 0
}
