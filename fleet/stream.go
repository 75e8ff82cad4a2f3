package fleet

import (
	"context"
	"time"
)

// Source yields the register's rows in order. Next returns io.EOF after the last row.
// A bad cell is not an error of Next: it is a Bad Value in the Asset. Next returns an
// error only when the file itself cannot be read further.
type Source interface {
	Header() *Header
	Next(ctx context.Context) (*Asset, error)
	Close() error
}

// Sink receives the run: Begin once, Prepare each result in the worker that checked it,
// Write every result in register order, End once with the summary. Sinks write to an
// io.Writer given at construction; the caller (cmd) makes the file atomic (temporary
// file, renamed after End). Abort releases what a sink holds (temporary files of its own)
// after a failed run.
//
// Prepare may do part of the work for a result before it reaches Write — typically
// encoding it, so that encoding runs on every core while Write, called in register order
// by one goroutine, only copies bytes out. It is called concurrently from several
// workers, after Begin; it must not touch state that Write uses, and may leave its work
// in Result.Prepared. A sink with nothing to prepare does nothing in it.
//
// Write must not keep the Result, nor anything it points to, once it returns: not the
// Result, its checks, figures or proposed evaluation, its Asset, or the Asset's Values,
// Cells or Problems. Strings and numbers copied out of them are fine. Run reuses that
// memory for later hoists (the Result's through the Checker, the Asset's through a Source
// that is a Recycler).
type Sink interface {
	Begin(h *Header, info *RunInfo) error
	Prepare(r *Result)
	Write(r *Result) error
	End(s *Summary, info *RunInfo) error
	Abort()
}

// Recycler is implemented by a Source that can reuse the memory of an Asset it returned
// (the Asset, its Values and Cells) for a later row, so that a long run does not
// allocate and clear that memory afresh for every hoist. Run hands each Asset back after
// writing its Result and adding it to the summary; strings are never reused, so any
// string taken from an Asset stays valid. Recycle is called from another goroutine than
// Next.
type Recycler interface {
	Recycle(a *Asset)
}

// RuleUse is one rule row in force, as the audit sheet lists it.
type RuleUse struct {
	ID         string
	Groups     string
	When       string
	Value      string
	Unit       string
	Source     string
	Provenance string
	Note       string
	Origin     string // "built-in iso", "built-in us", or the user's rule file
	Uses       int    // how many checks used it in this run
}

// RunInfo is what the audit sheet records about a run.
type RunInfo struct {
	Tool            string
	Version         string
	Command         string // the command line as given
	Input           string // input file name as given
	InputSHA256     string
	Sheet           string
	Profile         string // rule profile
	RulesFile       string // user rule file, "" for none
	ColumnsFile     string // columns file (--columns), "" for none
	Rules           []RuleUse
	AsOf            time.Time // the run's date for inspection and age checks
	Started         time.Time
	Finished        time.Time
	MarginalBand    float64
	RatedLoadFactor float64 // 0 when not re-rating the fleet
	Workers         int
	Rows            int
	Cautions        []string
}

// Caution is the warning every output carries.
const Caution = "hoistfleet is a screening calculation on the data given. It does not replace thorough examination by a competent person, the manufacturer's ratings and instructions, or the regulations, codes and licensed engineering practice that apply where the hoist is used, which always prevail. A hoist's rating may be changed only by its manufacturer or a competent person, after a load test."
