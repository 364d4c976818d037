package study

import (
	"errors"
	"math"
	"os"
	"strings"
	"sync"
	"testing"
	"testing/fstest"

	"dewcell/cvd"
)

// FuzzRead checks that no study file makes Parse panic; that a rejected file
// gets a *study.Error naming the file; and that an accepted one gives a
// usable feed: one mole fraction per component, none negative, summing to 1.
// The same bytes, as the CVD and CCE tables of a fixed study (ParseFS), must
// not make the reading of the tables panic either, and what it accepts
// keeps the rules of the tables.
func FuzzRead(f *testing.F) {
	f.Add([]byte(base))
	f.Add([]byte(withScenarios + goodUncertainty))
	for _, table := range []string{fieldCVD, metricCVD, fieldCCE, metricCCE} {
		f.Add([]byte(table))
	}
	for _, path := range []string{"../../../../testdata/o9.toml", "../../../../examples/sablewick.toml"} {
		if data, err := os.ReadFile(path); err == nil {
			f.Add(data)
		}
	}
	for _, tt := range badStudies {
		if strings.Contains(base, tt.old) {
			f.Add([]byte(strings.Replace(base, tt.old, tt.new, 1)))
		}
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		fuzzLab(t, data)
		st, err := Parse("fuzz.toml", data)
		if err != nil {
			var se *Error
			if !errors.As(err, &se) || !strings.HasPrefix(err.Error(), "fuzz.toml: ") {
				t.Fatalf("error %q (%T) is not a *study.Error naming the file", err, err)
			}
			return
		}
		fl := st.Fluid
		if fl == nil || len(st.Z) != fl.N() {
			t.Fatalf("accepted study with fluid %v and %d mole fractions", fl, len(st.Z))
		}
		if err := fl.CheckComposition(st.Z); err != nil {
			t.Fatalf("accepted study with a bad feed: %v", err)
		}
		sum := 0.0
		for _, z := range st.Z {
			sum += z
		}
		if math.Abs(sum-1) > 1e-12 {
			t.Fatalf("mole fractions sum to %.17g", sum)
		}
		if !(st.Reservoir.Temperature > 0) {
			t.Fatalf("accepted reservoir temperature %g K", st.Reservoir.Temperature)
		}
	})
}

// fuzzBase is the base study, parsed once: fuzzLab reads only the tables.
var fuzzBase = sync.OnceValues(func() (*Study, error) { return Parse("fuzz.toml", []byte(base)) })

// fuzzLab reads data as the CVD and the CCE table of the base study.
func fuzzLab(t *testing.T, data []byte) {
	st0, err := fuzzBase()
	if err != nil {
		t.Fatal(err)
	}
	st := *st0
	fl := &fileLab{CVD: value{true, "cvd.csv"}, CCE: value{true, "cce.csv"}}
	if len(data) > 0 && data[0]&1 == 1 { // half the inputs give the saturation pressure
		fl.SaturationPressure = value{true, "4141 psia"}
	}
	r := &reader{file: "fuzz.toml", atm: st.Atmospheric, fsys: fstest.MapFS{"cvd.csv": {Data: data}, "cce.csv": {Data: data}}}
	if r.lab(&st, fl); r.err != nil {
		var se *Error
		if !errors.As(r.err, &se) || !strings.HasPrefix(r.err.Error(), "fuzz.toml: lab") {
			t.Fatalf("table error %q (%T) is not a *study.Error naming the file and a [lab] key", r.err, r.err)
		}
		return
	}
	rep := st.Lab.Report
	if rep == nil || rep.CVD == nil || rep.CCE == nil || !(rep.T > 0) || !(rep.SaturationP > 0) {
		t.Fatalf("accepted tables gave the report %+v", rep)
	}
	share := func(v float64) bool { return cvd.IsMissing(v) || v >= 0 && v <= 1 }
	n := st.Fluid.N()
	for _, comps := range [][]cvd.LabComponent{rep.CVD.Gas, rep.CVD.Liquid} {
		for _, c := range comps {
			for _, i := range c.Index {
				if i < 0 || i >= n {
					t.Fatalf("component %s stands for index %d of %d", c.Name, i, n)
				}
			}
		}
	}
	pts := rep.CVD.Points
	for i, p := range pts {
		switch {
		case !(p.P > 0) || p.P > rep.SaturationP*(1+1e-12):
			t.Fatalf("CVD pressure %g Pa, saturation pressure %g Pa", p.P, rep.SaturationP)
		case i > 0 && p.P >= pts[i-1].P:
			t.Fatalf("CVD pressures %g then %g Pa do not fall", pts[i-1].P, p.P)
		case !share(p.Dropout) || !share(p.Produced):
			t.Fatalf("CVD dropout %g, produced %g", p.Dropout, p.Produced)
		case (p.Gas == nil) != (rep.CVD.Gas == nil) || p.Gas != nil && len(p.Gas) != len(rep.CVD.Gas):
			t.Fatalf("%d gas mole fractions for %d components", len(p.Gas), len(rep.CVD.Gas))
		case p.Liquid != nil && i != len(pts)-1:
			t.Fatalf("a liquid composition on point %d of %d", i+1, len(pts))
		}
	}
	for _, p := range rep.CCE.Points {
		if !(p.P > 0) || !share(p.LiquidVolume) || p.RelativeVolume <= 0 || p.Z <= 0 || p.Density <= 0 {
			t.Fatalf("CCE point %+v", p)
		}
	}
}
