// Package jsonout writes hoistfleet results as JSON lines: one JSON object per hoist, in
// register order, one line each (design.md, "--format jsonl"). The contract fields are
//
//	{"asset_id": "H-01", "row": 2, "status": "pass", "governing_check": "brake-holding",
//	 "worst_check": "brake-holding", "min_margin": 0.12, "max_rated_load_kg": 6480.5,
//	 "messages": [], "defaults_used": ["hook block mass 0 kg"],
//	 "checks": [{"id": "rope-design-factor", "status": "pass", "demand": 5, "capacity": 6.3,
//	             "unit": "1", "utilisation": 0.79, "limit_rated_load_kg": 7900.1,
//	             "rule": "…", "source": "…", "figures": {"rope_tension_n": 9800}}]}
//
// and they are never renamed. "action" (design.md's contract additions) follows
// "max_rated_load_kg": what to do, in plain words, null for a hoist that passes.
// Extensions, after the contract fields: "site",
// "rated_load_kg" (the load the checks were run at), "rating_note",
// "mechanism_capacity_kg" (the smallest limit over the mechanism's load-dependent checks:
// what the mechanism would allow, which max_rated_load_kg never exceeds without a
// Component WLL; design.md Revision 2), "derived", "hidden" (true when the register row
// is hidden or filtered out: design.md Revision 2), "coverage" ({"run": k, "possible": n}:
// the checks the hoist's data let run of those that apply; design.md Revision 2), "sheet"
// (the row's sheet, only when several sheets are read: --sheet all), "exposure" and
// "crane" (the register's Exposure and Crane, null when blank), "change" (what changed
// since the baseline of check --baseline, null without one: see appendChange; a hoist of
// the baseline missing from the register gets a line of its own at the end, with "row",
// "status" and "coverage" null and change kind "removed"), and on
// each check "margin", "message", "required_capacity" (what a failing load-dependent
// check would need to pass, in the unit of its capacity; null otherwise) and "review"
// ({utilisation, rule, source} where a review limit applies: design.md Revision 2;
// null otherwise); "proposed" {rated_load_kg, status, worst_check,
// min_margin, action, checks} when the hoist was re-checked at a proposed rated load (absent
// otherwise).
//
// Numbers are SI (kg, N, m, s, N m, W) unless a check's unit says otherwise; NaN and
// infinities are written as null, and so is a check id that is empty (no governing
// check). Keys are always in the order above. Strings are escaped as encoding/json
// escapes them without HTML escaping (<, > and & as they are; U+2028 and U+2029 as
// \u2028 and \u2029; invalid UTF-8 as \ufffd), numbers formatted as it formats a float64.
package jsonout

import (
	"fmt"
	"io"
	"strconv"
	"sync"

	"hoistfleet/calc"
	"hoistfleet/fleet"
	"hoistfleet/io/outbuf"
)

// Options customise a Writer. There are none yet: the jsonl contract has one form.
// The type exists so that every sink is built the same way, New(w, opts).
type Options struct{}

// flushAt is how much output the Writer holds before writing it out.
const flushAt = 64 << 10

// Writer is a fleet.Sink writing JSON lines. Errors stick: after the first failed write
// every later call returns it.
//
// The lines are encoded by hand into one buffer, handed to the underlying writer in
// blocks of about 64 KiB, except when that writer buffers cheaply itself (an
// outbuf.Absorber, such as the command's output file): then each line goes to it as it
// comes, straight from the buffer it was encoded in, which saves copying all the output
// once more. The JSON form of texts and numbers that repeat from check to
// check and hoist to hoist is made once and copied after that.
//
// Writer prepares in the workers (fleet.Sink.Prepare): the pipeline's workers encode each hoist's line
// (Prepare, concurrently, each with an encoder of its own from a pool) and Write only
// copies it out, so the encoding runs on every core.
type Writer struct {
	out    io.Writer
	enc    *encoder        // encodes in Write the results no worker prepared
	pool   sync.Pool       // *encoder for Prepare
	prep   outbuf.Prepared // the workers' lines, recycled once written
	buf    []byte          // output not yet written to out
	direct bool            // out absorbs writes (outbuf.Absorbs): buf is empty between calls
	err    error
}

