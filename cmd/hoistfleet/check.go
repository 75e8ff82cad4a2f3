package main

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"hash"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"sync/atomic"
	"time"

	"github.com/spf13/pflag"

	"hoistfleet/fleet"
	"hoistfleet/fleet/rules"
	"hoistfleet/io/baseline"
	"hoistfleet/io/csvout"
	"hoistfleet/io/jsonout"
	"hoistfleet/io/register"
	"hoistfleet/io/rulesfile"
	"hoistfleet/io/textout"
	"hoistfleet/io/xlsxout"
)

// checkConfig is what the flags shared by check, explain and demo set.
type checkConfig struct {
	rules           []string
	rulesSheet      string
	asOf            string
	sheet           string
	marginal        float64
	workers         int
	ratedLoadFactor float64
	headerRow       int
	dateOrder       string
	columns         string
}

func (c *checkConfig) register(fs *pflag.FlagSet) {
	fs.StringArrayVar(&c.rules, "rules", nil, "rule profile (iso, us) or a rule file (CSV, or XLSX with --rules-sheet) overriding it; repeat to layer: --rules us --rules ours.csv (default iso)")
	fs.StringVar(&c.rulesSheet, "rules-sheet", "", "the sheet of an XLSX rule file to read (default its first sheet)")
	fs.StringVar(&c.asOf, "as-of", "", "the run's date for inspections and ages, YYYY-MM-DD (default today)")
	fs.StringVar(&c.sheet, "sheet", "", "register sheet of an XLSX workbook (default the first), or all: every sheet with a recognisable header")
	fs.IntVar(&c.headerRow, "header-row", 0, "the register's header row (default: found in the first 30 rows)")
	fs.StringVar(&c.dateOrder, "date-order", "", "dmy, mdy or ymd: the order of dates written with numbers (25/03/2026) (default: each date column's own unambiguous dates)")
	fs.StringVar(&c.columns, "columns", "", "a columns file (CSV: register column,column,unit,date order) saying which register column is which of ours, for headers the synonyms do not cover")
	fs.Float64Var(&c.marginal, "marginal", 0.10, "marginal band: utilisation above 1 − band and up to 1 is marginal")
	fs.IntVar(&c.workers, "workers", 0, "checking workers, at least 1 (default the number of cores)")
	fs.Float64Var(&c.ratedLoadFactor, "rated-load-factor", 0, "re-rate every hoist to F × its rated load and check it there too; F from 0.5 to 3 (1.25 for +25 %)")
}

// readOptions are the register reader's options from the flags.
func (c *checkConfig) readOptions() (register.Options, error) {
	if c.headerRow < 0 {
		return register.Options{}, usagef("--header-row %d: want a row number, 1 or more", c.headerRow)
	}
	order, err := register.ParseDateOrder(c.dateOrder)
	if err != nil {
		return register.Options{}, usagef("--date-order: %v", err)
	}
	opt := register.Options{HeaderRow: c.headerRow, DateOrder: order}
	if c.columns != "" {
		f, err := os.Open(c.columns)
		if err != nil {
			return register.Options{}, usagef("--columns: %v", err)
		}
		defer f.Close()
		if opt.Columns, err = register.ReadColumnMap(c.columns, f); err != nil {
			return register.Options{}, usagef("--columns: %v", err)
		}
	}
	return opt, nil
}

// loadRules builds the rule table in force from --rules values (sheet: --rules-sheet).
func loadRules(values []string, sheet string) (*rules.Table, string, error) {
	profile := "iso"
	var files []string
	for _, v := range values {
		if isProfile(v) {
			profile = v
			continue
		}
		files = append(files, v)
	}
	t, err := rules.Profile(profile)
	if err != nil {
		return nil, "", usagef("--rules: %v", err)
	}
	for _, name := range files {
		f, err := os.Open(name)
		if err != nil {
			return nil, "", usagef("--rules: %v (want %s or a rule file)", err, strings.Join(rules.Profiles(), ", "))
		}
		user, err := rulesfile.Read(name, f, sheet)
		f.Close()
		if err != nil {
			return nil, "", usagef("--rules: %v", err)
		}
		t = t.Override(user)
	}
	return t, strings.Join(files, ", "), nil
}

