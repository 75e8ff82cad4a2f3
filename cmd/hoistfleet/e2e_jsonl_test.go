package main

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"hoistfleet/calc/approx"
	"hoistfleet/fleet"
)

// optionalCheck reports whether a check is unchecked without its columns and then does
// not count (component-rating without a Component WLL; limit-devices, motor-duty and
// brake-energy without theirs: fleet.Definition.Optional).
func optionalCheck(id string) bool {
	d, _ := fleet.DefinitionOf(id)
	return d.Optional
}

var hoistStatuses = map[string]bool{"pass": true, "marginal": true, "fail": true, "unchecked": true, "error": true}

// The figure names design.md ("Command line and machine-readable output") promises, at
// least, per check.
var designFigures = map[string][]string{
	"brake-stop":         {"distance_m", "time_s", "deceleration_m_s2", "peak_rope_tension_n", "peak_design_factor"},
	"runaway":            {"acceleration_m_s2", "drum_angular_acceleration_rad_s2", "rope_tension_n", "time_to_rated_speed_s", "fall_speed_m_s", "fall_energy_j"},
	"rope-design-factor": {"rope_tension_n", "reeving_efficiency"},
	"design-life":        {"used_h", "remaining_h"},
	"inspection-due":     {"next_due"},
}

// TestJSONLContract checks every line of `check demo-si.csv --format jsonl -o -` against
// design.md's contract: one object per hoist in register order, the named fields with
// their JSON types, row = spreadsheet row (header 1), stable check ids, the figures,
// and the status / margin / rating rules of "Exact definitions".
func TestJSONLContract(t *testing.T) {
	d := sharedDemo(t)
	for _, tc := range []struct {
		register string
		hoists   []jsonHoist
	}{{"demo-si.csv", d.si}, {"demo-us.csv", d.us}} {
		t.Run(tc.register, func(t *testing.T) {
			_, records := csvRecords(t, demoFile(t, tc.register))
			if len(tc.hoists) != len(records) {
				t.Fatalf("%d jsonl lines for %d register rows", len(tc.hoists), len(records))
			}
			for i, h := range tc.hoists {
				checkHoistObject(t, h)
				id := h.str("asset_id")
				if id != strings.TrimSpace(records[i][0]) {
					t.Errorf("line %d: asset_id %q, register row %d holds %q (register order)", i+1, id, i+2, records[i][0])
				}
				if row, _ := num(h["row"]); row != float64(i+2) {
					t.Errorf("%s: row %v, want %d (spreadsheet row, header = 1)", id, h["row"], i+2)
				}
			}
		})
	}
}

