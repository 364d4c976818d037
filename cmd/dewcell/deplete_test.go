package main

// Tests of deplete against the constant-volume depletion of fluid O9 in
// ../../testdata/pr-open.json (readable in pr-open.md, "Constant-volume
// depletion at 220 degF"): computed, not measured, by an independent
// general-purpose Peng–Robinson library (CalebBell/thermo 0.6.1, PR78, no
// volume shift) and repeated by a separate re-implementation; the two agree
// to 8e-13 % in dropout and 4e-14 % in produced moles.

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"dewcell/internal/refdata"
)

// refO9 returns the part of pr-open.json on fluid O9, as internal/refdata
// decodes it.
func refO9(t *testing.T) *refdata.O9 {
	t.Helper()
	d, err := refdata.Load()
	if err != nil {
		t.Fatal(err)
	}
	return &d.O9
}

// o9Variant writes a copy of the O9 study with each old string replaced by
// its new one (pairs in edits; each old must occur once) and extra appended,
// and returns its path.
func o9Variant(t *testing.T, extra string, edits ...string) string {
	t.Helper()
	return writeStudy(t, editStudy(t, o9Study, string(mustRead(t, o9Study)), edits...)+extra)
}

// rows returns doc[key] as row objects.
func rows(t *testing.T, doc map[string]any, key string) []map[string]any {
	t.Helper()
	list, ok := doc[key].([]any)
	if !ok {
		t.Fatalf("%q is %T, want an array of rows; keys: %v", key, doc[key], keys(doc))
	}
	out := make([]map[string]any, len(list))
	for i, r := range list {
		if out[i], ok = r.(map[string]any); !ok {
			t.Fatalf("%s[%d] is %T, want an object", key, i, r)
		}
	}
	return out
}

// rowAt finds the row whose pressureKey is p within 1e-9 relative.
func rowAt(t *testing.T, rs []map[string]any, pressureKey string, p float64) map[string]any {
	t.Helper()
	for _, r := range rs {
		if got, ok := r[pressureKey].(float64); ok && math.Abs(got-p) <= 1e-9*p {
			return r
		}
	}
	t.Fatalf("no row at %s = %g", pressureKey, p)
	return nil
}

// Tolerances against pr-open.json. The depletion targets are those of the
// issue ("Simulated lab experiments"): 0.05 % absolute in dropout and in
// cumulative produced moles, 1e-4 in Z. The reference compositions are
// exact to 1e-12 (the two reference codes agree to that); 1e-6 in mole
// fraction leaves room for the flash and dew-point tolerances of this code.
const (
	cvdPctTol  = 0.05
	cvdZTol    = 1e-4
	cvdMoleTol = 1e-6
)

