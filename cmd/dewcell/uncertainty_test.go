package main

import (
	"encoding/csv"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/uncertain"
)

// uncertaintyStudy is a cheap copy of the example (yearly steps, a short
// horizon, depletion and cycling in two cells) with an [uncertainty]
// section.
const uncertaintyStudy = "testdata/uncertainty.toml"

// withUncertainty writes the test study into a temporary folder with its
// [uncertainty] section replaced by section ("" for none), after the
// replacements old → new of edits (each old must occur once), and returns
// its path.
func withUncertainty(t *testing.T, section string, edits ...string) string {
	t.Helper()
	s := string(mustRead(t, uncertaintyStudy))
	i := strings.Index(s, "\n[uncertainty]")
	if i < 0 {
		t.Fatalf("%s has no [uncertainty]", uncertaintyStudy)
	}
	return writeStudy(t, editStudy(t, uncertaintyStudy, s[:i+1]+section, edits...))
}

// readCases reads a --cases-out file: its header and rows.
func readCases(t *testing.T, path string) ([]string, [][]string) {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) < 2 {
		t.Fatalf("%s: %d rows", path, len(rows))
	}
	return rows[0], rows[1:]
}

// TestUncertaintyWorkersAgree: the same seed on 1 and on 4 workers gives
// the same result to the byte, JSON and every case (each case is computed
// from its own row of the design, and the results are gathered by case).
func TestUncertaintyWorkersAgree(t *testing.T) {
	path := withUncertainty(t, `[uncertainty]
cases = 3
seed = 11
[uncertainty.vary]
"scenario.cycling.sweep_efficiency" = { distribution = "uniform", min = 0.55, max = 0.85 }
"reservoir.porosity" = { distribution = "normal", mean = 0.16, sd = 0.01 }
`)
	cases := filepath.Join(filepath.Dir(path), "cases.csv")
	var outs, csvs [2]string
	for k, w := range []string{"1", "4"} {
		code, out, errs := dewcell("uncertainty", path, "--format", "json", "--workers", w, "--cases-out", cases, "--force")
		if code != 0 {
			t.Fatalf("--workers %s: exit %d: %s", w, code, errs)
		}
		data, err := os.ReadFile(cases)
		if err != nil {
			t.Fatal(err)
		}
		outs[k], csvs[k] = out, string(data)
	}
	if outs[0] != outs[1] {
		t.Errorf("the JSON differs between 1 and 4 workers:\n%s\n---\n%s", outs[0], outs[1])
	}
	if csvs[0] != csvs[1] {
		t.Errorf("the cases differ between 1 and 4 workers:\n%s\n---\n%s", csvs[0], csvs[1])
	}
	doc := decodeJSON(t, outs[0])
	for _, k := range []string{"condensate_in_place_stb_p90", "condensate_in_place_stb_p50", "condensate_in_place_stb_p10",
		"condensate_in_place_stb_mean", "condensate_in_place_stb_sd", "wet_gas_in_place_mmscf_p90", "sales_gas_in_place_mmscf_p10"} {
		if _, ok := doc[k].(float64); !ok {
			t.Errorf("JSON has no number %s", k)
		}
	}
	p90, p50, p10 := doc["condensate_in_place_stb_p90"].(float64), doc["condensate_in_place_stb_p50"].(float64), doc["condensate_in_place_stb_p10"].(float64)
	if !(p90 < p50 && p50 < p10) {
		t.Errorf("condensate in place P90, P50, P10 = %v, %v, %v: the P90 (exceeded with 90 %% probability) must be the lowest", p90, p50, p10)
	}
	rows, _ := doc["scenarios"].([]any)
	if len(rows) != 2 {
		t.Fatalf("%d scenario rows, want 2", len(rows))
	}
	for _, r := range rows {
		row := r.(map[string]any)
		p, has := row["probability_beats_depletion"]
		switch {
		case row["kind"] == "depletion" && p != nil:
			t.Errorf("depletion has a probability of beating itself: %v", p)
		case row["kind"] != "depletion" && !has:
			t.Errorf("%v has no probability_beats_depletion", row["name"])
		case row["kind"] != "depletion":
			if f, _ := p.(float64); !(f >= 0 && f <= 1) {
				t.Errorf("%v: probability_beats_depletion %v, want 0 to 1", row["name"], p)
			}
		}
		for _, k := range []string{"npv_p90", "ultimate_condensate_stb_p50", "condensate_recovery_pct_p10", "sales_gas_recovery_pct_mean", "ultimate_sales_gas_mmscf_sd"} {
			if _, ok := row[k].(float64); !ok {
				t.Errorf("%v: no number %s", row["name"], k)
			}
		}
	}
}

