package main

import (
	"encoding/csv"
	"fmt"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"dewcell/cvd"
)

// Ideal-gas molar volumes at standard conditions, R T/p with
// R = 8.31446261815324 J/(mol K) (exact since the 2019 SI) and the exact unit
// definitions of NIST SP 811: 379.48 scf/lbmol at 60 degF and 14.696 psia
// (McCain, The Properties of Petroleum Fluids, 2nd ed., 1990, prints
// 379.4), 23.645 m3/kmol at 15 degC and 101.325 kPa (ISO 13443:1996).
var (
	stdScfPerLbmol = 8.31446261815324 * (60 + 459.67) / 1.8 / (14.696 * 6894.757293168361) * 453.59237 / 0.028316846592
	stdSm3PerKmol  = 8.31446261815324 * 288.15 / 101325 * 1000
)

// TestSeparateO9Stage runs O9 through one separator at 220 degF and
// 0.8 P_dew, a PT flash tabulated in pr-open.md ("PT flashes at fractions
// of P_dew"): the first stage's gas is the flash's vapour.
func TestSeparateO9Stage(t *testing.T) {
	ref := refO9(t)
	f := ref.Flashes[0] // P/P_dew = 0.8
	stage := fmt.Sprintf("\n[[separator.stage]]\npressure = \"%s psia\"\ntemperature = \"220 degF\"\n", strconv.FormatFloat(f.PPsia, 'g', -1, 64))
	study := o9Variant(t, stage)
	doc := runJSON(t, "separate", study)
	src := "pr-open.md, PT flash at 0.8 P_dew and 220 degF"
	stages := rows(t, doc, "stages")
	if len(stages) != 2 || stages[1]["stage"] != "stock tank" {
		t.Fatalf("stages %v, want the separator and the stock tank", stages)
	}
	s1 := stages[0]
	checkRel(t, "stage 1 pressure_psia", num(t, s1, "pressure_psia"), f.PPsia, 1e-12, "the study")
	// The vapour fraction agrees between the two reference codes to 1e-15;
	// 1e-7 leaves room for this code's flash tolerance.
	checkRel(t, "stage 1 gas_mole_fraction", num(t, s1, "gas_mole_fraction"), f.VapourFraction, 1e-7, src)
	checkRel(t, "stage 1 liquid_mole_fraction", num(t, s1, "liquid_mole_fraction"), 1-f.VapourFraction, 1e-6, src)
	// specific gravity = M / M_air with the program's air molar mass
	checkRel(t, "stage 1 gas_gravity", num(t, s1, "gas_gravity")*cvd.MolarMassAir*1000, f.MWV, 1e-7, src)
	checkRel(t, "stage 1 gas_volume_scf_lbmol", num(t, s1, "gas_volume_scf_lbmol"), f.VapourFraction*stdScfPerLbmol, 1e-7, src+"; ideal gas at 60 degF, 14.696 psia")

	// Balances and definitions.
	tank := stages[1]
	checkRel(t, "stock-tank feed", num(t, tank, "feed_mole_fraction"), num(t, s1, "liquid_mole_fraction"), 1e-12, "mole balance")
	gas := num(t, s1, "gas_mole_fraction") + num(t, tank, "gas_mole_fraction")
	checkRel(t, "surface_gas_mole_fraction", num(t, doc, "surface_gas_mole_fraction"), gas, 1e-12, "sum of the stage gases")
	checkRel(t, "gas + oil moles", gas+num(t, tank, "liquid_mole_fraction"), 1, 1e-12, "mole balance")
	checkRel(t, "surface_gas_scf_lbmol", num(t, doc, "surface_gas_scf_lbmol"), gas*stdScfPerLbmol, 1e-9, "ideal gas at 60 degF, 14.696 psia")
	gor := num(t, doc, "gor_scf_stb")
	checkRel(t, "gor_scf_stb", gor, num(t, doc, "surface_gas_scf_lbmol")/num(t, doc, "stock_tank_oil_stb_lbmol"), 1e-12, "GOR = gas/oil")
	checkRel(t, "cgr_stb_mmscf", num(t, doc, "cgr_stb_mmscf"), 1e6/gor, 1e-12, "CGR = 1/GOR")
	sg := num(t, doc, "stock_tank_oil_specific_gravity")
	checkRel(t, "api_gravity", num(t, doc, "api_gravity"), 141.5/sg-131.5, 1e-12, "API gravity = 141.5/SG - 131.5 (API definition)")
	// SG 60/60: density over water at 60 degF, 62.366 lb/ft3 (999.016 kg/m3)
	checkRel(t, "stock_tank_oil_specific_gravity", sg, num(t, doc, "stock_tank_oil_density_lb_ft3")*16.018463373960139/cvd.WaterDensity60F, 1e-9, "SG definition")
	var stageGOR float64
	for _, s := range stages {
		stageGOR += num(t, s, "stage_gor_scf_stb")
	}
	checkRel(t, "sum of stage GORs", stageGOR, gor, 1e-9, "the stage GORs add up to the total")
	checkAbs(t, "standard_temperature_degF", num(t, doc, "standard_temperature_degF"), 60, 1e-9, "DESIGN.md: 60 degF, 14.696 psia")
	checkAbs(t, "standard_pressure_psia", num(t, doc, "standard_pressure_psia"), 14.696, 1e-9, "DESIGN.md: 60 degF, 14.696 psia")

	// Metric: 15 degC and 101.325 kPa, volumes per kmol.
	doc = runJSON(t, "separate", "--units", "metric", study)
	checkRel(t, "surface_gas_sm3_kmol", num(t, doc, "surface_gas_sm3_kmol"), num(t, doc, "surface_gas_mole_fraction")*stdSm3PerKmol, 1e-9, "ideal gas at 15 degC, 101.325 kPa")
	checkRel(t, "gor x cgr", num(t, doc, "gor_sm3_sm3")*num(t, doc, "cgr_sm3_1e6sm3"), 1e6, 1e-12, "CGR = 1/GOR")
	checkAbs(t, "standard_temperature_degC", num(t, doc, "standard_temperature_degC"), 15, 1e-9, "DESIGN.md: 15 degC, 101.325 kPa")
	checkRel(t, "stage 1 gas_mole_fraction (metric)", num(t, rows(t, doc, "stages")[0], "gas_mole_fraction"), f.VapourFraction, 1e-7, src)
}

