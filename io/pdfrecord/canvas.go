package pdfrecord

import (
	"bytes"
	"fmt"
	"image"
	"image/color"
	"image/png"
	"math"

	"codeberg.org/go-pdf/fpdf"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/vg"
)

// canvas draws a plot as vector graphics into a region of the record's page: a
// vg.Canvas over the record's own fpdf document, so the plots are sharp at any zoom and
// their text can be read back. It follows gonum's vgpdf (which writes a PDF of its own
// and so cannot draw into ours): the region's origin is moved to its bottom left corner
// and the y axis flipped, as vg draws upwards; lengths are in mm, the document's unit.
//
// Text is set in the plot's own font (Liberation Sans, gonum's default), embedded in
// the document as a UTF-8 TrueType font, so that the widths gonum lays labels out with
// are the widths printed.
type canvas struct {
	doc   *fpdf.Fpdf
	w, h  vg.Length
	fonts map[string]bool // font families registered with doc
	width []vg.Length     // line width, a stack beside doc's transformation stack
	img   *int            // images drawn into doc so far (for unique names)
	err   error
}

// newCanvas starts drawing a w × h region whose top left corner is (x, y) mm on the
// current page. End must be called when the plot is drawn.
func newCanvas(doc *fpdf.Fpdf, x, y float64, w, h vg.Length, fonts map[string]bool, images *int) *canvas {
	c := &canvas{doc: doc, w: w, h: h, fonts: fonts, width: []vg.Length{vg.Points(1)}, img: images}
	doc.TransformBegin()
	doc.TransformTranslate(x, y)
	c.Push()
	c.Translate(vg.Point{X: 0, Y: h})
	c.Scale(1, -1)
	return c
}

// End closes the region's transformations and reports the first error met.
func (c *canvas) End() error {
	c.Pop()
	c.doc.TransformEnd()
	// The PDF's graphics state is restored, fpdf's idea of it is not: set what follows
	// explicitly (a fill unlike the text colour makes fpdf state the text's colour).
	c.doc.SetDashPattern(nil, 0)
	c.doc.SetAlpha(1, "Normal")
	c.doc.SetFillColor(255, 255, 255)
	c.doc.SetDrawColor(0, 0, 0)
	c.doc.SetTextColor(0, 0, 0)
	return c.err
}

// mm converts a vg length to the document's unit.
func mm(l vg.Length) float64 { return l.Points() * 25.4 / 72 }

func (c *canvas) Size() (w, h vg.Length) { return c.w, c.h }

// DPI is the resolution lengths are measured in: points.
func (c *canvas) DPI() float64 { return 72 }

func (c *canvas) SetLineWidth(w vg.Length) {
	c.width[len(c.width)-1] = w
	c.doc.SetLineWidth(mm(w))
}

func (c *canvas) SetLineDash(dashes []vg.Length, offs vg.Length) {
	ds := make([]float64, len(dashes))
	for i, d := range dashes {
		ds[i] = mm(d)
	}
	c.doc.SetDashPattern(ds, mm(offs))
}

func (c *canvas) SetColor(clr color.Color) {
	if clr == nil {
		clr = color.Black
	}
	n := color.NRGBAModel.Convert(clr).(color.NRGBA)
	c.doc.SetFillColor(int(n.R), int(n.G), int(n.B))
	c.doc.SetDrawColor(int(n.R), int(n.G), int(n.B))
	c.doc.SetTextColor(int(n.R), int(n.G), int(n.B))
	c.doc.SetAlpha(float64(n.A)/255, "Normal")
}

func (c *canvas) Rotate(rad float64) { c.doc.TransformRotate(-rad*180/math.Pi, 0, 0) }

func (c *canvas) Translate(pt vg.Point) { c.doc.TransformTranslate(mm(pt.X), mm(pt.Y)) }

func (c *canvas) Scale(x, y float64) { c.doc.TransformScale(x*100, y*100, 0, 0) }

func (c *canvas) Push() {
	c.width = append(c.width, c.width[len(c.width)-1])
	c.doc.TransformBegin()
}

func (c *canvas) Pop() {
	c.doc.TransformEnd()
	c.width = c.width[:len(c.width)-1]
	c.doc.SetLineWidth(mm(c.width[len(c.width)-1]))
}

