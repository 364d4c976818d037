package eos

import "math"

// Small dense solvers working in place on caller-owned storage, so the hot
// loops of the flash and saturation solvers allocate nothing.

// luSolve solves a·x = b for x by Gaussian elimination with partial pivoting.
// a is n×n row-major and is overwritten; b is overwritten by x. It reports
// false when a is singular to working precision.
func luSolve(a []float64, n int, b []float64) bool {
	// The loops run over row slices, as in cholSolve, so that the compiler
	// drops their bounds checks; the arithmetic is that of the indexed loops.
	a = a[:n*n]
	b = b[:n]
	for k := 0; k < n; k++ {
		piv, big := k, math.Abs(a[k*n+k])
		for i := k + 1; i < n; i++ {
			if v := math.Abs(a[i*n+k]); v > big {
				piv, big = i, v
			}
		}
		if big == 0 || math.IsNaN(big) {
			return false
		}
		rk := a[k*n : k*n+n]
		if piv != k {
			rp := a[piv*n : piv*n+n]
			rp = rp[:len(rk)]
			for j, v := range rk {
				rk[j], rp[j] = rp[j], v
			}
			b[k], b[piv] = b[piv], b[k]
		}
		inv := 1 / rk[k]
		tail := rk[k+1:]
		bk := b[k]
		for i := k + 1; i < n; i++ {
			ri := a[i*n : i*n+n]
			m := ri[k] * inv
			if m == 0 {
				continue
			}
			ti := ri[k+1:]
			ti = ti[:len(tail)]
			for j, v := range tail {
				ti[j] -= m * v
			}
			b[i] -= m * bk
		}
	}
	for i := n - 1; i >= 0; i-- {
		ri := a[i*n+i : i*n+n]
		bt := b[i+1:]
		bt = bt[:len(ri)-1]
		s := b[i]
		for j, v := range bt {
			s -= ri[j+1] * v
		}
		b[i] = s / ri[0]
	}
	return true
}

// cholSolve solves a·x = b for symmetric positive-definite a (n×n row-major,
// overwritten by its Cholesky factor); b is overwritten by x. It reports false
// when a is not positive definite. The loops run over row slices so that the
// compiler drops their bounds checks.
func cholSolve(a []float64, n int, b []float64) bool {
	a = a[:n*n]
	b = b[:n]
	for j := 0; j < n; j++ {
		rj := a[j*n : j*n+j+1]
		s := rj[j]
		for _, v := range rj[:j] {
			s -= v * v
		}
		if !(s > 0) {
			return false
		}
		d := math.Sqrt(s)
		rj[j] = d
		lj := rj[:j]
		for i := j + 1; i < n; i++ {
			ri := a[i*n : i*n+j+1]
			s := ri[j]
			for k, v := range ri[:j] {
				s -= v * lj[k]
			}
			ri[j] = s / d
		}
	}
	cholSubst(a, n, b)
	return true
}

// cholSubst solves L·Lᵀ·x = b with the factor L that cholSolve left in the
// lower triangle of a (n×n row-major), overwriting b with x.
func cholSubst(a []float64, n int, b []float64) {
	a = a[:n*n]
	b = b[:n]
	for i := 0; i < n; i++ {
		ri := a[i*n : i*n+i+1]
		s := b[i]
		for k, v := range ri[:i] {
			s -= v * b[k]
		}
		b[i] = s / ri[i]
	}
	for i := n - 1; i >= 0; i-- {
		s := b[i]
		for k := i + 1; k < n; k++ {
			s -= a[k*n+i] * b[k]
		}
		b[i] = s / a[i*n+i]
	}
}
