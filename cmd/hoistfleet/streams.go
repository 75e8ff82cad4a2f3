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
}

func systemStreams() Streams {
	tty := false
	if fi, err := os.Stderr.Stat(); err == nil {
		tty = fi.Mode()&os.ModeCharDevice != 0
	}
	return Streams{In: os.Stdin, Out: os.Stdout, Err: os.Stderr, ErrIsTTY: tty}
}
