package main

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"runtime"
	"sort"
	"strconv"
	"strings"
	"sync"
	"time"

	"github.com/schollz/progressbar/v3"
	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/mbal"
	"dewcell/uncertain"
)

const (
	flagWorkers  = "workers"
	flagCasesOut = "cases-out"
)

// p90Convention says what P90 means, in every result of the command.
const p90Convention = "P90 is the value exceeded with 90 % probability (the 10th percentile), P10 the value exceeded with 10 % probability (the 90th percentile): the reserves convention"

func uncertaintyCommand() *cli.Command {
	return studyCommand("uncertainty",
		"the decision as a distribution: the study's [uncertainty] cases, each through the volumes in place, the depletion and every [[scenario]] with its economics; "+
			"P90, P50 and P10 of the volumes, recoveries and NPVs, the probability that each maintenance scenario beats depletion, and the sensitivity of its gain to each input",
		[]cli.Flag{
			startAtDewPointFlag(), plotFlag(),
			&cli.IntFlag{Name: flagWorkers, Value: runtime.NumCPU(), Usage: "run the cases on `N` workers in parallel (default: the number of cores); the results do not depend on it"},
			&cli.StringFlag{Name: flagCasesOut, Usage: "write every case's inputs and outputs to `FILE.csv`, in full or not at all (never replaces a file without --force)"},
			&cli.BoolFlag{Name: flagForce, Usage: "let --cases-out replace a file that exists (never the study file)"},
		},
		func(c *cli.Context, o *options, st *study.Study) error {
			workers := c.Int(flagWorkers)
			if workers < 1 {
				return cli.Exit(fmt.Sprintf("--%s %d: want 1 or more workers", flagWorkers, workers), exitUsage)
			}
			out := c.String(flagCasesOut)
			if out != "" {
				if err := checkCasesOut(out, st.File, c.Bool(flagForce)); err != nil {
					return err
				}
			}
			ur, err := uncertaintyRun(o, st, c.Bool(flagStartAtDew), workers, 0)
			if err != nil {
				return err
			}
			r := uncertaintyReport(st, o.sys, ur)
			if out != "" {
				if err := saveFile(out, casesCSV(ur), c.Bool(flagForce)); err != nil {
					return cli.Exit(fmt.Sprintf("--%s: %v", flagCasesOut, err), exitUsage)
				}
				r.Note(fmt.Sprintf("every case's inputs and outputs are in %s", out))
			}
			return o.emitPlots(c, r)
		})
}

// checkCasesOut refuses, before anything is computed, a --cases-out file
// that is the study file, a folder, in a folder that does not exist, or a
// file that exists without --force.
func checkCasesOut(out, studyFile string, force bool) error {
	if _, _, err := checkOutput(out, studyFile); err != nil {
		return cli.Exit(fmt.Sprintf("--%s: %v", flagCasesOut, err), exitUsage)
	}
	if _, err := os.Stat(out); err == nil && !force {
		return cli.Exit(fmt.Sprintf("--%s: %s exists; give another name, or --%s to replace it", flagCasesOut, out, flagForce), exitUsage)
	}
	return nil
}

// An output is one quantity each case gives.
type output struct {
	name     string // key stem: condensate_in_place
	label    string
	unit     units.Unit // of the values; the zero Unit for money and fractions
	symbol   string     // the currency of money
	format   report.Format
	scenario int // the scenario it belongs to, −1 for the volumes in place
}

// uncertaintyResult is every case of a probabilistic run and what is made
// of them.
type uncertaintyResult struct {
	spec      *study.Uncertainty
	sampling  string
	scenarios []study.Scenario
	base      int // the depletion scenario, −1 when the study has none
	currency  string
	outputs   []output
	incr      []int // per scenario, the index of its incremental NPV in outputs, −1 when it has none

	inputs  [][]float64 // per case, the value of each input in its unit
	values  [][]float64 // per case, the outputs; nil for a failed case
	errs    []string    // per case, why it failed; "" when it ran
	elapsed time.Duration
	workers int

	// The one-at-a-time runs: every input at its P50 (median), then each
	// input at its P90 and at its P10 with the others at their P50. nil
	// values where a run failed or was not needed.
	median      []float64
	medianOut   []float64
	medianErr   string
	swingLo     [][]float64 // per input: outputs with the input at its P90
	swingHi     [][]float64 // per input: outputs with the input at its P10
	swingErrs   []string
	swingInputs [][2]float64 // per input: its P90 and P10
}

