package jsonout

import (
	"bytes"
	"encoding/json"
	"errors"
	"math"
	"os"
	"strings"
	"testing"

	"hoistfleet/calc"
	"hoistfleet/calc/approx"
	"hoistfleet/fleet"
)

var nan = math.NaN()

// fixture builds results by hand. The numbers are chosen, not computed by the tool:
// each test states what it checks against.
func fixture() []*fleet.Result {
	a := &fleet.Asset{Index: 0, Row: 2, ID: "H-01", Fields: map[string]fleet.Value{
		"site": {State: fleet.OK, Text: "North <works> & yard"}}}
	b := &fleet.Asset{Index: 1, Row: 3, ID: "=HYPERLINK(\"x\")"}
	c := &fleet.Asset{Index: 2, Row: 5, Blank: true}
	r1 := &fleet.Result{Asset: a,
		Evaluation: fleet.Evaluation{RatedLoadKg: 5000, Status: fleet.StatusPass, WorstCheck: "brake-holding", MinMargin: 0.12,
			Checks: []fleet.CheckResult{
				{ID: "rope-design-factor", Status: fleet.StatusPass, Demand: 5.6, Capacity: 7, Unit: "1", Utilisation: 0.8, Margin: 0.2,
					LimitRatedLoadKg: 6250, Rule: "Zp ≥ 5.6 (M6)", Source: "ISO 4308-1 table 2 (seen)",
					Figures: []calc.Figure{{Name: "rope_tension_n", Value: 25000, Unit: "N"}, {Name: "reeving_efficiency", Value: 0.99}}},
				{ID: "inspection-due", Status: fleet.StatusPass, Demand: 100, Capacity: 365, Unit: "d", Utilisation: 100.0 / 365, Margin: 1 - 100.0/365,
					LimitRatedLoadKg: nan, Figures: []calc.Figure{{Name: "next_due", Value: nan, Text: "2027-03-01"}}},
				{ID: "runaway", Status: fleet.StatusInfo, Demand: nan, Capacity: nan, Utilisation: nan, Margin: nan, LimitRatedLoadKg: nan,
					Figures: []calc.Figure{{Name: "acceleration_m_s2", Value: 9.80665}, {Name: "fall_energy_j", Value: math.Inf(1)}, {Name: "tiny", Value: 1.5e-9}}},
			}},
		Rating:       fleet.Rating{MaxRatedLoadKg: 6480.5, GoverningCheck: "brake-holding"},
		DefaultsUsed: []string{"hook block mass 0 kg"},
	}
	r2 := &fleet.Result{Asset: b,
		Evaluation: fleet.Evaluation{RatedLoadKg: 2000, Status: fleet.StatusFail, WorstCheck: "drum-ratio", MinMargin: -0.25,
			Checks: []fleet.CheckResult{{ID: "drum-ratio", Status: fleet.StatusFail, Demand: 20, Capacity: 16, Unit: "1", Utilisation: 1.25, Margin: -0.25,
				LimitRatedLoadKg: nan, Message: "drum too small"}}},
		Rating:   fleet.Rating{MaxRatedLoadKg: nan, Note: "drum-ratio fails at any load"},
		Messages: []string{"Register!F3: note"},
		Proposed: &fleet.Evaluation{RatedLoadKg: 2500, Status: fleet.StatusFail, WorstCheck: "drum-ratio", MinMargin: -0.25,
			Checks: []fleet.CheckResult{{ID: "drum-ratio", Status: fleet.StatusFail, Demand: 20, Capacity: 16, Unit: "1", Utilisation: 1.25, Margin: -0.25, LimitRatedLoadKg: nan}}},
	}
	r3 := &fleet.Result{Asset: c, Evaluation: fleet.Evaluation{Status: fleet.StatusError, MinMargin: nan, RatedLoadKg: nan},
		Rating: fleet.Rating{MaxRatedLoadKg: nan}, Messages: []string{"Register!5:5: empty row"}}
	return []*fleet.Result{r1, r2, r3}
}