// encoder turns results into lines. Its caches only save work: whatever it encoded
// before, the bytes of a result are the same.
type encoder struct {
	texts textCache
	nums  *numCache
	// memos remember the last texts written in each place of a line: the hoist's, then
	// by check index those of its checks and of its proposed checks.
	hoist   hoistMemos
	checks  []checkMemos
	pchecks []checkMemos
}

func newEncoder() *encoder { return &encoder{nums: new(numCache)} }

type hoistMemos struct {
	status, governing, worst, site, pstatus, pworst memo
	exposure, crane                                 memo
	note                                            freeMemo
	messages, defaults, derived                     []freeMemo // by index
}

type checkMemos struct {
	id, status, unit, rule, source memo
	reviewRule, reviewSource       memo
	message                        freeMemo
	figures                        []memo // by figure index: the key
}

// New returns a Writer writing to w. Nothing is guaranteed to reach w before End. When w
// is an outbuf.Absorber that absorbs writes, the Writer holds nothing between calls and
// writes each line to w as it comes.
func New(w io.Writer, opts Options) *Writer {
	wr := &Writer{out: w, enc: newEncoder(), direct: outbuf.Absorbs(w)}
	if !wr.direct {
		wr.buf = make([]byte, 0, flushAt+16<<10)
	}
	wr.pool.New = func() any { return newEncoder() }
	return wr
}

var (
	_ fleet.Sink = (*Writer)(nil)
)

// Begin writes nothing: JSON lines have no header.
func (w *Writer) Begin(h *fleet.Header, info *fleet.RunInfo) error { return w.err }

// Write writes one hoist's line.
func (w *Writer) Write(r *fleet.Result) error {
	if w.err != nil {
		return w.err
	}
	if r == nil || r.Asset == nil {
		w.err = fmt.Errorf("jsonout: result without an asset")
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
		w.buf = w.enc.appendHoist(w.buf, r)
	}
	if w.direct || len(w.buf) >= flushAt {
		w.flush()
	}
	return w.err
}

// Prepare encodes r's line (fleet.Sink): it runs in the pipeline's workers,
// concurrently, with an encoder of its own, and leaves the bytes in r.Prepared for Write.
// A result without an asset is left to Write, which reports it.
func (w *Writer) Prepare(r *fleet.Result) {
	if r == nil || r.Asset == nil {
		return
	}
	e := w.pool.Get().(*encoder)
	r.Prepared = w.prep.Encode(func(b []byte) []byte { return e.appendHoist(b, r) })
	w.pool.Put(e)
}

