package study

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
	"testing/fstest"

	"dewcell/cvd"
)

// The laboratory tables below are invented. The field and the metric tables
// are one report: the metric values are the field ones converted by the
// definitions of the units and printed to 10 significant digits (psia to
// bara: × 6894.757293168362/1e5; lb/ft3 to kg/m3: × 0.45359237/0.3048³;
// STB/MMscf to sm3/1e6 sm3: × 0.158987294928/0.028316846592; cP to µPa·s:
// × 1000), with the shares as fractions instead of percents and the headers
// in other cases.

const fieldCVD = `pressure [psia],liquid_dropout [%],produced [%],z_gas,z_two_phase,gas_viscosity [cP],cgr [STB/MMscf],gas_N2 [mol%],gas_CO2 [mol%],gas_C1 [mol%],gas_C2 [mol%],gas_C3 [mol%],gas_nC4 [mol%],gas_C7+ [mol%],liquid_C1 [mol%],liquid_C7+ [mol%],note
4141,0,0,0.912,0.912,0.0285,95,0.5,2.5,74.0,8.0,4.0,3.0,8.0,,,saturation
3500,1.8,7.2,0.874,0.881,0.0246,71,0.52,2.51,75.6,8.02,3.98,2.95,6.42,,,
2500,3.1,21.5,0.861,0.866,0.0203,52,0.54,2.53,77.3,8.05,3.9,2.85,4.83,,,
1500,2.6,40.3,0.888,0.852,0.0166,,0.55,2.55,78.4,8.1,3.85,2.75,3.8,28.4,51.2,"last step, no cgr"
`

const metricCVD = `Pressure [bara],Liquid_Dropout [fraction],PRODUCED [fraction],Z_Gas,z_two_phase,Gas_Viscosity [uPa.s],CGR [sm3/1e6 sm3],gas_n2 [mol fraction],GAS_co2 [fraction],gas_c1 [mol %],gas_C2 [%],gas_C3 [mol%],gas_NC4 [mol%],gas_c7+ [mol%],Liquid_c1 [fraction],LIQUID_C7+ [fraction],Notes
285.5118995,0,0,0.912,0.912,28.5,533.3854167,0.005,0.025,74.0,8.0,4.0,3.0,8.0,,,the saturation row gives the saturation pressure
241.3165053,0.018,0.072,0.874,0.881,24.6,398.6354167,0.0052,0.0251,75.6,8.02,3.98,2.95,6.42,,,
172.3689323,0.031,0.215,0.861,0.866,20.3,291.9583333,0.0054,0.0253,77.3,8.05,3.9,2.85,4.83,,,
103.4213594,0.026,0.403,0.888,0.852,16.6,,0.0055,0.0255,78.4,8.1,3.85,2.75,3.8,0.284,0.512,
`

const fieldCCE = `pressure [psia],relative_volume,liquid_volume [% of saturation volume],z,density [lb/ft3],note
6000,0.8412,,1.0935,21.37,
5000,0.9034,,1.0167,19.90,
4141,1.0000,0,0.9118,18.01,saturation
3500,1.1350,1.2,,,
2500,1.5127,2.7,,,
`

const metricCCE = `PRESSURE [bara], Relative_Volume [V/Vsat], liquid_volume [fraction of  Saturation Volume], Z, Density [kg/m3]
413.6854376,0.8412,,1.0935,342.3145623
344.7378647,0.9034,,1.0167,318.7674211
285.5118995,1.0,0,0.9118,288.4925254
241.3165053,1.135,0.012,,
172.3689323,1.5127,0.027,,
`

// The metric CCE with its densities in g/cm3.
const metricCCEg = `pressure [bara],relative_volume,liquid_volume [fraction of saturation volume],z,density [g/cm3]
413.6854376,0.8412,,1.0935,0.3423145623
344.7378647,0.9034,,1.0167,0.3187674211
285.5118995,1.0,0,0.9118,0.2884925254
241.3165053,1.135,0.012,,
172.3689323,1.5127,0.027,,
`

// Conversions to SI from the definitions (NIST SP 811 (2008), B.9): the
// psi from the pound, g_n and the inch; the barrel of 9702 in³; the cubic
// foot of 0.3048³ m³.
const (
	pa      = 6894.757293168362 // Pa per psi, the float64 nearest 0.45359237 × 9.80665/0.0254²
	lbPerFt = 0.45359237 / (0.3048 * 0.3048 * 0.3048)
	stbMM   = 0.158987294928 / (1e6 * 0.028316846592) // m³/m³ per STB/MMscf
)

// parseLab parses base with the [lab] keys lab and the files of files, all
// in memory (ParseFS), the study being case.toml.
func parseLab(lab string, files map[string]string) (*Study, error) {
	fsys := fstest.MapFS{"case.toml": {Data: []byte(base + "\n[lab]\n" + lab)}}
	for name, s := range files {
		fsys[name] = &fstest.MapFile{Data: []byte(s)}
	}
	return ParseFS(fsys, "case.toml")
}

// near compares a with b relative to b; a Missing value equals only another.
func near(a, b, tol float64) bool {
	if cvd.IsMissing(a) || cvd.IsMissing(b) {
		return cvd.IsMissing(a) && cvd.IsMissing(b)
	}
	return math.Abs(a-b) <= tol*math.Abs(b)
}

