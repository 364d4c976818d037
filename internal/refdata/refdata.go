// Package refdata reads the Peng–Robinson reference values of
// testdata/pr-open.json for the tests of eos, cvd and cmd/dewcell, and builds
// the two reference fluids of that file: the 9-component synthetic gas
// condensate O9 and methane + n-butane.
//
// The values are computed, not measured: they come from an independent
// general-purpose open-source Peng–Robinson library (CalebBell/thermo 0.6.1,
// PR78, no volume shift), each recomputed by a separate straightforward
// re-implementation of the same equations. They say whether this project
// solves the same equations with the same constants, not whether PR describes
// a real fluid. How they were made, the library versions and the consistency
// checks are in testdata/pr-open.md.
//
// The file is found from this package's own source directory, so the tests
// that use it do not depend on the working directory. It is read and decoded
// once. Units are those of the file (K, Pa, g/mol, kg/m³, mole fractions,
// percentages where a field name says pct) except in the fluids the builders
// return, whose molar masses are in kg/mol.
package refdata

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"sync"

	"dewcell/eos"
)

// File is the base name of the reference file, for messages.
const File = "pr-open.json"

// Path returns the location of testdata/pr-open.json: two directories above
// this package's source directory, at the module root. The source directory
// is the one the compiler recorded, so a build with -trimpath cannot find it.
func Path() (string, error) {
	_, self, _, ok := runtime.Caller(0)
	if !ok {
		return "", errors.New(File + ": cannot locate the refdata package source to find testdata")
	}
	if !filepath.IsAbs(self) {
		return "", fmt.Errorf("%s: the refdata package source is recorded as %q, not an absolute path (built with -trimpath?), so testdata cannot be found", File, self)
	}
	return filepath.Join(filepath.Dir(self), "..", "..", "testdata", File), nil
}

// Data is the part of pr-open.json the tests read.
type Data struct {
	Meta   Meta   `json:"meta"`
	Pure   Pure   `json:"pure"`
	Binary Binary `json:"binary"`
	O9     O9     `json:"o9"`
}

// Meta is the provenance and the unit constants of the file.
type Meta struct {
	SourceNote    string  `json:"source_note"`
	ThermoVersion string  `json:"thermo_version"`
	PsiPa         float64 `json:"psi_Pa"` // Pa per psi
}

// Component holds the constants of one component as the file gives them.
type Component struct {
	Name  string  `json:"name"`
	TcK   float64 `json:"Tc_K"`
	PcPa  float64 `json:"Pc_Pa"`
	Omega float64 `json:"omega"`
	MW    float64 `json:"MW"` // g/mol
}

// EOS converts the constants to an eos.Component, molar mass in kg/mol.
func (c Component) EOS() eos.Component {
	return eos.Component{Name: c.Name, M: c.MW / 1000, Tc: c.TcK, Pc: c.PcPa, Omega: c.Omega}
}

// Pure is part A: PR78 vapour pressures of pure components.
type Pure struct {
	Components  []PureComponent `json:"components"`
	Sensitivity Sensitivity     `json:"sensitivity"`
}

// PureComponent is one component of part A and its vapour pressures.
type PureComponent struct {
	Component
	Cases []PureCase `json:"cases"`
}

// PureCase is a vapour pressure at one reduced temperature.
type PureCase struct {
	Tr     float64 `json:"Tr"`
	TK     float64 `json:"T_K"`
	PsatPa float64 `json:"Psat_Pa"`
}

// Sensitivity is the vapour pressure of n-decane at one temperature with the
// PR78 and the PR76 kappa.
type Sensitivity struct {
	TK         float64 `json:"T_K"`
	PR78PsatPa float64 `json:"PR78_Psat_Pa"`
	PR76PsatPa float64 `json:"PR76_kappa_Psat_Pa"`
}

// Binary is part B: methane + n-butane.
type Binary struct {
	Components []string     `json:"components"` // names of part A components
	Kij        [][]float64  `json:"kij"`
	TK         float64      `json:"T_K"`
	TF         float64      `json:"T_F"`
	Flashes    []Flash      `json:"flashes"`
	Saturation []Saturation `json:"saturation"`
}