// checkHoistObject checks one hoist object's shape and internal consistency.
func checkHoistObject(t *testing.T, h jsonHoist) {
	t.Helper()
	id := h.str("asset_id")
	for _, k := range []string{"asset_id", "row", "status", "governing_check", "worst_check", "min_margin",
		"max_rated_load_kg", "messages", "defaults_used", "checks"} {
		if _, ok := h[k]; !ok {
			t.Errorf("%s: no %q key", id, k)
		}
	}
	if _, ok := h["asset_id"].(string); !ok {
		t.Errorf("%s: asset_id is %T, want a string", id, h["asset_id"])
	}
	if !hoistStatuses[h.str("status")] {
		t.Errorf("%s: status %q is not one of pass, marginal, fail, unchecked, error", id, h["status"])
	}
	for _, k := range []string{"messages", "defaults_used"} {
		arr, ok := h[k].([]any)
		if !ok {
			t.Errorf("%s: %s is %T, want an array (empty, not null, when there are none)", id, k, h[k])
		}
		for _, m := range arr {
			if _, ok := m.(string); !ok {
				t.Errorf("%s: %s holds %T, want strings", id, k, m)
			}
		}
	}
	for _, k := range []string{"min_margin", "max_rated_load_kg"} {
		if v := h[k]; v != nil {
			if _, ok := num(v); !ok {
				t.Errorf("%s: %s is %T, want a number or null", id, k, v)
			}
		}
	}
	for _, k := range []string{"governing_check", "worst_check"} {
		if v := h[k]; v != nil {
			if _, ok := v.(string); !ok {
				t.Errorf("%s: %s is %T, want a check id or null", id, k, v)
			}
		}
	}

	seen := map[string]bool{}
	worst := "pass"
	rank := map[string]int{"pass": 0, "marginal": 1, "unchecked": 2, "error": 3, "fail": 4}
	minMargin := math.Inf(1)
	for _, c := range h.checks() {
		cid, _ := c["id"].(string)
		if seen[cid] {
			t.Errorf("%s: check %s appears twice", id, cid)
		}
		seen[cid] = true
		for _, k := range []string{"id", "status", "demand", "capacity", "unit", "utilisation",
			"limit_rated_load_kg", "rule", "source", "figures"} {
			if _, ok := c[k]; !ok {
				t.Errorf("%s %s: no %q key", id, cid, k)
			}
		}
		for _, k := range []string{"demand", "capacity", "utilisation", "limit_rated_load_kg"} {
			if v := c[k]; v != nil {
				if _, ok := num(v); !ok {
					t.Errorf("%s %s: %s is %T, want a number or null", id, cid, k, v)
				}
			}
		}
		for _, k := range []string{"unit", "rule", "source"} {
			if _, ok := c[k].(string); !ok {
				t.Errorf("%s %s: %s is %T, want a string", id, cid, k, c[k])
			}
		}
		if _, ok := c["figures"].(map[string]any); !ok {
			t.Errorf("%s %s: figures is %T, want an object", id, cid, c["figures"])
		}
		st, _ := c["status"].(string)
		if !hoistStatuses[st] && st != "info" {
			t.Errorf("%s %s: status %q", id, cid, st)
		}
		// component-rating without a Component WLL is unchecked and does not count
		// (design.md Revision 2: the rating is capped at the rated load instead); so are
		// the other optional checks without their columns.
		optionalUnchecked := optionalCheck(cid) && st == "unchecked"
		if st != "info" && !optionalUnchecked && rank[st] > rank[worst] {
			worst = st
		}
		u, uok := num(c["utilisation"])
		// Statuses (design.md): pass u ≤ 1 − b, marginal 1 − b < u ≤ 1, fail u > 1, b = 0.10.
		// Two documented exceptions: a fleet angle below the 0.5° minimum is marginal
		// whatever u, and the load test is judged without the band (demo README).
		belowMinAngle := cid == "fleet-angle" && st == "marginal" && u <= 0.9
		// design.md Revision 2: a check that exceeds a review limit (a rule row recalled
		// with low confidence) is marginal whatever its verified utilisation, and says so;
		// a check may fail outright below utilisation 1 (no control braking means, too
		// few brakes), and then says why.
		review, _ := c["review"].(map[string]any)
		ru, _ := num(review["utilisation"])
		msg, _ := c["message"].(string)
		reviewExceeded := st == "marginal" && review != nil && ru > 1 && strings.Contains(msg, "which is not verified")
		if review != nil && (review["rule"] == "" || review["source"] == "") {
			t.Errorf("%s %s: review %v without its rule and source", id, cid, review)
		}
		outright := st == "fail" && u <= 1 && strings.Contains(msg, "FAIL:")
		noBand := cid == "load-test" || cid == "component-rating" // judged without the marginal band
		if uok && (st == "pass" || st == "marginal" || st == "fail") && !belowMinAngle && !reviewExceeded && !outright && !noBand {
			want := "pass"
			switch {
			case u > 1:
				want = "fail"
			case u > 0.9:
				want = "marginal"
			}
			if want != st {
				t.Errorf("%s %s: utilisation %.6g is %s with a 10 %% band, got %s", id, cid, u, want, st)
			}
		}
		// min_margin is over pass/marginal/fail checks (design.md); a load test, judged
		// without the band, counts only when it fails, else its margin 0 at the usual
		// 1.25 × test would hide every real margin.
		if (st == "pass" || st == "marginal" || st == "fail") && (!noBand || st == "fail") {
			if uok && 1-u < minMargin {
				minMargin = 1 - u
			}
		}
		// Rated loads are floored to 0.1 kg (design.md, "Maximum permissible rated load").
		if l, ok := num(c["limit_rated_load_kg"]); ok && math.Abs(l*10-math.Round(l*10)) > 1e-6 {
			t.Errorf("%s %s: limit_rated_load_kg %v is not a multiple of 0.1 kg", id, cid, l)
		}
		if st == "error" || st == "unchecked" {
			if m, _ := c["message"].(string); m == "" {
				t.Errorf("%s %s: %s without a message saying why", id, cid, st)
			}
		}
	}
	for _, cid := range designCheckIDs {
		if !seen[cid] && h.str("status") != "unchecked" {
			t.Errorf("%s: no %s check", id, cid)
		}
	}
	if len(h.checks()) == 0 {
		// A row that was not checked (an empty row) is unchecked, not pass.
		if got := h.str("status"); got != "unchecked" {
			t.Errorf("%s (row %v): no checks, status %s, want unchecked", id, h["row"], got)
		}
	} else if got := h.str("status"); got != worst {
		t.Errorf("%s: status %s, but the worst of its checks (fail > error > unchecked > marginal > pass) is %s", id, got, worst)
	}
	if mm, ok := num(h["min_margin"]); ok {
		if !approx.Equal(mm, minMargin, 1e-12, 1e-12) {
			t.Errorf("%s: min_margin %v, want %v (1 − the largest utilisation of pass/marginal/fail checks)", id, mm, minMargin)
		}
		// design.md Revision 2, "Smallest margin": worst_check names the check whose
		// margin min_margin is.
		if wc := h.str("worst_check"); wc == "" {
			t.Errorf("%s: min_margin %v without a worst_check", id, mm)
		} else if c := h.check(wc); c == nil {
			t.Errorf("%s: worst_check %q is not one of its checks", id, wc)
		} else if u, ok := num(c["utilisation"]); !ok || !approx.Equal(1-u, mm, 1e-12, 1e-12) {
			t.Errorf("%s: worst_check %s has utilisation %v, min_margin is %v", id, wc, c["utilisation"], mm)
		}
	}
	// The rating: the smallest limit over the load-dependent checks, named by
	// governing_check; the governing check's own limit equals it (or a named cap is lower).
	if mr, ok := num(h["max_rated_load_kg"]); ok {
		if math.Abs(mr*10-math.Round(mr*10)) > 1e-6 {
			t.Errorf("%s: max_rated_load_kg %v is not a multiple of 0.1 kg", id, mr)
		}
		smallest := math.Inf(1)
		for _, c := range h.checks() {
			cid, _ := c["id"].(string)
			st, _ := c["status"].(string)
			if cid == "inspection-due" || cid == "load-test" || st == "info" {
				continue
			}
			if l, ok := num(c["limit_rated_load_kg"]); ok && l < smallest {
				smallest = l
			}
		}
		if mr > smallest+1e-9 {
			t.Errorf("%s: max_rated_load_kg %v exceeds the smallest check limit %v", id, mr, smallest)
		}
		gc := h.str("governing_check")
		if gc == "" {
			t.Errorf("%s: a rating of %v kg without a governing_check", id, mr)
		} else if c := h.check(gc); c != nil {
			if l, ok := num(c["limit_rated_load_kg"]); !ok || !approx.Equal(l, mr, 1e-9, 0) {
				t.Errorf("%s: governing_check %s has limit %v, the rating is %v", id, gc, c["limit_rated_load_kg"], mr)
			}
		} else if !approx.Equal(mr, smallest, 1e-9, 0) && mr > smallest {
			t.Errorf("%s: governing cap %s gives %v above the checks' %v", id, gc, mr, smallest)
		}
	}

	for cid, names := range designFigures {
		c := h.check(cid)
		if c == nil {
			continue
		}
		fs := figures(c)
		for _, n := range names {
			if _, ok := fs[n]; !ok && c["status"] != "error" && c["status"] != "unchecked" {
				t.Errorf("%s %s: figures has no %q (design.md names it): %v", id, cid, n, keys(fs))
			}
		}
	}
	if c := h.check("inspection-due"); c != nil && c["status"] != "error" && c["status"] != "unchecked" {
		if s, ok := figures(c)["next_due"].(string); !ok {
			t.Errorf("%s inspection-due: next_due is %T, want an ISO date string", id, figures(c)["next_due"])
		} else if _, err := time.Parse(time.DateOnly, s); err != nil {
			t.Errorf("%s inspection-due: next_due %q is not an ISO date", id, s)
		}
	}
	if c := h.check("rope-design-factor"); c != nil && c["status"] != "error" && c["status"] != "unchecked" {
		if eta, ok := num(figures(c)["reeving_efficiency"]); !ok || eta <= 0 || eta > 1 {
			t.Errorf("%s rope-design-factor: reeving_efficiency %v not in (0, 1]", id, figures(c)["reeving_efficiency"])
		}
	}
}

