package mbal

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"

	"dewcell/eos"
	"dewcell/internal/phys"
)

// Heating value of gas: the ideal gross (higher) heating value of a
// composition from the component values of GPA 2145, its real-gas value per
// standard volume (GPA 2172 practice: the ideal value per ideal volume
// divided by the gas's Z), the summation-factor Z of GPA 2172, and the
// liquid densities at 60 °F that turn recovered natural-gas liquids into a
// volume.
//
// References:
//
//   - GPA Midstream Association (2016). Table of Physical Properties for
//     Hydrocarbons and Other Compounds of Interest to the Natural Gas and
//     Natural Gas Liquids Industries. GPA Midstream Standard 2145-16, Tulsa.
//     The values below are those of a public transcription of its table in
//     field units (pyngl, an open-source package for natural-gas-liquids
//     calculations, file src/thermo/gpa_2145.py). The heating values of C1
//     to nC6 and H2S agree with a second, independent transcription of an
//     earlier edition (Choquette, G. (2014), GasCombustionProperties, an
//     open-source class for the combustion properties of fuel gases, which
//     does not name its edition) except n-pentane, 4008.7 here and 4008.9
//     Btu/ft³ there (and n-heptane and n-octane, 5502.6/5502.5 and
//     6249.0/6248.9), which we read as the change of edition.
//   - GPA Midstream Association. Calculation of Gross Heating Value,
//     Relative Density, Compressibility and Theoretical Hydrocarbon Liquid
//     Content for Natural Gas Mixtures for Custody Transfer. GPA 2172-09
//     (reaffirmed 2019): Z = 1 − (Σ yᵢ bᵢ)² with the summation factors bᵢ
//     of GPA 2145, and the real-gas heating value H/Z.
//   - American Gas Association (2009). AGA Report No. 5, Natural Gas Energy
//     Measurement, and its calculation spreadsheet in imperial units, whose
//     example (a pipeline gas at 14.73 psia, 60 °F: Z = 0.997776 and a real
//     gross heating value of 1034.8 Btu_IT/ft³) these GPA 2145-16 values and
//     summation factors reproduce to its printed digits (heating_test.go).

// JoulesPerBtu is the International Table British thermal unit,
// 1055.05585262 J exactly: 1 Btu_IT/(lb·°F) is 1 cal_IT/(g·°C) =
// 4.1868 J/(g·K), so 1 Btu_IT = 4.1868 J/(g·K) × 453.59237 g × 5/9 K (NIST
// SP 811, Appendix B.8 and B.9).
const JoulesPerBtu = 4.1868 * 1000 * phys.KgPerPound * phys.KelvinPerRankine

// gpaMolesPerFt3 is the amount of ideal gas in one cubic foot at the GPA
// 2145 base conditions, 60 °F and 14.696 psia: p V/(R T) =
// 1.19529110617… mol (379.4828 ft³/lbmol). GPA 2145 computes it with the
// gas constant of its day (8.314472 J/(mol·K) in the 2009 edition, from
// memory); the difference from the exact R of the 2019 SI, about 1e-6, is
// ignored.
const gpaMolesPerFt3 = phys.FieldStandardP * phys.M3PerFt3 / (phys.R * phys.FieldStandardT)

// gpaJPerMolPerBtuFt3 turns a heating value in Btu per ideal ft³ at 60 °F,
// 14.696 psia into J/mol: 882.6769… J/mol per Btu/ft³.
const gpaJPerMolPerBtuFt3 = JoulesPerBtu / gpaMolesPerFt3

// m3PerUSGallon is the US liquid gallon (phys.M3PerUSGallon, exact).
const m3PerUSGallon = phys.M3PerUSGallon

// gpaEntry is one line of the GPA 2145-16 table, in the table's own field
// units. A zero heating value is a heating value of zero (a
// non-combustible); a zero summation factor or ftGal means the table gives
// no value.
type gpaEntry struct {
	m     float64 // molar mass, g/mol (GPA's, used only with ftGal)
	hv    float64 // ideal gross heating value, Btu per ideal ft³ at 60 °F, 14.696 psia
	sf    float64 // summation factor √(1 − Z) at 60 °F, 14.696 psia, dimensionless
	ftGal float64 // ideal gas at 60 °F, 14.696 psia per US gallon of liquid at 60 °F, ft³/gal
}

