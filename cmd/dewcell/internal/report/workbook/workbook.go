// Package workbook writes reports as an Office Open XML workbook (.xlsx),
// for engineers who carry the results on in a spreadsheet.
//
// The workbook opens on a cover sheet: the study's title, the command that
// made it, the unit system, the caution, a list of the sheets that follow
// (each a link to its sheet) with what each holds, and every report's
// warnings and notes. Then, for each report in turn:
//
//   - its summary, when it has fields: one row per quantity, with columns
//     Quantity, Value and Unit;
//   - its compositions, when it has vectors: the labels (components) down
//     the first column, one column per vector;
//   - one sheet per table;
//   - its matrix, labels down the first column and along the header.
//
// Every sheet has the same frame: its title in the first row, a single
// header row under it (the column's name and, in brackets, the unit people
// read it in: "Pressure [psia]"), then the data, with the two top rows
// frozen, and the first column as well when the sheet is wider than a
// text table (report.DefaultWidth characters). Numbers are stored as
// numbers in the unit of the header (report.Shown.Value), to the last
// digit that tells one float64 from the next, and are shown through a
// number format with the decimals of the text tables; a missing value is
// an empty cell; texts, and booleans as yes or no, are text.
//
// The same reports and options give the same bytes: the document's times
// are a fixed date (FixedTime) and nothing else in the file depends on
// when or where it was written.
package workbook

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"unicode/utf16"

	"github.com/xuri/excelize/v2"

	"dewcell/cmd/dewcell/internal/report"
)

// FixedTime is the creation and modification time written into every
// workbook's document properties, so that the output depends only on the
// reports: 1980-01-01, the earliest date a zip archive can record.
const FixedTime = "1980-01-01T00:00:00Z"

// Options say what the cover sheet holds and which columns are shown.
type Options struct {
	// Title is the study's title, the cover's heading; empty, the first
	// report's title.
	Title string
	// Caution is the caution printed on the cover and stored as the
	// document's description; it is required.
	Caution string
	// Command is the command line that made the reports.
	Command string
	// UnitSystem names the units of the reports ("field", "metric").
	UnitSystem string
	// Verbose shows the solver diagnostics (columns and fields marked
	// Verbose), as the text tables do with --verbose.
	Verbose bool
}

// Sizes.
const (
	maxSheetName = 31  // UTF-16 code units in a sheet name, the format's limit
	minColWidth  = 6   // characters
	maxColWidth  = 60  // characters; a longer text wraps
	coverLabelW  = 20  // the cover's first column
	coverTextW   = 100 // the cover's second column
)

// Write writes the reports as one workbook to w. It returns an error, and
// writes nothing, when there is no report, when one is nil or malformed
// (a row of the wrong length, a cell of a kind the model does not allow,
// a composition with more or fewer values than labels, a matrix that is
// not square) or when opt has no caution.
func Write(w io.Writer, opt Options, reports ...*report.Report) error {
	if len(reports) == 0 {
		return errors.New("no results to write into the workbook")
	}
	for i, r := range reports {
		if r == nil {
			return fmt.Errorf("internal error: result %d of %d is missing", i+1, len(reports))
		}
	}
	if strings.TrimSpace(opt.Caution) == "" {
		return errors.New("internal error: the workbook needs the caution for its cover")
	}
	b := &book{
		f:      excelize.NewFile(),
		opt:    opt,
		styles: map[style]int{},
		used:   map[string]bool{"history": true}, // a name the spreadsheet programs reserve
	}
	defer b.f.Close()
	if err := b.build(reports); err != nil {
		return err
	}
	_, err := b.f.WriteTo(w)
	return err
}

// A book is a workbook being built.
type book struct {
	f      *excelize.File
	opt    Options
	styles map[style]int
	used   map[string]bool // sheet names taken, in lower case
	sheets []entry         // the sheets after the cover, in order
}

// An entry is a sheet listed on the cover.
type entry struct {
	name, holds string
}

const coverName = "Cover"

