package main

// explain --format pdf (issue 17, item 3): the PDF is read back with pdftotext (poppler)
// and its numbers compared with the JSON lines of the same hoist from `check`. Without
// pdftotext the test skips, unless HOISTFLEET_REQUIRE_SOFFICE=1 (CI installs
// poppler-utils with LibreOffice), when it fails.

import (
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

func pdfText(t *testing.T, path string) string {
	t.Helper()
	bin, err := exec.LookPath("pdftotext")
	if err != nil {
		if os.Getenv("HOISTFLEET_REQUIRE_SOFFICE") == "1" {
			t.Fatal("pdftotext is not on PATH and HOISTFLEET_REQUIRE_SOFFICE=1: install poppler-utils")
		}
		t.Skip("pdftotext is not on PATH (poppler-utils)")
	}
	out, err := exec.Command(bin, "-layout", "-enc", "UTF-8", path, "-").Output()
	if err != nil {
		t.Fatalf("pdftotext %s: %v", path, err)
	}
	return string(out)
}

// sameTo4 reports whether a number printed to 4 significant figures (record.Num) is
// the JSON value rounded.
func sameTo4(printed string, want float64) bool {
	got, err := strconv.ParseFloat(printed, 64)
	if err != nil {
		return false
	}
	return math.Abs(got-want) <= 5e-4*math.Abs(want)+1e-12
}

func TestExplainPDFMatchesJSONL(t *testing.T) {
	dir := t.TempDir()
	reg := writeDemo(t, dir, "demo-si.csv")
	res := runCmd(t, "", "check", reg, "--format", "jsonl", "-o", "-", "--as-of", "2026-12-05", "--quiet")
	if res.code != exitOK && res.code != exitFindings {
		t.Fatalf("check: exit %d: %s", res.code, res.err)
	}
	hoists := byAsset(parseJSONL(t, res.out))
	rowRE := regexp.MustCompile(`^\s*([a-z-]+)\s+(pass|marginal|fail|info|unchecked|error)\s+(\S+)(?:\s+(\d+\.\d) kg)?`)
	for _, id := range []string{"CS-H11", "CS-H07"} {
		t.Run(id, func(t *testing.T) {
			pdf := filepath.Join(dir, id+".pdf")
			runCmd(t, "", "explain", reg, "--asset", id, "--format", "pdf", "-o", pdf, "--as-of", "2026-12-05").mustExit(t, exitOK, "explain --format pdf")
			text := pdfText(t, pdf)
			flat := normSpace(text)
			h := hoists[id]
			if h == nil {
				t.Fatalf("no JSON line for %s", id)
			}
			if want := "Register SHA-256 " + sha256File(t, reg); !strings.Contains(flat, want) {
				t.Errorf("the title block lacks %q", want)
			}
			if want := "Calculation record: hoist " + id; !strings.Contains(flat, want) {
				t.Errorf("lacks %q", want)
			}
			for _, want := range []string{"Prepared", "Checked", "Approved", "Signature", "Revision", "does not check", "crane's bridge",
				"Each load-dependent check's utilisation", "Left: brake-stop, speed against time", normSpace("does not replace thorough examination by a competent person")} {
				if !strings.Contains(flat, want) {
					t.Errorf("lacks %q", want)
				}
			}
			// The three plots are drawn into the PDF (vector graphics, their text readable);
			// the rating diagram's legend gives each line's crossing of the limit, which is
			// the check's limit_rated_load_kg (in t, 4 significant figures).
			for _, want := range []string{"Rating diagram: utilisation against the rated load", "Emergency stop while lowering", "Runaway from rest"} {
				if !strings.Contains(flat, want) {
					t.Errorf("lacks the plot %q", want)
				}
			}
			legends := 0
			for _, c := range h.checks() {
				lim, ok := num(c["limit_rated_load_kg"])
				m := regexp.MustCompile(regexp.QuoteMeta(c["id"].(string)) + ` \(limit (\S+) t\)`).FindStringSubmatch(flat)
				if m == nil {
					continue // its limit lies beyond the diagram, or it has no line
				}
				legends++
				if !ok || !sameTo4(m[1], lim/1000) {
					t.Errorf("%s: the diagram's line crosses the limit at %s t, JSONL's limit is %v kg", c["id"], m[1], c["limit_rated_load_kg"])
				}
			}
			if legends == 0 {
				t.Errorf("no line of the rating diagram crosses the limit")
			}
			switch gov := h.str("governing_check"); {
			case gov == "rated-load-cap":
				// Capped at the register's rated load (design.md Revision 2): the first
				// line to cross is at the mechanism's capacity.
				if mc, ok := num(h["mechanism_capacity_kg"]); !ok || !regexp.MustCompile(`\(limit `+regexp.QuoteMeta(strconv.FormatFloat(mc/1000, 'g', 4, 64))+` t\)`).MatchString(flat) {
					t.Errorf("no line of the rating diagram crosses at the mechanism's capacity %v kg", h["mechanism_capacity_kg"])
				}
			case gov != "" && !strings.Contains(flat, gov+" (limit "):
				t.Errorf("the governing check %s does not cross the limit in the rating diagram", gov)
			}
			// The table of checks: each check's status, utilisation and limit load.
			seen := map[string]bool{}
			for _, line := range strings.Split(text, "\n") {
				m := rowRE.FindStringSubmatch(line)
				if m == nil || seen[m[1]] {
					continue // the first row of a check is the checks table's
				}
				c := h.check(m[1])
				if c == nil {
					continue
				}
				seen[m[1]] = true
				if c["status"] != m[2] {
					t.Errorf("%s: status %s in the PDF, %v in JSONL", m[1], m[2], c["status"])
				}
				if u, ok := num(c["utilisation"]); ok {
					if !sameTo4(m[3], u) {
						t.Errorf("%s: utilisation %s in the PDF, %v in JSONL", m[1], m[3], u)
					}
				} else if m[3] != "—" {
					t.Errorf("%s: utilisation %s in the PDF, null in JSONL", m[1], m[3])
				}
				if lim, ok := num(c["limit_rated_load_kg"]); ok {
					if want := strconv.FormatFloat(lim, 'f', 1, 64); m[4] != want {
						t.Errorf("%s: limit %q kg in the PDF, %s in JSONL", m[1], m[4], want)
					}
				} else if m[4] != "" {
					t.Errorf("%s: limit %s kg in the PDF, null in JSONL", m[1], m[4])
				}
			}
			if len(seen) != len(h.checks()) {
				t.Errorf("%d of %d checks found in the PDF's table", len(seen), len(h.checks()))
			}
			if mx, ok := num(h["max_rated_load_kg"]); ok {
				want := "Maximum permissible rated load on the data given: " + strconv.FormatFloat(mx, 'f', 1, 64) + " kg"
				if !strings.Contains(flat, want) {
					t.Errorf("lacks %q", want)
				}
			}
			// The stop: the working's distance figure.
			stop := h.check("brake-stop")
			if d, ok := num(figures(stop)["distance_m"]); ok {
				m := regexp.MustCompile(`distance_m = (\S+) m`).FindStringSubmatch(flat)
				if m == nil || !sameTo4(m[1], d) {
					t.Errorf("stop distance %v in the PDF, %v m in JSONL", m, d)
				}
			} else if !strings.Contains(flat, "the brakes cannot stop the load") {
				t.Errorf("a stop that cannot be made is not said to be so")
			}
			// What would have to change: each failing check with a utilisation, capacity × u.
			for _, c := range h.checks() {
				u, ok1 := num(c["utilisation"])
				capy, ok2 := num(c["capacity"])
				if c["status"] != "fail" || !ok1 || !ok2 {
					continue
				}
				re := regexp.MustCompile(regexp.QuoteMeta(c["id"].(string)) + `: capacity needed (\S+) `)
				m := re.FindStringSubmatch(flat)
				if m == nil || !sameTo4(m[1], capy*u) {
					t.Errorf("%s: capacity needed %v in the PDF, want %v", c["id"], m, capy*u)
				}
			}
			if p, ok := h["proposed"].(map[string]any); ok {
				pk, _ := num(p["rated_load_kg"])
				want := "At the proposed rated load " + strconv.FormatFloat(pk, 'f', 1, 64) + " kg"
				if !strings.Contains(flat, want) || !strings.Contains(flat, "Working at the proposed load") {
					t.Errorf("lacks %q or the working at the proposed load", want)
				}
				if want := "Overall at the proposed load: " + p["status"].(string); !strings.Contains(flat, want) {
					t.Errorf("lacks %q", want)
				}
			}
		})
	}
	// From standard input the register's SHA-256 is known once it has been read.
	pdf := filepath.Join(dir, "stdin.pdf")
	b, err := os.ReadFile(reg)
	if err != nil {
		t.Fatal(err)
	}
	runCmd(t, string(b), "explain", "-", "--asset", "CS-H11", "--format", "pdf", "-o", pdf).mustExit(t, exitOK, "explain - --format pdf")
	if want := "Register SHA-256 " + sha256File(t, reg); !strings.Contains(normSpace(pdfText(t, pdf)), want) {
		t.Errorf("from standard input: lacks %q", want)
	}
	// A PDF needs somewhere to go.
	runCmd(t, "", "explain", reg, "--asset", "CS-H11", "--format", "pdf").mustExit(t, exitUsage, "explain --format pdf without -o")
	// --all writes one PDF per hoist (a small register: a record takes about 0.15 s).
	small := copyTestdata(t, dir, "small-si.csv")
	res = runCmd(t, "", "check", small, "--format", "jsonl", "-o", "-", "--quiet")
	n := len(parseJSONL(t, res.out))
	out := filepath.Join(dir, "records")
	runCmd(t, "", "explain", small, "--all", "--format", "pdf", "-o", out).mustExit(t, exitOK, "explain --all --format pdf")
	files := listDir(t, out)
	if len(files) != n || n == 0 {
		t.Errorf("--all --format pdf wrote %d files for %d hoists", len(files), n)
	}
	for _, f := range files {
		if !strings.HasSuffix(f, ".pdf") {
			t.Errorf("--all --format pdf wrote %s", f)
		}
	}
}