// TestLabFieldUnits: the field report in SI, against the conversions of the
// definitions above (each a single rounding, hence 1e-15), with blank cells
// Missing, the plus fraction standing for every pseudo-component, the final
// liquid on the last point only, and the note column's text ignored.
func TestLabFieldUnits(t *testing.T) {
	st, err := parseLab(`temperature = "240.8 degF"
saturation_pressure = "4141 psia"
cce = "lab/cce.csv"
cvd = "lab/cvd.csv"`, map[string]string{"lab/cvd.csv": fieldCVD, "lab/cce.csv": fieldCCE})
	if err != nil {
		t.Fatal(err)
	}
	if st.Lab.CVD != "lab/cvd.csv" || st.Lab.CCE != "lab/cce.csv" {
		t.Errorf("paths %q, %q; want lab/cvd.csv and lab/cce.csv within the file system", st.Lab.CVD, st.Lab.CCE)
	}
	rep := st.Lab.Report
	if rep == nil || rep.CVD == nil || rep.CCE == nil {
		t.Fatalf("report %+v, want one with both tables", rep)
	}
	if want := (240.8 + 459.67) / 1.8; !near(rep.T, want, 1e-15) { // T/K = (t/°F + 459.67)/1.8 (definition)
		t.Errorf("T = %.17g K, want %.17g", rep.T, want)
	}
	if want := 4141 * pa; !near(rep.SaturationP, want, 1e-15) {
		t.Errorf("saturation pressure %.17g Pa, want %.17g", rep.SaturationP, want)
	}
	c := rep.CVD
	if len(c.Points) != 4 {
		t.Fatalf("%d CVD points, want 4", len(c.Points))
	}
	p1, p3 := c.Points[1], c.Points[3]
	checks := []struct {
		what      string
		got, want float64
	}{
		{"P[1]", p1.P, 3500 * pa},
		{"Dropout[1]", p1.Dropout, 0.018},
		{"Produced[1]", p1.Produced, 0.072},
		{"ZGas[1]", p1.ZGas, 0.874},
		{"ZTwoPhase[1]", p1.ZTwoPhase, 0.881},
		{"GasViscosity[1]", p1.GasViscosity, 0.0246e-3}, // 1 cP = 1e-3 Pa·s
		{"CGR[1]", p1.CGR, 71 * stbMM},
		{"Gas[1] C1", p1.Gas[2], 0.756},
		{"Gas[1] C7+", p1.Gas[6], 0.0642},
		{"CGR[3], blank", p3.CGR, cvd.Missing},
		{"Liquid[3] C1", p3.Liquid[0], 0.284},
		{"Liquid[3] C7+", p3.Liquid[1], 0.512},
		{"CCE P[0]", rep.CCE.Points[0].P, 6000 * pa},
		{"CCE density[0]", rep.CCE.Points[0].Density, 21.37 * lbPerFt},
		{"CCE liquid volume[4]", rep.CCE.Points[4].LiquidVolume, 0.027},
		{"CCE liquid volume[0], blank", rep.CCE.Points[0].LiquidVolume, cvd.Missing},
		{"CCE Z[3], blank", rep.CCE.Points[3].Z, cvd.Missing},
		{"CCE density[3], blank", rep.CCE.Points[3].Density, cvd.Missing},
	}
	for _, ck := range checks {
		if !near(ck.got, ck.want, 1e-15) {
			t.Errorf("%s = %.17g, want %.17g", ck.what, ck.got, ck.want)
		}
	}
	for i, pt := range c.Points {
		if (pt.Liquid != nil) != (i == 3) {
			t.Errorf("point %d: liquid composition %v; want one on the last point only", i, pt.Liquid)
		}
		if len(pt.Gas) != 7 {
			t.Errorf("point %d: %d gas mole fractions, want 7", i, len(pt.Gas))
		}
	}
	if rep.CCE.LiquidBasis != cvd.OfSaturationVolume {
		t.Errorf("liquid basis %v, want OfSaturationVolume", rep.CCE.LiquidBasis)
	}

	// The components in the order of the columns, with the model components
	// each stands for: the fluid is built in the file's order with the plus
	// fraction split in its place (6 defined components, then C7+'s
	// pseudo-components), so the mole fractions of C7+'s indices sum to its
	// 8 mol % of the feed.
	var names []string
	seen := map[int]bool{}
	for _, lc := range c.Gas {
		names = append(names, lc.Name)
		for _, i := range lc.Index {
			if seen[i] {
				t.Errorf("index %d of %s is listed twice", i, lc.Name)
			}
			seen[i] = true
		}
	}
	if got := strings.Join(names, " "); got != "N2 CO2 C1 C2 C3 nC4 C7+" {
		t.Errorf("gas components %s", got)
	}
	if len(seen) != st.Fluid.N() {
		t.Errorf("the gas columns stand for %d model components, want all %d", len(seen), st.Fluid.N())
	}
	plus := c.Gas[6]
	if n := st.Fluid.N() - 6; len(plus.Index) != n || n < 2 {
		t.Fatalf("C7+ stands for %v, want the %d pseudo-components", plus.Index, n)
	}
	zPlus := 0.0
	for j, i := range plus.Index {
		if i != 6+j {
			t.Errorf("C7+ index %v, want 6, 7, …", plus.Index)
		}
		zPlus += st.Z[i]
	}
	if math.Abs(zPlus-0.08) > 1e-15 {
		t.Errorf("the feed's mole fractions at C7+'s indices sum to %.17g, want 0.08 (the study's 8 mol %%)", zPlus)
	}
	if !reflect.DeepEqual(c.Gas[2], cvd.LabComponent{Name: "C1", Index: []int{2}}) {
		t.Errorf("C1 is %+v, want index 2 (the third of fluid.composition)", c.Gas[2])
	}
	if len(c.Liquid) != 2 || c.Liquid[0].Name != "C1" || !reflect.DeepEqual(c.Liquid[1].Index, plus.Index) {
		t.Errorf("liquid components %+v, want C1 and C7+", c.Liquid)
	}
}

