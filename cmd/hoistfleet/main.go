// Command hoistfleet checks a register of powered drum hoists. See doc.go for usage.
package main

import (
	"context"
	"os"
	"os/signal"
	"runtime/debug"
	"syscall"
)

// softMemoryLimit is the Go heap size the runtime tries to stay under (GOMEMLIMIT
// overrides it).
const softMemoryLimit = 768 << 20

func main() {
	// run is a separate function so that its defers run before os.Exit.
	os.Exit(int(mainRun()))
}

func mainRun() exitCode {
	if os.Getenv("GOMEMLIMIT") == "" {
		// A soft limit makes the garbage collector work harder before the heap grows past
		// it; a million-hoist workbook otherwise peaks just above 1 GiB. It is soft: a run
		// that truly needs more still gets it.
		debug.SetMemoryLimit(softMemoryLimit)
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	return run(ctx, os.Args[1:], systemStreams())
}
