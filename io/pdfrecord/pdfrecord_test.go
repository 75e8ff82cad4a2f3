package pdfrecord

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
	"hoistfleet/calc/approx"
	"hoistfleet/fleet"
	"hoistfleet/fleet/rules"
	"hoistfleet/io/register"
	"hoistfleet/templates"
)

var asOf = time.Date(2026, 12, 5, 0, 0, 0, 0, time.UTC)

// demoHoist is one demo hoist checked as explain checks it (with its working).
type demoHoist struct {
	name string // register and rules, for messages
	r    *fleet.Result
	h    *fleet.Header
	chk  *fleet.Checker
}

// demoHoists checks every hoist of both demo registers with their own profile, and the
// SI register once more with the demo insurer's rules, which give brake-stop a distance
// limit (so that it is drawn as a line whose limit the rating search finds by root
// finding rather than in closed form).
func demoHoists(t *testing.T) []demoHoist {
	t.Helper()
	names, regs, err := templates.DemoRegisters()
	if err != nil {
		t.Fatal(err)
	}
	insurer, err := templates.DemoInsurerRules()
	if err != nil {
		t.Fatal(err)
	}
	var out []demoHoist
	for _, name := range names {
		profile := "iso"
		if strings.Contains(name, "-us") {
			profile = "us"
		}
		for _, withInsurer := range []bool{false, true} {
			if withInsurer && profile != "iso" {
				continue
			}
			tab, err := rules.Profile(profile)
			if err != nil {
				t.Fatal(err)
			}
			label := name + " " + profile
			if withInsurer {
				user, err := rules.ParseRules(bytes.NewReader(insurer), "insurer-rules.csv")
				if err != nil {
					t.Fatal(err)
				}
				tab = tab.Override(user)
				label += "+insurer"
			}
			chk, err := fleet.NewChecker(fleet.Options{Rules: tab, MarginalBand: 0.1, AsOf: asOf, Record: true})
			if err != nil {
				t.Fatal(err)
			}
			src, err := register.NewCSV(bytes.NewReader(regs[name]), name)
			if err != nil {
				t.Fatal(err)
			}
			for {
				a, err := src.Next(context.Background())
				if errors.Is(err, io.EOF) {
					break
				}
				if err != nil {
					t.Fatal(err)
				}
				out = append(out, demoHoist{name: label, r: chk.Check(a), h: src.Header(), chk: chk})
			}
		}
	}
	if len(out) < 30 {
		t.Fatalf("%d demo hoists", len(out))
	}
	return out
}

// The rating diagram's lines cross the limit (utilisation 1) at each check's own
// LimitRatedLoadKg — what JSONL gives as limit_rated_load_kg — and the first line to
// cross is the governing check at the maximum permissible rated load (design.md
// "Maximum permissible rated load"). The data drawn is tested, not the pixels.
func TestRatingDiagramCrossesAtTheLimits(t *testing.T) {
	crossings, governed := 0, 0
	for _, dh := range demoHoists(t) {
		r := dh.r
		d, ok := newRatingDiagram(r, dh.chk)
		if !ok {
			if r.RatedLoadKg > 0 && r.Status != fleet.StatusError && r.Status != fleet.StatusUnchecked {
				t.Errorf("%s %s: no rating diagram", dh.name, r.Asset.ID)
			}
			continue
		}
		top := d.LoadsKg[len(d.LoadsKg)-1]
		if d.LoadsKg[0] != 0 || top < 1.5*r.RatedLoadKg-1e-6 {
			t.Errorf("%s %s: loads %g … %g, want 0 … ≥ 1.5 × %g", dh.name, r.Asset.ID, d.LoadsKg[0], top, r.RatedLoadKg)
		}
		first, firstID := math.Inf(1), ""
		for _, c := range d.Curves {
			x := d.crossing(c)
			if math.IsNaN(c.LimitKg) || c.LimitKg+0.1 >= top {
				if !math.IsNaN(x) && !(x >= c.LimitKg) {
					t.Errorf("%s %s %s: crosses at %.1f kg, below its limit %.1f kg", dh.name, r.Asset.ID, c.ID, x, c.LimitKg)
				}
				continue
			}
			crossings++
			// The limit is floored to 0.1 kg, so the line is at or below 1 at the limit and
			// above it 0.1 kg later: the last load evaluated before it goes over lies in
			// [limit, limit + 0.1) (a grid load may fall between the two).
			if !(x >= c.LimitKg && x < c.LimitKg+0.1) {
				t.Errorf("%s %s %s: the line crosses 1 after %.3f kg, the check's limit is %.1f kg", dh.name, r.Asset.ID, c.ID, x, c.LimitKg)
			}
			if x < first {
				first, firstID = x, c.ID
			}
		}
		// Capped at the register's rated load (design.md Revision 2, rated-load-cap): the
		// first line crosses at the mechanism's capacity, above the rating.
		if r.GoverningCheck == fleet.RatedLoadCap && !math.IsInf(first, 1) {
			governed++
			if !(first >= r.MechanismCapacityKg && first < r.MechanismCapacityKg+0.1) || first < r.MaxRatedLoadKg {
				t.Errorf("%s %s: first crossing %s at %.1f kg, mechanism capacity %.1f kg, rating %.1f kg", dh.name, r.Asset.ID, firstID, first, r.MechanismCapacityKg, r.MaxRatedLoadKg)
			}
		}
		if gov := r.GoverningCheck; gov != "" && !math.IsNaN(r.MaxRatedLoadKg) && r.Rating.Note == "" && !math.IsInf(first, 1) {
			governed++
			if !(first >= r.MaxRatedLoadKg && first < r.MaxRatedLoadKg+0.1) || (firstID != gov && r.Check(firstID).LimitRatedLoadKg != r.Check(gov).LimitRatedLoadKg) {
				t.Errorf("%s %s: first crossing %s at %.1f kg, rating %.1f kg governed by %s", dh.name, r.Asset.ID, firstID, first, r.MaxRatedLoadKg, gov)
			}
		}
	}
	if crossings < 20 || governed < 10 {
		t.Errorf("only %d crossings and %d governed ratings tested", crossings, governed)
	}
}