// TestLabMetricUnits: the same report in metric units, with case-insensitive
// headers and component names, fractions for percents and no
// saturation_pressure (the first row, dropout 0 and produced 0, gives it),
// reads to the same SI values within the 10 printed digits (half a unit in
// the tenth digit is at most 5e-10 relative).
func TestLabMetricUnits(t *testing.T) {
	field, err := parseLab(`saturation_pressure = "4141 psia"
cce = "lab/cce.csv"
cvd = "lab/cvd.csv"`, map[string]string{"lab/cvd.csv": fieldCVD, "lab/cce.csv": fieldCCE})
	if err != nil {
		t.Fatal(err)
	}
	for _, cce := range []string{metricCCE, metricCCEg} {
		metric, err := parseLab(`cce = "lab/cce.csv"
cvd = "lab/cvd.csv"`, map[string]string{"lab/cvd.csv": metricCVD, "lab/cce.csv": cce})
		if err != nil {
			t.Fatal(err)
		}
		const tol = 5e-10
		f, m := field.Lab.Report, metric.Lab.Report
		if m.T != field.Reservoir.Temperature || f.T != m.T {
			t.Errorf("temperature %g K, want the reservoir's %g K when lab.temperature is not given", m.T, field.Reservoir.Temperature)
		}
		if !near(m.SaturationP, f.SaturationP, tol) {
			t.Errorf("saturation pressure from the saturation row %.10g Pa, want %.10g", m.SaturationP, f.SaturationP)
		}
		if !reflect.DeepEqual(m.CVD.Gas, f.CVD.Gas) || !reflect.DeepEqual(m.CVD.Liquid, f.CVD.Liquid) {
			t.Errorf("metric components %+v %+v, field %+v %+v", m.CVD.Gas, m.CVD.Liquid, f.CVD.Gas, f.CVD.Liquid)
		}
		for i, fp := range f.CVD.Points {
			mp := m.CVD.Points[i]
			pairs := [][2]float64{{mp.P, fp.P}, {mp.Dropout, fp.Dropout}, {mp.Produced, fp.Produced}, {mp.ZGas, fp.ZGas},
				{mp.ZTwoPhase, fp.ZTwoPhase}, {mp.GasViscosity, fp.GasViscosity}, {mp.CGR, fp.CGR}}
			for j := range fp.Gas {
				pairs = append(pairs, [2]float64{mp.Gas[j], fp.Gas[j]})
			}
			for j := range fp.Liquid {
				pairs = append(pairs, [2]float64{mp.Liquid[j], fp.Liquid[j]})
			}
			for j, pr := range pairs {
				if !near(pr[0], pr[1], tol) {
					t.Errorf("CVD point %d, value %d: metric %.17g, field %.17g", i, j, pr[0], pr[1])
				}
			}
		}
		for i, fp := range f.CCE.Points {
			mp := m.CCE.Points[i]
			for j, pr := range [][2]float64{{mp.P, fp.P}, {mp.RelativeVolume, fp.RelativeVolume}, {mp.LiquidVolume, fp.LiquidVolume}, {mp.Z, fp.Z}, {mp.Density, fp.Density}} {
				if !near(pr[0], pr[1], tol) {
					t.Errorf("CCE point %d, value %d: metric %.17g, field %.17g", i, j, pr[0], pr[1])
				}
			}
		}
		if want := 288.4925254; !near(m.CCE.Points[2].Density, want, 1e-15) { // kg/m3 is SI; g/cm3 is × 1000
			t.Errorf("density %.17g kg/m3, want %.17g", m.CCE.Points[2].Density, want)
		}
	}
}

