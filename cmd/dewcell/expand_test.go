package main

// Tests of expand against the constant-composition expansion of fluid O9 in
// ../../testdata/pr-open.json (pr-open.md, "Constant-composition expansion
// at 220 degF"): computed by CalebBell/thermo 0.6.1 (PR78, no volume shift)
// and a separate re-implementation, which agree to 1e-15 in V/V_dew and
// 8e-13 % in liquid volume.

import (
	"encoding/csv"
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"
)

// Tolerances against pr-open.json. The reference values agree between two
// codes to 1e-12; these leave room for the dew-point and flash tolerances of
// this code, and are as tight as the depletion targets of the issue in the
// liquid volume.
const (
	cceRelTol = 1e-6 // relative volume, Z
	ccePctTol = 1e-3 // liquid volume, % of V_dew
)

func TestExpandO9(t *testing.T) {
	ref := refO9(t)
	var list []string
	for _, r := range ref.CCE.Rows {
		list = append(list, strconv.FormatFloat(r.PPsia, 'g', -1, 64)+" psia")
	}
	doc := runJSON(t, "expand", "--pressures", strings.Join(list, ", "), o9Study)
	steps := rows(t, doc, "steps")
	if len(steps) != len(ref.CCE.Rows) {
		t.Fatalf("%d steps, want %d, one per pressure given", len(steps), len(ref.CCE.Rows))
	}
	src := "pr-open.json o9.cce, table \"Constant-composition expansion at 220 degF\" of pr-open.md"
	checkRel(t, "dew_pressure_psia", num(t, doc, "dew_pressure_psia"), ref.DewPoint.PPsia, 1e-6, "pr-open.md part C")
	checkRel(t, "z_saturation", num(t, doc, "z_saturation"), 0.84266174, 1e-7, "pr-open.md, Z_dew = 0.84266174")
	// V_dew = 0.0001010328048 m3/mol = 1.618390 ft3/lbmol (1 ft3/lbmol = 6.2427960576144e-5 m3/mol, NIST SP 811)
	checkRel(t, "saturation_volume_ft3_lbmol", num(t, doc, "saturation_volume_ft3_lbmol"), 0.0001010328048/6.2427960576144e-5, 1e-7, "pr-open.md, V_dew")
	for i, want := range ref.CCE.Rows {
		s := steps[i]
		at := fmt.Sprintf("%s row at %.6g psia", want.Region, want.PPsia)
		checkRel(t, at+" pressure_psia", num(t, s, "pressure_psia"), want.PPsia, 1e-12, "the pressures given")
		checkRel(t, at+" relative_volume", num(t, s, "relative_volume"), want.RelativeVolume, cceRelTol, src)
		checkAbs(t, at+" liquid_volume_pct", num(t, s, "liquid_volume_pct"), want.LiquidPct, ccePctTol, src)
		switch want.Region {
		case "single phase":
			checkRel(t, at+" z", num(t, s, "z"), *want.Z, cceRelTol, src)
			if c := num(t, s, "compressibility_per_psi"); !(c > 0) {
				t.Errorf("%s: compressibility_per_psi %g, want above zero", at, c)
			}
			if s["z_two_phase"] != nil {
				t.Errorf("%s: z_two_phase %v in one phase", at, s["z_two_phase"])
			}
		case "two phase":
			checkRel(t, at+" z_two_phase", num(t, s, "z_two_phase"), *want.ZTwoPhase, cceRelTol, src)
			checkRel(t, at+" vapor_fraction", num(t, s, "vapor_fraction"), *want.VapourFraction, cceRelTol, src)
			if s["z"] != nil || s["compressibility_per_psi"] != nil {
				t.Errorf("%s: single-phase z %v or compressibility %v below the dew point", at, s["z"], s["compressibility_per_psi"])
			}
		}
	}

	// The compressibility −(1/V) dV/dp at 1.1 P_dew lies between the secant
	// slopes of ln V to its neighbours at 1.05 and 1.2 P_dew, from the
	// relative volumes of pr-open.md (c falls as p rises in one phase).
	c := num(t, steps[2], "compressibility_per_psi")
	secant := func(a, b int) float64 {
		ra, rb := ref.CCE.Rows[a], ref.CCE.Rows[b]
		return -(math.Log(rb.RelativeVolume) - math.Log(ra.RelativeVolume)) / (rb.PPsia - ra.PPsia)
	}
	lo, hi := secant(1, 2), secant(2, 3) // 1.2–1.1 and 1.1–1.05 x P_dew
	if !(c > lo && c < hi) {
		t.Errorf("compressibility_per_psi at 1.1 P_dew = %g, want between the secants %g and %g (%s)", c, lo, hi, src)
	}

	// Metric: the same compressibility per bar, 1 bar = 1e5 Pa, 1 psi = 6894.757293168361 Pa.
	doc = runJSON(t, "expand", "--units", "metric", "--pressures", list[2], o9Study)
	cm := num(t, rows(t, doc, "steps")[0], "compressibility_per_bar")
	checkRel(t, "compressibility_per_bar", cm, c*1e5/6894.757293168361, 1e-9, "unit definitions, NIST SP 811")
}

