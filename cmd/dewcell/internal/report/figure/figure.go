package figure

import (
	"bytes"
	"fmt"
	"html"
	"image/png"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"

	"dewcell/cmd/dewcell/internal/report"
)

// Resolutions of PNG images, in dots per inch.
const (
	DefaultDPI = 150 // PNG's resolution when it is given 0
	MaxDPI     = 600
)

// SVG draws f as a standalone SVG document, 16 cm by 10 cm.
//
// It fails when f has neither series nor marks, when nothing of them can
// be placed on the axes (no finite point; no positive one on a logarithmic
// axis), when a series has more x values than y values or fewer, or when
// a logarithmic axis is given a fixed range that is not above zero. The
// error names the figure.
func SVG(f *report.Figure) ([]byte, error) {
	s, err := newScene(f)
	if err != nil {
		return nil, err
	}
	return s.svg(false)
}

// InlineSVG draws f as an <svg> element to be put inside an HTML page: no
// XML declaration, a viewBox with width 100% and a max-width of the
// figure's size, so that it scales with the page and never grows beyond
// 16 cm. It uses no ids (several figures can share a page), no scripts and
// no links, and carries the title as its accessible name. It fails as SVG
// does.
func InlineSVG(f *report.Figure) ([]byte, error) {
	s, err := newScene(f)
	if err != nil {
		return nil, err
	}
	return s.svg(true)
}

// PNG draws f as a PNG image, 16 cm by 10 cm at dpi dots per inch (0 means
// DefaultDPI): 945 by 591 pixels at 150 dpi. It fails as SVG does, and for
// a resolution outside 1 to MaxDPI.
func PNG(f *report.Figure, dpi int) ([]byte, error) {
	if dpi == 0 {
		dpi = DefaultDPI
	}
	if dpi < 1 || dpi > MaxDPI {
		return nil, fmt.Errorf("figure %s: a resolution of %d dpi is outside 1 to %d", figureNameOrNil(f), dpi, MaxDPI)
	}
	s, err := newScene(f)
	if err != nil {
		return nil, err
	}
	c := vgimg.NewWith(vgimg.UseWH(width, height), vgimg.UseDPI(dpi))
	s.draw(draw.New(c))
	var buf bytes.Buffer
	enc := png.Encoder{CompressionLevel: png.DefaultCompression}
	if err := enc.Encode(&buf, c.Image()); err != nil {
		return nil, fmt.Errorf("figure %s: %v", figureName(f), err)
	}
	return buf.Bytes(), nil
}

func figureNameOrNil(f *report.Figure) string {
	if f == nil {
		return "(none)"
	}
	return figureName(f)
}

// svgBody is how the drawing library begins the drawing itself: the group
// that puts the origin at the bottom left. What comes before it (an XML
// declaration, a comment and the <svg> start tag) is replaced.
const svgBody = `<g transform="scale(1, -1) translate(0, -`

// svgFont is the font family as the drawing library writes it, and the
// list written instead, with fonts of the same metrics for viewers that do
// not have it.
const (
	svgFont     = "font-family:Liberation Sans;"
	svgFontList = "font-family:'Liberation Sans',Arial,Helvetica,sans-serif;"
)

// svg draws s and writes the SVG, standalone or for inlining.
func (s *scene) svg(inline bool) ([]byte, error) {
	c := vgsvg.New(width, height)
	s.draw(draw.New(c))
	var raw bytes.Buffer
	if _, err := c.WriteTo(&raw); err != nil {
		return nil, fmt.Errorf("figure %s: %v", s.name, err)
	}
	i := bytes.Index(raw.Bytes(), []byte(svgBody))
	if i < 0 {
		return nil, fmt.Errorf("figure %s: the SVG drawing has an unexpected form", s.name)
	}
	body := bytes.ReplaceAll(raw.Bytes()[i:], []byte(svgFont), []byte(svgFontList))

	var b bytes.Buffer
	w, h := num(width), num(height)
	title := html.EscapeString(s.title)
	if inline {
		fmt.Fprintf(&b, `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 %s %s" width="100%%" style="max-width:16cm;height:auto" role="img"`, w, h)
		if s.title != "" {
			fmt.Fprintf(&b, ` aria-label="%s"`, title)
		}
		b.WriteString(">\n")
	} else {
		b.WriteString(`<?xml version="1.0" encoding="UTF-8"?>` + "\n")
		fmt.Fprintf(&b, `<svg xmlns="http://www.w3.org/2000/svg" version="1.1" width="16cm" height="10cm" viewBox="0 0 %s %s">`+"\n", w, h)
	}
	if s.title != "" {
		fmt.Fprintf(&b, "<title>%s</title>\n", title)
	}
	b.Write(body)
	return b.Bytes(), nil
}

// num writes a length in points as the drawing library writes its
// coordinates, to 5 significant digits.
func num(l vg.Length) string { return fmt.Sprintf("%.5g", l.Points()) }
