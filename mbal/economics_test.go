package mbal

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"
	"time"
)

// econClose reports whether got is within tol of want, relative to
// max(1, |want|).
func econClose(got, want, tol float64) bool {
	return math.Abs(got-want) <= tol*math.Max(1, math.Abs(want))
}

// A small project worked by hand: −100 in the first year, then 30, 40, 50
// and 20, at 10 % a year.
//
// End of year, the divisors are 1.1^(k+1) = 1.1, 1.21, 1.331, 1.4641,
// 1.61051:
//
//	−100/1.1     = −90.909091
//	  30/1.21    =  24.793388
//	  40/1.331   =  30.052592
//	  50/1.4641  =  34.150673
//	  20/1.61051 =  12.418426
//	NPV          =  10.505988 (the terms as rounded; 10.5059888 unrounded)
//
// Mid-year, every divisor is 1.1^(k+0.5), the end-of-year one over
// √1.1 = 1.0488088, so NPV = 10.505989 × 1.0488088 = 11.018774.
//
// The IRR: at 15 % the end-of-year terms are −86.956522, 22.684310,
// 26.300649, 28.587662, 9.943535, NPV = +0.559634; at 16 % −86.206897,
// 22.294887, 25.626307, 27.614555, 9.522260, NPV = −1.148888. The root lies
// between; interpolating linearly, 15.33 %. bc -l bisecting the NPV to 30
// digits gives 15.3221378771815 %.
func TestNPVIRRHandWorked(t *testing.T) {
	net := []float64{-100, 30, 40, 50, 20}
	for _, c := range []struct {
		d         Discounting
		want, tol float64
	}{
		{EndOfYear, 10.5059888, 5e-8}, // by hand above, to 7 decimals
		{MidYear, 11.018774, 5e-7},    // by hand above, to 6 decimals
	} {
		if got := NPV(0.1, net, c.d); math.Abs(got-c.want) > c.tol {
			t.Errorf("NPV(10 %%, %v, %v) = %.9g, want %.9g ± %g (worked by hand)", net, c.d, got, c.want, c.tol)
		}
	}
	// The bracket worked by hand: five terms each rounded to 6 decimals,
	// so each sum is within 2.5e-6.
	if a, b := NPV(0.15, net, EndOfYear), NPV(0.16, net, EndOfYear); math.Abs(a-0.559634) > 2.5e-6 || math.Abs(b+1.148888) > 2.5e-6 {
		t.Errorf("NPV at 15 %% and 16 %% = %.9g and %.9g, want 0.559634 and -1.148888 ± 2.5e-6 (by hand)", a, b)
	}
	for _, d := range []Discounting{EndOfYear, MidYear} {
		irr, ok, why := IRR(net, d)
		if !ok || math.Abs(irr-0.153221378771815) > 1e-12 {
			t.Errorf("IRR(%v, %v) = %.15g, %v, %q; want 0.153221378771815 (bc -l bisection)", net, d, irr, ok, why)
		}
	}
}

// The discounting exponents, exactly. At r = 0.5625, 1 + r = 1.5625 = 1.25²,
// so year k is divided by 1.25^(2k+1) mid-year and by 1.25^(2k+2) at the
// end of the year (the rule of CashFlow's doc: (1 + r)^(k + 0.5) and
// (1 + r)^(k + 1)). 1.25^m = 5^m/4^m is exact in float64 while 5^m < 2^53,
// m <= 22, so the quotients must match to the last bit. Any other exponent
// (k, k − 0.5, k + 1.5) is off by a factor of 1.25.
func TestDiscountingExponentsExact(t *testing.T) {
	const r = 0.5625
	pow125 := func(m int) float64 {
		p := 1.0
		for range m {
			p *= 1.25
		}
		return p
	}
	for k := range 10 {
		imp := make([]float64, k+1)
		imp[k] = 3
		if got, want := NPV(r, imp, MidYear), 3/pow125(2*k+1); got != want {
			t.Errorf("mid-year NPV of 3 in year %d at 56.25 %% = %.17g, want 3/1.25^%d = %.17g exactly", k, got, 2*k+1, want)
		}
		if got, want := NPV(r, imp, EndOfYear), 3/pow125(2*k+2); got != want {
			t.Errorf("end-of-year NPV of 3 in year %d at 56.25 %% = %.17g, want 3/1.25^%d = %.17g exactly", k, got, 2*k+2, want)
		}
	}

	// The same through CashFlow: a table 2040–2049 of sales gas at 1 per
	// standard m³, 7 m³ in each year from 2041, a capital cost of 5 in 2040.
	var years []YearVolumes
	for y := 2041; y <= 2049; y++ {
		years = append(years, YearVolumes{Year: y, SalesGas: 7})
	}
	for _, d := range []Discounting{MidYear, EndOfYear} {
		e := Economics{GasPrice: 1, GasBasis: GasPerVolume, DiscountRate: r, Discounting: d,
			Capex: []Capex{{Date: time.Date(2040, 5, 1, 0, 0, 0, 0, time.UTC), Amount: 5}}}
		res, err := CashFlow(e, years, 2049)
		if err != nil {
			t.Fatal(err)
		}
		if len(res.Years) != 10 || res.Years[0].Year != 2040 {
			t.Fatalf("%v: table of %d years from %d, want 10 from 2040", d, len(res.Years), res.Years[0].Year)
		}
		sum := 0.0
		for k, row := range res.Years {
			m := 2*k + 1
			if d == EndOfYear {
				m++
			}
			div := pow125(m)
			if row.Discounted != row.Net/div || row.DiscountFactor != 1/div {
				t.Errorf("%v, %d (k = %d): discounted %.17g, factor %.17g; want net/1.25^%d = %.17g, 1/1.25^%d = %.17g exactly",
					d, row.Year, k, row.Discounted, row.DiscountFactor, m, row.Net/div, m, 1/div)
			}
			sum += row.Net / div
		}
		if res.NPV != sum {
			t.Errorf("%v: NPV %.17g, want the sum of the discounted rows %.17g", d, res.NPV, sum)
		}
	}
}