// TestLabVariants: the saturation pressure alone; a liquid volume of the
// total volume; gauge pressures, converted with the study's atmospheric
// pressure; missing columns Missing; the saturation row optional when the
// key gives the pressure.
func TestLabVariants(t *testing.T) {
	st, err := parseLab(`saturation_pressure = "285.5 bara"`, nil)
	if err != nil {
		t.Fatal(err)
	}
	if r := st.Lab.Report; r == nil || r.SaturationP != 285.5e5 || r.CCE != nil || r.CVD != nil || st.Lab.CVD != "" {
		t.Errorf("saturation pressure alone: %+v", r)
	}

	cce := "pressure [psig],liquid_volume [% of total volume]\n1000,\n500,3.5\n"
	cvdT := "pressure [MPa],Z_GAS\n20,0.9\n15,\n"
	st, err = parseLab(`saturation_pressure = "21 MPa"
cce = "cce.csv"
cvd = "cvd.csv"`, map[string]string{"cce.csv": cce, "cvd.csv": cvdT})
	if err != nil {
		t.Fatal(err)
	}
	r := st.Lab.Report
	if r.CCE.LiquidBasis != cvd.OfTotalVolume {
		t.Errorf("liquid basis %v, want OfTotalVolume", r.CCE.LiquidBasis)
	}
	if want := 1000*pa + 101325; !near(r.CCE.Points[0].P, want, 1e-15) { // gauge + 1 atm, the study's default
		t.Errorf("1000 psig = %.17g Pa, want %.17g", r.CCE.Points[0].P, want)
	}
	if p := r.CCE.Points[1]; p.LiquidVolume != 0.035 || !cvd.IsMissing(p.RelativeVolume) || !cvd.IsMissing(p.Z) || !cvd.IsMissing(p.Density) {
		t.Errorf("CCE point %+v, want liquid volume 0.035 and the rest Missing", p)
	}
	if !cvd.IsMissing(r.CCE.Points[0].LiquidVolume) {
		t.Errorf("blank liquid volume %g, want Missing", r.CCE.Points[0].LiquidVolume)
	}
	p := r.CVD.Points[1]
	if p.P != 15e6 || !cvd.IsMissing(p.ZGas) || !cvd.IsMissing(p.Dropout) || !cvd.IsMissing(p.Produced) || !cvd.IsMissing(p.CGR) || p.Gas != nil || p.Liquid != nil {
		t.Errorf("CVD point %+v, want 15 MPa and nothing else measured", p)
	}
	if r.CVD.Gas != nil || r.CVD.Liquid != nil || r.SaturationP != 21e6 {
		t.Errorf("CVD %+v, saturation %g", r.CVD, r.SaturationP)
	}

	// A spreadsheet's byte-order mark, quoted cells, spaces around cells and
	// rows of empty cells below the table; a note column holding text.
	cvdT = "\uFEFFpressure [MPa], \"z_gas\",NOTE_by_lab\n 20 ,\"0.9\",\"first, at 20 MPa\"\n15,0.88,x\n,,\n,,\n"
	st, err = parseLab(`saturation_pressure = "21 MPa"
cvd = "cvd.csv"`, map[string]string{"cvd.csv": cvdT})
	if err != nil {
		t.Fatal(err)
	}
	if pts := st.Lab.Report.CVD.Points; len(pts) != 2 || pts[0].P != 20e6 || pts[0].ZGas != 0.9 || pts[1].ZGas != 0.88 {
		t.Errorf("CVD points %+v, want 20 and 15 MPa with Z 0.9 and 0.88", pts)
	}
}