// appendHoist appends the line of r: the object of one hoist and a newline.
func (e *encoder) appendHoist(b []byte, r *fleet.Result) []byte {
	hm := &e.hoist
	b = append(b, `{"asset_id":`...)
	b = appendString(b, r.Asset.ID)
	b = append(b, `,"row":`...)
	b = strconv.AppendInt(b, int64(r.Asset.Row), 10)
	b = append(b, `,"status":`...)
	b = e.texts.appendString(&hm.status, b, r.Status.String())
	b = append(b, `,"governing_check":`...)
	b = e.appendNullText(&hm.governing, b, r.GoverningCheck)
	b = append(b, `,"worst_check":`...)
	b = e.appendNullText(&hm.worst, b, r.WorstCheck)
	b = append(b, `,"min_margin":`...)
	b = e.nums.appendNumber(b, r.MinMargin)
	b = append(b, `,"max_rated_load_kg":`...)
	b = e.nums.appendNumber(b, r.MaxRatedLoadKg)
	b = append(b, `,"action":`...)
	b = appendNullString(b, r.Action)
	b = append(b, `,"messages":`...)
	b = appendStrings(b, r.Messages, &hm.messages)
	b = append(b, `,"defaults_used":`...)
	b = appendStrings(b, r.DefaultsUsed, &hm.defaults)
	b = append(b, `,"checks":`...)
	e.checks = growMemos(e.checks, len(r.Checks))
	b = e.appendChecks(b, r.Checks, e.checks)
	b = append(b, `,"site":`...)
	site := ""
	if v := r.Asset.Get("site"); v.State == fleet.OK {
		site = v.Text
	}
	b = e.appendNullText(&hm.site, b, site)
	b = append(b, `,"rated_load_kg":`...)
	b = e.nums.appendNumber(b, r.RatedLoadKg)
	b = append(b, `,"rating_note":`...)
	b = hm.note.appendNullText(b, r.Note)
	b = append(b, `,"mechanism_capacity_kg":`...)
	b = e.nums.appendNumber(b, r.MechanismCapacityKg)
	b = append(b, `,"derived":`...)
	b = appendStrings(b, r.Derived, &hm.derived)
	if r.Asset.Hidden {
		b = append(b, `,"hidden":true`...)
	} else {
		b = append(b, `,"hidden":false`...)
	}
	if r.Asset.Sheet != "" {
		b = append(b, `,"sheet":`...)
		b = appendNullString(b, r.Asset.Sheet)
	}
	b = append(b, `,"coverage":{"run":`...)
	b = strconv.AppendInt(b, int64(r.Coverage.Run), 10)
	b = append(b, `,"possible":`...)
	b = strconv.AppendInt(b, int64(r.Coverage.Possible), 10)
	b = append(b, '}')
	b = append(b, `,"exposure":`...)
	b = e.appendNullText(&hm.exposure, b, textOf(r.Asset, "exposure"))
	b = append(b, `,"crane":`...)
	b = e.appendNullText(&hm.crane, b, textOf(r.Asset, "crane"))
	b = append(b, `,"change":`...)
	b = e.appendChange(b, r.Change)
	if p := r.Proposed; p != nil {
		b = append(b, `,"proposed":{"rated_load_kg":`...)
		b = e.nums.appendNumber(b, p.RatedLoadKg)
		b = append(b, `,"status":`...)
		b = e.texts.appendString(&hm.pstatus, b, p.Status.String())
		b = append(b, `,"worst_check":`...)
		b = e.appendNullText(&hm.pworst, b, p.WorstCheck)
		b = append(b, `,"min_margin":`...)
		b = e.nums.appendNumber(b, p.MinMargin)
		b = append(b, `,"action":`...)
		b = appendNullString(b, p.Action)
		b = append(b, `,"checks":`...)
		e.pchecks = growMemos(e.pchecks, len(p.Checks))
		b = e.appendChecks(b, p.Checks, e.pchecks)
		b = append(b, '}')
	}
	return append(b, '}', '\n')
}

func growMemos(ms []checkMemos, n int) []checkMemos {
	for len(ms) < n {
		ms = append(ms, checkMemos{})
	}
	return ms
}

