// Package report is the result of a dewcell command as data: titled tables
// of typed columns (a quantity in a unit, with the way people read it), a
// key-value summary, compositions by component, notes, warnings and
// figures. The commands build a Report and never see an output format; the
// encoders in this package and below it render it: Text for people, CSV,
// JSON, and (in the subpackages) workbooks, figures and the HTML study
// report.
//
// Values are held in the unit of their column (the study's unit system),
// as plain float64, int, bool or string. A nil value, or a NaN, is a result
// that does not exist.
package report

import (
	"math"
	"strings"

	"dewcell/cmd/dewcell/internal/units"
)

// A Column names a quantity, the unit it is held in and how it is shown.
type Column struct {
	// Name is the snake_case stem of the JSON and CSV key ("dew_pressure");
	// the key is Name, then "_" and the unit's key (dew_pressure_psia).
	Name string
	// Label is the name for people ("Dew pressure"); empty, it is made from
	// Name with the trade's own spellings (CGR, GOR, p/Z, Z two-phase).
	Label string
	// Unit is the unit the values are held in; the zero Unit for a
	// dimensionless number or a text.
	Unit units.Unit
	// Format says how people read the numbers; the zero Format takes the
	// unit's (FormatOf).
	Format Format
	// Symbol, when set, is the unit as people read it instead of the
	// unit's own ("% points" for a difference of percentages held in %).
	Symbol string
	// Verbose marks a solver diagnostic (iterations, residuals): kept in
	// JSON and CSV, shown to people only when they ask (--verbose).
	Verbose bool
}

// Key is the JSON and CSV name: the name, then the unit key (pressure_psia).
func (c Column) Key() string {
	if c.Unit.Key == "" {
		return c.Name
	}
	return c.Name + "_" + c.Unit.Key
}

// Title is the column's name for people, without its unit.
func (c Column) Title() string {
	if c.Label != "" {
		return c.Label
	}
	return LabelOf(c.Name)
}

// NumberFormat is the column's format: its own, or its unit's.
func (c Column) NumberFormat() Format {
	if c.Format != (Format{}) {
		return c.Format
	}
	return FormatOf(c.Unit)
}

// A Field is one result of the summary. Value is a string, a bool, an int
// or a float64 in the column's unit; nil, or a NaN, leaves it out.
type Field struct {
	Column
	Value any
}

// A Vector is a number per label, such as a phase composition keyed by
// component name; JSON gives it as an object. Vectors over the same labels
// are shown side by side.
type Vector struct {
	Name   string // JSON key, e.g. "liquid_composition"
	Title  string // for people; empty: made from Name
	Label  string // what the labels are, e.g. "component"
	Labels []string
	Values []float64
	Format Format // the zero Format: mole fractions
}

// A Table has named columns and rows of cells (string, int, bool or
// float64; nil or NaN for a missing value). JSON gives it as an array of
// row objects.
type Table struct {
	Name  string // JSON key, e.g. "steps"
	Title string // heading for people
	// Part is the table's name as a CSV part (--table) and a file or sheet
	// name, when its JSON key would not serve: the envelope's "summary"
	// table is the part "extremes", so that "summary" stays the summary.
	// Empty, it is Name.
	Part    string
	Columns []Column
	Rows    [][]any
	// Detail marks a table that a summary view (demo's standard output)
	// leaves out: the traced points of an envelope, the compositions of
	// every step. It is in every file.
	Detail bool
	// Transpose shows the table to people with its rows as columns, headed
	// by the first column's values: a few cases of many quantities.
	Transpose bool
}

// A Matrix is a square table of numbers between labelled items, such as
// the binary interaction coefficients; JSON gives it as an object of
// objects.
type Matrix struct {
	Name   string // JSON key, e.g. "kij"
	Title  string
	Labels []string
	Values [][]float64
	Format Format
}

