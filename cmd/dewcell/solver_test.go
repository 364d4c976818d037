package main

// Tests of the commands that need the eos solvers, against the reference
// values of pr-open.md (../../testdata/pr-open.md): computed, not measured,
// by an independent general-purpose Peng–Robinson library (CalebBell/thermo,
// PR78, no volume shift) and re-checked by a separate re-implementation.

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// runJSON runs dewcell with --format json and decodes the result.
func runJSON(t *testing.T, args ...string) map[string]any {
	t.Helper()
	code, out, stderr := dewcell(append([]string{args[0], "--format", "json"}, args[1:]...)...)
	if code != 0 {
		t.Fatalf("dewcell %q: exit %d: %s", args, code, stderr)
	}
	var doc map[string]any
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatalf("dewcell %q: output is not JSON: %v\n%s", args, err, out)
	}
	return doc
}

// num returns doc[key] as a number, failing the test if it is absent.
func num(t *testing.T, doc map[string]any, key string) float64 {
	t.Helper()
	v, ok := doc[key].(float64)
	if !ok {
		t.Fatalf("key %q is %v, want a number; keys: %v", key, doc[key], keys(doc))
	}
	return v
}

func keys(doc map[string]any) []string {
	var k []string
	for key := range doc {
		k = append(k, key)
	}
	return k
}

// checkRel reports got against a reference value within a relative tolerance.
func checkRel(t *testing.T, what string, got, want, tol float64, src string) {
	t.Helper()
	if d := math.Abs(got-want) / math.Abs(want); !(d <= tol) {
		t.Errorf("%s = %.10g, want %.10g, rel. diff %.2g > %g (%s)", what, got, want, d, tol, src)
	}
}

func checkAbs(t *testing.T, what string, got, want, tol float64, src string) {
	t.Helper()
	if d := math.Abs(got - want); !(d <= tol) {
		t.Errorf("%s = %.10g, want %.10g, diff %.2g > %g (%s)", what, got, want, d, tol, src)
	}
}

// pr-open.md part C: incipient liquid at the upper dew point of O9, 220 degF.
var o9Incipient = map[string]float64{
	"N2": 0.005152550681, "CO2": 0.0314573095, "C1": 0.574829999, "C2": 0.07737617513, "C3": 0.04905537384,
	"nC4": 0.03925278287, "nC5": 0.02545835352, "P1": 0.1103214998, "P2": 0.0870959557,
}

func TestSatpointO9(t *testing.T) {
	doc := runJSON(t, "satpoint", o9Study)
	if doc["type"] != "dew" {
		t.Errorf("type %v, want dew (pr-open.md part C: a dew point)", doc["type"])
	}
	// P_dew = 3797.796273 psia (pr-open.md part C, "Upper dew point"); the
	// tolerance of 1e-6 is looser than the 10 printed digits, for the solver
	// tolerance and the path through units.
	checkRel(t, "upper_dew_pressure_psia", num(t, doc, "upper_dew_pressure_psia"), 3797.796273, 1e-6, "pr-open.md part C")
	checkAbs(t, "temperature_degF", num(t, doc, "temperature_degF"), 220, 1e-9, "o9.toml")
	// Z of the feed 0.84266174, of the incipient liquid 0.844020931 (8 and 9 digits).
	checkRel(t, "z_feed", num(t, doc, "z_feed"), 0.84266174, 1e-7, "pr-open.md part C")
	checkRel(t, "z_incipient", num(t, doc, "z_incipient"), 0.844020931, 1e-7, "pr-open.md part C")
	inc, ok := doc["incipient_composition"].(map[string]any)
	if !ok {
		t.Fatalf("incipient_composition is %v", doc["incipient_composition"])
	}
	for name, want := range o9Incipient {
		got, _ := inc[name].(float64)
		// thermo and the re-implementation agree to 3.7e-9 in x (pr-open.md).
		checkAbs(t, "incipient x_"+name, got, want, 1e-7, "pr-open.md part C, incipient liquid x at P_dew")
	}
	// Metric: the same point, 26184883.55 Pa = 261.8488355 bara.
	doc = runJSON(t, "satpoint", "--units", "metric", o9Study)
	checkRel(t, "upper_dew_pressure_bara", num(t, doc, "upper_dew_pressure_bara"), 261.8488355, 1e-6, "pr-open.md part C")
	checkAbs(t, "temperature_degC", num(t, doc, "temperature_degC"), 377.5944444-273.15, 1e-6, "pr-open.md part C: 377.5944444 K")
}

