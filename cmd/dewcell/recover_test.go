package main

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"strconv"
	"strings"
	"testing"
)

// TestRecoverO9 depletes the reservoir of o9.toml, which starts at its dew
// point and has no rock or water compressibility, at the pressures of
// pr-open.md's constant-volume depletion: the reservoir is then the CVD cell
// scaled up, so the wet gas recovered is the cumulative produced moles, the
// two-phase Z is the cell's, and the condensate saturation is the liquid
// dropout times (1 - Sw).
func TestRecoverO9(t *testing.T) {
	ref := refO9(t)
	var ps []string
	for _, r := range ref.CVD.Rows[1:] { // the first row is the dew point
		ps = append(ps, strconv.FormatFloat(r.PPsia, 'g', -1, 64)+" psia")
	}
	doc := runJSON(t, "recover", "--pressures", strings.Join(ps, ", "), o9Study)
	steps := rows(t, doc, "steps")
	src := "pr-open.json o9.cvd (\"Constant-volume depletion at 220 degF\" in pr-open.md)"
	const sw = 0.25 // o9.toml
	for _, r := range ref.CVD.Rows[1:] {
		s := rowAt(t, steps, "pressure_psia", r.PPsia)
		at := fmt.Sprintf(" at %g psia", r.PPsia)
		// Tolerances of TestDepleteO9 (the issue's: 0.05 % absolute, 1e-4 in Z).
		checkAbs(t, "wet_gas_recovery_pct"+at, num(t, s, "wet_gas_recovery_pct"), r.ProducedPct, cvdPctTol, src+": cumulative produced moles")
		checkAbs(t, "z_two_phase"+at, num(t, s, "z_two_phase"), r.ZTwoPhase, cvdZTol, src)
		checkAbs(t, "condensate_saturation"+at, num(t, s, "condensate_saturation"), r.DropoutPct/100*(1-sw), cvdPctTol/100, src+": dropout x (1 - Sw)")
		checkRel(t, "p_over_z"+at, num(t, s, "p_over_z_psia"), r.PPsia/num(t, s, "z_two_phase"), 1e-12, "p/Z")
	}
	// The last step is the abandonment pressure of o9.toml.
	last := steps[len(steps)-1]
	checkAbs(t, "last pressure", num(t, last, "pressure_psia"), 600, 1e-9, "o9.toml abandonment_pressure")
	checkAbs(t, "wet_gas_recovery_at_abandonment_pct", num(t, doc, "wet_gas_recovery_at_abandonment_pct"), num(t, last, "wet_gas_recovery_pct"), 1e-12, "the last step")
}

