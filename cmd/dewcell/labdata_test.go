package main

import (
	"bytes"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cvd"
	"dewcell/examples"
)

// The laboratory report of the bundled example (examples/lab) is invented:
// the "laboratory" is the equation of state itself, run on a fluid that
// differs from the example's starting characterization, and its numbers are
// rounded to the precision a PVT report prints. This file holds the
// procedure; TestExampleLabReport checks the stored tables are what it
// gives, and -write-lab writes them anew.

var writeLab = flag.Bool("write-lab", false, "rewrite the example's laboratory tables in examples/lab")

// labTruth is how the "true" fluid differs from the example's: a heavier,
// more strongly interacting plus fraction, as [[tune.parameter]]
// multipliers of the example's values (critical temperature, critical
// pressure and acentric factor of every C7+ pseudo-component, the C7+
// molar mass) and the C1/C7+ interaction coefficient.
var labTruth = `
[[tune.parameter]]
property = "critical_temperature"
component = "C7+"
min = 0.8
max = 1.2

[[tune.parameter]]
property = "critical_pressure"
component = "C7+"
min = 0.8
max = 1.2

[[tune.parameter]]
property = "acentric_factor"
component = "C7+"
min = 0.8
max = 1.2

[[tune.parameter]]
property = "molar_mass"
component = "C7+"
min = 0.8
max = 1.2
`

// labTruthValues are the multipliers of labTruth (invented).
var labTruthValues = []float64{1.012, 0.975, 1.02, 1.015}

// The experiments of the invented report: CVD steps and CCE pressures in
// psia, at the reservoir temperature.
var (
	labCVDPressures = []float64{4200, 3700, 3200, 2700, 2200, 1700, 1200, 800}
	labCCEPressures = []float64{6000, 5600, 5200, 4900, 4700, 4400, 4000, 3500, 3000, 2500}
)

const psia = 6894.757293168362 // Pa per psi, exact (NIST SP 811)

// exampleLabTables computes the invented report: the saturation pressure
// (psia, to 1 psi) and the CVD and CCE tables as CSV text.
func exampleLabTables(t testing.TB) (sat float64, cvdCSV, cceCSV string) {
	return labTables(t, labCVDPressures, labCCEPressures)
}