// uncertaintyRun samples the study's [uncertainty] and runs every case,
// and the one-at-a-time runs of the sensitivity, on workers goroutines.
// maxCases, when above 0, caps the number of cases.
func uncertaintyRun(o *options, st *study.Study, atDew bool, workers, maxCases int) (*uncertaintyResult, error) {
	spec := st.Uncertainty
	if spec == nil {
		return nil, cli.Exit(fmt.Sprintf("%s has no [uncertainty]: give the cases and the inputs to vary, such as "+
			`[uncertainty] cases = 200 and [uncertainty.vary] "reservoir.porosity" = { distribution = "normal", mean = 0.16, sd = 0.015, min = 0.10, max = 0.22 }`, st.File), exitUsage)
	}
	n := spec.Cases
	if maxCases > 0 && n > maxCases {
		n = maxCases
	}
	ur := &uncertaintyResult{spec: spec, sampling: spec.Sampling, scenarios: st.Scenarios, base: -1, workers: workers}
	for i, sc := range st.Scenarios {
		if sc.Kind == study.ScenarioDepletion && ur.base < 0 {
			ur.base = i
		}
		if sc.Economics != nil {
			ur.currency = sc.Economics.Currency
		}
	}
	ur.outputs, ur.incr = uncertainOutputs(o.sys, ur)
	x, err := sampleInputs(st, spec, n)
	if err != nil {
		return nil, err
	}
	ur.inputs = x
	// The one-at-a-time runs, needed only for the gains over depletion.
	k := len(spec.Inputs)
	ur.median = make([]float64, k)
	ur.swingInputs = make([][2]float64, k)
	for j, in := range spec.Inputs {
		ur.median[j] = in.Dist.Quantile(0.5)
		ur.swingInputs[j] = [2]float64{in.Dist.Quantile(0.1), in.Dist.Quantile(0.9)}
	}
	type job struct {
		x    []float64
		save func([]float64, string)
	}
	var jobs []job
	for i := range x {
		jobs = append(jobs, job{x[i], func(v []float64, e string) { ur.values[i], ur.errs[i] = v, e }})
	}
	ur.values, ur.errs = make([][]float64, n), make([]string, n)
	ur.swingLo, ur.swingHi, ur.swingErrs = make([][]float64, k), make([][]float64, k), make([]string, k)
	swings := hasIncremental(ur)
	if swings {
		jobs = append(jobs, job{ur.median, func(v []float64, e string) { ur.medianOut, ur.medianErr = v, e }})
		for j := range k {
			lo, hi := ur.swingInputs[j][0], ur.swingInputs[j][1]
			if lo == hi {
				continue // a fixed input: no swing
			}
			for side, at := range []float64{lo, hi} {
				xs := append([]float64(nil), ur.median...)
				xs[j] = at
				jobs = append(jobs, job{xs, func(v []float64, e string) {
					if side == 0 {
						ur.swingLo[j] = v
					} else {
						ur.swingHi[j] = v
					}
					if e != "" && ur.swingErrs[j] == "" {
						ur.swingErrs[j] = e
					}
				}})
			}
		}
	}
	bar := progressOf(o.stderr, len(jobs))
	start := time.Now()
	results := make([][]float64, len(jobs))
	errs := make([]string, len(jobs))
	next := make(chan int)
	var wg sync.WaitGroup
	var mu sync.Mutex
	for range min(workers, len(jobs)) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				results[i], errs[i] = runCase(o, st, atDew, ur, jobs[i].x)
				if bar != nil {
					mu.Lock()
					_ = bar.Add(1)
					mu.Unlock()
				}
			}
		}()
	}
	for i := range jobs {
		next <- i
	}
	close(next)
	wg.Wait()
	if bar != nil {
		_ = bar.Finish()
		fmt.Fprintln(o.stderr)
	}
	ur.elapsed = time.Since(start)
	for i, jb := range jobs {
		jb.save(results[i], errs[i])
	}
	failed := 0
	for _, e := range ur.errs {
		if e != "" {
			failed++
		}
	}
	fmt.Fprintf(o.stderr, "uncertainty: %d cases (%d failed) and %d one-at-a-time runs in %s on %s: %s per run\n",
		n, failed, len(jobs)-n, ur.elapsed.Round(100*time.Millisecond), count(min(workers, len(jobs)), "worker", "workers"),
		(ur.elapsed * time.Duration(min(workers, len(jobs))) / time.Duration(len(jobs))).Round(time.Millisecond))
	if failed == n {
		return nil, fmt.Errorf("every one of the %d cases failed; the first: %s", n, ur.errs[0])
	}
	return ur, nil
}

