package figure

import (
	"bytes"
	"encoding/xml"
	"errors"
	"html"
	"image"
	"image/png"
	"io"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"sync"
	"testing"

	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/units"
)

// svgText is a <text> element of an SVG: its content, its position as
// written (x, and y as it is in the page, upwards) and its font size, and
// whether it sits in a rotated group.
type svgText struct {
	text    string
	x, y    float64
	size    float64
	rotated bool
}

var fontSize = regexp.MustCompile(`font-size:([0-9.]+)px`)

// parseSVG reads b with encoding/xml, which rejects what is not well-formed
// XML, checks that its root is an svg element of the SVG namespace, and
// returns its texts and the style attributes of its paths.
func parseSVG(t *testing.T, b []byte) (texts []svgText, paths []string) {
	t.Helper()
	d := xml.NewDecoder(bytes.NewReader(b))
	var stack []bool // rotated, per open element
	var cur *svgText
	root := true
	for {
		tok, err := d.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("the SVG is not well-formed XML: %v", err)
		}
		switch e := tok.(type) {
		case xml.StartElement:
			if root {
				if e.Name.Local != "svg" || e.Name.Space != "http://www.w3.org/2000/svg" {
					t.Fatalf("root element %v, want svg in the SVG namespace", e.Name)
				}
				root = false
			}
			rot := len(stack) > 0 && stack[len(stack)-1]
			attr := map[string]string{}
			for _, a := range e.Attr {
				attr[a.Name.Local] = a.Value
			}
			if strings.HasPrefix(attr["transform"], "rotate(") {
				rot = true
			}
			stack = append(stack, rot)
			switch e.Name.Local {
			case "text":
				x, _ := strconv.ParseFloat(attr["x"], 64)
				y, _ := strconv.ParseFloat(attr["y"], 64)
				st := svgText{x: x, y: -y, rotated: rot}
				if m := fontSize.FindStringSubmatch(attr["style"]); m != nil {
					st.size, _ = strconv.ParseFloat(m[1], 64)
				}
				cur = &st
			case "path":
				paths = append(paths, attr["style"])
			}
		case xml.CharData:
			if cur != nil {
				cur.text += string(e)
			}
		case xml.EndElement:
			stack = stack[:len(stack)-1]
			if e.Name.Local == "text" && cur != nil {
				texts = append(texts, *cur)
				cur = nil
			}
		}
	}
	if root {
		t.Fatal("the SVG has no root element")
	}
	return texts, paths
}

// wantTexts are the texts a figure must show: title, axis labels, the
// label of every series, mark and reference line.
func wantTexts(f *report.Figure) []string {
	want := []string{f.Title, f.X.Text(), f.Y.Text()}
	for _, s := range f.Series {
		want = append(want, s.Label)
	}
	for _, m := range f.Marks {
		want = append(want, m.Label)
	}
	for _, l := range f.Lines {
		want = append(want, l.Label)
	}
	return want
}

// TestSVGHoldsTheTexts checks, against Go's XML parser, that the SVG of each
// figure is well-formed, holds every text of the figure as a text element
// (the title once, in bold at 12 px) and no text smaller than 10 px; the
// user unit is the point (a 16 cm width over a viewBox 453.54 wide, 16 cm
// being 453.54 pt by the definitions of the point, 1/72 in, and the inch,
// 2.54 cm), so 10 px is 10 pt at report size.
func TestSVGHoldsTheTexts(t *testing.T) {
	for _, f := range allFigures() {
		b, err := SVG(f)
		if err != nil {
			t.Fatalf("%s: %v", f.Name, err)
		}
		if !bytes.Contains(b, []byte(`width="16cm" height="10cm" viewBox="0 0 453.54 283.46"`)) {
			t.Errorf("%s: the SVG is not 16 cm by 10 cm over a viewBox in points", f.Name)
		}
		texts, _ := parseSVG(t, b)
		have := map[string]int{}
		for _, tx := range texts {
			have[tx.text]++
			if tx.size < 10 {
				t.Errorf("%s: text %q at %g px, want at least 10", f.Name, tx.text, tx.size)
			}
		}
		for _, w := range wantTexts(f) {
			if have[w] == 0 {
				t.Errorf("%s: no text %q in the SVG", f.Name, w)
			}
		}
		if have[f.Title] != 1 {
			t.Errorf("%s: the title appears %d times, want once", f.Name, have[f.Title])
		}
	}
}