// TestExpandDefaults: the default pressures are 1.3, 1.2, 1.1 and 1.05 times
// the dew point, the dew point, then 10 even steps to the abandonment
// pressure, 600 psia in o9.toml. pr-open.md's table uses the same multiples
// of P_dew.
func TestExpandDefaults(t *testing.T) {
	ref := refO9(t)
	doc := runJSON(t, "expand", o9Study)
	steps := rows(t, doc, "steps")
	if len(steps) != 15 {
		t.Fatalf("%d steps, want 15", len(steps))
	}
	for i := 0; i < 5; i++ {
		checkRel(t, fmt.Sprintf("step %d pressure_psia", i+1), num(t, steps[i], "pressure_psia"), ref.CCE.Rows[i].PPsia, 1e-6, "pr-open.md CCE")
		checkRel(t, fmt.Sprintf("step %d relative_volume", i+1), num(t, steps[i], "relative_volume"), ref.CCE.Rows[i].RelativeVolume, cceRelTol, "pr-open.md CCE")
	}
	checkRel(t, "last pressure_psia", num(t, steps[14], "pressure_psia"), 600, 1e-12, "o9.toml abandonment_pressure")
	// 600 psia is also the last row of pr-open.md's table.
	last := ref.CCE.Rows[len(ref.CCE.Rows)-1]
	checkRel(t, "relative_volume at 600 psia", num(t, steps[14], "relative_volume"), last.RelativeVolume, cceRelTol, "pr-open.md CCE")
	checkAbs(t, "liquid_volume_pct at 600 psia", num(t, steps[14], "liquid_volume_pct"), last.LiquidPct, ccePctTol, "pr-open.md CCE")
}

func TestExpandBadInput(t *testing.T) {
	noAbandon := o9Variant(t, "", `abandonment_pressure = "600 psia"`, "")
	cases := []badInputCase{
		{[]string{"--pressures", "3000 psia, abc", o9Study}, []string{"--pressures: item 2"}},
		{[]string{"--pressures", "3000 psia, 20 degF", o9Study}, []string{"--pressures: item 2", "temperature"}},
		{[]string{"--pressures", " , ", o9Study}, []string{"--pressures: item 1 is empty"}},
		{[]string{"--pressures", "-5 psia", o9Study}, []string{"--pressures: item 1"}},
		{[]string{"--temperature", "220", o9Study}, []string{"--temperature", "missing unit"}},
		{[]string{noAbandon}, []string{"--pressures", "reservoir.abandonment_pressure", noAbandon}},
		{[]string{"--steps", "3", o9Study}, []string{"steps"}},
	}
	checkBadInput(t, "expand", cases)
	// With the pressures given, no abandonment pressure is needed.
	if code, _, stderr := dewcell("expand", "--pressures", "3000 psia", noAbandon); code != 0 {
		t.Errorf("expand --pressures without abandonment_pressure: exit %d: %s", code, stderr)
	}
	// Above the cricondentherm: no dew point, a failed computation.
	if code, _, stderr := dewcell("expand", "--temperature", "1500 degF", o9Study); code != 1 || !strings.Contains(stderr, "no saturation point") {
		t.Errorf("expand at 1500 degF: exit %d, %q; want 1", code, stderr)
	}
}

func TestExpandFormats(t *testing.T) {
	code, out, stderr := dewcell("expand", "--format", "csv", "--units", "metric", o9Study)
	if code != 0 {
		t.Fatalf("csv: exit %d: %s", code, stderr)
	}
	recs, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatalf("csv does not parse: %v\n%s", err, out)
	}
	if len(recs) != 16 || !contains(recs[0], "pressure_bara") || !contains(recs[0], "relative_volume") ||
		!contains(recs[0], "compressibility_per_bar") {
		t.Errorf("csv: header %q and %d rows; want pressure_bara, relative_volume, compressibility_per_bar and 15 rows", recs[0], len(recs)-1)
	}
	// The summary is a CSV of its own, one row.
	code, out, stderr = dewcell("expand", "--format", "csv", "--table", "summary", "--units", "metric", o9Study)
	if recs, err := csv.NewReader(strings.NewReader(out)).ReadAll(); code != 0 || err != nil || len(recs) != 2 || !contains(recs[0], "dew_pressure_bara") {
		t.Errorf("csv --table summary: exit %d, %v: %q; want one row with dew_pressure_bara%s", code, err, out, stderr)
	}
	code, out, _ = dewcell("expand", o9Study)
	for _, want := range []string{"Relative", "volume", "Liquid", "[%]", "Compressibility", "[10^-6/psi]", "Dew pressure"} {
		if code != 0 || !strings.Contains(out, want) {
			t.Errorf("table: exit %d, output lacks %q:\n%s", code, want, out)
		}
	}
}