// TestSeparateMatchesDeplete: the surface CGR of the gas deplete produces at
// 3500 psia equals that of separate on a study whose feed is that gas, the
// produced-gas composition of pr-open.md's depletion table.
func TestSeparateMatchesDeplete(t *testing.T) {
	ref := refO9(t)
	row := ref.CVD.Rows[1]
	if row.PPsia != 3500 {
		t.Fatalf("pr-open.json CVD row 2 is at %g psia, want 3500", row.PPsia)
	}
	old := []string{"N2 = 0.8", "CO2 = 3.5", "C1 = 74", "C2 = 7.5", "C3 = 4", "nC4 = 2.7", "nC5 = 1.5", "P1 = 4.5", "P2 = 1.5"}
	var edits []string
	for i, c := range ref.Components {
		edits = append(edits, "\n"+old[i]+"\n", fmt.Sprintf("\n%s = %s\n", c.Name, strconv.FormatFloat(100*row.ProducedY[i], 'g', -1, 64)))
	}
	gasStudy := o9Variant(t, "", edits...)
	sep := runJSON(t, "separate", gasStudy)
	dep := runJSON(t, "deplete", o9Study)
	s := rowAt(t, rows(t, dep, "steps"), "pressure_psia", 3500)
	// y agrees with the reference to 1e-6 (TestDepleteO9): the CGR to 1e-4 relative.
	checkRel(t, "cgr_stb_mmscf at 3500 psia", num(t, s, "cgr_stb_mmscf"), num(t, sep, "cgr_stb_mmscf"), 1e-4, "separate on pr-open.md's produced gas at 3500 psia")
	checkRel(t, "surface_gas_gravity at 3500 psia", num(t, s, "surface_gas_gravity"), num(t, sep, "surface_gas_gravity"), 1e-5, "separate on pr-open.md's produced gas at 3500 psia")
}