// labErrors each break one thing of the field report. The message must start
// with the study file and name the key; for a table, the table, row and
// column as given in msg.
var labErrors = []struct {
	name     string
	lab      string // the [lab] keys; "" for the field report's
	cvd, cce string // the tables; "" for the field report's
	key      string
	msg      string
}{
	{name: "empty section", lab: "#", key: "lab", msg: "empty section; [lab] holds the measured saturation_pressure"},
	{name: "temperature alone", lab: `temperature = "240 degF"`, key: "lab", msg: "only the temperature is given"},
	{name: "temperature out of range", lab: `temperature = "3000 degF"` + "\ncvd = \"lab/cvd.csv\"", key: "lab.temperature", msg: "out of range"},
	{name: "temperature without unit", lab: "temperature = 240\ncvd = \"lab/cvd.csv\"", key: "lab.temperature", msg: "has no unit"},
	{name: "saturation pressure out of range", lab: `saturation_pressure = "1e6 psia"`, key: "lab.saturation_pressure", msg: "out of range"},
	{name: "saturation pressure of a wrong kind", lab: `saturation_pressure = "4141 degF"`, key: "lab.saturation_pressure", msg: "unit of temperature"},
	{name: "unknown lab key", lab: `saturation = "4141 psia"`, key: "lab.saturation", msg: "cce, cvd, saturation_pressure, temperature"},
	{name: "table missing", lab: `cvd = "lab/nothing.csv"`, key: "lab.cvd", msg: "cannot use lab/nothing.csv: file does not exist"},
	{name: "absolute path", lab: `cvd = "/lab/cvd.csv"`, key: "lab.cvd", msg: "/lab/cvd.csv is an absolute path"},
	{name: "path out of the files", lab: `cvd = "../lab/cvd.csv"`, key: "lab.cvd", msg: "../lab/cvd.csv leads out of the files"},
	{name: "path empty", lab: `cvd = ""`, key: "lab.cvd", msg: "empty path"},

	{name: "empty file", cvd: "", key: "lab.cvd", msg: "lab/cvd.csv: empty file; want a header row"},
	{name: "blank lines only", cvd: "\n , ,\n\n", key: "lab.cvd", msg: "lab/cvd.csv: empty file"},
	{name: "header without rows", cvd: "pressure [psia],z_gas\n", key: "lab.cvd", msg: "lab/cvd.csv: the header (line 1) is followed by no rows"},
	{name: "not CSV", cvd: "pressure [psia],z_gas\n4141,0.9\"1\n", key: "lab.cvd", msg: `lab/cvd.csv: line 2, character 9: not valid CSV: bare " in non-quoted-field`},
	{name: "row too short", cvd: "pressure [psia],z_gas,z_two_phase\n4141,0.9,0.9\n3000,0.9\n", key: "lab.cvd",
		msg: "lab/cvd.csv, row 2 (line 3): 2 cells, but the header has 3 columns"},
	{name: "row too long", cvd: "pressure [psia],z_gas\n4141,0.9,\n", key: "lab.cvd", msg: "lab/cvd.csv, row 1 (line 2): 3 cells, but the header has 2 columns"},
	{name: "no pressure column", cvd: "z_gas,z_two_phase\n0.9,0.9\n", key: "lab.cvd", msg: "lab/cvd.csv: no pressure column"},
	{name: "pressure cell blank", cvd: "pressure [psia],z_gas\n4141,0.9\n,0.88\n", key: "lab.cvd",
		msg: `lab/cvd.csv, row 2 (line 3), column 1 "pressure [psia]": no pressure; every row needs its pressure`},
	{name: "pressure without unit", cvd: "pressure,z_gas\n4141,0.9\n", key: "lab.cvd",
		msg: `lab/cvd.csv, header (line 1), column 1 "pressure": the pressure needs its unit in brackets, such as "pressure [psia]"; one of atm, bara, barg, kPa, MPa, Pa, psia, psig`},
	{name: "pressure in psi", cvd: "pressure [psi],z_gas\n4141,0.9\n", key: "lab.cvd", msg: `psia or psig? "psi" does not say whether the pressure is absolute or gauge`},
	{name: "pressure unit unknown", cvd: "pressure [kpa],z_gas\n4141,0.9\n", key: "lab.cvd",
		msg: `column 1 "pressure [kpa]": unknown pressure unit "kpa"; want one of atm, bara, barg, kPa, MPa, Pa, psia, psig`},
	{name: "pressure unit of a length", cvd: "pressure [ft],z_gas\n4141,0.9\n", key: "lab.cvd", msg: "ft is a unit of length; want a pressure unit"},
	{name: "pressure out of range", cvd: "pressure [psia],z_gas\n4141,0.9\n0,0.9\n", key: "lab.cvd", msg: `row 2 (line 3), column 1 "pressure [psia]": "0 psia": out of range`},
	{name: "pressures not falling", cvd: strings.Replace(fieldCVD, "2500,3.1", "3600,3.1", 1), key: "lab.cvd",
		msg: `lab/cvd.csv, row 3 (line 4), column 1 "pressure [psia]": 3600 psia is not below the pressure of the row before (3500 psia): the pressures of a CVD fall`},
	{name: "pressure above saturation", cvd: strings.Replace(fieldCVD, "4141,0,0", "4150,0,0", 1), key: "lab.cvd",
		msg: `row 1 (line 2), column 1 "pressure [psia]": 4150 psia is above lab.saturation_pressure (4141 psia)`},
	{name: "no saturation pressure known", lab: `cvd = "lab/cvd.csv"`, cvd: strings.Replace(fieldCVD, "4141,0,0,", "4141,0.1,0,", 1), key: "lab.saturation_pressure",
		msg: "the CVD table lab/cvd.csv does not begin at the saturation pressure (a first row with liquid_dropout 0 and produced 0), so the saturation pressure cannot be known"},
	{name: "not a number", cvd: strings.Replace(fieldCVD, "3500,1.8,", "3500,1.8x,", 1), key: "lab.cvd",
		msg: `lab/cvd.csv, row 2 (line 3), column 2 "liquid_dropout [%]": "1.8x" is not a number`},
	{name: "hexadecimal", cvd: strings.Replace(fieldCVD, "3500,1.8,", "3500,0x1p0,", 1), key: "lab.cvd", msg: `"0x1p0" is not a number`},
	{name: "not finite", cvd: strings.Replace(fieldCVD, ",0.0246,", ",1e999,", 1), key: "lab.cvd", msg: `column 6 "gas_viscosity [cP]": 1e999 is too large`},
	{name: "dropout above 100 %", cvd: strings.Replace(fieldCVD, "3500,1.8,", "3500,104,", 1), key: "lab.cvd",
		msg: `row 2 (line 3), column 2 "liquid_dropout [%]": 104 % is out of range; want a liquid dropout (liquid volume over the cell volume at the saturation pressure) from 0 to 100 %`},
	{name: "dropout negative", cvd: strings.Replace(fieldCVD, "3500,1.8,", "3500,-1.8,", 1), key: "lab.cvd", msg: "-1.8 % is out of range"},
	{name: "dropout fraction above 1", cvd: strings.Replace(strings.Replace(fieldCVD, "liquid_dropout [%]", "liquid_dropout [fraction]", 1), "3500,1.8,", "3500,1.8,", 1), key: "lab.cvd",
		msg: `column 2 "liquid_dropout [fraction]": 1.8 is out of range; want a liquid dropout (liquid volume over the cell volume at the saturation pressure) from 0 to 1`},
	{name: "dropout unit unknown", cvd: strings.Replace(fieldCVD, "liquid_dropout [%]", "liquid_dropout [vol%]", 1), key: "lab.cvd",
		msg: `unknown unit "vol%" for a liquid dropout (liquid volume over the cell volume at the saturation pressure); want [%] or [fraction]`},
	{name: "dropout without unit", cvd: strings.Replace(fieldCVD, "liquid_dropout [%]", "liquid_dropout", 1), key: "lab.cvd", msg: "needs its unit in brackets: [%] or [fraction]"},
	{name: "produced falling", cvd: strings.Replace(fieldCVD, "2500,3.1,21.5", "2500,3.1,7.0", 1), key: "lab.cvd",
		msg: `row 3 (line 4), column 3 "produced [%]": 7.0 % is not above the cumulative production of row 2 (7.2 %)`},
	{name: "produced above 100 %", cvd: strings.Replace(fieldCVD, "1500,2.6,40.3", "1500,2.6,140.3", 1), key: "lab.cvd", msg: "140.3 % is out of range; want a cumulative production"},
	{name: "Z-factor zero", cvd: strings.Replace(fieldCVD, "0.874,0.881", "0,0.881", 1), key: "lab.cvd", msg: `column 4 "z_gas": 0 is out of range; want a Z-factor of the gas above 0`},
	{name: "two-phase Z negative", cvd: strings.Replace(fieldCVD, "0.874,0.881", "0.874,-0.881", 1), key: "lab.cvd", msg: "-0.881 is out of range; want a two-phase Z-factor above 0"},
	{name: "Z-factor with a unit", cvd: strings.Replace(fieldCVD, "z_gas,", "z_gas [%],", 1), key: "lab.cvd", msg: `column 4 "z_gas [%]": a Z-factor of the gas is a bare number`},
	{name: "viscosity unit unknown", cvd: strings.Replace(fieldCVD, "[cP]", "[cp]", 1), key: "lab.cvd", msg: `unknown unit "cp" for a gas viscosity; want one of cP,`},
	{name: "viscosity unit of a pressure", cvd: strings.Replace(fieldCVD, "[cP]", "[psia]", 1), key: "lab.cvd", msg: "psia is a unit of pressure; want a unit of viscosity"},
	{name: "viscosity zero", cvd: strings.Replace(fieldCVD, ",0.0246,", ",0,", 1), key: "lab.cvd", msg: "0 cP is out of range; want a gas viscosity above 0"},
	{name: "CGR negative", cvd: strings.Replace(fieldCVD, ",71,", ",-71,", 1), key: "lab.cvd", msg: "-71 STB/MMscf is out of range; want a condensate-gas ratio of 0 or more"},
	{name: "CGR without unit", cvd: strings.Replace(fieldCVD, "cgr [STB/MMscf]", "cgr", 1), key: "lab.cvd", msg: `a condensate-gas ratio needs its unit in brackets, such as "cgr [STB/MMscf]"`},
	{name: "CCE pressure twice", cce: strings.Replace(fieldCCE, "5000,0.9034", "6000,0.9034", 1), key: "lab.cce",
		msg: `lab/cce.csv, row 2 (line 3), column 1 "pressure [psia]": the pressure of row 1 again`},
	{name: "unknown column", cvd: strings.Replace(fieldCVD, ",note", ",dew", 1), key: "lab.cvd",
		msg: `column 17 "dew": unknown column "dew"; the columns of a CVD table are pressure, liquid_dropout, produced`},
	{name: "unknown component", cvd: strings.Replace(fieldCVD, "gas_C2 [mol%]", "gas_C9 [mol%]", 1), key: "lab.cvd",
		msg: `column 11 "gas_C9 [mol%]": "C9" is not a component of the study; the components of fluid.composition are N2, CO2, C1, C2, C3, nC4, C7+`},
	{name: "pseudo-component", cvd: strings.Replace(fieldCVD, "gas_C7+ [mol%]", "gas_C7 [mol%]", 1), key: "lab.cvd", msg: `"C7" is not a component of the study`},
	{name: "duplicate column", cvd: strings.Replace(fieldCVD, "z_two_phase", "Z_GAS", 1), key: "lab.cvd",
		msg: `header (line 1), column 5 "Z_GAS": z_gas measures the same quantity as column 4 "z_gas"; give each quantity once`},
	{name: "duplicate component in another case", cvd: strings.Replace(fieldCVD, "gas_C2 [mol%]", "GAS_c1 [fraction]", 1), key: "lab.cvd",
		msg: `column 11 "GAS_c1 [fraction]": gas_C1 measures the same quantity as column 10 "gas_C1 [mol%]"`},
	{name: "composition without unit", cvd: strings.Replace(fieldCVD, "gas_C2 [mol%]", "gas_C2", 1), key: "lab.cvd", msg: "needs its unit in brackets: [mol%], [%] or [fraction]"},
	{name: "composition sum off", cvd: strings.Replace(fieldCVD, "3500,1.8,7.2,0.874,0.881,0.0246,71,0.52,2.51,75.6", "3500,1.8,7.2,0.874,0.881,0.0246,71,0.52,2.51,74.9", 1), key: "lab.cvd",
		msg: "lab/cvd.csv, row 2 (line 3): the produced-gas composition sums to 99.3 mol %; want 100 within 0.5, since the columns cover every component"},
	{name: "composition sum high", cvd: strings.Replace(fieldCVD, ",6.42,", ",7.1,", 1), key: "lab.cvd", msg: "row 2 (line 3): the produced-gas composition sums to 100.68 mol %"},
	{name: "partial composition above 100", cvd: "pressure [psia],gas_C1 [mol%],gas_C2 [mol%]\n4141,95,6\n", key: "lab.cvd",
		msg: "row 1 (line 2): the produced-gas composition sums to 101 mol %, more than 100 (by more than 0.5) although its columns, or the cells given, cover only some"},
	{name: "composition above 100 %", cvd: strings.Replace(fieldCVD, ",6.42,", ",106.42,", 1), key: "lab.cvd", msg: "106.42 % is out of range; want the produced gas's mole fraction of C7+ from 0 to 100 %"},
	{name: "liquid composition before the last row", cvd: strings.Replace(fieldCVD, "4.83,,,", "4.83,27.0,,", 1), key: "lab.cvd",
		msg: `row 3 (line 4), column 15 "liquid_C1 [mol%]": a liquid composition is given on the last row only`},
	{name: "liquid composition above 100", cvd: strings.Replace(fieldCVD, "28.4,51.2", "58.4,51.2", 1), key: "lab.cvd", msg: "row 4 (line 5): the liquid composition sums to 109.6 mol %"},

	{name: "CCE relative volume zero", cce: strings.Replace(fieldCCE, "5000,0.9034", "5000,0", 1), key: "lab.cce",
		msg: `lab/cce.csv, row 2 (line 3), column 2 "relative_volume": 0 is out of range; want a relative volume (V/Vsat) above 0`},
	{name: "CCE liquid volume above 100 %", cce: strings.Replace(fieldCCE, "3500,1.1350,1.2", "3500,1.1350,101.2", 1), key: "lab.cce",
		msg: `column 3 "liquid_volume [% of saturation volume]": 101.2 % is out of range; want a liquid volume (% of saturation volume) from 0 to 100 %`},
	{name: "CCE liquid volume of no volume", cce: strings.Replace(fieldCCE, "[% of saturation volume]", "[%]", 1), key: "lab.cce",
		msg: "say which volume the liquid volume is a share of: [% of saturation volume], [% of total volume], [fraction of saturation volume] or [fraction of total volume]"},
	{name: "CCE liquid volume of another volume", cce: strings.Replace(fieldCCE, "[% of saturation volume]", "[% of gas volume]", 1), key: "lab.cce", msg: `unknown unit "% of gas volume" for the liquid volume`},
	{name: "CCE density unit unknown", cce: strings.Replace(fieldCCE, "[lb/ft3]", "[kg/l]", 1), key: "lab.cce",
		msg: `unknown unit "kg/l" for a density; want one of g/cm3, g/cm³, kg/m3, kg/m³, lb/ft3, lb/ft³`},
	{name: "CCE density negative", cce: strings.Replace(fieldCCE, "21.37", "-21.37", 1), key: "lab.cce", msg: "-21.37 lb/ft3 is out of range; want a density above 0"},
	{name: "CCE Z zero", cce: strings.Replace(fieldCCE, "1.0935", "0", 1), key: "lab.cce", msg: "want a single-phase Z-factor above 0"},
	{name: "CCE without pressures", cce: "relative_volume,z\n1,0.9\n", key: "lab.cce", msg: "lab/cce.csv: no pressure column"},
	{name: "CCE pressure blank", cce: strings.Replace(fieldCCE, "3500,1.1350", ",1.1350", 1), key: "lab.cce", msg: "row 4 (line 5), column 1 \"pressure [psia]\": no pressure"},
	{name: "CCE unknown column", cce: strings.Replace(fieldCCE, "z,", "z_gas,", 1), key: "lab.cce", msg: `unknown column "z_gas"; the columns of a CCE table are pressure, relative_volume`},
	{name: "CCE empty", cce: "\n", key: "lab.cce", msg: "lab/cce.csv: empty file"},
}