// appendChecks appends the array of checks cs; ms has a memo for each.
func (e *encoder) appendChecks(b []byte, cs []fleet.CheckResult, ms []checkMemos) []byte {
	b = append(b, '[')
	for i := range cs {
		if i > 0 {
			b = append(b, ',')
		}
		c, m := &cs[i], &ms[i]
		b = append(b, `{"id":`...)
		b = e.texts.appendString(&m.id, b, c.ID)
		b = append(b, `,"status":`...)
		b = e.texts.appendString(&m.status, b, c.Status.String())
		b = append(b, `,"demand":`...)
		b = e.nums.appendNumber(b, c.Demand)
		b = append(b, `,"capacity":`...)
		b = e.nums.appendNumber(b, c.Capacity)
		b = append(b, `,"unit":`...)
		b = e.texts.appendString(&m.unit, b, c.Unit)
		b = append(b, `,"utilisation":`...)
		b = e.nums.appendNumber(b, c.Utilisation)
		b = append(b, `,"limit_rated_load_kg":`...)
		b = e.nums.appendNumber(b, c.LimitRatedLoadKg)
		b = append(b, `,"rule":`...)
		b = e.texts.appendString(&m.rule, b, c.Rule)
		b = append(b, `,"source":`...)
		b = e.texts.appendString(&m.source, b, c.Source)
		b = append(b, `,"figures":`...)
		b = e.appendFigures(b, c.Figures, m)
		b = append(b, `,"margin":`...)
		b = e.nums.appendNumber(b, c.Margin)
		b = append(b, `,"message":`...)
		b = m.message.appendNullText(b, c.Message)
		b = append(b, `,"required_capacity":`...)
		if c.Status == fleet.StatusFail && c.LoadDependent {
			b = e.nums.appendNumber(b, c.RequiredCapacity)
		} else {
			b = append(b, "null"...)
		}
		b = append(b, `,"review":`...)
		if c.ReviewRule == "" {
			b = append(b, "null"...)
		} else {
			b = append(b, `{"utilisation":`...)
			b = e.nums.appendNumber(b, c.ReviewUtilisation)
			b = append(b, `,"rule":`...)
			b = e.texts.appendString(&m.reviewRule, b, c.ReviewRule)
			b = append(b, `,"source":`...)
			b = e.texts.appendString(&m.reviewSource, b, c.ReviewSource)
			b = append(b, '}')
		}
		b = append(b, '}')
	}
	return append(b, ']')
}

// dedupMax is the number of figures up to which repeated names are found by comparing
// each name with those before it; a map is used beyond.
const dedupMax = 32

// appendFigures appends a check's figures as one object {name: number or text}, in the
// check's own order. A figure with Text is written as a string, otherwise as a number
// (null when NaN or infinite). A repeated name keeps its first value.
func (e *encoder) appendFigures(b []byte, fs []calc.Figure, m *checkMemos) []byte {
	for len(m.figures) < len(fs) {
		m.figures = append(m.figures, memo{})
	}
	var seen map[string]bool
	if len(fs) > dedupMax {
		seen = make(map[string]bool, len(fs))
	}
	b = append(b, '{')
	first := true
	for i := range fs {
		f := &fs[i]
		if seen != nil {
			if seen[f.Name] {
				continue
			}
			seen[f.Name] = true
		} else if repeated(fs, i) {
			continue
		}
		if !first {
			b = append(b, ',')
		}
		first = false
		b = e.texts.appendString(&m.figures[i], b, f.Name)
		b = append(b, ':')
		if f.Text != "" {
			b = appendString(b, f.Text)
		} else {
			b = e.nums.appendNumber(b, f.Value)
		}
	}
	return append(b, '}')
}

// repeated reports whether the name of fs[i] is that of an earlier figure.
func repeated(fs []calc.Figure, i int) bool {
	for j := range i {
		if fs[j].Name == fs[i].Name {
			return true
		}
	}
	return false
}

// appendNullText appends s as a JSON string, remembering it in m, or null when empty.
func (e *encoder) appendNullText(m *memo, b []byte, s string) []byte {
	if s == "" {
		return append(b, "null"...)
	}
	return e.texts.appendString(m, b, s)
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
		w.err = fmt.Errorf("jsonout: %w", err)
	}
}

// End writes a line for each hoist of the baseline that is not in the register (change
// kind removed) and flushes every line to the underlying writer.
func (w *Writer) End(s *fleet.Summary, info *fleet.RunInfo) error {
	if w.err != nil {
		return w.err
	}
	if s != nil {
		for _, c := range s.Removed {
			w.buf = w.enc.appendRemoved(w.buf, c)
			if len(w.buf) >= flushAt {
				w.flush()
			}
		}
	}
	w.flush()
	return w.err
}

// textOf is a text field of a, "" when empty or unreadable.
func textOf(a *fleet.Asset, key string) string {
	if v := a.Get(key); v.State == fleet.OK {
		return v.Text
	}
	return ""
}

