package main

// End-to-end tests of issue 19: changes since a baseline (check --baseline), the
// attention order by consequence (Exposure), cranes (Crane). The oracle for what changed
// is the command's own runs of the two registers without a baseline, compared here in the
// test with plain maps; the edits are made here and are the only ones.

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"slices"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet/rules"
)

// editRegister rewrites the CSV register b: edit(header, rows) returns the new rows.
func editRegister(t *testing.T, b []byte, edit func(h []string, rows [][]string) ([]string, [][]string)) []byte {
	t.Helper()
	h, rows := csvRecords(t, b)
	h, rows = edit(h, rows)
	var out bytes.Buffer
	w := csv.NewWriter(&out)
	if err := w.Write(h); err != nil {
		t.Fatal(err)
	}
	if err := w.WriteAll(rows); err != nil {
		t.Fatal(err)
	}
	return out.Bytes()
}

// setCell sets the cell of column name in the row of asset id, returning the old value.
func setCell(t *testing.T, h []string, rows [][]string, id, name, v string) string {
	t.Helper()
	c := colIndex(h, name)
	if c < 0 {
		t.Fatalf("no column %q", name)
	}
	for _, r := range rows {
		if r[0] == id {
			old := r[c]
			r[c] = v
			return old
		}
	}
	t.Fatalf("no asset %s", id)
	return ""
}

// edit is one register value changed on purpose.
type edit struct{ id, column, old, new string }