func keys(m map[string]any) []string {
	var out []string
	for k := range m {
		out = append(out, k)
	}
	return out
}

// readmeVerdict is one row of templates/demo/README.md's "Intended verdicts" table.
type readmeVerdict struct {
	asset  string
	status string
	checks map[string]readmeCheck // the checks not `pass`
	stop   string                 // stop distance text: "0.081 m", "self-locking", "cannot stop"
}

type readmeCheck struct {
	status string
	util   float64 // NaN when the README gives none
}

var readmeCheckRe = regexp.MustCompile(`^([a-z-]+) (pass|marginal|fail|error|unchecked)(?: ([0-9.]+))?$`)

// readmeVerdicts parses the demo README's table, the intended design of the demo
// (computed by a throwaway script from design.md's "Exact definitions", independent of
// the tool's code).
func readmeVerdicts(t *testing.T) (map[string]readmeVerdict, string) {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "..", "templates", "demo", "README.md"))
	if err != nil {
		t.Fatal(err)
	}
	out := map[string]readmeVerdict{}
	for _, line := range strings.Split(string(b), "\n") {
		if !regexp.MustCompile(`^\| (BQ|CS|OF|CB)-H\d\d \|`).MatchString(line) {
			continue
		}
		f := strings.Split(strings.Trim(strings.TrimSpace(line), "|"), "|")
		for i := range f {
			f[i] = strings.TrimSpace(f[i])
		}
		if len(f) < 6 {
			t.Fatalf("README row %q has %d fields", line, len(f))
		}
		v := readmeVerdict{asset: f[0], status: strings.Trim(f[3], "*"), checks: map[string]readmeCheck{}, stop: f[5]}
		list, _, _ := strings.Cut(f[4], "; at proposed")
		if list != "—" {
			for _, part := range strings.Split(list, ";") {
				m := readmeCheckRe.FindStringSubmatch(strings.TrimSpace(part))
				if m == nil {
					t.Fatalf("README row %s: cannot read %q", v.asset, part)
				}
				u := math.NaN()
				if m[3] != "" {
					u, _ = strconv.ParseFloat(m[3], 64)
				}
				v.checks[m[1]] = readmeCheck{m[2], u}
			}
		}
		out[v.asset] = v
	}
	return out, string(b)
}

