// Package regdump writes a register as a reader read it, field by field and exactly (a
// float by its bits), for the register reader's golden dumps and the developers' tool
// that writes them (testdata/tools/dumpregister): one definition, so that the tool's
// dumps are the tests' dumps.
package regdump

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"sort"
	"strconv"

	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
)

// Read dumps src's header and every asset it gives to w; recycle, when not nil, hands
// each asset back once dumped. sentinels are the errors a reader error may match with
// errors.Is (register.Sentinels), named in each error's dump. A read error ends the dump
// with its message.
func Read(w io.Writer, src fleet.Source, recycle func(*fleet.Asset), sentinels []error) {
	h := src.Header()
	fmt.Fprintf(w, "header file=%q sheet=%q\n", h.File, h.Sheet)
	for _, c := range h.Columns {
		fmt.Fprintf(w, " col %d title=%q key=%q unit=%q factor=%s\n", c.Index, c.Title, c.Key, c.Unit, Bits(c.Factor))
	}
	for _, p := range h.Problems {
		fmt.Fprintf(w, " problem %s\n", Err(p, sentinels))
	}
	for {
		a, err := src.Next(context.Background())
		if errors.Is(err, io.EOF) {
			return
		}
		if err != nil {
			fmt.Fprintf(w, "next error: %v\n", err)
			return
		}
		Asset(w, a, sentinels)
		if recycle != nil {
			recycle(a)
		}
	}
}

// Asset dumps one asset: its cells as given and the fields the reader wrote.
func Asset(w io.Writer, a *fleet.Asset, sentinels []error) {
	fmt.Fprintf(w, "asset index=%d row=%d id=%q blank=%v cells=%d fields=%v\n", a.Index, a.Row, a.ID, a.Blank, len(a.Cells), a.Values != nil)
	for i, c := range a.Cells {
		fmt.Fprintf(w, " cell %d %q num=%v date=%v %s\n", i, c.Text, c.IsNumber, c.IsDate, c.Date.Format("2006-01-02T15:04:05.999999999Z07:00"))
	}
	// The fields the reader wrote: every one carries its cell reference (the dumps were
	// made when Asset held a map of exactly those).
	var keys []string
	for i, col := range schema.Columns() {
		if i < len(a.Values) && a.Values[i].Cell.Row != 0 {
			keys = append(keys, col.Key)
		}
	}
	sort.Strings(keys)
	for _, k := range keys {
		v := a.Get(k)
		fmt.Fprintf(w, " field %s state=%d num=%s text=%q date=%s raw=%q cell=%+v", k, v.State, Bits(v.Num), v.Text,
			v.Date.Format("2006-01-02T15:04:05.999999999Z07:00"), v.Raw, v.Cell)
		if v.Err != nil {
			fmt.Fprintf(w, " err=%s", Err(v.Err, sentinels))
		}
		fmt.Fprintln(w)
	}
	for _, p := range a.Problems {
		fmt.Fprintf(w, " problem %s\n", Err(p, sentinels))
	}
}

// Err dumps a located error, naming the sentinels it matches.
func Err(e *fleet.Error, sentinels []error) string {
	is := ""
	for _, s := range sentinels {
		if errors.Is(e, s) {
			is += "[" + s.Error() + "]"
		}
	}
	return fmt.Sprintf("kind=%d op=%q asset=%q field=%q cell=%+v is=%s msg=%q", e.Kind, e.Op, e.Asset, e.Field, e.Cell, is, e.Error())
}

// Bits shows a float exactly.
func Bits(x float64) string {
	return strconv.FormatFloat(x, 'g', -1, 64) + "/" + strconv.FormatUint(math.Float64bits(x), 16)
}