// hasIncremental says whether the run has gains over depletion.
func hasIncremental(ur *uncertaintyResult) bool {
	for _, i := range ur.incr {
		if i >= 0 {
			return true
		}
	}
	return false
}

// progressOf is a progress bar of n steps on w when w is a terminal, else
// nil.
func progressOf(w io.Writer, n int) *progressbar.ProgressBar {
	f, ok := w.(*os.File)
	if !ok {
		return nil
	}
	fi, err := f.Stat()
	if err != nil || fi.Mode()&os.ModeCharDevice == 0 {
		return nil
	}
	return progressbar.NewOptions(n, progressbar.OptionSetWriter(w), progressbar.OptionSetDescription("uncertainty"),
		progressbar.OptionShowCount(), progressbar.OptionSetPredictTime(true), progressbar.OptionClearOnFinish())
}

// sampleInputs draws the design of n cases and turns it into the inputs'
// values: row i, column j the value of input j in case i, in its unit.
func sampleInputs(st *study.Study, spec *study.Uncertainty, n int) ([][]float64, error) {
	k := len(spec.Inputs)
	var u [][]float64
	var err error
	if spec.Sampling == study.MonteCarlo {
		u, err = uncertain.MonteCarlo(n, k, spec.Seed)
	} else {
		u, err = uncertain.LatinHypercube(n, k, spec.Seed)
	}
	if err != nil {
		return nil, cli.Exit(fmt.Sprintf("%s: uncertainty.cases: %v", st.File, err), exitUsage)
	}
	if len(spec.Correlations) > 0 {
		if n <= k {
			return nil, cli.Exit(fmt.Sprintf("%s: uncertainty.cases: %d cases for %d correlated inputs: rank correlations need more cases than inputs", st.File, n, k), exitUsage)
		}
		target := make([][]float64, k)
		for i := range target {
			target[i] = make([]float64, k)
			target[i][i] = 1
		}
		for _, c := range spec.Correlations {
			target[c.I][c.J], target[c.J][c.I] = c.Rho, c.Rho
		}
		u, err = uncertain.ImanConover(u, target, spec.Seed)
		var ce *uncertain.CorrelationError
		switch {
		case errors.As(err, &ce):
			return nil, cli.Exit(fmt.Sprintf("%s: [[uncertainty.correlate]]: the rank correlations of %q and %q cannot go with the others: %s",
				st.File, spec.Inputs[ce.I].Path, spec.Inputs[ce.J].Path, ce.Reason), exitUsage)
		case err != nil:
			return nil, cli.Exit(fmt.Sprintf("%s: [[uncertainty.correlate]]: %v", st.File, err), exitUsage)
		}
	}
	x := make([][]float64, n)
	for i := range x {
		x[i] = make([]float64, k)
		for j, in := range spec.Inputs {
			x[i][j] = in.Dist.Quantile(u[i][j])
		}
	}
	return x, nil
}

// uncertainOutputs lists the outputs of every case: the volumes in place,
// then per scenario its recoveries, ultimate volumes and NPV, and, for a
// scenario other than depletion, its NPV over depletion's.
func uncertainOutputs(sys units.System, ur *uncertaintyResult) ([]output, []int) {
	gU, lU := sys.Unit(units.GasVolume), sys.Unit(units.LiquidVolume)
	money := report.Format{Decimals: 0, MinDigits: 1}
	pct := report.Fixed(1)
	outs := []output{
		{name: "wet_gas_in_place", unit: gU, format: report.FormatOf(gU), scenario: -1},
		{name: "sales_gas_in_place", unit: gU, format: report.FormatOf(gU), scenario: -1},
		{name: "condensate_in_place", unit: lU, format: report.FormatOf(lU), scenario: -1},
	}
	incr := make([]int, len(ur.scenarios))
	for i, sc := range ur.scenarios {
		incr[i] = -1
		outs = append(outs,
			output{name: "condensate_recovery", unit: units.Percent, format: pct, scenario: i},
			output{name: "sales_gas_recovery", unit: units.Percent, format: pct, scenario: i},
			output{name: "ultimate_sales_gas", unit: gU, format: report.FormatOf(gU), scenario: i},
			output{name: "ultimate_condensate", unit: lU, format: report.FormatOf(lU), scenario: i})
		if sc.Economics != nil {
			outs = append(outs, output{name: "npv", label: "NPV", symbol: ur.currency, format: money, scenario: i})
			if ur.base >= 0 && i != ur.base && ur.scenarios[ur.base].Economics != nil {
				incr[i] = len(outs)
				outs = append(outs, output{name: "incremental_npv", label: "Incremental NPV", symbol: ur.currency, format: money, scenario: i})
			}
		}
	}
	for i := range outs {
		if outs[i].label == "" {
			outs[i].label = report.LabelOf(outs[i].name)
		}
	}
	return outs, incr
}