func (c *canvas) Stroke(p vg.Path) {
	if c.width[len(c.width)-1] > 0 {
		c.path(p, "D")
	}
}

func (c *canvas) Fill(p vg.Path) { c.path(p, "F") }

// FillString sets text with its baseline's left end at pt.
func (c *canvas) FillString(f font.Face, pt vg.Point, s string) {
	if f.Font.Size == 0 || s == "" {
		return
	}
	family := f.Name()
	if !c.fonts[family] {
		var b bytes.Buffer
		if _, err := f.Face.WriteSourceTo(nil, &b); err != nil {
			c.fail(fmt.Errorf("pdfrecord: the plot font %s: %w", family, err))
			return
		}
		c.doc.AddUTF8FontFromBytes(family, "", b.Bytes())
		c.fonts[family] = true
	}
	size := f.Font.Size.Points()
	c.doc.SetFont(family, "", size)
	c.Push()
	defer c.Pop()
	c.Translate(pt)
	c.Scale(1, -1)      // back to the page's downward y for the glyphs
	c.doc.Text(0, 0, s) // its baseline's left end at the origin
}

// DrawImage draws an image (the plots here draw none; heat maps would).
func (c *canvas) DrawImage(rect vg.Rectangle, img image.Image) {
	var b bytes.Buffer
	if err := png.Encode(&b, img); err != nil {
		c.fail(fmt.Errorf("pdfrecord: a plot's image: %w", err))
		return
	}
	*c.img++
	name := fmt.Sprintf("plotimage%d", *c.img)
	opt := fpdf.ImageOptions{ImageType: "PNG"}
	c.doc.RegisterImageOptionsReader(name, opt, &b)
	c.doc.ImageOptions(name, mm(rect.Min.X), mm(rect.Min.Y), mm(rect.Size().X), mm(rect.Size().Y), false, opt, 0, "")
}

func (c *canvas) fail(err error) {
	if c.err == nil {
		c.err = err
	}
}

// path draws a vg path: style "D" strokes, "F" fills.
func (c *canvas) path(p vg.Path, style string) {
	var x0, y0 float64
	for _, comp := range p {
		switch comp.Type {
		case vg.MoveComp:
			x0, y0 = mm(comp.Pos.X), mm(comp.Pos.Y)
			c.doc.MoveTo(x0, y0)
		case vg.LineComp:
			c.doc.LineTo(mm(comp.Pos.X), mm(comp.Pos.Y))
		case vg.ArcComp:
			c.arc(comp, style)
		case vg.CurveComp:
			px, py := mm(comp.Pos.X), mm(comp.Pos.Y)
			switch len(comp.Control) {
			case 1:
				c.doc.CurveTo(mm(comp.Control[0].X), mm(comp.Control[0].Y), px, py)
			case 2:
				c.doc.CurveBezierCubicTo(mm(comp.Control[0].X), mm(comp.Control[0].Y), mm(comp.Control[1].X), mm(comp.Control[1].Y), px, py)
			default:
				c.fail(fmt.Errorf("pdfrecord: a plot curve with %d control points", len(comp.Control)))
				return
			}
		case vg.CloseComp:
			c.doc.LineTo(x0, y0)
			c.doc.ClosePath()
		default:
			c.fail(fmt.Errorf("pdfrecord: unknown plot path component %d", comp.Type))
			return
		}
	}
	c.doc.DrawPath(style)
}

func (c *canvas) arc(comp vg.PathComp, style string) {
	x0 := comp.Pos.X + comp.Radius*vg.Length(math.Cos(comp.Start))
	y0 := comp.Pos.Y + comp.Radius*vg.Length(math.Sin(comp.Start))
	c.doc.LineTo(mm(x0), mm(y0))
	r := mm(comp.Radius)
	const deg = 180 / math.Pi
	beg := comp.Start * deg
	c.doc.Arc(mm(comp.Pos.X), mm(comp.Pos.Y), r, r, 0, beg, beg+comp.Angle*deg, style)
	x1 := comp.Pos.X + comp.Radius*vg.Length(math.Cos(comp.Start+comp.Angle))
	y1 := comp.Pos.Y + comp.Radius*vg.Length(math.Sin(comp.Start+comp.Angle))
	c.doc.MoveTo(mm(x1), mm(y1))
}
