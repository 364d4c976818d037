package workbook

import (
	"archive/zip"
	"bytes"
	"encoding/xml"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"unicode/utf16"

	"github.com/xuri/excelize/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/units"
)

// The reports of these tests are invented, shaped like those of the
// commands: a depletion with its summary (a pressure in psia, gas in MMscf
// that people read in Bscf, condensate in STB read in MMSTB, a text, a
// yes/no, a count and a solver diagnostic), ten steps with a missing Z and
// a NaN recovery, two tables named "steps", a table named "summary" beside
// the summary, an empty table, compositions and an interaction matrix.
// They are checked against the file as a general-purpose spreadsheet
// library reads it back, and against its XML.

const testCaution = "caution: screening estimates; reserves and development decisions need review by qualified, licensed professionals under local regulations"

var testOptions = Options{
	Title:      "Invented rich condensate, north block",
	Caution:    testCaution,
	Command:    "dewcell recover examples/north.toml --units field",
	UnitSystem: "field",
}

var (
	pressure = report.Column{Name: "pressure", Unit: units.Psia}
	cumGas   = report.Column{Name: "cum_sales_gas", Unit: units.MMscf}
	gor      = report.Column{Name: "gor", Unit: units.ScfPerSTB}
	recovery = report.Column{Name: "condensate_recovery", Unit: units.Percent}
	zTwo     = report.Column{Name: "z_two_phase", Format: report.ZFactor}
	phase    = report.Column{Name: "phases"}
	liquid   = report.Column{Name: "liquid_present"}
	flashes  = report.Column{Name: "flashes"}
	residual = report.Column{Name: "residual", Format: report.Diagnostic, Verbose: true}
)

// stepRows are ten depletion steps; row 3 has no Z and row 5 a NaN
// recovery, both missing values.
func stepRows() [][]any {
	var rows [][]any
	for i := range 10 {
		x := float64(i)
		p := 5012.345678901234 - 497.1234567*x
		var z any = 0.85 + 0.01234567891*x
		rec := any(4.987654321 * x)
		if i == 3 {
			z = nil
		}
		if i == 5 {
			rec = math.NaN()
		}
		ph := "two-phase"
		if i == 0 {
			ph = "gas"
		}
		rows = append(rows, []any{
			p,
			9876.54321 * x / 9 * (1 + x/7), // MMscf, up to about 21,945: read in Bscf
			12500.25 + 3333.3333*x,         // scf/STB, every value of five digits: grouped
			rec,
			z,
			ph,
			i > 0,
			12 + i,
			1.234567e-9 * (x + 1),
		})
	}
	return rows
}

func testReports() []*report.Report {
	cols := []report.Column{pressure, cumGas, gor, recovery, zTwo, phase, liquid, flashes, residual}
	rec := &report.Report{
		Name:  "recover",
		Title: "recovery by depletion of the north block",
		Fields: []report.Field{
			{Column: report.Column{Name: "initial_pressure", Unit: units.Psia}, Value: 5012.345678901234},
			{Column: report.Column{Name: "gas_in_place", Unit: units.MMscf}, Value: 152345.6789012345},
			{Column: report.Column{Name: "condensate_in_place", Unit: units.STB}, Value: 12345678.91234},
			{Column: report.Column{Name: "fluid"}, Value: "Invented rich condensate"},
			{Column: report.Column{Name: "started_at_model_dew_point"}, Value: false},
			{Column: report.Column{Name: "steps"}, Value: 10},
			{Column: report.Column{Name: "abandonment_pressure", Unit: units.Psia}, Value: nil},
			{Column: report.Column{Name: "balance_residual", Format: report.Diagnostic, Verbose: true}, Value: 3.25e-11},
		},
		Vectors: []report.Vector{
			{Name: "liquid_composition", Label: "component", Labels: []string{"N2", "CO2", "C1", "C2", "C3", "C7+"},
				Values: []float64{0.00123456789, 0.0123456789, 0.3456789012, 0.0812345678, 0.0612345678, 0.4983}},
			{Name: "vapour_composition", Label: "component", Labels: []string{"N2", "CO2", "C1", "C2", "C3", "C7+"},
				Values: []float64{0.0101234567, 0.0298765432, 0.7712345678, 0.0934567891, 0.0512345678, 0.0441}},
		},
		Tables: []report.Table{
			{Name: "steps", Title: "depletion steps", Columns: cols, Rows: stepRows()},
			{Name: "steps", Title: "laboratory steps", Columns: []report.Column{pressure, recovery},
				Rows: [][]any{{5012.3, 0.0}, {3000.1, 17.25}}},
			{Name: "summary", Title: "abandonment", Columns: []report.Column{pressure, cumGas},
				Rows: [][]any{{612.5, 21945.2}}},
			{Name: "history", Title: "production history", Columns: []report.Column{pressure, cumGas}},
		},
		Matrix: &report.Matrix{Name: "kij", Title: "binary interaction coefficients",
			Labels: []string{"N2", "CO2", "C1", "C7+"},
			Values: [][]float64{
				{0, 0, 0.025, 0.11},
				{0, 0, 0.105, 0.115},
				{0.025, 0.105, 0, 0.0412345678},
				{0.11, 0.115, 0.0412345678, 0},
			}},
		Warnings: []string{"the model's dew point is 37 psi above the measured one"},
		Notes:    []string{"recovery integrated with adaptive steps"},
	}
	inplace := &report.Report{
		Name:   "inplace",
		Title:  "volumes in place",
		Fields: []report.Field{{Column: report.Column{Name: "gas_in_place", Unit: units.MMscf}, Value: 152345.6789012345}},
		Tables: []report.Table{{Name: "steps", Title: "steps", Columns: []report.Column{pressure}, Rows: [][]any{{4000.0}}}},
		Notes:  []string{"in place from the equation of state"},
	}
	return []*report.Report{rec, inplace}
}