// TestUncertaintyFixedInputs: with every input of zero width, every case
// is the deterministic run of maintain and inplace on the study, to the
// last bit.
func TestUncertaintyFixedInputs(t *testing.T) {
	path := withUncertainty(t, `[uncertainty]
cases = 2
[uncertainty.vary]
"reservoir.area" = { distribution = "triangular", min = "3150 acre", mode = "3150 acre", max = "3150 acre" }
"reservoir.porosity" = { distribution = "normal", mean = 0.16, sd = 0 }
"scenario.cycling.sweep_efficiency" = { distribution = "uniform", min = 0.7, max = 0.7 }
"economics.gas_price" = { distribution = "lognormal", median = "3.4 USD/MMBtu", p90_ratio = 1 }
"scenario.cycling.cells" = { distribution = "discrete", values = [2], probabilities = [1] }
`)
	st, err := study.Read(path)
	if err != nil {
		t.Fatal(err)
	}
	o := &options{sys: units.Field, stdout: io.Discard, stderr: io.Discard}
	ur, err := uncertaintyRun(o, st, false, 2, 0)
	if err != nil {
		t.Fatal(err)
	}
	// The deterministic run: the study as the file gives it.
	det := *st
	det.Uncertainty = nil
	mr, err := maintainRun(o, &det, false, 0)
	if err != nil {
		t.Fatal(err)
	}
	mt := maintainReport(&det, units.Field, mr).Table("scenarios")
	ip, err := inplaceReport(o, &det)
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]float64{}
	for _, k := range []string{"wet_gas_in_place_mmscf", "sales_gas_in_place_mmscf", "condensate_in_place_stb"} {
		want[k] = ip.Field(k).(float64)
	}
	col := map[string]int{}
	for j, c := range mt.Columns {
		col[c.Key()] = j
	}
	for i, row := range mt.Rows {
		name := row[0].(string)
		for _, k := range []string{"npv", "ultimate_sales_gas_mmscf", "ultimate_condensate_stb", "condensate_recovery_pct", "sales_gas_recovery_pct", "incremental_npv"} {
			if v, ok := row[col[k]].(float64); ok {
				want[name+"/"+k] = v
			}
		}
		_ = i
	}
	for c, v := range ur.values {
		if v == nil {
			t.Fatalf("case %d failed: %s", c+1, ur.errs[c])
		}
		for j, oc := range ur.outputs {
			k := oc.column("", "").Key()
			if oc.scenario >= 0 {
				k = ur.scenarios[oc.scenario].Name + "/" + k
			}
			w, ok := want[k]
			if !ok {
				t.Errorf("no deterministic value for %s", k)
				continue
			}
			if v[j] != w {
				t.Errorf("case %d, %s = %.17g; the deterministic run gives %.17g", c+1, k, v[j], w)
			}
		}
	}
	if ur.medianOut == nil {
		t.Fatalf("the run at the inputs' P50 failed: %s", ur.medianErr)
	}
	for j := range ur.outputs {
		if ur.medianOut[j] != ur.values[0][j] && !(math.IsNaN(ur.medianOut[j]) && math.IsNaN(ur.values[0][j])) {
			t.Errorf("the run at the P50 differs from the cases in %s", ur.outputs[j].name)
		}
	}
}

// TestUncertaintyFailures: a case the study reader or the model refuses
// is counted and listed with its inputs and why, and the others run.
func TestUncertaintyFailures(t *testing.T) {
	// A porosity range of which a part lies at or above 1, which the
	// reader refuses; depletion alone keeps the cases cheap.
	path := withUncertainty(t, `[uncertainty]
cases = 6
seed = 3
[uncertainty.vary]
"reservoir.porosity" = { distribution = "uniform", min = 0.15, max = 1.6 }
`)
	data, _ := os.ReadFile(path)
	s := string(data)
	s = s[:strings.Index(s, "[[scenario]]\nname = \"cycling\"")] + s[strings.Index(s, "[uncertainty]"):]
	if err := os.WriteFile(path, []byte(s), 0o644); err != nil {
		t.Fatal(err)
	}
	cases := filepath.Join(filepath.Dir(path), "cases.csv")
	code, out, errs := dewcell("uncertainty", path, "--format", "json", "--cases-out", cases)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	head, rows := readCases(t, cases)
	if head[1] != "reservoir.porosity" || head[len(head)-1] != "error" {
		t.Fatalf("header %q", head)
	}
	var failed []int
	for i, r := range rows {
		phi, err := strconv.ParseFloat(r[1], 64)
		if err != nil {
			t.Fatal(err)
		}
		bad := phi >= 1 // the reader's range of a porosity, (0, 1)
		e := r[len(r)-1]
		switch {
		case bad && !strings.Contains(e, "reservoir.porosity"):
			t.Errorf("case %d, porosity %v: error %q, want one naming reservoir.porosity", i+1, phi, e)
		case !bad && e != "":
			t.Errorf("case %d, porosity %v failed: %s", i+1, phi, e)
		case !bad && r[2] == "":
			t.Errorf("case %d, porosity %v has no wet gas in place", i+1, phi)
		}
		if bad {
			failed = append(failed, i+1)
		}
	}
	if len(failed) == 0 || len(failed) == len(rows) {
		t.Fatalf("%d of %d cases failed; the test needs some of each", len(failed), len(rows))
	}
	doc := decodeJSON(t, out)
	if n := doc["cases_failed"].(float64); int(n) != len(failed) {
		t.Errorf("cases_failed %v, want %d", n, len(failed))
	}
	list, _ := doc["failed_cases"].([]any)
	if len(list) != len(failed) {
		t.Fatalf("failed_cases lists %d, want %d", len(list), len(failed))
	}
	for k, item := range list {
		row := item.(map[string]any)
		if int(row["case"].(float64)) != failed[k] || row["reservoir_porosity"] == nil || row["error"] == "" {
			t.Errorf("failed_cases[%d] = %v; want case %d with its porosity and error", k, row, failed[k])
		}
	}
	if !strings.Contains(errs, "cases failed") {
		t.Errorf("no warning of the failed cases on standard error:\n%s", errs)
	}
}