// TestBaselineListsExactlyTheEdits checks the demo, edits it in known ways (a hoist
// removed, one added, a rope's MBF lowered, an inspection done, a description changed)
// and checks the edited register against the first run's workbook and JSON lines: every
// output lists exactly those edits, and the verdict changes the two plain runs show.
func TestBaselineListsExactlyTheEdits(t *testing.T) {
	dir := t.TempDir()
	reg := writeDemo(t, dir, "demo-si.csv")
	base := []string{"--as-of", "2026-12-01", "--rules", "iso", "-q"}
	runCmd(t, "", append([]string{"check", reg, "-o", filepath.Join(dir, "base.xlsx")}, base...)...).mustExit(t, exitFindings, "baseline workbook")
	runCmd(t, "", append([]string{"check", reg, "-o", filepath.Join(dir, "base.jsonl")}, base...)...).mustExit(t, exitFindings, "baseline jsonl")

	var edits []edit
	edited := editRegister(t, demoFile(t, "demo-si.csv"), func(h []string, rows [][]string) ([]string, [][]string) {
		for _, e := range []edit{
			{id: "BQ-H08", column: "Rope MBF [kN]", new: "120"},
			{id: "CS-H12", column: "Last inspection", new: "2026-11-01"},
			{id: "OF-H01", column: "Description", new: "Wire rope hoist, moved to the paint shop"},
		} {
			e.old = setCell(t, h, rows, e.id, e.column, e.new)
			edits = append(edits, e)
		}
		var out [][]string
		for _, r := range rows {
			if r[0] != "OF-H05" {
				out = append(out, r)
			}
		}
		added := slices.Clone(rows[0])
		added[0] = "BQ-H99"
		return h, append(out, added)
	})
	newReg := filepath.Join(dir, "edited.csv")
	if err := os.WriteFile(newReg, edited, 0o644); err != nil {
		t.Fatal(err)
	}
	// The oracle: the edited register's own run, without a baseline.
	plainNew := runCmd(t, "", append([]string{"check", newReg, "--format", "jsonl", "-o", "-"}, base...)...)
	plainNew.mustExit(t, exitFindings, "edited, no baseline")
	oldRun := byAsset(parseJSONL(t, mustRead(t, filepath.Join(dir, "base.jsonl"))))
	newRun := byAsset(parseJSONL(t, plainNew.out))

	// want: what the change of each hoist must say, from the two plain runs.
	type want struct {
		kind, statusChange string
		failing, cleared   []string
		rating, overdue    bool
		overdueCleared     bool
		inputs             []string // "column: old → new"
	}
	wants := map[string]*want{}
	for id, n := range newRun {
		w := &want{kind: "added"}
		wants[id] = w
		o, ok := oldRun[id]
		if !ok {
			continue
		}
		w.kind = "unchanged"
		rank := map[string]int{"pass": 0, "marginal": 1, "unchecked": 2, "error": 3, "fail": 4}
		switch so, sn := rank[o.str("status")], rank[n.str("status")]; {
		case sn > so:
			w.statusChange = "worse"
		case sn < so:
			w.statusChange = "better"
		}
		ro, okO := num(o["max_rated_load_kg"])
		rn, okN := num(n["max_rated_load_kg"])
		w.rating = okO != okN || (okO && math.Abs(rn-ro) > 0.01*math.Abs(ro))
		for _, c := range n.checks() {
			id := c["id"].(string)
			oc := o.check(id)
			was, now := oc != nil && oc["status"] == "fail", c["status"] == "fail"
			switch {
			case now && !was && id == "inspection-due":
				w.overdue = true
			case now && !was:
				w.failing = append(w.failing, id)
			case was && !now && id == "inspection-due":
				w.overdueCleared = true
			case was && !now:
				w.cleared = append(w.cleared, id)
			}
		}
		for _, e := range edits {
			if e.id == id {
				w.inputs = append(w.inputs, e.column+": "+e.old+" → "+e.new)
			}
		}
		if w.statusChange != "" || w.rating || len(w.failing)+len(w.cleared) > 0 || w.overdue || w.overdueCleared || len(w.inputs) > 0 {
			w.kind = "changed"
		}
	}
	// The edits must show in the plain runs as meant: otherwise the test tests nothing.
	if w := wants["BQ-H08"]; w.statusChange != "worse" || !slices.Contains(w.failing, "rope-design-factor") {
		t.Fatalf("BQ-H08 with a 120 kN rope: want worse, rope-design-factor failing; the plain runs say %+v", *w)
	}
	if w := wants["CS-H12"]; !w.overdueCleared {
		t.Fatalf("CS-H12 inspected 2026-11-01: the plain runs do not show the inspection cleared: %+v", *w)
	}

	check := func(label string, lines []jsonHoist, withInputs bool) {
		t.Helper()
		seen := map[string]bool{}
		for _, l := range lines {
			id := l.str("asset_id")
			ch, ok := l["change"].(map[string]any)
			if !ok {
				t.Errorf("%s: %s: change %v, want an object", label, id, l["change"])
				continue
			}
			if ch["kind"] == "removed" {
				if id != "OF-H05" || l["row"] != nil || l["status"] != nil {
					t.Errorf("%s: removed line %s row %v status %v, want OF-H05 with row and status null", label, id, l["row"], l["status"])
				}
				seen[id] = true
				continue
			}
			seen[id] = true
			w := wants[id]
			if w == nil {
				t.Errorf("%s: %s is not in the edited register", label, id)
				continue
			}
			kind := w.kind
			if !withInputs && kind == "changed" && w.statusChange == "" && !w.rating && len(w.failing)+len(w.cleared) == 0 && !w.overdue && !w.overdueCleared {
				kind = "unchanged" // only register values changed, and a JSONL baseline has none
			}
			if ch["kind"] != kind {
				t.Errorf("%s: %s: kind %v, want %s", label, id, ch["kind"], kind)
			}
			if kind == "added" {
				continue
			}
			if got, _ := ch["status_change"].(string); got != w.statusChange {
				t.Errorf("%s: %s: status_change %q, want %q", label, id, got, w.statusChange)
			}
			if ch["rating_changed"] != w.rating {
				t.Errorf("%s: %s: rating_changed %v, want %v", label, id, ch["rating_changed"], w.rating)
			}
			if got := strs(ch["newly_failing"]); !slices.Equal(got, w.failing) {
				t.Errorf("%s: %s: newly_failing %v, want %v", label, id, got, w.failing)
			}
			if got := strs(ch["cleared"]); !slices.Equal(got, w.cleared) {
				t.Errorf("%s: %s: cleared %v, want %v", label, id, got, w.cleared)
			}
			if ch["newly_overdue"] != w.overdue || ch["overdue_cleared"] != w.overdueCleared {
				t.Errorf("%s: %s: newly_overdue %v overdue_cleared %v, want %v %v", label, id, ch["newly_overdue"], ch["overdue_cleared"], w.overdue, w.overdueCleared)
			}
			if !withInputs {
				if ch["inputs"] != nil {
					t.Errorf("%s: %s: inputs %v, want null (a JSON lines baseline has no register values)", label, id, ch["inputs"])
				}
				continue
			}
			var got []string
			ins, _ := ch["inputs"].([]any)
			for _, x := range ins {
				m := x.(map[string]any)
				got = append(got, fmt.Sprint(m["column"], ": ", m["old"], " → ", m["new"]))
			}
			if !slices.Equal(got, w.inputs) {
				t.Errorf("%s: %s: inputs %q, want exactly the edits %q", label, id, got, w.inputs)
			}
		}
		for id := range wants {
			if !seen[id] {
				t.Errorf("%s: no line for %s", label, id)
			}
		}
		if !seen["OF-H05"] {
			t.Errorf("%s: no removed line for OF-H05", label)
		}
	}

	// JSON lines against the workbook (register values compared) and against JSON lines.
	for _, b := range []struct {
		name       string
		withInputs bool
	}{{"base.xlsx", true}, {"base.jsonl", false}} {
		r := runCmd(t, "", append([]string{"check", newReg, "--format", "jsonl", "-o", "-", "--baseline", filepath.Join(dir, b.name)}, base...)...)
		r.mustExit(t, exitFindings, "jsonl against "+b.name)
		check("jsonl against "+b.name, parseJSONL(t, r.out), b.withInputs)
	}

	// The terminal and the workbook against the workbook.
	out := filepath.Join(dir, "edited-results.xlsx")
	term := runCmd(t, "", "check", newReg, "-o", out, "--as-of", "2026-12-01", "--rules", "iso", "--baseline", filepath.Join(dir, "base.xlsx"))
	term.mustExit(t, exitFindings, "workbook against base.xlsx")
	sec := term.out[strings.Index(term.out, "Changes since"):]
	sec = sec[:strings.Index(sec, "\n\n")]
	var listed []string
	for _, l := range strings.Split(sec, "\n")[1:] {
		f := strings.Fields(l)
		if len(f) > 0 && f[0] != "note:" && strings.Contains(l, "  ") && wants[f[0]] != nil || len(f) > 0 && f[0] == "OF-H05" {
			listed = append(listed, f[0])
		}
	}
	var wantListed []string
	for id, w := range wants {
		if w.kind != "unchanged" {
			wantListed = append(wantListed, id)
		}
	}
	wantListed = append(wantListed, "OF-H05")
	sort.Strings(listed)
	sort.Strings(wantListed)
	if !slices.Equal(listed, wantListed) {
		t.Errorf("terminal lists %v, want %v\n%s", listed, wantListed, sec)
	}
	for _, e := range edits {
		if !strings.Contains(sec, e.column+" "+e.old+" → "+e.new) {
			t.Errorf("terminal: no %q\n%s", e.column+" "+e.old+" → "+e.new, sec)
		}
	}
	if !strings.Contains(sec, "as of 2026-12-01") || !strings.Contains(sec, "rules iso") {
		t.Errorf("terminal: the baseline's as-of date and rules are not said:\n%s", sec)
	}

	f := openXLSX(t, out)
	if i, _ := f.GetSheetIndex("Changes"); i < 0 {
		t.Fatalf("no Changes sheet: %v", f.GetSheetList())
	}
	rows := sheetRows(t, f, "Changes", 13)
	meta := map[string][2]string{}
	hdr := -1
	for i, r := range rows {
		if r[0] == "Asset ID" {
			hdr = i
			break
		}
		meta[r[0]] = [2]string{r[1], r[5]}
	}
	baseAudit := sheetRows(t, openXLSX(t, filepath.Join(dir, "base.xlsx")), "Audit", 2)
	for _, r := range baseAudit {
		key := map[string]string{"As of": "As of", "Input SHA-256": "Input SHA-256", "Rule profile": "Rules"}[r[0]]
		if key != "" && meta[key][0] != r[1] {
			t.Errorf("Changes sheet: %s of the baseline %q, want the baseline's Audit's %q", key, meta[key][0], r[1])
		}
	}
	if hdr < 0 {
		t.Fatalf("Changes sheet has no table:\n%v", rows)
	}
	h := rows[hdr]
	var sheetIDs []string
	for _, r := range rows[hdr+1:] {
		if r[0] == "" {
			break
		}
		sheetIDs = append(sheetIDs, r[0])
		var wantIn []string
		for _, e := range edits {
			if e.id == r[0] {
				wantIn = append(wantIn, e.column+": "+e.old+" → "+e.new)
			}
		}
		if got := r[colIndex(h, "Register values changed (column: before → now)")]; got != strings.Join(wantIn, "; ") {
			t.Errorf("Changes sheet: %s: register values %q, want %q", r[0], got, strings.Join(wantIn, "; "))
		}
	}
	sort.Strings(sheetIDs)
	if !slices.Equal(sheetIDs, wantListed) {
		t.Errorf("Changes sheet lists %v, want %v", sheetIDs, wantListed)
	}
	if got := rows[hdr+1][colIndex(h, "Change")]; got != "worse" {
		t.Errorf("Changes sheet: first row's change %q (%s), want worse first", got, rows[hdr+1][0])
	}
}