// The emergency-stop plot is the check's stop: it starts at the lowering speed, the area
// under it is the stopping distance distance_m and it ends at rest at time_s; a brake that
// cannot stop the load gives a rising line.
func TestStopProfileIsTheStop(t *testing.T) {
	stops, cannot := 0, 0
	for _, dh := range demoHoists(t) {
		c := dh.r.Check("brake-stop")
		sp, ok := stopProfile(c)
		if !ok {
			continue
		}
		dist := calc.FigureValue(c.Figures, "distance_m")
		if !sp.Stops {
			cannot++
			if !math.IsNaN(dist) || sp.V[len(sp.V)-1] <= sp.V[0] {
				t.Errorf("%s %s: cannot stop, distance %v, speeds %v", dh.name, dh.r.Asset.ID, dist, sp.V)
			}
			continue
		}
		stops++
		id := dh.name + " " + dh.r.Asset.ID
		// The area of the straight segments is exact; 1e-9 is floating-point rounding.
		approx.Check(t, id+" distance", sp.area(), dist, 0, 1e-9)
		approx.Check(t, id+" time", sp.T[len(sp.T)-1], calc.FigureValue(c.Figures, "time_s"), 0, 1e-12)
		approx.Check(t, id+" speed at brake set", sp.V[1], calc.FigureValue(c.Figures, "speed_at_brake_set_m_s"), 0, 1e-12)
		// design.md Revision 2: the stop on layer j starts from v r_j / r_1 (the motor's
		// speed is the same on every layer), r_L = D/2 + (L − 1)(√3/2) d.
		if v := layerSpeed(dh.r.Asset, calc.FigureValue(c.Figures, "stop_layer")); !math.IsNaN(v) {
			approx.Check(t, id+" initial speed", sp.V[0], v, 0, 1e-12)
		}
		if sp.V[len(sp.V)-1] != 0 {
			t.Errorf("%s: ends at %g m/s", id, sp.V[len(sp.V)-1])
		}
	}
	if stops < 10 || cannot < 1 {
		t.Errorf("%d stops and %d that cannot stop tested", stops, cannot)
	}
}

// The runaway plot is uniform acceleration from rest (design.md "Runaway"): it reaches
// the rated hoisting speed at time_to_rated_speed_s and, when the load has fallen the
// lift height (the area under the line, ½ a t² = H), the speed fall_speed_m_s.
func TestRunawayProfileIsTheRunaway(t *testing.T) {
	n := 0
	for _, dh := range demoHoists(t) {
		c := dh.r.Check("runaway")
		rp, vRated, ok := runawayProfile(c)
		if !ok || rp.Note != "" {
			continue
		}
		n++
		id := dh.name + " " + dh.r.Asset.ID
		// The rated lowering speed on the layer of the runaway, the first or the outer
		// (design.md Revision 2).
		v1, vL := layerSpeed(dh.r.Asset, 1), layerSpeed(dh.r.Asset, math.Inf(1))
		if !approx.Equal(vRated, v1, 0, 1e-12) && !approx.Equal(vRated, vL, 0, 1e-12) {
			t.Errorf("%s: rated speed %g, want the lowering speed on the first (%g) or the outer layer (%g)", id, vRated, v1, vL)
		}
		if H := dh.r.Asset.Get("lift_height"); H.State == fleet.OK && H.Num > 0 {
			approx.Check(t, id+" fall", rp.area(), H.Num, 0, 1e-12)
			approx.Check(t, id+" fall speed", rp.V[1], calc.FigureValue(c.Figures, "fall_speed_m_s"), 0, 1e-12)
		}
	}
	if n < 10 {
		t.Errorf("%d runaways tested", n)
	}
}

