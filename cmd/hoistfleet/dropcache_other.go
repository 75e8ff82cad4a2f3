//go:build !linux

package main

import "os"

// writeBackAndDrop returns f.Sync: other systems get no page-cache advice, and a sync is
// the portable way to have the disk write while the run goes on.
func writeBackAndDrop(f *os.File) func() error { return f.Sync }
