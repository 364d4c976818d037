package main

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/examples"
)

// BenchmarkRecoverCommand: the whole recover command on the bundled example
// (reading the study, the fluid in place, the depletion and the other
// condensate bound, the JSON report), as a user runs it.
func BenchmarkRecoverCommand(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		if code := run([]string{"dewcell", "recover", "--format", "json", exampleStudy}, io.Discard, io.Discard); code != 0 {
			b.Fatalf("exit %d", code)
		}
	}
}

// BenchmarkTuneCommand: the tune command as a user runs it, four
// parameters (critical temperature, critical pressure, acentric factor and
// molar mass of the plus fraction) fitted to a saturation pressure, a
// 10-step CVD with produced-gas compositions and a 10-point CCE made by the
// procedure of the example's laboratory report (labdata_test.go).
func BenchmarkTuneCommand(b *testing.B) {
	sat, cvdCSV, cceCSV := labTables(b,
		[]float64{4400, 4000, 3600, 3200, 2800, 2400, 2000, 1600, 1200, 800},
		[]float64{6000, 5600, 5200, 4900, 4700, 4400, 4000, 3500, 3000, 2500})
	dir := b.TempDir()
	if err := os.MkdirAll(filepath.Join(dir, "lab"), 0o755); err != nil {
		b.Fatal(err)
	}
	text := strings.Replace(string(examples.Study), `saturation_pressure = "4811 psia"`, fmt.Sprintf(`saturation_pressure = "%.0f psia"`, sat), 1)
	for name, data := range map[string]string{"sablewick.toml": text, "lab/cvd.csv": cvdCSV, "lab/cce.csv": cceCSV} {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(data), 0o644); err != nil {
			b.Fatal(err)
		}
	}
	path := filepath.Join(dir, "sablewick.toml")
	// The run measured must be a converged one that finds the fluid the
	// tables came from.
	var out strings.Builder
	if code := run([]string{"dewcell", "tune", "--format", "json", path}, &out, io.Discard); code != 0 {
		b.Fatalf("exit %d", code)
	}
	var doc struct {
		Iterations int    `json:"iterations"`
		Stop       string `json:"stop"`
		Parameters []struct {
			Tuned float64 `json:"tuned"`
		} `json:"parameters"`
	}
	if err := json.Unmarshal([]byte(out.String()), &doc); err != nil || len(doc.Parameters) != len(labTruthValues) {
		b.Fatalf("tune output: %v, %d parameters", err, len(doc.Parameters))
	}
	for i, p := range doc.Parameters {
		if math.Abs(p.Tuned/labTruthValues[i]-1) > 0.01 {
			b.Errorf("parameter %d tuned to %.4f, the tables came from %.4f", i+1, p.Tuned, labTruthValues[i])
		}
	}
	b.Logf("%d iterations, stopped because: %s", doc.Iterations, doc.Stop)
	b.ReportAllocs()
	for b.Loop() {
		if code := run([]string{"dewcell", "tune", "--format", "json", path}, io.Discard, io.Discard); code != 0 {
			b.Fatalf("exit %d", code)
		}
	}
}

// BenchmarkForecastCommand: the forecast command on the bundled example
// (the depletion tabulated at 122 pressures, the plant, thirteen years of
// daily steps, the cash flow, the JSON report), as a user runs it.
func BenchmarkForecastCommand(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		if code := run([]string{"dewcell", "forecast", "--format", "json", exampleStudy}, io.Discard, io.Discard); code != 0 {
			b.Fatalf("exit %d", code)
		}
	}
}

// BenchmarkScenarios: the example's three scenarios (depletion, gas
// cycling in ten cells, water injection) forecast with monthly steps and
// their economics, without the sensitivity runs.
func BenchmarkScenarios(b *testing.B) {
	text := strings.Replace(string(examples.Study), "cells = 6 ", "cells = 10 ", 1)
	st, err := study.Parse(filepath.Join("..", "..", "examples", examples.StudyName), []byte(text))
	if err != nil {
		b.Fatal(err)
	}
	if st.Scenarios[1].Cells != 10 {
		b.Fatalf("%d cells", st.Scenarios[1].Cells)
	}
	o := &options{sys: units.Field, stderr: io.Discard}
	b.ReportAllocs()
	for b.Loop() {
		for _, sc := range st.Scenarios {
			if _, _, err := runScenario(o, st, sc, false, nil); err != nil {
				b.Fatal(err)
			}
		}
	}
}

// exampleUncertainty is an [uncertainty] section for the example (invented
// ranges): its area, porosity, plus-fraction molar mass, cycling sweep and
// gas price.
const exampleUncertainty = `
[uncertainty]
cases = 8
seed = 20261202
[uncertainty.vary]
"reservoir.area" = { distribution = "triangular", min = "2600 acre", mode = "3150 acre", max = "3700 acre" }
"reservoir.porosity" = { distribution = "normal", mean = 0.16, sd = 0.015, min = 0.10, max = 0.22 }
"fluid.plus.molar_mass" = { distribution = "uniform", min = 140.0, max = 152.0 }
"scenario.cycling.sweep_efficiency" = { distribution = "triangular", min = 0.5, mode = 0.7, max = 0.85 }
"economics.gas_price" = { distribution = "lognormal", median = "3.4 USD/MMBtu", p90_ratio = 0.7 }
`

// BenchmarkUncertainty: the example's probabilistic run, 8 cases of its
// three scenarios (depletion, cycling in six cells, water injection) in
// monthly steps and the 11 one-at-a-time runs of the sensitivity, on 1
// and on 2 workers; s/run is the time of one run (a case) per worker.
func BenchmarkUncertainty(b *testing.B) {
	text := string(examples.Study) + exampleUncertainty
	st, err := study.Parse(filepath.Join("..", "..", "examples", examples.StudyName), []byte(text))
	if err != nil {
		b.Fatal(err)
	}
	for _, workers := range []int{1, 2} {
		b.Run(fmt.Sprintf("workers-%d", workers), func(b *testing.B) {
			o := &options{sys: units.Field, stderr: io.Discard}
			runs := 0
			start := time.Now()
			for b.Loop() {
				ur, err := uncertaintyRun(o, st, false, workers, 0)
				if err != nil {
					b.Fatal(err)
				}
				runs += len(ur.values) + 1 + 2*len(ur.spec.Inputs)
			}
			b.ReportMetric(time.Since(start).Seconds()*float64(workers)/float64(runs), "s/run")
			b.ReportMetric(time.Since(start).Seconds()/float64(runs), "wall-s/run")
		})
	}
}
