package figure

import (
	"image/color"
	"math"
	"sync"

	xfont "golang.org/x/image/font"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/font/liberation"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"dewcell/cmd/dewcell/internal/report"
)

// Sizes, in points at the default size of the figure.
const (
	width  = 16 * vg.Centimeter
	height = 10 * vg.Centimeter

	outerMargin = 6 // around everything

	titleSize  = 12
	labelSize  = 11 // axis labels
	textSize   = 10 // ticks, legend, marks and reference lines
	seriesLine = 1.75
	refWidth   = 1
	frameLine  = 0.75
	gridLine   = 0.5

	markerRadius = 3.5 // markers of Points and LinePoints series
	markerLine   = 1.2 // their outline
	dotRadius    = 2   // a point left alone on a line
	markRadius   = 4.5 // marks
)

// palette holds the colours of the series, in the order they are taken:
// five of the palette of Okabe and Ito (blue, bluish green, orange, sky
// blue, reddish purple) and seven of Tol's qualitative schemes (vibrant
// red; bright red and purple; muted indigo, wine, olive and green).
//
//   - Okabe, M. and Ito, K. (2008). Color Universal Design (CUD): how to
//     make figures and presentations that are friendly to colorblind
//     people. https://jfly.iam.u-tokyo.ac.jp/color/
//   - Tol, P. (2021). Colour schemes. SRON Technical Note
//     SRON/EPS/TN/09-002, issue 3.2.
//
// Of the colours of those schemes (leaving out black, the greys, and the
// yellows and pale colours too light for a line on white), they are twelve
// whose closest pair is as far apart as any twelve allow, by the CIELAB
// difference under normal vision and under the simulations of protanopia,
// deuteranopia and tritanopia of Machado, Oliveira and Fernandes (2009):
// every pair is at least 10 units apart in all four, and the first eight,
// for figures of few series, at least 15 (TestPaletteDistinct).
var palette = []color.NRGBA{
	{0x00, 0x72, 0xB2, 0xFF}, // blue (Okabe–Ito)
	{0xCC, 0x33, 0x11, 0xFF}, // red (Tol vibrant)
	{0x00, 0x9E, 0x73, 0xFF}, // bluish green (Okabe–Ito)
	{0xE6, 0x9F, 0x00, 0xFF}, // orange (Okabe–Ito)
	{0x33, 0x22, 0x88, 0xFF}, // indigo (Tol muted)
	{0x56, 0xB4, 0xE9, 0xFF}, // sky blue (Okabe–Ito)
	{0x88, 0x22, 0x55, 0xFF}, // wine (Tol muted)
	{0xCC, 0x79, 0xA7, 0xFF}, // reddish purple (Okabe–Ito)
	{0x99, 0x99, 0x33, 0xFF}, // olive (Tol muted)
	{0xEE, 0x66, 0x77, 0xFF}, // red (Tol bright)
	{0x11, 0x77, 0x33, 0xFF}, // green (Tol muted)
	{0xAA, 0x33, 0x77, 0xFF}, // purple (Tol bright)
}

var (
	black     = color.NRGBA{0, 0, 0, 0xFF}
	white     = color.NRGBA{0xFF, 0xFF, 0xFF, 0xFF}
	refColour = color.NRGBA{0x55, 0x55, 0x55, 0xFF}
	gridColor = color.NRGBA{0xDD, 0xDD, 0xDD, 0xFF}
	boxColour = color.NRGBA{0x99, 0x99, 0x99, 0xFF}
)

// Dash patterns, in points. A series takes its style's first pattern; the
// series after the first twelve, whose colours repeat, take the next ones.
var (
	lineDashes = [][]vg.Length{nil, {9, 2.5, 2, 2.5}, {2, 2}, {9, 2.5, 2, 2.5, 2, 2.5}}
	dashDashes = [][]vg.Length{{6, 3}, {12, 4}, {3, 3}, {12, 3, 3, 3}}
	refDashes  = []vg.Length{1, 2}
)

// seriesLook is how series i of style st is drawn: its line (a zero width
// for none) and its marker (a nil Shape for none).
func seriesLook(i int, st report.Style) (draw.LineStyle, draw.GlyphStyle) {
	c := palette[i%len(palette)]
	round := i / len(palette)
	line := draw.LineStyle{Color: c, Width: seriesLine}
	glyph := draw.GlyphStyle{Color: c, Radius: markerRadius, Shape: seriesShapes[i%len(seriesShapes)]}
	switch st {
	case report.Points:
		line.Width = 0
	case report.LinePoints:
		line.Dashes = lineDashes[round%len(lineDashes)]
	case report.Dashed:
		line.Dashes = dashDashes[round%len(dashDashes)]
		glyph.Shape = nil
	case report.Bars, report.Ranges: // the legend shows a filled square
		line.Width = 0
		glyph.Shape = shape{kind: shapeSquare, filled: true}
	default: // Line, and a style this package does not know
		line.Dashes = lineDashes[round%len(lineDashes)]
		glyph.Shape = nil
	}
	return line, glyph
}

