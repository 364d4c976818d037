package figure

import (
	"math"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"dewcell/cmd/dewcell/internal/report"
)

// Spacing, in points.
const (
	titleGap   = 6 // below the title
	legendGap  = 8 // between the plot and a legend beside it
	legendPad  = 4 // inside the legend's box
	legendIn   = 4 // between a legend inside the plot and its frame
	thumbWidth = 26
	sampleStep = 2 // spacing of the points that stand for a curve when placing text
)

// draw draws the scene on c: background, title, plot, legend. It returns
// the plot as drawn and its data area, from which the plot's transforms
// give where a value lies.
func (s *scene) draw(c draw.Canvas) (*plot.Plot, draw.Canvas) {
	c.SetColor(white)
	c.Fill(c.Rectangle.Path())
	area := draw.Crop(c, outerMargin, -outerMargin, outerMargin, -outerMargin)
	if s.title != "" {
		sty := textStyle(titleSize, true)
		top := area.Max.Y
		for _, line := range strings.Split(wrap(s.title, sty, area.Max.X-area.Min.X), "\n") {
			w, h := measure(sty, line)
			put(c, sty, line, area.Center().X-w/2, top-h, false)
			area.Max.Y = top - h
			top -= sty.Font.Size
		}
		area.Max.Y -= titleGap
	}

	lg := s.legend()
	p, ov := s.plot(area)
	if len(lg.entries) == 0 {
		p.Draw(area)
		return p, p.DataCanvas(area)
	}
	// Inside the plot where it covers nothing, and where it leaves the
	// labels the best places.
	dc := p.DataCanvas(area)
	ob := s.obstacles(p, dc)
	if places := lg.inside(dc, ob); len(places) > 0 {
		at, least := places[0], math.Inf(1)
		for _, r := range places {
			if _, cost := s.placeTexts(p, dc, ob, &r); cost < least {
				at, least = r, cost
			}
		}
		ov.legend, ov.legendAt = lg, at
		p.Draw(area)
		return p, dc
	}
	// Beside the plot, in as many columns as its height needs, level with
	// the top of the data area.
	lw, lh := lg.size(area.Max.Y - area.Min.Y)
	plotArea := draw.Crop(area, 0, -(lw + legendGap), 0, 0)
	p, _ = s.plot(plotArea)
	p.Draw(plotArea)
	dc = p.DataCanvas(plotArea)
	bottom := max(dc.Max.Y-lh, area.Min.Y)
	x := plotArea.Max.X + legendGap
	lg.draw(c, vg.Rectangle{Min: vg.Point{X: x, Y: bottom}, Max: vg.Point{X: x + lw, Y: bottom + lh}}, false)
	return p, dc
}

// plot makes the gonum plot of the scene for a drawing area: axes, grid,
// reference lines, series, and the overlay of marks, labels, the legend
// inside and the frame.
func (s *scene) plot(area draw.Canvas) (*plot.Plot, *overlay) {
	p := plot.New()
	p.BackgroundColor = nil // the scene's background is already drawn
	aw, ah := area.Max.X-area.Min.X, area.Max.Y-area.Min.Y
	setAxis(&p.X, s.x, true, aw-60)
	setAxis(&p.Y, s.y, false, ah-40)

	grid := plotter.NewGrid()
	grid.Vertical = draw.LineStyle{Color: gridColor, Width: gridLine}
	grid.Horizontal = grid.Vertical
	p.Add(grid)
	p.Add(refLines{s.lines})
	for i := range s.series {
		p.Add(seriesPlot{&s.series[i]})
	}
	ov := &overlay{scene: s}
	p.Add(ov)
	return p, ov
}

