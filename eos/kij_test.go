package eos

import (
	"math"
	"testing"
)

// kijFluid returns the library components and a lumped C7+ for kij tests.
func kijFluid(t *testing.T) []Component {
	t.Helper()
	var comps []Component
	for _, name := range LibraryNames() {
		c, _ := LibraryComponent(name)
		comps = append(comps, c)
	}
	plus, _, err := SplitPlus(PlusFraction{FirstCarbon: 7, Z: 0.08, M: 0.143, SG: 0.795}, Characterization{})
	if err != nil {
		t.Fatal(err)
	}
	return append(comps, plus...)
}

func compIndex(comps []Component, name string) int {
	for i, c := range comps {
		if c.Name == name {
			return i
		}
	}
	return -1
}

// TestDefaultKijPublished checks the non-hydrocarbon entries against the PR
// table of METHODS.md 3.5 (values stored in a process-simulator databank,
// attributed to Knapp et al. 1982, DECHEMA Chemistry Data Series VI).
func TestDefaultKijPublished(t *testing.T) {
	t.Parallel()
	comps := kijFluid(t)
	n := len(comps)
	k := DefaultKij(comps, ChuehPrausnitz{})
	for _, tt := range []struct {
		a, b string
		want float64
	}{
		{"N2", "C1", 0.0311}, {"N2", "C2", 0.0515}, {"N2", "C3", 0.0852}, {"N2", "nC4", 0.0800},
		{"N2", "nC5", 0.1000}, {"N2", "nC6", 0.1496},
		{"CO2", "C1", 0.0919}, {"CO2", "C2", 0.1322}, {"CO2", "C3", 0.1241}, {"CO2", "nC4", 0.1333},
		{"CO2", "nC5", 0.1222}, {"CO2", "nC6", 0.1100},
		{"H2S", "C1", 0.0850}, {"H2S", "C2", 0.0833}, {"H2S", "C3", 0.0878}, {"H2S", "nC4", 0.0650},
		{"H2S", "nC5", 0.0630}, {"H2S", "nC6", 0.0570},
		{"N2", "CO2", -0.0170}, {"N2", "H2S", 0.1767}, {"CO2", "H2S", 0.0974},
		// Isomers take the normal isomer's value (rule of DefaultKij, no published source).
		{"N2", "iC4", 0.0800}, {"CO2", "iC5", 0.1222}, {"H2S", "iC4", 0.0650},
	} {
		i, j := compIndex(comps, tt.a), compIndex(comps, tt.b)
		if got := k[i*n+j]; got != tt.want {
			t.Errorf("k(%s, %s) = %g, want %g (METHODS.md 3.5)", tt.a, tt.b, got, tt.want)
		}
		if got := k[j*n+i]; got != tt.want {
			t.Errorf("k(%s, %s) = %g, want %g (METHODS.md 3.5)", tt.b, tt.a, got, tt.want)
		}
	}
}

// TestDefaultKijHeavy: components beyond the library take the nC7 value up to
// M(nC7), the nC10 value from M(nC10), in between linearly (DefaultKij's
// rule; the nC7 and nC10 columns are METHODS.md 3.5).
func TestDefaultKijHeavy(t *testing.T) {
	t.Parallel()
	n2, _ := LibraryComponent("N2")
	co2, _ := LibraryComponent("CO2")
	h2s, _ := LibraryComponent("H2S")
	for _, tt := range []struct {
		m            float64 // kg/mol
		n2, co2, h2s float64
	}{
		{0.090, 0.1441, 0.1000, 0.0550},    // lighter than nC7: nC7 column
		{0.100205, 0.1441, 0.1000, 0.0550}, // nC7
		{0.142286, 0.1293, 0.1141, 0.0450}, // nC10
		{0.400, 0.1293, 0.1141, 0.0450},    // heavier than nC10: nC10 column
	} {
		p := Component{Name: "P1", M: tt.m, Vc: 5e-4}
		k := DefaultKij([]Component{n2, co2, h2s, p}, ChuehPrausnitz{})
		if k[0*4+3] != tt.n2 || k[1*4+3] != tt.co2 || k[2*4+3] != tt.h2s {
			t.Errorf("M = %g kg/mol: k(N2, CO2, H2S with P1) = %g, %g, %g; want %g, %g, %g",
				tt.m, k[3], k[7], k[11], tt.n2, tt.co2, tt.h2s)
		}
	}
	mid := Component{Name: "P2", M: 0.12, Vc: 5e-4}
	k := DefaultKij([]Component{n2, co2, mid}, ChuehPrausnitz{})
	if !(k[2] < 0.1441 && k[2] > 0.1293) || !(k[5] > 0.1000 && k[5] < 0.1141) {
		t.Errorf("M between nC7 and nC10: k(N2, P2) = %g, k(CO2, P2) = %g; want between the nC7 and nC10 values", k[2], k[5])
	}
}

