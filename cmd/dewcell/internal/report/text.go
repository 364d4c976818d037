package report

import (
	"fmt"
	"io"
	"strings"
	"unicode/utf8"
)

// DefaultWidth is the widest line Text writes: a 120-column terminal.
const DefaultWidth = 120

// TextOptions choose what Text writes.
type TextOptions struct {
	Width   int  // the widest line; 0 means DefaultWidth
	Verbose bool // show solver diagnostics (columns marked Verbose)
	Brief   bool // leave out the Detail tables
}

// footnoteWidth is the widest text a table cell holds; a longer one is
// replaced by a numbered note under the table.
const footnoteWidth = 28

// WriteText writes the reports for people: the summary as quantity, value
// and unit; each table with its title, the unit under each column name and
// the numbers right-aligned in fixed decimals; a table wider than the
// width is split into sections that each repeat its first column.
func WriteText(w io.Writer, opt TextOptions, reports ...*Report) error {
	if opt.Width <= 0 {
		opt.Width = DefaultWidth
	}
	var b strings.Builder
	for i, r := range reports {
		if i > 0 {
			b.WriteByte('\n')
		}
		r.text(&b, opt)
	}
	_, err := io.WriteString(w, b.String())
	return err
}

func (r *Report) text(b *strings.Builder, opt TextOptions) {
	if r.Title != "" {
		b.WriteString(wrap(Capitalize(r.Title), opt.Width, ""))
	}
	if fields := r.shownFields(opt.Verbose); len(fields) > 0 {
		var short []Field
		var long []string
		for _, f := range fields {
			if s, isText := f.Value.(string); isText && width(s) > footnoteWidth {
				long = append(long, f.Title()+": "+s)
				continue
			}
			short = append(short, f)
		}
		if len(short) > 0 {
			summaryGrid(short).write(b, opt.Width)
		}
		for _, l := range long {
			b.WriteString(wrap(l, opt.Width, "  "))
		}
	}
	if t := CompositionTable(r.Vectors); t != nil {
		b.WriteString("\n" + wrap(Capitalize(t.Title), opt.Width, ""))
		g, _ := tableGrid(t, opt.Verbose)
		g.write(b, opt.Width)
	}
	for i := range r.Tables {
		t := &r.Tables[i]
		if opt.Brief && t.Detail {
			continue
		}
		title := t.Title
		if title == "" {
			title = LabelOf(t.Name)
		}
		b.WriteString("\n" + wrap(Capitalize(title), opt.Width, ""))
		if len(t.Rows) == 0 {
			b.WriteString("(none)\n")
			continue
		}
		g, notes := tableGrid(t, opt.Verbose)
		if t.Transpose {
			g = transposedGrid(t, opt.Verbose)
		}
		g.write(b, opt.Width)
		for _, n := range notes {
			b.WriteString(wrap(n, opt.Width, "     "))
		}
	}
	if m := r.Matrix; m != nil {
		title := m.Title
		if title == "" {
			title = LabelOf(m.Name)
		}
		b.WriteString("\n" + wrap(Capitalize(title), opt.Width, ""))
		g, _ := tableGrid(m.AsTable(), opt.Verbose)
		g.write(b, opt.Width)
	}
}

// shownFields are the summary fields people see.
func (r *Report) shownFields(verbose bool) []Field {
	var out []Field
	for _, f := range r.Fields {
		if !Missing(f.Value) && (verbose || !f.Verbose) {
			out = append(out, f)
		}
	}
	return out
}

// Capitalize makes the first letter of s upper case.
func Capitalize(s string) string {
	if s != "" && s[0] >= 'a' && s[0] <= 'z' {
		return string(s[0]-'a'+'A') + s[1:]
	}
	return s
}

// A cell is the text of one table cell, on one or more lines.
type cell struct {
	lines []string
	right bool
}

func textCell(s string) cell { return cell{lines: []string{s}} }

// A grid is a table laid out for a terminal.
type grid struct {
	head  [][]cell // header rows, usually one
	rows  [][]cell
	fixed int // the first fixed columns, repeated in every section
}

