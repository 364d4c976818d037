package report

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"dewcell/cmd/dewcell/internal/units"
)

// scientific matches a number in e-notation.
var scientific = regexp.MustCompile(`[0-9][eE][-+]?[0-9]`)

func TestShown(t *testing.T) {
	cases := []struct {
		name   string
		col    Column
		values []any
		cell   any
		text   string
		unit   string
		source string
	}{
		// Pressures to 1 psi; a stock-tank pressure keeps three significant digits.
		{"pressure", Column{Unit: units.Psia}, []any{4579.1235, 800.0}, 4579.1235, "4579", "psia", "engineering practice: 1 psi"}, // common practice, no published source
		{"small pressure", Column{Unit: units.Psia}, []any{14.696}, 14.696, "14.7", "psia", "three significant digits"},           // common practice, no published source
		{"bar", Column{Unit: units.Bara}, []any{315.72}, 315.72, "315.7", "bara", "0.1 bar"},                                      // common practice, no published source
		// 1 Bscf = 1000 MMscf and 1 MMSTB = 10^6 STB: the trade's multiples (M a thousand, MM a million, B a billion).
		{"gas in place", Column{Unit: units.MMscf}, []any{85042.3}, 85042.3, "85.04", "Bscf", "1 Bscf = 1000 MMscf"},
		{"condensate in place", Column{Unit: units.STB}, []any{3.26179e+07}, 3.26179e+07, "32.62", "MMSTB", "1 MMSTB = 1e6 STB"},
		{"well gas", Column{Unit: units.MMscf}, []any{4.354}, 4.354, "4.354", "MMscf", "stays in MMscf"},
		{"metric gas", Column{Unit: units.MillionSm3}, []any{7370.0}, 7370.0, "7.370", "10^9 sm3", "1e9 sm3 = 1000 x 1e6 sm3"},
		{"column of cumulatives", Column{Unit: units.MMscf}, []any{0.0, 10300.0, 202500.0}, 10300.0, "10.3", "Bscf", "one multiple per column"},
		{"all zero", Column{Unit: units.STB}, []any{0.0, 0.0}, 0.0, "0", "STB", "nothing to scale"},
		// 1 1/psi = 10^6 per 10^6 psi: millionths per psi, no e-notation.
		{"compressibility", Column{Unit: units.PerPsi}, []any{4.5e-6}, 4.5e-6, "4.500", "10^-6/psi", "1e-6/psi"},
		{"percent", Column{Unit: units.Percent}, []any{28.8169}, 28.8169, "28.82", "%", "0.01 %"}, // common practice, no published source
		{"z", Column{Format: ZFactor}, []any{0.94461}, 0.94461, "0.9446", "", "Z to 4 decimals"},  // common practice, no published source
		{"thousands", Column{Unit: units.AcreFoot}, []any{195300.0}, 195300.0, "195,300", "acre-ft", "thousands separators"},
		{"below 10000 no separator", Column{Unit: units.ScfPerSTB}, []any{7125.38}, 7125.38, "7125", "scf/STB", "four digits read without one"},
		{"a column that reaches five digits", Column{Unit: units.ScfPerSTB}, []any{305342.0, -4178.0}, -4178.0, "-4,178", "scf/STB", "every cell of the column alike"},
		{"negative zero", Column{Format: Fixed(2)}, []any{-0.001}, -0.001, "0.00", "", "no -0.00"},
		{"missing", Column{Unit: units.Psia}, []any{nil}, nil, "-", "psia", "a dash"},
		{"nan", Column{Unit: units.Psia}, []any{math.NaN()}, math.NaN(), "-", "psia", "a dash"},
		{"yes", Column{}, []any{true}, true, "yes", "", "booleans in words"},
		{"int", Column{}, []any{173}, 173, "173", "", "counts as they are"},
	}
	for _, c := range cases {
		s := ShowColumn(c.col, c.values)
		if got := s.Text(c.cell); got != c.text || s.Symbol != c.unit {
			t.Errorf("%s: %q [%s], want %q [%s] (%s)", c.name, got, s.Symbol, c.text, c.unit, c.source)
		}
	}
}