// runCase runs one case: the study with the inputs at x, every scenario
// forecast with its economics; its outputs in the order of ur.outputs, or
// why it failed. A case never stops the run: a failure, even a fault of
// the program, is returned as its message.
func runCase(o *options, st *study.Study, atDew bool, ur *uncertaintyResult, x []float64) (out []float64, fail string) {
	defer func() {
		if p := recover(); p != nil {
			out, fail = nil, fmt.Sprintf("internal error (a fault of dewcell, please report it with the study): %v", p)
		}
	}()
	cs, err := st.Case(x)
	if err != nil {
		return nil, err.Error()
	}
	// Each case has options of its own: its warnings stay with it.
	co := &options{sys: o.sys, format: o.format, study: o.study, stdout: io.Discard, stderr: io.Discard}
	sys := o.sys
	gU, lU := sys.Unit(units.GasVolume), sys.Unit(units.LiquidVolume)
	out = make([]float64, len(ur.outputs))
	for i := range out {
		out[i] = math.NaN()
	}
	if len(cs.Scenarios) == 0 { // the volumes in place alone, as inplace gives them
		res, err := reservoirOf(co, cs, "uncertainty", false)
		if err != nil {
			return nil, caseError(err, sys)
		}
		if _, err := startAtDewPoint(co, cs, &res, "uncertainty", atDew); err != nil {
			return nil, caseError(err, sys)
		}
		ip, err := mbal.InPlaceEOS(cs.Fluid, cs.Z, res, trainOf(cs, sys), nil)
		if err != nil {
			return nil, caseError(reservoirError(cs, sys, "fluid in place", err), sys)
		}
		out[0], out[1], out[2] = gU.FromSI(ip.WetGas), gU.FromSI(ip.SalesGas), lU.FromSI(ip.Condensate)
		return out, ""
	}
	mr, err := maintainRun(co, cs, atDew, 0)
	if err != nil {
		return nil, caseError(err, sys)
	}
	ip := mr.runs[0].ip
	out[0], out[1], out[2] = gU.FromSI(ip.WetGas), gU.FromSI(ip.SalesGas), lU.FromSI(ip.Condensate)
	for i, oc := range ur.outputs {
		if oc.scenario < 0 {
			continue
		}
		run := mr.runs[oc.scenario]
		fin := run.fc.Final.Cum
		switch oc.name {
		case "condensate_recovery":
			out[i] = units.Percent.FromSI(fin.Condensate / run.ip.Condensate)
		case "sales_gas_recovery":
			out[i] = units.Percent.FromSI(fin.SalesGas / run.salesInPlace)
		case "ultimate_sales_gas":
			out[i] = gU.FromSI(fin.SalesGas)
		case "ultimate_condensate":
			out[i] = lU.FromSI(fin.Condensate)
		case "npv":
			if run.cash != nil {
				out[i] = run.cash.NPV
			}
		case "incremental_npv":
			if run.cash != nil && mr.runs[ur.base].cash != nil {
				out[i] = run.cash.NPV - mr.runs[ur.base].cash.NPV
			}
		}
	}
	return out, ""
}

// caseError is the message of a case's failure.
func caseError(err error, sys units.System) string {
	var ec cli.ExitCoder
	if errors.As(err, &ec) {
		return err.Error()
	}
	return explain(err, sys)
}

// column of output oc, its key stem ending in stat (p90, …) after the unit.
func (oc output) column(prefix, stat string) Column {
	c := Column{Name: prefix + oc.name, Label: oc.label, Unit: oc.unit, Symbol: oc.symbol, Format: oc.format}
	if stat == "" {
		return c
	}
	c.Label += ", " + statLabel(stat)
	if c.Unit.Key == "" {
		c.Name += "_" + stat
	} else {
		c.Unit.Key += "_" + stat
	}
	return c
}