func TestDepleteO9(t *testing.T) {
	ref := refO9(t)
	doc := runJSON(t, "deplete", o9Study)
	src := "pr-open.json o9.cvd, table \"Constant-volume depletion at 220 degF\" of pr-open.md"

	// The steps: the dew point, then the [depletion] pressures of o9.toml.
	steps := rows(t, doc, "steps")
	if len(steps) != len(ref.CVD.Rows) {
		t.Fatalf("%d steps, want %d: the dew point and the 7 pressures of o9.toml", len(steps), len(ref.CVD.Rows))
	}
	checkRel(t, "dew_pressure_psia", num(t, doc, "dew_pressure_psia"), ref.DewPoint.PPsia, 1e-6, "pr-open.md part C")
	names := make([]string, len(ref.Components))
	for i, c := range ref.Components {
		names[i] = c.Name
	}
	gas, liquid := rows(t, doc, "gas_composition"), rows(t, doc, "liquid_composition")
	for i, want := range ref.CVD.Rows {
		s := steps[i]
		at := fmt.Sprintf("step %d (%.6g psia)", i+1, want.PPsia)
		p := num(t, s, "pressure_psia")
		checkRel(t, at+" pressure_psia", p, want.PPsia, 1e-6, src)
		checkAbs(t, at+" liquid_dropout_pct", num(t, s, "liquid_dropout_pct"), want.DropoutPct, cvdPctTol, src)
		checkAbs(t, at+" produced_pct", num(t, s, "produced_pct"), want.ProducedPct, cvdPctTol, src)
		checkAbs(t, at+" z_two_phase", num(t, s, "z_two_phase"), want.ZTwoPhase, cvdZTol, src)
		checkAbs(t, at+" z_gas", num(t, s, "z_gas"), want.ZV, cvdZTol, src)
		// densities in lb/ft3: 1 lb/ft3 = 16.018463373960139 kg/m3 (NIST SP 811, exact definitions)
		if want.RhoV != nil {
			checkRel(t, at+" gas_density_lb_ft3", num(t, s, "gas_density_lb_ft3")*16.018463373960139, *want.RhoV, 1e-5, src)
		}
		y := rowAt(t, gas, "pressure_psia", p)
		for k, n := range names {
			checkAbs(t, at+" produced gas "+n, num(t, y, n), want.ProducedY[k], cvdMoleTol, src)
		}
		if want.LiquidX == nil {
			if s["liquid_density_lb_ft3"] != nil {
				t.Errorf("%s: liquid density %v at the dew point, want null (one phase)", at, s["liquid_density_lb_ft3"])
			}
			continue
		}
		checkRel(t, at+" liquid_density_lb_ft3", num(t, s, "liquid_density_lb_ft3")*16.018463373960139, want.RhoL, 1e-5, src)
		x := rowAt(t, liquid, "pressure_psia", p)
		for k, n := range names {
			checkAbs(t, at+" liquid "+n, num(t, x, n), want.LiquidX[k], cvdMoleTol, src)
		}
	}

	// The largest tabulated dropout is 10.008167 % at 2000 psia, between
	// 2500 and 1500 psia (pr-open.md): the maximum lies there. It is the
	// maximum of the continuous depletion, which the laboratory's coarse
	// steps overstate (each removes gas leaner than the step's average, so
	// more liquid stays): within 0.1 vol% of the largest step of the same
	// depletion in 1000 steps of 3 psi, and below the tabulated 10.008167.
	if pm := num(t, doc, "max_dropout_pressure_psia"); !(pm > 1500 && pm < 2500) {
		t.Errorf("max_dropout_pressure_psia = %g, want between 1500 and 2500 psia (%s)", pm, src)
	}
	fine := rows(t, runJSON(t, "deplete", "--steps", "1000", o9Study), "steps")
	best := 0.0
	for _, s := range fine {
		best = math.Max(best, num(t, s, "liquid_dropout_pct"))
	}
	checkAbs(t, "max_liquid_dropout_pct", num(t, doc, "max_liquid_dropout_pct"), best, 0.1, "deplete --steps 1000")
	if got := num(t, doc, "max_liquid_dropout_pct"); !(got < 10.008167) {
		t.Errorf("max_liquid_dropout_pct = %g, not below the coarse steps' 10.008167 (%s)", got, src)
	}

	// Surface yields. o9.toml has no separator stages: the produced gas goes
	// to the stock tank at 60 degF and 14.696 psia. The sales gas cannot
	// exceed the produced moles as ideal gas, R T/p = 379.48 scf/lbmol
	// there (R = 8.31446261815324 J/(mol K), exact since the 2019 SI).
	scfPerLbmol := 8.31446261815324 * (60 + 459.67) / 1.8 / (14.696 * 6894.757293168361) * 453.59237 / 0.028316846592
	var prevOil float64
	for i, s := range steps[1:] {
		produced := num(t, s, "produced_pct") / 100
		gasV, oil := num(t, s, "cum_sales_gas_scf_lbmol"), num(t, s, "cum_condensate_stb_lbmol")
		if !(gasV > 0 && gasV < produced*scfPerLbmol && oil > prevOil) {
			t.Errorf("step %d: cum_sales_gas_scf_lbmol %g (want in (0, %g)), cum_condensate_stb_lbmol %g (want above %g)",
				i+2, gasV, produced*scfPerLbmol, oil, prevOil)
		}
		prevOil = oil
		if g := num(t, s, "surface_gas_gravity"); !(g > 0.55 && g < 1) {
			t.Errorf("step %d: surface_gas_gravity %g, want a gas between methane (0.55) and air", i+2, g)
		}
	}
	if steps[0]["cgr_stb_mmscf"] != nil {
		t.Errorf("the dew-point step produces nothing, yet has cgr %v", steps[0]["cgr_stb_mmscf"])
	}
}