func isProfile(s string) bool {
	for _, p := range rules.Profiles() {
		if s == p {
			return true
		}
	}
	return false
}

func parseAsOf(s string) (time.Time, error) {
	if s == "" {
		y, m, d := time.Now().Date()
		return time.Date(y, m, d, 0, 0, 0, 0, time.UTC), nil
	}
	t, err := time.Parse(time.DateOnly, s)
	if err != nil {
		return time.Time{}, usagef("--as-of %q: want a date YYYY-MM-DD", s)
	}
	return t, nil
}

func (c *checkConfig) checker() (*fleet.Checker, *rules.Table, string, time.Time, error) {
	return c.checkerRecord(false, nil)
}

// checkerWith builds the checker of a check run against a baseline (nil for none).
func (c *checkConfig) checkerWith(b *fleet.Baseline) (*fleet.Checker, *rules.Table, string, time.Time, error) {
	return c.checkerRecord(false, b)
}

// checkerRecord builds the checker; record keeps the calculation record (explain);
// b is the baseline to compare with (nil for none).
func (c *checkConfig) checkerRecord(record bool, b *fleet.Baseline) (*fleet.Checker, *rules.Table, string, time.Time, error) {
	rules, userFiles, err := loadRules(c.rules, c.rulesSheet)
	if err != nil {
		return nil, nil, "", time.Time{}, err
	}
	asOf, err := parseAsOf(c.asOf)
	if err != nil {
		return nil, nil, "", time.Time{}, err
	}
	if !(c.marginal >= 0 && c.marginal < 1) {
		return nil, nil, "", time.Time{}, usagef("--marginal %g: want a band in [0, 1)", c.marginal)
	}
	if f := c.ratedLoadFactor; f != 0 && !(f >= minLoadFactor && f <= maxLoadFactor) {
		hint := ""
		if f > 10 && f/100 >= minLoadFactor && f/100 <= maxLoadFactor {
			hint = " (did you mean " + strconv.FormatFloat(f/100, 'g', -1, 64) + "? the factor multiplies the rated load: 1.25 is +25 %)"
		}
		return nil, nil, "", time.Time{}, usagef("--rated-load-factor %g: want a factor from %g to %g%s", f, minLoadFactor, maxLoadFactor, hint)
	}
	if c.workers < 0 {
		return nil, nil, "", time.Time{}, usagef("--workers %d: want at least 1 (or leave it out for one per core)", c.workers)
	}
	chk, err := fleet.NewChecker(fleet.Options{Rules: rules, MarginalBand: c.marginal, AsOf: asOf,
		RatedLoadFactor: c.ratedLoadFactor, Workers: c.workers, Record: record, Baseline: b})
	if err != nil {
		return nil, nil, "", time.Time{}, usagef("%v", err)
	}
	return chk, rules, userFiles, asOf, nil
}

// The range of --rated-load-factor: a re-rating outside it is far more likely a slip (125
// meant as 125 %) than an intended one.
const minLoadFactor, maxLoadFactor = 0.5, 3.0

// input is an opened register: its source, and the hash of the bytes read so far.
type input struct {
	src  fleet.Source
	hash hash.Hash
	file *os.File
}

func (in *input) Close() error {
	err := in.src.Close()
	if in.file != nil {
		in.file.Close()
	}
	return err
}

func (in *input) sha256() string { return hex.EncodeToString(in.hash.Sum(nil)) }

// openRegister opens a register file read-only ("-" is standard input, CSV). XLSX is
// told from CSV by the zip signature, not the name.
// open opens the register name with the configuration's sheet and reading options.
func (c *checkConfig) open(name string, st Streams) (*input, error) {
	opt, err := c.readOptions()
	if err != nil {
		return nil, err
	}
	return openRegister(name, c.sheet, opt, st)
}

