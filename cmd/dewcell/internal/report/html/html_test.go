package html

import (
	"bytes"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/units"
)

func sample() *report.Report {
	r := &report.Report{Name: "recovery", Section: "Depletion recovery", Title: "depletion recovery of <b>field</b> & co",
		Fields: []report.Field{
			{Column: report.Column{Name: "wet_gas_in_place", Unit: units.MMscf}, Value: 260341.2},
			{Column: report.Column{Name: "condensate_model"}, Value: strings.Repeat("a long explanation of the model ", 4)},
			{Column: report.Column{Name: "iterations", Verbose: true}, Value: 17},
		},
		Warnings: []string{"check <this>"},
		Notes:    []string{"how it was done"},
	}
	wide := report.Table{Name: "steps", Title: "steps"}
	wide.Columns = append(wide.Columns, report.Column{Name: "pressure", Unit: units.Psia})
	for j := 1; j < 25; j++ {
		wide.Columns = append(wide.Columns, report.Column{Name: "quantity_" + strconv.Itoa(j), Unit: units.Percent})
	}
	for i := range 3 {
		row := []any{5000 - 1000*float64(i)}
		for j := 1; j < 25; j++ {
			row = append(row, float64(i*j)*1.25)
		}
		wide.Rows = append(wide.Rows, row)
	}
	detail := report.Table{Name: "points", Title: "envelope points", Detail: true,
		Columns: []report.Column{{Name: "pressure", Unit: units.Psia}}, Rows: [][]any{{1.0}, {2.0}}}
	r.Tables = []report.Table{wide, detail}
	r.Figures = []*report.Figure{{Name: "recovery", Title: "Depletion recovery", Caption: "Recovery against pressure.",
		X: report.Axis{Label: "Reservoir pressure", Unit: units.Psia}, Y: report.Axis{Label: "Recovery", Unit: units.Percent},
		Series: []report.Series{{Label: "Wet gas", X: []float64{5000, 3000, 1000}, Y: []float64{0, 40, 78}}}}}
	return r
}

var opt = Options{Title: "Invented <field>", File: "x.toml", Source: "title = \"<x>\"\n", Units: "field",
	Cautions: []string{"Screening estimates; review by qualified, licensed professionals under local regulations."}}

func write(t *testing.T, reports ...*report.Report) string {
	t.Helper()
	var b bytes.Buffer
	if err := Write(&b, opt, reports...); err != nil {
		t.Fatal(err)
	}
	return b.String()
}

// TestSelfContained: the page needs nothing else (HTML Living Standard:
// no script element, no resource fetched by src or href beyond its own
// anchors), escapes what the study gives (html/template's contextual
// escaping), and carries the cautions.
func TestSelfContained(t *testing.T) {
	page := write(t, sample())
	for _, bad := range []string{"<script", "<link", "@import", "url(", "<b>field</b>", "<this>", "<field>", `"<x>"`} {
		if strings.Contains(page, bad) {
			t.Errorf("the page holds %q", bad)
		}
	}
	if m := regexp.MustCompile(`(?:src|href)="([^"#][^"]*)"`).FindString(page); m != "" {
		t.Errorf("the page refers outside itself: %s", m)
	}
	for _, want := range []string{"&lt;b&gt;field&lt;/b&gt; &amp; co", "check &lt;this&gt;", "qualified, licensed professionals",
		"<svg", "Figure 1.", "Recovery against pressure.", "Appendix A: detail tables", "Appendix B: the study file",
		"how it was done", "@media print", "break-before: page"} {
		if !strings.Contains(page, want) {
			t.Errorf("the page lacks %q", want)
		}
	}
	// The diagnostic stays out; the long text is a paragraph.
	if strings.Contains(page, "Iterations") {
		t.Error("a solver diagnostic is shown")
	}
	if !strings.Contains(page, `<p class="long"><span class="label">Condensate model:</span>`) {
		t.Error("the long text is not a paragraph under the summary")
	}
}

// TestWideTablesSplit: a table of 25 columns is cut into tables that fit
// the page, each repeating the first column, so that nothing is lost in
// print.
func TestWideTablesSplit(t *testing.T) {
	page := write(t, sample())
	n := strings.Count(page, "Steps (continued)")
	if n < 1 {
		t.Fatalf("a 25-column table was not split")
	}
	if got := strings.Count(page, ">Pressure<span"); got != n+2 { // each section, and the detail table
		t.Errorf("the first column heads %d tables, want %d", got, n+2)
	}
	for j := 1; j < 25; j++ {
		if !strings.Contains(page, ">Quantity "+strconv.Itoa(j)+"<span") {
			t.Errorf("column %d is lost", j)
		}
	}
}

// An empty table, a list of findings with none, shows its title and says
// so, once, whatever its width.
func TestEmptyTable(t *testing.T) {
	r := sample()
	empty := report.Table{Name: "findings", Title: "findings"}
	for j := range 30 {
		empty.Columns = append(empty.Columns, report.Column{Name: "column_" + strconv.Itoa(j)})
	}
	r.Tables = append(r.Tables, empty)
	page := write(t, r)
	if n := strings.Count(page, `<p class="empty">None.</p>`); n != 1 {
		t.Errorf("the empty table says None %d times, want once", n)
	}
	if strings.Contains(page, ">Column 1<") {
		t.Error("the empty table shows its header")
	}
}

func TestWriteErrors(t *testing.T) {
	if err := Write(&bytes.Buffer{}, opt); err == nil {
		t.Error("no reports: no error")
	}
	if err := Write(&bytes.Buffer{}, opt, sample(), nil); err == nil || !strings.Contains(err.Error(), "result 2") {
		t.Errorf("a missing report: %v", err)
	}
	r := sample()
	r.Figures[0].Series = nil
	if err := Write(&bytes.Buffer{}, opt, r); err == nil || !strings.Contains(err.Error(), "Depletion recovery") {
		t.Errorf("an empty figure: %v, want an error naming it", err)
	}
}