// TestSeriesLinesWide checks that every stroke drawn in a series colour is
// at least 1.5 pt wide (the SVG's stroke-width, in points as above), except
// marker outlines, which are 1.2 pt: a series line is its colour at
// 1.75 pt.
func TestSeriesLinesWide(t *testing.T) {
	colour := map[string]bool{}
	for _, c := range palette {
		colour[strings.ToUpper(hexOf(c.R, c.G, c.B))] = true
	}
	strokeRE := regexp.MustCompile(`stroke:(#[0-9A-F]{6})`)
	widthRE := regexp.MustCompile(`stroke-width:([0-9.]+)`)
	for _, f := range allFigures() {
		b, err := SVG(f)
		if err != nil {
			t.Fatal(err)
		}
		_, paths := parseSVG(t, b)
		lines := 0
		for _, st := range paths {
			m := strokeRE.FindStringSubmatch(st)
			if m == nil || !colour[m[1]] {
				continue
			}
			w := 1.0 // the SVG default
			if mw := widthRE.FindStringSubmatch(st); mw != nil {
				w, _ = strconv.ParseFloat(mw[1], 64)
			}
			if w == markerLine {
				continue
			}
			if w < 1.5 {
				t.Errorf("%s: a series stroke %g pt wide, want at least 1.5: %s", f.Name, w, st)
			}
			lines++
		}
		if lines == 0 && f.Name != "p-over-z" {
			t.Errorf("%s: no series line found", f.Name)
		}
	}
}

func hexOf(r, g, b uint8) string {
	const digits = "0123456789ABCDEF"
	s := []byte{'#', 0, 0, 0, 0, 0, 0}
	for i, v := range []uint8{r, g, b} {
		s[1+2*i], s[2+2*i] = digits[v>>4], digits[v&15]
	}
	return string(s)
}

// TestInlineSVG checks that the inline form can go into an HTML page: no
// XML declaration or DOCTYPE, a viewBox with width 100% and a max-width,
// no ids that could clash between figures, no scripts, no links and no
// url() references; and that it holds the same texts as the standalone
// form (parsed with encoding/xml).
func TestInlineSVG(t *testing.T) {
	for _, f := range allFigures() {
		b, err := InlineSVG(f)
		if err != nil {
			t.Fatalf("%s: %v", f.Name, err)
		}
		if !bytes.HasPrefix(b, []byte("<svg ")) {
			t.Errorf("%s: the inline SVG starts %q, want an <svg> element", f.Name, b[:min(len(b), 20)])
		}
		lower := bytes.ToLower(b)
		for _, bad := range []string{"<?xml", "<!doctype", "<script", "href=", " id=", "url(", "javascript:"} {
			if bytes.Contains(lower, []byte(bad)) {
				t.Errorf("%s: the inline SVG contains %q", f.Name, bad)
			}
		}
		for _, need := range []string{`viewBox="0 0 453.54 283.46"`, `width="100%"`, `max-width:16cm`} {
			if !bytes.Contains(b, []byte(need)) {
				t.Errorf("%s: the inline SVG lacks %s", f.Name, need)
			}
		}
		d := xml.NewDecoder(bytes.NewReader(b))
		for {
			tok, err := d.Token()
			if err != nil {
				break
			}
			if e, ok := tok.(xml.StartElement); ok {
				for _, a := range e.Attr {
					if strings.HasPrefix(strings.ToLower(a.Name.Local), "on") || a.Name.Local == "id" {
						t.Errorf("%s: element %s has attribute %s", f.Name, e.Name.Local, a.Name.Local)
					}
				}
			}
		}
		inline, _ := parseSVG(t, b)
		std, err := SVG(f)
		if err != nil {
			t.Fatal(err)
		}
		standalone, _ := parseSVG(t, std)
		if len(inline) != len(standalone) {
			t.Errorf("%s: %d texts inline, %d standalone", f.Name, len(inline), len(standalone))
		}
	}
}