func (b *book) build(reports []*report.Report) error {
	if err := b.f.SetSheetName("Sheet1", coverName); err != nil {
		return err
	}
	b.used[strings.ToLower(coverName)] = true
	for i, r := range reports {
		prefix := shorten(clean(r.Name), 14)
		if prefix == "" {
			prefix = fmt.Sprintf("result %d", i+1)
		}
		if err := b.report(r, prefix); err != nil {
			return err
		}
	}
	if err := b.cover(reports); err != nil {
		return err
	}
	b.f.SetActiveSheet(0)
	if err := b.f.SetDocProps(&excelize.DocProperties{
		Title:       b.title(reports),
		Subject:     b.opt.Command,
		Creator:     "dewcell",
		Description: b.opt.Caution,
		Created:     FixedTime,
		Modified:    FixedTime,
	}); err != nil {
		return err
	}
	return b.f.SetAppProps(&excelize.AppProperties{Application: "dewcell"})
}

// title is the workbook's: the study's, or else the first report's.
func (b *book) title(reports []*report.Report) string {
	if b.opt.Title != "" {
		return b.opt.Title
	}
	return reportTitle(reports[0])
}

// reportTitle is r's title for people.
func reportTitle(r *report.Report) string {
	if r.Title != "" {
		return report.Capitalize(r.Title)
	}
	return report.LabelOf(r.Name)
}

// report adds r's sheets: summary, compositions, tables, matrix.
func (b *book) report(r *report.Report, prefix string) error {
	rt := reportTitle(r)
	if fields := shownFields(r, b.opt.Verbose); len(fields) > 0 {
		cols, err := summaryColumns(fields)
		if err != nil {
			return err
		}
		holds := fmt.Sprintf("%s: summary, %s", rt, count(len(fields), "quantity", "quantities"))
		if err := b.sheet(b.name(prefix, "summary"), rt, holds, cols); err != nil {
			return err
		}
	}
	if len(r.Vectors) > 0 {
		cols, err := vectorColumns(r.Vectors)
		if err != nil {
			return err
		}
		var names []string
		for _, c := range cols[1:] {
			names = append(names, c.head)
		}
		what := r.Vectors[0].Label
		if what == "" {
			what = "item"
		}
		holds := fmt.Sprintf("%s: %s, by %s", rt, strings.Join(names, ", "), what)
		if err := b.sheet(b.name(prefix, "compositions"), rt+": compositions", holds, cols); err != nil {
			return err
		}
	}
	for i := range r.Tables {
		t := &r.Tables[i]
		cols, err := tableColumns(t, b.opt.Verbose)
		if err != nil {
			return err
		}
		title := t.Title
		if title == "" {
			title = report.LabelOf(t.Name)
		}
		title = report.Capitalize(title)
		rows := "no rows"
		if len(t.Rows) > 0 {
			rows = count(len(t.Rows), "row", "rows")
		}
		holds := fmt.Sprintf("%s: %s, %s", rt, title, rows)
		if err := b.sheet(b.name(prefix, t.PartName()), title, holds, cols); err != nil {
			return err
		}
	}
	if m := r.Matrix; m != nil {
		cols, err := matrixColumns(m)
		if err != nil {
			return err
		}
		title := m.Title
		if title == "" {
			title = report.LabelOf(m.Name)
		}
		title = report.Capitalize(title)
		n := len(m.Labels)
		holds := fmt.Sprintf("%s: %s, %d × %d", rt, title, n, n)
		if err := b.sheet(b.name(prefix, m.Name), title, holds, cols); err != nil {
			return err
		}
	}
	return nil
}

func count(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return strconv.Itoa(n) + " " + many
}

// shownFields are the fields with a value, without the diagnostics unless
// verbose.
func shownFields(r *report.Report, verbose bool) []report.Field {
	var out []report.Field
	for _, f := range r.Fields {
		if !report.Missing(f.Value) && (verbose || !f.Verbose) {
			out = append(out, f)
		}
	}
	return out
}

// A column is one column of a sheet, ready to write.
type column struct {
	head  string
	right bool // numbers: the header aligned with them
	cells []cell
}

// A cell is one value of a column: a number in the unit of the header with
// the number format that shows it, a text, or nothing.
type cell struct {
	kind   kind
	num    float64
	text   string
	numFmt string
	width  int // characters it shows as
}

type kind int

const (
	empty kind = iota
	number
	text
)