// IRR against closed forms.
func TestIRRClosedForm(t *testing.T) {
	// A level annuity A for n years after an investment P, end of year:
	// NPV = [−P + A (1 − (1+r)^−n)/r]/(1 + r), zero at r = 10 % when
	// P = A (1 − 1.1^−n)/0.1 (the present value of an annuity, Jahn, Cook
	// and Graham 2008, ch. 14; any text on the time value of money). n = 400
	// also tests the scan for overflow near −99 % and at 1000 %.
	for _, n := range []int{5, 30, 400} {
		const a = 100.0
		p := a * (1 - math.Pow(1.1, -float64(n))) / 0.1
		net := []float64{-p}
		for range n {
			net = append(net, a)
		}
		for _, d := range []Discounting{EndOfYear, MidYear} {
			irr, ok, why := IRR(net, d)
			if !ok || math.Abs(irr-0.1) > 1e-12 {
				t.Errorf("annuity n = %d, %v: IRR = %.15g, %v, %q; want 0.1 (closed form)", n, d, irr, ok, why)
			}
		}
		// And the NPV at 5 %, the same closed form.
		want := (-p + a*(1-math.Pow(1.05, -float64(n)))/0.05) / 1.05
		if got := NPV(0.05, net, EndOfYear); !econClose(got, want, 1e-12) {
			t.Errorf("annuity n = %d: NPV(5 %%) = %.15g, want %.15g (closed form)", n, got, want)
		}
		if got := NPV(0.05, net, MidYear); !econClose(got, want*math.Sqrt(1.05), 1e-12) {
			t.Errorf("annuity n = %d: mid-year NPV(5 %%) = %.15g, want %.15g (closed form × √1.05)", n, got, want*math.Sqrt(1.05))
		}
	}

	// Two periods, −P then +Q: −P + Q/(1 + r) = 0 at r = Q/P − 1, for either
	// convention (both divide by a further √(1 + r) or 1 + r).
	for _, c := range []struct{ p, q float64 }{{80, 100}, {100, 50}, {100, 300}, {100, 1.5}, {100, 1000}} {
		want := c.q/c.p - 1
		for _, d := range []Discounting{EndOfYear, MidYear} {
			irr, ok, why := IRR([]float64{-c.p, c.q}, d)
			if !ok || math.Abs(irr-want) > 1e-12 {
				t.Errorf("IRR(−%g, %g, %v) = %.15g, %v, %q; want Q/P − 1 = %g", c.p, c.q, d, irr, ok, why, want)
			}
		}
	}

	// −4000, +2000, +4000: 2v² + v − 2 = 0 in v = 1/(1 + r), v = (√17 − 1)/4,
	// r = (√17 − 3)/4 = 28.08 %, the example of Brealey, Myers and Allen,
	// Principles of Corporate Finance, ch. 5 (from memory), in closed form.
	want := (math.Sqrt(17) - 3) / 4
	if irr, ok, why := IRR([]float64{-4000, 2000, 4000}, EndOfYear); !ok || math.Abs(irr-want) > 1e-12 {
		t.Errorf("IRR(−4000, 2000, 4000) = %.15g, %v, %q; want (√17 − 3)/4 = %.15g", irr, ok, why, want)
	}
}