// TestPNGSize checks against image/png that the PNG decodes, at 16 cm by
// 10 cm at the resolution asked: pixels = cm / 2.54 × dpi (the inch being
// 2.54 cm exactly), rounded; 0 dpi is the default of 150.
func TestPNGSize(t *testing.T) {
	f := envelopeFigure()
	for _, dpi := range []int{0, 72, 96, 150, 300} {
		b, err := PNG(f, dpi)
		if err != nil {
			t.Fatalf("dpi %d: %v", dpi, err)
		}
		img, err := png.Decode(bytes.NewReader(b))
		if err != nil {
			t.Fatalf("dpi %d: the PNG does not decode: %v", dpi, err)
		}
		d := float64(dpi)
		if dpi == 0 {
			d = 150
		}
		want := image.Pt(int(math.Round(16/2.54*d)), int(math.Round(10/2.54*d)))
		if got := img.Bounds().Size(); got != want {
			t.Errorf("dpi %d: %v pixels, want %v", dpi, got, want)
		}
	}
	for _, dpi := range []int{-1, MaxDPI + 1} {
		if _, err := PNG(f, dpi); err == nil || !strings.Contains(err.Error(), "phase-envelope") {
			t.Errorf("dpi %d: error %v, want one naming the figure", dpi, err)
		}
	}
}

// TestDeterministic checks that the same figure gives the same bytes,
// twice in a row and drawn from several goroutines at once.
func TestDeterministic(t *testing.T) {
	figs := allFigures()
	type out struct{ svg, inline, png []byte }
	render := func(f *report.Figure) (o out) {
		var err error
		if o.svg, err = SVG(f); err != nil {
			t.Error(err)
		}
		if o.inline, err = InlineSVG(f); err != nil {
			t.Error(err)
		}
		if o.png, err = PNG(f, 96); err != nil {
			t.Error(err)
		}
		return o
	}
	first := make([]out, len(figs))
	for i, f := range figs {
		first[i] = render(f)
	}
	again := make([]out, len(figs))
	var wg sync.WaitGroup
	for i, f := range figs {
		wg.Add(1)
		go func() {
			defer wg.Done()
			again[i] = render(f)
		}()
	}
	wg.Wait()
	for i, f := range figs {
		a, b := first[i], again[i]
		if !bytes.Equal(a.svg, b.svg) || !bytes.Equal(a.inline, b.inline) || !bytes.Equal(a.png, b.png) {
			t.Errorf("%s: two drawings differ", f.Name)
		}
	}
}

// TestLogAxisDropsNonPositive checks that points at or below zero on a
// logarithmic axis are left out as a NaN would be (the drawing is the same
// byte for byte), and that a figure left with nothing is an error that
// names the figure and the axis.
func TestLogAxisDropsNonPositive(t *testing.T) {
	mk := func(y []float64) *report.Figure {
		return &report.Figure{Name: "log-test", Title: "Log test",
			X:      report.Axis{Label: "Pressure", Unit: units.Psia},
			Y:      report.Axis{Label: "Mole fraction", Log: true},
			Series: []report.Series{{Label: "C7+", X: []float64{1, 2, 3, 4, 5}, Y: y}}}
	}
	withZero, err := SVG(mk([]float64{0.1, 0, 0.03, -1, 0.01}))
	if err != nil {
		t.Fatalf("non-positive values on a log axis: %v, want them dropped", err)
	}
	withNaN, err := SVG(mk([]float64{0.1, math.NaN(), 0.03, math.NaN(), 0.01}))
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(withZero, withNaN) {
		t.Error("zero and negative values on a log axis are not drawn as NaN would be")
	}
	texts, _ := parseSVG(t, withZero)
	for _, tx := range texts {
		if v, err := strconv.ParseFloat(tx.text, 64); err == nil && v <= 0 {
			t.Errorf("tick label %q on a figure with a log y axis", tx.text)
		}
	}
	_, err = SVG(mk([]float64{0, -1, 0, -2, 0}))
	if err == nil || !strings.Contains(err.Error(), `"log-test"`) || !strings.Contains(err.Error(), "logarithmic y axis") {
		t.Errorf("nothing positive on a log axis: error %v, want one naming the figure and the axis", err)
	}
	fixed := mk([]float64{0.1, 0.2, 0.3, 0.4, 0.5})
	fixed.Y.Min, fixed.Y.Max = 0, 1
	if _, err := SVG(fixed); err == nil || !strings.Contains(err.Error(), `"log-test"`) {
		t.Errorf("a fixed log range from 0: error %v, want one naming the figure", err)
	}
}