// dotLook is a point of a line series with no neighbour to join.
func dotLook(i int) draw.GlyphStyle {
	return draw.GlyphStyle{Color: palette[i%len(palette)], Radius: dotRadius, Shape: shape{kind: shapeCircle, filled: true}}
}

// markLook is mark i: a filled black shape, each mark its own in turn.
func markLook(i int) draw.GlyphStyle {
	s := markShapes[i%len(markShapes)]
	s.filled, s.halo = true, true
	return draw.GlyphStyle{Color: black, Radius: markRadius, Shape: s}
}

type shapeKind int

const (
	shapeCircle shapeKind = iota
	shapeSquare
	shapeTriangle
	shapeDiamond
	shapeInverted
	shapePlus
	shapeCross
)

var (
	seriesShapes = []shape{{kind: shapeCircle}, {kind: shapeSquare}, {kind: shapeTriangle}, {kind: shapeDiamond},
		{kind: shapeInverted}, {kind: shapePlus}, {kind: shapeCross}}
	markShapes = []shape{{kind: shapeCircle}, {kind: shapeSquare}, {kind: shapeTriangle}, {kind: shapeDiamond},
		{kind: shapeInverted}}
)

// A shape is a marker: open (a white inside, so that a line does not show
// through it) or filled, with an optional white halo that sets it off
// from the lines beneath.
type shape struct {
	kind   shapeKind
	filled bool
	halo   bool
}

var _ draw.GlyphDrawer = shape{}

// DrawGlyph draws s centred on pt, in the canvas's colour, fitting a
// circle of sty.Radius.
func (s shape) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	r := sty.Radius
	if s.kind == shapePlus || s.kind == shapeCross {
		if s.halo {
			c.SetLineStyle(draw.LineStyle{Color: white, Width: markerLine + 2})
			c.Stroke(s.path(pt, r))
		}
		c.SetLineStyle(draw.LineStyle{Color: sty.Color, Width: markerLine})
		c.Stroke(s.path(pt, r))
		return
	}
	if s.halo {
		c.SetColor(white)
		c.Fill(s.path(pt, r+1))
	}
	if s.filled {
		c.SetColor(sty.Color)
		c.Fill(s.path(pt, r))
		return
	}
	c.SetColor(white)
	c.Fill(s.path(pt, r))
	c.SetLineStyle(draw.LineStyle{Color: sty.Color, Width: markerLine})
	c.Stroke(s.path(pt, r-markerLine/2))
}

// path is the outline of s at pt, fitting a circle of radius r; shapes
// with corners are scaled to look about as large as the circle.
func (s shape) path(pt vg.Point, r vg.Length) vg.Path {
	var p vg.Path
	poly := func(scale vg.Length, angles ...float64) {
		for i, a := range angles {
			sin, cos := math.Sincos(a * math.Pi / 180)
			q := vg.Point{X: pt.X + scale*r*vg.Length(cos), Y: pt.Y + scale*r*vg.Length(sin)}
			if i == 0 {
				p.Move(q)
			} else {
				p.Line(q)
			}
		}
		p.Close()
	}
	switch s.kind {
	case shapeSquare:
		poly(1.15, 45, 135, 225, 315)
	case shapeTriangle:
		poly(1.3, 90, 210, 330)
	case shapeInverted:
		poly(1.3, 270, 30, 150)
	case shapeDiamond:
		poly(1.25, 0, 90, 180, 270)
	case shapePlus, shapeCross:
		a := 0.0
		if s.kind == shapeCross {
			a = 45
		}
		for _, d := range []float64{a, a + 90} {
			sin, cos := math.Sincos(d * math.Pi / 180)
			dx, dy := 1.2*r*vg.Length(cos), 1.2*r*vg.Length(sin)
			p.Move(vg.Point{X: pt.X - dx, Y: pt.Y - dy})
			p.Line(vg.Point{X: pt.X + dx, Y: pt.Y + dy})
		}
	default:
		p.Move(vg.Point{X: pt.X + r, Y: pt.Y})
		p.Arc(pt, r, 0, 2*math.Pi)
		p.Close()
	}
	return p
}

// fonts holds the Liberation fonts of gonum/plot, parsed once. A font.Cache
// is safe for concurrent use.
var fonts = sync.OnceValue(func() *font.Cache { return font.NewCache(liberation.Collection()) })

// textStyle is Liberation Sans of size pt in black, bold if asked.
func textStyle(size vg.Length, bold bool) text.Style {
	f := font.Font{Typeface: "Liberation", Variant: "Sans", Size: size}
	if bold {
		f.Weight = xfont.WeightBold
	}
	return text.Style{Color: black, Font: f, Handler: text.Plain{Fonts: fonts()}}
}
