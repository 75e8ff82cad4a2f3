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
// Numbers are SI (kg, N, m, s, N m, W) unless the unit field says otherwise, written to
// six significant digits (Digits: "6480.5", "0.637687", "1.5e-09"; the JSON lines carry
// the exact values); NaN and infinities are empty fields. figures is
// "name=value; name=value" with the check's figures in their order. rule gives each rule
// row the check used as "id = value unit (groups; condition)"; source is the short form of
// their citations (cite.Short: "ISO 4308-1 [memory, medium]"), whose full text is in the
// workbook's Audit sheet and in `hoistfleet rules`. A check that reads no rule row names
// its method in source, whole.
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
	"sync"
	"unicode/utf8"

	"hoistfleet/fleet"
	"hoistfleet/io/outbuf"
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
// blocks of about 64 KiB, except when that writer buffers cheaply itself (an
// outbuf.Absorber, such as the command's output file): then each hoist's records go to
// it as they come, straight from the buffer they were encoded in, which saves copying
// all the output once more. The text of check ids, units, rules, sources, sites and
// figure names that repeat from record to record is encoded once and copied after that;
// numbers are formatted to Digits significant digits by strconv.
//
// Writer prepares in the workers (fleet.Sink.Prepare): the pipeline's workers encode each hoist's records
// (Prepare, concurrently, each with an encoder of its own from a pool) and Write only
// copies them out, so the encoding runs on every core.
type Writer struct {
	out    io.Writer
	opts   Options
	enc    *encoder        // encodes in Write the results no worker prepared
	pool   sync.Pool       // *encoder for Prepare, configured like enc
	prep   outbuf.Prepared // the workers' encodings, recycled once written
	buf    []byte          // output not yet written to out
	direct bool            // out absorbs writes (outbuf.Absorbs): buf is empty between calls
	begun  bool
	err    error
}

// encoder turns results into records. Its caches only save work: whatever it encoded
// before, the bytes of a result are the same.
type encoder struct {
	opts     Options
	proposed bool
	fc       fieldCoder
	comma1   byte // the separator when it is one byte, else 0
	// fixedSpecial is set when the separator is one of the bytes the figures field is
	// made of besides names and texts ("; =", digits, ".-+e", "n/a"): then that field
	// is checked whole.
	fixedSpecial bool
	status       [6]string // encoded status words, by fleet.Status
	siteField    outbuf.TextField
	texts        textCache
	site, gov    memo        // the last site and governing check written
	memos        [][4]memo   // by check index: the last id, unit, rule and source
	messages     []freeMemo  // by check index: the last message
	figNames     [][]figName // by check and figure index: the last figure name
	pre          []byte      // the hoist-level fields of the current hoist, reused
	tmp          []byte      // scratch, reused
}

// clone returns an encoder with e's configuration and empty caches.
func (e *encoder) clone() *encoder {
	return &encoder{opts: e.opts, proposed: e.proposed, fc: e.fc, comma1: e.comma1,
		fixedSpecial: e.fixedSpecial, status: e.status, siteField: e.siteField}
}

// New returns a Writer writing to w. Output is buffered: End flushes it. When w is an
// outbuf.Absorber that absorbs writes, the Writer holds nothing between calls and
// writes each hoist's records to w as they come.
func New(w io.Writer, opts Options) *Writer {
	if opts.Comma == 0 {
		opts.Comma = ','
	}
	if outbuf.Absorbs(w) {
		return &Writer{out: w, opts: opts, direct: true}
	}
	return &Writer{out: w, opts: opts, buf: make([]byte, 0, flushAt+16<<10)}
}

var (
	_ fleet.Sink = (*Writer)(nil)
)

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
	e := &encoder{opts: w.opts, fc: newFieldCoder(w.opts.Comma), siteField: outbuf.NewTextField("site")}
	if w.opts.Comma < utf8.RuneSelf {
		e.comma1 = byte(w.opts.Comma)
	}
	e.fixedSpecial = hasSpecial(&e.fc, "; =0123456789.-+e/na")
	for i := range e.status {
		e.status[i] = string(appendText(&e.fc, nil, fleet.Status(i).String()))
	}
	e.proposed = w.opts.Proposed || (info != nil && info.RatedLoadFactor > 0)
	if h != nil {
		for _, c := range h.Columns {
			if c.Key == "proposed_rated_load" {
				e.proposed = true
			}
		}
	}
	w.enc = e
	w.pool.New = func() any { return e.clone() }
	b := w.buf
	if w.opts.BOM {
		b = append(b, 0xEF, 0xBB, 0xBF)
	}
	cols := Columns
	if e.proposed {
		cols = append(append([]string{}, Columns...), ProposedColumns...)
	}
	for i, c := range cols {
		if i > 0 {
			b = e.sep(b)
		}
		b = append(b, c...)
	}
	w.buf = e.eol(b)
	w.begun = true
	if w.direct {
		w.flush()
	}
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
	if w.direct {
		if ok, err := w.prep.WriteOut(w.out, r.Prepared); ok {
			r.Prepared = nil
			w.fail(err)
			return w.err
		}
	}
	if b, ok := w.prep.AppendTo(w.buf, r.Prepared); ok {
		w.buf, r.Prepared = b, nil
	} else {
		w.buf = w.enc.encode(w.buf, r)
	}
	if w.direct || len(w.buf) >= flushAt {
		w.flush()
	}
	return w.err
}