// Flash is a PT flash. TK, TF, FractionOfPdew, Phases, MWL and MWV are given
// for the O9 flashes only, and are zero in the binary ones.
type Flash struct {
	TK             float64   `json:"T_K"`
	TF             float64   `json:"T_F"`
	PPa            float64   `json:"P_Pa"`
	PPsia          float64   `json:"P_psia"`
	FractionOfPdew float64   `json:"fraction_of_Pdew"`
	Z              []float64 `json:"z"`
	Phases         int       `json:"phases"`
	VapourFraction float64   `json:"vapour_fraction"`
	X              []float64 `json:"x"`
	Y              []float64 `json:"y"`
	ZL             float64   `json:"Z_L"`
	ZV             float64   `json:"Z_V"`
	RhoL           float64   `json:"rho_L_kg_m3"`
	RhoV           float64   `json:"rho_V_kg_m3"`
	MWL            float64   `json:"MW_L"` // g/mol
	MWV            float64   `json:"MW_V"` // g/mol
}

// Saturation is the saturation points of one binary feed.
type Saturation struct {
	Z      []float64  `json:"z"`
	Points []SatPoint `json:"points"`
}

// SatPoint is one saturation point.
type SatPoint struct {
	Branch    string    `json:"branch"` // "upper" or "lower"
	Type      string    `json:"type"`   // "bubble", "dew" or "none"
	PPa       float64   `json:"P_Pa"`
	PPsia     float64   `json:"P_psia"`
	Incipient []float64 `json:"incipient"`
}

// O9 is part C: the synthetic gas condensate O9 at 220 °F.
type O9 struct {
	TK         float64       `json:"T_K"`
	TF         float64       `json:"T_F"`
	Components []O9Component `json:"components"`
	Kij        [][]float64   `json:"kij"`
	DewPoint   DewPoint      `json:"dew_point"`
	Flashes    []Flash       `json:"flashes"`
	CVD        CVD           `json:"cvd"`
	CCE        CCE           `json:"cce"`
}

// O9Component is a component of O9 and its mole fraction in the feed.
type O9Component struct {
	Component
	Z float64 `json:"z"`
}

// DewPoint is the upper dew point of O9 and its incipient liquid.
type DewPoint struct {
	Type        string    `json:"type"`
	PPa         float64   `json:"P_Pa"`
	PPsia       float64   `json:"P_psia"`
	Incipient   []float64 `json:"incipient_liquid_x"`
	IncipientMW float64   `json:"incipient_MW"` // g/mol
	ZFeed       float64   `json:"Z_feed"`
	ZIncipient  float64   `json:"Z_incipient"`
	RhoFeed     float64   `json:"rho_feed_kg_m3"`
	RhoInc      float64   `json:"rho_incipient_kg_m3"`
}

// CVD is the constant-volume depletion of O9; the first row is the dew point.
type CVD struct {
	Rows []CVDRow `json:"rows"`
}

// CVDRow is one depletion step. At the dew point LiquidX is nil, RhoV is nil
// and RhoL is zero: the cell holds one phase.
type CVDRow struct {
	PPa            float64   `json:"P_Pa"`
	PPsia          float64   `json:"P_psia"`
	DropoutPct     float64   `json:"liquid_dropout_pct_of_Vdew"`
	ProducedPct    float64   `json:"cum_produced_mol_pct"`
	ZV             float64   `json:"Z_V"`
	ZTwoPhase      float64   `json:"Z_two_phase"`
	VapourFraction float64   `json:"vapour_fraction"`
	ProducedY      []float64 `json:"produced_y"`
	LiquidX        []float64 `json:"liquid_x"`
	MolesInCell    float64   `json:"moles_in_cell"`
	RhoL           float64   `json:"rho_L_kg_m3"`
	RhoV           *float64  `json:"rho_V_kg_m3"`
}

// CCE is the constant-composition expansion of O9.
type CCE struct {
	VDew float64  `json:"V_dew_m3_per_mol"`
	ZDew float64  `json:"Z_dew"`
	Rows []CCERow `json:"rows"`
}

