package main

import (
	"errors"
	"fmt"
	"io"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"time"

	"github.com/spf13/pflag"
)

// pcgStream is the second PCG word: the seed flag gives the first, so one seed always
// gives the same register ("hoistgen" in ASCII).
const pcgStream = 0x686f69737467656e

// usageError is a command-line mistake: main exits 2 for it.
type usageError struct{ err error }

func (e *usageError) Error() string { return e.err.Error() }
func (e *usageError) Unwrap() error { return e.err }

// config is the parsed command line.
type config struct {
	Rows   int
	Seed   uint64
	Output string
	Units  string
	Sheet  string
	AsOf   time.Time
}

// longFlags are accepted with one dash too (`-seed 1`), as the Go flag package allows.
var longFlags = []string{"rows", "seed", "output", "units", "sheet", "as-of", "help"}

// normaliseArgs turns `-seed` into `--seed` (and `-seed=1` into `--seed=1`) for the long
// flag names, so pflag does not read them as a run of shorthand letters.
func normaliseArgs(args []string) []string {
	out := make([]string, 0, len(args))
	for i, a := range args {
		if a == "--" {
			return append(out, args[i:]...)
		}
		if strings.HasPrefix(a, "-") && !strings.HasPrefix(a, "--") && len(a) > 2 {
			name, _, _ := strings.Cut(a[1:], "=")
			for _, l := range longFlags {
				if name == l {
					a = "-" + a
					break
				}
			}
		}
		out = append(out, a)
	}
	return out
}

func parseArgs(args []string, stderr io.Writer) (config, error) {
	var cfg config
	fs := pflag.NewFlagSet("hoistgen", pflag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.IntVarP(&cfg.Rows, "rows", "n", 1000, "number of hoists to generate")
	fs.Uint64Var(&cfg.Seed, "seed", 1, "random seed: the same seed gives the same register")
	fs.StringVarP(&cfg.Output, "output", "o", "-", "output file, .csv or .xlsx (- for CSV on standard output)")
	fs.StringVar(&cfg.Units, "units", "si", "units of the register: si or us")
	fs.StringVar(&cfg.Sheet, "sheet", "Register", "sheet name of an .xlsx register")
	asOf := fs.String("as-of", "2026-12-01", "date the inspection and usage dates are drawn against (YYYY-MM-DD)")
	fs.Usage = func() {
		fmt.Fprintf(stderr, "hoistgen writes a synthetic register of powered drum hoists for testing hoistfleet.\n\n")
		fmt.Fprintf(stderr, "Usage: hoistgen -n ROWS -seed SEED -o FILE.csv|FILE.xlsx [--units si|us]\n\n")
		fs.PrintDefaults()
	}
	if err := fs.Parse(normaliseArgs(args)); err != nil {
		if errors.Is(err, pflag.ErrHelp) {
			return cfg, err
		}
		return cfg, &usageError{err}
	}
	if fs.NArg() > 0 {
		return cfg, &usageError{fmt.Errorf("unexpected argument %q", fs.Arg(0))}
	}
	if cfg.Rows < 0 {
		return cfg, &usageError{fmt.Errorf("--rows must be ≥ 0 (got %d)", cfg.Rows)}
	}
	if cfg.Units != "si" && cfg.Units != "us" {
		return cfg, &usageError{fmt.Errorf("--units must be si or us (got %q)", cfg.Units)}
	}
	t, err := time.Parse("2006-01-02", *asOf)
	if err != nil {
		return cfg, &usageError{fmt.Errorf("--as-of: %q is not a date YYYY-MM-DD", *asOf)}
	}
	cfg.AsOf = t
	switch ext := strings.ToLower(filepath.Ext(cfg.Output)); {
	case cfg.Output == "-", ext == ".csv", ext == ".xlsx":
	default:
		return cfg, &usageError{fmt.Errorf("output %q: the name must end in .csv or .xlsx (or be - for standard output)", cfg.Output)}
	}
	return cfg, nil
}

// run is the whole command: parse args, generate, write. It prints nothing to stdout
// unless the register goes there; a one-line note goes to stderr.
func run(args []string, stdout, stderr io.Writer) error {
	cfg, err := parseArgs(args, stderr)
	if err != nil {
		return err
	}
	if cfg.Output == "-" {
		return generate(cfg, stdout, false)
	}
	if err := writeFileAtomic(cfg.Output, func(w io.Writer) error {
		return generate(cfg, w, strings.EqualFold(filepath.Ext(cfg.Output), ".xlsx"))
	}); err != nil {
		return err
	}
	fmt.Fprintf(stderr, "hoistgen: wrote %d hoists to %s (seed %d, %s units)\n", cfg.Rows, cfg.Output, cfg.Seed, cfg.Units)
	return nil
}

// generate writes cfg.Rows hoists to w, one at a time: memory does not grow with the
// number of rows (the CSV path holds one row; the XLSX stream writer spills to a
// temporary file).
func generate(cfg config, w io.Writer, xlsx bool) error {
	fl, err := fields(cfg.Units)
	if err != nil {
		return err
	}
	var rw rowWriter
	if xlsx {
		x, err := newXLSXWriter(w, cfg.Sheet)
		if err != nil {
			return err
		}
		rw = x
	} else {
		rw = newCSVWriter(w)
	}
	titles := make([]string, len(fl))
	for i, f := range fl {
		titles[i] = f.Header
	}
	if err := rw.Header(titles); err != nil {
		_ = rw.Close()
		return err
	}
	rng := rand.New(rand.NewPCG(cfg.Seed, pcgStream))
	cells := make([]cell, len(fl))
	for i := 0; i < cfg.Rows; i++ {
		h := newHoist(rng, i, cfg.AsOf)
		for j, f := range fl {
			cells[j] = f.value(&h)
		}
		if err := rw.Row(cells); err != nil {
			_ = rw.Close()
			return err
		}
	}
	return rw.Close()
}

// writeFileAtomic writes through a temporary file in the target's directory and renames
// it over the target only when write succeeded.
func writeFileAtomic(name string, write func(io.Writer) error) error {
	dir := filepath.Dir(name)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(name)+".*.tmp")
	if err != nil {
		return fmt.Errorf("create %s: %w", name, err)
	}
	ok := false
	defer func() {
		if !ok {
			_ = tmp.Close()
			_ = os.Remove(tmp.Name())
		}
	}()
	if err := write(tmp); err != nil {
		return fmt.Errorf("write %s: %w", name, err)
	}
	if err := tmp.Chmod(0o644); err != nil {
		return fmt.Errorf("write %s: %w", name, err)
	}
	if err := tmp.Close(); err != nil {
		return fmt.Errorf("write %s: %w", name, err)
	}
	if err := os.Rename(tmp.Name(), name); err != nil {
		return fmt.Errorf("rename to %s: %w", name, err)
	}
	ok = true
	return nil
}