// No IRR, and several.
func TestIRRNoneOrSeveral(t *testing.T) {
	for _, c := range []struct {
		name string
		net  []float64
		d    Discounting
		why  string
	}{
		{"all positive", []float64{0, 10, 20}, MidYear,
			"the net cash flows never turn negative: there is no cost to earn a return on, and the NPV is positive at every rate"},
		{"all negative", []float64{-10, 0, -5}, EndOfYear,
			"the project never pays back its costs: the net cash flows are never positive"},
		{"all zero", []float64{0, 0}, MidYear, "the net cash flows are all zero: every discount rate gives NPV = 0"},
		{"none", nil, MidYear, "there are no cash flows"},
		{"not finite", []float64{-1, math.NaN()}, MidYear, "the net cash flow of year 2 of the table is NaN: not finite"},
		{"unknown convention", []float64{-1, 2}, Discounting(7), "the discounting convention 7 is unknown"},
		// −1, +20: IRR = 1900 % by the two-period closed form, above the
		// range; −100, +0.5: −99.5 %, below it.
		{"above the range", []float64{-1, 20}, EndOfYear,
			"the NPV is still positive at 1000 % a year: the return is above the highest rate searched"},
		{"below the range", []float64{-100, 0.5}, EndOfYear,
			"the NPV is negative even at -99 % a year: the project loses nearly all it invests"},
		// 1, −1, 1: (1 + r)² NPV = x² − x + 1 in x = 1 + r, whose
		// discriminant 1 − 4 < 0: no real root (closed form).
		{"no root", []float64{1, -1, 1}, EndOfYear,
			"no discount rate from -99 % to 1000 % a year gives NPV = 0: the NPV stays positive"},
		{"no root, negative", []float64{-1, 1, -1}, EndOfYear,
			"no discount rate from -99 % to 1000 % a year gives NPV = 0: the NPV stays negative"},
	} {
		irr, ok, why := IRR(c.net, c.d)
		if ok || irr != 0 || why != c.why {
			t.Errorf("%s: IRR(%v) = %g, %v, %q; want 0, false, %q", c.name, c.net, irr, ok, why, c.why)
		}
	}

	for _, c := range []struct {
		name  string
		net   []float64
		roots []float64
		why   string
	}{
		// −1 + 5/(1+r) − 6/(1+r)²: times (1+r)², −x² + 5x − 6 = −(x − 2)(x − 3)
		// in x = 1 + r, roots r = 100 % and 200 % (closed form; the classic
		// textbook case of several IRRs).
		{"−1, 5, −6", []float64{-1, 5, -6}, []float64{1, 2},
			"several discount rates give NPV = 0, 100 % and 200 % a year: the IRR is ambiguous"},
		// −4000 + 25000 v − 25000 v², v = 1/(1 + r): 25v² − 25v + 4 = 0,
		// v = 0.8 or 0.2, r = 25 % and 400 % (closed form; Brealey, Myers
		// and Allen, Principles of Corporate Finance, ch. 5, from memory).
		{"−4000, 25000, −25000", []float64{-4000, 25000, -25000}, []float64{0.25, 4},
			"several discount rates give NPV = 0, 25 % and 400 % a year: the IRR is ambiguous"},
		// (x − 1.1)(x − 1.5)(x − 2) = x³ − 4.6x² + 6.85x − 3.3 with x = 1 + r:
		// the flows −1, 4.6, −6.85, 3.3 have IRRs 10 %, 50 % and 100 %
		// (closed form).
		{"three roots", []float64{-1, 4.6, -6.85, 3.3}, []float64{0.1, 0.5, 1},
			"several discount rates give NPV = 0, 10 %, 50 % and 100 % a year: the IRR is ambiguous"},
	} {
		for _, d := range []Discounting{EndOfYear, MidYear} {
			irr, ok, why := IRR(c.net, d)
			if ok || irr != 0 || why != c.why {
				t.Errorf("%s, %v: IRR = %g, %v, %q; want 0, false, %q", c.name, d, irr, ok, why, c.why)
			}
			roots, _ := irrSolve(c.net, d)
			if len(roots) != len(c.roots) {
				t.Errorf("%s, %v: roots %v, want %v (closed form)", c.name, d, roots, c.roots)
				continue
			}
			for i := range roots {
				if math.Abs(roots[i]-c.roots[i]) > 1e-10 {
					t.Errorf("%s, %v: root %d = %.15g, want %g (closed form)", c.name, d, i, roots[i], c.roots[i])
				}
			}
		}
	}
}

// NPV's special cases, as its doc gives them.
func TestNPVSpecialCases(t *testing.T) {
	for _, c := range []struct {
		r float64
		d Discounting
	}{{-1, MidYear}, {-2, EndOfYear}, {math.NaN(), MidYear}, {math.Inf(1), MidYear}, {0.1, Discounting(3)}} {
		if got := NPV(c.r, []float64{1}, c.d); !math.IsNaN(got) {
			t.Errorf("NPV(%g, {1}, %v) = %g, want NaN", c.r, c.d, got)
		}
	}
	if got := NPV(0.1, nil, MidYear); got != 0 {
		t.Errorf("NPV of no cash flows = %g, want 0", got)
	}
	// At r = 0 the NPV is the plain sum, in either convention.
	if got := NPV(0, []float64{-3, 1, 4}, MidYear); got != 2 {
		t.Errorf("NPV(0, {−3, 1, 4}) = %g, want 2", got)
	}
}

// 6000 ft³ per barrel by the definitions: 1 ft³ = 1728 in³, 1 bbl = 42 US
// gallons of 231 in³ (NIST SP 811, App. B), so 6000 × 1728/9702 =
// 1068.6456400742 m³/m³.
func TestDefaultGasPerOilEquivalent(t *testing.T) {
	if want := 6000.0 * 1728 / (42 * 231); !econClose(DefaultGasPerOilEquivalent, want, 1e-14) {
		t.Errorf("DefaultGasPerOilEquivalent = %.15g, want %.15g (6000 ft³/bbl)", DefaultGasPerOilEquivalent, want)
	}
}