func statLabel(stat string) string {
	switch stat {
	case "mean":
		return "mean"
	case "sd":
		return "SD"
	}
	return strings.ToUpper(stat)
}

// sampleOf is output j over the cases that ran.
func (ur *uncertaintyResult) sampleOf(j int) []float64 {
	var xs []float64
	for _, v := range ur.values {
		if v != nil && !math.IsNaN(v[j]) {
			xs = append(xs, v[j])
		}
	}
	return xs
}

var stats = []string{"p90", "p50", "p10", "mean", "sd"}

func statsOf(s uncertain.Summary) []any { return []any{s.P90, s.P50, s.P10, s.Mean, s.SD} }

// uncertaintyReport shows the distribution of the outcomes.
func uncertaintyReport(st *study.Study, sys units.System, ur *uncertaintyResult) *Report {
	n := len(ur.values)
	failed := 0
	for _, e := range ur.errs {
		if e != "" {
			failed++
		}
	}
	cur := ur.currency
	r := &Report{Name: "uncertainty", Section: "The decision as a distribution",
		Title: fmt.Sprintf("Uncertainty of %s: %d cases of %s by %s sampling", fluidName(st), n, count(len(ur.spec.Inputs), "uncertain input", "uncertain inputs"), ur.sampling)}
	r.Fields = []Field{
		{Column: Column{Name: "cases"}, Value: n},
		{Column: Column{Name: "cases_failed"}, Value: failed},
		{Column: Column{Name: "sampling"}, Value: ur.sampling},
		{Column: Column{Name: "seed"}, Value: strconv.FormatUint(ur.spec.Seed, 10)},
		{Column: Column{Name: "p90_convention", Label: "Convention"}, Value: p90Convention},
	}
	if cur != "" {
		r.Fields = append(r.Fields, Field{Column: Column{Name: "currency"}, Value: cur})
	}
	summaries := make([]*uncertain.Summary, len(ur.outputs))
	for j := range ur.outputs {
		if s, err := uncertain.Summarize(ur.sampleOf(j)); err == nil {
			summaries[j] = &s
		}
	}
	// The volumes in place as fields.
	for j, oc := range ur.outputs {
		if oc.scenario >= 0 || summaries[j] == nil {
			continue
		}
		for k, stat := range stats {
			r.Fields = append(r.Fields, Field{Column: oc.column("", stat), Value: statsOf(*summaries[j])[k]})
		}
	}
	// Per scenario, its summaries under the keys of the JSON.
	sc := Table{Name: "scenarios", Title: "the scenarios' outcomes (" + p90Convention + ")", Transpose: true,
		Columns: []Column{{Name: "name"}, {Name: "kind"}}}
	var perScenario []output
	for _, oc := range ur.outputs {
		if oc.scenario == 0 || oc.scenario > 0 && oc.name == "incremental_npv" && !hasColumn(perScenario, "incremental_npv") {
			perScenario = append(perScenario, oc)
		}
	}
	for _, oc := range perScenario {
		for _, stat := range stats {
			sc.Columns = append(sc.Columns, oc.column("", stat))
		}
	}
	hasBeats := hasIncremental(ur)
	if hasBeats {
		sc.Columns = append(sc.Columns, Column{Name: "probability_beats_depletion", Label: "Probability of beating depletion", Format: report.Fixed(3)})
	}
	for i, scn := range ur.scenarios {
		row := []any{scn.Name, scn.Kind}
		for _, want := range perScenario {
			j := outputIndex(ur.outputs, i, want.name)
			for k := range stats {
				if j < 0 || summaries[j] == nil {
					row = append(row, nil)
				} else {
					row = append(row, statsOf(*summaries[j])[k])
				}
			}
		}
		if hasBeats {
			var p any
			if j := ur.incr[i]; j >= 0 {
				if v, err := uncertain.Exceedance(ur.sampleOf(j), 0); err == nil {
					p = v
				}
			}
			row = append(row, p)
		}
		sc.Rows = append(sc.Rows, row)
	}
	if len(ur.scenarios) > 0 {
		r.Tables = append(r.Tables, sc)
	}
	if hasBeats {
		for i, scn := range ur.scenarios {
			if j := ur.incr[i]; j >= 0 {
				if v, err := uncertain.Exceedance(ur.sampleOf(j), 0); err == nil {
					r.Note(fmt.Sprintf("%s beats depletion (its NPV is higher) in %s %% of the cases that ran", scn.Name, report.Sig(100*v, 3)))
				}
			}
		}
	}
	r.Tables = append(r.Tables, inputsTable(ur))
	if sens := sensitivityTable(ur); sens != nil {
		r.Tables = append(r.Tables, *sens)
	}
	if failed > 0 {
		r.Tables = append(r.Tables, failedTable(ur))
		r.Warn(fmt.Sprintf("%d of the %d cases failed and are left out of the distributions (table failed_cases gives each with its inputs and why)", failed, n))
	}
	if ur.medianErr != "" {
		r.Warn("the run with every input at its P50 failed, so the one-at-a-time swings are left out: " + ur.medianErr)
	}
	if len(ur.scenarios) == 0 {
		r.Note(fmt.Sprintf("%s has no [[scenario]]: only the volumes in place are run; give the scenarios to see the recoveries, NPVs and the gains of pressure maintenance", st.File))
	}
	r.Figures = uncertaintyFigures(ur)
	r.Note("the distributions are of the cases that ran; " + p90Convention)
	r.Note("the forecasts are screening estimates of a tank model; reserves need review by qualified, licensed professionals under the regulations where the field lies")
	return r
}