// TestNothingToDraw checks that a figure without series and marks, or
// whose points are all missing, is an error naming it (by name, or by
// title when it has none), as is a series of unequal x and y.
func TestNothingToDraw(t *testing.T) {
	nan := math.NaN()
	for _, tt := range []struct {
		f    *report.Figure
		want []string
	}{
		{&report.Figure{Name: "empty-one", Title: "Empty"}, []string{`"empty-one"`, "no series and no marks"}},
		{&report.Figure{Title: "Untitled but named by title", Lines: []report.RefLine{{Label: "x", Value: 1}}},
			[]string{`"Untitled but named by title"`, "no series and no marks"}},
		{&report.Figure{Name: "all-nan", Series: []report.Series{{Label: "a", X: []float64{nan, 1}, Y: []float64{2, math.Inf(1)}}}},
			[]string{`"all-nan"`, "no finite point"}},
		{&report.Figure{Name: "no-points", Series: []report.Series{{Label: "a"}}}, []string{`"no-points"`, "no finite point"}},
		{&report.Figure{Name: "ragged", Series: []report.Series{{Label: "dew", X: []float64{1, 2}, Y: []float64{1}}}},
			[]string{`"ragged"`, `"dew"`, "2 x values but 1 y values"}},
		{nil, []string{"no figure"}},
	} {
		for _, render := range []func(*report.Figure) ([]byte, error){SVG, InlineSVG, func(f *report.Figure) ([]byte, error) { return PNG(f, 0) }} {
			b, err := render(tt.f)
			if err == nil {
				t.Errorf("%v: no error, %d bytes", tt.want, len(b))
				continue
			}
			for _, w := range tt.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q, want it to contain %q", err, w)
				}
			}
			if strings.Contains(err.Error(), "report.") || strings.Contains(err.Error(), "figure.") {
				t.Errorf("error %q names a Go package", err)
			}
		}
	}
}

// TestOddInput draws figures a caller may pass by mistake or by chance:
// none may panic; each either draws (an SVG that parses, a PNG that
// decodes) or is an error.
func TestOddInput(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	many := &report.Figure{Name: "many", Title: "Thirty series", X: report.Axis{Label: "x"}, Y: report.Axis{Label: "y"}}
	for i := range 30 {
		many.Series = append(many.Series, report.Series{Label: "series " + strconv.Itoa(i), Style: report.Style(i % 5),
			X: []float64{0, 1, 2}, Y: []float64{float64(i), float64(i) + 1, float64(i) + 0.5}})
	}
	for _, f := range []*report.Figure{
		many,
		{Name: "one-point", Series: []report.Series{{Label: "a", X: []float64{3}, Y: []float64{7}}}},
		{Name: "one-mark", Marks: []report.Mark{{Label: "only", X: 0, Y: 0}}},
		{Name: "lone-points", Series: []report.Series{{Label: "a", X: []float64{1, nan, 3, inf, 5}, Y: []float64{1, 2, 3, 4, 5}}}},
		{Name: "huge", Series: []report.Series{{Label: "a", X: []float64{-1e300, 1e300}, Y: []float64{1, 2}}}},
		{Name: "overflow", Series: []report.Series{{Label: "a", X: []float64{-math.MaxFloat64, math.MaxFloat64}, Y: []float64{1, 2}}}},
		{Name: "flat", Series: []report.Series{{Label: "a", X: []float64{1e10, 1e10 + 1e-3}, Y: []float64{5, 5}}}},
		{Name: "tiny", Series: []report.Series{{Label: "a", X: []float64{1e-300, 2e-300}, Y: []float64{-1e-300, 1e-300}}}},
		{Name: "log-both-reversed", X: report.Axis{Log: true, Reverse: true}, Y: report.Axis{Log: true, Reverse: true},
			Series: []report.Series{{Label: "a", X: []float64{1e-8, 1, 1e8}, Y: []float64{1e-20, 1e-10, 1e20}}}},
		{Name: "log-narrow", Y: report.Axis{Log: true}, Series: []report.Series{{Label: "a", X: []float64{1, 2}, Y: []float64{101, 102}}}},
		{Name: "fixed-away", X: report.Axis{Min: 10, Max: 20}, Y: report.Axis{Min: -5, Max: -1},
			Series: []report.Series{{Label: "a", X: []float64{1, 2, 1e6}, Y: []float64{1, 2, -1e6}}},
			Marks:  []report.Mark{{Label: "away", X: 100, Y: 100}},
			Lines:  []report.RefLine{{Label: "away", Value: 1000}, {Label: "away too", Value: -1000, Vertical: true}}},
		{Name: "fixed-inf", X: report.Axis{Min: math.Inf(-1), Max: 5}, Series: []report.Series{{Label: "a", X: []float64{1, 2}, Y: []float64{1, 2}}}},
		{Name: "bad-text", Title: "bad \xff\xfe text \x00\x07 with\ttabs & <tags> \"quotes\" 'and' \uFFFF",
			X:      report.Axis{Label: "x\x1b[31m"},
			Series: []report.Series{{Label: "<script>alert(1)</script>", X: []float64{1, 2}, Y: []float64{1, 2}}},
			Marks:  []report.Mark{{Label: "a&b", X: 1, Y: 1}}},
		{Name: "long-title", Title: strings.Repeat("A very long title that must be wrapped ", 8),
			Series: []report.Series{{Label: strings.Repeat("long label ", 10), X: []float64{1, 2}, Y: []float64{1, 2}}}},
		{Name: "no-labels", Series: []report.Series{{X: []float64{1, 2}, Y: []float64{1, 2}}}, Marks: []report.Mark{{X: 1, Y: 1}},
			Lines: []report.RefLine{{Value: 1.5}}},
		{Name: "mark-nan", Series: []report.Series{{Label: "a", X: []float64{1, 2}, Y: []float64{1, 2}}},
			Marks: []report.Mark{{Label: "nan", X: nan, Y: 1}, {Label: "inf", X: 1, Y: inf}}},
		{Name: "unknown-style", Series: []report.Series{{Label: "a", Style: report.Style(99), X: []float64{1, 2}, Y: []float64{1, 2}}}},
		{Name: "many-marks", Series: []report.Series{{Label: "a", X: []float64{0, 1}, Y: []float64{0, 1}}},
			Marks: func() (ms []report.Mark) {
				for i := range 40 {
					ms = append(ms, report.Mark{Label: "mark " + strconv.Itoa(i), X: 0.5, Y: 0.5})
				}
				return ms
			}()},
	} {
		func() {
			defer func() {
				if r := recover(); r != nil {
					t.Errorf("%s: panic: %v", f.Name, r)
				}
			}()
			b, err := SVG(f)
			if err != nil {
				t.Logf("%s: %v", f.Name, err)
				return
			}
			parseSVG(t, b)
			if b, err = InlineSVG(f); err != nil {
				t.Errorf("%s: SVG draws but InlineSVG fails: %v", f.Name, err)
			}
			parseSVG(t, b)
			p, err := PNG(f, 72)
			if err != nil {
				t.Errorf("%s: SVG draws but PNG fails: %v", f.Name, err)
				return
			}
			if _, err := png.Decode(bytes.NewReader(p)); err != nil {
				t.Errorf("%s: the PNG does not decode: %v", f.Name, err)
			}
		}()
	}
}

