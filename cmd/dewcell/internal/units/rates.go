package units

// Rates: standard volumes per day, held in SI per second. A day is 86400 s
// exactly (NIST SP 811 (2008), B.8).
const secondsPerDay = 86400

var (
	MMscfPerDay      = def(GasRate, "mmscf_d", 1e6*M3PerFt3/secondsPerDay, secondsPerDay/(1e6*M3PerFt3), 0, "MMscf/d", "MMscfd", "MMscf/day")
	MillionSm3PerDay = def(GasRate, "1e6sm3_d", 1e6/secondsPerDay, secondsPerDay/1e6, 0, "1e6 sm3/d", "1e6sm3/d", "1e6 Sm3/d", "1e6 sm3/day")
	STBPerDay        = def(LiquidRate, "stb_d", M3PerBbl/secondsPerDay, secondsPerDay/M3PerBbl, 0, "STB/d", "STB/day", "bbl/d", "bbl/day")
	Sm3PerDay        = defAlias(LiquidRate, "sm3_d", 1.0/secondsPerDay, secondsPerDay, "sm3/d", "Sm3/d", "m3/d", "sm3/day")
)

func init() {
	def(GasRate, "mscf_d", 1e3*M3PerFt3/secondsPerDay, secondsPerDay/(1e3*M3PerFt3), 0, "Mscf/d", "Mscfd", "Mscf/day")
	def(GasRate, "scf_d", M3PerFt3/secondsPerDay, secondsPerDay/M3PerFt3, 0, "scf/d", "scf/day")
	def(GasRate, "1e3sm3_d", 1e3/secondsPerDay, secondsPerDay/1e3, 0, "1e3 sm3/d", "1e3sm3/d", "1e3 Sm3/d")
	defAlias(GasRate, "sm3_d", 1.0/secondsPerDay, secondsPerDay, "sm3/d", "Sm3/d", "m3/d", "sm3/day")
}

// Energies and heating values, output only. The British thermal unit is
// the International Table Btu, 1055.05585262 J exactly (NIST SP 811 (2008),
// B.8); a heating value per scf is per ft³ of standard gas.
const joulesPerBtu = 1055.05585262

var (
	MMBtu           = Unit{Kind: Energy, Symbol: "MMBtu", Key: "mmbtu", scale: 1e6 * joulesPerBtu, inv: 1 / (1e6 * joulesPerBtu)}
	Gigajoule       = Unit{Kind: Energy, Symbol: "GJ", Key: "gj", scale: 1e9, inv: 1e-9}
	BtuPerScf       = Unit{Kind: HeatingValue, Symbol: "Btu/scf", Key: "btu_scf", scale: joulesPerBtu / M3PerFt3, inv: M3PerFt3 / joulesPerBtu}
	MegajoulePerSm3 = Unit{Kind: HeatingValue, Symbol: "MJ/sm3", Key: "mj_sm3", scale: 1e6, inv: 1e-6}
)