// A Report is the result of one command.
type Report struct {
	Name  string // JSON key when several reports are written together, file name in a folder
	Title string // heading for people
	// Section is the short heading of the result in a document that holds
	// several ("Phase envelope"); empty, the title serves.
	Section string
	Fields  []Field
	Vectors []Vector
	Tables  []Table
	Matrix  *Matrix
	Figures []*Figure
	// Notes say what people should know about how the result was obtained;
	// Warnings, what may make it wrong or what they should check. Both go
	// to standard error with the result, and into the files that hold it.
	Notes    []string
	Warnings []string
}

// CompositionTable lays out vectors over the same labels as one table:
// the labels down the first column (headed by the first vector's Label),
// then a column per vector; a vector shorter than the first leaves its
// cells missing.
func CompositionTable(vs []Vector) *Table {
	if len(vs) == 0 {
		return nil
	}
	v0 := vs[0]
	label := v0.Label
	if label == "" {
		label = "item"
	}
	t := &Table{Name: "compositions", Title: "compositions, mole fraction", Columns: []Column{{Name: label}}}
	for _, v := range vs {
		f := v.Format
		if f == (Format{}) {
			f = MoleFraction
		}
		title := v.Title
		if title == "" {
			title = LabelOf(v.Name)
		}
		t.Columns = append(t.Columns, Column{Name: v.Name, Label: title, Format: f})
	}
	for i, l := range v0.Labels {
		row := []any{l}
		for _, v := range vs {
			var x any
			if i < len(v.Values) {
				x = v.Values[i]
			}
			row = append(row, x)
		}
		t.Rows = append(t.Rows, row)
	}
	return t
}

// AsTable lays out m as a table: its labels down the first column and a
// column per label.
func (m *Matrix) AsTable() *Table {
	f := m.Format
	if f == (Format{}) {
		f = Coefficient
	}
	t := &Table{Name: m.Name, Title: m.Title, Columns: []Column{{Name: "component", Label: " "}}}
	for _, l := range m.Labels {
		t.Columns = append(t.Columns, Column{Name: l, Label: l, Format: f})
	}
	for i, l := range m.Labels {
		row := []any{l}
		for _, x := range m.Values[i] {
			row = append(row, x)
		}
		t.Rows = append(t.Rows, row)
	}
	return t
}

// Brief is r without its Detail tables: a copy sharing everything else.
func (r *Report) Brief() *Report {
	b := *r
	b.Tables = nil
	for _, t := range r.Tables {
		if !t.Detail {
			b.Tables = append(b.Tables, t)
		}
	}
	return &b
}

// Warn adds warnings to r.
func (r *Report) Warn(msgs ...string) { r.Warnings = append(r.Warnings, msgs...) }

// Note adds notes to r.
func (r *Report) Note(msgs ...string) { r.Notes = append(r.Notes, msgs...) }

// PartName is the table's name as a CSV part: Part, or else Name.
func (t *Table) PartName() string {
	if t.Part != "" {
		return t.Part
	}
	return t.Name
}

// Table returns the table whose part name is name, or nil.
func (r *Report) Table(name string) *Table {
	for i := range r.Tables {
		if r.Tables[i].PartName() == name {
			return &r.Tables[i]
		}
	}
	return nil
}

// Field returns the value of the summary field whose key is key, or nil.
func (r *Report) Field(key string) any {
	for _, f := range r.Fields {
		if f.Key() == key {
			return f.Value
		}
	}
	return nil
}

// Missing reports whether a cell holds no value.
func Missing(v any) bool {
	f, isFloat := v.(float64)
	return v == nil || isFloat && math.IsNaN(f)
}

// A Figure is a chart of one or more series against shared axes, with
// labelled marks (a critical point) and reference lines (the reservoir
// temperature, a critical saturation). Values are in the axes' units.
type Figure struct {
	Name    string // file name stem, e.g. "phase-envelope"
	Title   string
	Caption string // one or two sentences for the report
	X, Y    Axis
	Series  []Series
	Marks   []Mark
	Lines   []RefLine
}