// TestUncertaintyLognormalInPlace: the gas in place is proportional to
// area × net thickness (the hydrocarbon pore volume over the molar volume
// at the initial state, every other input fixed). With both lognormal and
// independent the in place is lognormal, ln G = ln G0 + ln(A/A50) +
// ln(h/h50), of σ² = σA² + σh² (Johnson, Kotz and Balakrishnan (1994),
// Chapter 14: products of independent lognormals): its P90 is
// G0 exp(−z σ), P10 G0 exp(z σ), its mean G0 exp(σ²/2), G0 the in place at
// the medians, z = Φ⁻¹(0.9).
func TestUncertaintyLognormalInPlace(t *testing.T) {
	const n = 400
	ratioA, ratioH := 0.8, 0.85
	path := withUncertainty(t, `[uncertainty]
cases = 400
seed = 5
[uncertainty.vary]
"reservoir.area" = { distribution = "lognormal", median = "3150 acre", p90_ratio = 0.8 }
"reservoir.net_thickness" = { distribution = "lognormal", median = "62 ft", p90_ratio = 0.85 }
`)
	data, _ := os.ReadFile(path)
	s := string(data)
	s = s[:strings.Index(s, "[[scenario]]")] + s[strings.Index(s, "[uncertainty]"):] // the volumes in place alone
	if err := os.WriteFile(path, []byte(s), 0o644); err != nil {
		t.Fatal(err)
	}
	doc := runJSON(t, "uncertainty", path)
	// G0 from the inplace command on the same study (its [uncertainty] is
	// not read by inplace).
	ip := runJSON(t, "inplace", path)
	sigma := math.Hypot(math.Log(ratioA), math.Log(ratioH)) / uncertain.Z90
	// The standard deviation of ln of a sample p-quantile of n values is
	// about σ sqrt(p(1−p)/n)/φ(z_p) (the asymptotic normality of sample
	// quantiles; David and Nagaraja (2003), Order Statistics, 3rd ed.,
	// Section 10.2, from memory); Latin hypercube sampling does no worse for
	// a monotone output (McKay, Beckman and Conover 1979). Three of them.
	phi := func(z float64) float64 { return math.Exp(-z*z/2) / math.Sqrt(2*math.Pi) }
	tolLn := func(p, z float64) float64 { return 3 * sigma * math.Sqrt(p*(1-p)/n) / phi(z) }
	for _, q := range []string{"wet_gas_in_place_mmscf", "condensate_in_place_stb"} {
		g0 := ip[q].(float64)
		for _, c := range []struct {
			stat string
			p, z float64
		}{{"p90", 0.1, -uncertain.Z90}, {"p50", 0.5, 0}, {"p10", 0.9, uncertain.Z90}} {
			got := doc[q+"_"+c.stat].(float64)
			want := g0 * math.Exp(c.z*sigma)
			if d := math.Abs(math.Log(got / want)); d > tolLn(c.p, c.z) {
				t.Errorf("%s_%s = %.6g, the lognormal product gives %.6g (ln ratio %.4f, allowed %.4f)", q, c.stat, got, want, d, tolLn(c.p, c.z))
			}
		}
		mean := g0 * math.Exp(sigma*sigma/2)
		sd := mean * math.Sqrt(math.Expm1(sigma*sigma))
		if got := doc[q+"_mean"].(float64); math.Abs(got-mean) > 3*sd/math.Sqrt(n) {
			t.Errorf("%s_mean = %.6g, the lognormal product gives %.6g (allowed %.3g)", q, got, mean, 3*sd/math.Sqrt(n))
		}
		if got := doc[q+"_sd"].(float64); math.Abs(got/sd-1) > 0.15 {
			// the relative standard error of a sample SD of a lognormal of
			// this σ is about 5 % at 400 values (from memory); three of them
			t.Errorf("%s_sd = %.6g, the lognormal product gives %.6g", q, got, sd)
		}
	}
}

