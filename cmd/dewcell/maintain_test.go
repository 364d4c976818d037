package main

import (
	"math"
	"strings"
	"testing"
)

// The scenarios of the example side by side: the keys programs read, the
// component balance of every scenario, the depletion scenario as the
// forecast command gives it, and the verdict.
func TestMaintainExample(t *testing.T) {
	doc := runJSON(t, "maintain", exampleStudy)
	rows, ok := doc["scenarios"].([]any)
	if !ok || len(rows) != 3 {
		t.Fatalf("scenarios %v", doc["scenarios"])
	}
	byName := map[string]map[string]any{}
	for _, r := range rows {
		row := r.(map[string]any)
		for _, k := range []string{"name", "npv", "condensate_recovery_pct", "sales_gas_recovery_pct", "mass_balance_error", "min_pressure_psia"} {
			if _, ok := row[k]; !ok {
				t.Errorf("scenario rows lack %s: %v", k, row)
			}
		}
		// Initial + injected = produced + in place, to 1e-8 (the trade's
		// requirement of a compositional balance).
		if e, _ := row["mass_balance_error"].(float64); !(e >= 0 && e < 1e-8) {
			t.Errorf("%v: component balance error %v", row["name"], row["mass_balance_error"])
		}
		byName[row["name"].(string)] = row
	}
	fc := runJSON(t, "forecast", exampleStudy)
	if got, want := byName["depletion"]["npv"].(float64), num(t, fc, "npv"); math.Abs(got-want) > 1e-6*math.Abs(want) {
		t.Errorf("depletion scenario NPV %.0f, the forecast command's %.0f", got, want)
	}
	if got, want := byName["depletion"]["condensate_recovery_pct"].(float64), num(t, fc, "condensate_recovery_pct"); math.Abs(got-want) > 1e-9 {
		t.Errorf("depletion scenario condensate recovery %.4f %%, the forecast command's %.4f %%", got, want)
	}
	// Holding the pressure up keeps condensate in the gas: both maintenance
	// scenarios recover more than depletion (the purpose of cycling and
	// water injection; common practice, no published source).
	for _, n := range []string{"cycling", "water injection"} {
		if !(byName[n]["condensate_recovery_pct"].(float64) > byName["depletion"]["condensate_recovery_pct"].(float64)) {
			t.Errorf("%s recovers %.1f %% of the condensate, depletion %.1f %%", n, byName[n]["condensate_recovery_pct"], byName["depletion"]["condensate_recovery_pct"])
		}
		if d := byName[n]["incremental_npv"].(float64) - (byName[n]["npv"].(float64) - byName["depletion"]["npv"].(float64)); math.Abs(d) > 1 {
			t.Errorf("%s: incremental NPV off the difference of the NPVs by %g", n, d)
		}
	}
	if v, _ := doc["verdict"].(string); !strings.Contains(v, "pays best") && !strings.Contains(v, "no pressure maintenance pays") {
		t.Errorf("verdict %q", doc["verdict"])
	}
	if s, _ := doc["sensitivity"].([]any); len(s) < 4 {
		t.Errorf("%d sensitivity rows", len(s))
	}
}

// Cycling that returns nothing, in one cell sweeping the whole volume, is
// depletion: recoveries within 0.2 % (the limiting case of no return).
func TestMaintainCyclingWithoutReturn(t *testing.T) {
	text := string(mustRead(t, exampleStudy))
	for _, r := range [][2]string{{"return_fraction = 0.85 ", "return_fraction = 0.0 "}, {"sweep_efficiency = 0.7 ", "sweep_efficiency = 1.0 "}, {"cells = 6 ", "cells = 1 "}} {
		if !strings.Contains(text, r[0]) {
			t.Fatalf("the example lacks %q", r[0])
		}
		text = strings.Replace(text, r[0], r[1], 1)
	}
	doc := runJSON(t, "maintain", writeStudy(t, text))
	rows := doc["scenarios"].([]any)
	dep, cyc := rows[0].(map[string]any), rows[1].(map[string]any)
	for _, k := range []string{"condensate_recovery_pct", "sales_gas_recovery_pct"} {
		a, b := dep[k].(float64), cyc[k].(float64)
		if math.Abs(b/a-1) > 0.002 {
			t.Errorf("%s: depletion %.4f, cycling without return %.4f (%.3f %%)", k, a, b, 100*(b/a-1))
		}
	}
}

func TestMaintainUsageErrors(t *testing.T) {
	text := string(mustRead(t, exampleStudy))
	i := strings.Index(text, "\n[[scenario]]")
	j := strings.Index(text, "\n# [standard_conditions]")
	if i < 0 || j < i {
		t.Fatal("the example's scenarios are not where the test expects them")
	}
	checkBadInput(t, "maintain", []badInputCase{
		{[]string{writeStudy(t, text[:i+1]+text[j+1:])}, []string{"no [[scenario]]", "gas-cycling"}},
		{[]string{exampleStudy, "--sensitivity", "1.5"}, []string{"--sensitivity", "between 0 and 1"}},
	})
}

// Edge cases of a second reading: cycling that returns all the plant's gas
// (only condensate and NGL are sold) runs, bought gas stops with cycling,
// and water injection below full voidage replacement converges.
func TestMaintainEdgeCases(t *testing.T) {
	text := string(mustRead(t, exampleStudy))
	for _, r := range [][2]string{
		{"return_fraction = 0.85 ", "return_fraction = 1.0 \nmakeup_gas = \"5 MMscf/d\" "},
		{"voidage_replacement = 1.0", "voidage_replacement = 0.5"},
	} {
		if !strings.Contains(text, r[0]) {
			t.Fatalf("the example lacks %q", r[0])
		}
		text = strings.Replace(text, r[0], r[1], 1)
	}
	doc := runJSON(t, "maintain", writeStudy(t, text))
	rows := doc["scenarios"].([]any)
	cyc, wat := rows[1].(map[string]any), rows[2].(map[string]any)
	if !(cyc["condensate_recovery_pct"].(float64) > rows[0].(map[string]any)["condensate_recovery_pct"].(float64)) {
		t.Errorf("cycling all the gas: condensate recovery %v", cyc["condensate_recovery_pct"])
	}
	// Bought gas flows only while cycling: 8 years of 5 MMscf/d at most.
	years := doc["years_cycling"].([]any)
	for _, y := range years {
		row := y.(map[string]any)
		if row["year"].(float64) >= 2029 && row["gas_injected_mmscf"].(float64) != 0 {
			t.Errorf("%v: %v MMscf injected after cycling ended", row["year"], row["gas_injected_mmscf"])
		}
	}
	if e, _ := wat["mass_balance_error"].(float64); !(e < 1e-8) {
		t.Errorf("water injection at voidage replacement 0.5: balance error %v", wat["mass_balance_error"])
	}
}