// setAxis sets a gonum axis from the scene's: range, scale, label, ticks.
func setAxis(pa *plot.Axis, a axis, horizontal bool, length vg.Length) {
	pa.Min, pa.Max = a.min, a.max
	pa.Padding = 0
	pa.LineStyle.Width = 0 // the overlay draws the frame
	pa.Label.Text = a.label
	pa.Label.TextStyle = textStyle(labelSize, false)
	pa.Label.TextStyle.XAlign, pa.Label.TextStyle.YAlign = draw.XCenter, draw.YBottom
	pa.Label.Padding = 3
	pa.Tick.Label = textStyle(textSize, false)
	if horizontal {
		pa.Tick.Label.XAlign, pa.Tick.Label.YAlign = draw.XCenter, draw.YTop
	} else {
		pa.Tick.Label.XAlign, pa.Tick.Label.YAlign = draw.XRight, draw.YCenter
	}
	pa.Tick.LineStyle = draw.LineStyle{Color: black, Width: frameLine}
	pa.Tick.Length = 4
	lin := linearTicks{length: length, horizontal: horizontal, style: pa.Tick.Label}
	var scale plot.Normalizer = plot.LinearScale{}
	pa.Tick.Marker = lin
	if a.log {
		scale = plot.LogScale{}
		pa.Tick.Marker = logTicks{linear: lin}
	}
	if a.reverse {
		scale = plot.InvertedScale{Normalizer: scale}
	}
	pa.Scale = scale
}

// refLines draws the reference lines across the data area.
type refLines struct{ lines []refLine }

func (r refLines) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	sty := draw.LineStyle{Color: refColour, Width: refWidth, Dashes: refDashes}
	for _, l := range r.lines {
		if l.vertical {
			if x := trX(l.value); c.ContainsX(x) {
				c.StrokeLine2(sty, x, c.Min.Y, x, c.Max.Y)
			}
		} else if y := trY(l.value); c.ContainsY(y) {
			c.StrokeLine2(sty, c.Min.X, y, c.Max.X, y)
		}
	}
}

// seriesPlot draws one series: its runs of points as lines, its markers,
// and its lone points as dots.
type seriesPlot struct{ s *series }

func (sp seriesPlot) Plot(c draw.Canvas, p *plot.Plot) {
	if sp.s.style == report.Bars || sp.s.style == report.Ranges {
		sp.bars(c, p)
		return
	}
	line, glyph := seriesLook(sp.s.index, sp.s.style)
	runs := sp.s.runs(p, &c)
	if line.Width > 0 {
		for _, run := range runs {
			if len(run) == 1 && glyph.Shape == nil {
				c.DrawGlyph(dotLook(sp.s.index), run[0])
				continue
			}
			c.StrokeLines(line, clipRun(&c, run)...)
		}
	}
	if glyph.Shape != nil {
		for _, run := range runs {
			for _, pt := range run {
				c.DrawGlyph(glyph, pt)
			}
		}
	}
}

// bars draws the series as filled bars from zero, clipped to the plot.
func (sp seriesPlot) bars(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	w := barWidth(sp.s.x)
	col := palette[sp.s.index%len(palette)]
	clamp := func(v, lo, hi vg.Length) vg.Length { return max(lo, min(hi, v)) }
	ranges := sp.s.style == report.Ranges
	for i, x := range sp.s.x {
		if math.IsNaN(x) || ranges && (i%2 == 1 || i+1 >= len(sp.s.x) || math.IsNaN(sp.s.y[i+1])) {
			continue
		}
		from := 0.0
		to := sp.s.y[i]
		if ranges {
			from, to = sp.s.y[i], sp.s.y[i+1]
		}
		x0, x1 := clamp(trX(x-w/2), c.Min.X, c.Max.X), clamp(trX(x+w/2), c.Min.X, c.Max.X)
		y0, y1 := clamp(trY(from), c.Min.Y, c.Max.Y), clamp(trY(to), c.Min.Y, c.Max.Y)
		if x1 <= x0 || y0 == y1 {
			continue
		}
		c.FillPolygon(col, []vg.Point{{X: x0, Y: y0}, {X: x1, Y: y0}, {X: x1, Y: y1}, {X: x0, Y: y1}})
	}
}

// runs are the series' stretches of drawable points, in canvas
// coordinates.
func (s *series) runs(p *plot.Plot, c *draw.Canvas) [][]vg.Point {
	trX, trY := p.Transforms(c)
	var runs [][]vg.Point
	var cur []vg.Point
	for i := range s.x {
		if math.IsNaN(s.x[i]) {
			if len(cur) > 0 {
				runs = append(runs, cur)
				cur = nil
			}
			continue
		}
		cur = append(cur, vg.Point{X: trX(s.x[i]), Y: trY(s.y[i])})
	}
	if len(cur) > 0 {
		runs = append(runs, cur)
	}
	return runs
}

// obstacles are what text should not cover: points along every curve and
// reference line and at every marker (samples), and the marks.
type obstacles struct {
	samples []vg.Point
	marks   []markBox
}