// TestDepleteMetric checks the metric keys and a converted value:
// 3000 psia = 206.8427188 bara (1 psi = 6894.757293168361 Pa, NIST SP 811).
func TestDepleteMetric(t *testing.T) {
	doc := runJSON(t, "deplete", "--units", "metric", o9Study)
	s := rowAt(t, rows(t, doc, "steps"), "pressure_bara", 3000*6894.757293168361/1e5)
	checkAbs(t, "liquid_dropout_pct at 3000 psia", num(t, s, "liquid_dropout_pct"), 8.9723429, cvdPctTol, "pr-open.md, CVD at 220 degF")
	checkAbs(t, "produced_pct at 3000 psia", num(t, s, "produced_pct"), 18.178634, cvdPctTol, "pr-open.md, CVD at 220 degF")
	checkAbs(t, "z_two_phase at 3000 psia", num(t, s, "z_two_phase"), 0.81353481, cvdZTol, "pr-open.md, CVD at 220 degF")
	for _, k := range []string{"gas_density_kg_m3", "gas_viscosity_cP", "cgr_sm3_1e6sm3", "cum_sales_gas_sm3_kmol", "cum_condensate_sm3_kmol", "gas_molar_mass_g_mol"} {
		num(t, s, k)
	}
	checkAbs(t, "temperature_degC", num(t, doc, "temperature_degC"), 377.5944444444445-273.15, 1e-9, "pr-open.json o9.T_K")
	checkAbs(t, "standard_temperature_degC", num(t, doc, "standard_temperature_degC"), 15, 1e-9, "DESIGN.md: metric standard conditions 15 degC, 101.325 kPa")
}

// TestDepleteFromInitial starts the cell at 1.2 times the dew point. Above
// the dew point the cell holds one phase: the gas removed down to p leaves
// V(p_start)/V(p) of the moles, V from the single-phase Z of pr-open.md's CCE
// table. Below the dew point the cell holds n_d = V_cell/V_dew moles of the
// feed, the CCE relative volume at the start, and behaves as the cell that
// starts at the dew point scaled by n_d: the same dropout and two-phase Z,
// and produced moles 1 − n_d (1 − produced from the dew point).
func TestDepleteFromInitial(t *testing.T) {
	ref := refO9(t)
	start, above := ref.CCE.Rows[1], ref.CCE.Rows[2] // 1.2 and 1.1 x P_dew, single phase
	if start.Z == nil || above.Z == nil {
		t.Fatal("pr-open.json: CCE rows 2 and 3 have no single-phase Z")
	}
	ps := func(p float64) string { return strconv.FormatFloat(p, 'g', -1, 64) + " psia" }
	study := o9Variant(t, "", `initial_pressure = "3797.796273 psia"`, `initial_pressure = "`+ps(start.PPsia)+`"`)
	doc := runJSON(t, "deplete", "--from-initial", "--pressures", ps(above.PPsia)+", 3500 psia, 3000 psia", study)
	steps := rows(t, doc, "steps")
	if len(steps) != 5 {
		t.Fatalf("%d steps, want 5: the start, the pressure above the dew point, the dew point, 3500 and 3000 psia", len(steps))
	}
	src := "pr-open.md, CCE and CVD at 220 degF"
	checkRel(t, "start pressure", num(t, steps[0], "pressure_psia"), start.PPsia, 1e-9, "the study")
	checkRel(t, "start_pressure_psia", num(t, doc, "start_pressure_psia"), start.PPsia, 1e-9, "the study")
	checkAbs(t, "z_gas at the start", num(t, steps[0], "z_gas"), *start.Z, 1e-6, src)
	left := (*start.Z / start.PPsia) / (*above.Z / above.PPsia)
	checkAbs(t, "produced_pct above the dew point", num(t, steps[1], "produced_pct"), 100*(1-left), cvdPctTol, src)
	checkAbs(t, "z_gas above the dew point", num(t, steps[1], "z_gas"), *above.Z, 1e-6, src)
	checkAbs(t, "liquid_dropout_pct above the dew point", num(t, steps[1], "liquid_dropout_pct"), 0, 1e-12, "one phase")
	checkRel(t, "dew point step", num(t, steps[2], "pressure_psia"), ref.DewPoint.PPsia, 1e-6, src)
	nd := start.RelativeVolume
	checkAbs(t, "produced_pct at the dew point", num(t, steps[2], "produced_pct"), 100*(1-nd), cvdPctTol, src)
	for i, want := range ref.CVD.Rows[1:3] { // 3500 and 3000 psia
		s := steps[3+i]
		at := fmt.Sprintf("%g psia", want.PPsia)
		checkAbs(t, at+" liquid_dropout_pct", num(t, s, "liquid_dropout_pct"), want.DropoutPct, cvdPctTol, src)
		checkAbs(t, at+" produced_pct", num(t, s, "produced_pct"), 100*(1-nd*(1-want.ProducedPct/100)), cvdPctTol, src)
		checkAbs(t, at+" z_two_phase", num(t, s, "z_two_phase"), want.ZTwoPhase, cvdZTol, src)
	}
}

