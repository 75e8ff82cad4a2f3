// Package csvout writes hoistfleet results as CSV in long form: one record per hoist and
// check, every hoist-level value repeated on each of its checks, ready for a pivot table
// or a BI tool. The columns are, in order,
//
//	row, asset_id, site, hoist_status, governing_check, max_rated_load_kg, check, status,
//	demand, capacity, unit, utilisation, margin, limit_rated_load_kg, rule, source,
//	message, figures
//
// and, when the run re-rates (the register has a proposed rated load column, or the run
// applies a rated-load factor), proposed_hoist_status, proposed_status and
// proposed_utilisation: the verdicts at the proposed load. A hoist with no checks (an
// empty or unreadable row) still gets one record, with its messages in the message field,
// so no register row is dropped.
//
// Numbers are SI (kg, N, m, s, N m, W) unless the unit field says otherwise, written in
// Go's shortest round-trip form ("6480.5", "1.5e-09"); NaN and infinities are empty
// fields. figures is "name=value; name=value" with the check's figures in their order.
//
// Formula injection: a spreadsheet opening the file would run a text field that starts
// with =, +, -, @, tab or carriage return as a formula. Every text field that starts with
// one of these is written with a leading apostrophe ("'=1+2"). Numbers written by this
// package are not text and are never prefixed: "-0.12" stays a number.
package csvout

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
	"unicode/utf8"

	"hoistfleet/fleet"
)

// Options customise a Writer.
type Options struct {
	// Comma is the field separator; 0 means ','. Numbers always use a decimal point, so a
	// ';' separator does not change them.
	Comma rune
	// UseCRLF ends records with \r\n (RFC 4180) instead of \n.
	UseCRLF bool
	// BOM starts the file with a UTF-8 byte order mark, which some spreadsheet programs
	// need to read UTF-8 (rule texts contain ≥, ², °).
	BOM bool
	// Proposed forces the proposed_* columns even when Begin sees no sign of re-rating.
	Proposed bool
}

// Columns are the header of the long form, without the proposed_* columns.
var Columns = []string{"row", "asset_id", "site", "hoist_status", "governing_check", "max_rated_load_kg",
	"check", "status", "demand", "capacity", "unit", "utilisation", "margin", "limit_rated_load_kg",
	"rule", "source", "message", "figures"}

// ProposedColumns follow Columns when the run re-rates.
var ProposedColumns = []string{"proposed_hoist_status", "proposed_status", "proposed_utilisation"}

// Writer is a fleet.Sink writing the long-form CSV. Errors stick.
type Writer struct {
	bw       *bufio.Writer
	opts     Options
	proposed bool
	rec      []byte // the record being built, reused
	tmp      []byte // scratch for figures, reused
	begun    bool
	err      error
}

// New returns a Writer writing to w. Output is buffered: End flushes it.
func New(w io.Writer, opts Options) *Writer {
	if opts.Comma == 0 {
		opts.Comma = ','
	}
	return &Writer{bw: bufio.NewWriterSize(w, 64<<10), opts: opts}
}

var _ fleet.Sink = (*Writer)(nil)

// Begin writes the header. The proposed_* columns are included when opts.Proposed is set,
// info.RatedLoadFactor > 0, or h has a column whose schema key is proposed_rated_load.
func (w *Writer) Begin(h *fleet.Header, info *fleet.RunInfo) error {
	if w.err != nil {
		return w.err
	}
	if w.opts.Comma == '"' || w.opts.Comma == '\r' || w.opts.Comma == '\n' || w.opts.Comma == '\'' || !utf8.ValidRune(w.opts.Comma) {
		w.err = fmt.Errorf("csvout: invalid separator %q", w.opts.Comma)
		return w.err
	}
	w.proposed = w.opts.Proposed || (info != nil && info.RatedLoadFactor > 0)
	if h != nil {
		for _, c := range h.Columns {
			if c.Key == "proposed_rated_load" {
				w.proposed = true
			}
		}
	}
	if w.opts.BOM {
		w.rec = append(w.rec[:0], 0xEF, 0xBB, 0xBF)
	} else {
		w.rec = w.rec[:0]
	}
	cols := Columns
	if w.proposed {
		cols = append(append([]string{}, Columns...), ProposedColumns...)
	}
	for i, c := range cols {
		if i > 0 {
			w.rec = utf8.AppendRune(w.rec, w.opts.Comma)
		}
		w.rec = append(w.rec, c...)
	}
	w.begun = true
	return w.flushRecord()
}

