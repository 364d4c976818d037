package figure

import (
	"errors"

	"dewcell/cmd/dewcell/internal/report"
)

func SVG(f *report.Figure) ([]byte, error)          { return nil, errors.New("not yet") }
func PNG(f *report.Figure, dpi int) ([]byte, error) { return nil, errors.New("not yet") }

func InlineSVG(f *report.Figure) ([]byte, error) {
	return []byte(`<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 100 60" width="100%"><text x="10" y="30">` + f.Title + `</text></svg>`), nil
}