func hasColumn(outs []output, name string) bool {
	for _, oc := range outs {
		if oc.name == name {
			return true
		}
	}
	return false
}

// outputIndex is the index of scenario i's output name, or −1.
func outputIndex(outs []output, i int, name string) int {
	for j, oc := range outs {
		if oc.scenario == i && oc.name == name {
			return j
		}
	}
	return -1
}

// inputsTable gives each input's distribution and its sampled values.
func inputsTable(ur *uncertaintyResult) Table {
	t := Table{Name: "inputs", Title: "the uncertain inputs: their distributions and the values the cases drew",
		Columns: []Column{{Name: "input"}, {Name: "distribution"}, {Name: "unit"},
			{Name: "p90", Label: "P90"}, {Name: "p50", Label: "P50"}, {Name: "p10", Label: "P10"},
			{Name: "sample_p90", Label: "P90 of the cases"}, {Name: "sample_p50", Label: "P50 of the cases"}, {Name: "sample_p10", Label: "P10 of the cases"}}}
	for j, in := range ur.spec.Inputs {
		col := make([]float64, len(ur.inputs))
		for i, x := range ur.inputs {
			col[i] = x[j]
		}
		row := []any{in.Path, in.Kind, in.Unit, in.Dist.Quantile(0.1), in.Dist.Quantile(0.5), in.Dist.Quantile(0.9), nil, nil, nil}
		if s, err := uncertain.Summarize(col); err == nil {
			row[6], row[7], row[8] = s.P90, s.P50, s.P10
		}
		t.Rows = append(t.Rows, row)
	}
	return t
}

// sensitivityTable is the sensitivity of each gain over depletion to each
// input: Spearman's rank correlation over the cases, and the swing of the
// one-at-a-time runs between the input's P90 and P10; nil without gains.
func sensitivityTable(ur *uncertaintyResult) *Table {
	if !hasIncremental(ur) {
		return nil
	}
	money := report.Format{Decimals: 0, MinDigits: 1}
	cur := ur.currency
	t := Table{Name: "sensitivity", Title: "sensitivity of each scenario's NPV over depletion to each input: rank correlation over the cases, and the one-at-a-time swing with the other inputs at their P50",
		Columns: []Column{{Name: "scenario"}, {Name: "input"},
			{Name: "rank_correlation", Label: "Spearman rank correlation", Format: report.Fixed(3)},
			{Name: "incremental_npv_input_p90", Label: "Incremental NPV, input at its P90", Symbol: cur, Format: money},
			{Name: "incremental_npv_input_p50", Label: "Incremental NPV, inputs at their P50", Symbol: cur, Format: money},
			{Name: "incremental_npv_input_p10", Label: "Incremental NPV, input at its P10", Symbol: cur, Format: money},
			{Name: "swing", Symbol: cur, Format: money}}}
	for i, scn := range ur.scenarios {
		jo := ur.incr[i]
		if jo < 0 {
			continue
		}
		for j, in := range ur.spec.Inputs {
			var xs, ys []float64
			for c, v := range ur.values {
				if v != nil && !math.IsNaN(v[jo]) {
					xs, ys = append(xs, ur.inputs[c][j]), append(ys, v[jo])
				}
			}
			row := []any{scn.Name, in.Path, nil, nil, nil, nil, nil}
			if rho, err := uncertain.Spearman(xs, ys); err == nil {
				row[2] = rho
			}
			if ur.medianOut != nil {
				mid := ur.medianOut[jo]
				row[4] = mid
				lo, hi := mid, mid // a fixed input does not move the gain
				if ur.swingInputs[j][0] != ur.swingInputs[j][1] {
					lo, hi = math.NaN(), math.NaN()
					if ur.swingLo[j] != nil {
						lo = ur.swingLo[j][jo]
					}
					if ur.swingHi[j] != nil {
						hi = ur.swingHi[j][jo]
					}
				}
				row[3], row[5] = lo, hi
				if !math.IsNaN(lo) && !math.IsNaN(hi) {
					row[6] = math.Abs(hi - lo)
				}
			}
			t.Rows = append(t.Rows, row)
		}
	}
	return &t
}

