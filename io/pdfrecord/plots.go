package pdfrecord

import (
	"fmt"
	"image/color"
	"math"
	"slices"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"

	"hoistfleet/calc"
	"hoistfleet/fleet"
)

// Evaluator evaluates one hoist at a list of rated loads (fleet.Checker does).
type Evaluator interface {
	EvaluateAtLoads(a *fleet.Asset, loadsKg []float64) []fleet.Evaluation
}

// ratingDiagram is the data of the rating diagram: each load-dependent check's
// utilisation against the rated load on the hook.
type ratingDiagram struct {
	LoadsKg    []float64 // ascending, from 0
	Curves     []ratingCurve
	RatedKg    float64
	ProposedKg float64 // NaN when none
	// Markers are the limits of load-dependent checks without a utilisation (brake-stop
	// with no distance rule: the load above which the brakes can no longer stop it).
	Markers []ratingCurve
}

// ratingCurve is one check's line: its utilisation at each of LoadsKg (NaN where it is
// not computed) and the rated load at its limit from the check itself.
type ratingCurve struct {
	ID      string
	U       []float64
	LimitKg float64
}

// diagramSteps is the number of equal load steps of the rating diagram; the limit loads
// (and 0.1 kg above each, the rating's resolution) and the rated and proposed loads are
// evaluated as well, so every line passes through its limit exactly.
const diagramSteps = 150

// crossingTolerance is fleet's utilisation tolerance: a utilisation within 1e-9 of 1 is
// at the limit, not over it.
const crossingTolerance = 1e-9

// newRatingDiagram evaluates r's hoist from no load to 1.5 × its rated load (further when
// the proposed load lies beyond) with ev. ok is false when the hoist has no rated load
// or no load-dependent check has a utilisation.
func newRatingDiagram(r *fleet.Result, ev Evaluator) (ratingDiagram, bool) {
	d := ratingDiagram{RatedKg: r.RatedLoadKg, ProposedKg: math.NaN()}
	if !(r.RatedLoadKg > 0) || ev == nil {
		return d, false
	}
	top := 1.5 * r.RatedLoadKg
	// Beyond 1.5 × the rated load when the first limit lies there (up to 4 ×), so that
	// the line that governs is seen to cross.
	first := math.NaN()
	for _, c := range r.Checks {
		if c.LoadDependent && c.LimitRatedLoadKg > 0 && !(c.LimitRatedLoadKg >= first) {
			first = c.LimitRatedLoadKg
		}
	}
	if first > 0.95*top && first < 4*r.RatedLoadKg {
		top = 1.1 * first
	}
	if r.Proposed != nil {
		d.ProposedKg = r.Proposed.RatedLoadKg
		if d.ProposedKg > 0.95*top && d.ProposedKg < 4*r.RatedLoadKg {
			top = 1.1 * d.ProposedKg
		}
	}
	loads := make([]float64, 0, diagramSteps+24)
	for i := 0; i <= diagramSteps; i++ {
		loads = append(loads, top*float64(i)/diagramSteps)
	}
	loads = append(loads, r.RatedLoadKg)
	if !math.IsNaN(d.ProposedKg) {
		loads = append(loads, d.ProposedKg)
	}
	for _, c := range r.Checks {
		if c.LoadDependent && c.LimitRatedLoadKg > 0 && c.LimitRatedLoadKg+0.1 < top {
			loads = append(loads, c.LimitRatedLoadKg, c.LimitRatedLoadKg+0.1)
		}
	}
	slices.Sort(loads)
	d.LoadsKg = slices.Compact(loads)
	evals := ev.EvaluateAtLoads(r.Asset, d.LoadsKg)
	if len(evals) != len(d.LoadsKg) {
		return d, false
	}
	for j, c := range r.Checks {
		if !c.LoadDependent {
			continue
		}
		cv := ratingCurve{ID: c.ID, U: make([]float64, len(evals)), LimitKg: c.LimitRatedLoadKg}
		any := false
		for i, e := range evals {
			u := math.NaN()
			if j < len(e.Checks) && e.Checks[j].ID == c.ID {
				u = e.Checks[j].Utilisation
			}
			if math.IsInf(u, 0) {
				u = math.NaN()
			}
			cv.U[i] = u
			any = any || !math.IsNaN(u)
		}
		// A check that fails outright below its utilisation limit (design.md Revision 2:
		// no control braking means, too few brakes) fails at every load: its line would
		// stay under 1, so it is shown by its limit (0 kg) instead.
		outright := c.Status == fleet.StatusFail && c.Utilisation <= 1
		switch {
		case any && !outright:
			d.Curves = append(d.Curves, cv)
		case !math.IsNaN(c.LimitRatedLoadKg):
			d.Markers = append(d.Markers, cv)
		}
	}
	return d, len(d.Curves) > 0
}

