package plots

import (
	"bytes"

	"gonum.org/v1/plot"
)

// PNG renders a plot at the house size into PNG bytes.
func PNG(p *plot.Plot) ([]byte, error) {
	wt, err := p.WriterTo(Width, Height, "png")
	if err != nil {
		return nil, err
	}
	var buf bytes.Buffer
	if _, err := wt.WriteTo(&buf); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}
