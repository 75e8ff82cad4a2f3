package main

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"time"

	"hoistfleet/fleet"
	"hoistfleet/io/pdfrecord"
	"hoistfleet/io/record"
)

func runExplain(ctx context.Context, args []string, st Streams) error {
	var (
		cfg    checkConfig
		asset  string
		all    bool
		out    string
		format string
	)
	fs := newFlagSet("explain", st)
	fs.StringVar(&asset, "asset", "", "asset id of the hoist to explain")
	fs.BoolVar(&all, "all", false, "write the record of every hoist, one file each, into the folder given by -o")
	fs.StringVarP(&out, "output", "o", "", "with --all: the folder for the records; otherwise a file (default standard output)")
	fs.StringVar(&format, "format", "text", "text, md (Markdown) or pdf (a record to sign, with plots; needs -o FILE.pdf or -o DIR with --all)")
	cfg.register(fs)
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		return usagef("explain needs one register file, got %d arguments", fs.NArg())
	}
	var f record.Format
	ext, pdf := ".txt", false
	switch format {
	case "text", "txt":
	case "md", "markdown":
		f, ext = record.Markdown, ".md"
	case "pdf":
		ext, pdf = ".pdf", true
	default:
		return usagef("--format %q: want text, md or pdf", format)
	}
	if all == (asset != "") {
		return usagef("explain needs --asset ID or --all (one of them)")
	}
	if all && out == "" {
		return usagef("explain --all needs -o DIR, the folder for the records")
	}
	if pdf && out == "" {
		return usagef("explain --format pdf writes a PDF: give -o FILE.pdf (-o - for standard output)")
	}
	chk, rules, userFiles, asOf, err := cfg.checkerRecord(true, nil)
	if err != nil {
		return err
	}
	in, err := cfg.open(fs.Arg(0), st)
	if err != nil {
		return err
	}
	defer in.Close()
	h := in.src.Header()
	info := &fleet.RunInfo{Tool: "hoistfleet", Version: version, Input: fs.Arg(0), Sheet: h.Sheet, ColumnsFile: cfg.columns,
		Profile: rules.Profile, RulesFile: userFiles, AsOf: asOf, Started: time.Now(), MarginalBand: cfg.marginal,
		Cautions: []string{fleet.Caution}}
	// The record names the register by its SHA-256: a file is hashed first; standard
	// input is hashed as it is read, so its records are written once it has been read.
	var pending []*fleet.Result
	deferWrites := fs.Arg(0) == "-"
	if !deferWrites {
		sum, err := fileSHA256(fs.Arg(0))
		if err != nil {
			return err
		}
		info.InputSHA256 = sum
	}
	w := &recordWriter{st: st, h: h, info: info, format: f, pdf: pdf, chk: chk, names: map[string]int{}}
	if all {
		if err := os.MkdirAll(out, 0o755); err != nil {
			return fmt.Errorf("explain: %w", err)
		}
	}
	found := 0
	for {
		if err := ctx.Err(); err != nil {
			return err
		}
		a, err := in.src.Next(ctx)
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return err
		}
		if a.Blank || (!all && a.ID != asset) {
			continue
		}
		found++
		r := chk.Check(a)
		if deferWrites || !all {
			// One asset id: its rows are gathered first, since an id that repeats (at
			// two sites, on two sheets) writes one record per row.
			pending = append(pending, r)
			continue
		}
		if err := w.write(r, out, all, ext); err != nil {
			return err
		}
	}
	if deferWrites {
		info.InputSHA256 = in.sha256()
	}
	var written []string
	for _, r := range pending {
		path := out
		if !all && len(pending) > 1 && out != "" && out != "-" {
			// Several rows with the asset id, one file asked for: a file each, named
			// after the file asked for and the row, so that no record replaces another.
			ext := filepath.Ext(out)
			path = strings.TrimSuffix(out, ext) + "_" + recordFileName(r.Asset) + ext
			written = append(written, path)
		}
		if err := w.write(r, path, all, ext); err != nil {
			return err
		}
	}
	switch {
	case found == 0 && !all:
		return usagef("no hoist with asset id %q in %s", asset, fs.Arg(0))
	case found > 1 && !all && len(written) > 0:
		fmt.Fprintf(st.Err, "hoistfleet: asset id %q appears %d times in the register; a record for each: %s\n", asset, found, strings.Join(written, ", "))
	case found > 1 && !all:
		fmt.Fprintf(st.Err, "hoistfleet: asset id %q appears %d times in the register; every record is shown\n", asset, found)
	case all:
		fmt.Fprintf(st.Out, "%d calculation records written to %s\n", found, out)
	}
	return nil
}

var unsafeName = regexp.MustCompile(`[^A-Za-z0-9._-]+`)

// recordFileName is "row-0007_H-042": the row keeps names unique when ids repeat; with
// several sheets read as one register the sheet leads ("Nord_row-0007_H-042").
func recordFileName(a *fleet.Asset) string {
	id := strings.Trim(unsafeName.ReplaceAllString(a.ID, "_"), "_.")
	if id == "" {
		id = "no-id"
	}
	name := fmt.Sprintf("row-%04d_%s", a.Row, id)
	if a.Sheet != "" {
		sheet := strings.Trim(unsafeName.ReplaceAllString(a.Sheet, "_"), "_.")
		if sheet == "" {
			sheet = "sheet"
		}
		name = sheet + "_" + name
	}
	return name
}

// recordWriter writes calculation records in one format.
type recordWriter struct {
	st     Streams
	h      *fleet.Header
	info   *fleet.RunInfo
	format record.Format
	pdf    bool
	chk    *fleet.Checker
	names  map[string]int // --all: the file names written, so that none is written twice
}

// write writes r's record: to out (a file, or standard output for "" and "-"), or with
// all into the folder out, named after its row and asset id.
func (w *recordWriter) write(r *fleet.Result, out string, all bool, ext string) error {
	path := out
	if all {
		name := recordFileName(r.Asset)
		if n := w.names[name]; n > 0 { // two sheet names that read alike in a file name
			w.names[name] = n + 1
			name += "-" + strconv.Itoa(n+1)
		} else {
			w.names[name] = 1
		}
		path = filepath.Join(out, name+ext)
	}
	emit := func(dst io.Writer) error {
		if w.pdf {
			return pdfrecord.Write(dst, r, w.h, w.info, w.chk)
		}
		return record.Write(dst, r, w.h, w.info, w.format)
	}
	if path == "" || path == "-" {
		return emit(w.st.Out)
	}
	o, err := createOutput(path, w.st)
	if err != nil {
		return err
	}
	if err := emit(o.w); err != nil {
		o.abort()
		return err
	}
	return o.commit()
}

// fileSHA256 is the hex SHA-256 of a file's bytes.
func fileSHA256(name string) (string, error) {
	f, err := os.Open(name)
	if err != nil {
		return "", fmt.Errorf("reading the register: %w", err)
	}
	defer f.Close()
	hs := sha256.New()
	if _, err := io.Copy(hs, f); err != nil {
		return "", fmt.Errorf("reading the register %s: %w", name, err)
	}
	return hex.EncodeToString(hs.Sum(nil)), nil
}
