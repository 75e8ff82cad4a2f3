package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"time"

	"hoistfleet/fleet"
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
	fs.StringVar(&format, "format", "text", "text or md (Markdown)")
	cfg.register(fs)
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		return usagef("explain needs one register file, got %d arguments", fs.NArg())
	}
	var f record.Format
	ext := ".txt"
	switch format {
	case "text", "txt":
	case "md", "markdown":
		f, ext = record.Markdown, ".md"
	default:
		return usagef("--format %q: want text or md", format)
	}
	if all == (asset != "") {
		return usagef("explain needs --asset ID or --all (one of them)")
	}
	if all && out == "" {
		return usagef("explain --all needs -o DIR, the folder for the records")
	}
	chk, rules, userFiles, asOf, err := cfg.checkerRecord(true)
	if err != nil {
		return err
	}
	in, err := openRegister(fs.Arg(0), cfg.sheet, st)
	if err != nil {
		return err
	}
	defer in.Close()
	h := in.src.Header()
	info := &fleet.RunInfo{Tool: "hoistfleet", Version: version, Input: fs.Arg(0), Sheet: h.Sheet,
		Profile: rules.Profile, RulesFile: userFiles, AsOf: asOf, Started: time.Now(), MarginalBand: cfg.marginal,
		Cautions: []string{fleet.Caution}}
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
		if !all {
			if err := writeRecord(out, st, r, h, info, f); err != nil {
				return err
			}
			continue
		}
		name := filepath.Join(out, recordFileName(a)+ext)
		if err := writeRecord(name, st, r, h, info, f); err != nil {
			return err
		}
	}
	switch {
	case found == 0 && !all:
		return usagef("no hoist with asset id %q in %s", asset, fs.Arg(0))
	case found > 1 && !all:
		fmt.Fprintf(st.Err, "hoistfleet: asset id %q appears %d times in the register; every record is shown\n", asset, found)
	case all:
		fmt.Fprintf(st.Out, "%d calculation records written to %s\n", found, out)
	}
	return nil
}

var unsafeName = regexp.MustCompile(`[^A-Za-z0-9._-]+`)

// recordFileName is "row-0007_H-042": the row keeps names unique when ids repeat.
func recordFileName(a *fleet.Asset) string {
	id := strings.Trim(unsafeName.ReplaceAllString(a.ID, "_"), "_.")
	if id == "" {
		id = "no-id"
	}
	return fmt.Sprintf("row-%04d_%s", a.Row, id)
}

func writeRecord(path string, st Streams, r *fleet.Result, h *fleet.Header, info *fleet.RunInfo, f record.Format) error {
	if path == "" || path == "-" {
		return record.Write(st.Out, r, h, info, f)
	}
	o, err := createOutput(path, st)
	if err != nil {
		return err
	}
	if err := record.Write(o.w, r, h, info, f); err != nil {
		o.abort()
		return err
	}
	return o.commit()
}
