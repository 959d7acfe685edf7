package plots

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"gonum.org/v1/plot"
)

// WriteAtomic writes a file through a temporary file in the same folder and
// renames it into place, so that a failure never leaves a half-written file.
func WriteAtomic(path string, write func(io.Writer) error) (err error) {
	dir, base := filepath.Split(path)
	if dir == "" {
		dir = "."
	}
	f, err := os.CreateTemp(dir, "."+base+".tmp-*")
	if err != nil {
		return fmt.Errorf("cannot write %s: %w", path, err)
	}
	defer func() {
		if err != nil {
			f.Close()
			os.Remove(f.Name())
		}
	}()
	if err = write(f); err != nil {
		return fmt.Errorf("cannot write %s: %w", path, err)
	}
	if err = f.Close(); err != nil {
		return fmt.Errorf("cannot write %s: %w", path, err)
	}
	if err = os.Chmod(f.Name(), 0o644); err != nil {
		return err
	}
	if err = os.Rename(f.Name(), path); err != nil {
		return fmt.Errorf("cannot write %s: %w", path, err)
	}
	return nil
}

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
