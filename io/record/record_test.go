package record

import (
	"bytes"
	"context"
	"errors"
	"io"
	"math"
	"strings"
	"testing"
	"time"

	"hoistfleet/calc"
	"hoistfleet/fleet"
	"hoistfleet/fleet/rules"
	"hoistfleet/io/register"
	"hoistfleet/templates"
)

func TestNum(t *testing.T) {
	tests := []struct {
		in   float64
		want string
	}{
		{0, "0"},
		{9.80665, "9.807"},
		{320187.4, "320187"},
		{0.970398, "0.9704"},
		{1.5e-5, "1.5e-05"},
		{-0.25, "-0.25"},
		{math.NaN(), "—"},
		{math.Inf(1), "∞"},
	}
	for _, tt := range tests {
		if got := Num(tt.in); got != tt.want {
			t.Errorf("Num(%v) = %q, want %q", tt.in, got, tt.want)
		}
	}
}

// A record must carry the caution, the rule and its source, the substituted numbers and
// the rating, in both layouts.
func TestWriteRecord(t *testing.T) {
	a := &fleet.Asset{Row: 7, ID: "H-007",
		Cells:  []fleet.Cell{{Text: "H-007"}, {Text: "5", IsNumber: true}},
		Fields: map[string]fleet.Value{"asset_id": {State: fleet.OK, Text: "H-007"}, "rated_load": {State: fleet.OK, Num: 5000}}}
	h := &fleet.Header{Sheet: "Register", Columns: []fleet.Column{{Index: 0, Title: "Asset ID", Key: "asset_id", Factor: 1},
		{Index: 1, Title: "Rated load [t]", Key: "rated_load", Unit: "t", Factor: 1000}}}
	r := &fleet.Result{Asset: a, DefaultsUsed: []string{"hook block mass 0 kg"}}
	r.Status, r.RatedLoadKg, r.MinMargin, r.WorstCheck = fleet.StatusPass, 5000, 0.21, "rope-design-factor"
	r.MaxRatedLoadKg, r.GoverningCheck, r.MechanismCapacityKg = 5000, fleet.RatedLoadCap, 6350.2
	r.Checks = []fleet.CheckResult{{ID: "rope-design-factor", Status: fleet.StatusPass, Demand: 4.5, Capacity: 5.7, Unit: "1",
		Utilisation: 0.789, Margin: 0.211, LimitRatedLoadKg: 6350.2, LoadDependent: true,
		Rule: "rope.design_factor = 4.5 (M5)", Source: "ISO 4308-1 [seen]",
		Steps: []calc.Step{{Symbol: "W", Formula: "m g", Numbers: "5000 × 9.80665", Value: 49033.25, Unit: "N"}}},
		// design.md Revision 2: a review limit's utilisation and source are in the record.
		{ID: "brake-holding", Status: fleet.StatusPass, Demand: 100, Capacity: 200, Unit: "N m", Utilisation: 0.5, Margin: 0.5,
			ReviewRule: "brake.factor = 1.6", ReviewUtilisation: 0.64, ReviewSource: "EN 14492-2 [memory, low]"}}
	info := &fleet.RunInfo{Tool: "hoistfleet", Version: "test", Input: "reg.csv", Profile: "iso", AsOf: time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC)}
	for _, f := range []Format{Text, Markdown} {
		var b bytes.Buffer
		if err := Write(&b, r, h, info, f); err != nil {
			t.Fatal(err)
		}
		out := b.String()
		// Lines are wrapped: compare with the words joined by single spaces.
		joined := strings.Join(strings.Fields(strings.ReplaceAll(out, "\n> ", " ")), " ")
		if !strings.Contains(joined, fleet.Caution) {
			t.Errorf("format %d: record lacks the caution", f)
		}
		for _, want := range []string{"ISO 4308-1 [seen]", "5000 × 9.80665", "49033", "6350.2 kg", "rope-design-factor",
			"hook block mass 0 kg", "Rated load [t]", "5000 kg", "Prepared by:", "Checked by:", "Approved by:",
			"does not check", "the runway, rails", "governed by rated-load-cap", "Mechanism capacity",
			"Review limit (not verified, at worst marginal): brake.factor = 1.6, utilisation 0.64; source EN 14492-2 [memory, low]"} {
			if !strings.Contains(out, want) && !strings.Contains(joined, want) {
				t.Errorf("format %d: record lacks %q", f, want)
			}
		}
	}
}

