//go:build !(linux && (amd64 || arm64))

package main

import "os"

// syncAndDrop returns f.Sync: other systems get no page-cache advice.
func syncAndDrop(f *os.File) func() error { return f.Sync }