// econHandTable is a small development whose cash flow is worked by hand in
// TestCashFlowHandWorked.
func econHandTable() (Economics, []YearVolumes, int) {
	d := func(y int, m time.Month, day int) time.Time { return time.Date(y, m, day, 0, 0, 0, 0, time.UTC) }
	e := Economics{
		Currency:        "USD",
		GasPrice:        4e-9, // 4 per GJ
		GasBasis:        GasPerEnergy,
		CondensatePrice: 500,
		NGLPrice:        300,
		Royalty:         0.125,
		DiscountRate:    0.1,
		Discounting:     EndOfYear,
		OpexFixed:       2e6,
		OpexPerWell:     5e5,
		OpexGas:         0.01,
		OpexCondensate:  20,
		AbandonmentCost: 3e6,
		Capex: []Capex{
			{Date: d(2030, 3, 1), Amount: 10e6, What: "wells"},
			{Date: d(2030, 9, 1), Amount: 5e6, What: "plant"},
			{Date: d(2031, 1, 15), Amount: 2e6, What: "hook-up"},
		},
	}
	years := []YearVolumes{
		{Year: 2031, SalesGas: 1e8, SalesEnergy: 4e15, Condensate: 1e4, NGL: 2e3, WellYears: 3.5, ProducingFraction: 0.5},
		{Year: 2032, SalesGas: 2e8, SalesEnergy: 8e15, Condensate: 1.5e4, NGL: 3e3, WellYears: 4, ProducingFraction: 1},
	}
	return e, years, 2032
}

// The royalty, opex, net, discounting, payback, IRR and unit costs of a small
// table, by hand (currency in millions):
//
//	2030: capex 10 + 5 = 15; net −15.
//	2031: gas 4e-9 × 4e15 = 16, condensate 500 × 1e4 = 5, NGL 300 × 2e3 = 0.6,
//	      revenue 21.6, royalty 0.125 × 21.6 = 2.7,
//	      opex 2 × 0.5 + 0.5 × 3.5 + 0.01 × 1e8 + 20 × 1e4 = 1 + 1.75 + 1 + 0.2 = 3.95,
//	      capex 2; net 21.6 − 2.7 − 3.95 − 2 = 12.95.
//	2032: gas 32, condensate 7.5, NGL 0.9, revenue 40.4, royalty 5.05,
//	      opex 2 + 2 + 2 + 0.3 = 6.3, abandonment 3; net 40.4 − 5.05 − 6.3 − 3 = 26.05.
//
// Cumulative −15, −2.05, 24.0. End of year at 10 %: −15/1.1 + 12.95/1.21 +
// 26.05/1.331 = −13.636364 + 10.702479 + 19.571751 = 16.637866. The IRR: ×
// (1 + r)³, −15x² + 12.95x + 26.05 = 0, x = (12.95 + √1730.7025)/30, r =
// 81.839 %. Payback: 2.05/26.05 = 0.0786948 of 2032 (366 days), 28.80 days
// after 1 January: 29 January 2032, 19:15. Technical cost 15 + 2 + 3.95 +
// 6.3 + 3 = 30.25 over 3e8 m³ of gas (0.1008333 per m³), 1.2e16 J
// (2.5208333e-9 per J), and 2.5e4 + 5e3 + 3e8/1068.6456 = 310729.17 m³ of
// oil equivalent (97.35166 per m³).
func TestCashFlowHandWorked(t *testing.T) {
	e, years, abandon := econHandTable()
	res, err := CashFlow(e, years, abandon)
	if err != nil {
		t.Fatal(err)
	}
	type row struct {
		year                                      int
		gas, cond, ngl, rev, roy, opex, capex, ab float64
		net, cum                                  float64
	}
	want := []row{
		{2030, 0, 0, 0, 0, 0, 0, 15e6, 0, -15e6, -15e6},
		{2031, 16e6, 5e6, 0.6e6, 21.6e6, 2.7e6, 3.95e6, 2e6, 0, 12.95e6, -2.05e6},
		{2032, 32e6, 7.5e6, 0.9e6, 40.4e6, 5.05e6, 6.3e6, 0, 3e6, 26.05e6, 24e6},
	}
	if len(res.Years) != len(want) {
		t.Fatalf("%d rows, want %d (2030–2032)", len(res.Years), len(want))
	}
	for i, w := range want {
		g := res.Years[i]
		got := row{g.Year, g.GasRevenue, g.CondensateRevenue, g.NGLRevenue, g.Revenue, g.Royalty, g.Opex, g.Capex, g.Abandonment, g.Net, g.Cumulative}
		vals := func(r row) []float64 {
			return []float64{r.gas, r.cond, r.ngl, r.rev, r.roy, r.opex, r.capex, r.ab, r.net, r.cum}
		}
		gv, wv := vals(got), vals(w)
		for j := range gv {
			if got.year != w.year || !econClose(gv[j], wv[j], 1e-12) {
				t.Errorf("row %d: %+v, want %+v (by hand)", i, got, w)
				break
			}
		}
	}
	checks := []struct {
		name      string
		got, want float64
		tol       float64
	}{
		{"NPV", res.NPV, 16.637866e6, 3e-8}, // 6 decimals of millions: ±5e-7/16.6
		{"cumulative discounted", res.Years[2].CumulativeDiscounted, res.NPV, 1e-15},
		{"undiscounted profit", res.UndiscountedProfit, 24e6, 1e-12},
		{"IRR", res.IRR, (12.95+math.Sqrt(1730.7025))/30 - 1, 1e-12},
		{"payback years", res.PaybackYears, 2 + 2.05/26.05, 1e-12},
		{"total revenue", res.TotalRevenue, 62e6, 1e-12},
		{"total royalty", res.TotalRoyalty, 7.75e6, 1e-12},
		{"total opex", res.TotalOpex, 10.25e6, 1e-12},
		{"total capex", res.TotalCapex, 17e6, 1e-12},
		{"total abandonment", res.TotalAbandonment, 3e6, 1e-12},
		{"unit cost per m³ of gas", res.UnitCostPerSalesGas, 30.25e6 / 3e8, 1e-12},
		{"unit cost per J", res.UnitCostPerEnergy * 1e9, 30.25e6 / 1.2e16 * 1e9, 1e-12},
		{"oil equivalent", res.OilEquivalent, 25e3 + 5e3 + 3e8/(6000.0*1728/9702), 1e-12},
		{"unit technical cost", res.UnitTechnicalCost, 97.35165940, 1e-9}, // bc -l, 30.25e6/310729.1667
	}
	for _, c := range checks {
		if !econClose(c.got, c.want, c.tol) {
			t.Errorf("%s = %.12g, want %.12g (by hand)", c.name, c.got, c.want)
		}
	}
	if !res.IRRKnown || res.IRRWhy != "" || len(res.IRRs) != 1 {
		t.Errorf("IRR known %v, why %q, rates %v; want one IRR", res.IRRKnown, res.IRRWhy, res.IRRs)
	}
	wantPay := time.Date(2032, 1, 1, 0, 0, 0, 0, time.UTC).Add(time.Duration(2.05 / 26.05 * 366 * 24 * float64(time.Hour)))
	if !res.PaybackKnown || res.Payback.Sub(wantPay).Abs() > time.Second || res.Payback.Format("2006-01-02 15") != "2032-01-29 19" {
		t.Errorf("payback %v (known %v), want %v: 2.05/26.05 of the 366 days of 2032", res.Payback, res.PaybackKnown, wantPay)
	}

	// Mid-year: every divisor is the end-of-year one over √1.1, so the NPV
	// is √1.1 times as large; the IRR does not change.
	e.Discounting = MidYear
	mid, err := CashFlow(e, years, abandon)
	if err != nil {
		t.Fatal(err)
	}
	if !econClose(mid.NPV, res.NPV*math.Sqrt(1.1), 1e-12) || math.Abs(mid.IRR-res.IRR) > 1e-12 {
		t.Errorf("mid-year NPV %.12g, IRR %.12g; want %.12g (end-of-year × √1.1) and %.12g", mid.NPV, mid.IRR, res.NPV*math.Sqrt(1.1), res.IRR)
	}

	// Per volume, the same gas at 0.16 per standard m³ (4e-9 per J × 4e7
	// J/m³) earns the same; the royalty at 0 leaves all of the revenue.
	e.GasBasis, e.GasPrice, e.Royalty = GasPerVolume, 0.16, 0
	vol, err := CashFlow(e, years, abandon)
	if err != nil {
		t.Fatal(err)
	}
	if g := vol.Years[2].GasRevenue; !econClose(g, 32e6, 1e-12) || vol.TotalRoyalty != 0 || !econClose(vol.UndiscountedProfit, 24e6+7.75e6, 1e-12) {
		t.Errorf("per volume: 2032 gas revenue %.12g, royalty %g, profit %.12g; want 32e6, 0, 31.75e6", g, vol.TotalRoyalty, vol.UndiscountedProfit)
	}
}

