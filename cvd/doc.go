// Package cvd will hold the simulated laboratory experiments on a fluid
// described by package eos: constant-volume depletion, constant-composition
// expansion and the separator train, with lab-data import, comparison and
// tuning. It has no code yet; see DESIGN.md for its place in the layers.
package cvd