func TestUncertaintyBadInput(t *testing.T) {
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"uncertainty", "../../examples/sablewick.toml"}, "has no [uncertainty]"},
		{[]string{"uncertainty", uncertaintyStudy, "--workers", "0"}, "--workers 0"},
		{[]string{"uncertainty", uncertaintyStudy, "--cases-out", uncertaintyStudy}, "is the study file"},
		{[]string{"uncertainty", uncertaintyStudy, "--cases-out", "testdata/user3.toml"}, "exists; give another name, or --force"},
	} {
		code, _, errs := dewcell(c.args...)
		if code != exitUsage || !strings.Contains(errs, c.want) {
			t.Errorf("%q: exit %d, %q; want exit 2 and %q", c.args, code, errs, c.want)
		}
	}
}

// TestUncertaintyInReport: the study report carries the distribution when
// the study has [uncertainty] (here the volumes in place alone, which is
// cheap).
func TestUncertaintyInReport(t *testing.T) {
	path := withUncertainty(t, `[uncertainty]
cases = 20
[uncertainty.vary]
"reservoir.area" = { distribution = "uniform", min = "2800 acre", max = "3400 acre" }
`)
	data, _ := os.ReadFile(path)
	s := string(data)
	s = s[:strings.Index(s, "[[scenario]]")] + s[strings.Index(s, "[uncertainty]"):]
	if err := os.WriteFile(path, []byte(s), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(filepath.Dir(path), "report.html")
	if code, _, errs := dewcell("report", path, "--output", out); code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	html, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"The decision as a distribution", "Condensate in place, P90", "exceeded with 90 % probability"} {
		if !strings.Contains(string(html), want) {
			t.Errorf("the report has no %q", want)
		}
	}
}

// TestUncertaintyCorrelated: the cases carry the rank correlation asked
// between two inputs (Iman and Conover's reordering), and leave the others
// uncorrelated; the volumes in place alone keep it cheap. With 300 cases
// the standard error of a sample rank correlation is about
// (1 − ρ²)/sqrt(n) ≤ 0.06 (from memory); the reordering fits the design's
// correlation much closer than that, so 0.05 is ample.
func TestUncertaintyCorrelated(t *testing.T) {
	path := withUncertainty(t, `[uncertainty]
cases = 300
seed = 9
[uncertainty.vary]
"reservoir.porosity" = { distribution = "normal", mean = 0.16, sd = 0.015, min = 0.10, max = 0.22 }
"reservoir.water_saturation" = { distribution = "uniform", min = 0.20, max = 0.28 }
"reservoir.net_thickness" = { distribution = "triangular", min = "50 ft", mode = "62 ft", max = "70 ft" }
[[uncertainty.correlate]]
between = ["reservoir.water_saturation", "reservoir.porosity"]
rank_correlation = -0.6
`)
	data, _ := os.ReadFile(path)
	s := string(data)
	s = s[:strings.Index(s, "[[scenario]]")] + s[strings.Index(s, "[uncertainty]"):]
	if err := os.WriteFile(path, []byte(s), 0o644); err != nil {
		t.Fatal(err)
	}
	cases := filepath.Join(filepath.Dir(path), "cases.csv")
	if code, _, errs := dewcell("uncertainty", path, "--cases-out", cases, "--format", "json"); code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	head, rows := readCases(t, cases)
	if head[1] != "reservoir.porosity" || head[2] != "reservoir.water_saturation" || head[3] != "reservoir.net_thickness [ft]" {
		t.Fatalf("header %q", head)
	}
	cols := make([][]float64, 3)
	for _, r := range rows {
		for j := range cols {
			x, err := strconv.ParseFloat(r[j+1], 64)
			if err != nil {
				t.Fatal(err)
			}
			cols[j] = append(cols[j], x)
		}
	}
	for _, c := range []struct {
		i, j int
		want float64
	}{{0, 1, -0.6}, {0, 2, 0}, {1, 2, 0}} {
		rho, err := uncertain.Spearman(cols[c.i], cols[c.j])
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(rho-c.want) > 0.05 {
			t.Errorf("rank correlation of %s and %s = %.3f, want %.2f", head[c.i+1], head[c.j+1], rho, c.want)
		}
	}
}
