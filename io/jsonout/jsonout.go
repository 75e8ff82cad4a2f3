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
// and they are never renamed. Extensions, after the contract fields: "site",
// "rated_load_kg" (the load the checks were run at), "rating_note", "derived", and on
// each check "margin" and "message"; "proposed" {rated_load_kg, status, worst_check,
// min_margin, checks} when the hoist was re-checked at a proposed rated load (absent
// otherwise).
//
// Numbers are SI (kg, N, m, s, N m, W) unless a check's unit says otherwise; NaN and
// infinities are written as null, and so is a check id that is empty (no governing
// check). Keys are always in the order above: the objects are written from structs.
package jsonout

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"

	"hoistfleet/calc"
	"hoistfleet/fleet"
)

// Options customise a Writer. There are none yet: the jsonl contract has one form.
// The type exists so that every sink is built the same way, New(w, opts).
type Options struct{}

// Writer is a fleet.Sink writing JSON lines. Errors stick: after the first failed write
// every later call returns it.
type Writer struct {
	bw  *bufio.Writer
	enc *json.Encoder
	err error
}

// New returns a Writer writing to w. Nothing is guaranteed to reach w before End.
func New(w io.Writer, opts Options) *Writer {
	bw := bufio.NewWriterSize(w, 64<<10)
	enc := json.NewEncoder(bw)
	enc.SetEscapeHTML(false)
	return &Writer{bw: bw, enc: enc}
}

var _ fleet.Sink = (*Writer)(nil)

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
	if err := w.enc.Encode(NewHoist(r)); err != nil {
		w.err = fmt.Errorf("jsonout: row %d: %w", r.Asset.Row, err)
	}
	return w.err
}

// End flushes every line to the underlying writer.
func (w *Writer) End(s *fleet.Summary, info *fleet.RunInfo) error {
	if w.err != nil {
		return w.err
	}
	if err := w.bw.Flush(); err != nil {
		w.err = fmt.Errorf("jsonout: %w", err)
	}
	return w.err
}

// Abort drops what is buffered. The Writer holds no files of its own.
func (w *Writer) Abort() { w.bw.Reset(io.Discard) }

// Hoist is the JSON object of one hoist. Field order is the key order.
type Hoist struct {
	AssetID        string   `json:"asset_id"`
	Row            int      `json:"row"`
	Status         string   `json:"status"`
	GoverningCheck NullText `json:"governing_check"`
	WorstCheck     NullText `json:"worst_check"`
	MinMargin      Number   `json:"min_margin"`
	MaxRatedLoadKg Number   `json:"max_rated_load_kg"`
	Messages       []string `json:"messages"`
	DefaultsUsed   []string `json:"defaults_used"`
	Checks         []Check  `json:"checks"`
	// Extensions.
	Site        NullText  `json:"site"`
	RatedLoadKg Number    `json:"rated_load_kg"`
	RatingNote  NullText  `json:"rating_note"`
	Derived     []string  `json:"derived"`
	Proposed    *Proposed `json:"proposed,omitempty"`
}

// Check is the JSON object of one check.
type Check struct {
	ID               string  `json:"id"`
	Status           string  `json:"status"`
	Demand           Number  `json:"demand"`
	Capacity         Number  `json:"capacity"`
	Unit             string  `json:"unit"`
	Utilisation      Number  `json:"utilisation"`
	LimitRatedLoadKg Number  `json:"limit_rated_load_kg"`
	Rule             string  `json:"rule"`
	Source           string  `json:"source"`
	Figures          Figures `json:"figures"`
	// Extensions.
	Margin  Number   `json:"margin"`
	Message NullText `json:"message"`
}

// Proposed is the evaluation at a proposed rated load.
type Proposed struct {
	RatedLoadKg Number   `json:"rated_load_kg"`
	Status      string   `json:"status"`
	WorstCheck  NullText `json:"worst_check"`
	MinMargin   Number   `json:"min_margin"`
	Checks      []Check  `json:"checks"`
}