// cellOf prepares the value v, shown as s. grouped says whether the
// column shows thousands separators.
func cellOf(v any, s report.Shown, f report.Format, grouped bool) (cell, error) {
	switch x := v.(type) {
	case nil:
		return cell{}, nil
	case float64:
		if math.IsNaN(x) {
			return cell{}, nil
		}
		t := s.Text(x)
		if math.IsInf(x, 0) { // a spreadsheet number cannot hold it
			return cell{kind: text, text: t, width: len(t)}, nil
		}
		return cell{kind: number, num: s.Value(x), numFmt: floatFormat(s.Decimals, grouped, f.Scientific), width: len(t)}, nil
	case int:
		t := s.Text(x)
		return cell{kind: number, num: float64(x), numFmt: floatFormat(0, grouped, false), width: len(t)}, nil
	case bool, string:
		t := s.Text(x)
		return cell{kind: text, text: t, width: textWidth(t)}, nil
	}
	return cell{}, errBadCell
}

var errBadCell = errors.New("a value that is neither a number, a text nor yes or no")

// groups reports whether the text tables write any of the values with
// thousands separators (they do from five integer digits up): the column's
// number format then groups every value.
func groups(vals []any, s report.Shown) bool {
	for _, v := range vals {
		switch x := v.(type) {
		case float64:
			if !math.IsNaN(x) && !math.IsInf(x, 0) && strings.Contains(s.Text(x), ",") {
				return true
			}
		case int:
			if strings.Contains(s.Text(x), ",") {
				return true
			}
		}
	}
	return false
}

// floatFormat is the spreadsheet number format of d decimals, with
// thousands separators when grouped; scientific is three significant
// digits in e-notation, as the text tables show residuals.
func floatFormat(d int, grouped, scientific bool) string {
	if scientific {
		return "0.00E+00"
	}
	f := "0"
	if grouped {
		f = "#,##0"
	}
	if d > 0 {
		f += "." + strings.Repeat("0", d)
	}
	return f
}

func textWidth(s string) int {
	n := 0
	for _, line := range strings.Split(s, "\n") {
		n = max(n, len([]rune(line)))
	}
	return n
}

// unitHead is a column's header: its title, then its unit in brackets.
func unitHead(title, symbol string) string {
	if symbol == "" {
		return title
	}
	return title + " [" + symbol + "]"
}

// summaryColumns lays out fields as Quantity, Value and Unit, each value
// in its own format.
func summaryColumns(fields []report.Field) ([]column, error) {
	q := column{head: "Quantity"}
	v := column{head: "Value", right: true}
	u := column{head: "Unit"}
	for _, f := range fields {
		s := report.ShowField(f)
		c, err := cellOf(f.Value, s, f.NumberFormat(), groups([]any{f.Value}, s))
		if err != nil {
			return nil, fmt.Errorf("internal error: summary field %q holds %w", f.Key(), err)
		}
		sym := ""
		if c.kind == number || isInf(f.Value) {
			sym = s.Symbol
		}
		q.cells = append(q.cells, textCell(f.Title()))
		v.cells = append(v.cells, c)
		u.cells = append(u.cells, textCell(sym))
	}
	return []column{q, v, u}, nil
}

func isInf(v any) bool {
	x, ok := v.(float64)
	return ok && math.IsInf(x, 0)
}

func textCell(s string) cell {
	if s == "" {
		return cell{}
	}
	return cell{kind: text, text: s, width: textWidth(s)}
}

// tableColumns lays out t's columns, leaving out the diagnostics unless
// verbose.
func tableColumns(t *report.Table, verbose bool) ([]column, error) {
	for i, row := range t.Rows {
		if len(row) != len(t.Columns) {
			return nil, fmt.Errorf("internal error: row %d of table %q has %d cells for %d columns", i+1, t.Name, len(row), len(t.Columns))
		}
	}
	var cols []column
	for j, c := range t.Columns {
		if c.Verbose && !verbose {
			continue
		}
		vals := make([]any, len(t.Rows))
		anyNumber := false
		for i, row := range t.Rows {
			vals[i] = row[j]
			switch row[j].(type) {
			case float64, int:
				anyNumber = true
			}
		}
		s := report.ShowColumn(c, vals)
		grouped := groups(vals, s)
		col := column{head: unitHead(c.Title(), s.Symbol), right: anyNumber, cells: make([]cell, len(vals))}
		for i, v := range vals {
			cl, err := cellOf(v, s, c.NumberFormat(), grouped)
			if err != nil {
				return nil, fmt.Errorf("internal error: row %d of table %q holds in column %q %w", i+1, t.Name, c.Key(), err)
			}
			col.cells[i] = cl
		}
		cols = append(cols, col)
	}
	return cols, nil
}