// c1nc4 is methane + n-butane of pr-open.md part B: constants of its
// component table, kij = 0.02, at 160 degF.
func c1nc4(t *testing.T, zC1 float64) string {
	t.Helper()
	study := fmt.Sprintf(`# methane + n-butane, pr-open.md part B
[reservoir]
temperature = "160 degF"
[fluid]
equation = "PR78"
[fluid.composition]
C1 = %g
nC4 = %g
[fluid.properties.C1]
molar_mass = 16.043
critical_temperature = "190.56 K"
critical_pressure = "4.599 MPa"
acentric_factor = 0.0115
[fluid.properties.nC4]
molar_mass = 58.123
critical_temperature = "425.12 K"
critical_pressure = "3.796 MPa"
acentric_factor = 0.2002
[fluid.interaction]
"C1/nC4" = 0.02
`, 100*zC1, 100*(1-zC1))
	path := filepath.Join(t.TempDir(), fmt.Sprintf("c1nc4-%g.toml", zC1))
	if err := os.WriteFile(path, []byte(study), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// Half a degree above the critical point (testdata/near-critical.toml) the
// dew point is found although Newton's method fails there, and it is the edge
// of the two-phase region: flashes 1e-4 above and below it give one and two
// phases (a dew point's definition).
func TestSatpointNearCritical(t *testing.T) {
	study := filepath.Join("testdata", "near-critical.toml")
	doc := runJSON(t, "satpoint", study)
	if doc["type"] != "dew" {
		t.Fatalf("type %v, want dew", doc["type"])
	}
	dew := num(t, doc, "upper_dew_pressure_psia")
	for _, c := range []struct {
		f      float64
		phases float64
	}{{1 + 1e-4, 1}, {1 - 1e-4, 2}} {
		fl := runJSON(t, "flash", "--pressure", fmt.Sprintf("%.10g psia", dew*c.f), study)
		if got := num(t, fl, "phases"); got != c.phases {
			t.Errorf("flash at %.10g psia (dew point x %g): %g phases, want %g", dew*c.f, c.f, got, c.phases)
		}
	}
}

func TestSatpointBinary(t *testing.T) {
	// pr-open.md part B, "Saturation pressures" (psia, 10 digits).
	cases := []struct {
		zC1          float64
		typ          string
		upper, lower float64 // psia
	}{
		{0.1, "bubble", 425.5710352, 136.7881665},
		{0.5, "bubble", 1610.445655, 283.3454299},
		{0.7, "dew", 1709.627913, 607.4985244},
	}
	for _, c := range cases {
		doc := runJSON(t, "satpoint", c1nc4(t, c.zC1))
		if doc["type"] != c.typ {
			t.Errorf("z_C1 = %g: type %v, want %s (pr-open.md part B)", c.zC1, doc["type"], c.typ)
			continue
		}
		upperKey := "bubble_pressure_psia"
		if c.typ == "dew" {
			upperKey = "upper_dew_pressure_psia"
		}
		src := fmt.Sprintf("pr-open.md part B, z_C1 = %g", c.zC1)
		checkRel(t, upperKey, num(t, doc, upperKey), c.upper, 1e-6, src)
		checkRel(t, "lower_dew_pressure_psia", num(t, doc, "lower_dew_pressure_psia"), c.lower, 1e-6, src)
	}
	// z_C1 = 0.8 never splits at 160 degF (pr-open.md part B): no saturation
	// point, a failed computation.
	code, _, stderr := dewcell("satpoint", c1nc4(t, 0.8))
	if code != 1 || !strings.Contains(stderr, "no saturation point") {
		t.Errorf("z_C1 = 0.8: exit %d, %q; want 1 and no saturation point (pr-open.md part B)", code, stderr)
	}
}

func TestFlashO9(t *testing.T) {
	// pr-open.md part C, "PT flashes at fractions of P_dew", P/P_dew = 0.8:
	// 3038.237019 psia at 220 degF, the reservoir temperature of o9.toml.
	doc := runJSON(t, "flash", "--units", "metric", "--pressure", "3038.237019 psia", o9Study)
	const src = "pr-open.md part C, flash at 0.8 P_dew"
	if num(t, doc, "phases") != 2 || doc["state"] != "two-phase" {
		t.Errorf("phases %v, state %v; want 2, two-phase", doc["phases"], doc["state"])
	}
	checkAbs(t, "vapor_fraction", num(t, doc, "vapor_fraction"), 0.9179730546, 1e-8, src)    // 10 digits
	checkRel(t, "z_liquid", num(t, doc, "z_liquid"), 0.7482537887, 1e-8, src)                // 10 digits
	checkRel(t, "z_vapor", num(t, doc, "z_vapor"), 0.821638645, 1e-8, src)                   // 9 digits
	checkRel(t, "density_liquid", num(t, doc, "density_liquid_kg_m3"), 524.67984, 2e-7, src) // 8 digits
	checkRel(t, "density_vapor", num(t, doc, "density_vapor_kg_m3"), 204.62446, 2e-7, src)   // 8 digits
	checkAbs(t, "pressure_bara", num(t, doc, "pressure_bara"), 209.4790684, 1e-6, src)       // 20947906.84 Pa
	x, _ := doc["liquid_composition"].(map[string]any)
	y, _ := doc["vapor_composition"].(map[string]any)
	// Phase compositions at 0.8 P_dew, 8 significant digits.
	for name, want := range map[string][2]float64{
		"C1": {0.47933938, 0.76329175}, "P1": {0.15962692, 0.034757329}, "P2": {0.11944133, 0.0056674789},
	} {
		gx, _ := x[name].(float64)
		gy, _ := y[name].(float64)
		checkRel(t, "x_"+name, gx, want[0], 1e-7, src)
		checkRel(t, "y_"+name, gy, want[1], 1e-7, src)
	}
}

func TestFlashBinary(t *testing.T) {
	// pr-open.md part B: z = (0.5, 0.5) at 1000 psia and 160 degF.
	doc := runJSON(t, "flash", "--pressure", "1000 psia", c1nc4(t, 0.5))
	const src = "pr-open.md part B, flash at 1000 psia"
	checkAbs(t, "vapor_fraction", num(t, doc, "vapor_fraction"), 0.4620647562, 1e-8, src)
	checkRel(t, "z_liquid", num(t, doc, "z_liquid"), 0.252631982, 1e-8, src)
	checkRel(t, "z_vapor", num(t, doc, "z_vapor"), 0.7602016604, 1e-8, src)
	// 440.34362 kg/m3 = 27.4899 lb/ft3 (1 lb/ft3 = 16.01846 kg/m3, NIST SP 811).
	checkRel(t, "density_liquid_lb_ft3", num(t, doc, "density_liquid_lb_ft3")*16.018463373960139, 440.34362, 2e-7, src)
	// Above the bubble point of z_C1 = 0.5 (1610.4 psia, pr-open.md) the feed
	// is one liquid phase.
	doc = runJSON(t, "flash", "--pressure", "2000 psia", c1nc4(t, 0.5))
	if num(t, doc, "phases") != 1 || doc["state"] != "liquid" || num(t, doc, "vapor_fraction") != 0 {
		t.Errorf("z_C1 = 0.5 at 2000 psia: phases %v, state %v, vapor fraction %v; want 1, liquid, 0", doc["phases"], doc["state"], doc["vapor_fraction"])
	}
	if _, ok := doc["z_vapor"]; ok {
		t.Error("a single liquid phase reports z_vapor")
	}
}

func TestEnvelopeO9(t *testing.T) {
	doc := runJSON(t, "envelope", o9Study)
	summary, _ := doc["summary"].([]any)
	got := map[string][2]float64{}
	for _, r := range summary {
		row := r.(map[string]any)
		tt, _ := row["temperature_degF"].(float64)
		p, _ := row["pressure_psia"].(float64)
		got[row["type"].(string)] = [2]float64{tt, p}
	}
	bar, okBar := got["cricondenbar"]
	therm, okTherm := got["cricondentherm"]
	if !okBar || !okTherm {
		t.Fatalf("summary %v lacks the cricondenbar or cricondentherm", summary)
	}
	// The envelope encloses the dew point of pr-open.md part C (3797.796273
	// psia at 220 degF): no point of it lies above the cricondenbar or right
	// of the cricondentherm.
	if bar[1] < 3797.796273*(1-1e-6) || therm[0] < 220 {
		t.Errorf("cricondenbar %v psia, cricondentherm %v degF: the envelope must reach 3797.796 psia and 220 degF (pr-open.md part C)", bar, therm)
	}
	points, _ := doc["points"].([]any)
	if len(points) < 10 {
		t.Fatalf("%d envelope points", len(points))
	}
	for _, r := range points {
		row := r.(map[string]any)
		tt, _ := row["temperature_degF"].(float64)
		p, _ := row["pressure_psia"].(float64)
		if p > bar[1]*(1+1e-9) || tt > therm[0]+1e-9 {
			t.Errorf("point (%g degF, %g psia) beyond the cricondenbar %v or cricondentherm %v", tt, p, bar, therm)
		}
	}
}

// An envelope whose trace stops close to a critical point it cannot cross
// (testdata/flat-top.toml, an invented rich condensate) is still a result:
// exit 0, the converged dew branch, no critical row, and a warning that says
// where the trace stopped and what is missing.
func TestEnvelopeStopsNearCritical(t *testing.T) {
	study := filepath.Join("testdata", "flat-top.toml")
	code, out, stderr := dewcell("envelope", "--format", "json", study)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if !strings.Contains(stderr, "within a few per cent of a critical point it could not cross") {
		t.Errorf("stderr lacks the near-critical warning:\n%s", stderr)
	}
	var doc map[string]any
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	summary, _ := doc["summary"].([]any)
	for _, r := range summary {
		if r.(map[string]any)["type"] == "critical" {
			t.Errorf("a critical point is reported: %v", r)
		}
	}
	points, _ := doc["points"].([]any)
	for _, r := range points {
		if typ := r.(map[string]any)["type"]; typ != "dew" {
			t.Errorf("a %v point on a trace that never crossed the critical point", typ)
		}
	}
	// the saturation point at the reservoir temperature lies under the
	// traced cricondenbar
	sat := runJSON(t, "satpoint", study)
	var bar float64
	for _, r := range summary {
		if row := r.(map[string]any); row["type"] == "cricondenbar" {
			bar, _ = row["pressure_psia"].(float64)
		}
	}
	if dew := num(t, sat, "upper_dew_pressure_psia"); !(dew < bar) {
		t.Errorf("dew point %g psia not below the traced cricondenbar %g psia", dew, bar)
	}
}

// The example's bubble branch meets a second critical point at low
// temperature, beyond which the curve bounds two dense phases (the trace
// stops there): the warning says so in one line and names the last point,
// which is the last row of the points table; JSON names the end.
func TestEnvelopeTruncatedWarningNamesTheEnd(t *testing.T) {
	code, out, stderr := dewcell("envelope", "--format", "json", exampleStudy)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var doc map[string]any
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	points, _ := doc["points"].([]any)
	if len(points) == 0 {
		t.Fatal("no points")
	}
	last := points[len(points)-1].(map[string]any)
	// The point as the tables write it: 0.1 degF, 1 psia.
	want := fmt.Sprintf("the bubble branch ends at %.1f degF and %.0f psia, where it meets a second critical point", last["temperature_degF"], last["pressure_psia"])
	if !strings.Contains(stderr, want) || strings.Count(stderr, "the bubble branch ends") != 1 {
		t.Errorf("stderr lacks %q in one line:\n%s", want, stderr)
	}
	if doc["trace_end"] != "second-critical" {
		t.Errorf("trace_end %v, want second-critical", doc["trace_end"])
	}
}

func TestDemo(t *testing.T) {
	code, out, stderr := dewcell("demo", "--dir", filepath.Join(t.TempDir(), "demo"))
	if code != 0 {
		t.Fatalf("demo: exit %d: %s", code, stderr)
	}
	for _, want := range []string{"Components", "Upper dew pressure", "cricondentherm"} {
		if !strings.Contains(out, want) {
			t.Errorf("demo output lacks %q", want)
		}
	}
	if !strings.Contains(stderr, "caution: screening estimates") || strings.Contains(out, "caution") {
		t.Errorf("the caution must go to standard error only")
	}
	if strings.Contains(stderr, "below the computed") {
		t.Errorf("the example's initial pressure lies below its computed dew point: %s", stderr)
	}
	doc := runJSON(t, "demo", "--units", "metric", "--dir", filepath.Join(t.TempDir(), "demo-metric"))
	for _, k := range []string{"fluid", "saturation", "envelope"} {
		if _, ok := doc[k].(map[string]any); !ok {
			t.Errorf("demo JSON lacks %q", k)
		}
	}
}