// appendRemoved appends the line of a hoist of the baseline that is not in the register:
// the contract's fields null or empty (it was not checked), its site, and the change.
func (e *encoder) appendRemoved(b []byte, c *fleet.Change) []byte {
	b = append(b, `{"asset_id":`...)
	b = appendString(b, c.AssetID)
	b = append(b, `,"row":null,"status":null,"governing_check":null,"worst_check":null,"min_margin":null,"max_rated_load_kg":null,"action":null,"messages":[],"defaults_used":[],"checks":[],"site":`...)
	b = appendNullString(b, c.Site)
	b = append(b, `,"rated_load_kg":null,"rating_note":null,"mechanism_capacity_kg":null,"derived":[],"hidden":false,"coverage":null,"exposure":null,"crane":null,"change":`...)
	b = e.appendChange(b, c)
	return append(b, '}', '\n')
}

// appendChange appends the change since the baseline (null without one):
//
//	{"kind": "added|removed|changed|unchanged", "previous_row": 7, "previous_status": "pass",
//	 "status_change": "worse|better"|null, "previous_max_rated_load_kg": 5000,
//	 "rating_changed": false, "previous_mechanism_capacity_kg": 7718.8,
//	 "capacity_changed": false, "newly_failing": ["rope-wear"], "cleared": [],
//	 "newly_overdue": false, "overdue_cleared": false, "inputs": [{"column": "Rope MBF [kN]", "old": "178.6", "new": "150"}]}
//
// previous_* are null for an added hoist; inputs is null when the baseline carries no
// register values (JSON lines).
func (e *encoder) appendChange(b []byte, c *fleet.Change) []byte {
	if c == nil {
		return append(b, "null"...)
	}
	b = append(b, `{"kind":`...)
	b = appendString(b, c.Kind)
	b = append(b, `,"previous_row":`...)
	if c.Kind == fleet.ChangeAdded {
		b = append(b, `null,"previous_status":null`...)
	} else {
		b = strconv.AppendInt(b, int64(c.PrevRow), 10)
		b = append(b, `,"previous_status":`...)
		b = appendString(b, c.PrevStatus.String())
	}
	b = append(b, `,"status_change":`...)
	b = appendNullString(b, c.StatusChange)
	b = append(b, `,"previous_max_rated_load_kg":`...)
	b = e.nums.appendNumber(b, c.PrevMaxRatedLoadKg)
	b = append(b, `,"rating_changed":`...)
	b = strconv.AppendBool(b, c.RatingChanged)
	b = append(b, `,"previous_mechanism_capacity_kg":`...)
	b = e.nums.appendNumber(b, c.PrevCapacityKg)
	b = append(b, `,"capacity_changed":`...)
	b = strconv.AppendBool(b, c.CapacityChanged)
	b = append(b, `,"newly_failing":`...)
	b = appendIDs(b, c.NewlyFailing)
	b = append(b, `,"cleared":`...)
	b = appendIDs(b, c.Cleared)
	b = append(b, `,"newly_overdue":`...)
	b = strconv.AppendBool(b, c.NewlyOverdue)
	b = append(b, `,"overdue_cleared":`...)
	b = strconv.AppendBool(b, c.OverdueCleared)
	b = append(b, `,"inputs":`...)
	if c.Inputs == nil && !c.InputsCompared {
		b = append(b, "null"...)
	} else {
		b = append(b, '[')
		for i, in := range c.Inputs {
			if i > 0 {
				b = append(b, ',')
			}
			b = append(b, `{"column":`...)
			b = appendString(b, in.Column)
			b = append(b, `,"old":`...)
			b = appendString(b, in.Old)
			b = append(b, `,"new":`...)
			b = appendString(b, in.New)
			b = append(b, '}')
		}
		b = append(b, ']')
	}
	return append(b, '}')
}

func appendIDs(b []byte, ids []string) []byte {
	b = append(b, '[')
	for i, id := range ids {
		if i > 0 {
			b = append(b, ',')
		}
		b = appendString(b, id)
	}
	return append(b, ']')
}

// Abort drops what is buffered. The Writer holds no files of its own. In front of an
// outbuf.Absorber it holds nothing: what the Absorber holds is for its owner to drop.
func (w *Writer) Abort() {
	w.buf = w.buf[:0]
	w.out = io.Discard
}
