package main

import (
	"context"
	"errors"
	"fmt"
	"sort"
	"strings"

	"github.com/spf13/pflag"

	"hoistfleet/fleet"
)

// version is the tool's version, recorded on the audit sheet.
const version = "0.1.0"

// exitCode is the process exit status (design.md "Command line").
type exitCode int

const (
	exitOK       exitCode = 0 // nothing at or above the --fail-on level
	exitFindings exitCode = 1 // some hoist at or above the --fail-on level
	exitUsage    exitCode = 2 // usage or flag error
	exitIO       exitCode = 3 // input unreadable or output unwritable
)

// usageError is a command-line mistake: exit 2.
type usageError struct{ msg string }

func (e *usageError) Error() string { return e.msg }

func usagef(format string, a ...any) error { return &usageError{fmt.Sprintf(format, a...)} }

// findingsError reports that the run finished but some hoist reached the --fail-on level.
type findingsError struct{ worst fleet.Status }

func (e *findingsError) Error() string { return "worst status: " + e.worst.String() }

// run is the whole command: it parses args, does the work and returns the exit code.
func run(ctx context.Context, args []string, st Streams) exitCode {
	if len(args) == 0 {
		fmt.Fprint(st.Err, usageText)
		return exitUsage
	}
	var err error
	cmd, rest := args[0], args[1:]
	switch cmd {
	case "check":
		err = runCheck(ctx, rest, st)
	case "explain":
		err = runExplain(ctx, rest, st)
	case "template":
		err = runTemplate(rest, st)
	case "rules":
		err = runRules(rest, st)
	case "demo":
		err = runDemo(ctx, rest, st)
	case "columns":
		err = runColumns(ctx, rest, st)
	case "version", "--version":
		fmt.Fprintln(st.Out, "hoistfleet", version)
	case "help", "-h", "--help":
		if len(rest) > 0 {
			// A command's help is what 'COMMAND --help' prints, flags included, on
			// standard output.
			out := st
			out.Err = st.Out
			help := []string{"--help"}
			switch rest[0] {
			case "check":
				return report(runCheck(ctx, help, out), st, rest[0])
			case "explain":
				return report(runExplain(ctx, help, out), st, rest[0])
			case "template":
				return report(runTemplate(help, out), st, rest[0])
			case "rules":
				return report(runRules(help, out), st, rest[0])
			case "demo":
				return report(runDemo(ctx, help, out), st, rest[0])
			}
			if h, ok := commandHelp[rest[0]]; ok {
				fmt.Fprint(st.Out, strings.TrimRight(h, "\n")+"\n")
				return exitOK
			}
			topics := make([]string, 0, len(commandHelp))
			for k := range commandHelp {
				topics = append(topics, k)
			}
			sort.Strings(topics)
			fmt.Fprintf(st.Err, "hoistfleet: no help on %q: topics are %s\n", rest[0], strings.Join(topics, ", "))
			return exitUsage
		}
		fmt.Fprint(st.Out, usageText)
	default:
		err = usagef("unknown command %q: want check, explain, columns, template, rules or demo (hoistfleet help)", cmd)
	}
	return report(err, st, cmd)
}

// report prints err and returns the exit code for it; a usage error points at the
// command's help.
func report(err error, st Streams, cmd string) exitCode {
	var ue *usageError
	var fe *findingsError
	switch {
	case err == nil:
		return exitOK
	case errors.Is(err, pflag.ErrHelp):
		return exitOK
	case errors.As(err, &fe):
		return exitFindings
	case errors.As(err, &ue):
		fmt.Fprintln(st.Err, "hoistfleet:", err)
		if _, ok := commandHelp[cmd]; ok {
			fmt.Fprintf(st.Err, "run 'hoistfleet help %s' for its flags and examples\n", cmd)
		} else {
			fmt.Fprintln(st.Err, "run 'hoistfleet help' for usage")
		}
		return exitUsage
	case errors.Is(err, context.Canceled):
		fmt.Fprintln(st.Err, "hoistfleet: cancelled; no output was written")
		return exitIO
	}
	fmt.Fprintln(st.Err, "hoistfleet:", err)
	return exitIO
}

// newFlagSet returns a flag set that prints its usage (with the command's help text) on
// st.Err and returns errors instead of exiting.
func newFlagSet(name string, st Streams) *pflag.FlagSet {
	fs := pflag.NewFlagSet(name, pflag.ContinueOnError)
	fs.SetOutput(st.Err)
	fs.SortFlags = false
	fs.Usage = func() {
		fmt.Fprint(st.Err, strings.TrimRight(commandHelp[name], "\n")+"\n\nFlags:\n")
		fmt.Fprint(st.Err, fs.FlagUsages())
	}
	return fs
}

func parseFlags(fs *pflag.FlagSet, args []string) error {
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, pflag.ErrHelp) {
			return err
		}
		return usagef("%v", err)
	}
	return nil
}
