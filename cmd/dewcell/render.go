package main

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/olekukonko/tablewriter"
	"github.com/olekukonko/tablewriter/tw"

	"dewcell/cmd/dewcell/internal/units"
)

// A Column names a quantity and the unit it is shown in.
type Column struct {
	Name string     // snake_case, e.g. "pressure"
	Unit units.Unit // the zero Unit for a dimensionless number or a text
}

// Key is the JSON and CSV name: the name, then the unit key (pressure_psia).
func (c Column) Key() string {
	if c.Unit.Key == "" {
		return c.Name
	}
	return c.Name + "_" + c.Unit.Key
}

// Header is the name for people: "pressure [psia]".
func (c Column) Header() string {
	h := strings.ReplaceAll(c.Name, "_", " ")
	if c.Unit.Symbol != "" {
		h += " [" + c.Unit.Symbol + "]"
	}
	return h
}

// A Field is one scalar result. Value is a string, a bool, an int or a float64; a
// nil Value or a NaN means the result does not exist and it is left out.
type Field struct {
	Column
	Value any
}

// A Vector is a number per label, such as a phase composition keyed by
// component name; JSON gives it as an object.
type Vector struct {
	Name   string // JSON key, e.g. "liquid_composition"
	Label  string // what the labels are, e.g. "component"
	Labels []string
	Values []float64
}

// A Table has named columns and rows of cells (string, int or float64; nil or
// NaN for a missing value). JSON gives it as an array of row objects.
type Table struct {
	Name    string // JSON key, e.g. "points"
	Title   string // heading for people
	Columns []Column
	Rows    [][]any
}

// A Matrix is a square table of numbers between labelled items, such as the
// interaction coefficients; JSON gives it as an object of objects.
type Matrix struct {
	Name   string // JSON key, e.g. "kij"
	Title  string
	Labels []string
	Values [][]float64
}

// A Report is the result of one command, in the units it is shown in.
type Report struct {
	Name    string // JSON key when several reports are written together
	Title   string // heading for people
	Fields  []Field
	Vectors []Vector
	Tables  []Table
	Matrix  *Matrix
}

// Output formats.
const (
	formatTable = "table"
	formatCSV   = "csv"
	formatJSON  = "json"
)

var formats = []string{formatTable, formatCSV, formatJSON}

// render writes the reports in format. CSV takes a single report.
func render(w io.Writer, format string, reports ...*Report) error {
	switch format {
	case formatTable:
		for i, r := range reports {
			if i > 0 {
				if _, err := fmt.Fprintln(w); err != nil {
					return err
				}
			}
			if err := r.writeTable(w); err != nil {
				return err
			}
		}
		return nil
	case formatCSV:
		if len(reports) != 1 {
			return fmt.Errorf("CSV holds one table, and this command gives %d reports; use --format table or json", len(reports))
		}
		return reports[0].writeCSV(w)
	case formatJSON:
		var b bytes.Buffer
		if len(reports) == 1 {
			reports[0].appendJSON(&b)
		} else {
			b.WriteByte('{')
			for i, r := range reports {
				if i > 0 {
					b.WriteByte(',')
				}
				appendKey(&b, r.Name)
				r.appendJSON(&b)
			}
			b.WriteByte('}')
		}
		var out bytes.Buffer
		if err := json.Indent(&out, b.Bytes(), "", "  "); err != nil {
			return fmt.Errorf("internal error writing JSON: %w", err)
		}
		out.WriteByte('\n')
		_, err := w.Write(out.Bytes())
		return err
	}
	return fmt.Errorf("unknown format %q", format)
}

// missing reports whether a cell holds no value.
func missing(v any) bool {
	f, isFloat := v.(float64)
	return v == nil || isFloat && math.IsNaN(f)
}

// machineDigits is the precision of numbers in CSV and JSON: 14 significant
// digits, which drops the round-off of unit conversions (a temperature
// converted to kelvin and back comes out 60.00000000000006 °F, which 15
// digits would print as 60.0000000000001) and keeps far more digits than
// any input or model supports.
const machineDigits = 14

// cellText formats a cell for CSV: numbers to machineDigits.
func cellText(v any) string {
	switch x := v.(type) {
	case nil:
		return ""
	case string:
		return x
	case int:
		return strconv.Itoa(x)
	case bool:
		return strconv.FormatBool(x)
	case float64:
		if math.IsNaN(x) {
			return ""
		}
		return strconv.FormatFloat(x, 'g', machineDigits, 64)
	}
	panic(fmt.Sprintf("render: cell of type %T", v)) // a command built a bad Report
}