func TestSeparateFormats(t *testing.T) {
	code, out, stderr := dewcell("separate", "--format", "csv", o9Study)
	if code != 0 {
		t.Fatalf("csv: exit %d: %s", code, stderr)
	}
	recs, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatalf("csv does not parse: %v\n%s", err, out)
	}
	for _, k := range []string{"stage", "gas_volume_scf_lbmol", "stage_gor_scf_stb"} {
		if !contains(recs[0], k) {
			t.Errorf("csv header %q lacks %s", recs[0], k)
		}
	}
	code, out, _ = dewcell("separate", "--format", "csv", "--table", "summary", o9Study)
	if sum, err := csv.NewReader(strings.NewReader(out)).ReadAll(); code != 0 || err != nil || len(sum) != 2 {
		t.Errorf("csv --table summary: exit %d, %v, %q", code, err, out)
	} else {
		for _, k := range []string{"gor_scf_stb", "cgr_stb_mmscf", "api_gravity", "standard_pressure_psia"} {
			if !contains(sum[0], k) {
				t.Errorf("csv summary header %q lacks %s", sum[0], k)
			}
		}
	}
	if len(recs) != 2 || recs[1][0] != "stock tank" {
		t.Errorf("csv: %d rows, want the stock tank alone (o9.toml has no separator stages)", len(recs)-1)
	}
	if !strings.Contains(stderr, "no [[separator.stage]]") {
		t.Errorf("standard error %q does not say the study has no separator stages", stderr)
	}
	code, out, _ = dewcell("separate", "--units", "metric", o9Study)
	for _, want := range []string{`\| GOR +\| +[0-9.]+ \| sm3/sm3 +\|`, `\| CGR +\| +[0-9.]+ \| sm3/10\^6 sm3 +\|`, `API gravity`,
		`\| Standard pressure +\| +[0-9.]+ \| bara +\|`, "Compositions, mole fraction"} {
		if code != 0 || !regexp.MustCompile(want).MatchString(out) {
			t.Errorf("table: exit %d, output lacks %q:\n%s", code, want, out)
		}
	}
	if code, stdout, stderr := dewcell("separate", "--pressure", "3000 psia", o9Study); code != 2 || stdout != "" || !strings.Contains(stderr, "pressure") {
		t.Errorf("separate --pressure: exit %d, %q; want 2: separate takes no pressure", code, stderr)
	}
}

// TestSeparateGravityUnits: the stock-tank oil's specific gravity (60/60 degF)
// and API gravity, 141.5/SG - 131.5 (METHODS 5.1; IADC drilling glossary,
// "API gravity at 60 degF"), are defined at 60 degF whatever the standard
// conditions of the output. The dead oil of testdata/dead-oil.toml gives the
// same liquid in the field stock tank (60 degF, 14.696 psia) and in the
// metric one (15 degC, 101.325 kPa), so both unit systems must print the
// same gravities; its density at standard conditions differs, the liquid
// being denser at 15 degC.
func TestSeparateGravityUnits(t *testing.T) {
	// the example condensate's stock tank, unless the study sets standard
	// conditions, runs at 60 degF and 14.696 psia in both unit systems, so
	// its oil and API gravity do not depend on --units either
	for _, study := range []string{"testdata/dead-oil.toml", exampleStudy} {
		field, metric := runJSON(t, "separate", study), runJSON(t, "separate", "--units", "metric", study)
		for _, k := range []string{"api_gravity", "stock_tank_oil_specific_gravity"} {
			checkRel(t, study+": "+k+" (metric against field)", num(t, metric, k), num(t, field, k), 1e-12, "the same liquid at 60 degF")
		}
	}
	const study = "testdata/dead-oil.toml"
	field, metric := runJSON(t, "separate", study), runJSON(t, "separate", "--units", "metric", study)
	sg := num(t, field, "stock_tank_oil_specific_gravity")
	checkRel(t, "api_gravity", num(t, field, "api_gravity"), 141.5/sg-131.5, 1e-12, "API gravity = 141.5/SG - 131.5")
	// 1 lb/ft3 = 16.018463373960139 kg/m3 (NIST SP 811, from the pound and foot)
	rhoF, rhoM := num(t, field, "stock_tank_oil_density_lb_ft3")*16.018463373960139, num(t, metric, "stock_tank_oil_density_kg_m3")
	checkRel(t, "specific gravity from the 60 degF density", sg, rhoF/cvd.WaterDensity60F, 1e-9, "SG definition, water 999.016 kg/m3 at 60 degF")
	if !(rhoM > rhoF) {
		t.Errorf("stock-tank oil density %g kg/m3 at 15 degC, %g at 60 degF; want it denser at 15 degC", rhoM, rhoF)
	}
	// As people read them: the tables print the same API gravity.
	_, tf, _ := dewcell("separate", study)
	_, tm, _ := dewcell("separate", "--units", "metric", study)
	line := func(out string) string {
		for _, l := range strings.Split(out, "\n") {
			if f := strings.Split(l, "|"); len(f) > 2 && strings.TrimSpace(f[1]) == "API gravity" {
				return strings.TrimSpace(f[2]) // the value, whatever the width of the unit column
			}
		}
		return ""
	}
	if lf, lm := line(tf), line(tm); lf == "" || lf != lm {
		t.Errorf("API gravity line: field %q, metric %q; want the same", lf, lm)
	}
}