// TestOddInputDrawn checks which of the odd figures must draw: all of them
// but the one whose range overflows.
func TestOddInputDrawn(t *testing.T) {
	huge := &report.Figure{Name: "overflow", Series: []report.Series{{Label: "a", X: []float64{-math.MaxFloat64, math.MaxFloat64}, Y: []float64{1, 2}}}}
	if _, err := SVG(huge); err == nil || !strings.Contains(err.Error(), `"overflow"`) {
		t.Errorf("a range past the largest float: %v, want an error naming the figure", err)
	}
	for _, f := range []*report.Figure{
		{Name: "one-point", Series: []report.Series{{Label: "a", X: []float64{3}, Y: []float64{7}}}},
		{Name: "one-mark", Marks: []report.Mark{{Label: "only", X: 0, Y: 0}}},
		{Name: "flat", Series: []report.Series{{Label: "a", X: []float64{1e10, 1e10 + 1e-3}, Y: []float64{5, 5}}}},
	} {
		b, err := SVG(f)
		if err != nil {
			t.Errorf("%s: %v, want it drawn", f.Name, err)
			continue
		}
		texts, _ := parseSVG(t, b)
		numbers := 0
		for _, tx := range texts {
			if _, err := strconv.ParseFloat(tx.text, 64); err == nil {
				numbers++
			}
		}
		if numbers < 4 {
			t.Errorf("%s: %d tick labels, want both axes labelled", f.Name, numbers)
		}
	}
}