// vectorColumns lays out the vectors side by side: their labels, in the
// order they first appear, down the first column, a vector's value empty
// where it has none for a label.
func vectorColumns(vs []report.Vector) ([]column, error) {
	var labels []string
	index := map[string]int{}
	for _, v := range vs {
		if len(v.Values) != len(v.Labels) {
			return nil, fmt.Errorf("internal error: composition %q has %d labels and %d values", v.Name, len(v.Labels), len(v.Values))
		}
		for _, l := range v.Labels {
			if _, seen := index[l]; !seen {
				index[l] = len(labels)
				labels = append(labels, l)
			}
		}
	}
	what := vs[0].Label
	if what == "" {
		what = "item"
	}
	first := column{head: report.LabelOf(what)}
	for _, l := range labels {
		first.cells = append(first.cells, textCell(l))
	}
	cols := []column{first}
	for _, v := range vs {
		f := v.Format
		if f == (report.Format{}) {
			f = report.MoleFraction
		}
		vals := make([]any, len(labels))
		for i, l := range v.Labels {
			vals[index[l]] = v.Values[i]
		}
		s := report.ShowColumn(report.Column{Format: f}, vals)
		grouped := groups(vals, s)
		title := v.Title
		if title == "" {
			title = report.LabelOf(v.Name)
		}
		col := column{head: unitHead(title, s.Symbol), right: true, cells: make([]cell, len(vals))}
		for i, x := range vals {
			col.cells[i], _ = cellOf(x, s, f, grouped) // a float64 or nil: never an error
		}
		cols = append(cols, col)
	}
	return cols, nil
}

// matrixColumns lays out m with its labels down the first column and
// along the header, every value in one format.
func matrixColumns(m *report.Matrix) ([]column, error) {
	n := len(m.Labels)
	if len(m.Values) != n {
		return nil, fmt.Errorf("internal error: matrix %q has %d labels and %d rows", m.Name, n, len(m.Values))
	}
	for i, row := range m.Values {
		if len(row) != n {
			return nil, fmt.Errorf("internal error: row %d of matrix %q has %d values for %d labels", i+1, m.Name, len(row), n)
		}
	}
	f := m.Format
	if f == (report.Format{}) {
		f = report.Coefficient
	}
	var all []any
	for _, row := range m.Values {
		for _, x := range row {
			all = append(all, x)
		}
	}
	s := report.ShowColumn(report.Column{Format: f}, all)
	grouped := groups(all, s)
	first := column{head: report.LabelOf("component")} // what the matrix's labels are, as its CSV says
	for _, l := range m.Labels {
		first.cells = append(first.cells, textCell(l))
	}
	cols := []column{first}
	for j, l := range m.Labels {
		col := column{head: l, right: true, cells: make([]cell, n)}
		for i := range n {
			col.cells[i], _ = cellOf(m.Values[i][j], s, f, grouped) // a float64: never an error
		}
		cols = append(cols, col)
	}
	return cols, nil
}

// The frame of every data sheet: the title in the first row, the header in
// the second, the data from the third.
const (
	titleRow  = 1
	headerRow = 2
	firstRow  = 3
)

// sheet adds the sheet name with its title and columns, and lists it on
// the cover as holding holds.
func (b *book) sheet(name, title, holds string, cols []column) error {
	f := b.f
	if _, err := f.NewSheet(name); err != nil {
		return err
	}
	b.sheets = append(b.sheets, entry{name, holds})
	if err := b.set(name, 1, titleRow, textCell(title), style{title: true}); err != nil {
		return err
	}
	total := 0
	for j, c := range cols {
		col := j + 1
		if err := b.set(name, col, headerRow, textCell(c.head), style{header: true, right: c.right}); err != nil {
			return err
		}
		w := textWidth(c.head)
		for i, cl := range c.cells {
			st := style{numFmt: cl.numFmt, wrap: cl.kind == text && cl.width > maxColWidth}
			if err := b.set(name, col, firstRow+i, cl, st); err != nil {
				return err
			}
			w = max(w, cl.width)
		}
		w = min(max(w+2, minColWidth), maxColWidth)
		total += w
		letter, err := excelize.ColumnNumberToName(col)
		if err != nil {
			return err
		}
		if err := f.SetColWidth(name, letter, letter, float64(w)); err != nil {
			return err
		}
	}
	panes := &excelize.Panes{Freeze: true, YSplit: headerRow, TopLeftCell: "A3", ActivePane: "bottomLeft",
		Selection: []excelize.Selection{{SQRef: "A3", ActiveCell: "A3", Pane: "bottomLeft"}}}
	if total > report.DefaultWidth && len(cols) > 1 { // a text table would split it
		panes = &excelize.Panes{Freeze: true, XSplit: 1, YSplit: headerRow, TopLeftCell: "B3", ActivePane: "bottomRight",
			Selection: []excelize.Selection{{SQRef: "B3", ActiveCell: "B3", Pane: "bottomRight"}}}
	}
	return f.SetPanes(name, panes)
}

