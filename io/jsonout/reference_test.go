package jsonout

// The writer of commit f7400a6, which encodes with encoding/json (no hand-written
// encoder), kept here verbatim with its identifiers prefixed "ref": the differential
// tests compare the Writer's bytes with it.

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

// refWriter is a fleet.Sink writing JSON lines. Errors stick: after the first failed write
// every later call returns it.
type refWriter struct {
	bw  *bufio.Writer
	enc *json.Encoder
	err error
}

// refNew returns a refWriter writing to w. Nothing is guaranteed to reach w before End.
func refNew(w io.Writer, opts Options) *refWriter {
	bw := bufio.NewWriterSize(w, 64<<10)
	enc := json.NewEncoder(bw)
	enc.SetEscapeHTML(false)
	return &refWriter{bw: bw, enc: enc}
}

// Begin writes nothing: JSON lines have no header.
func (w *refWriter) Begin(h *fleet.Header, info *fleet.RunInfo) error { return w.err }

// Write writes one hoist's line.
func (w *refWriter) Write(r *fleet.Result) error {
	if w.err != nil {
		return w.err
	}
	if r == nil || r.Asset == nil {
		w.err = fmt.Errorf("jsonout: result without an asset")
		return w.err
	}
	if err := w.enc.Encode(refNewHoist(r)); err != nil {
		w.err = fmt.Errorf("jsonout: row %d: %w", r.Asset.Row, err)
	}
	return w.err
}

// End flushes every line to the underlying writer.
func (w *refWriter) End(s *fleet.Summary, info *fleet.RunInfo) error {
	if w.err != nil {
		return w.err
	}
	if err := w.bw.Flush(); err != nil {
		w.err = fmt.Errorf("jsonout: %w", err)
	}
	return w.err
}

// Abort drops what is buffered. The refWriter holds no files of its own.
func (w *refWriter) Abort() { w.bw.Reset(io.Discard) }

// refHoist is the JSON object of one hoist. Field order is the key order.
type refHoist struct {
	AssetID        string      `json:"asset_id"`
	Row            int         `json:"row"`
	Status         string      `json:"status"`
	GoverningCheck refNullText `json:"governing_check"`
	WorstCheck     refNullText `json:"worst_check"`
	MinMargin      refNumber   `json:"min_margin"`
	MaxRatedLoadKg refNumber   `json:"max_rated_load_kg"`
	Messages       []string    `json:"messages"`
	DefaultsUsed   []string    `json:"defaults_used"`
	Checks         []refCheck  `json:"checks"`
	// Extensions.
	Site        refNullText  `json:"site"`
	RatedLoadKg refNumber    `json:"rated_load_kg"`
	RatingNote  refNullText  `json:"rating_note"`
	Derived     []string     `json:"derived"`
	Proposed    *refProposed `json:"proposed,omitempty"`
}

// refCheck is the JSON object of one check.
type refCheck struct {
	ID               string     `json:"id"`
	Status           string     `json:"status"`
	Demand           refNumber  `json:"demand"`
	Capacity         refNumber  `json:"capacity"`
	Unit             string     `json:"unit"`
	Utilisation      refNumber  `json:"utilisation"`
	LimitRatedLoadKg refNumber  `json:"limit_rated_load_kg"`
	Rule             string     `json:"rule"`
	Source           string     `json:"source"`
	Figures          refFigures `json:"figures"`
	// Extensions.
	Margin  refNumber   `json:"margin"`
	Message refNullText `json:"message"`
}

// refProposed is the evaluation at a proposed rated load.
type refProposed struct {
	RatedLoadKg refNumber   `json:"rated_load_kg"`
	Status      string      `json:"status"`
	WorstCheck  refNullText `json:"worst_check"`
	MinMargin   refNumber   `json:"min_margin"`
	Checks      []refCheck  `json:"checks"`
}

// refNewHoist converts a result to its JSON object.
func refNewHoist(r *fleet.Result) refHoist {
	h := refHoist{
		AssetID:        r.Asset.ID,
		Row:            r.Asset.Row,
		Status:         r.Status.String(),
		GoverningCheck: refNullText(r.GoverningCheck),
		WorstCheck:     refNullText(r.WorstCheck),
		MinMargin:      refNumber(r.MinMargin),
		MaxRatedLoadKg: refNumber(r.MaxRatedLoadKg),
		Messages:       refNonNil(r.Messages),
		DefaultsUsed:   refNonNil(r.DefaultsUsed),
		Checks:         refChecks(r.Checks),
		RatedLoadKg:    refNumber(r.RatedLoadKg),
		RatingNote:     refNullText(r.Note),
		Derived:        refNonNil(r.Derived),
	}
	if v := r.Asset.Get("site"); v.State == fleet.OK {
		h.Site = refNullText(v.Text)
	}
	if p := r.Proposed; p != nil {
		h.Proposed = &refProposed{RatedLoadKg: refNumber(p.RatedLoadKg), Status: p.Status.String(),
			WorstCheck: refNullText(p.WorstCheck), MinMargin: refNumber(p.MinMargin), Checks: refChecks(p.Checks)}
	}
	return h
}

func refChecks(cs []fleet.CheckResult) []refCheck {
	out := make([]refCheck, len(cs))
	for i := range cs {
		c := &cs[i]
		out[i] = refCheck{ID: c.ID, Status: c.Status.String(), Demand: refNumber(c.Demand),
			Capacity: refNumber(c.Capacity), Unit: c.Unit, Utilisation: refNumber(c.Utilisation),
			LimitRatedLoadKg: refNumber(c.LimitRatedLoadKg), Rule: c.Rule, Source: c.Source,
			Figures: refFigures(c.Figures), Margin: refNumber(c.Margin), Message: refNullText(c.Message)}
	}
	return out
}

func refNonNil(s []string) []string {
	if s == nil {
		return []string{}
	}
	return s
}

// refNumber is a float64 written as a JSON number, or null when NaN or infinite.
type refNumber float64

// MarshalJSON implements json.Marshaler.
func (n refNumber) MarshalJSON() ([]byte, error) { return refAppendNumber(nil, float64(n)), nil }

// refAppendNumber appends f as encoding/json writes a float64 (shortest representation
// that round-trips, exponent form below 1e-6 and from 1e21), or null for NaN and ±Inf.
func refAppendNumber(b []byte, f float64) []byte {
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

// refNullText is a string written as null when empty.
type refNullText string

// MarshalJSON implements json.Marshaler.
func (s refNullText) MarshalJSON() ([]byte, error) {
	if s == "" {
		return []byte("null"), nil
	}
	return refMarshalString(string(s))
}

// refMarshalString quotes s as JSON without HTML escaping (the lines are data, not HTML).
func refMarshalString(s string) ([]byte, error) {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(s); err != nil {
		return nil, err
	}
	return bytes.TrimSuffix(buf.Bytes(), []byte("\n")), nil
}

// refFigures is a check's figures written as one object {name: number or text}, in the
// check's own order. A figure with Text is written as a string, otherwise as a number
// (null when NaN). A repeated name keeps its first value.
type refFigures []calc.Figure

// MarshalJSON implements json.Marshaler.
func (fs refFigures) MarshalJSON() ([]byte, error) {
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
		k, err := refMarshalString(f.Name)
		if err != nil {
			return nil, err
		}
		b = append(b, k...)
		b = append(b, ':')
		if f.Text != "" {
			v, err := refMarshalString(f.Text)
			if err != nil {
				return nil, err
			}
			b = append(b, v...)
		} else {
			b = refAppendNumber(b, f.Value)
		}
	}
	return append(b, '}'), nil
}