// crossing is the rated load at which a curve first goes over its limit: the last load
// evaluated before the first utilisation above 1, NaN when it never goes over.
func (d ratingDiagram) crossing(c ratingCurve) float64 {
	for i, u := range c.U {
		if u > 1+crossingTolerance {
			if i == 0 {
				return 0
			}
			return d.LoadsKg[i-1]
		}
	}
	return math.NaN()
}

// speedProfile is a speed–time polyline with its distance (the area under it).
type speedProfile struct {
	T, V     []float64 // s, m/s
	Distance float64   // m, NaN when the load is not stopped
	Stops    bool
	Note     string
}

// area is the distance under the polyline (trapezoids: exact for straight segments).
func (p speedProfile) area() float64 {
	s := 0.0
	for i := 1; i < len(p.T); i++ {
		s += 0.5 * (p.V[i] + p.V[i-1]) * (p.T[i] - p.T[i-1])
	}
	return s
}

// stopProfile is the emergency stop of brake-stop (design.md "Emergency stop"): the
// load lowering at v when the power is lost, speeding up at a_ff through the brake delay
// t_s to v_1, then slowing at a_b to rest. It is rebuilt from the check's own results:
// v (initial_speed_m_s, or the working's step v), v_1 (speed_at_brake_set_m_s), s_1 (runaway_distance_m), a_b
// (deceleration_m_s2) and the stop time (time_s); t_s = 2 s_1 / (v + v_1) since the
// speed is linear in the delay. When the brakes cannot stop the load the line goes on
// rising at −a_b for as long again as the delay.
func stopProfile(c *fleet.CheckResult) (speedProfile, bool) {
	if c == nil {
		return speedProfile{}, false
	}
	// The speed at power loss: the figure initial_speed_m_s where calc gives it (design.md
	// Revision 2: the layer's own speed), else the working's step "v".
	v0 := calc.FigureValue(c.Figures, "initial_speed_m_s")
	for _, s := range c.Steps {
		if s.Symbol == "v" && math.IsNaN(v0) {
			v0 = s.Value
		}
	}
	v1 := calc.FigureValue(c.Figures, "speed_at_brake_set_m_s")
	s1 := calc.FigureValue(c.Figures, "runaway_distance_m")
	ab := calc.FigureValue(c.Figures, "deceleration_m_s2")
	T := calc.FigureValue(c.Figures, "time_s")
	dist := calc.FigureValue(c.Figures, "distance_m")
	if !(v0 > 0) || math.IsNaN(v1) || math.IsNaN(s1) || math.IsNaN(ab) {
		return speedProfile{}, false
	}
	ts := 0.0
	if v0+v1 > 0 {
		ts = 2 * s1 / (v0 + v1)
	}
	p := speedProfile{T: []float64{0}, V: []float64{v0}, Distance: dist}
	if ts > 0 {
		p.T, p.V = append(p.T, ts), append(p.V, v1)
	}
	if ab > 0 && !math.IsNaN(T) {
		p.Stops = true
		p.T, p.V = append(p.T, T), append(p.V, 0)
		return p, true
	}
	extra := math.Max(ts, 0.5)
	p.T, p.V = append(p.T, ts+extra), append(p.V, v1-ab*extra)
	p.Note = "the brakes cannot stop the load"
	return p, true
}