// TestDemoVerdictsMatchREADME compares every demo hoist with the demo README's intended
// verdicts: overall status, each check that is not pass (status and utilisation to the
// README's two decimals), and the brake-stop distance (to its three decimals).
func TestDemoVerdictsMatchREADME(t *testing.T) {
	d := sharedDemo(t)
	want, readme := readmeVerdicts(t)
	if len(want) != 59 {
		t.Fatalf("README table has %d hoists, want 49 + 10", len(want))
	}
	counts := map[string]map[string]int{}
	for _, tc := range []struct {
		register string
		hoists   []jsonHoist
	}{{"demo-si.csv", d.si}, {"demo-us.csv", d.us}} {
		counts[tc.register] = map[string]int{}
		for _, h := range tc.hoists {
			id := h.str("asset_id")
			counts[tc.register][h.str("status")]++
			w, ok := want[id]
			if !ok {
				t.Errorf("%s is not in the README's table", id)
				continue
			}
			if got := h.str("status"); got != w.status {
				t.Errorf("%s: status %s, README intends %s", id, got, w.status)
			}
			for _, c := range h.checks() {
				cid, _ := c["id"].(string)
				st, _ := c["status"].(string)
				wc, listed := w.checks[cid]
				switch {
				case listed && st != wc.status:
					t.Errorf("%s %s: %s, README intends %s", id, cid, st, wc.status)
				case !listed && st != "pass" && st != "info" && !(optionalCheck(cid) && st == "unchecked"):
					t.Errorf("%s %s: %s (%s), README intends pass", id, cid, st, c["message"])
				}
				if listed && !math.IsNaN(wc.util) {
					if u, ok := num(c["utilisation"]); !ok || !approx.Equal(u, wc.util, 0.0051, 0) {
						t.Errorf("%s %s: utilisation %v, README %.2f", id, cid, c["utilisation"], wc.util)
					}
				}
			}
			stop := h.check("brake-stop")
			if stop == nil {
				t.Errorf("%s: no brake-stop check", id)
				continue
			}
			dist, dok := num(figures(stop)["distance_m"])
			switch {
			case w.stop == "cannot stop":
				if dok || stop["status"] != "fail" {
					t.Errorf("%s brake-stop: %s, distance %v; README: the brake cannot stop the load (fail, distance null)", id, stop["status"], figures(stop)["distance_m"])
				}
			case w.stop == "self-locking":
				if m, _ := stop["message"].(string); !strings.Contains(m, "self-locking") || stop["status"] != "info" {
					t.Errorf("%s brake-stop: %s %q; README: self-locking train, info", id, stop["status"], m)
				}
				rw := h.check("runaway")
				if a, ok := num(figures(rw)["acceleration_m_s2"]); !ok || a != 0 {
					t.Errorf("%s runaway: acceleration %v, want 0 for a self-locking train (design.md)", id, figures(rw)["acceleration_m_s2"])
				}
			default:
				wd, err := strconv.ParseFloat(strings.TrimSuffix(w.stop, " m"), 64)
				if err != nil {
					t.Fatalf("%s: README stop distance %q", id, w.stop)
				}
				if !dok || !approx.Equal(dist, wd, 0.00051, 0) {
					t.Errorf("%s brake-stop: distance %v m, README %.3f m", id, figures(stop)["distance_m"], wd)
				}
			}
		}
	}
	// "Totals: demo-si.csv 27 pass, 6 marginal, 13 fail, 3 error; demo-us.csv 7 pass, 3 fail."
	m := regexp.MustCompile("demo-si\\.csv`?\\s+(\\d+) pass,\\s+(\\d+) marginal,\\s+(\\d+) fail,\\s+(\\d+) error;\\s+`?demo-us\\.csv`?\\s+(\\d+) pass,\\s+(\\d+) fail").FindStringSubmatch(readme)
	if m == nil {
		t.Fatal("README has no Totals line")
	}
	atoi := func(s string) int { n, _ := strconv.Atoi(s); return n }
	for i, c := range []struct{ reg, st string }{{"demo-si.csv", "pass"}, {"demo-si.csv", "marginal"}, {"demo-si.csv", "fail"},
		{"demo-si.csv", "error"}, {"demo-us.csv", "pass"}, {"demo-us.csv", "fail"}} {
		if got := counts[c.reg][c.st]; got != atoi(m[i+1]) {
			t.Errorf("%s: %d %s, README totals %s", c.reg, got, c.st, m[i+1])
		}
	}

	// CS-H11: passes at 12.5 t; at the proposed 16 t only load-test fails (1.28).
	cs11 := byAsset(d.si)["CS-H11"]
	p, _ := cs11["proposed"].(map[string]any)
	if p == nil {
		t.Fatal("CS-H11: no proposed evaluation although the register proposes 16 t")
	}
	if p["status"] != "fail" {
		t.Errorf("CS-H11 at the proposed load: %v, README intends fail (load-test)", p["status"])
	}
	if rl, _ := num(p["rated_load_kg"]); rl != 16000 {
		t.Errorf("CS-H11 proposed rated_load_kg %v, want 16000", p["rated_load_kg"])
	}
	pcs, _ := p["checks"].([]any)
	for _, x := range pcs {
		c, _ := x.(map[string]any)
		cid, _ := c["id"].(string)
		st, _ := c["status"].(string)
		if cid == "load-test" {
			// 16 t against the last test's 15.625 t / 1.25 = 12.5 t: 1.28.
			if u, _ := num(c["utilisation"]); st != "fail" || !approx.Equal(u, 1.28, 1e-9, 0) {
				t.Errorf("CS-H11 proposed load-test: %s %v, want fail 1.28 (16 / (15.625 / 1.25))", st, c["utilisation"])
			}
		} else if cid == "component-rating" {
			// 16 t above the register's 12.5 t without a Component WLL: marginal (design.md
			// Revision 2).
			if st != "marginal" {
				t.Errorf("CS-H11 proposed component-rating: %s, want marginal", st)
			}
		} else if st != "pass" && st != "info" {
			t.Errorf("CS-H11 proposed %s: %s; README: only load-test fails at 16 t", cid, st)
		}
	}
}