// Write writes one record per check of r (one record when it has none).
func (w *Writer) Write(r *fleet.Result) error {
	if w.err != nil {
		return w.err
	}
	if !w.begun {
		w.err = fmt.Errorf("csvout: Write before Begin")
		return w.err
	}
	if r == nil || r.Asset == nil {
		w.err = fmt.Errorf("csvout: result without an asset")
		return w.err
	}
	site := ""
	if v := r.Asset.Get("site"); v.State == fleet.OK {
		site = v.Text
	}
	if len(r.Checks) == 0 {
		msg := ""
		for i, m := range r.Messages {
			if i > 0 {
				msg += "; "
			}
			msg += m
		}
		w.hoist(r, site)
		w.rec = w.appendEmpty(w.rec, 10)
		w.sep()
		w.rec = w.appendText(w.rec, msg)
		w.sep() // figures
		if w.proposed {
			w.sep()
			if r.Proposed != nil {
				w.rec = w.appendText(w.rec, r.Proposed.Status.String())
			}
			w.rec = w.appendEmpty(w.rec, 2)
		}
		return w.flushRecord()
	}
	for i := range r.Checks {
		c := &r.Checks[i]
		w.hoist(r, site)
		w.sep()
		w.rec = w.appendText(w.rec, c.ID)
		w.sep()
		w.rec = w.appendText(w.rec, c.Status.String())
		w.sep()
		w.rec = appendNum(w.rec, c.Demand)
		w.sep()
		w.rec = appendNum(w.rec, c.Capacity)
		w.sep()
		w.rec = w.appendText(w.rec, c.Unit)
		w.sep()
		w.rec = appendNum(w.rec, c.Utilisation)
		w.sep()
		w.rec = appendNum(w.rec, c.Margin)
		w.sep()
		w.rec = appendNum(w.rec, c.LimitRatedLoadKg)
		w.sep()
		w.rec = w.appendText(w.rec, c.Rule)
		w.sep()
		w.rec = w.appendText(w.rec, c.Source)
		w.sep()
		w.rec = w.appendText(w.rec, c.Message)
		w.sep()
		w.tmp = AppendFigures(w.tmp[:0], c)
		w.rec = w.appendTextBytes(w.rec, w.tmp)
		if w.proposed {
			w.sep()
			if p := r.Proposed; p != nil {
				w.rec = w.appendText(w.rec, p.Status.String())
				w.sep()
				if pc := p.Check(c.ID); pc != nil {
					w.rec = w.appendText(w.rec, pc.Status.String())
					w.sep()
					w.rec = appendNum(w.rec, pc.Utilisation)
				} else {
					w.sep()
				}
			} else {
				w.rec = w.appendEmpty(w.rec, 2)
			}
		}
		if err := w.flushRecord(); err != nil {
			return err
		}
	}
	return nil
}

// hoist starts a record with the hoist-level fields (row … max_rated_load_kg).
func (w *Writer) hoist(r *fleet.Result, site string) {
	w.rec = strconv.AppendInt(w.rec[:0], int64(r.Asset.Row), 10)
	w.sep()
	w.rec = w.appendText(w.rec, r.Asset.ID)
	w.sep()
	w.rec = w.appendText(w.rec, site)
	w.sep()
	w.rec = w.appendText(w.rec, r.Status.String())
	w.sep()
	w.rec = w.appendText(w.rec, r.GoverningCheck)
	w.sep()
	w.rec = appendNum(w.rec, r.MaxRatedLoadKg)
}