// The span of the table: from the earliest capex or production to the
// abandonment year, gaps filled with zero rows, entries without volumes
// outside it ignored.
func TestCashFlowSpan(t *testing.T) {
	e := Economics{GasPrice: 1, GasBasis: GasPerVolume, AbandonmentCost: 4,
		Capex: []Capex{{Date: time.Date(2028, 12, 31, 0, 0, 0, 0, time.UTC), Amount: 10}}}
	years := []YearVolumes{
		{Year: 2026},                // no volumes, before the table: ignored
		{Year: 2031, SalesGas: 6},   // 2029 and 2030 missing: zero rows
		{Year: 2032},                // present without volumes: a zero row
		{Year: 2033, SalesGas: 20},  // the last year with volumes
		{Year: 2036, SalesGas: 0.0}, // after the abandonment year, no volumes: ignored
	}
	res, err := CashFlow(e, years, 2034)
	if err != nil {
		t.Fatal(err)
	}
	// Net by hand: 2028 −10, 2029–2030 0, 2031 +6, 2032 0, 2033 +20,
	// 2034 −4 (abandonment, a year after production ends).
	want := []float64{-10, 0, 0, 6, 0, 20, -4}
	if len(res.Years) != len(want) || res.Years[0].Year != 2028 || res.Years[len(res.Years)-1].Year != 2034 {
		t.Fatalf("table of %d rows, want %d from 2028 to 2034", len(res.Years), len(want))
	}
	for k, w := range want {
		if r := res.Years[k]; r.Net != w || r.Year != 2028+k || r.Volumes.Year != r.Year {
			t.Errorf("row %d: year %d (volumes of %d), net %g; want %d, %g", k, r.Year, r.Volumes.Year, r.Net, 2028+k, w)
		}
	}
	// Capex first, production first: the table starts at the production.
	e.Capex[0].Date = time.Date(2032, 6, 1, 0, 0, 0, 0, time.UTC)
	res, err = CashFlow(e, years, 2033)
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Years) != 3 || res.Years[0].Year != 2031 || res.Years[1].Capex != 10 || res.Years[2].Abandonment != 4 {
		t.Errorf("table from %d of %d rows, capex %+v; want 2031–2033, capex 10 in 2032, abandonment 4 in 2033", res.Years[0].Year, len(res.Years), res.Years)
	}
}