// cellShort formats a cell for people: six significant digits.
func cellShort(v any) string {
	switch x := v.(type) {
	case nil:
		return "-"
	case bool:
		if x {
			return "yes"
		}
		return "no"
	case float64:
		if math.IsNaN(x) {
			return "-"
		}
		return strconv.FormatFloat(x, 'g', 6, 64)
	}
	return cellText(v)
}

func appendKey(b *bytes.Buffer, k string) {
	kb, _ := json.Marshal(k) // a string always marshals
	b.Write(kb)
	b.WriteByte(':')
}

func appendValue(b *bytes.Buffer, v any) {
	switch x := v.(type) {
	case string:
		s, _ := json.Marshal(x)
		b.Write(s)
	case float64:
		if math.IsNaN(x) || math.IsInf(x, 0) {
			b.WriteString("null")
			return
		}
		b.WriteString(strconv.FormatFloat(x, 'g', machineDigits, 64))
	case nil:
		b.WriteString("null")
	default:
		b.WriteString(cellText(v))
	}
}

func (r *Report) appendJSON(b *bytes.Buffer) {
	b.WriteByte('{')
	first := true
	sep := func() {
		if !first {
			b.WriteByte(',')
		}
		first = false
	}
	for _, f := range r.Fields {
		if missing(f.Value) {
			continue
		}
		sep()
		appendKey(b, f.Key())
		appendValue(b, f.Value)
	}
	for _, v := range r.Vectors {
		sep()
		appendKey(b, v.Name)
		b.WriteByte('{')
		for i, l := range v.Labels {
			if i > 0 {
				b.WriteByte(',')
			}
			appendKey(b, l)
			appendValue(b, v.Values[i])
		}
		b.WriteByte('}')
	}
	for _, t := range r.Tables {
		sep()
		appendKey(b, t.Name)
		b.WriteByte('[')
		for i, row := range t.Rows {
			if i > 0 {
				b.WriteByte(',')
			}
			b.WriteByte('{')
			for j, c := range t.Columns {
				if j > 0 {
					b.WriteByte(',')
				}
				appendKey(b, c.Key())
				appendValue(b, row[j])
			}
			b.WriteByte('}')
		}
		b.WriteByte(']')
	}
	if m := r.Matrix; m != nil {
		sep()
		appendKey(b, m.Name)
		b.WriteByte('{')
		for i, li := range m.Labels {
			if i > 0 {
				b.WriteByte(',')
			}
			appendKey(b, li)
			b.WriteByte('{')
			for j, lj := range m.Labels {
				if j > 0 {
					b.WriteByte(',')
				}
				appendKey(b, lj)
				appendValue(b, m.Values[i][j])
			}
			b.WriteByte('}')
		}
		b.WriteByte('}')
	}
	b.WriteByte('}')
}

// writeCSV writes the report as one rectangular table:
//
//   - with tables: the rows of the first, then those of any later table with
//     the same columns; each field is a further column, repeated on every row,
//     and a matrix whose labels are the first column gives a column per label
//     (kij_C1, …);
//   - without tables: one row of the fields, then of each vector's values
//     (liquid_composition_C1, …).
func (r *Report) writeCSV(w io.Writer) error {
	var header []string
	var rows [][]string
	fields := r.Fields[:0:0]
	for _, f := range r.Fields {
		if !missing(f.Value) {
			fields = append(fields, f)
		}
	}
	if len(r.Tables) == 0 {
		var row []string
		for _, f := range fields {
			header = append(header, f.Key())
			row = append(row, cellText(f.Value))
		}
		for _, v := range r.Vectors {
			for i, l := range v.Labels {
				header = append(header, v.Name+"_"+l)
				row = append(row, cellText(v.Values[i]))
			}
		}
		rows = append(rows, row)
	} else {
		if len(r.Vectors) > 0 {
			return errors.New("internal error: a report with tables and vectors has no CSV form")
		}
		first := r.Tables[0]
		for _, c := range first.Columns {
			header = append(header, c.Key())
		}
		for _, t := range r.Tables {
			if len(t.Columns) != len(first.Columns) {
				return fmt.Errorf("internal error: tables %s and %s differ in columns", first.Name, t.Name)
			}
			for i, c := range t.Columns {
				if c.Key() != first.Columns[i].Key() {
					return fmt.Errorf("internal error: tables %s and %s differ in columns", first.Name, t.Name)
				}
			}
			for _, row := range t.Rows {
				cells := make([]string, len(row))
				for i, v := range row {
					cells[i] = cellText(v)
				}
				rows = append(rows, cells)
			}
		}
		for _, f := range fields {
			header = append(header, f.Key())
			for i := range rows {
				rows[i] = append(rows[i], cellText(f.Value))
			}
		}
		if m := r.Matrix; m != nil {
			if len(rows) != len(m.Labels) {
				return errors.New("internal error: matrix and table differ in length")
			}
			for j, l := range m.Labels {
				header = append(header, m.Name+"_"+l)
				for i := range rows {
					if rows[i][0] != m.Labels[i] {
						return errors.New("internal error: matrix labels are not the table's first column")
					}
					rows[i] = append(rows[i], cellText(m.Values[i][j]))
				}
			}
		}
	}
	cw := csv.NewWriter(w)
	if err := cw.Write(header); err != nil {
		return err
	}
	if err := cw.WriteAll(rows); err != nil {
		return err
	}
	return cw.Error()
}