// TestDefaultKijStructure: symmetric, zero diagonal, within (−1, 1), and
// accepted by NewFluid for a full fluid with lumped pseudo-components.
func TestDefaultKijStructure(t *testing.T) {
	t.Parallel()
	comps := kijFluid(t)
	n := len(comps)
	for _, cp := range []ChuehPrausnitz{{}, {A: 0.25, B: 4}, {Off: true}} {
		k := DefaultKij(comps, cp)
		if len(k) != n*n {
			t.Fatalf("len = %d, want %d", len(k), n*n)
		}
		for i := 0; i < n; i++ {
			if k[i*n+i] != 0 {
				t.Errorf("k(%s, %s) = %g, want 0", comps[i].Name, comps[i].Name, k[i*n+i])
			}
			for j := 0; j < n; j++ {
				if k[i*n+j] != k[j*n+i] || math.Abs(k[i*n+j]) >= 1 {
					t.Errorf("k(%s, %s) = %g, k(%s, %s) = %g", comps[i].Name, comps[j].Name, k[i*n+j], comps[j].Name, comps[i].Name, k[j*n+i])
				}
			}
		}
		if _, err := NewFluid(comps, k, Options{}); err != nil {
			t.Errorf("NewFluid with DefaultKij(%+v): %v", cp, err)
		}
	}
	if got := DefaultKij(nil, ChuehPrausnitz{}); len(got) != 0 {
		t.Errorf("DefaultKij(nil) = %v", got)
	}
}

// TestChuehPrausnitz checks the identities of the Chueh–Prausnitz (1967)
// form: zero for equal critical volumes, increasing with their ratio, and
// bounded by A (the bracket lies in (0, 1]); defaults A = 0.18, B = 6
// (from memory).
func TestChuehPrausnitz(t *testing.T) {
	t.Parallel()
	var cp ChuehPrausnitz
	if got := cp.Kij(98.6e-6, 98.6e-6); got != 0 {
		t.Errorf("equal Vc: k = %g, want 0", got)
	}
	prev := 0.0
	for _, vc := range []float64{145.5e-6, 200e-6, 368e-6, 1e-3, 3e-3, 1} {
		got := cp.Kij(98.6e-6, vc)
		if !(got > prev && got < 0.18) {
			t.Errorf("k(C1, Vc = %g) = %g, want increasing, below A = 0.18", vc, got)
		}
		if sym := cp.Kij(vc, 98.6e-6); sym != got {
			t.Errorf("k not symmetric: %g vs %g", got, sym)
		}
		prev = got
	}
	if def, explicit := cp.Kij(98.6e-6, 1e-3), (ChuehPrausnitz{A: 0.18, B: 6}).Kij(98.6e-6, 1e-3); def != explicit {
		t.Errorf("zero value gives %g, A = 0.18, B = 6 gives %g", def, explicit)
	}
	// k scales with A.
	if a, b := (ChuehPrausnitz{A: 0.1}).Kij(1e-4, 1e-3), (ChuehPrausnitz{A: 0.2}).Kij(1e-4, 1e-3); math.Abs(b-2*a) > 1e-15 {
		t.Errorf("A = 0.1 gives %g, A = 0.2 gives %g, want twice", a, b)
	}
	if got := (ChuehPrausnitz{Off: true}).Kij(1e-4, 1e-3); got != 0 {
		t.Errorf("Off: k = %g, want 0", got)
	}
	if got := cp.Kij(0, 1e-3); got != 0 {
		t.Errorf("unknown Vc: k = %g, want 0", got)
	}
	// Hydrocarbon pairs of DefaultKij use it.
	c1, _ := LibraryComponent("C1")
	c6, _ := LibraryComponent("nC6")
	if k := DefaultKij([]Component{c1, c6}, cp); k[1] != cp.Kij(c1.Vc, c6.Vc) || k[1] <= 0 {
		t.Errorf("k(C1, nC6) = %g, want Chueh–Prausnitz %g", k[1], cp.Kij(c1.Vc, c6.Vc))
	}
}
