// Package figure draws a report.Figure as an SVG document, as an SVG
// element for an HTML page, or as a PNG image, with gonum.org/v1/plot.
//
// A figure is 16 cm by 10 cm, sized for a printed report: text of 10 pt
// and more (the title 12 pt), data lines 1.75 pt wide, reference lines a
// 1 pt dotted grey. Text is set in the Liberation Sans font that comes with
// gonum/plot, so no system font and no network are needed to measure or to
// rasterise it; the SVG names Arial and sans-serif after it for viewers
// without it (Liberation Sans has Arial's metrics).
//
// What is drawn:
//
//   - the title across the top, wrapped to the width if it is long;
//   - the axes with their labels (report.Axis.Text: the label with its
//     unit in brackets), ticks at round values and a light grid; a
//     logarithmic axis labels its decades (and 2 and 5 between them when
//     it spans few);
//   - each series in its style: Line a solid line, Dashed a dashed line,
//     Points open markers only, LinePoints a solid line with an open marker
//     at every point. A NaN or infinite x or y breaks the curve; a point
//     left alone between breaks is drawn as a dot. Series take the colours
//     of the palette in turn (twelve colours told apart also under the
//     three kinds of dichromatic vision), and each its own marker shape;
//     from the thirteenth series on, the colours repeat with other dash
//     patterns;
//   - a legend with the label of every series, in the corner of the plot
//     where it hides no data, or else to the right of the plot;
//   - the marks, as filled black shapes (circle, square, triangle,
//     diamond, inverted triangle, in turn), each with its label beside it
//     on the side where it hides least and stays inside the plot;
//   - the reference lines, thin dotted lines across the whole plot at
//     their value, each labelled along its length.
//
// The range of an axis is its Min to Max when Min < Max (both finite);
// otherwise it spans all the series points, marks and reference lines on
// it, with a margin of 4 % of the span (a factor on a logarithmic axis)
// that does not cross zero when all values are on one side of it. A
// reversed axis draws values falling from left to right, or from bottom
// to top. A logarithmic axis leaves out points, marks and lines that are
// not positive; only when nothing is left is that an error.
//
// The same figure always gives the same bytes, so that golden files and
// checksums of written files are stable. The SVG uses no ids, no scripts
// and no external references, and holds every text as text.
package figure
