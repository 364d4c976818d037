// Package units converts the quantities of a study file and of the command
// line between the units people write ("245 degF", "6200 psia", "2400 acre")
// and SI (K, Pa, m, m², m³, 1/Pa), and back into the two output systems,
// field and metric.
//
// Every conversion factor is an exact consequence of a unit's definition and
// is written as a Go constant expression on the definitions of package phys,
// which the library packages share, so that it is rounded to float64 only
// once:
//
//   - the international foot and inch, 1 ft = 0.3048 m and 1 in = 0.0254 m, and
//     the avoirdupois pound, 1 lb = 0.45359237 kg (international yard and pound
//     agreement, 1959);
//   - standard gravity g_n = 9.80665 m/s² (3rd CGPM, 1901), so that
//     1 lbf = 0.45359237 × 9.80665 N and 1 psi = 1 lbf/in²
//     = 6894.757293168361336… Pa;
//   - the standard atmosphere, 1 atm = 101325 Pa (10th CGPM, 1954), and the
//     bar, 1 bar = 10⁵ Pa;
//   - the degree Rankine, 1 °R = 5/9 K; 0 °F = 459.67 °R; 0 °C = 273.15 K;
//   - the international acre, 1 acre = 43560 ft², the hectare, 10⁴ m², and the
//     US oil barrel, 1 bbl = 42 US gallons = 9702 in³.
//   - the centipoise, 1 cP = 1 mPa·s = 10⁻³ Pa·s, the viscosity of laboratory
//     reports.
//
// See NIST Special Publication 811 (2008), Guide for the Use of the
// International System of Units, Appendix B, for these definitions.
//
// Gauge pressures (psig, barg) are converted with an atmospheric pressure the
// caller supplies; units never assumes one.
package units
