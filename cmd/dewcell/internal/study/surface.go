package study

import (
	"fmt"

	"dewcell/cmd/dewcell/internal/units"
)

// Surface holds the [surface] section: the producing separator data of a
// well, all that the quick-look estimate of gas and condensate in place
// needs. Ratios are at the study's standard conditions.
type Surface struct {
	// Stages lists the gas of each separator stage, the stock tank
	// included, in the order of the file.
	Stages []SurfaceStage
	// OilAPI and OilSG are the stock-tank oil's API gravity and 60/60 degF
	// specific gravity: exactly one is given, the other is 0.
	OilAPI, OilSG float64
	// OilM is the stock-tank oil's measured molar mass, kg/mol; 0 when not
	// given (a correlation then supplies it).
	OilM float64
	// N2, CO2 and H2S are the mole fractions of the well stream.
	N2, CO2, H2S float64
	// Correlation names the pseudo-critical correlation: one of
	// SurfaceCorrelations; the first when not given.
	Correlation string
}

// A SurfaceStage is the gas of one separator stage.
type SurfaceStage struct {
	GOR     float64 // standard m³ of this stage's gas per m³ of stock-tank oil
	Gravity float64 // specific gravity of the gas, air = 1
}

// SurfaceCorrelations are the values of surface.correlation; the first is
// the default.
var SurfaceCorrelations = []string{"sutton", "standing-natural-gas", "standing-condensate"}

// Limits on [surface] values. They catch unit and typing mistakes (a
// gravity in kg/m3, an API gravity for a specific gravity) rather than bound
// physics closely; common practice, no published source. The correlations
// check their own, narrower ranges.
const (
	maxGasGravity   = 5.0
	maxOilAPI       = 150.0
	maxOilSG        = 1.5
	maxOilMolarMass = 1000.0 // g/mol
)

type fileSurface struct {
	Stage       []fileSurfaceStage `toml:"stage"`
	OilAPI      value              `toml:"oil_api"`
	OilSG       value              `toml:"oil_specific_gravity"`
	OilM        value              `toml:"oil_molar_mass"`
	Correlation value              `toml:"correlation"`
	Impurities  *fileImpurities    `toml:"impurities"`
}

type fileSurfaceStage struct {
	GOR     value `toml:"gor"`
	Gravity value `toml:"gas_gravity"`
}

type fileImpurities struct {
	N2  value `toml:"N2"`
	CO2 value `toml:"CO2"`
	H2S value `toml:"H2S"`
}

func (r *reader) surface(s *Study, f *fileSurface) {
	if f == nil {
		return
	}
	sf := &Surface{}
	if len(f.Stage) == 0 {
		r.missing("surface.stage", `one [[surface.stage]] table per separator stage and the stock tank, each with gor = "6500 scf/STB" and gas_gravity = 0.68`)
		return
	}
	total := 0.0
	for i, st := range f.Stage {
		k := fmt.Sprintf("surface.stage[%d]", i+1)
		gor, _ := r.quantity(k+".gor", st.GOR, units.GasOilRatio, true)
		g, _ := r.between(k+".gas_gravity", st.Gravity, "a gas specific gravity (air = 1)", true, 0, maxGasGravity, true, false)
		total += gor
		sf.Stages = append(sf.Stages, SurfaceStage{GOR: gor, Gravity: g})
	}
	if r.err == nil && !(total > 0) {
		r.failf("surface.stage", "every stage's gor is zero: the well makes no surface gas")
	}

	api, hasAPI := r.between("surface.oil_api", f.OilAPI, "an API gravity", false, 0, maxOilAPI, true, false)
	sg, hasSG := r.between("surface.oil_specific_gravity", f.OilSG, "a stock-tank oil specific gravity (60/60 degF, water = 1)", false, 0, maxOilSG, true, false)
	switch {
	case r.err != nil:
	case hasAPI && hasSG:
		r.failf("surface.oil_specific_gravity", "give either surface.oil_api or surface.oil_specific_gravity, not both")
	case !hasAPI && !hasSG:
		r.missing("surface.oil_api", "the stock-tank oil's API gravity, such as oil_api = 48.5 (or oil_specific_gravity = 0.786)")
	}
	sf.OilAPI, sf.OilSG = api, sg
	if m, ok := r.between("surface.oil_molar_mass", f.OilM, "the stock-tank oil molar mass in g/mol", false, 0, maxOilMolarMass, true, false); ok {
		sf.OilM = m / 1000 // g/mol to kg/mol
	}
	sf.Correlation = r.choice("surface.correlation", f.Correlation, SurfaceCorrelations[0], SurfaceCorrelations...)

	if im := f.Impurities; im != nil {
		pct := func(k string, v value) float64 {
			x, _ := r.between(k, v, "a mole percent of the well stream", false, 0, 100, false, true)
			return x / 100
		}
		sf.N2 = pct("surface.impurities.N2", im.N2)
		sf.CO2 = pct("surface.impurities.CO2", im.CO2)
		sf.H2S = pct("surface.impurities.H2S", im.H2S)
		if sum := sf.N2 + sf.CO2 + sf.H2S; r.err == nil && sum >= 1 {
			r.failf("surface.impurities", "N2, CO2 and H2S add up to %g mol %%, leaving no hydrocarbons", 100*sum)
		}
	}
	s.Surface = sf
}
