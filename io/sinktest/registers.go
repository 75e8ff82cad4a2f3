// Package sinktest is test support for the result writers (io/csvout, io/jsonout,
// io/xlsxout): real results from the demo registers and from cmd/hoistgen registers
// checked by fleet, a sink that tees one run to several writers (and counts Prepare
// calls), random results with awkward text and numbers, the writers' golden outputs
// (golden.go), the checks every buffering or absorbing writer must pass, written once
// and called by each writer's tests with its own cases, and a benchmark loop. It is
// imported only by tests.
package sinktest

import (
	"bytes"
	"context"
	"fmt"
	"io"
	"os/exec"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	"hoistfleet/fleet"
	"hoistfleet/fleet/rules"
	"hoistfleet/io/register"
	"hoistfleet/templates"
)

// Real results for the differential tests and the benchmarks: the demo registers and a
// register made by cmd/hoistgen, checked by fleet with a fixed as-of date.

var AsOf = time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC)

// Register is one CSV register and its file name.
type Register struct {
	Name string
	Data []byte
}

// DemoRegisters returns the embedded demo registers.
func DemoRegisters(t testing.TB) []Register {
	t.Helper()
	names, files, err := templates.DemoRegisters()
	if err != nil {
		t.Fatal(err)
	}
	var out []Register
	for _, n := range names {
		out = append(out, Register{n, files[n]})
	}
	if len(out) == 0 {
		t.Fatal("no demo registers")
	}
	return out
}

var (
	genMu    sync.Mutex
	genCache = map[string][]byte{}
)

// GeneratedRegister runs cmd/hoistgen (go run) for n rows of the given units and seed.
// It skips the test in -short mode or when the go command is not at hand.
func GeneratedRegister(t testing.TB, n int, units string, seed int) Register {
	t.Helper()
	if testing.Short() {
		t.Skip("runs cmd/hoistgen")
	}
	goCmd, err := exec.LookPath("go")
	if err != nil {
		t.Skip("no go command: ", err)
	}
	key := fmt.Sprintf("hoistgen-%d-%s-%d.csv", n, units, seed)
	genMu.Lock()
	defer genMu.Unlock()
	if b, ok := genCache[key]; ok {
		return Register{key, b}
	}
	cmd := exec.Command(goCmd, "run", "hoistfleet/cmd/hoistgen", "-n", fmt.Sprint(n), "--seed", fmt.Sprint(seed), "--units", units, "-o", "-")
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	b, err := cmd.Output()
	if err != nil {
		t.Fatalf("hoistgen: %v\n%s", err, stderr.Bytes())
	}
	genCache[key] = b
	return Register{key, b}
}

func NewChecker(t testing.TB, profile string, factor float64) *fleet.Checker {
	t.Helper()
	tab, err := rules.Profile(profile)
	if err != nil {
		t.Fatal(err)
	}
	c, err := fleet.NewChecker(fleet.Options{Rules: tab, MarginalBand: 0.10, AsOf: AsOf, RatedLoadFactor: factor})
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// RunSinks runs fleet over reg once, every result going to each of sinks in turn.
func RunSinks(t testing.TB, reg Register, c *fleet.Checker, sinks ...fleet.Sink) {
	t.Helper()
	src, err := register.NewCSV(bytes.NewReader(reg.Data), reg.Name)
	if err != nil {
		t.Fatal(err)
	}
	defer src.Close()
	info := &fleet.RunInfo{Tool: "hoistfleet", Version: "test", Input: reg.Name, AsOf: AsOf, RatedLoadFactor: c.Options().RatedLoadFactor}
	tee := &TeeSink{sinks: sinks}
	if _, err := fleet.Run(context.Background(), src, tee, c, info, nil); err != nil {
		t.Fatal(err)
	}
	// The Writers prepare in the workers (fleet.Sink's Prepare): every result written must
	// have been prepared, so that the comparison covers that path.
	if tee.prepared.Load() != tee.written.Load() || tee.written.Load() == 0 {
		t.Fatalf("%d results prepared, %d written", tee.prepared.Load(), tee.written.Load())
	}
}

// TeeSink hands every call to each of its sinks (Prepare concurrently, from the
// pipeline's workers).
type TeeSink struct {
	sinks             []fleet.Sink
	prepared, written atomic.Int64
}

func (ts *TeeSink) Prepare(r *fleet.Result) {
	for _, s := range ts.sinks {
		s.Prepare(r)
	}
	ts.prepared.Add(1)
}

func (ts *TeeSink) Begin(h *fleet.Header, info *fleet.RunInfo) error {
	for _, s := range ts.sinks {
		if err := s.Begin(h, info); err != nil {
			return err
		}
	}
	return nil
}

func (ts *TeeSink) Write(r *fleet.Result) error {
	ts.written.Add(1)
	for _, s := range ts.sinks {
		if err := s.Write(r); err != nil {
			return err
		}
	}
	return nil
}

func (ts *TeeSink) End(sum *fleet.Summary, info *fleet.RunInfo) error {
	for _, s := range ts.sinks {
		if err := s.End(sum, info); err != nil {
			return err
		}
	}
	return nil
}

func (ts *TeeSink) Abort() {
	for _, s := range ts.sinks {
		s.Abort()
	}
}

// CheckedResults reads reg and checks every hoist directly (one fresh Result each).
func CheckedResults(t testing.TB, reg Register, c *fleet.Checker) (*fleet.Header, []*fleet.Result) {
	t.Helper()
	src, err := register.NewCSV(bytes.NewReader(reg.Data), reg.Name)
	if err != nil {
		t.Fatal(err)
	}
	defer src.Close()
	var rs []*fleet.Result
	for {
		a, err := src.Next(context.Background())
		if err == io.EOF {
			return src.Header(), rs
		}
		if err != nil {
			t.Fatal(err)
		}
		rs = append(rs, c.Check(a))
	}
}