// TestRecoverExample checks the recovery of the example field for the
// properties every depletion has: pressure, cumulative production and
// recovery move one way; p/Z falls; recoveries stay within 0 and 100 %;
// recovered volumes are fractions of the volumes in place of inplace; the
// condensate left plus the condensate produced is about the condensate in
// place; the mobile-condensate run recovers more condensate than the
// immobile one.
func TestRecoverExample(t *testing.T) {
	code, out, stderr := dewcell("recover", "--format", "json", exampleStudy)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	doc := decodeJSON(t, out)
	// The example's condensate saturation passes its critical saturation,
	// 0.12: a warning says so and points to --mobile-liquid.
	if !strings.Contains(stderr, "warning: the condensate saturation passes the critical condensate saturation (0.12") || !strings.Contains(stderr, "--mobile-liquid") {
		t.Errorf("standard error %q lacks the critical-saturation warning", stderr)
	}
	steps := rows(t, doc, "steps")
	if len(steps) != defaultRecoverySteps+2 { // the initial pressure, the dew point, then the steps
		t.Errorf("%d steps, want %d", len(steps), defaultRecoverySteps+2)
	}
	ip := runJSON(t, "inplace", exampleStudy)
	for _, k := range []string{"wet_gas_in_place_mmscf", "sales_gas_in_place_mmscf", "condensate_in_place_stb"} {
		checkRel(t, k, num(t, doc, k), num(t, ip, k), 1e-12, "inplace on the same study")
	}
	monotone(t, steps, "pressure_psia", -1)
	monotone(t, steps, "p_over_z_psia", -1)
	for _, k := range []string{"cum_wet_gas_mmscf", "cum_sales_gas_mmscf", "cum_condensate_stb", "wet_gas_recovery_pct", "sales_gas_recovery_pct", "condensate_recovery_pct"} {
		monotone(t, steps, k, +1)
	}
	for _, s := range steps {
		for _, k := range []string{"wet_gas_recovery_pct", "sales_gas_recovery_pct", "condensate_recovery_pct"} {
			if v := num(t, s, k); v < 0 || v > 100 {
				t.Errorf("%s = %g at %g psia, want 0 to 100", k, v, num(t, s, "pressure_psia"))
			}
		}
		checkAbs(t, "wet_gas_recovery_pct", num(t, s, "wet_gas_recovery_pct"), 100*num(t, s, "cum_wet_gas_mmscf")/num(t, doc, "wet_gas_in_place_mmscf"), 1e-9, "definition")
		checkAbs(t, "condensate_recovery_pct", num(t, s, "condensate_recovery_pct"), 100*num(t, s, "cum_condensate_stb")/num(t, doc, "condensate_in_place_stb"), 1e-9, "definition")
		so := num(t, s, "condensate_saturation")
		if mobile := s["condensate_mobile"].(bool); mobile != (so > 0.12) {
			t.Errorf("condensate_mobile %v at saturation %g, critical 0.12", mobile, so)
		}
	}
	// Above the dew point the produced stream is the reservoir fluid: gas,
	// sales gas and condensate are recovered alike.
	s1 := steps[1]
	checkRel(t, "recoveries at the dew point", num(t, s1, "condensate_recovery_pct"), num(t, s1, "wet_gas_recovery_pct"), 1e-9, "single-phase depletion produces the feed")
	// Retrograde loss: condensate is recovered less than gas (trade fact for a
	// depletion below the dew point).
	if num(t, doc, "condensate_recovery_at_abandonment_pct") >= num(t, doc, "sales_gas_recovery_at_abandonment_pct") {
		t.Errorf("condensate recovered %g %%, sales gas %g %%: the retrograde liquid should cost condensate",
			num(t, doc, "condensate_recovery_at_abandonment_pct"), num(t, doc, "sales_gas_recovery_at_abandonment_pct"))
	}
	// The condensate left in the reservoir and that produced come near the
	// condensate in place; not exactly, because the stock-tank yield of a
	// mixture is not the sum of its parts' yields (2.5 %, common practice,
	// no published source: the loss is a few percent of the whole).
	checkAbs(t, "condensate produced + left", num(t, doc, "condensate_recovery_at_abandonment_pct")+num(t, doc, "condensate_left_in_reservoir_pct"), 100, 2.5, "mole balance")
	lo, hi := num(t, doc, "condensate_recovery_at_abandonment_immobile_liquid_pct"), num(t, doc, "condensate_recovery_at_abandonment_mobile_liquid_pct")
	if !(hi > lo) || lo != num(t, doc, "condensate_recovery_at_abandonment_pct") {
		t.Errorf("condensate recovery bounds %g (immobile) and %g (mobile) %%: want the mobile one higher, and the immobile one this run's", lo, hi)
	}

	// --mobile-liquid: the upper bound.
	code, out, stderr = dewcell("recover", "--mobile-liquid", "--format", "json", exampleStudy)
	if code != 0 {
		t.Fatalf("--mobile-liquid: exit %d: %s", code, stderr)
	}
	mob := decodeJSON(t, out)
	checkRel(t, "--mobile-liquid condensate recovery", num(t, mob, "condensate_recovery_at_abandonment_pct"), hi, 1e-12, "the mobile bound of the default run")
	if strings.Contains(stderr, "warning: the condensate saturation") || !strings.Contains(stderr, "flows with the gas") {
		t.Errorf("--mobile-liquid: standard error %q; want a note that the liquid flows, not a warning", stderr)
	}
	// Until liquid first flows the two runs are the same depletion, so the
	// liquid flows from the step where the immobile run first passes the
	// critical saturation. A step flows exactly when its saturation sits on
	// the critical one (the excess went with the gas); once revaporization
	// takes it below, it stops.
	checkRel(t, "--mobile-liquid critical saturation pressure", num(t, mob, "critical_saturation_pressure_psia"), num(t, doc, "critical_saturation_pressure_psia"), 1e-12, "the immobile run")
	for _, s := range rows(t, mob, "steps") {
		onCritical := num(t, s, "condensate_saturation") >= 0.12*(1-1e-9)
		if flows := s["condensate_mobile"] == true; flows != onCritical {
			t.Errorf("--mobile-liquid: at %g psia saturation %g and mobile %v", num(t, s, "pressure_psia"), num(t, s, "condensate_saturation"), flows)
		}
	}
	for _, s := range rows(t, mob, "steps") {
		if so := num(t, s, "condensate_saturation"); so > 0.12+1e-6 {
			t.Errorf("--mobile-liquid: saturation %g at %g psia, above the critical 0.12 that flows", so, num(t, s, "pressure_psia"))
		}
	}
}