func openRegister(name, sheet string, opt register.Options, st Streams) (*input, error) {
	in := &input{hash: sha256.New()}
	var r io.Reader
	display := name
	regular := false // a regular file, which can be opened again and read at random
	if name == "-" {
		r = st.In
		display = "stdin"
	} else {
		f, err := os.Open(name)
		if err != nil {
			return nil, fmt.Errorf("reading the register: %w", err)
		}
		fi, err := f.Stat()
		if err == nil && fi.IsDir() {
			f.Close()
			return nil, fmt.Errorf("reading the register: %s is a directory", name)
		}
		regular = err == nil && fi.Mode().IsRegular()
		in.file = f
		r = f
	}
	br := io.TeeReader(r, in.hash)
	head := make([]byte, 4)
	n, err := io.ReadFull(br, head)
	if err != nil && err != io.ErrUnexpectedEOF && err != io.EOF {
		in.Close()
		return nil, fmt.Errorf("reading the register %s: %w", display, err)
	}
	full := io.MultiReader(bytes.NewReader(head[:n]), br)
	if n == 4 && bytes.Equal(head, []byte("PK\x03\x04")) {
		switch {
		case strings.EqualFold(sheet, register.SheetAll) && in.file == nil:
			err = usagef("--sheet all reads a workbook from its file, not from standard input")
		case strings.EqualFold(sheet, register.SheetAll) && !regular:
			err = usagef("--sheet all reads a workbook from a regular file, not from a pipe")
		case strings.EqualFold(sheet, register.SheetAll):
			in.src, err = register.NewXLSXAllSheets(name, opt)
		case regular:
			// From the path: the reader reads the zip with random access instead of a
			// copy of the whole file in memory. The hash reads the file at the end. A
			// named pipe is read through once, from here (opening it again would wait
			// for another writer).
			in.src, err = register.NewXLSXFileOptions(name, sheet, opt)
		default:
			in.src, err = register.NewXLSXOptions(full, filepath.Base(display), sheet, opt)
		}
	} else if n >= 4 && bytes.Equal(head, []byte{0xD0, 0xCF, 0x11, 0xE0}) {
		err = fmt.Errorf("%s is an OLE2 file: a legacy .xls workbook or a password-protected .xlsx; save an unprotected .xlsx or CSV copy", display)
	} else {
		if sheet != "" && !strings.EqualFold(sheet, register.SheetAll) {
			err = usagef("--sheet %q: %s is a CSV file, it has no sheets", sheet, display)
		} else {
			in.src, err = register.NewCSVOptions(full, filepath.Base(display), opt)
		}
	}
	if err != nil {
		if in.file != nil {
			in.file.Close()
		}
		return nil, err
	}
	return in, nil
}

// output is a file written atomically: a temporary file in the same directory, renamed
// over the target only when complete. A target that exists and is not a regular file (a
// device such as /dev/null, a named pipe) is written directly instead: renaming over it
// would replace the device with a file.
type output struct {
	path   string
	tmp    *os.File
	direct *os.File // the target itself, when it is not a regular file
	flush  *flusher // syncs tmp in the background as it grows
	w      io.Writer
}

// staleTemp matches the temporary files createOutput makes (".NAME.RANDOM.tmp"), and
// staleAge is the age after which one left by a killed run is removed by the next run
// into its folder.
var staleTemp = regexp.MustCompile(`^\..+\.[0-9]+\.tmp$`)

const staleAge = 24 * time.Hour