func width(s string) int { return utf8.RuneCountInString(s) }

func (c cell) width() int {
	n := 0
	for _, l := range c.lines {
		n = max(n, width(l))
	}
	return n
}

// write draws g, split into sections of at most maxWidth characters.
func (g *grid) write(b *strings.Builder, maxWidth int) {
	ncol := 0
	for _, r := range append(append([][]cell(nil), g.head...), g.rows...) {
		ncol = max(ncol, len(r))
	}
	if ncol == 0 {
		return
	}
	colW := make([]int, ncol)
	for _, r := range append(append([][]cell(nil), g.head...), g.rows...) {
		for j, c := range r {
			colW[j] = max(colW[j], c.width())
		}
	}
	// Sections: the fixed columns, then as many more as fit.
	fixed := max(1, g.fixed)
	fixedW := 1
	for j := 0; j < fixed && j < ncol; j++ {
		fixedW += colW[j] + 3
	}
	var sections [][]int
	var cur []int
	curW := fixedW
	for j := fixed; j < ncol; j++ {
		if len(cur) > 0 && curW+colW[j]+3 > maxWidth {
			sections = append(sections, cur)
			cur, curW = nil, fixedW
		}
		cur = append(cur, j)
		curW += colW[j] + 3
	}
	if len(cur) > 0 || len(sections) == 0 {
		sections = append(sections, cur)
	}
	for si, sec := range sections {
		cols := make([]int, 0, fixed+len(sec))
		for j := 0; j < fixed && j < ncol; j++ {
			cols = append(cols, j)
		}
		cols = append(cols, sec...)
		if si > 0 {
			b.WriteString("(continued)\n")
		}
		rule := func() {
			b.WriteByte('+')
			for _, j := range cols {
				b.WriteString(strings.Repeat("-", colW[j]+2))
				b.WriteByte('+')
			}
			b.WriteByte('\n')
		}
		line := func(row []cell) {
			n := 1
			for _, j := range cols {
				if j < len(row) {
					n = max(n, len(row[j].lines))
				}
			}
			for k := range n {
				b.WriteByte('|')
				for _, j := range cols {
					var c cell
					if j < len(row) {
						c = row[j]
					}
					s := ""
					if k < len(c.lines) {
						s = c.lines[k]
					}
					pad := strings.Repeat(" ", colW[j]-width(s))
					if c.right {
						b.WriteString(" " + pad + s + " |")
					} else {
						b.WriteString(" " + s + pad + " |")
					}
				}
				b.WriteByte('\n')
			}
		}
		rule()
		for _, h := range g.head {
			line(h)
		}
		if len(g.head) > 0 {
			rule()
		}
		for _, r := range g.rows {
			line(r)
		}
		rule()
	}
}

// numeric reports whether v is shown as a number, right-aligned.
func numeric(v any) bool {
	switch v.(type) {
	case float64, int:
		return true
	}
	return false
}

// summaryGrid lays out fields as quantity, value and unit, never split.
func summaryGrid(fields []Field) *grid {
	g := &grid{head: [][]cell{{textCell("Quantity"), {lines: []string{"Value"}, right: true}, textCell("Unit")}}, fixed: 3}
	for _, f := range fields {
		s := ShowField(f)
		sym := s.Symbol
		if _, isText := f.Value.(string); isText {
			sym = ""
		}
		g.rows = append(g.rows, []cell{textCell(f.Title()), {lines: []string{s.Text(f.Value)}, right: numeric(f.Value)}, textCell(sym)})
	}
	return g
}

// header is the heading cell of a column: its name over as many lines as
// keep it about as wide as its values, then its unit.
func header(title, unit string, valueW int, right bool) cell {
	// At most about three lines of name: a column as wide as a third of
	// the name, or as its values.
	target := max(valueW, width(unit), 8, (width(title)+2)/3+2)
	lines := wrapLines(title, target)
	if unit != "" {
		lines = append(lines, unit)
	}
	return cell{lines: lines, right: right}
}