func TestWrap(t *testing.T) {
	tests := []struct {
		name, in string
		width    int
		want     []string
	}{
		{"fits", "a short line", 20, []string{"a short line"}},
		{"prose", "one two three four five six", 10, []string{"one two", "three four", "five six"}},
		{"bullet keeps its marker's indent", "  - alpha beta gamma delta", 14, []string{"  - alpha beta", "    gamma", "    delta"}},
		{"numbers line lines up after =", "      = 12760 + (4/0.2575)² (23.1/0.97)", 24, []string{"      = 12760 +", "        (4/0.2575)²", "        (23.1/0.97)"}},
		{"quote continues quoted", "> **Caution.** one two three", 16, []string{"> **Caution.**", "> one two three"}},
		{"indented without marker", "  m_eq = m + (n_e/r)² x", 14, []string{"  m_eq = m +", "      (n_e/r)²", "      x"}},
		{"a word longer than the line is broken", "see /a/very/long/path/name.csv now", 12, []string{"see", "/a/very/long", "/path/name.c", "sv now"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := Wrap(tt.in, tt.width)
			if strings.Join(got, "|") != strings.Join(tt.want, "|") {
				t.Errorf("Wrap(%q, %d) =\n%q\nwant\n%q", tt.in, tt.width, got, tt.want)
			}
			for _, l := range got {
				if n := len([]rune(l)); n > tt.width {
					t.Errorf("line %q has %d runes > %d", l, n, tt.width)
				}
			}
			// Wrapping loses no word (a broken word is whole again once joined).
			if strings.Join(strings.Fields(strings.Join(got, " ")), "") != strings.Join(strings.Fields(strings.ReplaceAll(tt.in, "> ", " ")), "") &&
				!strings.HasPrefix(tt.in, ">") {
				t.Errorf("words changed: %q", got)
			}
		})
	}
}

// Every line of every demo hoist's record, text and Markdown, is at most Width
// characters, and a Markdown code block is closed (issue 17: lines up to 391 characters).
func TestRecordsWrapAtWidth(t *testing.T) {
	names, regs, err := templates.DemoRegisters()
	if err != nil {
		t.Fatal(err)
	}
	for _, name := range names {
		profile := "iso"
		if strings.Contains(name, "-us") {
			profile = "us"
		}
		tab, err := rules.Profile(profile)
		if err != nil {
			t.Fatal(err)
		}
		chk, err := fleet.NewChecker(fleet.Options{Rules: tab, MarginalBand: 0.1, Record: true,
			AsOf: time.Date(2026, 12, 5, 0, 0, 0, 0, time.UTC)})
		if err != nil {
			t.Fatal(err)
		}
		src, err := register.NewCSV(bytes.NewReader(regs[name]), name)
		if err != nil {
			t.Fatal(err)
		}
		info := &fleet.RunInfo{Tool: "hoistfleet", Version: "test", Input: "a/rather/long/folder/name/for/the/register/" + name,
			InputSHA256: strings.Repeat("ab", 32), Profile: profile, AsOf: time.Date(2026, 12, 5, 0, 0, 0, 0, time.UTC)}
		n := 0
		for {
			a, err := src.Next(context.Background())
			if errors.Is(err, io.EOF) {
				break
			}
			if err != nil {
				t.Fatal(err)
			}
			r := chk.Check(a)
			n++
			for _, f := range []Format{Text, Markdown} {
				var b bytes.Buffer
				if err := Write(&b, r, src.Header(), info, f); err != nil {
					t.Fatal(err)
				}
				fences := 0
				for i, l := range strings.Split(b.String(), "\n") {
					if c := len([]rune(l)); c > Width {
						t.Errorf("%s %s format %d line %d: %d characters: %q", name, a.ID, f, i+1, c, l)
					}
					if l == "```" {
						fences++
					}
				}
				if fences%2 != 0 {
					t.Errorf("%s %s: unclosed code block", name, a.ID)
				}
			}
		}
		if n < 10 {
			t.Errorf("%s: %d hoists read", name, n)
		}
	}
}
