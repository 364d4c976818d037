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
//	critical_volume = "0.0986 m3/kmol" # optional, used by the Chueh–Prausnitz interaction coefficients and the viscosity;
//	                                   # absent: estimated for the viscosity, with a warning (Study.Estimates)
//	boiling_point   = "-258.7 degF"    # optional
//	specific_gravity = 0.3             # optional, 60/60 degF
//
// Dimensional values are strings with their unit; molar masses and mole
// percents are bare numbers (g/mol, mol %). The pressures and temperatures of
// a state (reservoir, separator, depletion, standard conditions, history)
// must lie in the range of units.ParseState: 1 kPa to 400 MPa, 100 K to
// 1500 K. `volume_shift` in [fluid] defaults
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
// Two sections hold field data:
//
//	[surface]                      separator data for the quick-look gas and condensate in place
//	oil_api = 48.5                 stock-tank oil API gravity; or oil_specific_gravity = 0.786 (60/60 degF)
//	oil_molar_mass = 122.0         g/mol, optional; absent: Cragoe (1929) from the API gravity
//	correlation = "sutton"         pseudo-critical properties: sutton | standing-natural-gas | standing-condensate
//	[surface.impurities]           optional, mol % of the well stream
//	N2 = 0.52
//	CO2 = 2.16
//	H2S = 0.0
//	[[surface.stage]]              one per separator stage, then the stock tank
//	gor = "6505 scf/STB"           this stage's gas over the stock-tank oil ("1160 sm3/sm3")
//	gas_gravity = 0.682            air = 1
//
//	[[history]]                    one per time, in time order; needs reservoir.initial_pressure
//	date = 2021-07-01              a TOML date, or "2021-07-01"; or step = 3; or neither in any row
//	pressure = "3530 psia"         average reservoir pressure
//	sales_gas = "50.39 Bscf"       cumulative since discovery: "850 MMscf", "1.4e9 sm3", "350 1e6 sm3"
//	condensate = "5.18 MMSTB"      cumulative stock-tank condensate: "420 MSTB", "1200 bbl", "8.2e5 sm3"
//	water = "12 MSTB"              cumulative water, optional; once a row gives it, every later row must
//
// Surface ratios and volumes are at the study's standard conditions. Dates
// and steps rise from row to row; cumulative volumes never fall; only the
// first row may record no production (the initial state); a row with
// production lies below reservoir.initial_pressure.
//
// The laboratory report, all of it optional but not all of it absent:
//
//	[lab]
//	temperature = "240.8 degF"          # of the experiments; default: reservoir.temperature
//	saturation_pressure = "4141 psia"   # the measured dew (or bubble) point
//	cce = "lab/cce.csv"                 # constant-composition expansion; paths relative to the study file
//	cvd = "lab/cvd.csv"                 # constant-volume depletion
//
// The tables are CSV files with one header row: column names,
// case-insensitive, each with its unit in brackets, then a row per pressure
// in the order of the report. A blank cell is a value not measured
// (cvd.Missing); a column whose name starts with "note" is ignored; any other
// column the table does not know is an error, and so is a quantity given
// twice. Shares are in [%] or [fraction]; pressures in any unit a study file
// accepts (gauge units with the study's atmospheric pressure), within the
// range of a state. The CVD's columns:
//
//	pressure [psia]              required; falling, at or below saturation_pressure
//	liquid_dropout [%]           liquid volume over the cell volume at the saturation pressure, 0 to 100 %
//	produced [%]                 cumulative moles produced over the moles charged, rising, 0 to 100 %
//	z_gas, z_two_phase           Z-factors of the equilibrium gas and of the cell contents, above 0
//	gas_viscosity [cP]           any viscosity unit: cP, mPa.s, uPa.s, Pa.s
//	cgr [STB/MMscf]              condensate-gas ratio: STB/MMscf, STB/Mscf, sm3/1e6 sm3
//	gas_NAME [mol%]              produced-gas composition: [mol%], [%] or [fraction]
//	liquid_NAME [mol%]           the liquid left in the cell, on the last row only
//
// NAME is a component of [fluid.composition] (matched without regard to case
// when only one name matches), or the plus fraction, which stands for all its
// pseudo-components. A composition whose columns cover every component sums
// to 100 within 0.5 mol %; one that covers only some may not exceed 100.5.
// The first row may be the saturation point (liquid_dropout 0, produced 0);
// without saturation_pressure it must be, and gives it. The CCE's columns:
//
//	pressure [psia]                            required, in any order
//	relative_volume                            V/Vsat, above 0
//	liquid_volume [% of saturation volume]     or [% of total volume], [fraction of saturation volume],
//	                                           [fraction of total volume]: 0 to 100 %
//	z                                          single-phase Z-factor, above 0
//	density [g/cm3]                            single-phase density: g/cm3, kg/m3, lb/ft3
//
// A bad table is reported with the study file and the key, then the table's
// path, row (from 1 after the header), line and column:
//
//	case.toml: lab.cvd: lab/cvd.csv, row 3 (line 4), column 2 "liquid_dropout [%]": 104 % is out of range; ...
//
// Read and Parse read the tables from the operating system's files; ParseFS
// reads the study and its tables from an fs.FS (the demo's embedded example).
//
// The probabilistic run, [uncertainty] with [uncertainty.vary] and
// [[uncertainty.correlate]], is described in uncertainty.go; Study.Case reads
// the study again with its inputs set to a case's values.
//
// The [[separator.stage]], [[surface.stage]] and [[history]] tables are
// numbered from 1 in messages: separator.stage[2].pressure is the second
// stage's pressure, history[3].date the third row's date.
package study