// An Axis is the label and unit of one direction of a figure.
type Axis struct {
	Label string
	Unit  units.Unit
	Log   bool // logarithmic scale
	// Min and Max, when Min < Max, fix the range; otherwise it follows the
	// data.
	Min, Max float64
	// Reverse draws the values falling from left to right (pressure
	// falling with time).
	Reverse bool
}

// Text is the axis label with its unit as printed matter writes it:
// "Temperature [°F]", "Cumulative wet gas [10^6 sm3]".
func (a Axis) Text() string {
	if a.Unit.Symbol == "" {
		return a.Label
	}
	return a.Label + " [" + PrintedSymbol(a.Unit.Symbol) + "]"
}

// PrintedSymbol writes a unit as printed matter does, beyond the plain
// text of a terminal: degrees with their sign (°F), powers of ten as 10^6,
// cubic and square metres and feet with superscripts (m³).
func PrintedSymbol(sym string) string {
	s := displaySymbol(sym)
	for _, r := range printedUnits {
		s = strings.ReplaceAll(s, r[0], r[1])
	}
	return s
}

var printedUnits = [][2]string{
	{"degF", "°F"}, {"degC", "°C"}, {"degR", "°R"},
	{"m3", "m³"}, {"ft3", "ft³"}, {"m2", "m²"}, {"ft2", "ft²"},
}

// FigureUnit is the multiple of u in which a figure draws values (in u) up
// to hi, as the tables show them (1000 MMscf as 1 Bscf), and the factor
// that converts a value in u to it; the multiple converts from SI as any
// unit does.
func FigureUnit(u units.Unit, hi float64) (units.Unit, float64) {
	s := ShowColumn(Column{Unit: u}, []any{hi})
	return s.Unit, s.Factor
}

// A Style is how a series is drawn.
type Style int

// Series styles.
const (
	Line       Style = iota // a solid line through the points
	Points                  // markers only: measurements, data
	LinePoints              // a line with a marker at every point: model values at few points
	Dashed                  // a dashed line: a fit, a bound
	// Bars draws a filled bar from zero to each point, centred on its x,
	// 0.8 of the closest spacing of the points wide: yearly amounts.
	Bars
	// Ranges draws a filled bar between each pair of points (points 2k and
	// 2k+1, of the same x): the span of a result over its inputs' range, a
	// tornado chart standing up.
	Ranges
)

// A Series is one curve of a figure.
type Series struct {
	Label string
	X, Y  []float64 // NaN breaks the curve
	Style Style
}

// A Mark is a labelled point: the critical point, the cricondenbar.
type Mark struct {
	Label string
	X, Y  float64
}

// A RefLine is a labelled straight line across the plot at a constant x
// (Vertical) or y.
type RefLine struct {
	Label    string
	Value    float64
	Vertical bool
}

// LabelOf makes a name for people from a snake_case key: the words, the
// first capitalised, with the trade's spellings of its abbreviations
// (cgr → CGR, p_over_z → p/Z, z_two_phase → Z two-phase).
func LabelOf(name string) string {
	s := " " + strings.ReplaceAll(name, "_", " ") + " "
	for _, r := range labelTerms {
		s = strings.ReplaceAll(s, " "+r[0]+" ", " "+r[1]+" ")
	}
	s = strings.TrimSpace(s)
	if strings.HasPrefix(s, "p/Z") || strings.HasPrefix(s, "kij") {
		return s // lower case as the trade writes them
	}
	return Capitalize(s)
}

// labelTerms are replaced whole-word, in order.
var labelTerms = [][2]string{
	{"p over z", "p/Z"},
	{"f over expansion", "F/(Eg+Efw)"},
	{"two phase", "two-phase"},
	{"three phase", "three-phase"},
	{"end point", "end-point"},
	{"quick look", "quick-look"},
	{"pseudo critical", "pseudo-critical"},
	{"pseudo reduced", "pseudo-reduced"},
	{"r squared", "R²"},
	{"cum", "cumulative"},
	{"pct", "%"},
	{"cgr", "CGR"},
	{"gor", "GOR"},
	{"api", "API"},
	{"z", "Z"},
	{"kij", "kij"},
	{"eos", "EOS"},
}