// TestDepleteFromInitialAtDew: o9.toml's initial pressure is its dew point
// to 10 digits; --from-initial then starts at the dew point and says so.
func TestDepleteFromInitialAtDew(t *testing.T) {
	code, out, stderr := dewcell("deplete", "--from-initial", "--format", "json", o9Study)
	if code != 0 || !strings.Contains(stderr, "starts at the dew point") {
		t.Fatalf("exit %d, stderr %q; want 0 and a note that the depletion starts at the dew point", code, stderr)
	}
	var doc map[string]any
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	s := rowAt(t, rows(t, doc, "steps"), "pressure_psia", 3000)
	checkAbs(t, "produced_pct at 3000 psia", num(t, s, "produced_pct"), 18.178634, cvdPctTol, "pr-open.md, CVD at 220 degF")
}

// TestDepleteSteps: --steps N gives the dew point and N even steps down to
// the abandonment pressure, 600 psia in o9.toml.
func TestDepleteSteps(t *testing.T) {
	code, out, stderr := dewcell("deplete", "--steps", "4", "--format", "json", o9Study)
	if code != 0 || !strings.Contains(stderr, "[depletion] pressures") {
		t.Fatalf("exit %d, stderr %q; want 0 and a note that the study's pressures are not used", code, stderr)
	}
	var doc map[string]any
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	steps := rows(t, doc, "steps")
	pd := 3797.796273 // pr-open.md part C
	if len(steps) != 5 {
		t.Fatalf("%d steps, want 5", len(steps))
	}
	for k, s := range steps {
		checkRel(t, fmt.Sprintf("step %d", k+1), num(t, s, "pressure_psia"), pd-(pd-600)*float64(k)/4, 1e-6, "even steps from the dew point to 600 psia")
	}
}