// failedTable lists the cases that failed, with their inputs and why.
func failedTable(ur *uncertaintyResult) Table {
	t := Table{Name: "failed_cases", Title: "the cases that failed, with their inputs and why", Columns: []Column{{Name: "case"}}}
	for _, in := range ur.spec.Inputs {
		t.Columns = append(t.Columns, Column{Name: nameStem(in.Path, '_'), Label: in.Path + unitSuffix(in.Unit), Format: report.Format{Decimals: 4, MinDigits: 3, MaxDecimals: 6}})
	}
	t.Columns = append(t.Columns, Column{Name: "error"})
	for i, e := range ur.errs {
		if e == "" {
			continue
		}
		row := []any{i + 1}
		for _, x := range ur.inputs[i] {
			row = append(row, x)
		}
		t.Rows = append(t.Rows, append(row, e))
	}
	return t
}

func unitSuffix(u string) string {
	if u == "" {
		return ""
	}
	return " [" + u + "]"
}

// casesCSV is every case: its number, its inputs in their units, its
// outputs and why it failed, with 14 significant digits as CSV keeps them.
func casesCSV(ur *uncertaintyResult) []byte {
	var b bytes.Buffer
	w := csv.NewWriter(&b)
	head := []string{"case"}
	for _, in := range ur.spec.Inputs {
		h := in.Path
		if in.Unit != "" {
			h += " [" + in.Unit + "]"
		}
		head = append(head, h)
	}
	for _, oc := range ur.outputs {
		key := oc.column("", "").Key()
		if oc.scenario >= 0 {
			key = nameStem(ur.scenarios[oc.scenario].Name, '_') + "_" + key
		}
		head = append(head, key)
	}
	head = append(head, "error")
	_ = w.Write(head)
	num := func(x float64) string {
		if math.IsNaN(x) {
			return ""
		}
		return strconv.FormatFloat(x, 'g', 14, 64)
	}
	for i := range ur.inputs {
		row := []string{strconv.Itoa(i + 1)}
		for _, x := range ur.inputs[i] {
			row = append(row, num(x))
		}
		for j := range ur.outputs {
			v := math.NaN()
			if ur.values[i] != nil {
				v = ur.values[i][j]
			}
			row = append(row, num(v))
		}
		_ = w.Write(append(row, ur.errs[i]))
	}
	w.Flush()
	return b.Bytes()
}

