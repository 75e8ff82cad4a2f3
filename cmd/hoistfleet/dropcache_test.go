package main

import (
	"bytes"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"
)

// TestWriteBackAndDropKeepsContent: starting write-back and dropping a file's pages loses
// nothing: the file reads back as written, before and after more is appended.
func TestWriteBackAndDropKeepsContent(t *testing.T) {
	f, err := os.Create(filepath.Join(t.TempDir(), "out.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rng := rand.New(rand.NewPCG(1, 2))
	var want []byte
	sync := writeBackAndDrop(f)
	for range 3 {
		chunk := make([]byte, 1<<20+rng.IntN(4096))
		for i := range chunk {
			chunk[i] = byte(rng.Uint32())
		}
		if _, err := f.Write(chunk); err != nil {
			t.Fatal(err)
		}
		want = append(want, chunk...)
		if err := sync(); err != nil {
			t.Fatal(err)
		}
		got, err := os.ReadFile(f.Name())
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(got, want) {
			t.Fatalf("after write-back and drop the file has %d bytes, not the %d written, or differs", len(got), len(want))
		}
	}
}
