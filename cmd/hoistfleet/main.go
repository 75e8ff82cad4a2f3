// Command hoistfleet checks a register of powered drum hoists. See doc.go for usage.
package main

import (
	"context"
	"os"
	"os/signal"
	"runtime/debug"
	"runtime/pprof"
	"syscall"
)

// softMemoryLimit is the Go heap size the runtime tries to stay under (GOMEMLIMIT
// overrides it).
const softMemoryLimit = 768 << 20

// gcPercent lets the heap grow to five times what is live before a collection (GOGC
// overrides it). A run keeps little alive (the reorder buffer, the summary) but allocates
// steadily per hoist, so the default 100 spends a fifth of the CPU collecting; the soft
// memory limit still bounds the heap of a large workbook.
const gcPercent = 400

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
	if os.Getenv("GOGC") == "" {
		debug.SetGCPercent(gcPercent)
	}
	if path := os.Getenv("HOISTFLEET_CPUPROFILE"); path != "" {
		// For developers (DEVELOPERS.md): a CPU profile of the whole command.
		if f, err := os.Create(path); err == nil {
			if pprof.StartCPUProfile(f) == nil {
				defer func() { pprof.StopCPUProfile(); f.Close() }()
			}
		}
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	return run(ctx, os.Args[1:], systemStreams())
}