// TestSentenceNumbers: numbers in the sentences of notes and warnings are
// never in e-notation (the rule for what people read).
func TestSentenceNumbers(t *testing.T) {
	for _, c := range []struct {
		got, want string
	}{
		{Sig(-0.0122, 3), "-0.0122"}, {Sig(0.31, 3), "0.31"}, {Sig(5e-5, 2), "0.00005"}, {Sig(1234.6, 3), "1235"}, {Sig(0, 3), "0"},
		{PValue(0.648), "p = 0.648"}, {PValue(0.65), "p = 0.65"}, {PValue(2.2e-9), "p < 0.001"},
		{Quantity(3823.3, units.Psia), "3823 psia"}, {Quantity(-87.3959, units.DegF), "-87.4 degF"}, {Quantity(85042.3, units.MMscf), "85.04 Bscf"},
	} {
		if c.got != c.want {
			t.Errorf("%q, want %q", c.got, c.want)
		}
	}
}

func TestLabelOf(t *testing.T) {
	// The trade's own spellings of its abbreviations.
	for name, want := range map[string]string{
		"cgr":                        "CGR",
		"gor":                        "GOR",
		"p_over_z":                   "p/Z",
		"corrected_p_over_z":         "Corrected p/Z",
		"z_two_phase":                "Z two-phase",
		"cum_wet_gas":                "Cumulative wet gas",
		"api_gravity":                "API gravity",
		"gas_end_point_relative_per": "Gas end-point relative per",
		"upper_dew_pressure":         "Upper dew pressure",
	} {
		if got := LabelOf(name); got != want {
			t.Errorf("LabelOf(%q) = %q, want %q", name, got, want)
		}
	}
}

// wide is a report with a table of 20 columns and long texts.
func wide() *Report {
	r := &Report{Name: "wide", Title: "a result with a long title that goes on and on about the fluid, the reservoir, the separator train and the stock tank conditions",
		Fields: []Field{
			{Column: Column{Name: "dew_pressure", Unit: units.Psia}, Value: 4579.1235},
			{Column: Column{Name: "wet_gas_in_place", Unit: units.MMscf}, Value: 260341.2},
			{Column: Column{Name: "integration"}, Value: strings.Repeat("a long explanation of how the result was obtained ", 5)},
			{Column: Column{Name: "iterations", Verbose: true}, Value: 17},
			{Column: Column{Name: "residual", Verbose: true, Format: Diagnostic}, Value: 1.6e-14},
		}}
	tb := Table{Name: "steps", Title: "steps"}
	tb.Columns = append(tb.Columns, Column{Name: "pressure", Unit: units.Psia})
	for j := 1; j < 20; j++ {
		tb.Columns = append(tb.Columns, Column{Name: "quantity_number_" + strconv.Itoa(j), Unit: units.Percent})
	}
	tb.Columns = append(tb.Columns, Column{Name: "source"})
	for i := range 5 {
		row := []any{5000 - 500*float64(i)}
		for j := 1; j < 20; j++ {
			row = append(row, float64(i*j)*1.2345)
		}
		row = append(row, "from the C7+ split: gamma distribution, Kesler-Lee properties")
		tb.Rows = append(tb.Rows, row)
	}
	r.Tables = []Table{tb}
	return r
}

func TestTextFitsWidth(t *testing.T) {
	var b bytes.Buffer
	if err := WriteText(&b, TextOptions{}, wide()); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	for i, l := range strings.Split(out, "\n") {
		if n := len([]rune(l)); n > DefaultWidth {
			t.Errorf("line %d is %d characters wide, more than a %d-column terminal:\n%s", i+1, n, DefaultWidth, l)
		}
	}
	if !strings.Contains(out, "(continued)") {
		t.Error("a 21-column table was not split into sections")
	}
	// Every section repeats the first column.
	if n := strings.Count(out, "| Pressure |"); n < 2 {
		t.Errorf("the first column heads %d sections, want every section", n)
	}
	if strings.Contains(out, "Iterations") || scientific.MatchString(out) {
		t.Errorf("solver diagnostics shown without --verbose:\n%s", out)
	}
	if !strings.Contains(out, "[1] from the C7+ split") {
		t.Errorf("the long text cell is not a note under the table:\n%s", out)
	}
	if !strings.Contains(out, "| Wet gas in place | 260.3 | Bscf") {
		t.Errorf("the summary does not read 260.3 Bscf:\n%s", out)
	}
	b.Reset()
	if err := WriteText(&b, TextOptions{Verbose: true}, wide()); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(b.String(), "| Iterations") || !strings.Contains(b.String(), "1.60e-14") {
		t.Errorf("--verbose does not show the solver diagnostics:\n%s", b.String())
	}
}

