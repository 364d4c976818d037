// Package mbal will hold the reservoir layer: volumes in place, depletion
// recovery versus pressure, condensate saturation and the production-history
// material balance, built on the experiments of package cvd. It has no code
// yet; see DESIGN.md for its place in the layers.
package mbal