func run(t *testing.T, rs []*fleet.Result) []string {
	t.Helper()
	var buf bytes.Buffer
	w := New(&buf, Options{})
	if err := w.Begin(&fleet.Header{}, &fleet.RunInfo{}); err != nil {
		t.Fatal(err)
	}
	for _, r := range rs {
		if err := w.Write(r); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.End(fleet.NewSummary(10), &fleet.RunInfo{}); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	if !strings.HasSuffix(out, "\n") {
		t.Fatalf("output does not end in a newline: %q", out)
	}
	return strings.Split(strings.TrimSuffix(out, "\n"), "\n")
}

func TestOneLinePerHoistInOrder(t *testing.T) {
	lines := run(t, fixture())
	if len(lines) != 3 {
		t.Fatalf("got %d lines, want 3", len(lines))
	}
	wantRows := []int{2, 3, 5} // the fixture's register rows (design.md: header = row 1)
	for i, l := range lines {
		var m map[string]any
		if err := json.Unmarshal([]byte(l), &m); err != nil {
			t.Fatalf("line %d is not JSON: %v\n%s", i+1, err, l)
		}
		if got := m["row"].(float64); int(got) != wantRows[i] {
			t.Errorf("line %d: row %v, want %d", i+1, got, wantRows[i])
		}
	}
}

// TestKeyOrder checks the contract's key order (design.md "--format jsonl") and that
// extensions come after it.
func TestKeyOrder(t *testing.T) {
	lines := run(t, fixture())
	want := []string{`"asset_id"`, `"row"`, `"status"`, `"governing_check"`, `"worst_check"`, `"min_margin"`,
		`"max_rated_load_kg"`, `"messages"`, `"defaults_used"`, `"checks"`, `"site"`, `"rated_load_kg"`,
		`"rating_note"`, `"derived"`, `"hidden"`, `"coverage"`, `"exposure"`, `"crane"`, `"change"`, `"proposed"`}
	l := lines[1]
	// look for the top-level keys only: strip the nested check arrays first
	top := l
	for _, k := range []string{`"checks":[`} {
		i := strings.Index(top, k)
		j := strings.Index(top[i:], `}]`)
		top = top[:i+len(k)] + top[i+j+1:]
	}
	last := -1
	for _, k := range want {
		i := strings.Index(top, k+":")
		if i < 0 {
			t.Fatalf("key %s missing in %s", k, top)
		}
		if i < last {
			t.Errorf("key %s out of order in %s", k, top)
		}
		last = i
	}
	ck := []string{`"id"`, `"status"`, `"demand"`, `"capacity"`, `"unit"`, `"utilisation"`, `"limit_rated_load_kg"`,
		`"rule"`, `"source"`, `"figures"`, `"margin"`, `"message"`}
	c := lines[0][strings.Index(lines[0], `"checks":[`):]
	last = -1
	for _, k := range ck {
		i := strings.Index(c, k+":")
		if i < last || i < 0 {
			t.Errorf("check key %s missing or out of order in %s", k, c)
		}
		last = i
	}
}

func TestValues(t *testing.T) {
	lines := run(t, fixture())
	var h struct {
		AssetID        string   `json:"asset_id"`
		Status         string   `json:"status"`
		Governing      *string  `json:"governing_check"`
		MinMargin      *float64 `json:"min_margin"`
		MaxRatedLoadKg *float64 `json:"max_rated_load_kg"`
		Messages       []string `json:"messages"`
		DefaultsUsed   []string `json:"defaults_used"`
		Site           *string  `json:"site"`
		Checks         []struct {
			ID          string         `json:"id"`
			Status      string         `json:"status"`
			Utilisation *float64       `json:"utilisation"`
			Limit       *float64       `json:"limit_rated_load_kg"`
			Figures     map[string]any `json:"figures"`
		} `json:"checks"`
		Proposed *struct {
			RatedLoadKg float64 `json:"rated_load_kg"`
			Status      string  `json:"status"`
		} `json:"proposed"`
	}
	if err := json.Unmarshal([]byte(lines[0]), &h); err != nil {
		t.Fatal(err)
	}
	if h.AssetID != "H-01" || h.Status != "pass" || *h.Governing != "brake-holding" || *h.Site != "North <works> & yard" {
		t.Errorf("identity/status wrong: %+v", h)
	}
	if !approx.Equal(*h.MaxRatedLoadKg, 6480.5, 0, 1e-15) || !approx.Equal(*h.MinMargin, 0.12, 0, 1e-15) {
		t.Errorf("numbers changed in transit: %v %v", *h.MaxRatedLoadKg, *h.MinMargin)
	}
	if len(h.Messages) != 0 || h.Messages == nil {
		t.Errorf("messages must be [] not null: %v", h.Messages)
	}
	if !strings.Contains(lines[0], `"North <works> & yard"`) {
		t.Errorf("HTML escaping applied: %s", lines[0])
	}
	if h.Proposed != nil {
		t.Errorf("proposed present without a proposed evaluation")
	}
	if strings.Contains(lines[0], `"proposed"`) {
		t.Errorf("proposed key written without a proposed evaluation")
	}
	// g_n = 9.80665 m/s² exactly (NIST SP 811 appendix B, seen): a figure passes unrounded.
	if g := h.Checks[2].Figures["acceleration_m_s2"].(float64); g != 9.80665 {
		t.Errorf("figure altered: %v", g)
	}
	if h.Checks[2].Figures["fall_energy_j"] != nil {
		t.Errorf("+Inf must be null, got %v", h.Checks[2].Figures["fall_energy_j"])
	}
	if s, ok := h.Checks[1].Figures["next_due"].(string); !ok || s != "2027-03-01" {
		t.Errorf("text figure: %v", h.Checks[1].Figures["next_due"])
	}
	if h.Checks[1].Limit != nil || h.Checks[2].Utilisation != nil {
		t.Errorf("NaN must be null")
	}
	if !strings.Contains(lines[0], `"tiny":1.5e-9`) {
		t.Errorf("small numbers not written as encoding/json does: %s", lines[0])
	}

	if err := json.Unmarshal([]byte(lines[1]), &h); err != nil {
		t.Fatal(err)
	}
	if h.MaxRatedLoadKg != nil {
		t.Errorf("NaN rating must be null")
	}
	if h.Proposed == nil || h.Proposed.Status != "fail" || !approx.Equal(h.Proposed.RatedLoadKg, 2500, 0, 0) {
		t.Errorf("proposed: %+v", h.Proposed)
	}
	if !strings.Contains(lines[2], `"governing_check":null`) || !strings.Contains(lines[2], `"checks":[]`) {
		t.Errorf("empty row: %s", lines[2])
	}
}

// TestAppendNumber compares with encoding/json's own float formatting, the reference
// the jsonl contract follows.
func TestAppendNumber(t *testing.T) {
	for _, f := range []float64{0, 1, -1, 0.1, 1e-6, 9.99e-7, 1e-7, 123456789, 1e20, 1e21, -2.5e-12, 6480.5, math.SmallestNonzeroFloat64, math.MaxFloat64} {
		want, _ := json.Marshal(f)
		if got := string(AppendNumber(nil, f)); got != string(want) {
			t.Errorf("AppendNumber(%v) = %s, encoding/json %s", f, got, want)
		}
	}
	for _, f := range []float64{math.NaN(), math.Inf(1), math.Inf(-1)} {
		if got := string(AppendNumber(nil, f)); got != "null" {
			t.Errorf("AppendNumber(%v) = %s, want null", f, got)
		}
	}
}

type failWriter struct{}

func (failWriter) Write(p []byte) (int, error) { return 0, errors.New("disk full") }

func TestErrorSticks(t *testing.T) {
	w := New(failWriter{}, Options{})
	_ = w.Begin(&fleet.Header{}, &fleet.RunInfo{})
	for _, r := range fixture() {
		_ = w.Write(r)
	}
	if err := w.End(nil, nil); err == nil || !strings.Contains(err.Error(), "disk full") {
		t.Fatalf("End error = %v, want disk full", err)
	}
	if err := w.Write(fixture()[0]); err == nil {
		t.Fatal("error did not stick")
	}
	if err := w.Write(&fleet.Result{}); err == nil {
		t.Fatal("a result without an asset must be an error")
	}
}

func ExampleWriter() {
	var buf bytes.Buffer
	w := New(&buf, Options{})
	r := &fleet.Result{Asset: &fleet.Asset{Row: 2, ID: "H-07"},
		Evaluation: fleet.Evaluation{RatedLoadKg: 1000, Status: fleet.StatusMarginal, WorstCheck: "drum-ratio", MinMargin: 0.05,
			Coverage: fleet.Coverage{Run: 1, Possible: 1},
			Action:   "No action for the drum's D/d (20 against 19 required, fixed by the design); note it at the next modification",
			Checks: []fleet.CheckResult{{ID: "drum-ratio", Status: fleet.StatusMarginal, Demand: 19, Capacity: 20, Unit: "1",
				Utilisation: 0.95, Margin: 0.05, LimitRatedLoadKg: math.NaN(), Rule: "h1 ≥ 19 (M5)", Source: "ISO 4308-1"}}},
		Rating: fleet.Rating{MaxRatedLoadKg: 1200.5, MechanismCapacityKg: 1200.5, GoverningCheck: "motor-torque"}}
	_ = w.Begin(&fleet.Header{}, &fleet.RunInfo{})
	_ = w.Write(r)
	_ = w.End(fleet.NewSummary(10), &fleet.RunInfo{})
	buf.WriteTo(os.Stdout)
	// Output:
	// {"asset_id":"H-07","row":2,"status":"marginal","governing_check":"motor-torque","worst_check":"drum-ratio","min_margin":0.05,"max_rated_load_kg":1200.5,"action":"No action for the drum's D/d (20 against 19 required, fixed by the design); note it at the next modification","messages":[],"defaults_used":[],"checks":[{"id":"drum-ratio","status":"marginal","demand":19,"capacity":20,"unit":"1","utilisation":0.95,"limit_rated_load_kg":null,"rule":"h1 ≥ 19 (M5)","source":"ISO 4308-1","figures":{},"margin":0.05,"message":null,"required_capacity":null,"review":null}],"site":null,"rated_load_kg":1000,"rating_note":null,"mechanism_capacity_kg":1200.5,"derived":[],"hidden":false,"coverage":{"run":1,"possible":1},"exposure":null,"crane":null,"change":null}
}
