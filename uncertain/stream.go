package uncertain

import (
	"math/bits"
	"math/rand/v2"
)

// golden is ⌊2⁶⁴/φ⌋, φ the golden ratio, an odd number: the increment of
// SplitMix64 (Steele, Lea and Flood (2014)). golden2 is 2 golden mod 2⁶⁴.
const (
	golden  = 0x9e3779b97f4a7c15
	golden2 = 0x3c6ef372fe94f82a
)

// mix64 is the SplitMix64 finaliser (Steele, Lea and Flood (2014), with
// the shifts and multipliers of Stafford's "Mix13" variant that Java's
// SplittableRandom uses, from memory): a bijection of the 64-bit words
// whose every output bit depends on every input bit.
func mix64(z uint64) uint64 {
	z = (z ^ z>>30) * 0xbf58476d1ce4e5b9
	z = (z ^ z>>27) * 0x94d049bb133111eb
	return z ^ z>>31
}

// Stream returns the random stream number index of seed: a PCG generator
// (O'Neill (2014); math/rand/v2's PCG-DXSM) whose 128-bit state is
// (mix64(seed + γ), mix64(index + mix64(seed + 2γ))), γ the golden-ratio
// increment of SplitMix64. Both words are bijections, of the seed and, for
// a given seed, of the index, so distinct (seed, index) pairs start
// distinct generators, at unrelated points of PCG's period of 2¹²⁸: the
// streams are independent for all practical purposes, however close their
// seeds or indices.
//
// A probabilistic run draws each case from its own stream, Stream(seed,
// case number): the case then sees the same random numbers whichever
// goroutine evaluates it and however many there are, so the results do not
// depend on the number of workers. The generator is not safe for concurrent
// use; each goroutine needs its own, which a stream per case gives.
func Stream(seed, index uint64) *rand.Rand {
	return rand.New(rand.NewPCG(mix64(seed+golden), mix64(index+mix64(seed+golden2))))
}

// Tags that derive the seeds of the package's own streams from the seed a
// caller gives, so that a design and a caller's Stream(seed, i) of the same
// seed do not coincide.
const (
	tagMonteCarlo = 0x4d6f6e74_65436172 // "MonteCar"
	tagLatin      = 0x4c617469_6e487970 // "LatinHyp"
	tagImanCon    = 0x496d616e_436f6e6f // "ImanCono"
)

// derive returns the seed of the streams that the purpose tag draws from
// seed: mix64(seed ⊕ tag), a bijection of seed.
func derive(seed, tag uint64) uint64 { return mix64(seed ^ tag) }

// open01 returns a uniform draw from the open interval (0, 1): the 53 upper
// bits of a 64-bit draw plus one half, over 2⁵³. It is never 0 or 1, so a
// quantile function never sees its support's infinite ends.
func open01(r *rand.Rand) float64 {
	return (float64(r.Uint64()>>11) + 0.5) / (1 << 53)
}

// below returns a uniform integer in [0, n), n > 0, by Lemire's (2019)
// multiply-and-reject method on 64-bit draws. The package uses it rather
// than rand's IntN so that its designs depend on the generator's 64-bit
// output alone.
func below(r *rand.Rand, n uint64) uint64 {
	hi, lo := bits.Mul64(r.Uint64(), n)
	if lo < n {
		threshold := -n % n // 2⁶⁴ mod n
		for lo < threshold {
			hi, lo = bits.Mul64(r.Uint64(), n)
		}
	}
	return hi
}

// shuffle fills p with a uniformly random permutation of 0, …, len(p)−1 by
// Durstenfeld's (1964) version of the Fisher–Yates shuffle.
func shuffle(r *rand.Rand, p []int) {
	for i := range p {
		p[i] = i
	}
	for i := len(p) - 1; i > 0; i-- {
		j := int(below(r, uint64(i+1)))
		p[i], p[j] = p[j], p[i]
	}
}