// runawayProfile is runaway's speed from rest with the brake released and the motor
// unpowered (design.md "Runaway"): v = a_ff t, up to the fall of the lift height (speed
// fall_speed_m_s at t = v_H / a_ff) or, without a lift height, to three times the time to
// reach the rated speed. ratedSpeed is that speed (a_ff × time_to_rated_speed_s): the rated
// lowering speed on the layer of the runaway (design.md Revision 2: v_j = v r_j / r_1).
func runawayProfile(c *fleet.CheckResult) (p speedProfile, ratedSpeed float64, ok bool) {
	if c == nil {
		return speedProfile{}, math.NaN(), false
	}
	a := calc.FigureValue(c.Figures, "acceleration_m_s2")
	tv := calc.FigureValue(c.Figures, "time_to_rated_speed_s")
	vH := calc.FigureValue(c.Figures, "fall_speed_m_s")
	if math.IsNaN(a) {
		return speedProfile{}, math.NaN(), false
	}
	if a <= 0 {
		return speedProfile{T: []float64{0, 1}, V: []float64{0, 0}, Note: "self-locking: no runaway"}, math.NaN(), true
	}
	ratedSpeed = a * tv
	end := 3 * tv
	if vH > 0 {
		end = vH / a
	}
	if !(end > 0) || math.IsInf(end, 0) {
		return speedProfile{}, math.NaN(), false
	}
	p = speedProfile{T: []float64{0, end}, V: []float64{0, a * end}, Distance: 0.5 * a * end * end}
	return p, ratedSpeed, true
}

// Colours of the plots and the status marks (our own choice).
var (
	colPass      = color.RGBA{0x2e, 0x7d, 0x32, 0xff}
	colMarginal  = color.RGBA{0xd9, 0x8e, 0x04, 0xff}
	colFail      = color.RGBA{0xc6, 0x28, 0x28, 0xff}
	colInfo      = color.RGBA{0x54, 0x6e, 0x7a, 0xff}
	colUnchecked = color.RGBA{0x8d, 0x6e, 0x63, 0xff}
	colError     = color.RGBA{0x6a, 0x1b, 0x9a, 0xff}
	colInk       = color.RGBA{0x21, 0x21, 0x21, 0xff}
	// lineColours tell the rating diagram's checks apart.
	lineColours = []color.Color{
		color.RGBA{0x1f, 0x5f, 0xa8, 0xff}, color.RGBA{0xd6, 0x5f, 0x00, 0xff}, color.RGBA{0x2a, 0x8a, 0x4a, 0xff},
		color.RGBA{0xa8, 0x1f, 0x5c, 0xff}, color.RGBA{0x6b, 0x4c, 0xa8, 0xff}, color.RGBA{0x00, 0x8b, 0x8b, 0xff},
		color.RGBA{0x8a, 0x6a, 0x10, 0xff}, color.RGBA{0x55, 0x55, 0x55, 0xff},
	}
)

func newPlot(title, x, y string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.Title.TextStyle.Font.Size = vg.Points(11)
	p.X.Label.Text, p.Y.Label.Text = x, y
	for _, ax := range []*plot.Axis{&p.X, &p.Y} {
		ax.Label.TextStyle.Font.Size = vg.Points(9)
		ax.Label.TextStyle.Color = colInk
		ax.Tick.Label.Font.Size = vg.Points(8)
		ax.Tick.Label.Color = colInk
	}
	grid := plotter.NewGrid()
	grid.Vertical.Color, grid.Horizontal.Color = color.Gray{Y: 0xd0}, color.Gray{Y: 0xd0}
	p.Add(grid)
	p.Legend.TextStyle.Font.Size = vg.Points(8)
	for _, f := range []*font.Font{&p.Title.TextStyle.Font, &p.X.Label.TextStyle.Font, &p.Y.Label.TextStyle.Font,
		&p.X.Tick.Label.Font, &p.Y.Tick.Label.Font, &p.Legend.TextStyle.Font} {
		f.Variant = "Sans"
	}
	return p
}