// padHead makes every header cell of a row as tall, the names at the top
// and the units on the last line.
func padHead(row []cell) {
	n := 0
	for _, c := range row {
		n = max(n, len(c.lines))
	}
	for i, c := range row {
		if len(c.lines) == 0 {
			row[i].lines = make([]string, n)
			continue
		}
		// Keep a unit on the last line: insert the blank lines before it.
		for len(row[i].lines) < n {
			l := row[i].lines
			if strings.HasPrefix(l[len(l)-1], "[") {
				row[i].lines = append(append(append([]string(nil), l[:len(l)-1]...), ""), l[len(l)-1])
			} else {
				row[i].lines = append(l, "")
			}
		}
	}
}

// tableGrid lays out t; text cells longer than footnoteWidth become
// numbered notes, returned for writing under the table.
func tableGrid(t *Table, verbose bool) (*grid, []string) {
	var cols []int
	for j, c := range t.Columns {
		if verbose || !c.Verbose {
			cols = append(cols, j)
		}
	}
	g := &grid{fixed: 1}
	var notes []string
	noteOf := map[string]string{}
	body := make([][]cell, len(t.Rows))
	head := make([]cell, len(cols))
	for k, j := range cols {
		c := t.Columns[j]
		vals := make([]any, len(t.Rows))
		anyNumber := false
		for i, row := range t.Rows {
			vals[i] = row[j]
			anyNumber = anyNumber || numeric(row[j])
		}
		s := ShowColumn(c, vals)
		valueW := 1
		for i, v := range vals {
			txt := s.Text(v)
			if str, isText := v.(string); isText && width(str) > footnoteWidth {
				mark, seen := noteOf[str]
				if !seen {
					mark = fmt.Sprintf("[%d]", len(notes)+1)
					noteOf[str] = mark
					notes = append(notes, mark+" "+str)
				}
				txt = mark
			}
			body[i] = append(body[i], cell{lines: []string{txt}, right: numeric(v) || Missing(v) && anyNumber})
			valueW = max(valueW, width(txt))
		}
		unit := ""
		if s.Symbol != "" {
			unit = "[" + s.Symbol + "]"
		}
		head[k] = header(c.Title(), unit, valueW, anyNumber)
	}
	padHead(head)
	g.head = [][]cell{head}
	g.rows = body
	return g, notes
}

// transposedGrid lays out t with a row per column of t (its title, then
// each case's value, then the unit) and a column per row of t, headed by
// the row's first cell.
func transposedGrid(t *Table, verbose bool) *grid {
	head := []cell{textCell("Quantity")}
	for _, row := range t.Rows {
		head = append(head, cell{lines: []string{(Shown{}).Text(row[0])}, right: true})
	}
	head = append(head, textCell("Unit"))
	g := &grid{head: [][]cell{head}, fixed: 1}
	for j, c := range t.Columns[1:] {
		if c.Verbose && !verbose {
			continue
		}
		vals := make([]any, len(t.Rows))
		for i, row := range t.Rows {
			vals[i] = row[j+1]
		}
		s := ShowColumn(c, vals)
		line := []cell{textCell(c.Title())}
		for _, v := range vals {
			line = append(line, cell{lines: []string{s.Text(v)}, right: numeric(v) || Missing(v)})
		}
		g.rows = append(g.rows, append(line, textCell(s.Symbol)))
	}
	return g
}

// wrapLines breaks s at spaces into lines of at most n characters; a word
// longer than n has a line of its own.
func wrapLines(s string, n int) []string {
	var lines []string
	cur := ""
	for _, w := range strings.Fields(s) {
		switch {
		case cur == "":
			cur = w
		case width(cur)+1+width(w) <= n:
			cur += " " + w
		default:
			lines = append(lines, cur)
			cur = w
		}
	}
	if cur != "" || len(lines) == 0 {
		lines = append(lines, cur)
	}
	return lines
}

// wrap breaks s into lines of at most n characters, the later ones
// indented, each ending in a newline.
func wrap(s string, n int, indent string) string {
	lines := wrapLines(s, n-width(indent))
	var b strings.Builder
	for i, l := range lines {
		if i > 0 {
			b.WriteString(indent)
		}
		b.WriteString(l + "\n")
	}
	return b.String()
}