// TestRecoverCompressibility: the rock and water compressibilities of the
// study support the pressure, so more gas comes out by the abandonment
// pressure than from a rigid reservoir (Havlena and Odeh 1963: E_fw adds to
// the expansion).
func TestRecoverCompressibility(t *testing.T) {
	rigid := exampleVariant(t, "", "rock_compressibility = \"4.5e-6 1/psi\"\n", "", "water_compressibility = \"3.2e-6 1/psi\"\n", "")
	a := runJSON(t, "recover", exampleStudy)
	b := runJSON(t, "recover", rigid)
	if !(num(t, a, "wet_gas_recovery_at_abandonment_pct") > num(t, b, "wet_gas_recovery_at_abandonment_pct")) {
		t.Errorf("wet gas recovery %g %% with compressible rock, %g %% without: want more with", num(t, a, "wet_gas_recovery_at_abandonment_pct"), num(t, b, "wet_gas_recovery_at_abandonment_pct"))
	}
	// c_e = (c_f + c_w S_w)/(1 - S_w) (Havlena and Odeh 1963), Sw = 0.24.
	checkRel(t, "effective_compressibility", num(t, a, "effective_compressibility_per_psi"), (4.5e-6+3.2e-6*0.24)/0.76, 1e-12, "Havlena and Odeh (1963)")
	checkAbs(t, "rigid effective_compressibility", num(t, b, "effective_compressibility_per_psi"), 0, 0, "no compressibility given")
}

// monotone checks that key moves in direction sign (+1 up, -1 down) from row
// to row, never the other way.
func monotone(t *testing.T, rs []map[string]any, key string, sign float64) {
	t.Helper()
	for i := 1; i < len(rs); i++ {
		if d := sign * (num(t, rs[i], key) - num(t, rs[i-1], key)); d < 0 {
			t.Errorf("%s goes the wrong way between rows %d and %d: %g then %g", key, i, i+1, num(t, rs[i-1], key), num(t, rs[i], key))
		}
	}
}

func TestRecoverFormats(t *testing.T) {
	code, out, stderr := dewcell("recover", "--format", "csv", "--units", "metric", "--steps", "4", exampleStudy)
	if code != 0 {
		t.Fatalf("csv: exit %d: %s", code, stderr)
	}
	recs, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatalf("csv does not parse: %v\n%s", err, out)
	}
	checkHeader(t, "recover csv", recs[0], "pressure_bara", "wet_gas_recovery_pct", "sales_gas_recovery_pct", "condensate_recovery_pct",
		"condensate_saturation", "z_two_phase", "cum_wet_gas_1e6sm3", "cum_condensate_sm3", "cgr_sm3_1e6sm3", "p_over_z_bara",
		"wet_gas_in_place_1e6sm3", "condensate_left_in_reservoir_sm3")
	if len(recs) != 1+6 {
		t.Errorf("csv: %d rows, want the initial pressure, the dew point and 4 steps", len(recs)-1)
	}
	code, out, _ = dewcell("recover", "--pressures", "4000 psia, 3000 psia", exampleStudy)
	if code != 0 || !strings.Contains(out, "condensate saturation") || !strings.Contains(out, "| 800 ") {
		t.Errorf("table with --pressures: exit %d; want the steps down to the abandonment pressure, 800 psia:\n%s", code, out)
	}
}

func TestRecoverBadInput(t *testing.T) {
	noAbandon := exampleVariant(t, "", "abandonment_pressure = \"800 psia\"\n", "")
	cases := []badInputCase{
		{[]string{"--pressures", "3000 psia, 3500 psia", exampleStudy}, []string{"--pressures: item 2", "not below the pressure before it"}},
		{[]string{"--pressures", "5000 psia", exampleStudy}, []string{"--pressures: item 1", "reservoir.initial_pressure", exampleStudy}},
		{[]string{"--pressures", "3000 psia, 500 psia", exampleStudy}, []string{"--pressures: item 2", "reservoir.abandonment_pressure"}},
		{[]string{"--pressures", "3000", exampleStudy}, []string{"--pressures: item 1", "missing unit"}},
		{[]string{"--steps", "0", exampleStudy}, []string{"--steps", "from 1 to"}},
		{[]string{"--steps", "3", "--pressures", "3000 psia", exampleStudy}, []string{"--pressures and --steps"}},
		{[]string{noAbandon}, []string{noAbandon, "reservoir.abandonment_pressure", "missing"}},
	}
	checkBadInput(t, "recover", cases)
}

// decodeJSON decodes a JSON report, failing on a key given twice at its top
// level (which json.Unmarshal would silently resolve to the last).
func decodeJSON(t *testing.T, out string) map[string]any {
	t.Helper()
	dec := json.NewDecoder(strings.NewReader(out))
	if tok, err := dec.Token(); err != nil || tok != json.Delim('{') {
		t.Fatalf("output is not a JSON object: %v\n%s", err, out)
	}
	seen := map[string]bool{}
	for dec.More() {
		tok, err := dec.Token()
		if err != nil {
			t.Fatalf("output is not JSON: %v\n%s", err, out)
		}
		k := tok.(string)
		if seen[k] {
			t.Errorf("JSON key %q given twice", k)
		}
		seen[k] = true
		var skip json.RawMessage
		if err := dec.Decode(&skip); err != nil {
			t.Fatalf("output is not JSON: %v\n%s", err, out)
		}
	}
	var doc map[string]any
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatalf("output is not JSON: %v\n%s", err, out)
	}
	return doc
}