// Prepare encodes r's records (fleet.Sink): it runs in the pipeline's workers,
// concurrently, with an encoder of its own, and leaves the bytes in r.Prepared for Write.
// Before Begin, or on a result without an asset, it does nothing (Write reports those).
func (w *Writer) Prepare(r *fleet.Result) {
	if w.enc == nil || r == nil || r.Asset == nil {
		return
	}
	e := w.pool.Get().(*encoder)
	r.Prepared = w.prep.Encode(func(b []byte) []byte { return e.encode(b, r) })
	w.pool.Put(e)
}

// encode appends the records of r (one per check, one when it has none).
func (e *encoder) encode(b []byte, r *fleet.Result) []byte {
	e.pre = e.hoist(e.pre[:0], r)
	if len(r.Checks) == 0 {
		b = e.noChecks(b, r)
	}
	for len(e.memos) < len(r.Checks) {
		e.memos = append(e.memos, [4]memo{})
		e.messages = append(e.messages, freeMemo{})
		e.figNames = append(e.figNames, nil)
	}
	for i := range r.Checks {
		b = e.check(b, r, i)
	}
	return b
}

// hoist appends the hoist-level fields (row … max_rated_load_kg) and a separator.
func (e *encoder) hoist(b []byte, r *fleet.Result) []byte {
	site := e.siteField.Text(r.Asset)
	b = strconv.AppendInt(b, int64(r.Asset.Row), 10)
	b = e.sep(b)
	b = appendText(&e.fc, b, r.Asset.ID)
	b = e.sep(b)
	b = e.texts.appendText(&e.fc, &e.site, b, site)
	b = e.sep(b)
	b = e.appendStatus(b, r.Status)
	b = e.sep(b)
	b = e.texts.appendText(&e.fc, &e.gov, b, r.GoverningCheck)
	b = e.sep(b)
	b = appendNum(b, r.MaxRatedLoadKg)
	return e.sep(b)
}

// noChecks appends the one record of a hoist without checks, its messages in the
// message field.
func (e *encoder) noChecks(b []byte, r *fleet.Result) []byte {
	b = append(b, e.pre...)
	b = e.appendEmpty(b, 10)
	msg := e.tmp[:0]
	for i, m := range r.Messages {
		if i > 0 {
			msg = append(msg, "; "...)
		}
		msg = append(msg, m...)
	}
	e.tmp = msg
	b = appendText(&e.fc, b, msg)
	b = e.sep(b) // figures
	if e.proposed {
		b = e.sep(b)
		if r.Proposed != nil {
			b = e.appendStatus(b, r.Proposed.Status)
		}
		b = e.appendEmpty(b, 2)
	}
	return e.eol(b)
}

// check appends the record of check i of r.
func (e *encoder) check(b []byte, r *fleet.Result, i int) []byte {
	c, m := &r.Checks[i], &e.memos[i]
	b = append(b, e.pre...)
	b = e.texts.appendText(&e.fc, &m[0], b, c.ID)
	b = e.sep(b)
	b = e.appendStatus(b, c.Status)
	b = e.sep(b)
	b = e.appendNum(b, c.Demand)
	b = e.sep(b)
	b = e.appendNum(b, c.Capacity)
	b = e.sep(b)
	b = e.texts.appendText(&e.fc, &m[1], b, c.Unit)
	b = e.sep(b)
	b = e.appendNum(b, c.Utilisation)
	b = e.sep(b)
	b = e.appendNum(b, c.Margin)
	b = e.sep(b)
	b = e.appendNum(b, c.LimitRatedLoadKg)
	b = e.sep(b)
	b = e.texts.appendText(&e.fc, &m[2], b, c.Rule)
	b = e.sep(b)
	b = e.texts.appendSource(&e.fc, &m[3], b, c.Source)
	b = e.sep(b)
	b = e.messages[i].appendText(&e.fc, b, c.Message)
	b = e.sep(b)
	b = e.appendFigures(b, c, i)
	if e.proposed {
		b = e.sep(b)
		if p := r.Proposed; p != nil {
			b = e.appendStatus(b, p.Status)
			b = e.sep(b)
			if pc := p.Check(c.ID); pc != nil {
				b = e.appendStatus(b, pc.Status)
				b = e.sep(b)
				b = e.appendNum(b, pc.Utilisation)
			} else {
				b = e.sep(b)
			}
		} else {
			b = e.appendEmpty(b, 2)
		}
	}
	return e.eol(b)
}