// The payback turns positive for good, interpolated within the year.
func TestCashFlowPayback(t *testing.T) {
	utc := func(y int, m time.Month, d, h int) time.Time { return time.Date(y, m, d, h, 0, 0, 0, time.UTC) }
	e := Economics{GasPrice: 1, GasBasis: GasPerVolume, Discounting: EndOfYear, Capex: []Capex{
		{Date: utc(2030, 2, 1, 0), Amount: 100}, {Date: utc(2032, 8, 1, 0), Amount: 80}}}
	// Net −100, +150, −80, +60; cumulative −100, +50, −30, +30. It is
	// first positive in 2031 but falls back in 2032; for good from 2033, at
	// 30/60 = 0.5 of its 365 days: 182.5 days after 1 January, 2 July 2033
	// at 12:00 (31+28+31+30+31+30 = 181 days to 1 July), 3.5 years after
	// 1 January 2030 (by hand).
	years := []YearVolumes{{Year: 2031, SalesGas: 150}, {Year: 2033, SalesGas: 60}}
	res, err := CashFlow(e, years, 2033)
	if err != nil {
		t.Fatal(err)
	}
	if !res.PaybackKnown || !res.Payback.Equal(utc(2033, 7, 2, 12)) || res.PaybackYears != 3.5 {
		t.Errorf("payback %v (%g years, known %v), want 2033-07-02 12:00, 3.5 years (by hand)", res.Payback, res.PaybackYears, res.PaybackKnown)
	}
	// The last year 30 instead: cumulative ends at 0, never above it.
	years[1].SalesGas = 30
	if res, err = CashFlow(e, years, 2033); err != nil {
		t.Fatal(err)
	}
	if res.PaybackKnown || !res.Payback.IsZero() || res.PaybackYears != 0 {
		t.Errorf("payback %v (%g years, known %v), want none: the cumulative ends at 0", res.Payback, res.PaybackYears, res.PaybackKnown)
	}
	// No cost at all: never negative, paid back on the first day.
	e.Capex = nil
	if res, err = CashFlow(e, years, 2033); err != nil {
		t.Fatal(err)
	}
	if !res.PaybackKnown || !res.Payback.Equal(utc(2031, 1, 1, 0)) || res.PaybackYears != 0 {
		t.Errorf("payback %v (%g years, known %v), want 2031-01-01, 0 years", res.Payback, res.PaybackYears, res.PaybackKnown)
	}
	if res.IRRKnown || res.IRRWhy != "the net cash flows never turn negative: there is no cost to earn a return on, and the NPV is positive at every rate" {
		t.Errorf("IRR known %v, why %q; want none: no negative flows", res.IRRKnown, res.IRRWhy)
	}
	// Payback in the first year of the table: −100 of capex and +400 of gas
	// in 2030 (365 days), net +300 (by hand): the cumulative is linear in
	// the year from 0, so it turns positive on 1 January, 0 years.
	e.Capex = []Capex{{Date: utc(2030, 6, 1, 0), Amount: 100}}
	if res, err = CashFlow(e, []YearVolumes{{Year: 2030, SalesGas: 400}}, 2030); err != nil {
		t.Fatal(err)
	}
	if !res.PaybackKnown || res.PaybackYears != 0 || !res.Payback.Equal(utc(2030, 1, 1, 0)) {
		t.Errorf("one-year table: payback %v (%g years), want 2030-01-01, 0 years", res.Payback, res.PaybackYears)
	}
}

// A cash flow with several IRRs through CashFlow: −1, +5, −6 (roots 100 %
// and 200 %, closed form in TestIRRNoneOrSeveral) as capex 1 in 2030, gas 5
// in 2031 and an abandonment cost of 6 in 2032.
func TestCashFlowAmbiguousIRR(t *testing.T) {
	e := Economics{GasPrice: 1, GasBasis: GasPerVolume, AbandonmentCost: 6,
		Capex: []Capex{{Date: time.Date(2030, 1, 1, 0, 0, 0, 0, time.UTC), Amount: 1}}}
	res, err := CashFlow(e, []YearVolumes{{Year: 2031, SalesGas: 5}}, 2032)
	if err != nil {
		t.Fatal(err)
	}
	if res.IRRKnown || res.IRR != 0 || len(res.IRRs) != 2 || math.Abs(res.IRRs[0]-1) > 1e-10 || math.Abs(res.IRRs[1]-2) > 1e-10 ||
		!strings.Contains(res.IRRWhy, "100 % and 200 %") {
		t.Errorf("IRR %g known %v, rates %v, why %q; want none, rates 1 and 2", res.IRR, res.IRRKnown, res.IRRs, res.IRRWhy)
	}
}