// A markBox is the room a mark takes; index is its place in the scene.
type markBox struct {
	vg.Rectangle
	index int
}

// markExtent is the half-width of the room a mark takes, its halo
// included: the corners of its triangles reach 1.3 radii.
const markExtent = 1.3*markRadius + 1

func (s *scene) obstacles(p *plot.Plot, c draw.Canvas) obstacles {
	var ob obstacles
	add := func(pt vg.Point) {
		if c.Contains(pt) {
			ob.samples = append(ob.samples, pt)
		}
	}
	segment := func(a, b vg.Point) {
		d := math.Hypot(float64(b.X-a.X), float64(b.Y-a.Y))
		n := min(int(d/sampleStep), 10000)
		for k := 0; k <= n; k++ {
			t := vg.Length(k) / vg.Length(max(n, 1))
			add(vg.Point{X: a.X + t*(b.X-a.X), Y: a.Y + t*(b.Y-a.Y)})
		}
	}
	for i := range s.series {
		sr := &s.series[i]
		line, glyph := seriesLook(sr.index, sr.style)
		for _, run := range sr.runs(p, &c) {
			if len(run) == 1 {
				add(run[0])
			}
			for _, l := range clipRun(&c, run) {
				for k := range l {
					add(l[k])
					if line.Width > 0 && k > 0 {
						segment(l[k-1], l[k])
					}
				}
			}
			if glyph.Shape != nil {
				r := glyph.Radius
				for _, pt := range run {
					for _, d := range []vg.Point{{X: -r, Y: -r}, {X: r, Y: -r}, {X: -r, Y: r}, {X: r, Y: r}} {
						add(pt.Add(d))
					}
				}
			}
		}
	}
	trX, trY := p.Transforms(&c)
	for _, l := range s.lines {
		if l.vertical {
			x := trX(l.value)
			segment(vg.Point{X: x, Y: c.Min.Y}, vg.Point{X: x, Y: c.Max.Y})
		} else {
			y := trY(l.value)
			segment(vg.Point{X: c.Min.X, Y: y}, vg.Point{X: c.Max.X, Y: y})
		}
	}
	for i, m := range s.marks {
		pt := vg.Point{X: trX(m.x), Y: trY(m.y)}
		if c.Contains(pt) {
			r := vg.Length(markExtent)
			ob.marks = append(ob.marks, markBox{vg.Rectangle{Min: pt.Sub(vg.Point{X: r, Y: r}), Max: pt.Add(vg.Point{X: r, Y: r})}, i})
		}
	}
	return ob
}

// clipRun is a run of two or more points clipped to the data area.
func clipRun(c *draw.Canvas, run []vg.Point) [][]vg.Point {
	if len(run) < 2 {
		return nil
	}
	return c.ClipLinesXY(run)
}

// overlay draws, over the data: the marks, their labels, the labels of the
// reference lines, the legend when it is inside the plot, and the frame.
type overlay struct {
	scene    *scene
	legend   *legend
	legendAt vg.Rectangle
}

func (o *overlay) Plot(c draw.Canvas, p *plot.Plot) {
	s := o.scene
	trX, trY := p.Transforms(&c)
	for _, m := range s.marks {
		c.DrawGlyph(markLook(m.index), vg.Point{X: trX(m.x), Y: trY(m.y)})
	}
	var legendAt *vg.Rectangle
	if o.legend != nil {
		legendAt = &o.legendAt
	}
	texts, _ := s.placeTexts(p, c, s.obstacles(p, c), legendAt)
	sty := textStyle(textSize, false)
	for _, t := range texts {
		if t.up {
			sty := sty
			sty.Color = refColour
			put(c, sty, t.text, t.at.Min.X, t.at.Min.Y, true)
			continue
		}
		put(c, sty, t.text, t.at.Min.X, t.at.Min.Y, false)
	}
	if o.legend != nil {
		o.legend.draw(c, o.legendAt, true)
	}
	c.SetLineStyle(draw.LineStyle{Color: black, Width: frameLine})
	c.Stroke(c.Rectangle.Path())
}

// A placed text is a label and the box it takes; up turns it a quarter,
// reading upwards.
type placed struct {
	text string
	at   vg.Rectangle
	up   bool
}