// set writes c into the cell at col and row of sheet, in style st.
func (b *book) set(sheet string, col, row int, c cell, st style) error {
	ref, err := excelize.CoordinatesToCellName(col, row)
	if err != nil {
		return err
	}
	switch c.kind {
	case empty:
		return nil
	case number:
		x := c.num
		if x == 0 {
			x = 0 // no negative zero
		}
		// Stored to MachineDigits, as CSV and JSON write it, without the
		// round-off of unit conversions (248.00000000000006 °F is 248).
		x = report.Rounded(x)
		if err := b.f.SetCellFloat(sheet, ref, x, fixedDigits(x), 64); err != nil {
			return err
		}
	case text:
		if err := b.f.SetCellStr(sheet, ref, c.text); err != nil {
			return err
		}
	}
	if st == (style{}) {
		return nil
	}
	id, err := b.style(st)
	if err != nil {
		return err
	}
	return b.f.SetCellStyle(sheet, ref, ref, id)
}

// fixedDigits is the number of decimals that writes x in fixed notation
// with the shortest digits that read back as x. (A precision of -1 would
// have the file writer cut the digits to 15 significant ones.)
func fixedDigits(x float64) int {
	mant, exp, _ := strings.Cut(strconv.FormatFloat(x, 'e', -1, 64), "e")
	e, _ := strconv.Atoi(exp) // FormatFloat always writes an exponent
	digits := len(strings.TrimPrefix(strings.Replace(mant, ".", "", 1), "-"))
	return max(0, digits-1-e)
}

// A style is a cell's look.
type style struct {
	numFmt string
	title  bool // a sheet's title: bold and larger
	header bool // a column's name: bold, a line under it
	right  bool
	wrap   bool
	link   bool // a link to a sheet
	label  bool // a label of the cover: bold
}

func (b *book) style(st style) (int, error) {
	if id, ok := b.styles[st]; ok {
		return id, nil
	}
	s := &excelize.Style{}
	if st.numFmt != "" {
		nf := st.numFmt
		s.CustomNumFmt = &nf
	}
	switch {
	case st.title:
		s.Font = &excelize.Font{Bold: true, Size: 13}
	case st.header:
		s.Font = &excelize.Font{Bold: true}
		s.Border = []excelize.Border{{Type: "bottom", Color: "000000", Style: 1}}
	case st.link:
		s.Font = &excelize.Font{Color: "0563C1", Underline: "single"}
	case st.label:
		s.Font = &excelize.Font{Bold: true}
	}
	if st.right || st.wrap {
		s.Alignment = &excelize.Alignment{WrapText: st.wrap, Vertical: "top"}
		if st.right {
			s.Alignment.Horizontal = "right"
		}
	}
	id, err := b.f.NewStyle(s)
	if err != nil {
		return 0, err
	}
	b.styles[st] = id
	return id, nil
}

