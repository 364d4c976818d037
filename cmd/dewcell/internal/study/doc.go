// Package study reads a study file, the TOML description of one case, checks
// every value and builds the Peng–Robinson fluid it describes.
//
// The sections and keys are those of DESIGN.md ("The study file"), plus:
//
//	[standard_conditions]                 optional
//	temperature          = "60 degF"      default: that of the output unit system
//	pressure             = "14.696 psia"  (60 degF and 14.696 psia field, 15 degC and 101.325 kPa metric)
//	atmospheric_pressure = "14.696 psia"  converts gauge pressures (psig, barg); default 1 atm
//
//	[fluid]
//	hydrocarbon_kij_a = 0.18   # Chueh–Prausnitz A for hydrocarbon pairs; absent: the eos default; 0: all such pairs 0
//	hydrocarbon_kij_b = 6      # Chueh–Prausnitz B; absent: the eos default
//
//	[fluid.plus]
//	first_carbon       = 7             # n of Cn+; needed only when the name does not say it ("C7+")
//	gamma_shape        = 1.0           # gamma split: shape alpha; absent: the eos default (1)
//	minimum_molar_mass = 92.0          # gamma split: eta, g/mol; absent: 14 n − 6
//	acentric           = "kesler-lee"  # or "edmister": acentric factors of the pseudo-components
//
//	[fluid.properties.NAME]
//	critical_volume = "0.0986 m3/kmol" # optional, used by the Chueh–Prausnitz interaction coefficients
//	boiling_point   = "-258.7 degF"    # optional
//	specific_gravity = 0.3             # optional, 60/60 degF
//
// Dimensional values are strings with their unit; molar masses and mole
// percents are bare numbers (g/mol, mol %). `volume_shift` in [fluid] defaults
// to false: the plain Peng–Robinson volumes, as eos.Options does.
//
// Component names are case-sensitive and are library names (eos.LibraryComponent),
// the plus fraction named in [fluid.plus], or user components defined in
// [fluid.properties.NAME] with molar_mass, critical_temperature,
// critical_pressure and acentric_factor. Properties given for a library
// component override its library values. An interaction key "A/B" names two
// components of the fluid; naming the plus fraction sets the coefficient of
// every pseudo-component split from it.
//
// The [[separator.stage]] tables are numbered from 1 in messages:
// separator.stage[2].pressure is the second stage's pressure.
package study
