// Package html writes a study's results as one self-contained HTML file:
// inline styles and figures (SVG), no scripts and nothing fetched, laid out
// for the screen and for print (page breaks before each part, tables and
// figures kept whole).
package html

import (
	"bytes"
	_ "embed"
	"errors"
	"fmt"
	"html/template"
	"io"
	"regexp"
	"strings"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/report/figure"
)

// Options describe the study the reports come from.
type Options struct {
	Title     string   // the study's title
	File      string   // the study file as named on the command line
	Source    string   // the study file's text, echoed in an appendix; empty leaves it out
	Command   string   // the command that wrote the report
	Units     string   // the unit system of the numbers
	Generated string   // when, as people read it ("2026-12-02 14:05 UTC")
	Version   string   // of the program
	Cautions  []string // the usual cautions, one paragraph each
	// Inputs is a result echoing the study's inputs, shown first; nil
	// leaves it out.
	Inputs *report.Report
}

// Write writes the reports, in order, as one HTML document: a title block
// with the cautions, the contents, the warnings of the whole run, then a
// part per report (its summary, its tables, its figures, its notes and
// warnings), an appendix of the detail tables and the study file.
func Write(w io.Writer, opt Options, reports ...*report.Report) error {
	if len(reports) == 0 {
		return errors.New("no results to write")
	}
	doc := document{Options: opt, CSS: template.CSS(css)}
	all := reports
	if opt.Inputs != nil {
		all = append([]*report.Report{opt.Inputs}, reports...)
	}
	nFig := 0
	for i, r := range all {
		if r == nil {
			return fmt.Errorf("result %d is missing", i+1)
		}
		p := part{ID: fmt.Sprintf("part-%d", i+1), Title: r.Section, Subtitle: report.Capitalize(r.Title), Notes: r.Notes, Warnings: r.Warnings}
		switch {
		case p.Title == "" && p.Subtitle != "":
			p.Title, p.Subtitle = p.Subtitle, ""
		case p.Title == "":
			p.Title = report.LabelOf(r.Name)
		}
		p.Summary = summaryOf(r)
		if t := report.CompositionTable(r.Vectors); t != nil {
			p.Tables = append(p.Tables, split(tableOf(t))...)
		}
		for ti := range r.Tables {
			t := &r.Tables[ti]
			tv := tableOf(t)
			if t.Detail {
				tv.ID = fmt.Sprintf("%s-detail-%d", p.ID, ti+1)
				doc.Details = append(doc.Details, detail{Part: p.Title, PartID: p.ID, Tables: split(tv)})
				p.DetailRefs = append(p.DetailRefs, tv)
				continue
			}
			p.Tables = append(p.Tables, split(tv)...)
		}
		if r.Matrix != nil {
			p.Tables = append(p.Tables, split(tableOf(r.Matrix.AsTable()))...)
		}
		for _, f := range r.Figures {
			svg, err := figure.InlineSVG(f)
			if err != nil {
				return fmt.Errorf("figure %q: %w", f.Title, err)
			}
			nFig++
			p.Figures = append(p.Figures, fig{N: nFig, ID: fmt.Sprintf("figure-%d", nFig), Title: f.Title, Caption: f.Caption, SVG: template.HTML(svg)})
		}
		for _, m := range r.Warnings {
			doc.Warnings = append(doc.Warnings, warning{Part: p.Title, PartID: p.ID, Text: m})
		}
		doc.Parts = append(doc.Parts, p)
	}
	var b bytes.Buffer
	if err := page.Execute(&b, doc); err != nil {
		return fmt.Errorf("internal error writing HTML: %w", err)
	}
	_, err := w.Write(b.Bytes())
	return err
}

type document struct {
	Options
	CSS      template.CSS
	Parts    []part
	Details  []detail
	Warnings []warning
}

type part struct {
	ID, Title  string
	Subtitle   string
	Summary    []row
	Tables     []*table
	DetailRefs []*table
	Figures    []fig
	Notes      []string
	Warnings   []string
}

type row struct {
	Label, Value string
	Unit         template.HTML
	Number       bool
	Long         bool // a text too long for the table: shown as a paragraph
}

type table struct {
	ID, Title string
	Head      []headCell
	Rows      [][]cellView
}

type headCell struct {
	Label  string
	Unit   template.HTML // the unit, powers of ten as superscripts
	Number bool
}

// unitHTML writes a unit for a page: "10^-6/psi" as 10<sup>-6</sup>/psi.
func unitHTML(sym string) template.HTML {
	e := template.HTMLEscapeString(sym)
	return template.HTML(power.ReplaceAllString(e, "10<sup>$1</sup>"))
}