// appendFigures appends the figures field of c: AppendFigures, encoded as a text field.
// It is built in place; only a field that needs a guard or quotes is encoded again.
// ci is the check's index in its result.
func (e *encoder) appendFigures(b []byte, c *fleet.CheckResult, ci int) []byte {
	if len(c.Figures) == 0 {
		return b
	}
	start := len(b)
	special := e.fixedSpecial
	names := e.figNames[ci]
	for len(names) < len(c.Figures) {
		names = append(names, figName{})
	}
	e.figNames[ci] = names
	for i := range c.Figures {
		f, fn := &c.Figures[i], &names[i]
		if f.Name != fn.name || len(fn.before) == 0 {
			fn.set(&e.fc, f.Name, i == 0)
		}
		b = append(b, fn.before...)
		special = special || fn.special
		switch {
		case f.Text != "":
			b = append(b, f.Text...)
			special = special || hasSpecial(&e.fc, f.Text)
		case math.IsNaN(f.Value) || math.IsInf(f.Value, 0):
			b = append(b, "n/a"...)
		default:
			b = appendG(b, f.Value)
		}
	}
	if c0 := b[start]; !special && c0 != ' ' && !isGuardByte(c0) {
		return b
	}
	e.tmp = append(e.tmp[:0], b[start:]...)
	return appendText(&e.fc, b[:start], e.tmp)
}

// figName is the last figure name written in one place of the figures field and the
// bytes that go before the figure's value: "; name=" ("name=" for the first figure).
type figName struct {
	name    string
	before  []byte
	special bool // name holds a byte that forces quoting
}

// set makes fn remember name.
func (fn *figName) set(fc *fieldCoder, name string, first bool) {
	fn.before = fn.before[:0]
	if !first {
		fn.before = append(fn.before, "; "...)
	}
	fn.before = append(append(fn.before, name...), '=')
	fn.name, fn.special = name, hasSpecial(fc, name)
}

// appendStatus appends a status word.
func (e *encoder) appendStatus(b []byte, s fleet.Status) []byte {
	if s >= 0 && int(s) < len(e.status) {
		return append(b, e.status[s]...)
	}
	return appendText(&e.fc, b, s.String())
}

func (e *encoder) sep(b []byte) []byte {
	if e.comma1 != 0 {
		return append(b, e.comma1)
	}
	return append(b, e.fc.comma...)
}

// appendEmpty appends n separators (n empty fields after the current one).
func (e *encoder) appendEmpty(b []byte, n int) []byte {
	for range n {
		b = e.sep(b)
	}
	return b
}

func (e *encoder) eol(b []byte) []byte {
	if e.opts.UseCRLF {
		return append(b, '\r', '\n')
	}
	return append(b, '\n')
}

// flush writes the buffered output to the underlying writer.
func (w *Writer) flush() {
	if len(w.buf) == 0 || w.err != nil {
		return
	}
	w.fail(outbuf.WriteAll(w.out, w.buf))
	w.buf = w.buf[:0]
}

// fail makes err, an error of the underlying writer, the Writer's sticky error.
func (w *Writer) fail(err error) {
	if err != nil && w.err == nil {
		w.err = fmt.Errorf("csvout: %w", err)
	}
}

// End flushes everything to the underlying writer.
func (w *Writer) End(s *fleet.Summary, info *fleet.RunInfo) error {
	if w.err != nil {
		return w.err
	}
	w.flush()
	return w.err
}

// Abort drops what is buffered. The Writer holds no files of its own. In front of an
// outbuf.Absorber it holds nothing: what the Absorber holds is for its owner to drop.
func (w *Writer) Abort() {
	w.buf = w.buf[:0]
	w.out = io.Discard
}
