package main

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/mbal"
)

// The forecast of the example, checked against the recover command (the
// forecast adds time to the depletion, not volumes), its own plateau, and
// the discounting rule of the economics: year k of the cash-flow table
// (k = 0 first) divided by (1 + r)^(k + 0.5), mid-year.
func TestForecastExample(t *testing.T) {
	doc := runJSON(t, "forecast", exampleStudy)
	steps, ok := doc["steps"].([]any)
	if !ok || len(steps) < 24 {
		t.Fatalf("steps %v", doc["steps"])
	}
	want := []string{"date", "pressure_psia", "wells", "wet_gas_rate_mmscf_d", "sales_gas_rate_mmscf_d", "condensate_rate_stb_d",
		"cum_wet_gas_mmscf", "cum_sales_gas_mmscf", "cum_condensate_stb"}
	first := steps[0].(map[string]any)
	for _, k := range want {
		if _, ok := first[k]; !ok {
			t.Errorf("step rows lack %s", k)
		}
	}
	plateau := num(t, doc, "plateau_rate_mmscf_d")
	onPlateau := 0
	for _, s := range steps {
		row := s.(map[string]any)
		if row["on_plateau"] == true {
			onPlateau++
			if q := row["sales_gas_rate_mmscf_d"].(float64); math.Abs(q/plateau-1) > 1e-6 {
				t.Errorf("%v: %.6f MMscf/d on the plateau of %g", row["date"], q, plateau)
			}
		}
	}
	if onPlateau < 12 {
		t.Errorf("%d steps on the plateau, the example has years of it", onPlateau)
	}
	// The cumulative wet gas at the final pressure is recover's there.
	last := steps[len(steps)-1].(map[string]any)
	pf := last["pressure_psia"].(float64)
	rec := runJSON(t, "recover", exampleStudy, "--pressures", fmt.Sprintf("%.6f psia", pf))
	rows := rec["steps"].([]any)
	r := rows[len(rows)-1].(map[string]any)
	if got, want := last["cum_wet_gas_mmscf"].(float64), r["cum_wet_gas_mmscf"].(float64); math.Abs(got/want-1) > 0.002 {
		t.Errorf("cumulative wet gas %.1f MMscf at %.1f psia, recover gives %.1f", got, pf, want)
	}
	if got, want := last["cum_condensate_stb"].(float64), r["cum_condensate_stb"].(float64); math.Abs(got/want-1) > 0.002 {
		t.Errorf("cumulative condensate %.0f STB at %.1f psia, recover gives %.0f", got, pf, want)
	}
	// NPV: the mid-year rule, recomputed from the table's net cash flows.
	if doc["currency"] != "USD" {
		t.Errorf("currency %v", doc["currency"])
	}
	cf := doc["cash_flow"].([]any)
	npv, sum := 0.0, 0.0
	for k, y := range cf {
		row := y.(map[string]any)
		net := row["net_cash_flow"].(float64)
		npv += net / math.Pow(1.10, float64(k)+0.5)
		sum += row["discounted_cash_flow"].(float64)
	}
	if got := num(t, doc, "npv"); math.Abs(got-npv) > 1e-6*math.Abs(npv) || math.Abs(sum-npv) > 1e-6*math.Abs(npv) {
		t.Errorf("npv %.0f; the table's net cash flows discounted by 1.1^(k+0.5) give %.0f, its discounted column sums to %.0f", got, npv, sum)
	}
	// The IRR discounts the net cash flows to zero.
	irr := num(t, doc, "irr")
	at := 0.0
	for k, y := range cf {
		at += y.(map[string]any)["net_cash_flow"].(float64) / math.Pow(1+irr, float64(k)+0.5)
	}
	if math.Abs(at) > 1e-6*math.Abs(npv) {
		t.Errorf("NPV at the IRR %.4f is %.0f, want 0", irr, at)
	}
	metric := runJSON(t, "forecast", exampleStudy, "--units", "metric")
	m0 := metric["steps"].([]any)[0].(map[string]any)
	for _, k := range []string{"pressure_bara", "sales_gas_rate_1e6sm3_d", "condensate_rate_sm3_d", "cum_wet_gas_1e6sm3", "cum_condensate_sm3"} {
		if _, ok := m0[k]; !ok {
			t.Errorf("metric step rows lack %s", k)
		}
	}
}