var power = regexp.MustCompile(`10\^(-?[0-9]+)`)

type cellView struct {
	Text   string
	Number bool
}

type fig struct {
	N         int
	ID, Title string
	Caption   string
	SVG       template.HTML
}

type detail struct {
	Part, PartID string
	Tables       []*table // one table, split to fit the page
}

type warning struct {
	Part, PartID, Text string
}

// longText is the length from which a text value leaves the summary table
// for a paragraph under it.
const longText = 60

func summaryOf(r *report.Report) []row {
	var out []row
	for _, f := range r.Fields {
		if report.Missing(f.Value) || f.Verbose {
			continue
		}
		s := report.ShowField(f)
		rw := row{Label: f.Title(), Value: s.Text(f.Value), Unit: unitHTML(s.Symbol)}
		switch v := f.Value.(type) {
		case float64, int:
			rw.Number = true
		case string:
			rw.Unit = ""
			rw.Long = len(v) > longText
		default:
			rw.Unit = ""
		}
		out = append(out, rw)
	}
	return out
}

func numeric(v any) bool {
	switch v.(type) {
	case float64, int:
		return true
	}
	return false
}

// pageChars is the width a table may take, in characters of its text: an
// A4 page between margins at the print size of the tables (7.5 pt), and a
// screen of about 1100 pixels.
const pageChars = 110

// cellPad is what a cell's padding and rule take, in characters.
const cellPad = 2

// split cuts tv into tables no wider than pageChars, each repeating its
// first column; the later ones are titled as continued.
func split(tv *table) []*table {
	n := len(tv.Head)
	if n == 0 || len(tv.Rows) == 0 { // an empty table shows as "None."
		return []*table{tv}
	}
	w := make([]int, n)
	for j, h := range tv.Head {
		for _, word := range strings.Fields(h.Label) { // headers wrap at spaces
			w[j] = max(w[j], len([]rune(word)))
		}
		w[j] = max(w[j], len([]rune(string(h.Unit)))-9) // "10<sup>6</sup>" reads as 4
	}
	for _, r := range tv.Rows {
		for j, c := range r {
			if j < n {
				w[j] = max(w[j], len([]rune(c.Text)))
			}
		}
	}
	var sections [][]int
	var cur []int
	used := w[0] + cellPad
	for j := 1; j < n; j++ {
		if len(cur) > 0 && used+w[j]+cellPad > pageChars {
			sections = append(sections, cur)
			cur, used = nil, w[0]+cellPad
		}
		cur = append(cur, j)
		used += w[j] + cellPad
	}
	if len(sections) == 0 {
		return []*table{tv}
	}
	sections = append(sections, cur)
	out := make([]*table, len(sections))
	for k, sec := range sections {
		cols := append([]int{0}, sec...)
		part := &table{Title: tv.Title}
		if k == 0 {
			part.ID = tv.ID
		} else {
			part.Title = tv.Title + " (continued)"
		}
		for _, j := range cols {
			part.Head = append(part.Head, tv.Head[j])
		}
		for _, r := range tv.Rows {
			var cells []cellView
			for _, j := range cols {
				cells = append(cells, r[j])
			}
			part.Rows = append(part.Rows, cells)
		}
		out[k] = part
	}
	return out
}

func tableOf(t *report.Table) *table {
	title := t.Title
	if title == "" {
		title = report.LabelOf(t.Name)
	}
	tv := &table{Title: report.Capitalize(title)}
	var cols []int
	for j, c := range t.Columns {
		if !c.Verbose {
			cols = append(cols, j)
		}
	}
	shown := make([]report.Shown, len(t.Columns))
	for _, j := range cols {
		c := t.Columns[j]
		vals := make([]any, len(t.Rows))
		isNum := false
		for i, r := range t.Rows {
			vals[i] = r[j]
			isNum = isNum || numeric(r[j])
		}
		shown[j] = report.ShowColumn(c, vals)
		tv.Head = append(tv.Head, headCell{Label: c.Title(), Unit: unitHTML(shown[j].Symbol), Number: isNum})
	}
	for _, r := range t.Rows {
		var cells []cellView
		for _, j := range cols {
			cells = append(cells, cellView{Text: shown[j].Text(r[j]), Number: numeric(r[j]) || report.Missing(r[j])})
		}
		tv.Rows = append(tv.Rows, cells)
	}
	return tv
}

//go:embed report.css
var css string

var page = template.Must(template.New("report").Funcs(template.FuncMap{
	"lines": func(s string) []string { return strings.Split(strings.TrimRight(s, "\n"), "\n") },
}).Parse(pageTemplate))

//go:embed report.tmpl
var pageTemplate string
