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
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
	"hoistfleet/io/register"
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
	h := r.Header()
	fmt.Fprintf(b, "header file=%q sheet=%q\n", h.File, h.Sheet)
	for _, c := range h.Columns {
		fmt.Fprintf(b, " col %d title=%q key=%q unit=%q factor=%s\n", c.Index, c.Title, c.Key, c.Unit, bits(c.Factor))
	}
	for _, p := range h.Problems {
		fmt.Fprintf(b, " problem %s\n", dumpErr(p))
	}
	for {
		a, err := r.Next(context.Background())
		if err == io.EOF {
			return nil
		}
		if err != nil {
			fmt.Fprintf(b, "next error: %v\n", err)
			return nil
		}
		dumpAsset(b, a)
	}
}

func dumpAsset(b *bufio.Writer, a *fleet.Asset) {
	fmt.Fprintf(b, "asset index=%d row=%d id=%q blank=%v cells=%d fields=%v\n", a.Index, a.Row, a.ID, a.Blank, len(a.Cells), a.Values != nil)
	for i, c := range a.Cells {
		fmt.Fprintf(b, " cell %d %q num=%v date=%v %s\n", i, c.Text, c.IsNumber, c.IsDate, c.Date.Format("2006-01-02T15:04:05.999999999Z07:00"))
	}
	var keys []string // the fields the reader wrote: every one carries its cell reference
	for i, col := range schema.Columns() {
		if i < len(a.Values) && a.Values[i].Cell.Row != 0 {
			keys = append(keys, col.Key)
		}
	}
	sort.Strings(keys)
	for _, k := range keys {
		v := a.Get(k)
		fmt.Fprintf(b, " field %s state=%d num=%s text=%q date=%s raw=%q cell=%+v", k, v.State, bits(v.Num), v.Text,
			v.Date.Format("2006-01-02T15:04:05.999999999Z07:00"), v.Raw, v.Cell)
		if v.Err != nil {
			fmt.Fprintf(b, " err=%s", dumpErr(v.Err))
		}
		b.WriteByte('\n')
	}
	for _, p := range a.Problems {
		fmt.Fprintf(b, " problem %s\n", dumpErr(p))
	}
}

// sentinels are the errors a reader error may match with errors.Is.
var sentinels = []error{register.ErrNotNumber, register.ErrNotWhole, register.ErrNotDate, register.ErrNotAllowed,
	register.ErrOutOfRange, register.ErrUnit, register.ErrSyntax}

func dumpErr(e *fleet.Error) string {
	is := ""
	for _, s := range sentinels {
		if errors.Is(e, s) {
			is += "[" + s.Error() + "]"
		}
	}
	return fmt.Sprintf("kind=%d op=%q asset=%q field=%q cell=%+v is=%s msg=%q", e.Kind, e.Op, e.Asset, e.Field, e.Cell, is, e.Error())
}

// bits shows a float exactly.
func bits(x float64) string {
	return strconv.FormatFloat(x, 'g', -1, 64) + "/" + strconv.FormatUint(math.Float64bits(x), 16)
}
