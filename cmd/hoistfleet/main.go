// Command hoistfleet checks a register of powered drum hoists. See doc.go for usage.
package main

import (
	"context"
	"os"
	"os/signal"
	"syscall"
)

func main() {
	// run is a separate function so that its defers run before os.Exit.
	os.Exit(int(mainRun()))
}

func mainRun() exitCode {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	return run(ctx, os.Args[1:], systemStreams())
}