func TestLabErrors(t *testing.T) {
	for _, tt := range labErrors {
		t.Run(tt.name, func(t *testing.T) {
			lab := tt.lab
			if lab == "" {
				lab = "saturation_pressure = \"4141 psia\"\ncce = \"lab/cce.csv\"\ncvd = \"lab/cvd.csv\""
			}
			files := map[string]string{"lab/cvd.csv": fieldCVD, "lab/cce.csv": fieldCCE}
			if tt.cvd != "" || strings.HasPrefix(tt.name, "empty file") {
				files["lab/cvd.csv"] = tt.cvd
			}
			if tt.cce != "" {
				files["lab/cce.csv"] = tt.cce
			}
			st, err := parseLab(lab, files)
			if err == nil {
				t.Fatalf("no error; report %+v", st.Lab.Report)
			}
			var se *Error
			if !errors.As(err, &se) {
				t.Fatalf("error %v (%T) is not a *study.Error", err, err)
			}
			msg := err.Error()
			if !strings.HasPrefix(msg, "case.toml: ") {
				t.Errorf("error %q does not start with the study file", msg)
			}
			if se.Key != tt.key {
				t.Errorf("error %q names key %q, want %q", msg, se.Key, tt.key)
			}
			if !strings.Contains(msg, tt.msg) {
				t.Errorf("error %q\ndoes not say %q", msg, tt.msg)
			}
		})
	}
}