// NewHoist converts a result to its JSON object.
func NewHoist(r *fleet.Result) Hoist {
	h := Hoist{
		AssetID:        r.Asset.ID,
		Row:            r.Asset.Row,
		Status:         r.Status.String(),
		GoverningCheck: NullText(r.GoverningCheck),
		WorstCheck:     NullText(r.WorstCheck),
		MinMargin:      Number(r.MinMargin),
		MaxRatedLoadKg: Number(r.MaxRatedLoadKg),
		Messages:       nonNil(r.Messages),
		DefaultsUsed:   nonNil(r.DefaultsUsed),
		Checks:         checks(r.Checks),
		RatedLoadKg:    Number(r.RatedLoadKg),
		RatingNote:     NullText(r.Note),
		Derived:        nonNil(r.Derived),
	}
	if v := r.Asset.Get("site"); v.State == fleet.OK {
		h.Site = NullText(v.Text)
	}
	if p := r.Proposed; p != nil {
		h.Proposed = &Proposed{RatedLoadKg: Number(p.RatedLoadKg), Status: p.Status.String(),
			WorstCheck: NullText(p.WorstCheck), MinMargin: Number(p.MinMargin), Checks: checks(p.Checks)}
	}
	return h
}

func checks(cs []fleet.CheckResult) []Check {
	out := make([]Check, len(cs))
	for i := range cs {
		c := &cs[i]
		out[i] = Check{ID: c.ID, Status: c.Status.String(), Demand: Number(c.Demand),
			Capacity: Number(c.Capacity), Unit: c.Unit, Utilisation: Number(c.Utilisation),
			LimitRatedLoadKg: Number(c.LimitRatedLoadKg), Rule: c.Rule, Source: c.Source,
			Figures: Figures(c.Figures), Margin: Number(c.Margin), Message: NullText(c.Message)}
	}
	return out
}

func nonNil(s []string) []string {
	if s == nil {
		return []string{}
	}
	return s
}

// Number is a float64 written as a JSON number, or null when NaN or infinite.
type Number float64

// MarshalJSON implements json.Marshaler.
func (n Number) MarshalJSON() ([]byte, error) { return AppendNumber(nil, float64(n)), nil }

// AppendNumber appends f as encoding/json writes a float64 (shortest representation
// that round-trips, exponent form below 1e-6 and from 1e21), or null for NaN and ±Inf.
func AppendNumber(b []byte, f float64) []byte {
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return append(b, "null"...)
	}
	abs := math.Abs(f)
	format := byte('f')
	if abs != 0 && (abs < 1e-6 || abs >= 1e21) {
		format = 'e'
	}
	b = strconv.AppendFloat(b, f, format, -1, 64)
	if format == 'e' {
		// clean up e-09 to e-9, as encoding/json does
		n := len(b)
		if n >= 4 && b[n-4] == 'e' && b[n-3] == '-' && b[n-2] == '0' {
			b[n-2] = b[n-1]
			b = b[:n-1]
		}
	}
	return b
}

// NullText is a string written as null when empty.
type NullText string

// MarshalJSON implements json.Marshaler.
func (s NullText) MarshalJSON() ([]byte, error) {
	if s == "" {
		return []byte("null"), nil
	}
	return marshalString(string(s))
}

// marshalString quotes s as JSON without HTML escaping (the lines are data, not HTML).
func marshalString(s string) ([]byte, error) {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(s); err != nil {
		return nil, err
	}
	return bytes.TrimSuffix(buf.Bytes(), []byte("\n")), nil
}

// Figures is a check's figures written as one object {name: number or text}, in the
// check's own order. A figure with Text is written as a string, otherwise as a number
// (null when NaN). A repeated name keeps its first value.
type Figures []calc.Figure

// MarshalJSON implements json.Marshaler.
func (fs Figures) MarshalJSON() ([]byte, error) {
	b := make([]byte, 0, 32*len(fs)+2)
	b = append(b, '{')
	seen := make(map[string]bool, len(fs))
	for _, f := range fs {
		if seen[f.Name] {
			continue
		}
		seen[f.Name] = true
		if len(seen) > 1 {
			b = append(b, ',')
		}
		k, err := marshalString(f.Name)
		if err != nil {
			return nil, err
		}
		b = append(b, k...)
		b = append(b, ':')
		if f.Text != "" {
			v, err := marshalString(f.Text)
			if err != nil {
				return nil, err
			}
			b = append(b, v...)
		} else {
			b = AppendNumber(b, f.Value)
		}
	}
	return append(b, '}'), nil
}