// written writes the reports and reads the workbook back, with excelize and
// as XML.
func written(t *testing.T, opt Options, reports ...*report.Report) (*excelize.File, rawBook, []byte) {
	t.Helper()
	var buf bytes.Buffer
	if err := Write(&buf, opt, reports...); err != nil {
		t.Fatalf("Write: %v", err)
	}
	f, err := excelize.OpenReader(bytes.NewReader(buf.Bytes()))
	if err != nil {
		t.Fatalf("the workbook does not open: %v", err)
	}
	t.Cleanup(func() { f.Close() })
	return f, readRaw(t, buf.Bytes()), buf.Bytes()
}

// rawBook is each sheet's cells as the XML holds them, by sheet name and
// cell reference.
type rawBook map[string]map[string]rawCell

type rawCell struct {
	T    string `xml:"t,attr"`
	R    string `xml:"r,attr"`
	V    *string
	Text string // an inline string
}

// readRaw reads the worksheets' XML: the sheet names from xl/workbook.xml,
// their files from its relationships (ECMA-376 Part 1, §18.2 and §18.3).
func readRaw(t *testing.T, data []byte) rawBook {
	t.Helper()
	zr, err := zip.NewReader(bytes.NewReader(data), int64(len(data)))
	if err != nil {
		t.Fatalf("not a zip archive: %v", err)
	}
	part := func(name string) []byte {
		for _, zf := range zr.File {
			if zf.Name == name {
				rc, err := zf.Open()
				if err != nil {
					t.Fatal(err)
				}
				defer rc.Close()
				b, err := io.ReadAll(rc)
				if err != nil {
					t.Fatal(err)
				}
				return b
			}
		}
		t.Fatalf("the archive has no %s", name)
		return nil
	}
	var wb struct {
		Sheets []struct {
			Name string `xml:"name,attr"`
			ID   string `xml:"http://schemas.openxmlformats.org/officeDocument/2006/relationships id,attr"`
		} `xml:"sheets>sheet"`
	}
	if err := xml.Unmarshal(part("xl/workbook.xml"), &wb); err != nil {
		t.Fatal(err)
	}
	var rels struct {
		Rel []struct {
			ID     string `xml:"Id,attr"`
			Target string `xml:"Target,attr"`
		} `xml:"Relationship"`
	}
	if err := xml.Unmarshal(part("xl/_rels/workbook.xml.rels"), &rels); err != nil {
		t.Fatal(err)
	}
	target := map[string]string{}
	for _, r := range rels.Rel {
		target[r.ID] = "xl/" + strings.TrimPrefix(r.Target, "/xl/")
	}
	book := rawBook{}
	for _, s := range wb.Sheets {
		var ws struct {
			Rows []struct {
				C []struct {
					rawCell
					V  *string `xml:"v"`
					IS struct {
						T string `xml:"t"`
					} `xml:"is"`
				} `xml:"c"`
			} `xml:"sheetData>row"`
		}
		if err := xml.Unmarshal(part(target[s.ID]), &ws); err != nil {
			t.Fatal(err)
		}
		cells := map[string]rawCell{}
		for _, r := range ws.Rows {
			for _, c := range r.C {
				rc := c.rawCell
				rc.V, rc.Text = c.V, c.IS.T
				cells[rc.R] = rc
			}
		}
		book[s.Name] = cells
	}
	return book
}

