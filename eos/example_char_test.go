package eos_test

import (
	"fmt"
	"log"

	"dewcell/eos"
)

func ExampleLibraryComponent() {
	c1, ok := eos.LibraryComponent("C1")
	if !ok {
		log.Fatal("no C1")
	}
	fmt.Printf("%s: Tc %.5g K, Pc %.4g Pa, omega %.3g\n", c1.Name, c1.Tc, c1.Pc, c1.Omega)
	c6, _ := eos.LibraryComponent("C6") // alias
	fmt.Println(c6.Name)
	// Output:
	// C1: Tc 190.56 K, Pc 4.599e+06 Pa, omega 0.011
	// nC6
}

func ExampleSplitPlus() {
	plus := eos.PlusFraction{Name: "C7+", FirstCarbon: 7, Z: 0.0821, M: 0.143, SG: 0.795}
	comps, z, err := eos.SplitPlus(plus, eos.Characterization{}) // gamma, alpha 1, 4 lumps, Kesler–Lee
	if err != nil {
		log.Fatal(err)
	}
	for i, c := range comps {
		fmt.Printf("%-8s z %.4g  M %.4g kg/mol  SG %.4g  Tc %.4g K\n", c.Name, z[i], c.M, c.SG, c.Tc)
	}
	// Output:
	// C7-C11   z 0.06129  M 0.1192 kg/mol  SG 0.7648  Tc 594.7 K
	// C12-C18  z 0.01776  M 0.1962 kg/mol  SG 0.8358  Tc 710.2 K
	// C19-C29  z 0.002897  M 0.3031 kg/mol  SG 0.9035  Tc 816.4 K
	// C30+     z 0.0001487  M 0.465 kg/mol  SG 0.9754  Tc 918.8 K
}

func ExampleDefaultKij() {
	n2, _ := eos.LibraryComponent("N2")
	c1, _ := eos.LibraryComponent("C1")
	nc6, _ := eos.LibraryComponent("nC6")
	// N2 pairs from the published table, C1–nC6 by Chueh–Prausnitz (A 0.18, B 6).
	k := eos.DefaultKij([]eos.Component{n2, c1, nc6}, eos.ChuehPrausnitz{})
	for i := 0; i < 3; i++ {
		fmt.Printf("%.4f %.4f %.4f\n", k[3*i], k[3*i+1], k[3*i+2])
	}
	// Output:
	// 0.0000 0.0311 0.1496
	// 0.0311 0.0000 0.0240
	// 0.1496 0.0240 0.0000
}