// Every demo hoist's record is laid out with every text in characters the embedded fonts
// print (Write fails otherwise); a passing, a re-rated, a failing and a US hoist's are
// written whole (embedding and compressing the fonts is most of a record's time); a
// character outside the fonts is refused by name.
func TestWriteEveryDemoHoist(t *testing.T) {
	whole := map[string]bool{"BQ-H01": true, "CS-H11": true, "CS-H07": true}
	for _, dh := range demoHoists(t) {
		if strings.Contains(dh.name, "insurer") {
			continue // the same texts as without, but for brake-stop's rule
		}
		info := &fleet.RunInfo{Tool: "hoistfleet", Version: "test", Input: "demo.csv", InputSHA256: strings.Repeat("0f", 32),
			Profile: "iso", AsOf: asOf}
		if !whole[dh.r.Asset.ID] && !(strings.Contains(dh.name, "-us") && !whole["us"]) {
			if _, err := layout(dh.r, dh.h, info, dh.chk); err != nil {
				t.Errorf("%s %s: %v", dh.name, dh.r.Asset.ID, err)
			}
			continue
		}
		if strings.Contains(dh.name, "-us") {
			whole["us"] = true
		}
		var b bytes.Buffer
		if err := Write(&b, dh.r, dh.h, info, dh.chk); err != nil {
			t.Errorf("%s %s: %v", dh.name, dh.r.Asset.ID, err)
			continue
		}
		if !bytes.HasPrefix(b.Bytes(), []byte("%PDF-")) || !bytes.Contains(b.Bytes(), []byte("%%EOF")) {
			t.Errorf("%s %s: not a PDF", dh.name, dh.r.Asset.ID)
		}
	}
	dh := demoHoists(t)[0]
	a := *dh.r.Asset
	a.ID = "H-中"
	r := *dh.r
	r.Asset = &a
	err := Write(io.Discard, &r, dh.h, &fleet.RunInfo{Tool: "hoistfleet", Input: "x.csv", AsOf: asOf}, nil)
	if err == nil || !strings.Contains(err.Error(), "U+4E2D") {
		t.Errorf("a character the fonts lack: err = %v, want one naming U+4E2D", err)
	}
}

// The fonts print what the records contain: the Greek, super- and subscripts, operators
// and arrows of the formulas.
func TestFontsHaveTheRecordsCharacters(t *testing.T) {
	p, err := newPrinter(&fleet.RunInfo{})
	if err != nil {
		t.Fatal(err)
	}
	const s = "η_RD ² ≤ ≥ × → − √ ⌊ ⌋ · ½ π α_d Δ θ ω ∞ — … ° µ"
	for _, f := range []*face{p.sans, p.bold, p.mono} {
		if r, bad := f.missing(s); bad {
			t.Errorf("%s %s lacks %q", f.family, f.style, r)
		}
	}
	if r, bad := p.sans.missing("a\x01b"); !bad || r != 1 {
		t.Errorf("a control character: %q %v, want it reported", r, bad)
	}
}

// layerSpeed is the register's rated lowering speed (the hoisting speed where none is
// given) on layer j of its drum, v r_j / r_1 (design.md Revision 2): r_1 = D/2, r_L = D/2
// + (L − 1)(√3/2) d for the outer layer (j ≥ 2; +Inf asks for the outer layer). NaN when
// the register lacks a value.
func layerSpeed(a *fleet.Asset, j float64) float64 {
	v := a.Get("lowering_speed")
	if v.State != fleet.OK {
		v = a.Get("hoist_speed")
	}
	if v.State != fleet.OK {
		return math.NaN()
	}
	layers := 1.0
	if l := a.Get("rope_layers"); l.State == fleet.OK {
		layers = l.Num
	}
	if j < 2 || layers < 2 {
		return v.Num
	}
	D, d := a.Get("drum_diameter"), a.Get("rope_diameter")
	if D.State != fleet.OK || d.State != fleet.OK {
		return math.NaN()
	}
	r1 := D.Num / 2
	return v.Num * (r1 + (layers-1)*math.Sqrt(3)/2*d.Num) / r1
}