func ref(col, row int) string {
	r, err := excelize.CoordinatesToCellName(col, row)
	if err != nil {
		panic(err)
	}
	return r
}

// checkNumber checks that the cell at col and row of sheet holds the
// number want as a number: excelize's cell type, the XML's (no t="s",
// "str" or "inlineStr"; ECMA-376 Part 1, §18.3.1.4: no t, or t="n", is a
// number), and its value to 14 significant digits, every one of them.
func checkNumber(t *testing.T, f *excelize.File, raw rawBook, sheet string, col, row int, want float64, what string) {
	t.Helper()
	r := ref(col, row)
	typ, err := f.GetCellType(sheet, r)
	if err != nil {
		t.Fatal(err)
	}
	if typ != excelize.CellTypeUnset && typ != excelize.CellTypeNumber {
		t.Errorf("%s!%s (%s): cell type %v, want a number", sheet, r, what, typ)
	}
	c, ok := raw[sheet][r]
	if !ok || c.V == nil {
		t.Errorf("%s!%s (%s): no value in the XML, want %v", sheet, r, what, want)
		return
	}
	if c.T != "" && c.T != "n" {
		t.Errorf("%s!%s (%s): XML type t=%q, want a number", sheet, r, what, c.T)
	}
	got, err := strconv.ParseFloat(*c.V, 64)
	if err != nil {
		t.Errorf("%s!%s (%s): XML value %q is not a number", sheet, r, what, *c.V)
		return
	}
	// The model's value times the display factor, to the 14 significant
	// digits of CSV and JSON (strconv, 'g' format), every one of them.
	want = report.Rounded(want)
	if math.Float64bits(got) != math.Float64bits(want) {
		t.Errorf("%s!%s (%s): stored %v, want %v (the model's value times the display factor, to 14 digits)", sheet, r, what, got, want)
	}
}

// checkText checks that the cell holds the text want, as text.
func checkText(t *testing.T, f *excelize.File, raw rawBook, sheet string, col, row int, want string) {
	t.Helper()
	r := ref(col, row)
	got, err := f.GetCellValue(sheet, r)
	if err != nil {
		t.Fatal(err)
	}
	if got != want {
		t.Errorf("%s!%s = %q, want %q", sheet, r, got, want)
	}
	if c := raw[sheet][r]; c.T != "s" && c.T != "inlineStr" && c.T != "str" {
		t.Errorf("%s!%s (%q): XML type t=%q, want a text", sheet, r, want, c.T)
	}
}

// checkEmpty checks that the cell has no value.
func checkEmpty(t *testing.T, f *excelize.File, raw rawBook, sheet string, col, row int, what string) {
	t.Helper()
	r := ref(col, row)
	got, err := f.GetCellValue(sheet, r)
	if err != nil {
		t.Fatal(err)
	}
	if c, ok := raw[sheet][r]; got != "" || ok && (c.V != nil || c.Text != "") {
		t.Errorf("%s!%s (%s) = %q, want an empty cell", sheet, r, what, got)
	}
}

// shownAs is how excelize, applying the cell's number format, writes the
// cell: what a spreadsheet shows.
func shownAs(t *testing.T, f *excelize.File, sheet string, col, row int) string {
	t.Helper()
	got, err := f.GetCellValue(sheet, ref(col, row))
	if err != nil {
		t.Fatal(err)
	}
	return got
}

// numFmt is the custom number format of the cell's style.
func numFmt(t *testing.T, f *excelize.File, sheet string, col, row int) string {
	t.Helper()
	id, err := f.GetCellStyle(sheet, ref(col, row))
	if err != nil {
		t.Fatal(err)
	}
	st, err := f.GetStyle(id)
	if err != nil {
		t.Fatal(err)
	}
	if st.CustomNumFmt == nil {
		return ""
	}
	return *st.CustomNumFmt
}

// wantSheets are the sheets of testReports, in order, named by the rule of
// this package: the report's name, then the part's; a repeated name takes
// " (2)".
var wantSheets = []string{
	"Cover",
	"recover summary",
	"recover compositions",
	"recover steps",
	"recover steps (2)",
	"recover summary (2)",
	"recover history",
	"recover kij",
	"inplace summary",
	"inplace steps",
}