// Every validation error, with its field and message.
func TestCashFlowErrors(t *testing.T) {
	type mod func(e *Economics, y *[]YearVolumes, abandon *int)
	date := func(y int, m time.Month, d int) time.Time { return time.Date(y, m, d, 0, 0, 0, 0, time.UTC) }
	for _, c := range []struct {
		mod   mod
		field string
		msg   string
	}{
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.GasPrice = -1 },
			"GasPrice", "economics: gas price = -1, want at least 0 and finite"},
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.CondensatePrice = math.NaN() },
			"CondensatePrice", "economics: condensate price = NaN, want at least 0 and finite (currency per m³)"},
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.NGLPrice = -5 },
			"NGLPrice", "economics: ngl price = -5, want at least 0 and finite (currency per m³)"},
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.OpexFixed = -1 },
			"OpexFixed", "economics: opex fixed = -1, want at least 0 and finite (currency per year)"},
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.OpexPerWell = -2 },
			"OpexPerWell", "economics: opex per well = -2, want at least 0 and finite (currency per well and year)"},
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.OpexGas = -0.5 },
			"OpexGas", "economics: opex gas = -0.5, want at least 0 and finite (currency per standard m³)"},
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.OpexCondensate = -3 },
			"OpexCondensate", "economics: opex condensate = -3, want at least 0 and finite (currency per m³)"},
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.AbandonmentCost = math.Inf(1) },
			"AbandonmentCost", "economics: abandonment cost = +Inf, want at least 0 and finite"},
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.GasPerOilEquivalent = -1 },
			"GasPerOilEquivalent", "economics: gas per oil equivalent = -1, want at least 0 and finite standard m³ per m³ (0 means 6000 ft³ per barrel)"},
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.GasBasis = 2 },
			"GasBasis", "economics: gas basis = 2 is unknown: want GasPerEnergy (a price per joule of heating value) or GasPerVolume (per standard m³)"},
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.Royalty = 1 },
			"Royalty", "economics: royalty = 1, want at least 0 and below 1 (a fraction of revenue)"},
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.Royalty = -0.1 },
			"Royalty", "economics: royalty = -0.1, want at least 0 and below 1 (a fraction of revenue)"},
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.DiscountRate = -1 },
			"DiscountRate", "economics: discount rate = -1, want above -1 and finite (a fraction per year: 0.1 for 10 %)"},
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.Discounting = 5 },
			"Discounting", "economics: discounting = 5 is unknown: want MidYear or EndOfYear"},
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.Capex[1].Date = time.Time{} },
			"Capex[1].Date", "economics: capex[1].date is not set: every capital cost needs the date it is spent (plant)"},
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.Capex[0].Amount = -3 },
			"Capex[0].Amount", "economics: capex[0].amount = -3, want at least 0 and finite (wells)"},
		{func(_ *Economics, y *[]YearVolumes, _ *int) { (*y)[1].Year = 2030 },
			"years[1].Year", "economics: years[1].year = 2030 comes after 2031 (years[0]): years must be in increasing order"},
		{func(_ *Economics, y *[]YearVolumes, _ *int) { (*y)[1].Year = 2031 },
			"years[1].Year", "economics: years[1].year = 2031 repeats years[0]: each year may appear once"},
		{func(_ *Economics, y *[]YearVolumes, _ *int) { (*y)[0].SalesGas = -1 },
			"years[0].SalesGas", "economics: years[0].sales gas = -1 in 2031, want at least 0 and finite (standard m³)"},
		{func(_ *Economics, y *[]YearVolumes, _ *int) { (*y)[1].SalesEnergy = math.Inf(1) },
			"years[1].SalesEnergy", "economics: years[1].sales energy = +Inf in 2032, want at least 0 and finite (J)"},
		{func(_ *Economics, y *[]YearVolumes, _ *int) { (*y)[0].Condensate = -2 },
			"years[0].Condensate", "economics: years[0].condensate = -2 in 2031, want at least 0 and finite (m³)"},
		{func(_ *Economics, y *[]YearVolumes, _ *int) { (*y)[0].NGL = math.NaN() },
			"years[0].NGL", "economics: years[0].ngl = NaN in 2031, want at least 0 and finite (m³)"},
		{func(_ *Economics, y *[]YearVolumes, _ *int) { (*y)[0].WellYears = -1 },
			"years[0].WellYears", "economics: years[0].well years = -1 in 2031, want at least 0 and finite (well-years)"},
		{func(_ *Economics, y *[]YearVolumes, _ *int) { (*y)[0].ProducingFraction = 1.5 },
			"years[0].ProducingFraction", "economics: years[0].producing fraction = 1.5 in 2031, want from 0 to 1 (the fraction of the year the field produced)"},
		{func(_ *Economics, y *[]YearVolumes, _ *int) { (*y)[0].ProducingFraction = 0 },
			"years[0].ProducingFraction", "economics: years[0].producing fraction = 0 in 2031, a year that sells gas or liquids: give the fraction of the year the field produced, on which the fixed opex is charged"},
		{func(_ *Economics, y *[]YearVolumes, _ *int) { (*y)[1].WellYears = 0 },
			"years[1].WellYears", "economics: years[1].well years = 0 in 2032, a year that sells gas or liquids: give the producing wells times the fraction of the year each produced, on which the opex per well is charged"},
		{func(_ *Economics, y *[]YearVolumes, _ *int) { (*y)[1].SalesEnergy = 0 },
			"years[1].SalesEnergy", "economics: years[1].sales energy = 0 in 2032, a year that sells 2e+08 standard m³ of gas priced per joule: give the gross heating value of the gas sold"},
		{func(_ *Economics, _ *[]YearVolumes, a *int) { *a = 2031 },
			"abandonYear", "economics: abandon year = 2031 is before 2032, the last year with volumes"},
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.Capex[2].Date = date(2033, 2, 1) },
			"Capex[2].Date", "economics: capex[2].date = 2033-02-01 falls after the abandonment year 2032 (hook-up)"},
		{func(e *Economics, y *[]YearVolumes, _ *int) { e.Capex, *y = nil, []YearVolumes{{Year: 2031}} },
			"years", "economics: years has no year with volumes and there is no capital cost: nothing to evaluate"},
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.Capex[0].Date = date(1, 3, 1) },
			"abandonYear", "economics: abandon year = 2032 makes a table of 2032 years from 1, want at most 500: check the capital-cost dates and the abandonment year"},
		// 1 + r = 1e-7: (1e-7)^(k+1) underflows to 0 beyond k ≈ 46 (the
		// smallest float64 is 4.9e-324), within a table from 1980.
		{func(e *Economics, _ *[]YearVolumes, _ *int) {
			e.DiscountRate, e.Capex[0].Date = -0.9999999, date(1980, 1, 1)
		}, "DiscountRate", "economics: discount rate = -0.9999999 overflows the discounting over the 53 years of the table"},
		{func(e *Economics, _ *[]YearVolumes, _ *int) { e.CondensatePrice = 1e308 },
			"years", "economics: years give a cash flow in 2031 too large to add up: check the prices, costs and volumes"},
	} {
		e, years, abandon := econHandTable()
		c.mod(&e, &years, &abandon)
		res, err := CashFlow(e, years, abandon)
		var ee *EconomicsError
		if res != nil || !errors.Is(err, ErrBadEconomics) || !errors.As(err, &ee) || ee.Field != c.field || err.Error() != c.msg {
			t.Errorf("CashFlow: %v, %v (field %q);\nwant nil and %q (field %q)", res, err, fieldOf(ee), c.msg, c.field)
		}
	}
}