// cover fills the first sheet.
func (b *book) cover(reports []*report.Report) error {
	const sh = coverName
	row := 1
	put := func(col int, c cell, st style) error { return b.set(sh, col, row, c, st) }
	if err := put(1, textCell(b.title(reports)), style{title: true}); err != nil {
		return err
	}
	row += 2
	for _, kv := range [][2]string{
		{"Command", b.opt.Command},
		{"Unit system", b.opt.UnitSystem},
		{"Caution", b.opt.Caution},
	} {
		if kv[1] == "" {
			continue
		}
		if err := put(1, textCell(kv[0]), style{label: true}); err != nil {
			return err
		}
		if err := put(2, textCell(kv[1]), style{wrap: true, label: kv[0] == "Caution"}); err != nil {
			return err
		}
		row++
	}
	row++
	if err := b.coverHeader(&row, "Sheet", "What it holds"); err != nil {
		return err
	}
	if len(b.sheets) == 0 {
		if err := put(1, textCell("none: the results have no quantities or tables"), style{}); err != nil {
			return err
		}
		row++
	}
	for _, e := range b.sheets {
		if err := put(1, textCell(e.name), style{link: true}); err != nil {
			return err
		}
		ref, _ := excelize.CoordinatesToCellName(1, row) // row and column are in range: set has just used them
		tip := "Go to " + e.name
		if err := b.f.SetCellHyperLink(sh, ref, quoteSheet(e.name)+"!A1", "Location", excelize.HyperlinkOpts{Tooltip: &tip}); err != nil {
			return err
		}
		if err := put(2, textCell(e.holds), style{wrap: true}); err != nil {
			return err
		}
		row++
	}
	for _, part := range []struct {
		head string
		msgs func(*report.Report) []string
	}{
		{"Warning", func(r *report.Report) []string { return r.Warnings }},
		{"Note", func(r *report.Report) []string { return r.Notes }},
	} {
		row++
		if err := b.coverHeader(&row, "Result", part.head); err != nil {
			return err
		}
		n := 0
		for _, r := range reports {
			for _, m := range part.msgs(r) {
				if err := put(1, textCell(reportTitle(r)), style{wrap: true}); err != nil {
					return err
				}
				if err := put(2, textCell(m), style{wrap: true}); err != nil {
					return err
				}
				row++
				n++
			}
		}
		if n == 0 {
			if err := put(1, textCell("none"), style{}); err != nil {
				return err
			}
			row++
		}
	}
	if err := b.f.SetColWidth(sh, "A", "A", coverLabelW); err != nil {
		return err
	}
	return b.f.SetColWidth(sh, "B", "B", coverTextW)
}

// coverHeader writes a header of two columns on the cover at *row and
// moves to the next row.
func (b *book) coverHeader(row *int, a, c string) error {
	if err := b.set(coverName, 1, *row, textCell(a), style{header: true}); err != nil {
		return err
	}
	if err := b.set(coverName, 2, *row, textCell(c), style{header: true}); err != nil {
		return err
	}
	*row++
	return nil
}

// quoteSheet writes a sheet name for a reference: in apostrophes, an
// apostrophe in it doubled.
func quoteSheet(name string) string {
	return "'" + strings.ReplaceAll(name, "'", "''") + "'"
}

// name makes the unique sheet name of a report's part: the report's
// (shortened) name and the part's, within the format's limits.
func (b *book) name(prefix, part string) string {
	p := clean(part)
	name := strings.TrimSpace(prefix + " " + p)
	if units16(name) > maxSheetName {
		name = strings.TrimSpace(prefix + " " + cut(p, maxSheetName-units16(prefix)-1))
	}
	if name == "" {
		name = "sheet"
	}
	base := name
	for k := 2; b.used[strings.ToLower(name)]; k++ {
		suffix := fmt.Sprintf(" (%d)", k)
		name = cut(base, maxSheetName-len(suffix)) + suffix
	}
	b.used[strings.ToLower(name)] = true
	return name
}

// clean makes s fit for a sheet name: the characters the format forbids
// ([]:*?/\) become hyphens, underscores and runs of white space single
// spaces, and no apostrophe starts or ends it.
func clean(s string) string {
	s = strings.Map(func(r rune) rune {
		switch {
		case strings.ContainsRune(`[]:*?/\`, r):
			return '-'
		case r == '_' || r < ' ':
			return ' '
		}
		return r
	}, s)
	return trimName(strings.Join(strings.Fields(s), " "))
}

func trimName(s string) string { return strings.Trim(s, " '") }

// shorten cuts s to at most n code units, at a space when that keeps more
// than half of it.
func shorten(s string, n int) string {
	if units16(s) <= n {
		return s
	}
	c := cut(s, n)
	if i := strings.LastIndexByte(c, ' '); i > n/2 {
		c = c[:i]
	}
	return trimName(c)
}

// cut is the longest start of s of at most n UTF-16 code units, the unit
// of the sheet-name limit.
func cut(s string, n int) string {
	used := 0
	for i, r := range s {
		used += utf16.RuneLen(r)
		if used > n {
			return trimName(s[:i])
		}
	}
	return s
}

func units16(s string) int {
	n := 0
	for _, r := range s {
		n += utf16.RuneLen(r)
	}
	return n
}