// placeTexts places the labels of the marks, then of the reference lines,
// each where it covers least (best) of the data area c, keeping off the
// legend when it is inside (legendAt). cost sums what they cover.
func (s *scene) placeTexts(p *plot.Plot, c draw.Canvas, ob obstacles, legendAt *vg.Rectangle) (texts []placed, cost float64) {
	var taken []vg.Rectangle // the legend and the labels placed so far
	if legendAt != nil {
		taken = append(taken, *legendAt)
	}
	sty := textStyle(textSize, false)
	trX, trY := p.Transforms(&c)
	for i, m := range s.marks {
		pt := vg.Point{X: trX(m.x), Y: trY(m.y)}
		if m.label == "" || !c.Contains(pt) {
			continue
		}
		w, h := measure(sty, m.label)
		ring := func(r, d vg.Length) []vg.Point { // lower left corners: NE, E, SE, NW, W, SW, N, S
			return []vg.Point{
				{X: pt.X + d + 1, Y: pt.Y + d},
				{X: pt.X + r + 2, Y: pt.Y - h/2},
				{X: pt.X + d + 1, Y: pt.Y - d - h},
				{X: pt.X - d - 1 - w, Y: pt.Y + d},
				{X: pt.X - r - 2 - w, Y: pt.Y - h/2},
				{X: pt.X - d - 1 - w, Y: pt.Y - d - h},
				{X: pt.X - w/2, Y: pt.Y + r + 2},
				{X: pt.X - w/2, Y: pt.Y - r - 2 - h},
			}
		}
		// Around the mark, then further off, each place also slid back
		// inside the data area (for a mark near its edge); a place further
		// off counts as covering half a point of a curve more.
		var cands []cand
		r := vg.Length(markExtent)
		for k, extra := range []vg.Length{0, 6, 12, 20} {
			for _, q := range ring(r+extra, 0.75*r+0.7*extra) {
				slid := vg.Point{
					X: max(c.Min.X+1, min(q.X, c.Max.X-1-w)),
					Y: max(c.Min.Y+1, min(q.Y, c.Max.Y-1-h)),
				}
				cands = append(cands, cand{q, 0.5 * float64(k)}, cand{slid, 0.5 * float64(k)})
			}
		}
		at, score := best(c, ob, i, taken, w, h, cands, 1)
		taken = append(taken, at)
		texts = append(texts, placed{m.label, at, false})
		cost += score
	}

	// Labels of the reference lines, along them, at the top, the bottom or
	// midway.
	for _, l := range s.lines {
		if l.label == "" {
			continue
		}
		w, h := measure(sty, l.label)
		var cands []cand
		if l.vertical {
			x := trX(l.value)
			if !c.ContainsX(x) {
				continue
			}
			w, h = h, w // the text turned a quarter
			for _, y := range []vg.Length{c.Max.Y - 4 - h, c.Min.Y + 4, (c.Min.Y + c.Max.Y - h) / 2} {
				cands = append(cands, cand{vg.Point{X: x + 3, Y: y}, 0}, cand{vg.Point{X: x - 3 - w, Y: y}, 0})
			}
		} else {
			y := trY(l.value)
			if !c.ContainsY(y) {
				continue
			}
			for _, x := range []vg.Length{c.Max.X - 4 - w, c.Min.X + 4, (c.Min.X + c.Max.X - w) / 2} {
				cands = append(cands, cand{vg.Point{X: x, Y: y + 2}, 0}, cand{vg.Point{X: x, Y: y - 2 - h}, 0})
			}
		}
		at, score := best(c, ob, -1, taken, w, h, cands, 0.5)
		taken = append(taken, at)
		texts = append(texts, placed{l.label, at, l.vertical})
		cost += score
	}
	return texts, cost
}

// best is the rectangle of size w×h, with its lower left corner at one of
// cands, that covers least: it should lie inside the data area, cover no
// mark and no text placed before, and as few points of the curves as can
// be (counted within pad of it). The mark own (an index of the scene's
// marks, or -1), which the text labels, may come closer than other marks,
// to its own radius. The first of equally good places wins.
func best(c draw.Canvas, ob obstacles, own int, taken []vg.Rectangle, w, h vg.Length, cands []cand, pad vg.Length) (vg.Rectangle, float64) {
	var bestR vg.Rectangle
	bestScore := math.Inf(1)
	for _, cd := range cands {
		p := cd.at
		r := vg.Rectangle{Min: p, Max: vg.Point{X: p.X + w, Y: p.Y + h}}
		score := cd.cost
		if r.Min.X < c.Min.X+1 || r.Max.X > c.Max.X-1 || r.Min.Y < c.Min.Y+1 || r.Max.Y > c.Max.Y-1 {
			score += 1000
		}
		for _, t := range taken {
			if overlaps(r, t) {
				score += 100
			}
		}
		for _, m := range ob.marks {
			if m.index != own && overlaps(r, m.Rectangle) {
				score += 100
			}
			if m.index == own && distance(r, centre(m.Rectangle)) < markRadius+1.5 {
				score += 100
			}
		}
		score += float64(covered(r, ob.samples, pad))
		if score < bestScore {
			bestR, bestScore = r, score
		}
	}
	return bestR, bestScore
}

