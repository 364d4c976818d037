package figure

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"
	"unicode"

	"dewcell/cmd/dewcell/internal/report"
)

// scene is a figure checked and reduced to what can be drawn: the points
// of every series (NaN where a curve breaks), the marks and lines inside a
// logarithmic axis's positive half, and the range of each axis.
type scene struct {
	name   string // for messages: the figure's name or title, quoted
	title  string
	series []series
	marks  []mark
	lines  []refLine
	x, y   axis
}

type series struct {
	label string
	style report.Style
	x, y  []float64 // equal lengths; a point with a NaN is not drawn
	index int       // position in the figure, for its colour and marker
}

type mark struct {
	label string
	x, y  float64
	index int
}

type refLine struct {
	label    string
	value    float64
	vertical bool
}

type axis struct {
	label        string
	log, reverse bool
	min, max     float64 // min < max, both finite (positive on a log axis)
}

// margin is the share of an axis's span added at each end of a range
// that follows the data.
const margin = 0.04

// newScene checks f and prepares it for drawing.
func newScene(f *report.Figure) (*scene, error) {
	if f == nil {
		return nil, errors.New("no figure to draw")
	}
	name := figureName(f)
	fail := func(format string, a ...any) error {
		return fmt.Errorf("figure %s: "+format, append([]any{name}, a...)...)
	}
	if len(f.Series) == 0 && len(f.Marks) == 0 {
		return nil, fail("nothing to draw: it has no series and no marks")
	}
	s := &scene{
		name:  name,
		title: clean(f.Title),
		x:     axis{label: clean(f.X.Text()), log: f.X.Log, reverse: f.X.Reverse},
		y:     axis{label: clean(f.Y.Text()), log: f.Y.Log, reverse: f.Y.Reverse},
	}
	// drawable says whether a point can be placed on the axes: finite, and
	// positive on a logarithmic axis.
	drawable := func(v float64, a *axis) bool {
		return !math.IsNaN(v) && !math.IsInf(v, 0) && (!a.log || v > 0)
	}
	finite := 0 // points and marks that are finite in x and y
	var xs, ys []float64
	for i, sr := range f.Series {
		if len(sr.X) != len(sr.Y) {
			return nil, fail("series %q has %d x values but %d y values", sr.Label, len(sr.X), len(sr.Y))
		}
		out := series{label: clean(sr.Label), style: sr.Style, index: i,
			x: make([]float64, len(sr.X)), y: make([]float64, len(sr.Y))}
		for j := range sr.X {
			x, y := sr.X[j], sr.Y[j]
			if isFinite(x) && isFinite(y) {
				finite++
			}
			if drawable(x, &s.x) && drawable(y, &s.y) {
				out.x[j], out.y[j] = x, y
				xs, ys = append(xs, x), append(ys, y)
			} else {
				out.x[j], out.y[j] = math.NaN(), math.NaN()
			}
		}
		if sr.Style == report.Bars || sr.Style == report.Ranges {
			// The bars' sides and their feet at zero are in the ranges.
			w := barWidth(out.x)
			for j := range out.x {
				if !math.IsNaN(out.x[j]) {
					xs = append(xs, out.x[j]-w/2, out.x[j]+w/2)
					if drawable(0, &s.y) && sr.Style == report.Bars {
						ys = append(ys, 0)
					}
				}
			}
		}
		s.series = append(s.series, out)
	}
	for i, m := range f.Marks {
		if isFinite(m.X) && isFinite(m.Y) {
			finite++
		}
		if drawable(m.X, &s.x) && drawable(m.Y, &s.y) {
			s.marks = append(s.marks, mark{label: clean(m.Label), x: m.X, y: m.Y, index: i})
			xs, ys = append(xs, m.X), append(ys, m.Y)
		}
	}
	if len(xs) == 0 {
		switch {
		case finite == 0:
			return nil, fail("nothing to draw: its series and marks hold no finite point")
		case s.x.log && s.y.log:
			return nil, fail("nothing to draw: no point has positive x and y for the logarithmic axes")
		case s.x.log:
			return nil, fail("nothing to draw: no point has a positive x for the logarithmic x axis")
		default:
			return nil, fail("nothing to draw: no point has a positive y for the logarithmic y axis")
		}
	}
	for _, l := range f.Lines {
		a, vs := &s.y, &ys
		if l.Vertical {
			a, vs = &s.x, &xs
		}
		if drawable(l.Value, a) {
			s.lines = append(s.lines, refLine{label: clean(l.Label), value: l.Value, vertical: l.Vertical})
			*vs = append(*vs, l.Value)
		}
	}
	var err error
	if s.x.min, s.x.max, err = axisRange(f.X, xs); err != nil {
		return nil, fail("x axis: %v", err)
	}
	if s.y.min, s.y.max, err = axisRange(f.Y, ys); err != nil {
		return nil, fail("y axis: %v", err)
	}
	return s, nil
}

