// Command dumpregister writes every field of a register's header and assets as the
// reader returns them, one line per cell, field and problem, in the format of
// io/register's golden dumps (io/register/testdata/golden). It is a developer's tool for
// comparing two versions of the reader on a large register (one from cmd/hoistgen, say):
//
//	go run ./testdata/tools/dumpregister REGISTER.csv > new.txt   (or .xlsx)
//	git stash; go run ./testdata/tools/dumpregister REGISTER.csv > old.txt; git stash pop
//	cmp old.txt new.txt
//
// It is not part of the test suite; io/register's TestGoldenDumps compares the reader
// with the dumps of the registers kept in the tree.
package main

import (
	"bufio"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"hoistfleet/io/register"
	"hoistfleet/io/register/regdump"
)

func main() {
	if len(os.Args) != 2 {
		fmt.Fprintln(os.Stderr, "usage: dumpregister REGISTER.csv|REGISTER.xlsx")
		os.Exit(2)
	}
	out := bufio.NewWriter(os.Stdout)
	if err := dump(out, os.Args[1]); err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
	if err := out.Flush(); err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
}

func dump(b *bufio.Writer, path string) error {
	f, err := os.Open(path)
	if err != nil {
		return err
	}
	defer f.Close()
	name := filepath.Base(path)
	var r *register.Reader
	if strings.HasSuffix(path, ".xlsx") {
		r, err = register.NewXLSX(f, name, "")
	} else {
		r, err = register.NewCSV(f, name)
	}
	if err != nil {
		fmt.Fprintf(b, "open error: %v\n", err)
		return nil
	}
	defer r.Close()
	regdump.Read(b, r, nil, register.Sentinels())
	return nil
}
