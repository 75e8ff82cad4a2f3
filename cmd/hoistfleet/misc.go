package main

import (
	"context"
	"encoding/csv"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"text/tabwriter"

	"hoistfleet/fleet/rules"
	"hoistfleet/io/blank"
	"hoistfleet/templates"
)

func runTemplate(args []string, st Streams) error {
	var out, units string
	fs := newFlagSet("template", st)
	fs.StringVarP(&out, "output", "o", "register.xlsx", "file to write: .xlsx or .csv; - writes CSV to standard output")
	fs.StringVar(&units, "units", "si", "header units: si or us (US customary)")
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if fs.NArg() != 0 {
		return usagef("template takes no arguments, got %q", fs.Args())
	}
	if units != "si" && units != "us" {
		return usagef("--units %q: want si or us", units)
	}
	csv := out == "-" || strings.EqualFold(filepath.Ext(out), ".csv")
	if !csv && !strings.EqualFold(filepath.Ext(out), ".xlsx") {
		return usagef("-o %s: want a .xlsx or .csv file name", out)
	}
	if out != "-" {
		if _, err := os.Stat(out); err == nil {
			return usagef("%s exists: hoistfleet template does not overwrite files; choose another name", out)
		}
	}
	o, err := createOutput(out, st)
	if err != nil {
		return err
	}
	if csv {
		err = blank.WriteCSV(o.w, units)
	} else {
		err = blank.WriteXLSX(o.w, units)
	}
	if err != nil {
		o.abort()
		return fmt.Errorf("writing the template: %w", err)
	}
	if err := o.commit(); err != nil {
		return err
	}
	if out != "-" {
		fmt.Fprintf(st.Out, "blank register written to %s (%s units)\n", out, strings.ToUpper(units))
	}
	return nil
}

func runRules(args []string, st Streams) error {
	var values []string
	var format, sheet string
	fs := newFlagSet("rules", st)
	fs.StringArrayVar(&values, "rules", nil, "rule profile (iso, us) or a rule file overriding it; repeatable (default iso)")
	fs.StringVar(&sheet, "rules-sheet", "", "the sheet of an XLSX rule file to read (default its first sheet)")
	fs.StringVar(&format, "format", "text", "text, md or csv")
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	t, files, err := loadRules(values, sheet)
	if err != nil {
		return err
	}
	switch format {
	case "md":
		fmt.Fprint(st.Out, rules.Markdown(t))
		return nil
	case "csv":
		w := csv.NewWriter(st.Out)
		w.Write(rules.RuleColumns[:])
		for _, r := range t.Rules {
			w.Write([]string{r.ID, r.Groups, r.When, r.Value, r.Unit, r.Source, r.Provenance, r.Note})
		}
		w.Flush()
		return w.Error()
	case "text":
	default:
		return usagef("--format %q: want text, md or csv", format)
	}
	fmt.Fprintf(st.Out, "Rules in force: profile %s", t.Profile)
	if files != "" {
		fmt.Fprintf(st.Out, ", overridden by %s", files)
	}
	fmt.Fprint(st.Out, "\n\n")
	tw := tabwriter.NewWriter(st.Out, 0, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "RULE\tGROUPS\tWHEN\tVALUE\tUNIT\tSOURCE\tPROVENANCE\tORIGIN")
	for _, r := range t.Rules {
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\n", r.ID, r.Groups, dash(r.When), r.Value, dash(r.Unit), r.Source, r.Provenance, r.Origin)
	}
	return tw.Flush()
}

func dash(s string) string {
	if s == "" {
		return "-"
	}
	return s
}

// demoAsOf is the date of the invented demo scenario, so that its overdue inspections
// and ages are the same on every run.
const demoAsOf = "2026-12-01"

func runDemo(ctx context.Context, args []string, st Streams) error {
	var c checkRun
	dir := "hoistfleet-demo"
	fs := newFlagSet("demo", st)
	fs.StringVarP(&dir, "output", "o", dir, "folder for the demo registers and their results")
	c.cfg.register(fs)
	fs.BoolVarP(&c.quiet, "quiet", "q", false, "no summary on the terminal")
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if fs.NArg() != 0 {
		return usagef("demo takes no arguments, got %q", fs.Args())
	}
	if c.cfg.asOf == "" {
		c.cfg.asOf = demoAsOf
	}
	names, files, err := templates.DemoRegisters()
	if err != nil {
		return fmt.Errorf("demo: %w", err)
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return fmt.Errorf("demo: %w", err)
	}
	for _, n := range names {
		path := filepath.Join(dir, n)
		if err := os.WriteFile(path, files[n], 0o644); err != nil {
			return fmt.Errorf("demo: %w", err)
		}
		run := c
		if len(c.cfg.rules) == 0 && strings.HasSuffix(n, "-us.csv") {
			// The US site's register is checked against the US profile.
			run.cfg.rules = []string{"us"}
		}
		run.register = path
		run.failOn = "never"
		run.format = "xlsx"
		run.out = defaultOutput(path, "xlsx")
		if !c.quiet {
			profile := "iso"
			if len(run.cfg.rules) > 0 {
				profile = strings.Join(run.cfg.rules, " + ")
			}
			fmt.Fprintf(st.Out, "== %s (rules %s, as of %s)\n", path, profile, c.cfg.asOf)
		}
		if _, err := run.run(ctx, st); err != nil {
			return err
		}
		if !c.quiet {
			fmt.Fprintln(st.Out)
		}
	}
	// The same SI register against the operator's insurer's own acceptance criteria: a
	// user rule file layered over the ISO profile.
	rules, err := templates.DemoInsurerRules()
	if err != nil {
		return fmt.Errorf("demo: %w", err)
	}
	rulesPath := filepath.Join(dir, "insurer-rules.csv")
	if err := os.WriteFile(rulesPath, rules, 0o644); err != nil {
		return fmt.Errorf("demo: %w", err)
	}
	if len(c.cfg.rules) == 0 && len(names) > 0 {
		run := c
		run.cfg.rules = []string{"iso", rulesPath}
		run.register = filepath.Join(dir, names[0])
		run.failOn = "never"
		run.format = "xlsx"
		run.out = strings.TrimSuffix(run.register, ".csv") + "-insurer-results.xlsx"
		if !c.quiet {
			fmt.Fprintf(st.Out, "== %s (rules iso + %s, as of %s)\n", run.register, rulesPath, c.cfg.asOf)
		}
		if _, err := run.run(ctx, st); err != nil {
			return err
		}
	}
	return nil
}