// uncertaintyFigures: per maintenance scenario a histogram of its gain
// over depletion; the S-curves of the NPVs and of the gains; a tornado of
// each gain's one-at-a-time swings.
func uncertaintyFigures(ur *uncertaintyResult) []*report.Figure {
	var out []*report.Figure
	cur := ur.currency
	if cur == "" {
		return nil
	}
	moneyAxis := func(what string) report.Axis { return report.Axis{Label: what + " [10^6 " + cur + "]"} }
	exceed := report.Axis{Label: "Probability of exceeding [%]", Min: 0, Max: 100}
	pLines := []report.RefLine{{Label: "P90", Value: 90}, {Label: "P50", Value: 50}, {Label: "P10", Value: 10}}
	for i, scn := range ur.scenarios {
		j := ur.incr[i]
		if j < 0 {
			continue
		}
		xs := ur.sampleOf(j)
		edges, counts, err := uncertain.Histogram(xs, histogramBins(len(xs)))
		if err != nil || len(edges) < 3 {
			continue
		}
		h := &report.Figure{Name: "uncertainty-histogram-" + strings.Trim(nameStem(scn.Name, '-'), "-"), Title: "Distribution of the gain of " + scn.Name,
			Caption: fmt.Sprintf("Number of cases by the NPV of %s over depletion's; the dotted line is zero.", scn.Name),
			X:       moneyAxis("Incremental NPV"), Y: report.Axis{Label: "Cases"}}
		bars := report.Series{Label: "Cases", Style: report.Bars}
		for b, c := range counts {
			bars.X, bars.Y = append(bars.X, (edges[b]+edges[b+1])/2/1e6), append(bars.Y, float64(c))
		}
		h.Series = []report.Series{bars}
		h.Lines = []report.RefLine{{Value: 0, Vertical: true}}
		out = append(out, h)
	}
	scurve := func(name, title, caption, what string, pick func(i int) int) *report.Figure {
		f := &report.Figure{Name: name, Title: title, Caption: caption, X: moneyAxis(what), Y: exceed, Lines: pLines}
		for i, scn := range ur.scenarios {
			j := pick(i)
			if j < 0 {
				continue
			}
			values, below, err := uncertain.Cumulative(ur.sampleOf(j))
			if err != nil {
				continue
			}
			s := report.Series{Label: scn.Name, Style: report.Line}
			for k := range values {
				s.X, s.Y = append(s.X, values[k]/1e6), append(s.Y, 100*(1-below[k]))
			}
			f.Series = append(f.Series, s)
		}
		if len(f.Series) == 0 {
			return nil
		}
		return f
	}
	if f := scurve("uncertainty-npv", "NPV by scenario: probability of exceeding", "Probability that each scenario's NPV exceeds a value (S-curves); the P90, P50 and P10 are read where the curves cross 90, 50 and 10 %.",
		"NPV", func(i int) int { return outputIndex(ur.outputs, i, "npv") }); f != nil {
		out = append(out, f)
	}
	if f := scurve("uncertainty-incremental-npv", "NPV over depletion: probability of exceeding", "Probability that each scenario's NPV over depletion's exceeds a value; where a curve crosses zero is the probability that the scenario beats depletion.",
		"Incremental NPV", func(i int) int { return ur.incr[i] }); f != nil {
		f.Lines = append(f.Lines, report.RefLine{Value: 0, Vertical: true})
		out = append(out, f)
	}
	// Tornadoes, widest swing first.
	if ur.medianOut == nil {
		return out
	}
	for i, scn := range ur.scenarios {
		jo := ur.incr[i]
		if jo < 0 {
			continue
		}
		type bar struct {
			label  string
			lo, hi float64
		}
		var bars []bar
		for j, in := range ur.spec.Inputs {
			if ur.swingLo[j] == nil || ur.swingHi[j] == nil {
				continue
			}
			bars = append(bars, bar{in.Path, ur.swingLo[j][jo], ur.swingHi[j][jo]})
		}
		if len(bars) == 0 {
			continue
		}
		sort.SliceStable(bars, func(a, b int) bool { return math.Abs(bars[a].hi-bars[a].lo) > math.Abs(bars[b].hi-bars[b].lo) })
		tor := &report.Figure{Name: "uncertainty-tornado-" + strings.Trim(nameStem(scn.Name, '-'), "-"), Title: "What moves the gain of " + scn.Name,
			Caption: fmt.Sprintf("NPV of %s over depletion's as each input goes from its P90 to its P10, the others at their P50 (widest first); the dotted line is the gain with every input at its P50.", scn.Name),
			X:       report.Axis{Label: "Input (labelled)", Min: 0.3, Max: float64(len(bars)) + 0.7}, Y: moneyAxis("Incremental NPV")}
		span := report.Series{Label: "Input from its P90 to its P10", Style: report.Ranges}
		for k, b := range bars {
			x := float64(k + 1)
			span.X, span.Y = append(span.X, x, x), append(span.Y, b.lo/1e6, b.hi/1e6)
			tor.Marks = append(tor.Marks, report.Mark{Label: b.label, X: x, Y: math.Max(b.lo, b.hi) / 1e6})
		}
		tor.Series = []report.Series{span}
		tor.Lines = []report.RefLine{{Label: "inputs at P50", Value: ur.medianOut[jo] / 1e6}}
		out = append(out, tor)
	}
	return out
}

// histogramBins is the number of bins for n values: Sturges' rule,
// 1 + log2 n (Sturges 1926), at least 5.
func histogramBins(n int) int {
	return max(5, int(math.Ceil(1+math.Log2(float64(n)))))
}
