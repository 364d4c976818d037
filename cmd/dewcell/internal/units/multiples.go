package units

// Multiples in which people read a quantity, smallest first: a reservoir's
// gas in Bscf, a well's in MMscf, condensate in STB, MSTB or MMSTB, and
// compressibilities in millionths per psi or per bar. They are for output
// only; each has the key of the unit it is a multiple of, because JSON and
// CSV keep that unit.
var (
	thousandSm3    = Unit{Kind: GasVolume, Symbol: "1e3 sm3", Key: "1e3sm3", scale: 1e3, inv: 1 / 1e3}
	billionSm3     = Unit{Kind: GasVolume, Symbol: "1e9 sm3", Key: "1e9sm3", scale: 1e9, inv: 1 / 1e9}
	thousandLiqSm3 = Unit{Kind: LiquidVolume, Symbol: "1e3 sm3", Key: "1e3sm3", scale: 1e3, inv: 1 / 1e3}
	millionLiqSm3  = Unit{Kind: LiquidVolume, Symbol: "1e6 sm3", Key: "1e6sm3", scale: 1e6, inv: 1 / 1e6}
	thousandBbl    = Unit{Kind: Volume, Symbol: "Mbbl", Key: "mbbl", scale: 1e3 * M3PerBbl, inv: 1 / (1e3 * M3PerBbl)}
	millionBbl     = Unit{Kind: Volume, Symbol: "MMbbl", Key: "mmbbl", scale: 1e6 * M3PerBbl, inv: 1 / (1e6 * M3PerBbl)}
	thousandM3     = Unit{Kind: Volume, Symbol: "1e3 m3", Key: "1e3m3", scale: 1e3, inv: 1 / 1e3}
	millionM3      = Unit{Kind: Volume, Symbol: "1e6 m3", Key: "1e6m3", scale: 1e6, inv: 1 / 1e6}
	microPerPsi    = Unit{Kind: Compressibility, Symbol: "1e-6/psi", Key: "per_psi", scale: 1e-6 / PaPerPsi, inv: PaPerPsi / 1e-6}
	microPerBar    = Unit{Kind: Compressibility, Symbol: "1e-6/bar", Key: "per_bar", scale: 1e-6 / PaPerBar, inv: PaPerBar / 1e-6}
	millionMMBtu   = Unit{Kind: Energy, Symbol: "1e6 MMBtu", Key: "mmbtu", scale: 1e12 * joulesPerBtu, inv: 1 / (1e12 * joulesPerBtu)}
	thousandMMBtu  = Unit{Kind: Energy, Symbol: "1e3 MMBtu", Key: "mmbtu", scale: 1e9 * joulesPerBtu, inv: 1 / (1e9 * joulesPerBtu)}
	terajoule      = Unit{Kind: Energy, Symbol: "TJ", Key: "gj", scale: 1e12, inv: 1e-12}
	petajoule      = Unit{Kind: Energy, Symbol: "PJ", Key: "gj", scale: 1e15, inv: 1e-15}
)

var multiples = map[string][]Unit{
	"gas:" + Scf.Symbol:       {Scf, Mscf, MMscf, Bscf, Tscf},
	"gas:" + GasSm3.Symbol:    {GasSm3, thousandSm3, MillionSm3, billionSm3},
	"liq:" + STB.Symbol:       {STB, MSTB, MMSTB},
	"liq:" + LiquidSm3.Symbol: {LiquidSm3, thousandLiqSm3, millionLiqSm3},
	"vol:" + Barrel.Symbol:    {Barrel, thousandBbl, millionBbl},
	"vol:" + CuMetre.Symbol:   {CuMetre, thousandM3, millionM3},
	"cmp:" + PerPsi.Symbol:    {microPerPsi},
	"cmp:" + PerBar.Symbol:    {microPerBar},
	"nrg:" + MMBtu.Symbol:     {MMBtu, thousandMMBtu, millionMMBtu},
	"nrg:" + Gigajoule.Symbol: {Gigajoule, terajoule, petajoule},
}

// family is the key of the multiples of u, by the smallest of them.
func family(u Unit) string {
	switch u.Kind {
	case GasVolume:
		for _, f := range []Unit{Scf, GasSm3} {
			if inFamily(u, multiples["gas:"+f.Symbol]) {
				return "gas:" + f.Symbol
			}
		}
	case LiquidVolume:
		for _, f := range []Unit{STB, LiquidSm3} {
			if inFamily(u, multiples["liq:"+f.Symbol]) {
				return "liq:" + f.Symbol
			}
		}
	case Volume:
		for _, f := range []Unit{Barrel, CuMetre} {
			if inFamily(u, multiples["vol:"+f.Symbol]) {
				return "vol:" + f.Symbol
			}
		}
	case Energy:
		for _, f := range []Unit{MMBtu, Gigajoule} {
			if inFamily(u, multiples["nrg:"+f.Symbol]) {
				return "nrg:" + f.Symbol
			}
		}
	case Compressibility:
		for _, f := range []Unit{PerPsi, PerBar} {
			if u.scale == f.scale {
				return "cmp:" + f.Symbol
			}
		}
	}
	return ""
}

func inFamily(u Unit, fam []Unit) bool {
	for _, m := range fam {
		if u.scale == m.scale {
			return true
		}
	}
	return false
}

// Multiples lists the multiples of u that output may show it in, smallest
// first, or nil when u has none.
func Multiples(u Unit) []Unit { return multiples[family(u)] }