// segments splits a curve at its NaNs into drawable pieces.
func segments(xs, ys []float64, scale float64) []plotter.XYs {
	var out []plotter.XYs
	var cur plotter.XYs
	for i := range xs {
		if math.IsNaN(ys[i]) {
			if len(cur) > 0 {
				out = append(out, cur)
			}
			cur = nil
			continue
		}
		cur = append(cur, plotter.XY{X: xs[i] / scale, Y: ys[i]})
	}
	if len(cur) > 0 {
		out = append(out, cur)
	}
	return out
}

func vline(p *plot.Plot, x, y0, y1 float64, c color.Color, dashed bool, label string) error {
	l, err := plotter.NewLine(plotter.XYs{{X: x, Y: y0}, {X: x, Y: y1}})
	if err != nil {
		return err
	}
	l.Color, l.Width = c, vg.Points(1)
	if dashed {
		l.Dashes = []vg.Length{vg.Points(4), vg.Points(3)}
	}
	p.Add(l)
	if label != "" {
		lb, err := plotter.NewLabels(plotter.XYLabels{XYs: plotter.XYs{{X: x, Y: y1}}, Labels: []string{" " + label}})
		if err != nil {
			return err
		}
		lb.TextStyle[0].Font.Size, lb.TextStyle[0].Font.Variant = vg.Points(8), "Sans"
		lb.TextStyle[0].Color = c
		lb.TextStyle[0].YAlign = -1
		p.Add(lb)
	}
	return nil
}

// ratingPlot draws the rating diagram: loads in the register's unit (unit, kg per unit).
func ratingPlot(d ratingDiagram, unit string, perUnit float64) (*plot.Plot, error) {
	p := newPlot("Rating diagram: utilisation against the rated load", "rated load on the hook ["+unit+"]", "utilisation")
	top := d.LoadsKg[len(d.LoadsKg)-1] / perUnit
	ymax := 1.6
	for _, c := range d.Curves {
		for _, u := range c.U {
			if u > ymax && u <= 3 {
				ymax = u
			}
		}
	}
	ymax = math.Ceil(ymax*10) / 10
	if ymax > 3 {
		ymax = 3
	}
	limit, err := plotter.NewLine(plotter.XYs{{X: 0, Y: 1}, {X: top, Y: 1}})
	if err != nil {
		return nil, err
	}
	limit.Color, limit.Width = colFail, vg.Points(1.2)
	p.Add(limit)
	for i, c := range d.Curves {
		col := lineColours[i%len(lineColours)]
		first := true
		for _, seg := range segments(d.LoadsKg, c.U, perUnit) {
			l, err := plotter.NewLine(seg)
			if err != nil {
				return nil, err
			}
			l.Color, l.Width = col, vg.Points(1.4)
			if i >= len(lineColours) {
				l.Dashes = []vg.Length{vg.Points(5), vg.Points(2)}
			}
			p.Add(l)
			if first {
				name := c.ID
				if x := d.crossing(c); !math.IsNaN(x) {
					name += fmt.Sprintf(" (limit %.4g %s)", x/perUnit, unit)
				}
				p.Legend.Add(name, l)
				first = false
			}
		}
	}
	if err := vline(p, d.RatedKg/perUnit, 0, ymax*0.93, colInk, true, "rated"); err != nil {
		return nil, err
	}
	if !math.IsNaN(d.ProposedKg) {
		if err := vline(p, d.ProposedKg/perUnit, 0, ymax*0.85, colMarginal, true, "proposed"); err != nil {
			return nil, err
		}
	}
	for _, m := range d.Markers {
		if x := m.LimitKg / perUnit; x > 0 && x < top {
			if err := vline(p, x, 0, ymax*0.77, colInfo, true, m.ID+" limit"); err != nil {
				return nil, err
			}
		}
	}
	p.Legend.Top = true
	p.Legend.Left = true
	// Plotters widen the axes to their data when added: the ranges are set last.
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = 0, top, 0, ymax
	return p, nil
}