// figureName names f in messages: its name, else its title.
func figureName(f *report.Figure) string {
	switch {
	case f.Name != "":
		return fmt.Sprintf("%q", f.Name)
	case f.Title != "":
		return fmt.Sprintf("%q", f.Title)
	}
	return "(untitled)"
}

func isFinite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// axisRange is the range of a, fixed or following vs (all drawable on a),
// with the margin.
func axisRange(a report.Axis, vs []float64) (lo, hi float64, err error) {
	if isFinite(a.Min) && isFinite(a.Max) && a.Min < a.Max {
		if a.Log && a.Min <= 0 {
			return 0, 0, fmt.Errorf("the fixed range %g to %g of a logarithmic axis must be above zero", a.Min, a.Max)
		}
		return a.Min, a.Max, nil
	}
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, v := range vs {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	if a.Log {
		return logRange(lo, hi)
	}
	return linearRange(lo, hi)
}

// linearRange widens [lo, hi] by the margin, without crossing zero when
// the values are all on one side of it; a single value gets a range around
// it.
func linearRange(lo, hi float64) (float64, float64, error) {
	span := hi - lo
	if math.IsInf(span, 0) {
		return 0, 0, fmt.Errorf("values from %g to %g span too much to draw", lo, hi)
	}
	mag := math.Max(math.Abs(lo), math.Abs(hi))
	if span <= 1e-9*mag || span == 0 {
		// One value, or values equal to nine digits: a range of 10 % of
		// the value around it (±1 around zero).
		mid := lo + span/2
		d := 0.1 * math.Abs(mid)
		if d == 0 {
			d = 1
		}
		nlo, nhi := mid-d, mid+d
		if lo >= 0 && nlo < 0 {
			nlo = 0
		}
		if hi <= 0 && nhi > 0 {
			nhi = 0
		}
		return nlo, nhi, nil
	}
	nlo, nhi := lo-margin*span, hi+margin*span
	if lo >= 0 && nlo < 0 {
		nlo = 0
	}
	if hi <= 0 && nhi > 0 {
		nhi = 0
	}
	if math.IsInf(nlo, 0) || math.IsInf(nhi, 0) {
		return 0, 0, fmt.Errorf("values from %g to %g span too much to draw", lo, hi)
	}
	return nlo, nhi, nil
}

// logRange widens [lo, hi] (both positive) by the margin of the span of
// their logarithms; a single value gets a factor of 2 either side.
func logRange(lo, hi float64) (float64, float64, error) {
	llo, lhi := math.Log10(lo), math.Log10(hi)
	span := lhi - llo
	if span <= 1e-9*math.Max(1, math.Max(math.Abs(llo), math.Abs(lhi))) {
		span = 2 * math.Log10(2) / (1 + 2*margin)
		mid := (llo + lhi) / 2
		llo, lhi = mid-span/2, mid+span/2
	}
	nlo, nhi := math.Pow(10, llo-margin*span), math.Pow(10, lhi+margin*span)
	if nlo <= 0 || math.IsInf(nhi, 0) {
		return 0, 0, fmt.Errorf("values from %g to %g span too much to draw", lo, hi)
	}
	return nlo, nhi, nil
}

// clean makes s fit to be drawn and written into XML: valid UTF-8, with
// control characters other than line breaks made spaces.
func clean(s string) string {
	s = strings.ToValidUTF8(s, "\uFFFD")
	s = strings.ReplaceAll(s, "\r\n", "\n")
	return strings.Map(func(r rune) rune {
		switch {
		case r == '\n':
			return r
		case unicode.IsControl(r), r == '\uFFFE', r == '\uFFFF':
			return ' '
		}
		return r
	}, s)
}

// barWidth is the width of the bars of a series at x: 0.8 of the closest
// spacing of its points, or 0.8 with a single point.
func barWidth(x []float64) float64 {
	var xs []float64
	for _, v := range x {
		if !math.IsNaN(v) {
			xs = append(xs, v)
		}
	}
	sort.Float64s(xs)
	gap := math.Inf(1)
	for i := 1; i < len(xs); i++ {
		if d := xs[i] - xs[i-1]; d > 0 && d < gap {
			gap = d
		}
	}
	if math.IsInf(gap, 1) {
		gap = 1
	}
	return 0.8 * gap
}
