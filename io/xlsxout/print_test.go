package xlsxout

import (
	"regexp"
	"strings"
	"testing"
)

// TestPrintSetup: every sheet has a page setup on the paper asked for (ECMA-376 Part 1,
// 18.18.*: paperSize 9 is A4, 1 is Letter), the streamed sheets' print elements stand
// where CT_Worksheet puts them (sheetPr before sheetViews; autoFilter, printOptions,
// pageMargins, pageSetup, headerFooter in that order after sheetData), the Register
// repeats its header row and Asset ID column, and every page has "page N of M".
func TestPrintSetup(t *testing.T) {
	for _, tc := range []struct {
		paper, code string
	}{{"", "9"}, {PaperA4, "9"}, {PaperLetter, "1"}} {
		t.Run("paper="+tc.paper, func(t *testing.T) {
			info := runInfo()
			info.Input = "site & yard.xlsx"
			b := writeNew(t, header("t", 1000), info, fixture(), Options{Paper: tc.paper}, 0)
			for _, sheet := range []string{SheetSummary, SheetRegister, SheetChecks, SheetData, SheetAudit} {
				x := sheetXML(t, b, sheet)
				ps := regexp.MustCompile(`<pageSetup [^>]*>`).FindString(x)
				if !strings.Contains(ps, `paperSize="`+tc.code+`"`) {
					t.Errorf("%s: pageSetup %q, want paperSize %s", sheet, ps, tc.code)
				}
				wantOrient := "landscape"
				if sheet == SheetSummary {
					wantOrient = "portrait"
				}
				if !strings.Contains(ps, `orientation="`+wantOrient+`"`) {
					t.Errorf("%s: pageSetup %q, want %s", sheet, ps, wantOrient)
				}
				if !strings.Contains(ps, `fitToWidth="`) || !regexp.MustCompile(`fitToPage="(1|true)"`).MatchString(x) {
					t.Errorf("%s: not fitted to the page width: %q", sheet, ps)
				}
				if !strings.Contains(x, "page &amp;P of &amp;N") || !strings.Contains(x, "&amp;A") || !strings.Contains(x, "site &amp;&amp; yard.xlsx") {
					t.Errorf("%s: header/footer lacks the sheet, the register (its & doubled) or page N of M:\n%s", sheet, between(x, "<headerFooter>", "</headerFooter>"))
				}
			}
			for _, sheet := range []string{SheetRegister, SheetChecks} {
				x := sheetXML(t, b, sheet)
				last := -1
				for _, el := range []string{"<sheetPr>", "<sheetViews>", "<cols>", "<sheetData>", "</sheetData>", "<autoFilter ",
					"<printOptions ", "<pageMargins ", "<pageSetup ", "<headerFooter>", "</worksheet>"} {
					i := strings.Index(x, el)
					if i < 0 || i < last {
						t.Errorf("%s: %s missing or out of CT_Worksheet's order", sheet, el)
					}
					last = i
				}
			}
			if p := regexp.MustCompile(`<pageSetup [^>]*>`).FindString(sheetXML(t, b, SheetSummary)); !strings.Contains(p, `fitToHeight="1"`) {
				t.Errorf("Summary: %q, want one page tall", p)
			}
			f := open(t, b)
			titles := map[string]string{}
			for _, d := range f.GetDefinedName() {
				if d.Name == "_xlnm.Print_Titles" {
					titles[d.Scope] = d.RefersTo
				}
			}
			if got := titles[SheetRegister]; got != "'Register'!$A:$A,'Register'!$1:$1" {
				t.Errorf("Register print titles %q, want the Asset ID column and the header row", got)
			}
			if got := titles[SheetChecks]; got != "'Checks'!$1:$1" {
				t.Errorf("Checks print titles %q, want the header row", got)
			}
		})
	}
	if _, err := paperCode("a3"); err == nil {
		t.Error("paper a3 accepted")
	}
}

// TestPagesAcross: the Register is spread over enough landscape pages that it prints at
// PrintMinScale or more. A4 landscape is 297 mm = 841.9 pt wide (ISO 216), less 2 × 0.4 in
// margins = 784.3 pt, 1307 pt at 60 %; a 10-character column is 56.25 pt (7 px a
// character + 5 px, 0.75 pt a px).
func TestPagesAcross(t *testing.T) {
	w := func(n int, each float64) []float64 {
		ws := make([]float64, n)
		for i := range ws {
			ws[i] = each
		}
		return ws
	}
	for _, tc := range []struct {
		widths []float64
		rep    float64
		code   int
		want   int
	}{
		{w(23, 10), 0, 9, 1},  // 1293.75 pt: one page
		{w(24, 10), 0, 9, 2},  // 1350 pt: two
		{w(24, 10), 10, 9, 2}, // 1307 − 56.25 = 1250.8 pt a page
		{w(100, 10), 10, 9, 5},
		{w(24, 10), 0, 1, 2}, // Letter: 11 in = 792 pt, 734.4 pt, 1224 pt at 60 %
		{w(21, 10), 0, 1, 1},
	} {
		if got := pagesAcross(tc.widths, tc.rep, tc.code); got != tc.want {
			t.Errorf("pagesAcross(%d × %v, rep %v, paper %d) = %d, want %d", len(tc.widths), tc.widths[0], tc.rep, tc.code, got, tc.want)
		}
	}
}

// sheetXML returns a worksheet part of a workbook by sheet name, through the workbook's
// relationships.
func sheetXML(t *testing.T, b []byte, sheet string) string {
	t.Helper()
	parts := zipParts(t, b)
	m, err := sheetParts(func(name string) ([]byte, bool) { s, ok := parts[name]; return []byte(s), ok })
	if err != nil {
		t.Fatal(err)
	}
	s, ok := parts[m[sheet]]
	if !ok {
		t.Fatalf("no part for sheet %s", sheet)
	}
	return s
}

// TestWrappedLines: words are kept whole, lines fill up to n characters.
func TestWrappedLines(t *testing.T) {
	for _, tc := range []struct {
		s    string
		n    int
		want int
	}{
		{"", 10, 0},
		{"short", 10, 1},
		{"exactly ten", 11, 1},
		{"one two three", 7, 2},    // "one two" | "three"
		{"aaaa bbbb cccc", 9, 2},   // "aaaa bbbb" | "cccc"
		{"abcdefghijklmnop", 5, 4}, // a word longer than a line takes ⌈16/5⌉ lines
	} {
		if got := wrappedLines(tc.s, tc.n); got != tc.want {
			t.Errorf("wrappedLines(%q, %d) = %d, want %d", tc.s, tc.n, got, tc.want)
		}
	}
}
