package register

import (
	"bytes"
	"context"
	"testing"
	"time"

	"hoistfleet/fleet"
	"hoistfleet/fleet/rules"
	"hoistfleet/io/csvout"
)

// countingReader passes a Reader through and notes every distinct Asset it returns, so a
// test can see that memory was reused (the same *Asset returned for two rows).
type countingReader struct {
	*Reader
	seen   map[*fleet.Asset]int
	reused int
}

func (c *countingReader) Next(ctx context.Context) (*fleet.Asset, error) {
	a, err := c.Reader.Next(ctx)
	if a != nil {
		if c.seen[a]++; c.seen[a] > 1 {
			c.reused++
		}
	}
	return a, err
}

// plainSource hides the reader's Recycle, so Run hands no Asset back to it.
type plainSource struct{ fleet.Source }

// TestRunWithRecycledAssets: the real reader, Checker, pipeline and CSV writer, with far
// more rows than the reorder buffer holds, so Assets are reused while workers and the
// writer run (the race detector watches that in `go test -race`). The long form must be
// the same as a run that reuses nothing, and reuse must have happened.
func TestRunWithRecycledAssets(t *testing.T) {
	header, rows := generatedRegister(7, 600)
	data := generatedCSV(header, rows, ',')
	tab, err := rules.Profile("iso")
	if err != nil {
		t.Fatal(err)
	}
	chk, err := fleet.NewChecker(fleet.Options{Rules: tab, MarginalBand: 0.1, Workers: 2, Buffer: 8,
		AsOf: time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC)})
	if err != nil {
		t.Fatal(err)
	}
	run := func(recycle bool) (string, int) {
		r, err := NewCSV(bytes.NewReader(data), "g.csv")
		if err != nil {
			t.Fatal(err)
		}
		counting := &countingReader{Reader: r, seen: map[*fleet.Asset]int{}}
		var src fleet.Source = counting
		if !recycle {
			src = plainSource{counting}
		}
		var out bytes.Buffer
		if _, err := fleet.Run(context.Background(), src, csvout.New(&out, csvout.Options{}), chk, &fleet.RunInfo{}, nil); err != nil {
			t.Fatal(err)
		}
		return out.String(), counting.reused
	}
	fresh, none := run(false)
	recycled, reused := run(true)
	if none != 0 {
		t.Errorf("%d Assets reused although the source does not recycle", none)
	}
	if reused < len(rows)/2 {
		t.Errorf("only %d of %d rows reused an Asset", reused, len(rows))
	}
	if recycled != fresh {
		t.Errorf("the long form differs when Assets are recycled (%d vs %d bytes)", len(recycled), len(fresh))
	}
}