// speedPlot draws a speed–time profile with its annotations; its note goes in the top
// left corner (noteLeft) or the top middle, where the line is not.
func speedPlot(title string, sp speedProfile, marks []mark, noteLeft bool) (*plot.Plot, error) {
	p := newPlot(title, "time [s]", "speed [m/s]")
	pts := make(plotter.XYs, len(sp.T))
	vmax := 0.0
	for i := range sp.T {
		pts[i] = plotter.XY{X: sp.T[i], Y: sp.V[i]}
		vmax = math.Max(vmax, sp.V[i])
	}
	if vmax <= 0 {
		vmax = 1
	}
	xmax := sp.T[len(sp.T)-1] * 1.05
	if xmax <= 0 {
		xmax = 1
	}
	p.X.Max = xmax
	poly, err := plotter.NewPolygon(append(append(plotter.XYs{}, pts...), plotter.XY{X: sp.T[len(sp.T)-1], Y: 0}, plotter.XY{X: 0, Y: 0}))
	if err != nil {
		return nil, err
	}
	poly.Color = color.NRGBA{0x1f, 0x5f, 0xa8, 0x38}
	poly.LineStyle.Width = 0
	if sp.Stops {
		p.Add(poly) // the shaded distance: only for a stop
	}
	l, err := plotter.NewLine(pts)
	if err != nil {
		return nil, err
	}
	l.Color, l.Width = color.RGBA{0x1f, 0x5f, 0xa8, 0xff}, vg.Points(1.6)
	p.Add(l)
	for _, m := range marks {
		if m.horizontal {
			h, err := plotter.NewLine(plotter.XYs{{X: 0, Y: m.at}, {X: xmax, Y: m.at}})
			if err != nil {
				return nil, err
			}
			h.Color, h.Width, h.Dashes = m.col, vg.Points(1), []vg.Length{vg.Points(4), vg.Points(3)}
			p.Add(h)
			lb, err := plotter.NewLabels(plotter.XYLabels{XYs: plotter.XYs{{X: xmax * 0.02, Y: m.at}}, Labels: []string{m.label}})
			if err != nil {
				return nil, err
			}
			lb.TextStyle[0].Font.Size, lb.TextStyle[0].Color, lb.TextStyle[0].YAlign = vg.Points(8), m.col, 0.2
			lb.TextStyle[0].Font.Variant = "Sans"
			p.Add(lb)
			continue
		}
		if err := vline(p, m.at, 0, vmax*1.12, m.col, true, m.label); err != nil {
			return nil, err
		}
	}
	noteX := 0.45
	if noteLeft {
		noteX = 0.04
	}
	if sp.Note != "" || !math.IsNaN(sp.Distance) {
		text := sp.Note
		if !math.IsNaN(sp.Distance) && sp.Note == "" {
			text = fmt.Sprintf("distance (shaded) %.4g m", sp.Distance)
		}
		lb, err := plotter.NewLabels(plotter.XYLabels{XYs: plotter.XYs{{X: noteX * xmax, Y: vmax * 1.15}}, Labels: []string{text}})
		if err != nil {
			return nil, err
		}
		lb.TextStyle[0].Font.Size, lb.TextStyle[0].Color, lb.TextStyle[0].Font.Variant = vg.Points(9), colInk, "Sans"
		p.Add(lb)
	}
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = 0, xmax, 0, vmax*1.25
	return p, nil
}

// mark is a labelled line across a speed plot: at a time (vertical) or a speed.
type mark struct {
	at         float64
	horizontal bool
	label      string
	col        color.Color
}