// gpa2145 holds GPA 2145-16 values for the component library's names (see
// the references above: every number from its field-unit table, as
// transcribed, except where a line says otherwise). Non-combustibles have a
// gross heating value of zero by definition. The liquid densities (ftGal)
// are those of the liquid at 60 °F under its own vapour pressure where that
// exceeds 14.696 psia; methane and nitrogen are above their critical
// temperatures at 60 °F, so their entries cannot be the density of a real
// liquid there, and they are used as the table gives them. The n-heptane and
// n-octane lines are here for fluids that name them and for the
// pseudo-component fit below. The example of AGA Report No. 5 checks the
// heating values and summation factors of N2, CO2 and C1 to nC6 together
// (heating_test.go); those of H2S, nC7 and nC8 rest on the transcription
// alone, and the heating value of H2S on the second one as well.
var gpa2145 = map[string]gpaEntry{
	"N2":  {m: 28.0134, hv: 0, sf: 0.01696, ftGal: 91.128},
	"CO2": {m: 44.0095, hv: 0, sf: 0.0748, ftGal: 58.746},
	"H2S": {m: 34.0809, hv: 637.10, sf: 0.0917, ftGal: 74.16},
	"C1":  {m: 16.0425, hv: 1010.0, sf: 0.04438, ftGal: 59.138},
	"C2":  {m: 30.0690, hv: 1769.7, sf: 0.0913, ftGal: 37.488},
	"C3":  {m: 44.0956, hv: 2516.1, sf: 0.1329, ftGal: 36.391},
	"iC4": {m: 58.1222, hv: 3251.9, sf: 0.1690, ftGal: 30.637},
	"nC4": {m: 58.1222, hv: 3262.3, sf: 0.1801, ftGal: 31.801},
	"iC5": {m: 72.1488, hv: 4000.9, sf: 0.2206, ftGal: 27.414},
	"nC5": {m: 72.1488, hv: 4008.7, sf: 0.2323, ftGal: 27.658},
	"nC6": {m: 86.1754, hv: 4755.9, sf: 0.2973, ftGal: 24.380},
	"nC7": {m: 100.2019, hv: 5502.6, sf: 0.3646, ftGal: 21.730},
	"nC8": {m: 114.2285, hv: 6249.0, sf: 0.4326, ftGal: 19.570},
	// Non-combustibles outside the component library: zero by definition;
	// the table's other entries for them are not carried.
	"H2O": {},
	"He":  {},
}

// Molar masses of the CH2 group and of the H2 that closes an n-paraffin
// CnH2n+2, g/mol, from the atomic weights C 12.0107 and H 1.00794 that
// reproduce the GPA 2145 molar masses of the n-paraffins (nC6: 6 × 12.0107
// + 14 × 1.00794 = 86.17536).
const (
	massCH2 = 12.0107 + 2*1.00794
	massH2  = 2 * 1.00794
)

// ParaffinCarbonNumber returns the carbon number n, not rounded, of the
// n-paraffin CnH2n+2 whose molar mass is m (kg/mol):
// n = (m − M_H2)/M_CH2.
func ParaffinCarbonNumber(m float64) float64 {
	return (m*1000 - massH2) / massCH2
}

// paraffinLine is the least-squares line y = a + b n through the table's
// n-paraffins nC5 to nC8 of the quantity that get picks from an entry.
func paraffinLine(get func(gpaEntry) float64) (a, b float64) {
	names := [...]string{"nC5", "nC6", "nC7", "nC8"}
	var sn, sy float64
	for _, name := range names {
		e := gpa2145[name]
		sn += ParaffinCarbonNumber(e.m / 1000)
		sy += get(e)
	}
	k := float64(len(names))
	nm, ym := sn/k, sy/k
	var sxy, sxx float64
	for _, name := range names {
		e := gpa2145[name]
		dn := ParaffinCarbonNumber(e.m/1000) - nm
		sxy += dn * (get(e) - ym)
		sxx += dn * dn
	}
	b = sxy / sxx
	return ym - b*nm, b
}