// axisLabels are the tick labels of the x axis (the numeric texts that
// share one baseline, the most of them) and of the y axis (the other
// numeric texts), each with its position along its axis.
func axisLabels(texts []svgText) (x, y []svgText) {
	byY := map[float64][]svgText{}
	var nums []svgText
	for _, tx := range texts {
		if _, err := strconv.ParseFloat(tx.text, 64); err == nil && !tx.rotated {
			byY[tx.y] = append(byY[tx.y], tx)
			nums = append(nums, tx)
		}
	}
	var base float64
	for yy, g := range byY {
		if len(g) > len(byY[base]) || len(g) == len(byY[base]) && yy < base {
			base = yy
		}
	}
	x = byY[base]
	for _, tx := range nums {
		if tx.y != base {
			y = append(y, tx)
		}
	}
	return x, y
}

func values(ts []svgText) []float64 {
	var v []float64
	for _, t := range ts {
		f, _ := strconv.ParseFloat(t.text, 64)
		v = append(v, f)
	}
	return v
}

// TestTickLabelsCoverData checks the drawn tick labels of every figure
// against its data: on a linear axis they are evenly spaced and the data
// lie within a spacing of their ends; on a logarithmic axis they are 1, 2
// or 5 times powers of ten and the data lie within a factor of 10 of their
// ends; along the axis they rise left to right (bottom to top), or fall
// when the axis is reversed.
func TestTickLabelsCoverData(t *testing.T) {
	for _, f := range allFigures() {
		b, err := SVG(f)
		if err != nil {
			t.Fatal(err)
		}
		texts, _ := parseSVG(t, b)
		xl, yl := axisLabels(texts)
		for _, ax := range []struct {
			name   string
			a      report.Axis
			labels []svgText
			pos    func(svgText) float64
			data   func() []float64
		}{
			{"x", f.X, xl, func(s svgText) float64 { return s.x }, func() (v []float64) {
				for _, s := range f.Series {
					v = append(v, s.X...)
				}
				for _, m := range f.Marks {
					v = append(v, m.X)
				}
				return v
			}},
			{"y", f.Y, yl, func(s svgText) float64 { return s.y }, func() (v []float64) {
				for _, s := range f.Series {
					v = append(v, s.Y...)
				}
				for _, m := range f.Marks {
					v = append(v, m.Y)
				}
				return v
			}},
		} {
			if len(ax.labels) < 3 {
				t.Errorf("%s %s axis: %d tick labels, want at least 3", f.Name, ax.name, len(ax.labels))
				continue
			}
			sort.Slice(ax.labels, func(i, j int) bool { return ax.pos(ax.labels[i]) < ax.pos(ax.labels[j]) })
			v := values(ax.labels)
			for i := 1; i < len(v); i++ {
				if rising := v[i] > v[i-1]; rising == ax.a.Reverse {
					t.Errorf("%s %s axis: labels %v along the axis, reversed %v", f.Name, ax.name, v, ax.a.Reverse)
					break
				}
			}
			sort.Float64s(v)
			lo, hi := v[0], v[len(v)-1]
			dlo, dhi := math.Inf(1), math.Inf(-1)
			for _, d := range ax.data() {
				if !math.IsNaN(d) && (!ax.a.Log || d > 0) {
					dlo, dhi = math.Min(dlo, d), math.Max(dhi, d)
				}
			}
			if ax.a.Log {
				for _, x := range v {
					m := x / math.Pow(10, math.Floor(math.Log10(x)+1e-9))
					if math.Abs(m-1) > 1e-9 && math.Abs(m-2) > 1e-9 && math.Abs(m-5) > 1e-9 {
						t.Errorf("%s %s axis: log tick label %g is not 1, 2 or 5 times a power of ten", f.Name, ax.name, x)
					}
				}
				if dlo < lo/10 || dhi > hi*10 {
					t.Errorf("%s %s axis: labels %g to %g, data %g to %g", f.Name, ax.name, lo, hi, dlo, dhi)
				}
				continue
			}
			step := v[1] - v[0]
			for i := 2; i < len(v); i++ {
				if math.Abs(v[i]-v[i-1]-step) > 1e-9*math.Max(1, math.Abs(step)) {
					t.Errorf("%s %s axis: labels %v not evenly spaced", f.Name, ax.name, v)
					break
				}
			}
			if dlo < lo-step || dhi > hi+step {
				t.Errorf("%s %s axis: labels %g to %g by %g, data %g to %g", f.Name, ax.name, lo, hi, step, dlo, dhi)
			}
		}
	}
}