func TestSheets(t *testing.T) {
	f, raw, _ := written(t, testOptions, testReports()...)
	got := f.GetSheetList()
	if strings.Join(got, "|") != strings.Join(wantSheets, "|") {
		t.Errorf("sheets %q,\nwant %q", got, wantSheets)
	}
	checkSheetNames(t, got)
	if len(raw) != len(got) {
		t.Errorf("the XML lists %d sheets, excelize %d", len(raw), len(got))
	}
	if i := f.GetActiveSheetIndex(); i != 0 {
		t.Errorf("the workbook opens on sheet %d, want the cover", i)
	}
}

// checkSheetNames checks names against the rules of the file format and of
// the spreadsheet programs that read it: 1 to 31 UTF-16 code units, none of
// []:*?/\, no apostrophe first or last, unique regardless of case, and
// not "History", which Excel reserves.
func checkSheetNames(t *testing.T, names []string) {
	t.Helper()
	seen := map[string]bool{}
	for _, n := range names {
		if l := len(utf16.Encode([]rune(n))); l == 0 || l > 31 {
			t.Errorf("sheet name %q: %d UTF-16 code units, want 1 to 31", n, l)
		}
		if strings.ContainsAny(n, `[]:*?/\`) {
			t.Errorf("sheet name %q holds a character of []:*?/\\", n)
		}
		if strings.HasPrefix(n, "'") || strings.HasSuffix(n, "'") {
			t.Errorf("sheet name %q starts or ends with an apostrophe", n)
		}
		if strings.EqualFold(n, "history") {
			t.Errorf("sheet name %q is reserved", n)
		}
		if seen[strings.ToLower(n)] {
			t.Errorf("sheet name %q is used twice (regardless of case)", n)
		}
		seen[strings.ToLower(n)] = true
	}
}

// TestSheetNames builds reports whose names break every rule and checks
// that the workbook's names keep them.
func TestSheetNames(t *testing.T) {
	table := func(name string) report.Table {
		return report.Table{Name: name, Columns: []report.Column{pressure}, Rows: [][]any{{1000.0}}}
	}
	var reports []*report.Report
	for _, name := range []string{"pressure_maintenance_with_cycling", "a[b]:c*d?e/f\\g", "'quoted'", "", "History"} {
		reports = append(reports, &report.Report{Name: name, Tables: []report.Table{
			table("steps"), table("Steps"), table("STEPS"),
			table("a_very_long_table_name_beyond_thirty_one_characters"),
			table("a_very_long_table_name_beyond_thirty_one_characters_too"),
			table("ünïcödé_ßtéps_😀_with_wide_characters_and_more"),
			table(""),
		}})
	}
	// A report whose part makes the bare name "History".
	reports = append(reports, &report.Report{Name: "", Tables: []report.Table{table("history")}})
	f, _, _ := written(t, testOptions, reports...)
	names := f.GetSheetList()
	if want := 1 + 5*7 + 1; len(names) != want {
		t.Errorf("%d sheets, want %d: %q", len(names), want, names)
	}
	checkSheetNames(t, names)
	for _, n := range names {
		if _, err := f.GetSheetIndex(n); err != nil {
			t.Errorf("sheet %q: %v", n, err)
		}
	}
}

func TestSummary(t *testing.T) {
	f, raw, _ := written(t, testOptions, testReports()...)
	const sh = "recover summary"
	checkText(t, f, raw, sh, 1, 1, "Recovery by depletion of the north block")
	for j, h := range []string{"Quantity", "Value", "Unit"} {
		checkText(t, f, raw, sh, j+1, 2, h)
	}
	// The units and decimals are those of the text tables' summary; the
	// values shown are worked by hand from the fields of testReports.
	rows := []struct {
		quantity string
		value    any // float64 stored, or the text
		unit     string
		shown    string
		numFmt   string
	}{
		{"Initial pressure", 5012.345678901234, "psia", "5012", "0"},
		// 152,345.68 MMscf is 152.34568 Bscf (1 Bscf = 1000 MMscf): four
		// significant digits, 1 decimal.
		{"Gas in place", 152345.6789012345, "Bscf", "152.3", "0.0"},
		// 12,345,678.9 STB is 12.3456789 MMSTB.
		{"Condensate in place", 12345678.91234, "MMSTB", "12.35", "0.00"},
		{"Fluid", "Invented rich condensate", "", "", ""},
		{"Started at model dew point", "no", "", "", ""},
		{"Steps", 10.0, "", "10", "0"},
	}
	fields := testReports()[0].Fields
	for i, w := range rows {
		row := 3 + i
		checkText(t, f, raw, sh, 1, row, w.quantity)
		switch v := w.value.(type) {
		case string:
			checkText(t, f, raw, sh, 2, row, v)
			checkEmpty(t, f, raw, sh, 3, row, "unit of a text")
		case float64:
			s := report.ShowField(fields[i])
			checkNumber(t, f, raw, sh, 2, row, s.Value(v), w.quantity)
			if w.unit == "" {
				checkEmpty(t, f, raw, sh, 3, row, "unit of a count")
			} else {
				checkText(t, f, raw, sh, 3, row, w.unit)
			}
			if got := shownAs(t, f, sh, 2, row); got != w.shown {
				t.Errorf("%s: shown as %q, want %q", w.quantity, got, w.shown)
			}
			if got := numFmt(t, f, sh, 2, row); got != w.numFmt {
				t.Errorf("%s: number format %q, want %q", w.quantity, got, w.numFmt)
			}
		}
	}
	// The field without a value and the diagnostic are left out.
	checkEmpty(t, f, raw, sh, 1, 3+len(rows), "after the last field")

	// The gas in place against the definition of the multiples, apart
	// from the factor the model computes: 1 Bscf = 1000 MMscf. The factor
	// is a quotient of two SI scales, each rounded, and the workbook
	// stores 14 significant digits, as CSV and JSON do: half a unit of the
	// 14th digit, 5e-14 relative. (The XML, not excelize: excelize reads
	// numbers back to 15 significant digits.)
	var got float64
	if v := raw[sh]["B4"].V; v != nil {
		got, _ = strconv.ParseFloat(*v, 64)
	}
	if want := 152345.6789012345 / 1000; math.Abs(got-want) > 5e-14*want {
		t.Errorf("gas in place stored as %v Bscf, want %v (1 Bscf = 1000 MMscf)", got, want)
	}

	// With Verbose the diagnostic is shown, in e-notation.
	opt := testOptions
	opt.Verbose = true
	f, raw, _ = written(t, opt, testReports()...)
	last := 3 + len(rows)
	checkText(t, f, raw, sh, 1, last, "Balance residual")
	checkNumber(t, f, raw, sh, 2, last, 3.25e-11, "balance residual")
	if got := numFmt(t, f, sh, 2, last); got != "0.00E+00" {
		t.Errorf("balance residual: number format %q, want 0.00E+00", got)
	}
}

func TestTable(t *testing.T) {
	reports := testReports()
	steps := &reports[0].Tables[0]
	f, raw, _ := written(t, testOptions, reports...)
	const sh = "recover steps"
	checkText(t, f, raw, sh, 1, 1, "Depletion steps")
	// Headers: the column's name and the unit people read it in, as the
	// text table heads it (cumulative gas of up to 21,945 MMscf in Bscf);
	// the residual, a diagnostic, is left out.
	heads := []string{"Pressure [psia]", "Cumulative sales gas [Bscf]", "GOR [scf/STB]", "Condensate recovery [%]",
		"Z two-phase", "Phases", "Liquid present", "Flashes"}
	for j, h := range heads {
		checkText(t, f, raw, sh, j+1, 2, h)
	}
	checkEmpty(t, f, raw, sh, len(heads)+1, 2, "the diagnostic's header")
	rows, err := f.GetRows(sh)
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 2+10 {
		t.Errorf("%d rows, want the title, the header and 10 steps", len(rows))
	}
	// The number formats give the text tables' decimals: pressure to 1
	// psi, gas to 4 significant digits (2 decimals at 21.9 Bscf), GOR to
	// 1 scf/STB with thousands separators (every value has five digits),
	// recovery to 2 decimals, Z to 4, counts whole.
	wantFmt := []string{"0", "0.00", "#,##0", "0.00", "0.0000", "", "", "0"}
	var text strings.Builder
	if err := report.WriteText(&text, report.TextOptions{Width: 1000}, &report.Report{Tables: []report.Table{*steps}}); err != nil {
		t.Fatal(err)
	}
	for j, c := range steps.Columns[:len(heads)] {
		vals := make([]any, len(steps.Rows))
		for i, row := range steps.Rows {
			vals[i] = row[j]
		}
		s := report.ShowColumn(c, vals)
		for i, v := range vals {
			row := 3 + i
			switch x := v.(type) {
			case float64:
				if math.IsNaN(x) {
					checkEmpty(t, f, raw, sh, j+1, row, "NaN")
					continue
				}
				checkNumber(t, f, raw, sh, j+1, row, s.Value(x), c.Name)
				// What shows is what the text table shows.
				shown := shownAs(t, f, sh, j+1, row)
				if want := s.Text(x); shown != want {
					t.Errorf("%s row %d: shown as %q, the text table writes %q", c.Name, i+1, shown, want)
				}
				if !strings.Contains(text.String(), " "+shown+" ") {
					t.Errorf("%s row %d: %q is not in the text table", c.Name, i+1, shown)
				}
				if got := numFmt(t, f, sh, j+1, row); got != wantFmt[j] {
					t.Errorf("%s row %d: number format %q, want %q", c.Name, i+1, got, wantFmt[j])
				}
			case int:
				checkNumber(t, f, raw, sh, j+1, row, float64(x), c.Name)
			case nil:
				checkEmpty(t, f, raw, sh, j+1, row, "missing "+c.Name)
			case bool:
				want := "no"
				if x {
					want = "yes"
				}
				checkText(t, f, raw, sh, j+1, row, want)
			case string:
				checkText(t, f, raw, sh, j+1, row, x)
			}
		}
	}
	// The missing cells of testReports: Z of row 4 (nil), recovery of row 6 (NaN).
	checkEmpty(t, f, raw, sh, 5, 3+3, "Z of the fourth step")
	checkEmpty(t, f, raw, sh, 4, 3+5, "recovery of the sixth step")

	// Column widths hold the header and the widest value.
	for j, h := range heads {
		col, _ := excelize.ColumnNumberToName(j + 1)
		w, err := f.GetColWidth(sh, col)
		if err != nil {
			t.Fatal(err)
		}
		if w < float64(len(h)) {
			t.Errorf("column %s (%s) is %g wide, narrower than its header", col, h, w)
		}
		for i := range steps.Rows {
			if v := shownAs(t, f, sh, j+1, 3+i); w < float64(len(v)) {
				t.Errorf("column %s (%s) is %g wide, narrower than %q", col, h, w, v)
			}
		}
	}

	// With Verbose the residual is there, in e-notation.
	opt := testOptions
	opt.Verbose = true
	f, raw, _ = written(t, opt, testReports()...)
	checkText(t, f, raw, sh, 9, 2, "Residual")
	for i, row := range steps.Rows {
		checkNumber(t, f, raw, sh, 9, 3+i, row[8].(float64), "residual")
		if got, want := shownAs(t, f, sh, 9, 3+i), strconv.FormatFloat(row[8].(float64), 'e', 2, 64); !strings.EqualFold(got, want) {
			// The text writes 1.23e-09, a spreadsheet 1.23E-09.
			t.Errorf("residual row %d: shown as %q, want %q", i+1, got, want)
		}
	}
}

// TestNoNumberAsText scans every cell of every sheet: a cell stored as text
// must not read as a finite number, so that no number of the model was
// written as text.
func TestNoNumberAsText(t *testing.T) {
	opt := testOptions
	opt.Verbose = true
	f, raw, _ := written(t, opt, testReports()...)
	sst := map[string]bool{}
	for sheet, cells := range raw {
		for r, c := range cells {
			var s string
			switch c.T {
			case "s", "str", "inlineStr":
				v, err := f.GetCellValue(sheet, r)
				if err != nil {
					t.Fatal(err)
				}
				s = v
			default:
				continue
			}
			sst[s] = true
			if x, err := strconv.ParseFloat(strings.ReplaceAll(s, ",", ""), 64); err == nil && !math.IsInf(x, 0) {
				t.Errorf("%s!%s holds the number %q as text (t=%q)", sheet, r, s, c.T)
			}
		}
	}
	if !sst["Invented rich condensate"] {
		t.Error("the scan found no text cell: it checked nothing")
	}
}

func TestPanes(t *testing.T) {
	f, _, _ := written(t, testOptions, testReports()...)
	for _, c := range []struct {
		sheet   string
		xSplit  int
		topLeft string
	}{
		{"recover summary", 0, "A3"},
		{"recover steps (2)", 0, "A3"},
		{"recover history", 0, "A3"},
		// Eight columns whose headers take 135 characters: wider than a
		// text table's 120.
		{"recover steps", 1, "B3"},
		{"recover kij", 0, "A3"},
	} {
		p, err := f.GetPanes(c.sheet)
		if err != nil {
			t.Fatal(err)
		}
		if !p.Freeze || p.YSplit != 2 || p.XSplit != c.xSplit || p.TopLeftCell != c.topLeft {
			t.Errorf("%s: panes %+v, want frozen above row 3 (title and header), %d columns, top-left %s", c.sheet, p, c.xSplit, c.topLeft)
		}
	}
	// A table wider than a text table (120 characters) keeps its first
	// column in view too.
	var cols []report.Column
	row := []any{}
	for i := range 14 {
		cols = append(cols, report.Column{Name: fmt.Sprintf("gas_composition_c%d", i+1), Format: report.MoleFraction})
		row = append(row, 0.1)
	}
	wide := &report.Report{Name: "deplete", Tables: []report.Table{{Name: "steps", Columns: cols, Rows: [][]any{row}}}}
	f, _, _ = written(t, testOptions, wide)
	p, err := f.GetPanes("deplete steps")
	if err != nil {
		t.Fatal(err)
	}
	if !p.Freeze || p.YSplit != 2 || p.XSplit != 1 || p.TopLeftCell != "B3" {
		t.Errorf("wide table: panes %+v, want the title, the header and the first column frozen", p)
	}
}

func TestCompositionsAndMatrix(t *testing.T) {
	reports := testReports()
	f, raw, _ := written(t, testOptions, reports...)
	const sh = "recover compositions"
	checkText(t, f, raw, sh, 1, 2, "Component")
	checkText(t, f, raw, sh, 2, 2, "Liquid composition")
	checkText(t, f, raw, sh, 3, 2, "Vapour composition")
	for j, v := range reports[0].Vectors {
		for i, l := range v.Labels {
			checkText(t, f, raw, sh, 1, 3+i, l)
			// Mole fractions are stored as they are (factor 1) and shown
			// to 5 decimals (report.MoleFraction).
			checkNumber(t, f, raw, sh, 2+j, 3+i, v.Values[i], v.Name+" "+l)
			if got, want := shownAs(t, f, sh, 2+j, 3+i), strconv.FormatFloat(v.Values[i], 'f', 5, 64); got != want {
				t.Errorf("%s %s shown as %q, want %q", v.Name, l, got, want)
			}
		}
	}

	const mk = "recover kij"
	checkText(t, f, raw, mk, 1, 1, "Binary interaction coefficients")
	m := reports[0].Matrix
	for j, l := range m.Labels {
		checkText(t, f, raw, mk, 2+j, 2, l)
		checkText(t, f, raw, mk, 1, 3+j, l)
		for i := range m.Labels {
			checkNumber(t, f, raw, mk, 2+j, 3+i, m.Values[i][j], "kij "+m.Labels[i]+"/"+l)
		}
	}
	// Coefficients to 4 decimals, more for small ones (report.Coefficient:
	// two significant digits of the smallest non-zero value, 0.025, need 3,
	// so 4).
	if got := shownAs(t, f, mk, 5, 5); got != "0.0412" {
		t.Errorf("kij C1/C7+ shown as %q, want 0.0412", got)
	}
}

func TestCover(t *testing.T) {
	f, raw, _ := written(t, testOptions, testReports()...)
	rows, err := f.GetRows("Cover")
	if err != nil {
		t.Fatal(err)
	}
	var all []string
	for _, r := range rows {
		all = append(all, strings.Join(r, " | "))
	}
	text := strings.Join(all, "\n")
	checkText(t, f, raw, "Cover", 1, 1, testOptions.Title)
	for _, want := range []string{
		testOptions.Caution,
		testOptions.Command,
		testOptions.UnitSystem,
		"Recovery by depletion of the north block | the model's dew point is 37 psi above the measured one",
		"Recovery by depletion of the north block | recovery integrated with adaptive steps",
		"Volumes in place | in place from the equation of state",
		"recover history | Recovery by depletion of the north block: Production history, no rows",
		"recover steps | Recovery by depletion of the north block: Depletion steps, 10 rows",
	} {
		if !strings.Contains(text, want) {
			t.Errorf("the cover does not hold %q; it reads:\n%s", want, text)
		}
	}
	// Every sheet is listed, with a link to it.
	links := 0
	for i, r := range rows {
		if len(r) == 0 {
			continue
		}
		for _, name := range wantSheets[1:] {
			if r[0] != name {
				continue
			}
			ok, target, err := f.GetCellHyperLink("Cover", ref(1, i+1))
			if err != nil {
				t.Fatal(err)
			}
			if want := "'" + name + "'!A1"; !ok || target != want {
				t.Errorf("cover: %q links to %q (%v), want %q", name, target, ok, want)
			}
			links++
		}
	}
	if links != len(wantSheets)-1 {
		t.Errorf("the cover links %d sheets, want %d", links, len(wantSheets)-1)
	}
	props, err := f.GetDocProps()
	if err != nil {
		t.Fatal(err)
	}
	if props.Title != testOptions.Title || props.Description != testCaution || props.Created != FixedTime || props.Modified != FixedTime {
		t.Errorf("document properties %+v", props)
	}
}

func TestEmptyTable(t *testing.T) {
	f, raw, _ := written(t, testOptions, testReports()...)
	const sh = "recover history"
	rows, err := f.GetRows(sh)
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 2 {
		t.Errorf("the empty table has %d rows, want the title and the header: %q", len(rows), rows)
	}
	checkText(t, f, raw, sh, 1, 2, "Pressure [psia]")
	// No value to scale by: the column keeps the unit it is held in.
	checkText(t, f, raw, sh, 2, 2, "Cumulative sales gas [MMscf]")
}

// TestDeterministic writes the same reports several times: the bytes must
// not change (map order, times).
func TestDeterministic(t *testing.T) {
	_, _, first := written(t, testOptions, testReports()...)
	for range 4 {
		_, _, again := written(t, testOptions, testReports()...)
		if !bytes.Equal(first, again) {
			t.Fatal("the same reports gave different bytes")
		}
	}
}

func TestBadInput(t *testing.T) {
	good := func() *report.Report { return testReports()[0] }
	cases := []struct {
		name    string
		opt     Options
		reports []*report.Report
		want    string
	}{
		{"no reports", testOptions, nil, "no results"},
		{"a nil report", testOptions, []*report.Report{good(), nil}, "result 2 of 2 is missing"},
		{"no caution", Options{Title: "x"}, []*report.Report{good()}, "caution"},
		{"a short row", testOptions, []*report.Report{{Name: "r", Tables: []report.Table{
			{Name: "t", Columns: []report.Column{pressure, cumGas}, Rows: [][]any{{1.0}}}}}}, "row 1 of table \"t\" has 1 cells for 2 columns"},
		{"a cell of another kind", testOptions, []*report.Report{{Name: "r", Tables: []report.Table{
			{Name: "t", Columns: []report.Column{pressure}, Rows: [][]any{{float32(1)}}}}}}, "neither a number"},
		{"a field of another kind", testOptions, []*report.Report{{Name: "r", Fields: []report.Field{
			{Column: pressure, Value: []float64{1}}}}}, "neither a number"},
		{"a composition short of values", testOptions, []*report.Report{{Name: "r", Vectors: []report.Vector{
			{Name: "v", Labels: []string{"C1", "C2"}, Values: []float64{1}}}}}, "2 labels and 1 values"},
		{"a matrix short of a row", testOptions, []*report.Report{{Name: "r", Matrix: &report.Matrix{Name: "kij",
			Labels: []string{"C1", "C2"}, Values: [][]float64{{0, 0}}}}}, "2 labels and 1 rows"},
		{"a matrix short of a column", testOptions, []*report.Report{{Name: "r", Matrix: &report.Matrix{Name: "kij",
			Labels: []string{"C1", "C2"}, Values: [][]float64{{0, 0}, {0}}}}}, "row 2 of matrix"},
	}
	for _, c := range cases {
		var buf bytes.Buffer
		err := Write(&buf, c.opt, c.reports...)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one saying %q", c.name, err, c.want)
		}
		if buf.Len() != 0 {
			t.Errorf("%s: %d bytes written with the error", c.name, buf.Len())
		}
	}
}

// TestEmptyReport writes a report with nothing but a warning: the cover
// alone, with the warning.
func TestEmptyReport(t *testing.T) {
	r := &report.Report{Name: "satpoint", Title: "saturation point", Warnings: []string{"no saturation point above 400 MPa"}}
	f, _, _ := written(t, testOptions, r)
	if got := f.GetSheetList(); len(got) != 1 || got[0] != "Cover" {
		t.Errorf("sheets %q, want the cover alone", got)
	}
	rows, _ := f.GetRows("Cover")
	found := false
	for _, row := range rows {
		found = found || strings.Contains(strings.Join(row, "|"), "no saturation point above 400 MPa")
	}
	if !found {
		t.Errorf("the cover does not hold the warning: %q", rows)
	}
}

// TestSample writes the workbook of testReports to the file named by
// DEWCELL_WORKBOOK_SAMPLE, to look at in a spreadsheet program.
func TestSample(t *testing.T) {
	path := os.Getenv("DEWCELL_WORKBOOK_SAMPLE")
	if path == "" {
		t.Skip("DEWCELL_WORKBOOK_SAMPLE names no file")
	}
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := Write(&buf, testOptions, testReports()...); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
}