func TestDepleteBadInput(t *testing.T) {
	noInitial := o9Variant(t, "", `initial_pressure = "3797.796273 psia"   # the PR78 upper dew point (pr-open.md)`, "")
	lowInitial := o9Variant(t, "", `initial_pressure = "3797.796273 psia"`, `initial_pressure = "3000 psia"`)
	aboveDew := o9Variant(t, "", `pressures = ["3500 psia"`, `pressures = ["4000 psia", "3500 psia"`)
	noSteps := o9Variant(t, "", "[depletion]", "", `pressures = ["3500 psia", "3000 psia", "2500 psia", "2000 psia", "1500 psia", "1000 psia", "600 psia"]`, "",
		`abandonment_pressure = "600 psia"`, "")
	highAbandon := o9Variant(t, "", "[depletion]", "", `pressures = ["3500 psia", "3000 psia", "2500 psia", "2000 psia", "1500 psia", "1000 psia", "600 psia"]`, "",
		`abandonment_pressure = "600 psia"`, `abandonment_pressure = "4000 psia"`,
		`initial_pressure = "3797.796273 psia"`, `initial_pressure = "5000 psia"`)
	cases := []badInputCase{
		{[]string{"--pressures", "3000", o9Study}, []string{"--pressures: item 1", "missing unit"}},
		{[]string{"--pressures", "3000 psia; 2000 psia", o9Study}, []string{"--pressures: item 1"}},
		{[]string{"--pressures", "3000 psia,, 2000 psia", o9Study}, []string{"--pressures: item 2 is empty"}},
		{[]string{"--pressures", "", o9Study}, []string{"--pressures: empty list"}},
		{[]string{"--pressures", "0 psia", o9Study}, []string{"--pressures: item 1", "above zero"}},
		{[]string{"--pressures", "3000 psia, 3500 psia", o9Study}, []string{"--pressures: item 2", "not below the pressure before it"}},
		{[]string{"--pressures", "3000 psia, 3000 psia", o9Study}, []string{"--pressures: item 2", "not below"}},
		// 4000 psia is above the dew point, 3797.8 psia (pr-open.md part C)
		{[]string{"--pressures", "4000 psia, 3000 psia", o9Study}, []string{"--pressures: item 1", "not below the dew point", "--from-initial"}},
		{[]string{"--steps", "0", o9Study}, []string{"--steps", "from 1 to"}},
		{[]string{"--steps", "-3", o9Study}, []string{"--steps"}},
		{[]string{"--steps", "many", o9Study}, []string{"steps"}},
		{[]string{"--steps", "3", "--pressures", "3000 psia", o9Study}, []string{"--pressures and --steps"}},
		{[]string{"--from-initial", noInitial}, []string{"--from-initial", "reservoir.initial_pressure", noInitial}},
		{[]string{"--from-initial", lowInitial}, []string{"--from-initial", "reservoir.initial_pressure", "below the computed dew point"}},
		{[]string{"--from-initial", "--pressures", "3500 psia", lowInitial}, []string{"--from-initial", "below the computed dew point"}},
		{[]string{aboveDew}, []string{aboveDew, "depletion.pressures[1]", "not below the dew point", "--from-initial"}},
		{[]string{noSteps}, []string{"--pressures", "[depletion]", "reservoir.abandonment_pressure", noSteps}},
		{[]string{highAbandon}, []string{highAbandon, "reservoir.abandonment_pressure", "not below the dew point"}},
		{[]string{"--temperature", "200 degF", o9Study}, []string{"temperature"}},
	}
	checkBadInput(t, "deplete", cases)
	// Above the cricondentherm there is no dew point: a failed computation.
	hot := o9Variant(t, "", `temperature = "220 degF"`, `temperature = "1500 degF"`)
	if code, _, stderr := dewcell("deplete", hot); code != 1 || !strings.Contains(stderr, "no saturation point") {
		t.Errorf("deplete at 1500 degF: exit %d, %q; want 1 and no saturation point", code, stderr)
	}
}