// The pseudo-component lines: gross heating value (Btu/ft³) and summation
// factor against carbon number. Through the 2145-16 values of nC5 to nC8
// the heating value rises by 746.76 Btu/ft³ per CH2 group (the differences
// are 747.2, 746.7 and 746.4) and the line reproduces the table's n-alkanes
// within 0.3 Btu/ft³, and an earlier edition's n-nonane, outside the fit
// (6996.5), within 0.6 (heating_test.go).
var (
	pseudoHVa, pseudoHVb = paraffinLine(func(e gpaEntry) float64 { return e.hv })
	pseudoSFa, pseudoSFb = paraffinLine(func(e gpaEntry) float64 { return e.sf })
)

// Errors of the heating-value and plant calculations.
var (
	// ErrBadGas reports an unusable gas composition or amount.
	ErrBadGas = errors.New("invalid gas composition")
	// ErrNoProperty reports a component for which no heating value,
	// summation factor or liquid density is known.
	ErrNoProperty = errors.New("no value known for the component")
)

// gpaLookup finds the table entry of a component by its name or, for an
// alias of the component library (C6 for nC6), its canonical name.
func gpaLookup(name string) (gpaEntry, bool) {
	if e, ok := gpa2145[name]; ok {
		return e, true
	}
	if c, ok := eos.LibraryComponent(name); ok {
		e, ok := gpa2145[c.Name]
		return e, ok
	}
	return gpaEntry{}, false
}

// minPseudoMass is the molar mass above which a component that is not in
// the table is taken as a pseudo-component (an n-paraffin equivalent):
// heavier than the pentanes, 72.1488 g/mol.
const minPseudoMass = 0.0721488

// tableNames lists the names the table knows, for error messages.
func tableNames() string {
	names := make([]string, 0, len(gpa2145))
	for n := range gpa2145 {
		names = append(names, n)
	}
	sort.Strings(names)
	return strings.Join(names, ", ")
}

// ComponentHeatingValue returns the ideal gross heating value of component
// c, J/mol, at the GPA 2145 reference of 60 °F (the combustion and the
// metering temperature) and 14.696 psia: the heat given out by burning one
// mole of the ideal gas completely in air with the water formed condensed
// to liquid, everything at 60 °F.
//
// A component of the table (by name, or by the library alias C6) takes the
// table's value converted exactly: H [J/mol] = H [Btu/ft³] × 1055.05585262
// J/Btu ÷ p V/(R T) mol/ft³ at 60 °F, 14.696 psia. N2, CO2, H2O and He give
// 0; H2S burns to SO2 and water and has 637.1 Btu/ft³.
//
// Any other component heavier than the pentanes (M > 72.1488 g/mol) is
// taken as a pseudo-component, a heavy fraction such as "C7-C11": it is
// given the heating value of the hypothetical n-paraffin of the same molar
// mass, H = a + b n with n = ParaffinCarbonNumber(M) and the line a + b n
// fitted to the table's n-paraffins nC5 to nC8 (b = 746.76 Btu/ft³ per CH2
// group; the gross heat of combustion of a homologous series rises by a
// nearly constant amount per CH2). This is a fit to the table, not a
// published correlation, and its specific gravity is not used: a real heavy
// fraction holds naphthenes and aromatics, with less hydrogen per carbon
// than the n-paraffin of the same molar mass, so the estimate is high for
// it — by a few per cent for a naphthene and by more for an aromatic (from
// memory of the GPA values of cyclohexane and benzene, not checked here).
// A pseudo-component is usually a small part of a sales gas. A lighter
// component that the table does not know is an error wrapping
// ErrNoProperty.
func ComponentHeatingValue(c eos.Component) (float64, error) {
	if e, ok := gpaLookup(c.Name); ok {
		return e.hv * gpaJPerMolPerBtuFt3, nil
	}
	if c.M > minPseudoMass && !math.IsInf(c.M, 0) {
		n := ParaffinCarbonNumber(c.M)
		return (pseudoHVa + pseudoHVb*n) * gpaJPerMolPerBtuFt3, nil
	}
	return 0, fmt.Errorf("%w: no heating value for %s (M = %g kg/mol): the table has %s, and a pseudo-component must be heavier than %g kg/mol",
		ErrNoProperty, c.Name, c.M, tableNames(), minPseudoMass)
}