// TestWorstCheckCarriesTheMargin (design.md Revision 2, "Smallest margin"): worst_check
// names the check whose margin min_margin is, and a check without a utilisation never
// carries one. CS-H07 (issue 15): its smallest margin is brake-holding's, not brake-stop's
// (the brake cannot stop the load: no utilisation). Every marginal or failing hoist has a
// check of that status to explain it.
func TestWorstCheckCarriesTheMargin(t *testing.T) {
	d := sharedDemo(t)
	for _, h := range append(append([]jsonHoist{}, d.si...), d.us...) {
		id, st := h.str("asset_id"), h.str("status")
		mm, ok := num(h["min_margin"])
		if !ok {
			continue
		}
		c := h.check(h.str("worst_check"))
		if c == nil {
			t.Errorf("%s: min_margin %v, worst_check %q is none of its checks", id, mm, h.str("worst_check"))
			continue
		}
		if u, ok := num(c["utilisation"]); !ok || !approx.Equal(1-u, mm, 1e-12, 1e-12) {
			t.Errorf("%s: worst_check %v carries utilisation %v, not min_margin %v", id, c["id"], c["utilisation"], mm)
		}
		if st == "marginal" || st == "fail" {
			found := false
			for _, x := range h.checks() {
				found = found || x["status"] == st
			}
			if !found {
				t.Errorf("%s is %s with no check of that status", id, st)
			}
		}
	}
	cs7 := byAsset(d.si)["CS-H07"]
	if cs7.str("worst_check") != "brake-holding" {
		t.Errorf("CS-H07 worst_check %q, want brake-holding (brake-stop has no utilisation)", cs7.str("worst_check"))
	}
}

