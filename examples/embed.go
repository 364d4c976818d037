// Package examples holds the study files of an invented field, ready to run.
// The demo command embeds one of them.
package examples

import "embed"

// StudyName is the file name of the bundled example study.
const StudyName = "sablewick.toml"

// Study is the content of the bundled example study, examples/sablewick.toml.
//
//go:embed sablewick.toml
var Study []byte

// Files holds the bundled example study and the laboratory tables its
// [lab] section names, for study.ParseFS.
//
//go:embed sablewick.toml lab/*.csv
var Files embed.FS