// CCERow is one expansion step. Region is "single phase", "dew point" or
// "two phase"; a field the file does not give for that region is nil: Z in
// two phases, Rho at the dew point and in two phases, ZTwoPhase and
// VapourFraction in one phase.
type CCERow struct {
	PPa            float64  `json:"P_Pa"`
	PPsia          float64  `json:"P_psia"`
	Region         string   `json:"region"`
	RelativeVolume float64  `json:"relative_volume"`
	LiquidPct      float64  `json:"liquid_volume_pct_of_Vdew"`
	Z              *float64 `json:"Z"`
	Rho            *float64 `json:"rho_kg_m3"`
	ZTwoPhase      *float64 `json:"Z_two_phase"`
	VapourFraction *float64 `json:"vapour_fraction"`
}

// Value returns *p, or NaN where the file does not give the value (p nil):
// a NaN fails every comparison, so a missing reference value cannot pass.
func Value(p *float64) float64 {
	if p == nil {
		return math.NaN()
	}
	return *p
}

// Load returns the decoded file, or the error that reading or decoding it
// gave; it reads the file on the first call only. The Data is shared:
// callers must not change it.
func Load() (*Data, error) { return loadOnce() }

var loadOnce = sync.OnceValues(load)

func load() (*Data, error) {
	path, err := Path()
	if err != nil {
		return nil, err
	}
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	d := new(Data)
	if err := json.Unmarshal(b, d); err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	if len(d.Pure.Components) == 0 || len(d.Binary.Flashes) == 0 || len(d.Binary.Saturation) == 0 ||
		len(d.O9.Components) == 0 || len(d.O9.Flashes) == 0 || d.O9.DewPoint.PPa == 0 ||
		len(d.O9.CVD.Rows) < 2 || len(d.O9.CCE.Rows) == 0 {
		return nil, fmt.Errorf("%s: a section the tests need is missing or empty", path)
	}
	return d, nil
}

// flatKij turns the file's n×n rows into the row-major slice eos.NewFluid takes.
func flatKij(rows [][]float64, n int) ([]float64, error) {
	if len(rows) != n {
		return nil, fmt.Errorf("%s: kij has %d rows for %d components", File, len(rows), n)
	}
	k := make([]float64, 0, n*n)
	for i, r := range rows {
		if len(r) != n {
			return nil, fmt.Errorf("%s: kij row %d has %d entries for %d components", File, i, len(r), n)
		}
		k = append(k, r...)
	}
	return k, nil
}

// O9Fluid builds the synthetic gas condensate O9 (pr-open.md, part C):
// constants and kij as the file gives them, PR78, no volume shift. It
// returns the fluid and the feed mole fractions, both new on every call.
func O9Fluid() (*eos.Fluid, []float64, error) {
	d, err := Load()
	if err != nil {
		return nil, nil, err
	}
	comps := make([]eos.Component, len(d.O9.Components))
	z := make([]float64, len(d.O9.Components))
	for i, c := range d.O9.Components {
		comps[i] = c.EOS()
		z[i] = c.Z
	}
	kij, err := flatKij(d.O9.Kij, len(comps))
	if err != nil {
		return nil, nil, err
	}
	fl, err := eos.NewFluid(comps, kij, eos.Options{Equation: eos.PR78})
	if err != nil {
		return nil, nil, fmt.Errorf("%s: O9: %w", File, err)
	}
	if err := fl.CheckComposition(z); err != nil {
		return nil, nil, fmt.Errorf("%s: O9 feed: %w", File, err)
	}
	return fl, z, nil
}

// BinaryFluid builds methane + n-butane with kij 0.02 (pr-open.md, part B),
// constants from the pure-component part of the file, PR78, no volume shift.
// The fluid is new on every call.
func BinaryFluid() (*eos.Fluid, error) {
	d, err := Load()
	if err != nil {
		return nil, err
	}
	byName := map[string]eos.Component{}
	for _, c := range d.Pure.Components {
		byName[c.Name] = c.EOS()
	}
	var comps []eos.Component
	for _, name := range d.Binary.Components {
		c, ok := byName[name]
		if !ok {
			return nil, fmt.Errorf("%s: binary component %q has no constants in part 'pure'", File, name)
		}
		comps = append(comps, c)
	}
	kij, err := flatKij(d.Binary.Kij, len(comps))
	if err != nil {
		return nil, err
	}
	fl, err := eos.NewFluid(comps, kij, eos.Options{Equation: eos.PR78})
	if err != nil {
		return nil, fmt.Errorf("%s: methane + n-butane: %w", File, err)
	}
	return fl, nil
}
