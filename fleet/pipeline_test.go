package fleet

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math/rand/v2"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"
	"testing"
	"time"
)

// sleepy is a row-level problem whose message takes time to produce. Checker.Check
// formats every row problem while resolving the row, so a sleepy problem makes the real
// check take as long as we like: workers then finish rows out of order. done, when set,
// records the order in which the rows' checks got past the delay.
type sleepy struct {
	d     time.Duration
	index int
	done  *completions
}

type completions struct {
	mu    sync.Mutex
	order []int
}

func (s sleepy) Error() string {
	time.Sleep(s.d)
	if s.done != nil {
		s.done.mu.Lock()
		s.done.order = append(s.done.order, s.index)
		s.done.mu.Unlock()
	}
	return "slow row"
}

// fakeSource yields assets from gen until n rows (n < 0: forever). It records how far
// the reader has run ahead of the sink.
type fakeSource struct {
	h      *Header
	n      int
	gen    func(i int) *Asset
	next   int
	failAt int            // > 0: Next returns errBroken at this row index
	block  bool           // Next blocks until ctx is done
	sink   *recordingSink // for the read-ahead measure
	buffer int64          // expected bound of reads − writes (0: not checked)
	t      testing.TB

	reads   atomic.Int64
	maxGap  atomic.Int64
	overrun atomic.Int64 // times reads − writes exceeded buffer
	closed  atomic.Bool
}

var errBroken = errors.New("register file truncated")

func (s *fakeSource) Header() *Header { return s.h }

