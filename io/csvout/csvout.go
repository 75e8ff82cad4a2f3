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

// flushAt is how much output the Writer holds before writing it out.
const flushAt = 64 << 10

// Writer is a fleet.Sink writing the long-form CSV. Errors stick.
//
// A hoist's records are built in one buffer and handed to the underlying writer in
// blocks of about 64 KiB. The text of check ids, units, rules, sources, sites and
// numbers that repeat from record to record is encoded once and copied after that.
type Writer struct {
	out      io.Writer
	opts     Options
	proposed bool
	fc       fieldCoder
	comma1   byte // the separator when it is one byte, else 0
	// fixedSpecial is set when the separator is one of the bytes the figures field is
	// made of besides names and texts ("; =", digits, ".-+e", "n/a"): then that field
	// is checked whole.
	fixedSpecial bool
	status       [6]string // encoded status words, by fleet.Status
	texts        textCache
	site, gov    memo       // the last site and governing check written
	memos        [][4]memo  // by check index: the last id, unit, rule and source
	messages     []freeMemo // by check index: the last message
	clean        [][]string // by check and figure index: the last name without special bytes
	nums         *numCache
	buf          []byte // output not yet written to out
	pre          []byte // the hoist-level fields of the current hoist, reused
	tmp          []byte // scratch, reused
	begun        bool
	err          error
}

// New returns a Writer writing to w. Output is buffered: End flushes it.
func New(w io.Writer, opts Options) *Writer {
	if opts.Comma == 0 {
		opts.Comma = ','
	}
	return &Writer{out: w, opts: opts, nums: new(numCache), buf: make([]byte, 0, flushAt+16<<10)}
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
	w.fc = newFieldCoder(w.opts.Comma)
	if w.opts.Comma < utf8.RuneSelf {
		w.comma1 = byte(w.opts.Comma)
	}
	w.fixedSpecial = hasSpecial(&w.fc, "; =0123456789.-+e/na")
	for i := range w.status {
		w.status[i] = string(appendText(&w.fc, nil, fleet.Status(i).String()))
	}
	w.proposed = w.opts.Proposed || (info != nil && info.RatedLoadFactor > 0)
	if h != nil {
		for _, c := range h.Columns {
			if c.Key == "proposed_rated_load" {
				w.proposed = true
			}
		}
	}
	b := w.buf
	if w.opts.BOM {
		b = append(b, 0xEF, 0xBB, 0xBF)
	}
	cols := Columns
	if w.proposed {
		cols = append(append([]string{}, Columns...), ProposedColumns...)
	}
	for i, c := range cols {
		if i > 0 {
			b = w.sep(b)
		}
		b = append(b, c...)
	}
	w.buf = w.eol(b)
	w.begun = true
	return w.err
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
	w.pre = w.hoist(w.pre[:0], r)
	b := w.buf
	if len(r.Checks) == 0 {
		b = w.noChecks(b, r)
	}
	for len(w.memos) < len(r.Checks) {
		w.memos = append(w.memos, [4]memo{})
		w.messages = append(w.messages, freeMemo{})
		w.clean = append(w.clean, nil)
	}
	for i := range r.Checks {
		b = w.check(b, r, i)
	}
	w.buf = b
	if len(b) >= flushAt {
		w.flush()
	}
	return w.err
}

// hoist appends the hoist-level fields (row … max_rated_load_kg) and a separator.
func (w *Writer) hoist(b []byte, r *fleet.Result) []byte {
	site := ""
	if v := r.Asset.Get("site"); v.State == fleet.OK {
		site = v.Text
	}
	b = strconv.AppendInt(b, int64(r.Asset.Row), 10)
	b = w.sep(b)
	b = appendText(&w.fc, b, r.Asset.ID)
	b = w.sep(b)
	b = w.texts.appendText(&w.fc, &w.site, b, site)
	b = w.sep(b)
	b = w.appendStatus(b, r.Status)
	b = w.sep(b)
	b = w.texts.appendText(&w.fc, &w.gov, b, r.GoverningCheck)
	b = w.sep(b)
	b = w.nums.appendNum(b, r.MaxRatedLoadKg)
	return w.sep(b)
}

// noChecks appends the one record of a hoist without checks, its messages in the
// message field.
func (w *Writer) noChecks(b []byte, r *fleet.Result) []byte {
	b = append(b, w.pre...)
	b = w.appendEmpty(b, 10)
	msg := w.tmp[:0]
	for i, m := range r.Messages {
		if i > 0 {
			msg = append(msg, "; "...)
		}
		msg = append(msg, m...)
	}
	w.tmp = msg
	b = appendText(&w.fc, b, msg)
	b = w.sep(b) // figures
	if w.proposed {
		b = w.sep(b)
		if r.Proposed != nil {
			b = w.appendStatus(b, r.Proposed.Status)
		}
		b = w.appendEmpty(b, 2)
	}
	return w.eol(b)
}