// One message in full: the study file, the key, the table, the row and its
// line, the column, and what is wrong.
func TestLabErrorForm(t *testing.T) {
	_, err := parseLab(`saturation_pressure = "4141 psia"
cvd = "lab/cvd.csv"`, map[string]string{"lab/cvd.csv": strings.Replace(fieldCVD, "3500,1.8,", "3500,104,", 1)})
	want := `case.toml: lab.cvd: lab/cvd.csv, row 2 (line 3), column 2 "liquid_dropout [%]": 104 % is out of range; ` +
		`want a liquid dropout (liquid volume over the cell volume at the saturation pressure) from 0 to 100 %`
	if err == nil || err.Error() != want {
		t.Errorf("error\n%v\nwant\n%s", err, want)
	}
}

// TestLabOperatingSystem: Read and Parse read the tables from the operating
// system's files, relative to the study file's folder, to the same report
// as ParseFS reads from memory; the paths are those of the operating system.
func TestLabOperatingSystem(t *testing.T) {
	dir := t.TempDir()
	if err := os.MkdirAll(filepath.Join(dir, "lab"), 0o755); err != nil {
		t.Fatal(err)
	}
	lab := "saturation_pressure = \"4141 psia\"\ncce = \"lab/cce.csv\"\ncvd = \"lab/cvd.csv\""
	for name, s := range map[string]string{"lab/cvd.csv": fieldCVD, "lab/cce.csv": fieldCCE, "case.toml": base + "\n[lab]\n" + lab} {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(s), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	mem, err := parseLab(lab, map[string]string{"lab/cvd.csv": fieldCVD, "lab/cce.csv": fieldCCE})
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, "case.toml")
	st, err := Read(path)
	if err != nil {
		t.Fatal(err)
	}
	if st.Lab.CVD != filepath.Join(dir, "lab", "cvd.csv") || st.Lab.CCE != filepath.Join(dir, "lab", "cce.csv") {
		t.Errorf("paths %q, %q; want the tables in %s/lab", st.Lab.CVD, st.Lab.CCE, dir)
	}
	// NaN != NaN: compare the reports as printed.
	if a, b := printed(st.Lab.Report), printed(mem.Lab.Report); a != b {
		t.Errorf("from the files:\n%s\nfrom memory:\n%s", a, b)
	}
	data, _ := os.ReadFile(path)
	st2, err := Parse(path, data)
	if err != nil || printed(st2.Lab.Report) != printed(mem.Lab.Report) {
		t.Errorf("Parse: %v, or a different report", err)
	}

	// A folder where a table should be is refused by name.
	if err := os.Mkdir(filepath.Join(dir, "lab", "folder.csv"), 0o755); err != nil {
		t.Fatal(err)
	}
	_, err = Parse(path, []byte(base+"\n[lab]\ncce = \"lab/folder.csv\"\n"))
	var se *Error
	if !errors.As(err, &se) || se.Key != "lab.cce" || !strings.Contains(err.Error(), "folder.csv is a folder, not a regular file") {
		t.Errorf("a folder as a table: %v", err)
	}
	// A table error names the table by its path from the working folder.
	bad := strings.Replace(fieldCVD, "3500,1.8,", "3500,x,", 1)
	if err := os.WriteFile(filepath.Join(dir, "lab", "cvd.csv"), []byte(bad), 0o644); err != nil {
		t.Fatal(err)
	}
	_, err = Read(path)
	if want := path + ": lab.cvd: " + filepath.Join(dir, "lab", "cvd.csv") + `, row 2 (line 3), column 2 "liquid_dropout [%]": "x" is not a number`; err == nil || !strings.HasPrefix(err.Error(), want) {
		t.Errorf("error %v\nwant it to start %s", err, want)
	}
}