func TestForecastUsageErrors(t *testing.T) {
	text := string(mustRead(t, exampleStudy))
	cut := func(section string) string {
		text := text
		if section == "[wells]" { // and its drilling schedule
			i := strings.Index(text, "\n[[wells.add]]")
			j := strings.Index(text[i+1:], "\n[")
			text = text[:i+1] + text[i+1+j+1:]
		}
		i := strings.Index(text, "\n"+section+"\n")
		if i < 0 {
			t.Fatalf("the example has no %s", section)
		}
		j := strings.Index(text[i+1:], "\n[")
		return text[:i+1] + text[i+1+j+1:]
	}
	checkBadInput(t, "forecast", []badInputCase{
		{[]string{writeStudy(t, cut("[wells]"))}, []string{"no [wells] section", "test_rate"}},
		{[]string{writeStudy(t, cut("[production]"))}, []string{"no [production] section", "plateau_rate"}},
		{[]string{writeStudy(t, strings.Replace(text, `gas_price = "3.4 USD/MMBtu"`, `gas_price = "3.4 USD/gal"`, 1))}, []string{"economics.gas_price", "unknown unit"}},
	})
}

// Every command with --plot draws its figures into the folder.
func TestPlotFlagWritesFigures(t *testing.T) {
	for _, cmd := range []string{"compare", "check", "tune", "forecast", "recover", "deplete"} {
		dir := t.TempDir()
		if code, _, stderr := dewcell(cmd, exampleStudy, "--plot", dir, "--format", "json"); code != 0 {
			t.Fatalf("%s: exit %d: %s", cmd, code, stderr)
		}
		svg, _ := filepath.Glob(filepath.Join(dir, "*.svg"))
		png, _ := filepath.Glob(filepath.Join(dir, "*.png"))
		if len(svg) == 0 || len(svg) != len(png) {
			t.Errorf("%s --plot: %d SVG and %d PNG figures", cmd, len(svg), len(png))
		}
		for _, f := range svg {
			if fi, err := os.Stat(f); err != nil || fi.Size() < 1000 {
				t.Errorf("%s: %s is empty", cmd, f)
			}
		}
	}
}

// A component with no heating value (a light user component the GPA 2145
// table does not hold) leaves the sales gas's energy unknown, not wrong.
func TestForecastUnknownHeatingValue(t *testing.T) {
	st, err := study.Read(userFile)
	if err != nil {
		t.Fatal(err)
	}
	_, proc, err := plantOf(st, st.Plant, units.Field)
	if err != nil {
		t.Fatal(err)
	}
	out, err := proc(st.Z, 1)
	if err != nil {
		t.Fatal(err)
	}
	if !math.IsNaN(out.SalesEnergy) || !(out.SalesGas > 0) {
		t.Errorf("sales gas %g sm3 with energy %g J, want the gas and an unknown energy", out.SalesGas, out.SalesEnergy)
	}
	sg, err := salesGasOf(st, units.Field, trainOf(st, units.Field), mbal.Plant{})
	if err != nil {
		t.Fatal(err)
	}
	if sg.unknown == "" || !math.IsNaN(sg.hv) {
		t.Errorf("heating value %g, unknown %q: want it unknown, saying why", sg.hv, sg.unknown)
	}
}

// A cash flow that is positive from its first year and turns negative only
// through the abandonment cost has an NPV rising through its one root: no
// rate of return measures it, and the forecast says so instead of giving
// that root as the IRR (a lending rather than a borrowing cash flow, a
// pitfall of the IRR the finance textbooks give; from memory).
func TestForecastIRRRisingRoot(t *testing.T) {
	text := strings.Replace(string(mustRead(t, exampleStudy)), `date = "2018-07-01"
amount = "260e6 USD"`, `date = "2020-07-01"
amount = "1e6 USD"`, 1)
	doc := runJSON(t, "forecast", writeStudy(t, text))
	if _, ok := doc["irr"]; ok {
		t.Errorf("irr %v given for a cash flow that begins positive", doc["irr"])
	}
	if note, _ := doc["irr_note"].(string); !strings.Contains(note, "rises through it") {
		t.Errorf("irr_note %q", doc["irr_note"])
	}
}