func (s *fakeSource) Next(ctx context.Context) (*Asset, error) {
	if s.block {
		<-ctx.Done()
		return nil, ctx.Err()
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	if s.n >= 0 && s.next >= s.n {
		return nil, io.EOF
	}
	if s.failAt > 0 && s.next == s.failAt {
		return nil, fmt.Errorf("reading row %d: %w", s.next+2, errBroken)
	}
	// Rows read so far (this one included) minus rows written: the reader holds a slot
	// for this row, acquired before Next, so the gap is bounded by Options.Buffer. The
	// writes count only grows, so reading it after counting this read can only
	// understate the gap, never overstate it.
	r := s.reads.Add(1)
	if s.sink != nil {
		gap := r - s.sink.writes.Load()
		for {
			m := s.maxGap.Load()
			if gap <= m || s.maxGap.CompareAndSwap(m, gap) {
				break
			}
		}
		if s.buffer > 0 && gap > s.buffer {
			s.overrun.Add(1)
		}
	}
	a := s.gen(s.next)
	a.Index = -1 // Run must set it
	s.next++
	return a, nil
}

func (s *fakeSource) Close() error { s.closed.Store(true); return nil }

// recordingSink records what Run gives it.
type recordingSink struct {
	mu       sync.Mutex
	ids      []string
	indexes  []int
	messages [][]string // each result's messages, copied
	begun    int
	ended    int
	aborted  int
	summary  *Summary
	writes   atomic.Int64
	delay    time.Duration // per Write
	failAt   int           // > 0: Write number failAt fails
	onWrite  func(n int64) // called after each write
	before   func(n int64) // called before each write, with the writes so far
	writeErr error
}

var errDiskFull = errors.New("no space left on device")

func (k *recordingSink) Begin(h *Header, info *RunInfo) error {
	k.mu.Lock()
	defer k.mu.Unlock()
	k.begun++
	return nil
}

func (k *recordingSink) Prepare(*Result) {}

func (k *recordingSink) Write(r *Result) error {
	if k.before != nil {
		k.before(k.writes.Load())
	}
	if k.delay > 0 {
		time.Sleep(k.delay)
	}
	k.mu.Lock()
	if k.failAt > 0 && len(k.ids)+1 == k.failAt {
		k.mu.Unlock()
		return errDiskFull
	}
	k.ids = append(k.ids, r.Asset.ID)
	k.indexes = append(k.indexes, r.Asset.Index)
	k.messages = append(k.messages, slices.Clone(r.Messages))
	k.mu.Unlock()
	n := k.writes.Add(1)
	if k.onWrite != nil {
		k.onWrite(n)
	}
	return nil
}

func (k *recordingSink) End(s *Summary, info *RunInfo) error {
	k.mu.Lock()
	defer k.mu.Unlock()
	k.ended++
	k.summary = s
	return nil
}

func (k *recordingSink) Abort() {
	k.mu.Lock()
	defer k.mu.Unlock()
	k.aborted++
}

func testHeader() *Header { return &Header{File: "fleet.xlsx", Sheet: testSheet} }

// rowAsset is row i of a synthetic register: winchA with its own id and row number.
func rowAsset(t testing.TB, i int) *Asset {
	a := winchA(t).asset()
	re := *a
	re.ID = fmt.Sprintf("H-%05d", i)
	re.Row = i + 2
	re.Fields = make(map[string]Value, len(a.Fields))
	for k, v := range a.Fields {
		v.Cell.Row = re.Row
		re.Fields[k] = v
	}
	id := re.Fields["asset_id"]
	id.Text, id.Raw = re.ID, re.ID
	re.Fields["asset_id"] = id
	return &re
}

// runWithin runs Run and fails the test if it does not return within d.
func runWithin(t *testing.T, d time.Duration, ctx context.Context, src Source, sink Sink, c *Checker, info *RunInfo, progress *atomic.Int64) (*Summary, error) {
	t.Helper()
	type out struct {
		s   *Summary
		err error
	}
	ch := make(chan out, 1)
	go func() {
		s, err := Run(ctx, src, sink, c, info, progress)
		ch <- out{s, err}
	}()
	select {
	case o := <-ch:
		return o.s, o.err
	case <-time.After(d):
		buf := make([]byte, 1<<20)
		n := runtime.Stack(buf, true)
		t.Fatalf("Run did not return within %v; goroutines:\n%s", d, buf[:n])
		return nil, nil
	}
}

func checkerWith(t testing.TB, workers, buffer int) *Checker {
	c, err := NewChecker(Options{Rules: isoChecker(t).Options().Rules, MarginalBand: 0.1, AsOf: asOf, Workers: workers, Buffer: buffer})
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// TestRunKeepsRegisterOrder: workers taking random time still give results in
// register order, each row once (design.md; style.md §6). Run with -race.
func TestRunKeepsRegisterOrder(t *testing.T) {
	const n = 400
	rng := rand.New(rand.NewPCG(1, 2))
	delays := make([]time.Duration, n)
	for i := range delays {
		delays[i] = time.Duration(rng.IntN(1000)) * time.Microsecond
	}
	for _, cfg := range []struct{ workers, buffer int }{{8, 32}, {4, 4}, {3, 1}, {1, 0}} {
		t.Run(fmt.Sprintf("workers=%d buffer=%d", cfg.workers, cfg.buffer), func(t *testing.T) {
			sink := &recordingSink{}
			done := &completions{}
			src := &fakeSource{h: testHeader(), n: n, gen: func(i int) *Asset {
				a := rowAsset(t, i)
				a.Problems = []*Error{{Kind: Other, Err: sleepy{d: delays[i], index: i, done: done}}}
				return a
			}}
			var progress atomic.Int64
			info := &RunInfo{}
			sum, err := runWithin(t, 60*time.Second, context.Background(), src, sink, checkerWith(t, cfg.workers, cfg.buffer), info, &progress)
			if err != nil {
				t.Fatal(err)
			}
			if len(sink.ids) != n {
				t.Fatalf("%d results written, want %d", len(sink.ids), n)
			}
			// The workers did finish out of order, so the reorder buffer was exercised.
			if cfg.workers > 1 && cfg.buffer != 1 && slices.IsSorted(done.order) { // buffer 1: one row in flight
				t.Errorf("checks completed in register order: the test did not exercise reordering")
			}
			for i := range n {
				if want := fmt.Sprintf("H-%05d", i); sink.ids[i] != want || sink.indexes[i] != i {
					t.Fatalf("result %d is %s (index %d), want %s (index %d)", i, sink.ids[i], sink.indexes[i], want, i)
				}
			}
			if sink.begun != 1 || sink.ended != 1 || sink.aborted != 0 {
				t.Errorf("Begin %d End %d Abort %d, want 1 1 0", sink.begun, sink.ended, sink.aborted)
			}
			if sum.Total != n || progress.Load() != n || info.Rows != n {
				t.Errorf("summary total %d, progress %d, info rows %d, want %d", sum.Total, progress.Load(), info.Rows, n)
			}
			wantWorkers := cfg.workers
			if info.Workers != wantWorkers {
				t.Errorf("info.Workers = %d, want %d", info.Workers, wantWorkers)
			}
			// The audit's rule counts: every row looked up the M5 rope design factor once.
			for _, u := range info.Rules {
				if u.ID == "rope.design_factor" && u.Groups == "M5" && u.Uses != n {
					t.Errorf("rope.design_factor M5 used %d times, want %d", u.Uses, n)
				}
			}
		})
	}
}

// TestRunBadRowsNeverCancel: bad cells, blank rows, impossible reeving and rows with
// nothing in them are data: every row is written once, the run ends normally.
func TestRunBadRowsNeverCancel(t *testing.T) {
	const n = 120
	gen := func(i int) *Asset {
		switch i % 6 {
		case 1:
			b := winchA(t).bad("rope_mbf", "lots", `"lots" is not a number in [kN]`)
			a := b.asset()
			a.ID = fmt.Sprintf("H-%05d", i)
			return a
		case 2:
			return &Asset{Row: i + 2, Blank: true}
		case 3:
			a := rowAsset(t, i)
			a.Fields["parts_of_line"] = Value{State: OK, Num: 3} // 3 parts cannot share 2 rope ends
			return a
		case 4:
			return &Asset{Row: i + 2, ID: fmt.Sprintf("H-%05d", i), Fields: map[string]Value{},
				Problems: []*Error{{Kind: Duplicate, Cell: CellRef{Sheet: testSheet, Row: i + 2, Col: 1}, Err: errors.New("duplicate asset id")}}}
		case 5:
			a := rowAsset(t, i)
			a.Fields["drum_diameter"] = Value{State: OK, Num: 0.2} // D/d 14.3 < 18: fail
			return a
		}
		return rowAsset(t, i)
	}
	sink := &recordingSink{}
	src := &fakeSource{h: testHeader(), n: n, gen: gen}
	sum, err := runWithin(t, 60*time.Second, context.Background(), src, sink, checkerWith(t, 4, 16), &RunInfo{}, nil)
	if err != nil {
		t.Fatalf("Run: %v (a bad row must not stop the run)", err)
	}
	if len(sink.indexes) != n {
		t.Fatalf("%d rows written, want %d", len(sink.indexes), n)
	}
	for i, idx := range sink.indexes {
		if idx != i {
			t.Fatalf("row %d written at position %d", idx, i)
		}
	}
	total := 0
	for _, c := range sum.ByStatus {
		total += c
	}
	if sum.Total != n || total != n || sink.ended != 1 || sink.aborted != 0 {
		t.Errorf("summary total %d (by status %d), End %d, Abort %d", sum.Total, total, sink.ended, sink.aborted)
	}
	if sum.ByStatus[StatusError] == 0 || sum.ByStatus[StatusFail] == 0 || sum.ByStatus[StatusUnchecked] == 0 {
		t.Errorf("by status %v: want errors, fails and unchecked rows counted", sum.ByStatus)
	}
}

// TestRunCancel: cancelling the context makes Run return promptly with
// context.Canceled, the sink aborted and never ended, and every goroutine gone.
func TestRunCancel(t *testing.T) {
	for _, tc := range []struct {
		name  string
		block bool
	}{
		{"endless register", false},
		{"source blocked in Next", true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			base := runtime.NumGoroutine()
			ctx, cancel := context.WithCancel(context.Background())
			defer cancel()
			sink := &recordingSink{}
			src := &fakeSource{h: testHeader(), n: -1, block: tc.block, gen: func(i int) *Asset { return rowAsset(t, i) }}
			var cancelled time.Time
			if tc.block {
				time.AfterFunc(50*time.Millisecond, func() { cancelled = time.Now(); cancel() })
			} else {
				sink.onWrite = func(n int64) {
					if n == 200 {
						cancelled = time.Now()
						cancel()
					}
				}
			}
			_, err := runWithin(t, 10*time.Second, ctx, src, sink, checkerWith(t, 4, 64), &RunInfo{}, nil)
			took := time.Since(cancelled)
			if !errors.Is(err, context.Canceled) {
				t.Fatalf("Run returned %v, want context.Canceled", err)
			}
			// "Promptly": a few rows' work at most; 1 s is generous under -race.
			t.Logf("returned %v after the cancel", took)
			if took > time.Second {
				t.Errorf("Run returned %v after the cancel", took)
			}
			sink.mu.Lock()
			defer sink.mu.Unlock()
			if sink.aborted != 1 || sink.ended != 0 {
				t.Errorf("Abort %d, End %d: want Abort once and no End", sink.aborted, sink.ended)
			}
			// No goroutine outlives Run (pipeline.go: "after every goroutine has ended").
			deadline := time.Now().Add(time.Second)
			for runtime.NumGoroutine() > base && time.Now().Before(deadline) {
				time.Sleep(5 * time.Millisecond)
			}
			if g := runtime.NumGoroutine(); g > base {
				t.Errorf("%d goroutines after Run, %d before", g, base)
			}
		})
	}
}

// TestRunAlreadyCancelled: a context cancelled before the run writes nothing.
func TestRunAlreadyCancelled(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	sink := &recordingSink{}
	src := &fakeSource{h: testHeader(), n: 50, gen: func(i int) *Asset { return rowAsset(t, i) }}
	_, err := runWithin(t, 10*time.Second, ctx, src, sink, checkerWith(t, 2, 8), &RunInfo{}, nil)
	if !errors.Is(err, context.Canceled) || sink.ended != 0 || sink.aborted != 1 {
		t.Errorf("err %v, End %d, Abort %d: want context.Canceled, 0, 1", err, sink.ended, sink.aborted)
	}
}

// TestRunSourceAndSinkFailures: a source that cannot be read further or a sink that
// cannot write stops the run with that error; the sink is aborted, not ended.
func TestRunSourceAndSinkFailures(t *testing.T) {
	t.Run("source", func(t *testing.T) {
		sink := &recordingSink{}
		src := &fakeSource{h: testHeader(), n: 100, failAt: 40, gen: func(i int) *Asset { return rowAsset(t, i) }}
		_, err := runWithin(t, 10*time.Second, context.Background(), src, sink, checkerWith(t, 4, 8), &RunInfo{}, nil)
		if !errors.Is(err, errBroken) {
			t.Fatalf("err %v, want the source's error", err)
		}
		if sink.ended != 0 || sink.aborted != 1 || len(sink.ids) > 40 {
			t.Errorf("End %d Abort %d, %d written: want 0, 1, ≤ 40", sink.ended, sink.aborted, len(sink.ids))
		}
	})
	t.Run("sink", func(t *testing.T) {
		sink := &recordingSink{failAt: 25}
		src := &fakeSource{h: testHeader(), n: 100, gen: func(i int) *Asset { return rowAsset(t, i) }}
		_, err := runWithin(t, 10*time.Second, context.Background(), src, sink, checkerWith(t, 4, 8), &RunInfo{}, nil)
		if !errors.Is(err, errDiskFull) {
			t.Fatalf("err %v, want the sink's error", err)
		}
		if sink.ended != 0 || sink.aborted != 1 || len(sink.ids) != 24 {
			t.Errorf("End %d Abort %d, %d written: want 0, 1, 24", sink.ended, sink.aborted, len(sink.ids))
		}
	})
}

// TestRunMemoryBounded: with Buffer = b the reader never runs more than b rows ahead
// of the writer, however slow the writer (pipeline.go: memory bounded by the reorder
// buffer, not by the register). The writer holds its first write until the reader has
// read b rows, so the bound is reached whatever the speed of the checks (under -race
// they can be slower than the slow writer), and then stays slow.
func TestRunMemoryBounded(t *testing.T) {
	for _, cfg := range []struct{ workers, buffer int }{{4, 8}, {2, 8}, {4, 1}, {1, 3}} {
		t.Run(fmt.Sprintf("workers=%d buffer=%d", cfg.workers, cfg.buffer), func(t *testing.T) {
			const n = 300
			sink := &recordingSink{delay: 300 * time.Microsecond}
			src := &fakeSource{h: testHeader(), n: n, sink: sink, buffer: int64(cfg.buffer), gen: func(i int) *Asset { return rowAsset(t, i) }}
			sink.before = func(written int64) {
				for deadline := time.Now().Add(20 * time.Second); written == 0 && src.reads.Load() < int64(cfg.buffer) && time.Now().Before(deadline); {
					time.Sleep(time.Millisecond)
				}
			}
			_, err := runWithin(t, 60*time.Second, context.Background(), src, sink, checkerWith(t, cfg.workers, cfg.buffer), &RunInfo{}, nil)
			if err != nil {
				t.Fatal(err)
			}
			if o := src.overrun.Load(); o > 0 {
				t.Errorf("reader ran more than %d rows ahead of the writer %d times (max gap %d)", cfg.buffer, o, src.maxGap.Load())
			}
			// The bound is reached: the measure can see an overrun.
			if m := src.maxGap.Load(); m != int64(cfg.buffer) {
				t.Errorf("largest read-ahead %d, want exactly the buffer %d with a slow writer", m, cfg.buffer)
			}
			if len(sink.ids) != n {
				t.Errorf("%d written, want %d", len(sink.ids), n)
			}
		})
	}
}
