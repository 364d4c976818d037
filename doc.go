// Package dewcell holds no code: its test, deps_test.go, enforces the
// layering of the module's packages, which DEVELOPERS.md describes.
//
//	cmd/dewcell  ->  mbal  ->  cvd  ->  eos  ->  internal/phys, gonum, standard library
//
// The library packages (eos, cvd, mbal and the internal packages outside
// cmd) never import the command line, its output libraries or anything under
// cmd/, even indirectly.
package dewcell