// TestDemoHandChecks recomputes a few demo figures by hand from the register's own
// values and published constants, and finds them in the JSON lines.
func TestDemoHandChecks(t *testing.T) {
	d := sharedDemo(t)
	hs := byAsset(d.si)
	const g = 9.80665 // standard gravity, NIST SP 811 (exact)
	// CS-H04: 10 t + 210 kg on 2 falls, 1 rope end, sheave efficiency 0.98, no deflection
	// sheaves, 18 mm 6x36 IWRC 1960 rope of MBF 226.1 kN, group M6.
	// EN 12385-4 (standards.md, seen): MBF = 18² · 1960 · 0.356 / 1000 = 226.08 kN.
	// η_R = (1 − 0.98²) / (2 · 0.02) = 0.99 (design.md). F = (10210 g) / (2 · 0.99).
	// ISO 4308-1 Zp for M6 = 5.6 (standards.md, seen). u = 5.6 F / MBF.
	h := hs["CS-H04"]
	c := h.check("rope-design-factor")
	F := 10210 * g / (2 * 0.99)
	if v, _ := num(figures(c)["rope_tension_n"]); !approx.Equal(v, F, 1e-6, 1e-9) {
		t.Errorf("CS-H04 rope_tension_n %v, by hand %v", v, F)
	}
	if v, _ := num(figures(c)["reeving_efficiency"]); !approx.Equal(v, 0.99, 1e-12, 0) {
		t.Errorf("CS-H04 reeving_efficiency %v, by hand 0.99", v)
	}
	if v, _ := num(c["utilisation"]); !approx.Equal(v, 5.6*F/226100, 1e-9, 0) {
		t.Errorf("CS-H04 rope-design-factor utilisation %v, by hand %v", v, 5.6*F/226100)
	}
	// The limit: the rated load at which 5.6 F = MBF, floored to 0.1 kg:
	// m = 226100 / 5.6 · 1.98 / g − 210 = 7941.86 → 7941.8 kg.
	lim := math.Floor((226100/5.6*1.98/g-210)*10) / 10
	if v, _ := num(c["limit_rated_load_kg"]); v != lim {
		t.Errorf("CS-H04 rope-design-factor limit %v kg, by hand %v kg", v, lim)
	}
	if v, _ := num(h["max_rated_load_kg"]); v != lim || h.str("governing_check") != "rope-design-factor" {
		t.Errorf("CS-H04 rating %v kg by %s, by hand %v kg by rope-design-factor", h["max_rated_load_kg"], h["governing_check"], lim)
	}
	// OF-H02: D/d = 210 / 14 = 15.0 against h1 = 16 for M4 (standards.md, memory medium):
	// utilisation 16 / 15 = 1.0667; drum ratio fails whatever the load, so no rating.
	h = hs["OF-H02"]
	c = h.check("drum-ratio")
	if v, _ := num(c["utilisation"]); !approx.Equal(v, 16.0/15.0, 1e-12, 0) || c["status"] != "fail" {
		t.Errorf("OF-H02 drum-ratio %v %v, by hand fail 1.0667", c["status"], c["utilisation"])
	}
	if h["max_rated_load_kg"] != nil {
		t.Errorf("OF-H02: rating %v, design.md: null when drum-ratio fails", h["max_rated_load_kg"])
	}
	// BQ-H02: last periodic inspection 2025-09-18, normal service, 12 months (ASME B30.16
	// periodic inspection yearly, standards.md, seen); next due 2026-09-18.
	c = hs["BQ-H02"].check("inspection-due")
	if figures(c)["next_due"] != "2026-09-18" {
		t.Errorf("BQ-H02 next_due %v, want 2026-09-18", figures(c)["next_due"])
	}
}

