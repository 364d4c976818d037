package report

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"
)

// MachineDigits is the precision of numbers in CSV and JSON: 14 significant
// digits, which drops the round-off of unit conversions (a temperature
// converted to kelvin and back comes out 60.00000000000006 °F, which 15
// digits would print as 60.0000000000001) and keeps far more digits than
// any input or model supports.
const MachineDigits = 14

// Rounded is x to MachineDigits significant digits, as CSV and JSON write
// it: what a workbook stores.
func Rounded(x float64) float64 {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return x
	}
	r, _ := strconv.ParseFloat(strconv.FormatFloat(x, 'g', MachineDigits, 64), 64)
	return r
}

// SummaryPart is the name of the CSV part that holds the summary; no
// table's part name may be the same (Table.Part).
const SummaryPart = "summary"

// summaryPart is the name of r's summary part.
func (r *Report) summaryPart() string { return SummaryPart }

// Parts lists the names of the CSV parts of r: each table, the summary
// when r has fields or compositions (first when r has no table), then the
// matrix. The first is the one CSV writes by default.
func (r *Report) Parts() []string {
	var p []string
	for i := range r.Tables {
		p = append(p, r.Tables[i].PartName())
	}
	if len(r.Fields) > 0 || len(r.Vectors) > 0 {
		if len(r.Tables) == 0 {
			p = append([]string{r.summaryPart()}, p...)
		} else {
			p = append(p, r.summaryPart())
		}
	}
	if r.Matrix != nil {
		p = append(p, r.Matrix.Name)
	}
	return p
}

// csvText formats a cell for CSV and JSON: numbers to MachineDigits.
func csvText(v any) string {
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
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return ""
		}
		return strconv.FormatFloat(x, 'g', MachineDigits, 64)
	}
	panic(fmt.Sprintf("report: cell of type %T", v)) // a command built a bad Report
}

// WriteCSV writes one part of r (Parts; "" is the first) as one
// rectangular table in full precision, the unit at the end of each column
// name. The summary is one row of its fields, then of each composition's
// values (liquid_composition_C1, …); a matrix is a row per label.
func WriteCSV(w io.Writer, r *Report, part string) error {
	parts := r.Parts()
	if len(parts) == 0 {
		return fmt.Errorf("the result has no table for CSV")
	}
	if part == "" {
		part = parts[0]
	}
	if !slices.Contains(parts, part) {
		return fmt.Errorf("the result has no table %q; it has %s", part, strings.Join(parts, ", "))
	}
	var header []string
	var rows [][]string
	switch {
	case part == r.summaryPart():
		var row []string
		for _, f := range r.Fields {
			if !Missing(f.Value) {
				header = append(header, f.Key())
				row = append(row, csvText(f.Value))
			}
		}
		for _, v := range r.Vectors {
			for i, l := range v.Labels {
				header = append(header, v.Name+"_"+l)
				row = append(row, csvText(v.Values[i]))
			}
		}
		rows = [][]string{row}
	case r.Matrix != nil && part == r.Matrix.Name:
		header = append([]string{"component"}, r.Matrix.Labels...)
		for i, l := range r.Matrix.Labels {
			row := []string{l}
			for _, x := range r.Matrix.Values[i] {
				row = append(row, csvText(x))
			}
			rows = append(rows, row)
		}
	default:
		t := r.Table(part)
		for _, c := range t.Columns {
			header = append(header, c.Key())
		}
		for _, row := range t.Rows {
			cells := make([]string, len(row))
			for i, v := range row {
				cells[i] = csvText(v)
			}
			rows = append(rows, cells)
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

// WriteJSON writes the reports as JSON: one object, or with several an
// object of them by name. Fields are keys with their unit
// (dew_pressure_psia), compositions objects by component, tables arrays of
// row objects, the matrix an object of objects, then the run's warnings
// and notes.
func WriteJSON(w io.Writer, reports ...*Report) error {
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
		b.WriteString(strconv.FormatFloat(x, 'g', MachineDigits, 64))
	case nil:
		b.WriteString("null")
	default:
		b.WriteString(csvText(v))
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
		if Missing(f.Value) {
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
	for _, list := range []struct {
		key  string
		msgs []string
	}{{"warnings", r.Warnings}, {"notes", r.Notes}} {
		if len(list.msgs) == 0 {
			continue
		}
		sep()
		appendKey(b, list.key)
		b.WriteByte('[')
		for i, m := range list.msgs {
			if i > 0 {
				b.WriteByte(',')
			}
			appendValue(b, m)
		}
		b.WriteByte(']')
	}
	b.WriteByte('}')
}
