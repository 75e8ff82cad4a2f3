package fleet

import (
	"context"
	"errors"
	"fmt"
	"io"
	"runtime"
	"strings"
	"sync/atomic"

	"golang.org/x/sync/errgroup"
)

// Run reads every row of src, checks it in a bounded pool of workers and writes the
// results to sink in register order, then the summary. A bad row is data, never a reason
// to stop: Run returns an error only when the source cannot be read further, the sink
// fails, or ctx is cancelled (then with ctx's error, after every goroutine has ended).
//
// Memory is bounded by the reorder buffer (Options.Buffer results in flight), not by
// the register: the reader waits for a free slot before reading the next row.
// progress, when not nil, is incremented once per result written.
func Run(ctx context.Context, src Source, sink Sink, c *Checker, info *RunInfo, progress *atomic.Int64) (*Summary, error) {
	opts := c.Options()
	workers := opts.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	buffer := opts.Buffer
	if buffer <= 0 {
		buffer = 64 * workers
	}
	info.Workers = workers
	if err := sink.Begin(src.Header(), info); err != nil {
		return nil, fmt.Errorf("writing results: %w", err)
	}
	summary := NewSummary(opts.TopN)
	var titles []string // the register's column headers as the results show them
	for _, col := range src.Header().Columns {
		titles = append(titles, col.DisplayTitle())
		if col.Key == "exposure" {
			summary.Weigh(c.attention)
		}
	}
	baseline := opts.Baseline
	if baseline != nil {
		summary.Compare(baseline)
	}
	cranes := craneSites{}
	addProblems := func(ps []*Error) {
		for _, p := range ps {
			if p.Kind == Other {
				// A note of how the register was read, not a problem of a cell.
				summary.NoteCount++
				if len(summary.Notes) < summary.TopN {
					summary.Notes = append(summary.Notes, p.Error())
				}
				continue
			}
			summary.ProblemCount++
			if len(summary.Problems) < summary.TopN {
				summary.Problems = append(summary.Problems, p.Error())
			}
		}
	}
	// Header problems first, once; a Source may add more while it reads (the rows it
	// left out, a column's blank markers), which are counted at the end.
	headerProblems := len(src.Header().Problems)
	addProblems(src.Header().Problems)
	useCounts := make([]int, len(opts.Rules.Rules)) // uses of each rule row, by index
	// A Sink keeps nothing of a result once written (the Sink contract), so Run reuses
	// its memory: the Result's (Checker.recycle) and, when the Source can take it back,
	// the Asset's.
	recycler, _ := src.(Recycler)

	g, ctx := errgroup.WithContext(ctx)
	slots := make(chan struct{}, buffer) // a slot is held from read until written
	jobs := make(chan *Asset, buffer)    // deep queues: fewer hand-offs that leave a core idle
	done := make(chan *Result, buffer)

	g.Go(func() error { // reader
		defer close(jobs)
		for index := 0; ; index++ {
			select {
			case slots <- struct{}{}:
			case <-ctx.Done():
				return ctx.Err()
			}
			a, err := src.Next(ctx)
			if errors.Is(err, io.EOF) {
				return nil
			}
			if err != nil {
				return err
			}
			a.Index = index // output order is read order, whatever the source counted
			cranes.check(a)
			select {
			case jobs <- a:
			case <-ctx.Done():
				return ctx.Err()
			}
		}
	})
	workersDone := make(chan struct{})
	var wg errgroup.Group
	for range workers {
		wg.Go(func() error {
			for a := range jobs {
				r := c.Check(a)
				if baseline != nil {
					r.Change = baseline.Compare(r, titles)
				}
				sink.Prepare(r)
				select {
				case done <- r:
				case <-ctx.Done():
					return ctx.Err()
				}
			}
			return nil
		})
	}
	g.Go(func() error {
		err := wg.Wait()
		close(done)
		close(workersDone)
		return err
	})
	g.Go(func() error { // collector: reorder and write
		pending := map[int]*Result{}
		next := 0
		for r := range done {
			pending[r.Asset.Index] = r
			for {
				p, ok := pending[next]
				if !ok {
					break
				}
				delete(pending, next)
				next++
				if err := sink.Write(p); err != nil {
					return fmt.Errorf("writing results: %w", err)
				}
				summary.Add(p)
				for _, i := range p.rules {
					useCounts[i]++
				}
				if summary.Weighted && p.Status != StatusPass {
					sr, er := c.attention.rows(p.Status, p.Asset.Get("exposure").Text)
					for _, i := range [2]int{sr, er} {
						if i >= 0 && i < len(useCounts) {
							useCounts[i]++
						}
					}
				}
				if progress != nil {
					progress.Add(1)
				}
				if recycler != nil {
					recycler.Recycle(p.Asset)
				}
				c.recycle(p)
				<-slots
			}
		}
		if len(pending) > 0 && ctx.Err() == nil {
			return &Error{Kind: Internal, Err: fmt.Errorf("%d results never written (next expected %d)", len(pending), next)}
		}
		return nil
	})
	if err := g.Wait(); err != nil {
		<-workersDone
		sink.Abort()
		return summary, err
	}
	if h := src.Header(); len(h.Problems) > headerProblems {
		addProblems(h.Problems[headerProblems:])
	}
	summary.Finish(baseline)
	info.Rows = summary.Total
	info.Rules = ruleUses(opts.Rules, useCounts)
	if err := sink.End(summary, info); err != nil {
		sink.Abort()
		return summary, fmt.Errorf("writing results: %w", err)
	}
	return summary, nil
}

// craneSites finds a crane id used at two sites (an input error: a crane is at one site).
// It runs in the reader, in register order, so that the later row's message reaches
// every output with the row.
type craneSites map[string]craneSeen

type craneSeen struct {
	site string
	row  int
}

// check adds a located problem to a when its crane was first seen at another site.
func (m craneSites) check(a *Asset) {
	v := a.Get("crane")
	if v.State != OK || v.Text == "" {
		return
	}
	site := a.Get("site").Text
	key := CraneKey(v.Text)
	first, ok := m[key]
	if !ok {
		m[key] = craneSeen{site: site, row: a.Row}
		return
	}
	if strings.EqualFold(strings.TrimSpace(first.site), strings.TrimSpace(site)) {
		return
	}
	a.Problems = append(a.Problems, &Error{Kind: Conflict, Asset: a.ID, Cell: v.Cell, Field: "crane",
		Err: fmt.Errorf("crane %s is at site %s here and at site %s on row %d: a crane is at one site; give the crane at each site its own id", v.Text, orNone(site), orNone(first.site), first.row)})
}

func orNone(s string) string {
	if s == "" {
		return "(none)"
	}
	return "'" + s + "'"
}