// check appends the record of check i of r.
func (w *Writer) check(b []byte, r *fleet.Result, i int) []byte {
	c, m := &r.Checks[i], &w.memos[i]
	b = append(b, w.pre...)
	b = w.texts.appendText(&w.fc, &m[0], b, c.ID)
	b = w.sep(b)
	b = w.appendStatus(b, c.Status)
	b = w.sep(b)
	b = w.nums.appendNum(b, c.Demand)
	b = w.sep(b)
	b = w.nums.appendNum(b, c.Capacity)
	b = w.sep(b)
	b = w.texts.appendText(&w.fc, &m[1], b, c.Unit)
	b = w.sep(b)
	b = w.nums.appendNum(b, c.Utilisation)
	b = w.sep(b)
	b = w.nums.appendNum(b, c.Margin)
	b = w.sep(b)
	b = w.nums.appendNum(b, c.LimitRatedLoadKg)
	b = w.sep(b)
	b = w.texts.appendText(&w.fc, &m[2], b, c.Rule)
	b = w.sep(b)
	b = w.texts.appendText(&w.fc, &m[3], b, c.Source)
	b = w.sep(b)
	b = w.messages[i].appendText(&w.fc, b, c.Message)
	b = w.sep(b)
	b = w.appendFigures(b, c, i)
	if w.proposed {
		b = w.sep(b)
		if p := r.Proposed; p != nil {
			b = w.appendStatus(b, p.Status)
			b = w.sep(b)
			if pc := p.Check(c.ID); pc != nil {
				b = w.appendStatus(b, pc.Status)
				b = w.sep(b)
				b = w.nums.appendNum(b, pc.Utilisation)
			} else {
				b = w.sep(b)
			}
		} else {
			b = w.appendEmpty(b, 2)
		}
	}
	return w.eol(b)
}

// appendFigures appends the figures field of c: AppendFigures, encoded as a text field.
// It is built in place; only a field that needs a guard or quotes is encoded again.
// ci is the check's index in its result.
func (w *Writer) appendFigures(b []byte, c *fleet.CheckResult, ci int) []byte {
	if len(c.Figures) == 0 {
		return b
	}
	start := len(b)
	special := w.fixedSpecial
	clean := w.clean[ci]
	for len(clean) < len(c.Figures) {
		clean = append(clean, "")
	}
	w.clean[ci] = clean
	for i := range c.Figures {
		f := &c.Figures[i]
		if i > 0 {
			b = append(b, "; "...)
		}
		b = append(b, f.Name...)
		b = append(b, '=')
		if f.Name != clean[i] {
			if hasSpecial(&w.fc, f.Name) {
				special = true
			} else {
				clean[i] = f.Name
			}
		}
		switch {
		case f.Text != "":
			b = append(b, f.Text...)
			special = special || hasSpecial(&w.fc, f.Text)
		case math.IsNaN(f.Value) || math.IsInf(f.Value, 0):
			b = append(b, "n/a"...)
		default:
			b = w.nums.appendG(b, f.Value)
		}
	}
	if c0 := b[start]; !special && c0 != ' ' && !isGuardByte(c0) {
		return b
	}
	w.tmp = append(w.tmp[:0], b[start:]...)
	return appendText(&w.fc, b[:start], w.tmp)
}

// appendStatus appends a status word.
func (w *Writer) appendStatus(b []byte, s fleet.Status) []byte {
	if s >= 0 && int(s) < len(w.status) {
		return append(b, w.status[s]...)
	}
	return appendText(&w.fc, b, s.String())
}

func (w *Writer) sep(b []byte) []byte {
	if w.comma1 != 0 {
		return append(b, w.comma1)
	}
	return append(b, w.fc.comma...)
}

// appendEmpty appends n separators (n empty fields after the current one).
func (w *Writer) appendEmpty(b []byte, n int) []byte {
	for range n {
		b = w.sep(b)
	}
	return b
}

func (w *Writer) eol(b []byte) []byte {
	if w.opts.UseCRLF {
		return append(b, '\r', '\n')
	}
	return append(b, '\n')
}

// flush writes the buffered output to the underlying writer.
func (w *Writer) flush() {
	if len(w.buf) == 0 || w.err != nil {
		return
	}
	n, err := w.out.Write(w.buf)
	if err == nil && n < len(w.buf) {
		err = io.ErrShortWrite
	}
	if err != nil {
		w.err = fmt.Errorf("csvout: %w", err)
	}
	w.buf = w.buf[:0]
}

// End flushes everything to the underlying writer.
func (w *Writer) End(s *fleet.Summary, info *fleet.RunInfo) error {
	if w.err != nil {
		return w.err
	}
	w.flush()
	return w.err
}

// Abort drops what is buffered. The Writer holds no files of its own.
func (w *Writer) Abort() {
	w.buf = w.buf[:0]
	w.out = io.Discard
}