func fieldOf(e *EconomicsError) string {
	if e == nil {
		return ""
	}
	return e.Field
}

// The hand-worked case of TestNPVIRRHandWorked.
func ExampleNPV() {
	net := []float64{-100, 30, 40, 50, 20}
	fmt.Printf("end of year %.4g, mid-year %.4g\n", NPV(0.1, net, EndOfYear), NPV(0.1, net, MidYear))
	// Output: end of year 10.51, mid-year 11.02
}

func ExampleIRR() {
	if irr, ok, _ := IRR([]float64{-100, 30, 40, 50, 20}, MidYear); ok {
		fmt.Printf("IRR %.4g %%\n", 100*irr)
	}
	if _, ok, why := IRR([]float64{-1, 5, -6}, MidYear); !ok {
		fmt.Println(why)
	}
	// Output:
	// IRR 15.32 %
	// several discount rates give NPV = 0, 100 % and 200 % a year: the IRR is ambiguous
}

// The table of TestCashFlowHandWorked.
func ExampleCashFlow() {
	e, years, abandon := econHandTable()
	res, err := CashFlow(e, years, abandon)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, y := range res.Years {
		fmt.Printf("%d  revenue %5.4g  royalty %5.4g  opex %5.4g  capex %4.4g  net %6.4g million\n",
			y.Year, y.Revenue/1e6, y.Royalty/1e6, y.Opex/1e6, (y.Capex+y.Abandonment)/1e6, y.Net/1e6)
	}
	fmt.Printf("NPV10 %.4g million, IRR %.4g %%, payback %s\n", res.NPV/1e6, 100*res.IRR, res.Payback.Format("2 January 2006"))
	// Output:
	// 2030  revenue     0  royalty     0  opex     0  capex   15  net    -15 million
	// 2031  revenue  21.6  royalty   2.7  opex  3.95  capex    2  net  12.95 million
	// 2032  revenue  40.4  royalty  5.05  opex   6.3  capex    3  net  26.05 million
	// NPV10 16.64 million, IRR 81.84 %, payback 29 January 2032
}

// BenchmarkIRR: the scan and root finding on a 30-year table, an
// investment then a level income (IRR 10 %).
func BenchmarkIRR(b *testing.B) {
	net := []float64{-100 * (1 - math.Pow(1.1, -29)) / 0.1}
	for range 29 {
		net = append(net, 100)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, ok, why := IRR(net, MidYear); !ok {
			b.Fatal(why)
		}
	}
}