// printed writes a report with %v, in which Missing values print as NaN.
func printed(r *cvd.LabReport) string {
	if r == nil {
		return "<nil>"
	}
	return fmt.Sprintf("%v %v %+v %+v", r.T, r.SaturationP, *r.CCE, *r.CVD)
}

// ParseFS refuses a study file that is not a regular one, as Read does.
func TestParseFSStudyFile(t *testing.T) {
	fsys := fstest.MapFS{"dir/x.txt": {Data: []byte("")}}
	_, err := ParseFS(fsys, "dir")
	if err == nil || !strings.Contains(err.Error(), "dir: is a folder, not a regular file") {
		t.Errorf("a folder as the study: %v", err)
	}
	_, err = ParseFS(fsys, "none.toml")
	if err == nil || !strings.Contains(err.Error(), "none.toml: cannot read the study file: file does not exist") {
		t.Errorf("no study: %v", err)
	}
	// In a subfolder, the tables are found beside the study.
	fsys = fstest.MapFS{"study/case.toml": {Data: []byte(base + "\n[lab]\ncvd = \"lab/cvd.csv\"\nsaturation_pressure = \"4141 psia\"\n")},
		"study/lab/cvd.csv": {Data: []byte(fieldCVD)}}
	st, err := ParseFS(fsys, "study/case.toml")
	if err != nil || st.Lab.CVD != "study/lab/cvd.csv" || len(st.Lab.Report.CVD.Points) != 4 {
		t.Errorf("study in a subfolder: %v, %+v", err, st)
	}
}
