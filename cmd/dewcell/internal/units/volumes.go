package units

// Surface volumes. A standard gas volume (scf, sm3) is the ideal-gas volume
// at the standard conditions of the study, and a stock-tank liquid volume
// (STB, sm3) the liquid's volume there; both convert to m³ by the length
// definitions alone (NIST SP 811: 1 ft³ = 0.028316846592 m³, 1 bbl =
// 0.158987294928 m³). "M" is a thousand and "MM" a million in field units
// (Mscf, MMscf, MSTB, MMSTB), "B" a billion (Bscf) and "T" a trillion
// (Tscf), as the trade writes them; metric volumes take a power of ten
// ("350 1e6 sm3").
var (
	Scf        = def(GasVolume, "scf", M3PerFt3, 1/M3PerFt3, 0, "scf")
	Mscf       = def(GasVolume, "mscf", 1e3*M3PerFt3, 1/(1e3*M3PerFt3), 0, "Mscf")
	MMscf      = def(GasVolume, "mmscf", 1e6*M3PerFt3, 1/(1e6*M3PerFt3), 0, "MMscf")
	Bscf       = def(GasVolume, "bscf", 1e9*M3PerFt3, 1/(1e9*M3PerFt3), 0, "Bscf")
	Tscf       = def(GasVolume, "tscf", 1e12*M3PerFt3, 1/(1e12*M3PerFt3), 0, "Tscf")
	GasSm3     = def(GasVolume, "sm3", 1, 1, 0, "sm3", "Sm3")
	MillionSm3 = def(GasVolume, "1e6sm3", 1e6, 1/1e6, 0, "1e6 sm3", "1e6sm3", "1e6 Sm3")

	STB   = def(LiquidVolume, "stb", M3PerBbl, 1/M3PerBbl, 0, "STB")
	MSTB  = def(LiquidVolume, "mstb", 1e3*M3PerBbl, 1/(1e3*M3PerBbl), 0, "MSTB")
	MMSTB = def(LiquidVolume, "mmstb", 1e6*M3PerBbl, 1/(1e6*M3PerBbl), 0, "MMSTB")
	// LiquidSm3 is a stock-tank liquid volume in m³ at standard conditions.
	LiquidSm3 = defAlias(LiquidVolume, "sm3", 1, 1, "sm3", "Sm3", "m3", "m³")

	ScfPerSTB = def(GasOilRatio, "scf_stb", M3PerFt3/M3PerBbl, M3PerBbl/M3PerFt3, 0, "scf/STB", "scf/bbl")
	Sm3PerSm3 = def(GasOilRatio, "sm3_sm3", 1, 1, 0, "sm3/sm3", "Sm3/Sm3", "sm3/m3", "m3/m3")

	// STBPerMMscf is a condensate-gas ratio, stock-tank barrels per million
	// standard cubic feet of gas, as laboratory reports give it.
	STBPerMMscf = def(LiquidGasRatio, "stb_mmscf", M3PerBbl/(1e6*M3PerFt3), 1e6*M3PerFt3/M3PerBbl, 0, "STB/MMscf", "bbl/MMscf")

	// AcreFoot and HectareMetre measure bulk rock.
	AcreFoot     = def(Volume, "acre_ft", M3PerAcreFt, 1/M3PerAcreFt, 0, "acre-ft")
	HectareMetre = def(Volume, "ha_m", M2PerHectare, 1/M2PerHectare, 0, "ha-m")

	// Output-only units of surface volume per bulk rock volume; a study
	// file never gives them.
	MscfPerAcreFt   = Unit{Kind: GasPerBulk, Symbol: "Mscf/acre-ft", Key: "mscf_per_acre_ft", scale: 1e3 * M3PerFt3 / M3PerAcreFt, inv: M3PerAcreFt / (1e3 * M3PerFt3)}
	STBPerAcreFt    = Unit{Kind: LiquidPerBulk, Symbol: "STB/acre-ft", Key: "stb_per_acre_ft", scale: M3PerBbl / M3PerAcreFt, inv: M3PerAcreFt / M3PerBbl}
	GasSm3PerHaM    = Unit{Kind: GasPerBulk, Symbol: "sm3/ha-m", Key: "sm3_per_ha_m", scale: 1 / M2PerHectare, inv: M2PerHectare}
	LiquidSm3PerHaM = Unit{Kind: LiquidPerBulk, Symbol: "sm3/ha-m", Key: "sm3_per_ha_m", scale: 1 / M2PerHectare, inv: M2PerHectare}
)

// alias holds, by kind, symbols that a kind accepts although the symbol
// belongs to another kind in table: "bbl" and "m3" are reservoir volumes, but
// also stock-tank liquid volumes; "sm3" is a gas volume, but also a liquid
// one.
var alias = map[Kind]map[string]Unit{}

// defAlias defines a unit of kind k under symbols that may also name units of
// other kinds; Parse finds it only when k is wanted.
func defAlias(k Kind, key string, scale, inv float64, symbols ...string) Unit {
	u := Unit{Kind: k, Symbol: symbols[0], Key: key, scale: scale, inv: inv}
	if alias[k] == nil {
		alias[k] = map[string]Unit{}
	}
	for _, s := range symbols {
		v := u
		v.Symbol = s
		alias[k][s] = v
	}
	return u
}

func init() {
	// Input-only surface units.
	def(GasOilRatio, "mscf_stb", 1e3*M3PerFt3/M3PerBbl, M3PerBbl/(1e3*M3PerFt3), 0, "Mscf/STB")
	def(LiquidGasRatio, "stb_mscf", M3PerBbl/(1e3*M3PerFt3), 1e3*M3PerFt3/M3PerBbl, 0, "STB/Mscf", "bbl/Mscf")
	// Metric condensate-gas ratios: stock-tank m³ per million standard m³.
	// Written with a space ("sm3/1e6 sm3") the symbol suits a table header
	// (Lookup), not a quantity string, which takes one word as its unit.
	def(LiquidGasRatio, "sm3_1e6sm3", 1e-6, 1e6, 0, "sm3/1e6sm3", "sm3/1e6 sm3", "Sm3/1e6Sm3", "Sm3/1e6 Sm3", "m3/1e6m3", "m3/1e6 m3")
	def(GasVolume, "1e3sm3", 1e3, 1/1e3, 0, "1e3 sm3", "1e3sm3", "1e3 Sm3")
	def(GasVolume, "1e9sm3", 1e9, 1/1e9, 0, "1e9 sm3", "1e9sm3", "1e9 Sm3")
	defAlias(LiquidVolume, "bbl", M3PerBbl, 1/M3PerBbl, "bbl")
	defAlias(LiquidVolume, "mbbl", 1e3*M3PerBbl, 1/(1e3*M3PerBbl), "Mbbl")
	defAlias(LiquidVolume, "mmbbl", 1e6*M3PerBbl, 1/(1e6*M3PerBbl), "MMbbl")
	defAlias(LiquidVolume, "1e3sm3", 1e3, 1/1e3, "1e3 sm3", "1e3sm3", "1e3 Sm3")
	defAlias(LiquidVolume, "1e6sm3", 1e6, 1/1e6, "1e6 sm3", "1e6sm3", "1e6 Sm3")
}