// writeTable writes the report for people.
func (r *Report) writeTable(w io.Writer) error {
	heading := func(s string) error {
		if s == "" {
			return nil
		}
		_, err := fmt.Fprintln(w, s)
		return err
	}
	if err := heading(r.Title); err != nil {
		return err
	}
	if len(r.Fields) > 0 {
		var rows [][]string
		for _, f := range r.Fields {
			if !missing(f.Value) {
				rows = append(rows, []string{f.Header(), cellShort(f.Value)})
			}
		}
		if err := table(w, []string{"quantity", "value"}, rows); err != nil {
			return err
		}
	}
	if len(r.Vectors) > 0 {
		// Vectors over the same labels side by side.
		v0 := r.Vectors[0]
		header := []string{v0.Label}
		rows := make([][]string, len(v0.Labels))
		for i, l := range v0.Labels {
			rows[i] = []string{l}
		}
		for _, v := range r.Vectors {
			if len(v.Labels) != len(v0.Labels) {
				return errors.New("internal error: vectors of different lengths")
			}
			header = append(header, strings.ReplaceAll(v.Name, "_", " "))
			for i, x := range v.Values {
				rows[i] = append(rows[i], cellShort(x))
			}
		}
		if err := table(w, header, rows); err != nil {
			return err
		}
	}
	for _, t := range r.Tables {
		if err := heading(t.Title); err != nil {
			return err
		}
		header := make([]string, len(t.Columns))
		for i, c := range t.Columns {
			header[i] = c.Header()
		}
		rows := make([][]string, len(t.Rows))
		for i, row := range t.Rows {
			rows[i] = make([]string, len(row))
			for j, v := range row {
				rows[i][j] = cellShort(v)
			}
		}
		if err := table(w, header, rows); err != nil {
			return err
		}
	}
	if m := r.Matrix; m != nil {
		if err := heading(m.Title); err != nil {
			return err
		}
		header := append([]string{""}, m.Labels...)
		rows := make([][]string, len(m.Labels))
		for i, l := range m.Labels {
			rows[i] = []string{l}
			for _, v := range m.Values[i] {
				rows[i] = append(rows[i], cellShort(v))
			}
		}
		if err := table(w, header, rows); err != nil {
			return err
		}
	}
	return nil
}

// table draws one table: text in the first column on the left, numbers on
// the right, headers as given.
func table(w io.Writer, header []string, rows [][]string) error {
	align := make([]tw.Align, len(header))
	for i := range align {
		align[i] = tw.AlignRight
	}
	align[0] = tw.AlignLeft
	t := tablewriter.NewTable(w,
		tablewriter.WithRendition(tw.Rendition{Symbols: tw.NewSymbols(tw.StyleASCII)}),
		tablewriter.WithHeaderAutoFormat(tw.Off),
		tablewriter.WithHeaderAlignment(tw.AlignCenter),
		tablewriter.WithRowAlignmentConfig(tw.CellAlignment{PerColumn: align}),
	)
	t.Header(header)
	for _, row := range rows {
		if err := t.Append(row); err != nil {
			return err
		}
	}
	return t.Render()
}