func createOutput(path string, st Streams) (*output, error) {
	if path == "-" {
		return &output{path: "-", w: st.Out}, nil
	}
	if fi, err := os.Stat(path); err == nil && !fi.Mode().IsRegular() {
		if fi.IsDir() {
			return nil, usagef("-o %s is a folder: name a file in it", path)
		}
		f, err := os.OpenFile(path, os.O_WRONLY, 0)
		if err != nil {
			return nil, fmt.Errorf("writing the results: %w", err)
		}
		return &output{path: path, direct: f, w: f}, nil
	}
	dir := filepath.Dir(path)
	if fi, err := os.Stat(dir); err != nil || !fi.IsDir() {
		return nil, fmt.Errorf("writing the results: the folder %s does not exist: create it or name another with -o", dir)
	}
	removeStaleTemps(dir, time.Now())
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".*.tmp")
	if err != nil {
		return nil, fmt.Errorf("writing the results: %w", err)
	}
	if err := tmp.Chmod(0o644); err != nil { // CreateTemp makes 0600: colleagues must read results
		tmp.Close()
		os.Remove(tmp.Name())
		return nil, fmt.Errorf("writing the results: %w", err)
	}
	fl := newFlusher(tmp, writeBackAndDrop(tmp))
	return &output{path: path, tmp: tmp, flush: fl, w: fl}, nil
}

// removeStaleTemps removes the temporary files of earlier runs into dir that were killed
// before they could remove their own (only names of createOutput's pattern, older than
// staleAge). It is best effort.
func removeStaleTemps(dir string, now time.Time) {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return
	}
	for _, e := range entries {
		if !e.Type().IsRegular() || !staleTemp.MatchString(e.Name()) {
			continue
		}
		if fi, err := e.Info(); err == nil && now.Sub(fi.ModTime()) > staleAge {
			os.Remove(filepath.Join(dir, e.Name()))
		}
	}
}

func (o *output) commit() error {
	if o.direct != nil {
		if err := o.direct.Close(); err != nil {
			return fmt.Errorf("writing %s: %w", o.path, err)
		}
		return nil
	}
	if o.tmp == nil {
		return nil
	}
	if err := o.flush.Close(); err != nil {
		o.abort()
		return fmt.Errorf("writing %s: %w", o.path, err)
	}
	if err := o.tmp.Sync(); err != nil {
		o.abort()
		return fmt.Errorf("writing %s: %w", o.path, err)
	}
	if err := o.tmp.Close(); err != nil {
		o.abort()
		return fmt.Errorf("writing %s: %w", o.path, err)
	}
	if err := os.Rename(o.tmp.Name(), o.path); err != nil {
		os.Remove(o.tmp.Name())
		return fmt.Errorf("writing %s: %w", o.path, err)
	}
	syncDir(filepath.Dir(o.path))
	return nil
}

// syncDir syncs a directory, so that a rename into it survives a crash. It is best
// effort: some systems cannot open a directory for syncing, and the output is complete
// either way.
func syncDir(dir string) {
	if d, err := os.Open(dir); err == nil {
		d.Sync()
		d.Close()
	}
}

// abort abandons the output: what the flusher still holds is dropped, not written, and
// the temporary file removed.
func (o *output) abort() {
	if o.direct != nil {
		o.direct.Close()
	}
	if o.tmp != nil {
		o.flush.Abort()
		o.tmp.Close()
		os.Remove(o.tmp.Name())
	}
}

// sameFile reports whether two paths name the same existing file.
func sameFile(a, b string) bool {
	fa, err1 := os.Stat(a)
	fb, err2 := os.Stat(b)
	return err1 == nil && err2 == nil && os.SameFile(fa, fb)
}

// defaultOutput is REGISTER's name with "-results" and the format's extension, beside it.
func defaultOutput(register, format string) string {
	if register == "-" {
		return "-"
	}
	base := strings.TrimSuffix(register, filepath.Ext(register))
	return base + "-results." + format
}

func newSink(format string, w io.Writer, paper string) fleet.Sink {
	switch format {
	case "csv":
		return csvout.New(w, csvout.Options{})
	case "jsonl":
		return jsonout.New(w, jsonout.Options{})
	}
	return xlsxout.New(w, xlsxout.Options{Paper: paper})
}

type checkRun struct {
	cfg      checkConfig
	out      string
	format   string
	failOn   string
	quiet    bool
	paper    string
	topN     int
	register string
	baseline string
}

