package jsonout

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
	"hoistfleet/io/register"
	"hoistfleet/templates"
)

// Real results for the differential tests and the benchmarks: the demo registers and a
// register made by cmd/hoistgen, checked by fleet with a fixed as-of date.

var asOf = time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC)

// namedRegister is one CSV register and its file name.
type namedRegister struct {
	name string
	data []byte
}

// demoRegisters returns the embedded demo registers.
func demoRegisters(t testing.TB) []namedRegister {
	t.Helper()
	names, files, err := templates.DemoRegisters()
	if err != nil {
		t.Fatal(err)
	}
	var out []namedRegister
	for _, n := range names {
		out = append(out, namedRegister{n, files[n]})
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

// generatedRegister runs cmd/hoistgen (go run) for n rows of the given units and seed.
// It skips the test in -short mode or when the go command is not at hand.
func generatedRegister(t testing.TB, n int, units string, seed int) namedRegister {
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
		return namedRegister{key, b}
	}
	cmd := exec.Command(goCmd, "run", "hoistfleet/cmd/hoistgen", "-n", fmt.Sprint(n), "--seed", fmt.Sprint(seed), "--units", units, "-o", "-")
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	b, err := cmd.Output()
	if err != nil {
		t.Fatalf("hoistgen: %v\n%s", err, stderr.Bytes())
	}
	genCache[key] = b
	return namedRegister{key, b}
}

func newChecker(t testing.TB, profile string, factor float64) *fleet.Checker {
	t.Helper()
	tab, err := templates.Profile(profile)
	if err != nil {
		t.Fatal(err)
	}
	c, err := fleet.NewChecker(fleet.Options{Rules: tab, MarginalBand: 0.10, AsOf: asOf, RatedLoadFactor: factor})
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// runSinks runs fleet over reg once, every result going to each of sinks in turn.
func runSinks(t testing.TB, reg namedRegister, c *fleet.Checker, sinks ...fleet.Sink) {
	t.Helper()
	src, err := register.NewCSV(bytes.NewReader(reg.data), reg.name)
	if err != nil {
		t.Fatal(err)
	}
	defer src.Close()
	info := &fleet.RunInfo{Tool: "hoistfleet", Version: "test", Input: reg.name, AsOf: asOf, RatedLoadFactor: c.Options().RatedLoadFactor}
	tee := &teeSink{sinks: sinks}
	if _, err := fleet.Run(context.Background(), src, tee, c, info, nil); err != nil {
		t.Fatal(err)
	}
	// The Writer under test encodes in the workers (fleet.Preparer): every result written
	// must have been prepared, so that the comparison covers that path.
	if tee.prepared.Load() != tee.written.Load() || tee.written.Load() == 0 {
		t.Fatalf("%d results prepared, %d written", tee.prepared.Load(), tee.written.Load())
	}
}

// teeSink hands every call to each of its sinks; Prepare goes to those that are
// fleet.Preparers (called concurrently by the pipeline's workers).
type teeSink struct {
	sinks             []fleet.Sink
	prepared, written atomic.Int64
}

func (ts *teeSink) Prepare(r *fleet.Result) {
	for _, s := range ts.sinks {
		if p, ok := s.(fleet.Preparer); ok {
			p.Prepare(r)
			ts.prepared.Add(1)
		}
	}
}

func (ts *teeSink) Begin(h *fleet.Header, info *fleet.RunInfo) error {
	for _, s := range ts.sinks {
		if err := s.Begin(h, info); err != nil {
			return err
		}
	}
	return nil
}

func (ts *teeSink) Write(r *fleet.Result) error {
	ts.written.Add(1)
	for _, s := range ts.sinks {
		if err := s.Write(r); err != nil {
			return err
		}
	}
	return nil
}

func (ts *teeSink) End(sum *fleet.Summary, info *fleet.RunInfo) error {
	for _, s := range ts.sinks {
		if err := s.End(sum, info); err != nil {
			return err
		}
	}
	return nil
}

func (ts *teeSink) Abort() {
	for _, s := range ts.sinks {
		s.Abort()
	}
}

// checkedResults reads reg and checks every hoist directly (one fresh Result each).
func checkedResults(t testing.TB, reg namedRegister, c *fleet.Checker) (*fleet.Header, []*fleet.Result) {
	t.Helper()
	src, err := register.NewCSV(bytes.NewReader(reg.data), reg.name)
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