func TestTransposed(t *testing.T) {
	r := &Report{Tables: []Table{{Name: "routes", Transpose: true, Columns: []Column{
		{Name: "route"}, {Name: "z", Format: ZFactor}, {Name: "wet_gas", Unit: units.MMscf},
	}, Rows: [][]any{{"equation of state", 0.9831, 260300.0}, {"quick look", 0.9968, 256700.0}}}}}
	var b bytes.Buffer
	if err := WriteText(&b, TextOptions{}, r); err != nil {
		t.Fatal(err)
	}
	want := regexp.MustCompile(`\| Wet gas +\| +260\.3 \| +256\.7 \| Bscf \|`)
	if !want.MatchString(b.String()) || !strings.Contains(b.String(), "equation of state") {
		t.Errorf("transposed table:\n%s", b.String())
	}
}

func TestCSVParts(t *testing.T) {
	r := wide()
	r.Matrix = &Matrix{Name: "kij", Labels: []string{"A", "B"}, Values: [][]float64{{0, 0.0123456789012345}, {0.0123456789012345, 0}}}
	if got := r.Parts(); strings.Join(got, ",") != "steps,summary,kij" {
		t.Errorf("parts %q", got)
	}
	read := func(part string) [][]string {
		var b bytes.Buffer
		if err := WriteCSV(&b, r, part); err != nil {
			t.Fatalf("%s: %v", part, err)
		}
		recs, err := csv.NewReader(&b).ReadAll()
		if err != nil {
			t.Fatalf("%s: %v", part, err)
		}
		return recs
	}
	steps := read("")
	if len(steps) != 6 || steps[0][0] != "pressure_psia" || len(steps[0]) != 21 {
		t.Errorf("the first table: %d records, header %q", len(steps), steps[0])
	}
	sum := read(SummaryPart)
	if len(sum) != 2 || sum[0][0] != "dew_pressure_psia" || sum[1][0] != "4579.1235" {
		t.Errorf("summary: %q", sum)
	}
	// Full precision: 14 significant digits, within half a unit of the 14th.
	kij := read("kij")
	if v, err := strconv.ParseFloat(kij[1][2], 64); err != nil || math.Abs(v/0.0123456789012345-1) > 0.5e-13 {
		t.Errorf("kij A/B %q", kij[1][2])
	}
	if err := WriteCSV(&bytes.Buffer{}, r, "nonesuch"); err == nil || !strings.Contains(err.Error(), "steps, summary, kij") {
		t.Errorf("a wrong part: %v, want the list of parts", err)
	}
	// A table whose JSON key is summary takes another part name.
	r.Tables = append(r.Tables, Table{Name: SummaryPart, Part: "extremes", Columns: []Column{{Name: "x"}}, Rows: [][]any{{1.0}}})
	if got := strings.Join(r.Parts(), ","); got != "steps,extremes,summary,kij" {
		t.Errorf("parts %s", got)
	}
	if recs := read("extremes"); len(recs) != 2 || recs[0][0] != "x" {
		t.Errorf("the part extremes: %q", recs)
	}
	if recs := read(SummaryPart); recs[0][0] != "dew_pressure_psia" {
		t.Errorf("the summary part, beside a table named summary: %q", recs)
	}
}

func TestJSONWarningsAndMissing(t *testing.T) {
	r := &Report{Fields: []Field{
		{Column: Column{Name: "a", Unit: units.Psia}, Value: 1.5},
		{Column: Column{Name: "b"}, Value: nil},
		{Column: Column{Name: "c"}, Value: math.NaN()},
	}, Tables: []Table{{Name: "t", Columns: []Column{{Name: "x"}}, Rows: [][]any{{math.Inf(1)}}}}}
	r.Warn("check this")
	r.Note("how it was done")
	var b bytes.Buffer
	if err := WriteJSON(&b, r); err != nil {
		t.Fatal(err)
	}
	var doc map[string]any
	if err := json.Unmarshal(b.Bytes(), &doc); err != nil { // encoding/json, the outside check
		t.Fatalf("%v\n%s", err, b.String())
	}
	if doc["a_psia"] != 1.5 || doc["b"] != nil || doc["c"] != nil {
		t.Errorf("fields: %v", doc)
	}
	if _, ok := doc["b"]; ok {
		t.Error("a missing field is written")
	}
	if w, _ := doc["warnings"].([]any); len(w) != 1 || w[0] != "check this" {
		t.Errorf("warnings %v", doc["warnings"])
	}
	if n, _ := doc["notes"].([]any); len(n) != 1 {
		t.Errorf("notes %v", doc["notes"])
	}
	if rows := doc["t"].([]any); rows[0].(map[string]any)["x"] != nil {
		t.Errorf("an infinite cell is %v, want null", rows[0])
	}
}