func runCheck(ctx context.Context, args []string, st Streams) error {
	var c checkRun
	fs := newFlagSet("check", st)
	fs.StringVarP(&c.out, "output", "o", "", "results file; - for standard output (default REGISTER-results.FORMAT beside the register)")
	fs.StringVar(&c.format, "format", "", "xlsx, csv or jsonl (default from the output name's extension; csv for standard output; else xlsx)")
	c.cfg.register(fs)
	fs.StringVar(&c.failOn, "fail-on", "fail", "exit 1 when a hoist is at or above this status: fail, marginal or never (error counts as fail)")
	fs.BoolVarP(&c.quiet, "quiet", "q", false, "no summary or progress on the terminal")
	fs.StringVar(&c.paper, "paper", "", "paper the workbook prints on: a4 or letter (default from the locale: letter for US and Canadian ones, else a4)")
	fs.StringVar(&c.baseline, "baseline", "", "an earlier results workbook or JSON lines of hoistfleet: say what changed since (hoists added and removed, statuses, ratings, checks, register values)")
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		return usagef("check needs one register file (or - for CSV on standard input), got %d arguments", fs.NArg())
	}
	c.register = fs.Arg(0)
	_, err := c.run(ctx, st)
	return err
}

func (c *checkRun) run(ctx context.Context, st Streams) (*fleet.Summary, error) {
	switch c.failOn {
	case "fail", "marginal", "never":
	default:
		return nil, usagef("--fail-on %q: want fail, marginal or never", c.failOn)
	}
	switch c.format {
	case "", "xlsx", "csv", "jsonl":
	default:
		return nil, usagef("--format %q: want xlsx, csv or jsonl", c.format)
	}
	if c.out == "" && c.register == "-" {
		c.out = "-" // a register on standard input: results on standard output
	}
	if c.register != "-" && c.out != "" && c.out != "-" && (sameFile(c.register, c.out) || filepath.Clean(c.register) == filepath.Clean(c.out)) {
		return nil, usagef("the output %s is the register itself: hoistfleet never overwrites its input", c.out)
	}
	ext := strings.TrimPrefix(strings.ToLower(filepath.Ext(c.out)), ".")
	if fi, err := os.Stat(c.out); err == nil && !fi.Mode().IsRegular() {
		ext = c.format // a device or a pipe: its name says nothing of the format
		if ext == "" {
			ext = "xlsx"
		}
	}
	switch {
	case c.format == "" && c.out == "-":
		c.format = "csv" // never a zip onto a terminal or a pipe by default
	case c.format == "" && (ext == "csv" || ext == "jsonl" || ext == "xlsx"):
		c.format = ext
	case c.format == "" && c.out != "":
		return nil, usagef("-o %s: say the format: name the file .xlsx, .csv or .jsonl, or give --format", c.out)
	case c.format == "":
		c.format = "xlsx"
	case c.out != "" && c.out != "-" && ext != c.format:
		return nil, usagef("-o %s with --format %s: the name says %q; name the file .%s, or leave --format out", c.out, c.format, ext, c.format)
	}
	if c.out == "-" && c.format == "xlsx" && st.OutIsTTY {
		return nil, usagef("--format xlsx -o -: a workbook is binary and would be written onto the terminal; redirect it (> results.xlsx), or use --format csv or jsonl")
	}
	paper, err := resolvePaper(c.paper, os.Getenv)
	if err != nil {
		return nil, err
	}
	if c.out == "" {
		c.out = defaultOutput(c.register, c.format)
	}
	if c.register != "-" && c.out != "-" && (sameFile(c.register, c.out) || filepath.Clean(c.register) == filepath.Clean(c.out)) {
		return nil, usagef("the output %s is the register itself: hoistfleet never overwrites its input", c.out)
	}
	var prev *fleet.Baseline
	if c.baseline != "" {
		if c.out != "-" && (sameFile(c.baseline, c.out) || filepath.Clean(c.baseline) == filepath.Clean(c.out)) {
			return nil, usagef("the output %s is the baseline itself: name another output with -o, or keep the earlier results under another name", c.out)
		}
		if prev, err = baseline.Read(c.baseline); err != nil {
			return nil, err
		}
	}
	chk, rules, userFiles, asOf, err := c.cfg.checkerWith(prev)
	if err != nil {
		return nil, err
	}
	in, err := c.cfg.open(c.register, st)
	if err != nil {
		return nil, err
	}
	defer in.Close()
	out, err := createOutput(c.out, st)
	if err != nil {
		return nil, err
	}
	info := &fleet.RunInfo{Tool: "hoistfleet", Version: version, Command: "hoistfleet check " + c.register,
		Input: c.register, Sheet: in.src.Header().Sheet, ColumnsFile: c.cfg.columns, Profile: rules.Profile, RulesFile: userFiles,
		AsOf: asOf, Started: time.Now(), MarginalBand: c.cfg.marginal, RatedLoadFactor: c.cfg.ratedLoadFactor,
		Cautions: []string{fleet.Caution}}
	sink := &hashingSink{Sink: newSink(c.format, out.w, paper), in: in, info: info}
	var progress atomic.Int64
	stopProgress := startProgress(st, c.quiet || c.out == "-", &progress)
	summary, err := fleet.Run(ctx, in.src, sink, chk, info, &progress)
	stopProgress()
	if err != nil {
		out.abort()
		return summary, err
	}
	if summary.Total == 0 {
		// A register without a hoist under its header is not a fleet that passed.
		out.abort()
		h := in.src.Header()
		return summary, fmt.Errorf("%s: no hoist was read: the rows under the header (sheet %s) hold no hoist, so nothing was checked and no results were written", c.register, h.Sheet)
	}
	if err := out.commit(); err != nil {
		return summary, err
	}
	if !c.quiet {
		w := st.Out
		if c.out == "-" {
			w = st.Err
		}
		if err := textout.Summary(w, summary, info); err != nil {
			return summary, err
		}
		if c.out != "-" {
			fmt.Fprintf(w, "\nresults: %s\n", c.out)
		}
	}
	return summary, failOn(summary, c.failOn)
}