// TestMarksWhereTheScalesPutThem checks where marks land in the PNG: at
// the point of the data area that the definitions of the scales give (a
// reversed linear x, a logarithmic y, fixed ranges), which must also be
// where gonum/plot's own transforms put it, and not at the mirror image a
// forgotten reversal would give.
func TestMarksWhereTheScalesPutThem(t *testing.T) {
	f := &report.Figure{
		Name:   "mapping",
		Title:  "Marks on a reversed linear x and a logarithmic y",
		X:      report.Axis{Label: "Pressure", Unit: units.Psia, Min: 1000, Max: 5000, Reverse: true},
		Y:      report.Axis{Label: "Mole fraction", Log: true, Min: 1e-3, Max: 1},
		Series: []report.Series{{Label: "a", X: []float64{1000, 5000}, Y: []float64{0.002, 0.002}}},
		Marks:  []report.Mark{{Label: "one", X: 4500, Y: 0.01}, {Label: "two", X: 1500, Y: 0.5}, {Label: "three", X: 2000, Y: 0.05}},
	}
	const dpi = 150
	s, err := newScene(f)
	if err != nil {
		t.Fatal(err)
	}
	c := vgimg.NewWith(vgimg.UseWH(width, height), vgimg.UseDPI(dpi))
	p, dc := s.draw(draw.New(c))
	trX, trY := p.Transforms(&dc)

	b, err := PNG(f, dpi)
	if err != nil {
		t.Fatal(err)
	}
	img, err := png.Decode(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	dark := func(x, y float64) bool { // x, y in points from the lower left
		px := int(math.Round(x / 72 * dpi))
		py := img.Bounds().Dy() - int(math.Round(y/72*dpi))
		r, g, bl, _ := img.At(px, py).RGBA()
		return r < 0x3000 && g < 0x3000 && bl < 0x3000
	}
	x0, x1 := float64(dc.Min.X), float64(dc.Max.X)
	y0, y1 := float64(dc.Min.Y), float64(dc.Max.Y)
	for _, m := range f.Marks {
		// Reversed linear: 5000 at the left edge, 1000 at the right.
		wantX := x0 + (5000-m.X)/(5000-1000)*(x1-x0)
		// Logarithmic: the share of the decades from 1e-3 to 1.
		wantY := y0 + math.Log10(m.Y/1e-3)/math.Log10(1/1e-3)*(y1-y0)
		if gx, gy := float64(trX(m.X)), float64(trY(m.Y)); math.Abs(gx-wantX) > 1e-6 || math.Abs(gy-wantY) > 1e-6 {
			t.Errorf("mark %s: gonum/plot puts it at (%g, %g) pt, the scales at (%g, %g)", m.Label, gx, gy, wantX, wantY)
		}
		// The mark's disc has a radius of 4.5 pt: its centre and points
		// 2 pt around it are black.
		for _, d := range [][2]float64{{0, 0}, {2, 0}, {-2, 0}, {0, 2}, {0, -2}} {
			if !dark(wantX+d[0], wantY+d[1]) {
				t.Errorf("mark %s: no mark at (%g, %g) pt", m.Label, wantX+d[0], wantY+d[1])
			}
		}
		if mirror := x0 + x1 - wantX; dark(mirror, wantY) {
			t.Errorf("mark %s: something dark at the mirror image (%g, %g) pt", m.Label, mirror, wantY)
		}
	}
}

// TestLabelsInsidePlot checks that the labels of marks near the corners of
// the data area are drawn inside it: their left ends (the x of the SVG
// text) and right ends (plus the width the font gives) lie within it.
func TestLabelsInsidePlot(t *testing.T) {
	f := &report.Figure{
		Name:   "corners",
		X:      report.Axis{Label: "x", Min: 0, Max: 10},
		Y:      report.Axis{Label: "y", Min: 0, Max: 10},
		Series: []report.Series{{X: []float64{0, 10}, Y: []float64{5, 5}}},
		Marks: []report.Mark{
			{Label: "lower left corner", X: 0, Y: 0}, {Label: "upper right corner", X: 10, Y: 10},
			{Label: "upper left corner", X: 0, Y: 10}, {Label: "lower right corner", X: 10, Y: 0},
			{Label: "right edge", X: 10, Y: 5},
		},
	}
	s, err := newScene(f)
	if err != nil {
		t.Fatal(err)
	}
	c := vgimg.NewWith(vgimg.UseWH(width, height), vgimg.UseDPI(72))
	_, dc := s.draw(draw.New(c))
	b, err := SVG(f)
	if err != nil {
		t.Fatal(err)
	}
	texts, _ := parseSVG(t, b)
	sty := textStyle(textSize, false)
	found := 0
	for _, tx := range texts {
		if !strings.Contains(tx.text, "corner") && !strings.Contains(tx.text, "edge") {
			continue
		}
		found++
		w := float64(sty.Width(tx.text))
		const slack = 0.01 // the SVG's coordinates have 5 digits
		if tx.x < float64(dc.Min.X)-slack || tx.x+w > float64(dc.Max.X)+slack || tx.y < float64(dc.Min.Y)-slack || tx.y > float64(dc.Max.Y)+slack {
			t.Errorf("label %q from x %g to %g at y %g, outside the data area %v", tx.text, tx.x, tx.x+w, tx.y, dc.Rectangle)
		}
	}
	if found != len(f.Marks) {
		t.Errorf("%d mark labels found, want %d", found, len(f.Marks))
	}
}

// TestLegendPlacement checks that the legend lies inside the plot where a
// corner is free (the p/Z figure's upper right) and beside it when the
// curves fill the corners (the composition figure), by where the SVG
// draws the first series label relative to the data area.
func TestLegendPlacement(t *testing.T) {
	for _, tt := range []struct {
		f      *report.Figure
		inside bool
	}{{pzFigure(), true}, {compositionFigure(), false}} {
		s, err := newScene(tt.f)
		if err != nil {
			t.Fatal(err)
		}
		c := vgimg.NewWith(vgimg.UseWH(width, height), vgimg.UseDPI(72))
		_, dc := s.draw(draw.New(c))
		b, err := SVG(tt.f)
		if err != nil {
			t.Fatal(err)
		}
		texts, _ := parseSVG(t, b)
		label := tt.f.Series[0].Label
		for _, tx := range texts {
			if tx.text != label {
				continue
			}
			if in := tx.x > float64(dc.Min.X) && tx.x < float64(dc.Max.X); in != tt.inside {
				t.Errorf("%s: legend entry %q at x %g, data area %g to %g; want inside %v", tt.f.Name, label, tx.x, dc.Min.X, dc.Max.X, tt.inside)
			}
		}
	}
}

// TestRealisticFigures draws the figures of fixtures_test.go in every
// format; with DEWCELL_FIGURE_SAMPLES set to a folder it writes them there
// to be looked at.
func TestRealisticFigures(t *testing.T) {
	dir := os.Getenv("DEWCELL_FIGURE_SAMPLES")
	if dir != "" {
		if err := os.MkdirAll(dir, 0o755); err != nil {
			t.Fatal(err)
		}
	}
	for _, f := range allFigures() {
		svg, err := SVG(f)
		if err != nil {
			t.Fatalf("%s: %v", f.Name, err)
		}
		pngB, err := PNG(f, 0)
		if err != nil {
			t.Fatalf("%s: %v", f.Name, err)
		}
		inline, err := InlineSVG(f)
		if err != nil {
			t.Fatalf("%s: %v", f.Name, err)
		}
		t.Logf("%s: SVG %d bytes, PNG %d bytes at %d dpi", f.Name, len(svg), len(pngB), DefaultDPI)
		if dir == "" {
			continue
		}
		page := "<!DOCTYPE html>\n<html><body style=\"max-width:20cm\">\n<h1>" + html.EscapeString(f.Title) + "</h1>\n" + string(inline) + "</body></html>\n"
		for name, data := range map[string][]byte{f.Name + ".svg": svg, f.Name + ".png": pngB, f.Name + ".html": []byte(page)} {
			if err := os.WriteFile(filepath.Join(dir, name), data, 0o644); err != nil {
				t.Fatal(err)
			}
		}
	}
}

var errSink error

func BenchmarkFigure(b *testing.B) {
	f := envelopeFigure()
	for _, bc := range []struct {
		name string
		fn   func() ([]byte, error)
	}{
		{"SVG", func() ([]byte, error) { return SVG(f) }},
		{"PNG150", func() ([]byte, error) { return PNG(f, 150) }},
	} {
		b.Run(bc.name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				_, err := bc.fn()
				errSink = errors.Join(errSink, err)
			}
			if errSink != nil {
				b.Fatal(errSink)
			}
		})
	}
}
