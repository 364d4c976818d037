// Package phys holds the exact definitions that the packages of dewcell
// share: the molar gas constant, the field units the trade's correlations
// were published in, the standard conditions of surface volumes, and the
// reference values of gas and oil gravities. It sits below eos and imports
// nothing, so that every package, the command's unit system included, uses
// these values and no rounded copy of them.
//
// Every value is an untyped Go constant written as its definition, so that
// arithmetic among them is exact and a value is rounded to float64 once,
// where it is used: PaPerPsi is KgPerPound × StandardGravity / MetrePerInch²,
// not a decimal copy of that product.
//
// # References
//
//   - BIPM (2019). The International System of Units (SI), 9th edition: the
//     defining constants N_A and k (26th CGPM, 2018), so that R = N_A k is
//     exact; the standard atmosphere (10th CGPM, 1954, Resolution 4) and the
//     standard acceleration of gravity (3rd CGPM, 1901).
//   - Thompson, A. and Taylor, B.N. (2008). Guide for the Use of the
//     International System of Units (SI). NIST Special Publication 811,
//     Appendix B: the international foot, inch and avoirdupois pound (the
//     1959 agreement), the pound-force, the degree Rankine and Fahrenheit,
//     the US gallon and the petroleum barrel of 42 US gallons.
package phys

// The molar gas constant, from the defining constants of the SI (26th CGPM,
// 2018, in force since 20 May 2019).
const (
	Avogadro  = 6.02214076e23 // N_A, 1/mol, exact
	Boltzmann = 1.380649e-23  // k, J/K, exact
	// R is the molar gas constant N_A k = 8.31446261815324 J/(mol·K), exact.
	R = Avogadro * Boltzmann
)

// Units of length, mass and force (NIST SP 811, Appendix B.8 and B.9).
const (
	MetrePerFoot    = 0.3048     // international foot (1959), exact
	MetrePerInch    = 0.0254     // international inch (1959), exact
	KgPerPound      = 0.45359237 // avoirdupois pound (1959), exact
	StandardGravity = 9.80665    // g_n, m/s² (3rd CGPM, 1901), exact
	NewtonPerLbf    = KgPerPound * StandardGravity
)

// Units of pressure.
const (
	// PaPerPsi is one pound-force per square inch,
	// 6894.757293168361336… Pa (NIST SP 811 B.9 prints 6.894 757 E+03).
	PaPerPsi = NewtonPerLbf / (MetrePerInch * MetrePerInch)
	PaPerBar = 1e5    // bar, exact
	PaPerAtm = 101325 // standard atmosphere (10th CGPM, 1954), exact
)

// Temperature scales (NIST SP 811 B.9): T/K = t/°C + 273.15, T/°R =
// t/°F + 459.67 and 1 °R = 5/9 K, all exact.
const (
	KelvinAt0C       = 273.15
	RankineAt0F      = 459.67
	KelvinPerRankine = 5.0 / 9
	RankinePerKelvin = 9.0 / 5 // 1.8
)

// KelvinFromFahrenheit is (f + 459.67)/1.8: the temperature in kelvin of f
// degrees Fahrenheit.
func KelvinFromFahrenheit(f float64) float64 { return (f + RankineAt0F) / RankinePerKelvin }

// FahrenheitFromKelvin is 1.8 t − 459.67: the temperature in degrees
// Fahrenheit of t kelvin.
func FahrenheitFromKelvin(t float64) float64 { return t*RankinePerKelvin - RankineAt0F }

// Units of volume and amount of substance (NIST SP 811 B.8, B.9).
const (
	M3PerFt3      = MetrePerFoot * MetrePerFoot * MetrePerFoot       // 0.028316846592 m³, exact
	M3PerUSGallon = 231 * MetrePerInch * MetrePerInch * MetrePerInch // US liquid gallon of 231 in³, 3.785411784e-3 m³, exact
	M3PerBbl      = 42 * M3PerUSGallon                               // barrel for petroleum, 42 US gallons: 0.158987294928 m³, exact
	MolPerLbmol   = 1000 * KgPerPound                                // pound-mole, 453.59237 mol, exact
	M3KgPerFt3Lb  = M3PerFt3 / KgPerPound                            // 1 ft³/lb in m³/kg, 0.062427960576144… (exact ratio)
	M3MolPerFt3Lb = M3PerFt3 / MolPerLbmol                           // 1 ft³/lbmol in m³/mol, 6.2427960576144…e-5 (exact ratio)
	KgM3PerLbFt3  = KgPerPound / M3PerFt3                            // 1 lb/ft³ in kg/m³, 16.018463373960139… (exact ratio)
)

// Standard conditions of surface volumes. A standard gas volume is the
// ideal-gas volume of its moles at these conditions, a stock-tank liquid
// volume the liquid's volume there.
const (
	// FieldStandardT and FieldStandardP are 60 °F and 14.696 psia, the
	// reference conditions of the American oil and gas industry for gas and
	// liquid volumes (METHODS 5.1; API Manual of Petroleum Measurement
	// Standards, ch. 11.1, from memory). 14.696 psia is one standard
	// atmosphere to 4e-6.
	FieldStandardT = (60 + RankineAt0F) * KelvinPerRankine // 288.705555… K
	FieldStandardP = 14.696 * PaPerPsi                     // 101325.353… Pa
	// MetricStandardT and MetricStandardP are 15 °C and 101.325 kPa, the
	// standard reference conditions of ISO 13443:1996 for natural gas and
	// of ISO 5024:1999 for petroleum liquids (both from memory).
	MetricStandardT = 15 + KelvinAt0C // 288.15 K
	MetricStandardP = PaPerAtm        // 101325 Pa
)

// Reference values of surface gravities.
const (
	// MolarMassAir is the molar mass of dry air, 28.9647 g/mol, in kg/mol:
	// gas specific gravity is M/M_air. The value is that of METHODS §2
	// ("28.97 commonly"), not traced to a primary source (from memory: the
	// published values for dry air of present composition lie between
	// 28.963 and 28.966 g/mol).
	MolarMassAir = 0.0289647
	// WaterDensity60F is the density of water at 60 °F, 999.016 kg/m³
	// (62.366 lb/ft³, METHODS 5.1), the reference of the 60/60 °F specific
	// gravity of oils; Tanaka et al. (2001, Metrologia 38, 301–309) give
	// 999.017 for air-free water at 101.325 kPa.
	WaterDensity60F = 999.016
)

// The API gravity scale: API = 141.5/SG − 131.5, SG the 60/60 °F specific
// gravity (METHODS 5.1; the definition of the American Petroleum Institute's
// hydrometer scale).
const (
	APINumerator = 141.5
	APIOffset    = 131.5
)

// APIGravity is 141.5/sg − 131.5, the API gravity of a liquid of 60/60 °F
// specific gravity sg.
func APIGravity(sg float64) float64 { return APINumerator/sg - APIOffset }

// SpecificGravity is 141.5/(api + 131.5), the 60/60 °F specific gravity of a
// liquid of API gravity api.
func SpecificGravity(api float64) float64 { return APINumerator / (api + APIOffset) }