// TestOutputsReproducible: two runs on the same register with the same --as-of give
// byte-identical JSON lines and CSV, whatever the number of workers, and workbooks with
// identical cell contents (the Audit's run times and worker count aside).
func TestOutputsReproducible(t *testing.T) {
	dir := t.TempDir()
	reg := writeDemo(t, dir, "demo-si.csv")
	for _, format := range []string{"jsonl", "csv"} {
		var outs [][]byte
		for i, workers := range []string{"1", "7"} {
			out := filepath.Join(dir, "r"+strconv.Itoa(i)+"."+format)
			runCmd(t, "", "check", reg, "-o", out, "--as-of", "2026-12-01", "--workers", workers, "-q").
				mustExit(t, exitFindings, "check --format "+format)
			b, err := os.ReadFile(out)
			if err != nil {
				t.Fatal(err)
			}
			outs = append(outs, b)
		}
		if len(outs[0]) == 0 {
			t.Errorf("%s output is empty", format)
		}
		if !bytes.Equal(outs[0], outs[1]) {
			t.Errorf("%s output differs between two runs (1 and 7 workers)", format)
		}
	}
	var books []*excelize.File
	for i, workers := range []string{"1", "7"} {
		out := filepath.Join(dir, "r"+strconv.Itoa(i)+".xlsx")
		runCmd(t, "", "check", reg, "-o", out, "--as-of", "2026-12-01", "--workers", workers, "-q").
			mustExit(t, exitFindings, "check --format xlsx")
		books = append(books, openXLSX(t, out))
	}
	sheets := books[0].GetSheetList()
	if s := books[1].GetSheetList(); strings.Join(s, ",") != strings.Join(sheets, ",") {
		t.Fatalf("sheets differ: %q and %q", sheets, s)
	}
	varying := map[string]bool{"Started": true, "Finished": true, "Run time": true, "Workers": true}
	for _, sh := range sheets {
		a, b := sheetRows(t, books[0], sh, 1), sheetRows(t, books[1], sh, 1)
		if len(a) != len(b) {
			t.Errorf("sheet %s: %d and %d rows", sh, len(a), len(b))
			continue
		}
		for r := range a {
			if sh == "Audit" && len(a[r]) > 0 && varying[a[r][0]] {
				continue
			}
			if strings.Join(a[r], "\x00") != strings.Join(b[r], "\x00") {
				t.Errorf("sheet %s row %d differs:\n%q\n%q", sh, r+1, a[r], b[r])
			}
		}
	}
}