// A cand is a place for a text: the lower left corner of its box, and
// what it costs beside what it covers.
type cand struct {
	at   vg.Point
	cost float64
}

func centre(r vg.Rectangle) vg.Point {
	return vg.Point{X: (r.Min.X + r.Max.X) / 2, Y: (r.Min.Y + r.Max.Y) / 2}
}

// distance is the distance from p to the nearest point of r.
func distance(r vg.Rectangle, p vg.Point) vg.Length {
	dx := max(r.Min.X-p.X, 0, p.X-r.Max.X)
	dy := max(r.Min.Y-p.Y, 0, p.Y-r.Max.Y)
	return vg.Length(math.Hypot(float64(dx), float64(dy)))
}

func overlaps(a, b vg.Rectangle) bool {
	return a.Min.X < b.Max.X && b.Min.X < a.Max.X && a.Min.Y < b.Max.Y && b.Min.Y < a.Max.Y
}

// covered counts the points within pad of r.
func covered(r vg.Rectangle, pts []vg.Point, pad vg.Length) int {
	n := 0
	for _, p := range pts {
		if p.X >= r.Min.X-pad && p.X <= r.Max.X+pad && p.Y >= r.Min.Y-pad && p.Y <= r.Max.Y+pad {
			n++
		}
	}
	return n
}

// legend is the key to the series: a sample of each series' line and
// marker, and its label.
type legend struct {
	entries []legendEntry
	sty     text.Style
	rowH    vg.Length
	textW   vg.Length // the widest label
}

type legendEntry struct {
	label string
	line  draw.LineStyle
	glyph draw.GlyphStyle
}

func (s *scene) legend() *legend {
	l := &legend{sty: textStyle(textSize, false)}
	for _, sr := range s.series {
		if sr.label == "" {
			continue
		}
		line, glyph := seriesLook(sr.index, sr.style)
		l.entries = append(l.entries, legendEntry{sr.label, line, glyph})
		w, h := measure(l.sty, sr.label)
		l.textW = max(l.textW, w)
		l.rowH = max(l.rowH, h+2, 2*markerRadius+4)
	}
	return l
}

// size is the legend's width and height in as many columns as it needs to
// stay within the height maxH.
func (l *legend) size(maxH vg.Length) (w, h vg.Length) {
	if len(l.entries) == 0 {
		return 0, 0
	}
	rows := l.rows(maxH)
	cols := (len(l.entries) + rows - 1) / rows
	colW := thumbWidth + 4 + l.textW
	return vg.Length(cols)*colW + vg.Length(cols-1)*8 + 2*legendPad, vg.Length(rows)*l.rowH + 2*legendPad
}

func (l *legend) rows(maxH vg.Length) int {
	fit := float64((maxH - 2*legendPad) / l.rowH)
	if fit >= float64(len(l.entries)) {
		return len(l.entries)
	}
	return max(1, int(fit))
}

// inside lists the places for the legend in the corners of the data area
// c (and midway along its edges) where it covers no curve and no mark, in
// the order they are preferred.
func (l *legend) inside(c draw.Canvas, ob obstacles) []vg.Rectangle {
	cw, ch := c.Max.X-c.Min.X, c.Max.Y-c.Min.Y
	w, h := l.size(ch)
	if w > 0.5*cw || h > 0.7*ch {
		return nil
	}
	var clear []vg.Rectangle
	left, right := c.Min.X+legendIn, c.Max.X-legendIn-w
	bottom, top := c.Min.Y+legendIn, c.Max.Y-legendIn-h
	midX, midY := (c.Min.X+c.Max.X-w)/2, (c.Min.Y+c.Max.Y-h)/2
	for _, p := range []vg.Point{
		{X: right, Y: top}, {X: left, Y: top}, {X: right, Y: bottom}, {X: left, Y: bottom},
		{X: midX, Y: top}, {X: midX, Y: bottom}, {X: right, Y: midY}, {X: left, Y: midY},
	} {
		r := vg.Rectangle{Min: p, Max: vg.Point{X: p.X + w, Y: p.Y + h}}
		if covered(r, ob.samples, 2) > 0 {
			continue
		}
		free := true
		for _, m := range ob.marks {
			free = free && !overlaps(r, m.Rectangle)
		}
		if free {
			clear = append(clear, r)
		}
	}
	return clear
}

