// Package examples holds the study files of an invented field, ready to run.
// The demo command embeds one of them.
package examples

import _ "embed"

// StudyName is the file name of the bundled example study.
const StudyName = "sablewick.toml"

// Study is the content of the bundled example study, examples/sablewick.toml.
//
//go:embed sablewick.toml
var Study []byte
