package textout

import (
	"bytes"
	"errors"
	"math"
	"os"
	"strings"
	"testing"
	"time"

	"hoistfleet/fleet"
)

func res(row int, id, site string, st fleet.Status, margin, kg float64, gov string, checks ...fleet.CheckResult) *fleet.Result {
	return &fleet.Result{Asset: &fleet.Asset{Row: row, ID: id, Fields: map[string]fleet.Value{"site": {State: fleet.OK, Text: site}}},
		Evaluation: fleet.Evaluation{RatedLoadKg: 1000, Status: st, MinMargin: margin, WorstCheck: gov, Checks: checks},
		Rating:     fleet.Rating{MaxRatedLoadKg: kg, GoverningCheck: gov}}
}

func summary() *fleet.Summary {
	s := fleet.NewSummary(10)
	overdue := fleet.CheckResult{ID: "inspection-due", Status: fleet.StatusFail, Demand: 400, Capacity: 365, Unit: "d"}
	worn := fleet.CheckResult{ID: "rope-wear", Status: fleet.StatusFail}
	for _, r := range []*fleet.Result{
		res(2, "H-01", "North", fleet.StatusPass, 0.40, 6480.5, "brake-holding"),
		res(3, "H-02", "North", fleet.StatusFail, -0.25, math.NaN(), "", overdue, worn),
		res(4, "H-03", "South yard", fleet.StatusMarginal, 0.05, 1999.9, "motor-torque"),
		res(5, "H-04", "", fleet.StatusUnchecked, math.NaN(), math.NaN(), ""),
		res(6, "H-05", "South yard", fleet.StatusFail, -0.5, 800, "rope-design-factor"),
	} {
		switch r.Asset.ID {
		case "H-02":
			r.Action = "Examine now: periodic inspection 35 days overdue; discard the rope"
		case "H-05":
			r.Action = "Derate to 0.8 t, or fit a rope with a minimum breaking force of at least 50 kN (has 25 kN)"
		}
		s.Add(r)
	}
	return s
}

// TestGolden: the expected text is written by hand from the five hoists above: 2 fail
// (H-02 fails on rope-wear, a mechanical check, so it ranks before H-05, whose fixture carries no failing check list, although H-05's margin is smaller), 1 unchecked, 1 marginal, 1 pass;
// percentages of 5 hoists.
func TestGolden(t *testing.T) {
	var buf bytes.Buffer
	info := &fleet.RunInfo{AsOf: time.Date(2026, 5, 1, 0, 0, 0, 0, time.UTC), Profile: "iso", MarginalBand: 0.1}
	if err := Summary(&buf, summary(), info); err != nil {
		t.Fatal(err)
	}
	want := `5 hoists checked (as of 2026-05-01, rules iso, marginal band 10 %)
  fail       2  40.0 %
  error      0  0.0 %
  unchecked  1  20.0 %
  marginal   1  20.0 %
  pass       1  20.0 %

By site       fail  error  unchecked  marginal  pass  total
  North       1     0      0          0         1     2
  South yard  1     0      0          1         0     2
  (no site)   0     0      1          0         0     1

Worst hoists (worst status first, the mechanism before records, then the smallest margin)
  asset  row  status     smallest margin  worst check         rated load  max rated load  governed by
  H-02   3    fail       -25.0 %          -                   1.00 t      none            -
  H-05   6    fail       -50.0 %          rope-design-factor  1.00 t      0.80 t          rope-design-factor
  H-04   5    unchecked  -                -                   1.00 t      none            -
  H-03   4    marginal   5.0 %            motor-torque        1.00 t      1.99 t          motor-torque

What to do, worst hoists first
  H-02  Examine now: periodic inspection 35 days overdue; discard the rope
  H-05  Derate to 0.8 t, or fit a rope with a minimum breaking force of at least 50 kN (has 25 kN)

Overdue inspections  1
Flagged rope-wear    1

Screening calculation on the data given: it does not replace examination by a competent person.
`
	if got := buf.String(); got != want {
		t.Errorf("summary:\ngot\n%s\nwant\n%s", got, want)
	}
}

func TestEmptyAndErrors(t *testing.T) {
	var buf bytes.Buffer
	if err := Summary(&buf, fleet.NewSummary(10), nil); err != nil {
		t.Fatal(err)
	}
	want := `0 hoists checked
  fail       0
  error      0
  unchecked  0
  marginal   0
  pass       0

Overdue inspections  0

Screening calculation on the data given: it does not replace examination by a competent person.
`
	if buf.String() != want {
		t.Errorf("empty summary:\n%q\nwant\n%q", buf.String(), want)
	}
	if err := Summary(&buf, nil, nil); err == nil {
		t.Error("nil summary must be an error")
	}
	if err := Summary(failWriter{}, summary(), nil); err == nil {
		t.Error("write error must be returned")
	}
}

type failWriter struct{}

func (failWriter) Write(p []byte) (int, error) { return 0, errors.New("closed") }

func ExampleSummary() {
	s := fleet.NewSummary(10)
	s.Add(res(2, "H-01", "Dock", fleet.StatusPass, 0.3, 5000, "motor-torque"))
	_ = Summary(os.Stdout, s, nil)
	// Output:
	// 1 hoist checked
	//   fail       0  0.0 %
	//   error      0  0.0 %
	//   unchecked  0  0.0 %
	//   marginal   0  0.0 %
	//   pass       1  100.0 %
	//
	// By site  fail  error  unchecked  marginal  pass  total
	//   Dock   0     0      0          0         1     1
	//
	// Overdue inspections  0
	//
	// Screening calculation on the data given: it does not replace examination by a competent person.
}

// TestCoverageLines: the summary says what the verdicts rest on (checks run of those
// that apply, worked by hand from the fixture: 3 + 1 of 4 + 4 = 4 of 8, 50 %, one hoist
// with under half run) and lists the columns to collect, the one that alone lets the most
// checks run first.
func TestCoverageLines(t *testing.T) {
	s := fleet.NewSummary(10)
	a := res(2, "H-01", "North", fleet.StatusPass, 0.4, 1000, "")
	a.Coverage = fleet.Coverage{Run: 3, Possible: 4}
	a.Gaps = []fleet.Gap{{Key: "operating_hours", Check: "design-life", Alone: true}}
	b := res(3, "H-02", "North", fleet.StatusUnchecked, math.NaN(), math.NaN(), "")
	b.Coverage = fleet.Coverage{Run: 1, Possible: 4}
	b.Gaps = []fleet.Gap{{Key: "rope_mbf", Check: "rope-design-factor", Alone: true}, {Key: "rope_mbf", Check: "brake-stop", Alone: true},
		{Key: "drum_diameter", Check: "drum-ratio"}}
	s.Add(a)
	s.Add(b)
	var buf bytes.Buffer
	if err := Summary(&buf, s, nil); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	for _, want := range []string{
		"The verdicts rest on 4 of the 8 checks that apply (50 %); 1 hoist had fewer than half of its checks run.\n",
		"  column           hoists lacking it  check results waiting on it  of them on it alone  checks\n" +
			"  Rope MBF         1                  2                            2                    rope-design-factor, brake-stop\n" +
			"  Operating hours  1                  1                            1                    design-life\n" +
			"  Drum diameter    1                  1                            0                    drum-ratio\n",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("summary lacks\n%s\ngot\n%s", want, out)
		}
	}
}