func mustRead(t *testing.T, path string) string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

func strs(v any) []string {
	var out []string
	l, _ := v.([]any)
	for _, x := range l {
		out = append(out, fmt.Sprint(x))
	}
	return out
}

// attentionIDs returns the asset ids of the Summary's attention list, in order.
func attentionIDs(t *testing.T, path string) []string {
	t.Helper()
	rows := sheetRows(t, openXLSX(t, path), "Summary", 12)
	var ids []string
	in := false
	for _, r := range rows {
		switch {
		case strings.HasPrefix(r[0], "Hoists needing attention first"):
			in = true
		case in && (r[0] == "Asset ID" || strings.HasPrefix(r[0], "Ordered by")):
		case in && r[0] == "":
			return ids
		case in:
			ids = append(ids, r[0])
		}
	}
	return ids
}

// TestExposureOrdersAttention fills in Exposure on a register of ten hoists needing
// attention and checks that the Summary's list is reordered as the rule table's weights
// say: by status weight × exposure weight, ties in the order without the column; and that
// a user rule file's weight overrides the built-in one.
func TestExposureOrdersAttention(t *testing.T) {
	dir := t.TempDir()
	keep := []string{"BQ-H01", "BQ-H08", "BQ-H10", "BQ-H11", "BQ-H13", "CS-H04", "CS-H05", "CS-H06", "CS-H07", "CS-H12", "OF-H02"}
	exposure := map[string]string{"CS-H07": "low", "BQ-H08": "people below", "CS-H04": "hazardous load",
		"OF-H02": "process critical", "BQ-H11": "low", "BQ-H13": "low", "CS-H06": "process critical"}
	sub := func(withExposure bool) string {
		b := editRegister(t, demoFile(t, "demo-si.csv"), func(h []string, rows [][]string) ([]string, [][]string) {
			var out [][]string
			for _, r := range rows {
				if slices.Contains(keep, r[0]) {
					if withExposure {
						r = append(r, exposure[r[0]])
					}
					out = append(out, r)
				}
			}
			if withExposure {
				h = append(slices.Clone(h), "Exposure")
			}
			return h, out
		})
		name := map[bool]string{false: "plain.csv", true: "exposed.csv"}[withExposure]
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, b, 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	plain, exposed := sub(false), sub(true)
	args := []string{"--as-of", "2026-12-01", "--rules", "iso", "-q"}
	runCmd(t, "", append([]string{"check", plain, "-o", filepath.Join(dir, "plain.xlsx")}, args...)...).mustExit(t, exitFindings, "plain")
	runCmd(t, "", append([]string{"check", exposed, "-o", filepath.Join(dir, "exposed.xlsx")}, args...)...).mustExit(t, exitFindings, "exposed")
	js := runCmd(t, "", append([]string{"check", plain, "--format", "jsonl", "-o", "-"}, args...)...)
	status := map[string]string{}
	for _, h := range parseJSONL(t, js.out) {
		status[h.str("asset_id")] = h.str("status")
	}
	before := attentionIDs(t, filepath.Join(dir, "plain.xlsx"))
	after := attentionIDs(t, filepath.Join(dir, "exposed.xlsx"))
	needing := 0
	for _, st := range status {
		if st != "pass" {
			needing++
		}
	}
	if len(before) != needing || needing < 8 {
		t.Fatalf("the plain list has %d hoists (%v), want all %d needing attention: the register was chosen to show them all", len(before), before, needing)
	}

	// The expected order from the rule table itself (templates/rules/iso.csv).
	tab, err := rules.Profile("iso")
	if err != nil {
		t.Fatal(err)
	}
	weight := func(id, name, val string) float64 {
		t.Helper()
		s := rules.Scope{}
		if name != "" {
			s.Attrs = map[string]string{name: val}
		}
		v, _, err := tab.Value(id, s)
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
	priority := func(id string) float64 {
		e := weight("attention.unstated_weight", "", "")
		if x := exposure[id]; x != "" {
			e = weight("attention.exposure_weight", "exposure", x)
		}
		return weight("attention.status_weight", "status", status[id]) * e
	}
	want := slices.Clone(before)
	sort.SliceStable(want, func(i, j int) bool { return priority(want[i]) > priority(want[j]) })
	if !slices.Equal(after, want) {
		t.Errorf("attention list with Exposure\n got %v\nwant %v (weights from the rules; without Exposure %v)", after, want, before)
	}
	if slices.Equal(after, before) {
		t.Errorf("filling in Exposure did not change the order: %v", after)
	}
	if i, j := slices.Index(after, "BQ-H08"), slices.Index(after, "CS-H07"); i < 0 || j < 0 || i > j {
		t.Errorf("a marginal hoist over people (BQ-H08, at %d) must rank above a failing one in a store room (CS-H07, at %d) with the built-in weights", i, j)
	}

	// A user rule file: the store room weighs 100; CS-H07 (fail) goes first.
	rf := filepath.Join(dir, "weights.csv")
	if err := os.WriteFile(rf, []byte("rule,groups,when,value,unit,source,provenance,note\n"+
		"attention.exposure_weight,all,exposure=low,100,1,our insurer,\"common practice, no published source\",test\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	runCmd(t, "", append([]string{"check", exposed, "-o", filepath.Join(dir, "user.xlsx"), "--rules", rf}, args...)...).mustExit(t, exitFindings, "user weights")
	if got := attentionIDs(t, filepath.Join(dir, "user.xlsx")); len(got) == 0 || exposure[got[0]] != "low" || status[got[0]] != "fail" {
		t.Errorf("with the low exposure weighted 100 the list starts %v, want a failing hoist in a low-exposure place", got)
	}

	// The matrix counts every hoist once, by status and exposure.
	rows := sheetRows(t, openXLSX(t, filepath.Join(dir, "exposed.xlsx")), "Summary", 8)
	for i, r := range rows {
		if r[0] != "Hoists by status and exposure" {
			continue
		}
		total := 0
		for _, rr := range rows[i+2 : i+7] {
			for _, c := range rr[1:6] {
				var n int
				fmt.Sscan(c, &n)
				total += n
			}
		}
		if total != len(keep) {
			t.Errorf("the status × exposure matrix counts %d hoists, want %d", total, len(keep))
		}
		if rows[i+1][1] != "people below" || rows[i+1][5] != "not stated" {
			t.Errorf("matrix header %v", rows[i+1])
		}
		return
	}
	t.Error("the Summary has no status × exposure matrix")
}

// TestCranes gives the demo a Crane column: two cranes of two hoists each, and a crane id
// reused at another site (an input error on the later row). The crane's status is its
// worst hoist's; the Summary counts cranes; the Register shows the column under its filter.
func TestCranes(t *testing.T) {
	dir := t.TempDir()
	crane := map[string]string{"BQ-H05": "C1", "BQ-H06": "C1", "CS-H06": "C2", "CS-H07": "C2", "OF-H01": "C1"}
	b := editRegister(t, demoFile(t, "demo-si.csv"), func(h []string, rows [][]string) ([]string, [][]string) {
		for i := range rows {
			rows[i] = append(rows[i], crane[rows[i][0]])
		}
		return append(slices.Clone(h), "Crane"), rows
	})
	reg := filepath.Join(dir, "cranes.csv")
	if err := os.WriteFile(reg, b, 0o644); err != nil {
		t.Fatal(err)
	}
	args := []string{"--as-of", "2026-12-01", "--rules", "iso"}
	js := runCmd(t, "", append([]string{"check", reg, "--format", "jsonl", "-o", "-"}, args...)...)
	js.mustExit(t, exitFindings, "cranes jsonl")
	hs := byAsset(parseJSONL(t, js.out))
	rank := map[string]int{"pass": 0, "marginal": 1, "unchecked": 2, "error": 3, "fail": 4}
	worst := map[string]string{}
	for id, c := range crane {
		if got := hs[id].str("crane"); got != c {
			t.Errorf("%s: crane %q, want %q", id, got, c)
		}
		if st := hs[id].str("status"); rank[st] > rank[worst[c]] || worst[c] == "" {
			worst[c] = st
		}
	}
	if hs["BQ-H01"]["crane"] != nil {
		t.Errorf("BQ-H01: crane %v, want null", hs["BQ-H01"]["crane"])
	}
	msgs := strs(hs["OF-H01"]["messages"])
	if !slices.ContainsFunc(msgs, func(m string) bool {
		return strings.Contains(m, "cranes.csv!") && strings.Contains(m, "crane C1 is at site 'Oddley Fabrication Works' here and at site 'Brindlemouth Quay' on row")
	}) {
		t.Errorf("OF-H01: no located message for crane C1 at two sites: %q", msgs)
	}
	// C1 is at two sites: at least error, whatever its hoists.
	if rank[worst["C1"]] < rank["error"] {
		worst["C1"] = "error"
	}

	out := filepath.Join(dir, "cranes.xlsx")
	term := runCmd(t, "", append([]string{"check", reg, "-o", out}, args...)...)
	term.mustExit(t, exitFindings, "cranes workbook")
	if !strings.Contains(normSpace(term.out), "Cranes 2 (fail ") {
		t.Errorf("terminal: no crane count 2:\n%s", term.out)
	}
	f := openXLSX(t, out)
	rows := sheetRows(t, f, "Summary", 6)
	found := false
	for i, r := range rows {
		if strings.HasPrefix(r[0], "Cranes: 2 ") {
			found = true
			counts := map[string]string{}
			for c := 0; c < 5; c++ {
				counts[strings.ToLower(rows[i+1][c])] = rows[i+2][c]
			}
			want := map[string]int{}
			for _, st := range worst {
				want[st]++
			}
			for st := range rank {
				if counts[st] != fmt.Sprint(want[st]) {
					t.Errorf("Summary: cranes %s %s, want %d (worst hoists %v)", st, counts[st], want[st], worst)
				}
			}
		}
	}
	if !found {
		t.Error("the Summary does not count the cranes")
	}
	reg2 := sheetRows(t, f, "Register", 1)
	c := colIndex(reg2[0], "Crane")
	if c < 0 {
		t.Fatal("the Register has no Crane column")
	}
	for _, r := range reg2[1:] {
		for len(r) <= c {
			r = append(r, "")
		}
		if r[c] != crane[r[0]] {
			t.Errorf("Register: %s crane %q, want %q", r[0], r[c], crane[r[0]])
		}
	}
	// filterable: the Register's filter covers the Crane column
	parts := zipFiles(t, out)
	wbRels := rels(parts["xl/_rels/workbook.xml.rels"], "xl")
	part := ""
	for _, tag := range sheetRe.FindAllString(string(parts["xl/workbook.xml"]), -1) {
		if a := attrs(tag); a["name"] == "Register" {
			part = wbRels[a["id"]]
		}
	}
	m := regexp.MustCompile(`<autoFilter ref="\$?A\$?1:\$?([A-Z]+)\$?\d+"`).FindSubmatch(parts[part])
	if m == nil {
		t.Fatalf("the Register (%s) has no filter from A1", part)
	}
	last, err := excelize.ColumnNameToNumber(string(m[1]))
	if err != nil || last < c+1 {
		t.Errorf("the Register's filter ends at column %s, before the Crane column (%d)", m[1], c+1)
	}
}

// TestLibreOfficePrintsChangesAndMatrix prints, through LibreOffice, the workbook of the
// demo with Exposure and Crane filled in, checked against its own earlier results with one
// rope's MBF re-entered: the Summary (with the cranes and the status × exposure matrix)
// stays one page, and the Changes sheet is one page wide (its first and last columns on
// the same page). HOISTFLEET_RENDER_DIR keeps the PDF.
func TestLibreOfficePrintsChangesAndMatrix(t *testing.T) {
	bin := needSoffice(t)
	if _, err := exec.LookPath("pdftotext"); err != nil {
		t.Skip("pdftotext is not on PATH")
	}
	dir := t.TempDir()
	exposure := map[string]string{"CS-H07": "low", "BQ-H08": "people below", "CS-H04": "hazardous load", "CS-H05": "process critical"}
	crane := map[string]string{"BQ-H01": "BQ-C1", "BQ-H02": "BQ-C1", "CS-H07": "CS-C7", "CS-H08": "CS-C7"}
	mbf := ""
	write := func(name string, edit bool) string {
		b := editRegister(t, demoFile(t, "demo-si.csv"), func(h []string, rows [][]string) ([]string, [][]string) {
			for i, r := range rows {
				rows[i] = append(r, crane[r[0]], exposure[r[0]])
			}
			h = append(slices.Clone(h), "Crane", "Exposure")
			if edit {
				mbf = setCell(t, h, rows, "BQ-H08", "Rope MBF [kN]", "120")
			}
			return h, rows
		})
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, b, 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	before, after := write("before.csv", false), write("after.csv", true)
	runCmd(t, "", "check", before, "-o", filepath.Join(dir, "before.xlsx"), "--as-of", "2026-12-01", "-q").mustExit(t, exitFindings, "before")
	book := filepath.Join(dir, "after-results.xlsx")
	runCmd(t, "", "check", after, "-o", book, "--as-of", "2026-12-01", "-q", "--baseline", filepath.Join(dir, "before.xlsx")).mustExit(t, exitFindings, "after")
	pdf := filepath.Join(soffice(t, bin, "pdf", book), "after-results.pdf")
	pageText := func(p int) string {
		b, err := exec.Command("pdftotext", "-f", strconv.Itoa(p), "-l", strconv.Itoa(p), "-layout", pdf, "-").Output()
		if err != nil {
			return ""
		}
		return string(b)
	}
	first := pageText(1)
	for _, want := range []string{"Hoists by status and exposure", "people below", "not stated", "Cranes: 2", "CS-C7"} {
		if !strings.Contains(first, want) {
			t.Errorf("the Summary's page has no %q:\n%s", want, clip(first))
		}
	}
	if strings.HasPrefix(strings.TrimSpace(pageText(2)), "Summary") {
		t.Error("the Summary runs onto page 2")
	}
	changes := 0
	for p := 2; ; p++ {
		txt := pageText(p)
		if txt == "" {
			break
		}
		if !strings.HasPrefix(strings.TrimSpace(txt), "Changes") {
			continue
		}
		changes++
		if !strings.Contains(txt, "Asset ID") || !strings.Contains(txt, "Register values changed") ||
			!strings.Contains(normSpace(txt), "Rope MBF [kN]: "+mbf+" → 120") {
			t.Errorf("Changes page %d does not hold the table's first and last columns and the edit:\n%s", p, clip(txt))
		}
	}
	if changes != 1 {
		t.Errorf("the Changes sheet prints on %d pages, want 1", changes)
	}
	if keep := os.Getenv("HOISTFLEET_RENDER_DIR"); keep != "" {
		b, _ := os.ReadFile(pdf)
		if err := os.WriteFile(filepath.Join(keep, "changes-matrix.pdf"), b, 0o644); err != nil {
			t.Error(err)
		}
	}
}

// TestBaselineOtherRules: a baseline made with other rules is compared all the same, and
// the terminal and the Changes sheet say so.
func TestBaselineOtherRules(t *testing.T) {
	dir := t.TempDir()
	reg := writeDemo(t, dir, "demo-si.csv")
	prev := filepath.Join(dir, "us.xlsx")
	runCmd(t, "", "check", reg, "-o", prev, "--as-of", "2026-12-01", "--rules", "us", "-q").mustExit(t, exitFindings, "us")
	out := filepath.Join(dir, "iso.xlsx")
	r := runCmd(t, "", "check", reg, "-o", out, "--as-of", "2026-12-01", "--rules", "iso", "--baseline", prev)
	r.mustExit(t, exitFindings, "iso against us")
	const note = "the baseline used the us rules, this run the iso rules"
	if !strings.Contains(r.out, "note: "+note) {
		t.Errorf("terminal does not say the rules differ:\n%s", r.out)
	}
	found := false
	for _, row := range sheetRows(t, openXLSX(t, out), "Changes", 1) {
		found = found || strings.Contains(row[0], note)
	}
	if !found {
		t.Error("the Changes sheet does not say the rules differ")
	}
	// The same register under other rules: only verdicts change, no register value.
	if !strings.Contains(r.out, ", 0 with register values changed,") || !strings.Contains(r.out, "0 added, 0 removed,") {
		t.Errorf("two runs of one register: want no hoist added or removed and no register value changed:\n%s", r.out)
	}
}
