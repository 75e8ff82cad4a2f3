package csvout

// The writer of commit f7400a6, without the fast path, kept here verbatim with its
// identifiers prefixed "ref": the differential tests compare the Writer's bytes with it.

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
	"unicode/utf8"

	"hoistfleet/fleet"
)

// refWriter is a fleet.Sink writing the long-form CSV. Errors stick.
type refWriter struct {
	bw       *bufio.Writer
	opts     Options
	proposed bool
	rec      []byte // the record being built, reused
	tmp      []byte // scratch for figures, reused
	begun    bool
	err      error
}

// refNew returns a refWriter writing to w. Output is buffered: End flushes it.
func refNew(w io.Writer, opts Options) *refWriter {
	if opts.Comma == 0 {
		opts.Comma = ','
	}
	return &refWriter{bw: bufio.NewWriterSize(w, 64<<10), opts: opts}
}

// Begin writes the header. The proposed_* columns are included when opts.Proposed is set,
// info.RatedLoadFactor > 0, or h has a column whose schema key is proposed_rated_load.
func (w *refWriter) Begin(h *fleet.Header, info *fleet.RunInfo) error {
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
func (w *refWriter) Write(r *fleet.Result) error {
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
		w.rec = refAppendNum(w.rec, c.Demand)
		w.sep()
		w.rec = refAppendNum(w.rec, c.Capacity)
		w.sep()
		w.rec = w.appendText(w.rec, c.Unit)
		w.sep()
		w.rec = refAppendNum(w.rec, c.Utilisation)
		w.sep()
		w.rec = refAppendNum(w.rec, c.Margin)
		w.sep()
		w.rec = refAppendNum(w.rec, c.LimitRatedLoadKg)
		w.sep()
		w.rec = w.appendText(w.rec, c.Rule)
		w.sep()
		w.rec = w.appendText(w.rec, c.Source)
		w.sep()
		w.rec = w.appendText(w.rec, c.Message)
		w.sep()
		w.tmp = refAppendFigures(w.tmp[:0], c)
		w.rec = w.appendTextBytes(w.rec, w.tmp)
		if w.proposed {
			w.sep()
			if p := r.Proposed; p != nil {
				w.rec = w.appendText(w.rec, p.Status.String())
				w.sep()
				if pc := p.Check(c.ID); pc != nil {
					w.rec = w.appendText(w.rec, pc.Status.String())
					w.sep()
					w.rec = refAppendNum(w.rec, pc.Utilisation)
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
func (w *refWriter) hoist(r *fleet.Result, site string) {
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
	w.rec = refAppendNum(w.rec, r.MaxRatedLoadKg)
}

func (w *refWriter) sep() { w.rec = utf8.AppendRune(w.rec, w.opts.Comma) }

// appendEmpty appends n separators (n empty fields after the current one).
func (w *refWriter) appendEmpty(b []byte, n int) []byte {
	for range n {
		b = utf8.AppendRune(b, w.opts.Comma)
	}
	return b
}

func (w *refWriter) flushRecord() error {
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
func (w *refWriter) End(s *fleet.Summary, info *fleet.RunInfo) error {
	if w.err != nil {
		return w.err
	}
	if err := w.bw.Flush(); err != nil {
		w.err = fmt.Errorf("csvout: %w", err)
	}
	return w.err
}

// Abort drops what is buffered. The refWriter holds no files of its own.
func (w *refWriter) Abort() { w.bw.Reset(io.Discard) }

// refAppendNum appends f in the shortest form that reads back to the same float64, or
// nothing for NaN and ±Inf.
func refAppendNum(b []byte, f float64) []byte {
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return b
	}
	return strconv.AppendFloat(b, f, 'g', -1, 64)
}

// refAppendFigures appends c's figures as "name=value; name=value": numbers in shortest
// round-trip form (NaN and ±Inf as "n/a"), text figures as written.
func refAppendFigures(b []byte, c *fleet.CheckResult) []byte {
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

// refNeedsGuard reports whether a text field would be read as a formula by a spreadsheet:
// it starts with =, +, -, @, tab or carriage return.
func refNeedsGuard(s string) bool {
	if s == "" {
		return false
	}
	switch s[0] {
	case '=', '+', '-', '@', '\t', '\r':
		return true
	}
	return false
}

func (w *refWriter) appendText(b []byte, s string) []byte {
	return w.appendField(b, s, refNeedsGuard(s))
}

func (w *refWriter) appendTextBytes(b []byte, s []byte) []byte {
	return w.appendField(b, string(s), len(s) > 0 && refNeedsGuard(string(s[:1])))
}

// appendField appends a text field, with a leading apostrophe when guard is set, quoted
// as encoding/csv quotes: when it holds the separator, a quote, CR or LF, or starts with
// a space or tab.
func (w *refWriter) appendField(b []byte, s string, guard bool) []byte {
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

func (w *refWriter) needsQuotes(s string, guard bool) bool {
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
