package main

import (
	"context"
	"errors"
	"fmt"
	"io"

	"hoistfleet/io/colreport"
	"hoistfleet/io/register"
)

// runColumns is 'hoistfleet columns REGISTER': how each column of the register is read,
// which of ours it lacks and what they would unlock, and how its rows were read.
func runColumns(ctx context.Context, args []string, st Streams) error {
	var cfg checkConfig
	var format string
	fs := newFlagSet("columns", st)
	fs.StringVar(&format, "format", "text", "text or json")
	fs.StringVar(&cfg.sheet, "sheet", "", "register sheet of an XLSX workbook (default the first), or all: a report for each sheet")
	fs.IntVar(&cfg.headerRow, "header-row", 0, "the register's header row (default: found in the first 30 rows)")
	fs.StringVar(&cfg.dateOrder, "date-order", "", "dmy, mdy or ymd: the order of dates written with numbers")
	fs.StringVar(&cfg.columns, "columns", "", "a columns file (CSV: register column,column,unit,date order) for headers the synonyms do not cover")
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		return usagef("columns needs one register file (or - for CSV on standard input), got %d arguments", fs.NArg())
	}
	if format != "text" && format != "json" {
		return usagef("--format %q: want text or json", format)
	}
	in, err := cfg.open(fs.Arg(0), st)
	if err != nil {
		return err
	}
	defer in.Close()
	// Read every row: the notes of the rows left out, blank markers and date orders
	// come at the end.
	for {
		_, err := in.src.Next(ctx)
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return err
		}
	}
	if all, ok := in.src.(*register.AllSheets); ok {
		// --sheet all: a report for each sheet read (its own header and notes), then
		// the notes of the whole read (the sheets skipped, hidden or empty, the sites taken
		// from sheet names); JSON: {"sheets": [report, …], "notes": […]}.
		var reps []colreport.Report
		for _, h := range all.SheetHeaders() {
			reps = append(reps, colreport.Build(h))
		}
		if format == "json" {
			notes := []string{}
			for _, p := range all.Notes() {
				notes = append(notes, p.Error())
			}
			return colreport.WriteJSON(st.Out, struct {
				Sheets []colreport.Report `json:"sheets"`
				Notes  []string           `json:"notes"`
			}{reps, notes})
		}
		for i, rep := range reps {
			if i > 0 {
				fmt.Fprintln(st.Out)
			}
			if err := colreport.WriteText(st.Out, rep); err != nil {
				return err
			}
		}
		fmt.Fprintln(st.Out)
		for _, p := range all.Notes() {
			fmt.Fprintln(st.Out, p.Error())
		}
		return nil
	}
	rep := colreport.Build(in.src.Header())
	if format == "json" {
		return colreport.WriteJSON(st.Out, rep)
	}
	return colreport.WriteText(st.Out, rep)
}