// labTables computes a report like the example's at the CVD steps cvdPs
// and CCE pressures ccePs (psia).
func labTables(t testing.TB, cvdPs, ccePs []float64) (sat float64, cvdCSV, cceCSV string) {
	t.Helper()
	text := stripLab(string(examples.Study)) + labTruth
	st, err := study.Parse(filepath.Join("..", "..", "examples", examples.StudyName), []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	fl, z, err := st.Tuned(labTruthValues)
	if err != nil {
		t.Fatal(err)
	}
	temp := st.Reservoir.Temperature
	ps := func(list []float64) []float64 {
		out := make([]float64, len(list))
		for i, p := range list {
			out[i] = p * psia
		}
		return out
	}
	d, err := cvd.Deplete(fl, z, temp, cvd.DepletionOptions{Pressures: ps(cvdPs), SkipMaxDropout: true})
	if err != nil {
		t.Fatal(err)
	}
	sat = math.Round(d.Dew.P / psia)

	// The lab lumps the plus fraction: C7+ is the sum of its pseudo-components.
	names := componentNames(st.Fluid)
	type lump struct {
		name  string
		index []int
	}
	var lumps []lump
	plus := -1
	for i := range fl.N() {
		if st.Fluid.Component(i).M <= heavyMolarMass {
			lumps = append(lumps, lump{names[i], []int{i}})
			continue
		}
		if plus < 0 {
			plus = len(lumps)
			lumps = append(lumps, lump{name: "C7+"})
		}
		lumps[plus].index = append(lumps[plus].index, i)
	}
	var b strings.Builder
	b.WriteString("pressure [psia],liquid_dropout [%],produced [%],z_gas,z_two_phase")
	for _, l := range lumps {
		fmt.Fprintf(&b, ",gas_%s [mol%%]", l.name)
	}
	b.WriteString("\n")
	f := strconv.FormatFloat
	row := func(p, drop, prod, zg, z2 float64, y []float64) {
		fmt.Fprintf(&b, "%s,%s,%s,%s,%s", f(p, 'f', 0, 64), f(100*drop, 'f', 2, 64), f(100*prod, 'f', 2, 64), f(zg, 'f', 4, 64), f(z2, 'f', 4, 64))
		for _, l := range lumps {
			s := 0.0
			for _, i := range l.index {
				s += y[i]
			}
			fmt.Fprintf(&b, ",%s", f(100*s, 'f', 2, 64))
		}
		b.WriteString("\n")
	}
	for _, s := range d.Steps { // the dew point, then the steps
		row(s.P/psia, s.LiquidDropout, s.Produced, s.ZGas, s.ZTwoPhase, s.Y)
	}
	cvdCSV = b.String()

	e, err := cvd.Expand(fl, z, temp, ps(ccePs), nil)
	if err != nil {
		t.Fatal(err)
	}
	b.Reset()
	b.WriteString("pressure [psia],relative_volume,liquid_volume [% of saturation volume],z,density [g/cm3]\n")
	m := fl.MolarMass(z)
	for _, s := range e.Steps {
		liquid, zz, rho := "", "", ""
		if s.TwoPhase {
			liquid = f(100*s.LiquidVolume, 'f', 2, 64)
		} else {
			zz = f(s.Z, 'f', 4, 64)
			rho = f(m/(s.RelativeVolume*e.VSat)/1000, 'f', 4, 64)
		}
		fmt.Fprintf(&b, "%s,%s,%s,%s,%s\n", f(s.P/psia, 'f', 0, 64), f(s.RelativeVolume, 'f', 4, 64), liquid, zz, rho)
	}
	cceCSV = b.String()
	return sat, cvdCSV, cceCSV
}

// stripLab removes the [lab] section and the tuning sections of the
// example ([[tune.parameter]], [tune.weights]), which the procedure gives
// anew.
func stripLab(s string) string {
	var out []string
	skip := false
	for _, line := range strings.SplitAfter(s, "\n") {
		if h := strings.TrimSpace(line); strings.HasPrefix(h, "[") {
			name := strings.Trim(strings.Fields(strings.SplitN(h, "#", 2)[0] + " ")[0], "[]")
			skip = name == "lab" || name == "tune" || strings.HasPrefix(name, "tune.")
		}
		if !skip {
			out = append(out, line)
		}
	}
	return strings.Join(out, "")
}

func TestExampleLabReport(t *testing.T) {
	sat, cvdCSV, cceCSV := exampleLabTables(t)
	dir := filepath.Join("..", "..", "examples", "lab")
	files := map[string]string{"cvd.csv": cvdCSV, "cce.csv": cceCSV}
	if *writeLab {
		for name, text := range files {
			if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
				t.Fatal(err)
			}
		}
		t.Logf("saturation pressure %g psia", sat)
		return
	}
	for name, want := range files {
		got, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		if !sameCSV(string(got), want) {
			t.Errorf("examples/lab/%s is not what the procedure of labdata_test.go gives; rerun with -write-lab after a deliberate change\n got: %s\nwant: %s", name, got, want)
		}
	}
	readme, err := os.ReadFile(filepath.Join(dir, "README.md"))
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(readme, []byte(fmt.Sprintf("%.0f psia", sat))) {
		t.Errorf("examples/lab/README.md does not give the procedure's saturation pressure, %.0f psia", sat)
	}
	if want := fmt.Sprintf("saturation_pressure = \"%.0f psia\"", sat); !bytes.Contains(examples.Study, []byte(want)) {
		t.Errorf("examples/%s does not give the procedure's saturation pressure in its [lab]: want %s", examples.StudyName, want)
	}
}

// sameCSV compares two tables cell by cell, numbers within one unit of
// their last printed digit (a solver's last bits may flip a rounding).
func sameCSV(a, b string) bool {
	ra, rb := strings.Split(strings.TrimSpace(a), "\n"), strings.Split(strings.TrimSpace(b), "\n")
	if len(ra) != len(rb) {
		return false
	}
	for i := range ra {
		ca, cb := strings.Split(ra[i], ","), strings.Split(rb[i], ",")
		if len(ca) != len(cb) {
			return false
		}
		for j := range ca {
			if ca[j] == cb[j] {
				continue
			}
			x, err1 := strconv.ParseFloat(ca[j], 64)
			y, err2 := strconv.ParseFloat(cb[j], 64)
			if err1 != nil || err2 != nil {
				return false
			}
			ulp := 1.0
			if k := strings.IndexByte(cb[j], '.'); k >= 0 {
				ulp = math.Pow(10, -float64(len(cb[j])-k-1))
			}
			if math.Abs(x-y) > 1.01*ulp {
				return false
			}
		}
	}
	return true
}