// compositionTolerance is how far from 1 the mole fractions of a gas may sum.
const compositionTolerance = 1e-6

// checkGas checks that y is a composition of comps: as many entries, all
// finite and non-negative, summing to 1 within 1e-6. It returns the sum.
func checkGas(comps []eos.Component, y []float64) (float64, error) {
	if len(comps) == 0 {
		return 0, fmt.Errorf("%w: no components", ErrBadGas)
	}
	if len(y) != len(comps) {
		return 0, fmt.Errorf("%w: %d mole fractions for %d components", ErrBadGas, len(y), len(comps))
	}
	s := 0.0
	for i, v := range y {
		if math.IsNaN(v) || math.IsInf(v, 0) || v < 0 {
			return 0, fmt.Errorf("%w: mole fraction of %s = %g, want a finite value >= 0", ErrBadGas, comps[i].Name, v)
		}
		s += v
	}
	if math.Abs(s-1) > compositionTolerance {
		return 0, fmt.Errorf("%w: mole fractions sum to %.10g, want 1 within %g", ErrBadGas, s, compositionTolerance)
	}
	return s, nil
}

// GrossHeatingValue returns the ideal gross heating value of a gas of
// components comps and mole fractions y, J/mol of ideal gas at 60 °F,
// 14.696 psia: Σ yᵢ Hᵢ with Hᵢ from ComponentHeatingValue (GPA 2172). y
// must sum to 1 within 1e-6; it is used as given, not normalised. A
// component of zero mole fraction needs no heating value. Errors
// wrap ErrBadGas (the composition) or ErrNoProperty (a component without a
// heating value).
//
// IdealGrossBtuPerFt3 converts the result to Btu per ideal ft³ at 60 °F,
// 14.696 psia; HeatingValuePerVolume gives the real-gas value per standard
// volume.
func GrossHeatingValue(comps []eos.Component, y []float64) (idealPerMol float64, err error) {
	if _, err := checkGas(comps, y); err != nil {
		return 0, err
	}
	for i, c := range comps {
		if y[i] == 0 {
			continue // absent (removed by the plant, say): its heating value does not matter
		}
		h, err := ComponentHeatingValue(c)
		if err != nil {
			return 0, err
		}
		idealPerMol += y[i] * h
	}
	return idealPerMol, nil
}

// IdealGrossBtuPerFt3 converts a molar heating value, J/mol, to Btu_IT per
// ideal cubic foot at the GPA 2145 base of 60 °F and 14.696 psia, the unit
// the table is published in.
func IdealGrossBtuPerFt3(idealPerMol float64) float64 {
	return idealPerMol / gpaJPerMolPerBtuFt3
}

// HeatingValuePerVolume returns the heating value per cubic metre of real
// gas at standard conditions tStd (K), pStd (Pa), J/m³: the ideal molar
// value times the ideal-gas moles in a cubic metre, divided by the gas's
// compressibility factor zStd there,
//
//	H_v = H_m p/(R T) / Z,
//
// because a cubic metre of real gas holds 1/Z times the moles of a cubic
// metre of ideal gas (GPA 2172; ISO 6976 does the same). zStd is the
// caller's: the Peng–Robinson Z of the gas at tStd, pStd (eos.Fluid.Props),
// or SummationFactorZ at 60 °F. The two differ: for a lean pipeline gas
// the Peng–Robinson Z at 60 °F and atmospheric pressure is about 6e-4 below
// the summation-factor Z (0.99721 against 0.99778 for the example gas of
// AGA Report No. 5; methane alone 0.99750 against 0.99803), so the
// equation's Z gives a heating value per real volume about 0.06 % higher
// than GPA 2172's. The ideal molar value is taken as
// independent of the metering conditions, as GPA 2172 does when it moves
// the table's values to another base pressure; the combustion temperature
// stays that of the table, 60 °F.
func HeatingValuePerVolume(idealPerMol, zStd, tStd, pStd float64) float64 {
	return idealPerMol * pStd / (phys.R * tStd) / zStd
}

