package eos

import (
	"fmt"
	"math/rand"
	"testing"
)

func caseK(t *testing.T, want int) (*Fluid, []float64, float64) {
	rng := rand.New(rand.NewSource(7))
	for k := 0; ; k++ {
		fl, z := randomCondensate(t, rng)
		T := degF(150 + 200*rng.Float64())
		if k == want {
			return fl, z, T
		}
	}
}

func TestTmpDbgN(t *testing.T) {
	fl, z, T := caseK(t, 115)
	up, _ := UpperSaturation(fl, T, z, nil)
	env, _ := TraceEnvelope(fl, z, nil)
	fmt.Println("T", T, "crit", env.Critical, up.P)
	f := NewFlasher(fl, nil)
	var r FlashResult

	err := f.Flash(&r, T, up.P*0.999, z)
	fmt.Println(err)
}