// TestDepleteFormats parses the CSV and table forms: one rectangular CSV
// table with the compositions as columns and the summary repeated.
func TestDepleteFormats(t *testing.T) {
	code, out, stderr := dewcell("deplete", "--format", "csv", o9Study)
	if code != 0 {
		t.Fatalf("csv: exit %d: %s", code, stderr)
	}
	recs, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatalf("csv does not parse: %v\n%s", err, out)
	}
	if len(recs) != 9 {
		t.Fatalf("csv: %d records, want a header and 8 steps", len(recs))
	}
	col := map[string]int{}
	for i, h := range recs[0] {
		col[h] = i
	}
	for _, k := range []string{"pressure_psia", "liquid_dropout_pct", "produced_pct", "z_gas", "z_two_phase", "gas_viscosity_cP", "cgr_stb_mmscf"} {
		if _, ok := col[k]; !ok {
			t.Errorf("csv header %q lacks %s", recs[0], k)
		}
	}
	// The CSV holds one table in full; the others, and the summary, are
	// asked for by name, and a wrong name lists them.
	for _, c := range []struct{ part, key string }{
		{"gas_composition", "C1"}, {"liquid_composition", "P2"}, {"summary", "max_liquid_dropout_pct"}, {"summary", "max_dropout_pressure_psia"},
	} {
		code, out, stderr := dewcell("deplete", "--format", "csv", "--table", c.part, o9Study)
		if code != 0 || !strings.Contains(strings.SplitN(out, "\n", 2)[0], c.key) {
			t.Errorf("--table %s: exit %d, header lacks %s: %s%s", c.part, code, c.key, out, stderr)
		}
	}
	if code, _, stderr := dewcell("deplete", "--format", "csv", "--table", "nonesuch", o9Study); code != 2 || !strings.Contains(stderr, "gas_composition") {
		t.Errorf("--table nonesuch: exit %d, want a failure listing the tables: %s", code, stderr)
	}
	if i, ok := col["liquid_dropout_pct"]; ok {
		got, err := strconv.ParseFloat(recs[3][i], 64) // 3000 psia
		if err != nil {
			t.Fatal(err)
		}
		checkAbs(t, "csv liquid_dropout_pct at 3000 psia", got, 8.9723429, cvdPctTol, "pr-open.md, CVD at 220 degF")
	}
	code, out, _ = dewcell("deplete", o9Study)
	for _, want := range []string{"Maximum liquid dropout", "Liquid", "dropout", "[%]", "two-phase", "Produced gas composition", "Retrograde liquid composition"} {
		if code != 0 || !strings.Contains(out, want) {
			t.Errorf("table: exit %d, output lacks %q:\n%s", code, want, out)
		}
	}
}

// TestDepleteExampleRevaporizes: the bundled example condensate shows what
// every gas-condensate CVD report shows (common practice, no published
// source): no liquid at the dew point, a dropout maximum inside the pressure
// range, and revaporization below it.
func TestDepleteExampleRevaporizes(t *testing.T) {
	doc := runJSON(t, "deplete", exampleStudy)
	steps := rows(t, doc, "steps")
	first, last := steps[0], steps[len(steps)-1]
	maxP := doc["max_dropout_pressure_psia"].(float64)
	maxD := doc["max_liquid_dropout_pct"].(float64)
	if first["liquid_dropout_pct"].(float64) != 0 {
		t.Errorf("dropout at the dew point = %v, want 0", first["liquid_dropout_pct"])
	}
	if !(maxP < first["pressure_psia"].(float64) && maxP > last["pressure_psia"].(float64)) {
		t.Errorf("maximum dropout at %g psia, outside the depletion's range", maxP)
	}
	if d := last["liquid_dropout_pct"].(float64); !(d < maxD) {
		t.Errorf("dropout at abandonment %g %% not below the maximum %g %%: no revaporization", d, maxD)
	}
}

// TestDepleteCrossesLowerDewPoint: an invented lean condensate 2 degF below
// its cricondentherm (testdata/lean-near-cricondentherm.toml). Its depletion
// condenses a trace of liquid and then crosses the lower dew point, below
// which the liquid revaporizes completely (single-phase gas again, as the
// phase envelope requires below the lower dew point); near there the cell's
// flashes split off liquid fractions of 1e-8 to 1e-7, which must converge.
func TestDepleteCrossesLowerDewPoint(t *testing.T) {
	doc := runJSON(t, "deplete", filepath.Join("testdata", "lean-near-cricondentherm.toml"))
	steps := rows(t, doc, "steps")
	wet := 0
	prev := -1.0
	for _, s := range steps {
		d := s["liquid_dropout_pct"].(float64)
		if d > 0 {
			wet++
		}
		if pp := s["produced_pct"].(float64); !(pp >= prev) {
			t.Errorf("cumulative produced moles fall to %g %% at %v psia", pp, s["pressure_psia"])
		} else {
			prev = pp
		}
	}
	if wet == 0 {
		t.Fatal("no step holds liquid: the case no longer crosses the two-phase region")
	}
	if d := steps[len(steps)-1]["liquid_dropout_pct"].(float64); d != 0 {
		t.Errorf("dropout at abandonment %g %%, want 0 below the lower dew point", d)
	}
	if steps[len(steps)-2]["liquid_dropout_pct"].(float64) != 0 {
		t.Errorf("the last two steps should both lie below the lower dew point")
	}
}
