package report

import (
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"github.com/google/renameio/v2"
)

// WriteFile writes a file durably and atomically: into a temporary file in
// the same folder, synced to disk, renamed into place (renameio), and the
// folder synced so that the rename itself survives a crash. A failure never
// leaves a half-written file.
func WriteFile(path string, write func(io.Writer) error) error {
	f, err := renameio.NewPendingFile(path, renameio.WithPermissions(0o644), renameio.WithExistingPermissions())
	if err != nil {
		return fmt.Errorf("cannot write %s: %w", path, err)
	}
	defer f.Cleanup()
	if err := write(f); err != nil {
		return fmt.Errorf("cannot write %s: %w", path, err)
	}
	if err := f.CloseAtomicallyReplace(); err != nil {
		return fmt.Errorf("cannot write %s: %w", path, err)
	}
	return syncDir(filepath.Dir(path))
}

// syncDir flushes a folder's entries (renames, new files) to disk.
func syncDir(dir string) error {
	d, err := os.Open(dir)
	if err != nil {
		return err
	}
	defer d.Close()
	if err := d.Sync(); err != nil && !errors.Is(err, os.ErrInvalid) {
		return fmt.Errorf("cannot sync %s: %w", dir, err)
	}
	return nil
}

// output is one file of a review folder.
type output struct {
	name  string
	write func(io.Writer) error
}

// WriteOutputs writes the review's pictures, report.md and report.html into
// dir. The files are written, synced, into a staged sibling folder that is
// renamed into place at the end, so a reader never sees a mix of old and new
// files and an interrupted run leaves dir as it was; an existing dir is
// replaced only then. It refuses to replace a folder holding any of the
// protected input files, or holding files it would not write (it replaces
// only earlier reports).
func WriteOutputs(dir string, r *Review, protect []string) ([]string, error) {
	outs := []output{}
	for _, f := range r.Figures {
		outs = append(outs, output{f.File, func(w io.Writer) error { _, err := w.Write(f.PNG); return err }})
	}
	outs = append(outs, output{"report.md", r.WriteMarkdown}, output{"report.html", r.WriteHTML})
	dir = filepath.Clean(dir)
	if err := checkReplaceable(dir, outs, protect); err != nil {
		return nil, err
	}
	parent := filepath.Dir(dir)
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return nil, fmt.Errorf("cannot create output folder: %w", err)
	}
	stage, err := os.MkdirTemp(parent, "."+filepath.Base(dir)+".staging-")
	if err != nil {
		return nil, fmt.Errorf("cannot create output folder: %w", err)
	}
	defer os.RemoveAll(stage) // no-op once renamed
	if err := os.Chmod(stage, 0o755); err != nil {
		return nil, err
	}
	var written []string
	for _, o := range outs {
		if err := WriteFile(filepath.Join(stage, o.name), o.write); err != nil {
			return nil, err
		}
		written = append(written, filepath.Join(dir, o.name))
	}
	if err := syncDir(stage); err != nil {
		return nil, err
	}
	// Move an earlier report aside, put the new one in place, drop the old.
	var old string
	if _, err := os.Stat(dir); err == nil {
		old = stage + ".old"
		if err := os.Rename(dir, old); err != nil {
			return nil, fmt.Errorf("cannot replace %s: %w", dir, err)
		}
	}
	if err := os.Rename(stage, dir); err != nil {
		if old != "" {
			os.Rename(old, dir)
		}
		return nil, fmt.Errorf("cannot write %s: %w", dir, err)
	}
	if err := syncDir(parent); err != nil {
		return nil, err
	}
	if old != "" {
		os.RemoveAll(old)
	}
	return written, nil
}

// checkReplaceable refuses an output folder that holds an input file or
// anything but an earlier report's files.
func checkReplaceable(dir string, outs []output, protect []string) error {
	ents, err := os.ReadDir(dir)
	if errors.Is(err, os.ErrNotExist) {
		return nil
	}
	if err != nil {
		st, serr := os.Stat(dir)
		if serr == nil && !st.IsDir() {
			return fmt.Errorf("refusing to write into %s: it is a file, not a folder", dir)
		}
		return fmt.Errorf("cannot read output folder: %w", err)
	}
	for _, in := range protect {
		ist, err := os.Stat(in)
		if err != nil {
			continue
		}
		for _, e := range ents {
			if st, err := os.Stat(filepath.Join(dir, e.Name())); err == nil && os.SameFile(st, ist) {
				return fmt.Errorf("refusing to write %s: it holds the input file %s", dir, in)
			}
		}
	}
	for _, e := range ents {
		if !isReportFile(e.Name()) {
			return fmt.Errorf("refusing to replace %s: it holds %s, which is not part of a report (give an empty or new folder)", dir, e.Name())
		}
	}
	return nil
}

// isReportFile reports whether a file name is one a review folder holds.
func isReportFile(name string) bool {
	switch filepath.Ext(name) {
	case ".png":
		return true
	}
	return name == "report.md" || name == "report.html" || name == "screenshot.png"
}