// draw draws the legend in r, in a white box with a frame when boxed.
func (l *legend) draw(c draw.Canvas, r vg.Rectangle, boxed bool) {
	if boxed {
		c.SetColor(white)
		c.Fill(r.Path())
		c.SetLineStyle(draw.LineStyle{Color: boxColour, Width: gridLine})
		c.Stroke(r.Path())
	}
	rows := max(1, int((r.Max.Y-r.Min.Y-2*legendPad)/l.rowH+0.01))
	colW := thumbWidth + 4 + l.textW
	for i, e := range l.entries {
		col, row := i/rows, i%rows
		x := r.Min.X + legendPad + vg.Length(col)*(colW+8)
		yc := r.Max.Y - legendPad - (vg.Length(row)+0.5)*l.rowH
		if e.line.Width > 0 {
			c.StrokeLine2(e.line, x, yc, x+thumbWidth, yc)
		}
		if e.glyph.Shape != nil {
			c.DrawGlyphNoClip(e.glyph, vg.Point{X: x + thumbWidth/2, Y: yc})
		}
		_, h := measure(l.sty, e.label)
		put(c, l.sty, e.label, x+thumbWidth+4, yc-h/2, false)
	}
}

// measure is the size of txt set in sty, unturned: its widest line, and
// from the lowest descender of its last line to the highest ascender of its
// first (lines are a font size apart, as gonum/plot sets them).
func measure(sty text.Style, txt string) (w, h vg.Length) {
	e := sty.FontExtents()
	n := len(sty.Handler.Lines(txt))
	return sty.Width(txt), vg.Length(n-1)*sty.Font.Size + e.Ascent + e.Descent
}

// put sets txt, left-aligned, with the lower left corner of its box (as
// measure gives it) at (x, y); turned a quarter anticlockwise, reading
// upwards, when up is set, the box then being h wide and w high.
//
// gonum/plot's plain text puts the baseline of the last of n lines at
// pt.Y − ascent + size (alignment and rotation aside), so the bottom of the
// box is there less the descent. Turned a quarter, the same holds in the
// turned frame, whose x is the page's y and whose y is minus the page's x.
func put(c draw.Canvas, sty text.Style, txt string, x, y vg.Length, up bool) {
	e := sty.FontExtents()
	sty.XAlign, sty.YAlign, sty.Rotation = draw.XLeft, draw.YBottom, 0
	if !up {
		c.FillText(sty, vg.Point{X: x, Y: y + e.Ascent + e.Descent - sty.Font.Size}, txt)
		return
	}
	n := vg.Length(len(sty.Handler.Lines(txt)))
	sty.Rotation = math.Pi / 2
	// In the turned frame the box's top is at pt'.Y + n·size and must be at
	// −x, and its left at pt'.X = y.
	c.FillText(sty, vg.Point{X: x + n*sty.Font.Size, Y: y}, txt)
}

// wrap breaks txt into lines no wider than w (a word wider than w keeps a
// line to itself), keeping its own line breaks.
func wrap(txt string, sty text.Style, w vg.Length) string {
	var out []string
	for _, para := range strings.Split(txt, "\n") {
		words := strings.Fields(para)
		line := ""
		for _, word := range words {
			try := word
			if line != "" {
				try = line + " " + word
			}
			if line != "" && sty.Width(try) > w {
				out = append(out, line)
				line = word
				continue
			}
			line = try
		}
		out = append(out, line)
	}
	return strings.Join(out, "\n")
}

// Interfaces kept by the plotters.
var (
	_ plot.Plotter = refLines{}
	_ plot.Plotter = seriesPlot{}
	_ plot.Plotter = (*overlay)(nil)
)