// Base pressures that SummationFactorZ accepts, Pa: within 5 % of the
// table's 14.696 psia (the contract base pressures 14.65, 14.73 and
// 15.025 psia lie inside).
const (
	SummationMinP = 0.95 * phys.FieldStandardP
	SummationMaxP = 1.05 * phys.FieldStandardP
)

// SummationFactorZ returns the compressibility factor at 60 °F and base
// pressure pBase (Pa) of a gas of components comps and mole fractions y by
// the summation-factor method of GPA 2172,
//
//	Z = 1 − (pBase/p₀) (Σ yᵢ bᵢ)²,  p₀ = 14.696 psia,
//
// with the summation factors bᵢ = √(1 − Zᵢ) of GPA 2145-16 at 60 °F and
// 14.696 psia. The temperature is fixed at 60 °F: the factors are for that
// temperature only. A pseudo-component (see ComponentHeatingValue) takes
// the factor of the n-paraffin of its molar mass from the least-squares
// line through the table's nC5 to nC8 (0.0668 per CH2 group; it reproduces
// those four within 0.002) — a choice of this package, not of GPA 2172.
//
// This is the Z of GPA 2172, the custody-transfer convention;
// HeatingValuePerVolume takes it or any other, such as the Peng–Robinson Z
// of the fluid at standard conditions, and its documentation says how far
// the two differ. Errors:
// ErrBadGas for the composition, ErrNoProperty for a component without a
// factor (H2O and He here), ErrCorrelationRange for pBase outside
// [SummationMinP, SummationMaxP].
func SummationFactorZ(comps []eos.Component, y []float64, pBase float64) (float64, error) {
	if !(pBase >= SummationMinP && pBase <= SummationMaxP) {
		return 0, fmt.Errorf("%w: summation-factor Z at %g Pa (%.4g psia); the factors are for base pressures from %.4g to %.4g psia",
			ErrCorrelationRange, pBase, pBase/fieldPsi, SummationMinP/fieldPsi, SummationMaxP/fieldPsi)
	}
	if _, err := checkGas(comps, y); err != nil {
		return 0, err
	}
	s := 0.0
	for i, c := range comps {
		b, err := summationFactor(c)
		if err != nil {
			return 0, err
		}
		s += y[i] * b
	}
	return 1 - pBase/phys.FieldStandardP*s*s, nil
}

// summationFactor returns the GPA 2145-16 summation factor of c, or the
// n-paraffin line's value for a pseudo-component.
func summationFactor(c eos.Component) (float64, error) {
	if e, ok := gpaLookup(c.Name); ok {
		if e.sf == 0 {
			return 0, fmt.Errorf("%w: no summation factor for %s in the table", ErrNoProperty, c.Name)
		}
		return e.sf, nil
	}
	if c.M > minPseudoMass && !math.IsInf(c.M, 0) {
		return pseudoSFa + pseudoSFb*ParaffinCarbonNumber(c.M), nil
	}
	return 0, fmt.Errorf("%w: no summation factor for %s (M = %g kg/mol): the table has %s, and a pseudo-component must be heavier than %g kg/mol",
		ErrNoProperty, c.Name, c.M, tableNames(), minPseudoMass)
}

// StandardLiquidDensity returns the density, kg/m³, of component c as a
// liquid at 60 °F: its specific gravity times the density of water at
// 60 °F (phys.WaterDensity60F, 999.016 kg/m³) when c.SG is set, otherwise
// the GPA 2145-16 value for a component of the table, M × p V/(R T) × (ft³
// of ideal gas per gallon of liquid) per gallon — propane: 36.391 ft³/gal,
// 506.70 kg/m³, specific gravity 0.5072. A component with neither is an
// error wrapping ErrNoProperty.
func StandardLiquidDensity(c eos.Component) (float64, error) {
	if c.SG > 0 && !math.IsInf(c.SG, 0) {
		return c.SG * phys.WaterDensity60F, nil
	}
	if e, ok := gpaLookup(c.Name); ok && e.ftGal > 0 {
		return e.m / 1000 * gpaMolesPerFt3 * e.ftGal / m3PerUSGallon, nil
	}
	return 0, fmt.Errorf("%w: no liquid density at 60 °F for %s: give its specific gravity (SG)", ErrNoProperty, c.Name)
}