// hashingSink records the input's SHA-256 and the finish time just before the summary
// and audit are written, when the whole input has been read.
type hashingSink struct {
	fleet.Sink
	in   *input
	info *fleet.RunInfo
}

func (s *hashingSink) End(sum *fleet.Summary, info *fleet.RunInfo) error {
	if s.in.file != nil {
		// Read whatever the reader left unread (XLSX readers read all; CSV stops at EOF).
		io.Copy(s.in.hash, s.in.file)
	}
	info.InputSHA256 = s.in.sha256()
	info.Finished = time.Now()
	return s.Sink.End(sum, info)
}

func failOn(s *fleet.Summary, level string) error {
	worst := fleet.StatusPass
	for _, st := range fleet.Statuses {
		if s.ByStatus[st] > 0 {
			worst = st
			break
		}
	}
	switch level {
	case "never":
		return nil
	case "marginal":
		if worst != fleet.StatusPass {
			return &findingsError{worst}
		}
	default:
		if worst == fleet.StatusFail || worst == fleet.StatusError {
			return &findingsError{worst}
		}
	}
	return nil
}

// startProgress shows "checked N hoists" on stderr once a run has taken more than a
// second, when stderr is a terminal; it returns the function that clears the line.
func startProgress(st Streams, quiet bool, n *atomic.Int64) func() {
	if quiet || !st.ErrIsTTY {
		return func() {}
	}
	done := make(chan struct{})
	finished := make(chan struct{})
	go func() {
		defer close(finished)
		start := time.Now()
		tick := time.NewTicker(250 * time.Millisecond)
		defer tick.Stop()
		shown := false
		for {
			select {
			case <-done:
				if shown {
					fmt.Fprint(st.Err, "\r\033[K")
				}
				return
			case <-tick.C:
				if el := time.Since(start); el > time.Second {
					k := n.Load()
					fmt.Fprintf(st.Err, "\rchecked %d hoists (%.0f/s)", k, float64(k)/el.Seconds())
					shown = true
				}
			}
		}
	}()
	return func() { close(done); <-finished }
}