func (w *Writer) sep() { w.rec = utf8.AppendRune(w.rec, w.opts.Comma) }

// appendEmpty appends n separators (n empty fields after the current one).
func (w *Writer) appendEmpty(b []byte, n int) []byte {
	for range n {
		b = utf8.AppendRune(b, w.opts.Comma)
	}
	return b
}

func (w *Writer) flushRecord() error {
	if w.opts.UseCRLF {
		w.rec = append(w.rec, '\r', '\n')
	} else {
		w.rec = append(w.rec, '\n')
	}
	if _, err := w.bw.Write(w.rec); err != nil {
		w.err = fmt.Errorf("csvout: %w", err)
	}
	return w.err
}

// End flushes everything to the underlying writer.
func (w *Writer) End(s *fleet.Summary, info *fleet.RunInfo) error {
	if w.err != nil {
		return w.err
	}
	if err := w.bw.Flush(); err != nil {
		w.err = fmt.Errorf("csvout: %w", err)
	}
	return w.err
}

// Abort drops what is buffered. The Writer holds no files of its own.
func (w *Writer) Abort() { w.bw.Reset(io.Discard) }

// appendNum appends f in the shortest form that reads back to the same float64, or
// nothing for NaN and ±Inf.
func appendNum(b []byte, f float64) []byte {
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return b
	}
	return strconv.AppendFloat(b, f, 'g', -1, 64)
}

// AppendFigures appends c's figures as "name=value; name=value": numbers in shortest
// round-trip form (NaN and ±Inf as "n/a"), text figures as written.
func AppendFigures(b []byte, c *fleet.CheckResult) []byte {
	for i, f := range c.Figures {
		if i > 0 {
			b = append(b, "; "...)
		}
		b = append(b, f.Name...)
		b = append(b, '=')
		switch {
		case f.Text != "":
			b = append(b, f.Text...)
		case math.IsNaN(f.Value) || math.IsInf(f.Value, 0):
			b = append(b, "n/a"...)
		default:
			b = strconv.AppendFloat(b, f.Value, 'g', -1, 64)
		}
	}
	return b
}

// NeedsGuard reports whether a text field would be read as a formula by a spreadsheet:
// it starts with =, +, -, @, tab or carriage return.
func NeedsGuard(s string) bool {
	if s == "" {
		return false
	}
	switch s[0] {
	case '=', '+', '-', '@', '\t', '\r':
		return true
	}
	return false
}

func (w *Writer) appendText(b []byte, s string) []byte {
	return w.appendField(b, s, NeedsGuard(s))
}

func (w *Writer) appendTextBytes(b []byte, s []byte) []byte {
	return w.appendField(b, string(s), len(s) > 0 && NeedsGuard(string(s[:1])))
}

// appendField appends a text field, with a leading apostrophe when guard is set, quoted
// as encoding/csv quotes: when it holds the separator, a quote, CR or LF, or starts with
// a space or tab.
func (w *Writer) appendField(b []byte, s string, guard bool) []byte {
	if !w.needsQuotes(s, guard) {
		if guard {
			b = append(b, '\'')
		}
		return append(b, s...)
	}
	b = append(b, '"')
	if guard {
		b = append(b, '\'')
	}
	for i := 0; i < len(s); i++ {
		if s[i] == '"' {
			b = append(b, '"', '"')
		} else {
			b = append(b, s[i])
		}
	}
	return append(b, '"')
}

func (w *Writer) needsQuotes(s string, guard bool) bool {
	if s == "" {
		return false
	}
	if !guard && (s[0] == ' ' || s[0] == '\t') {
		return true
	}
	for _, r := range s {
		if r == w.opts.Comma || r == '"' || r == '\r' || r == '\n' {
			return true
		}
	}
	return false
}
