package csvout

import (
	"io"
	"testing"

	"hoistfleet/fleet"
	"hoistfleet/io/sinktest"
)

func newSink(w io.Writer) fleet.Sink { return New(w, Options{}) }

// TestAbortDropsOutput: after Abort nothing buffered reaches the writer.
func TestAbortDropsOutput(t *testing.T) { sinktest.AbortDropsOutput(t, newSink, fixture()) }

// TestShortWrite: a writer that takes less than it is given without saying why is an
// error (as bufio reports it), and the error sticks.
func TestShortWrite(t *testing.T) { sinktest.ShortWriteSticks(t, newSink, fixture()[0]) }

// TestLargeOutputInBlocks: output larger than the buffer reaches the writer whole (its
// golden output), in more than one block.
func TestLargeOutputInBlocks(t *testing.T) {
	sinktest.Golden(t, "", sinktest.WriteInBlocks(t, newSink, sinktest.RandomResults(5, 2000)))
}
