package main

import (
	"fmt"
	"io"
	"os"
	"strings"
	"time"

	"github.com/spf13/cobra"

	"boltrisk/montecarlo/report"
	"boltrisk/montecarlo/scenario"
)

// outFlags are the report-writing options of the analysis commands.
type outFlags struct {
	Dir string
	Now func() time.Time // injected clock for the provenance date
}

func (o *outFlags) add(cmd *cobra.Command) {
	cmd.Flags().StringVar(&o.Dir, "out", "", "write PNG pictures, report.md and a self-contained report.html into this folder (created if missing)")
	o.Now = time.Now
}

// provenance describes the run for the report.
func provenance(ss []*scenario.Scenario, seed uint64, samples int64, workers int, now func() time.Time) report.Provenance {
	return report.Provenance{Version: toolVersion(), Command: "boltrisk " + strings.Join(os.Args[1:], " "),
		Seed: seed, Samples: samples, Workers: workers, Date: now(), Inputs: ss}
}

// write writes the review and lists the files on stderr.
func (o *outFlags) write(r *report.Review, ss []*scenario.Scenario, stderr io.Writer, quiet bool) error {
	var protect []string
	for _, s := range ss {
		if s.File != "" {
			protect = append(protect, s.File)
		}
	}
	files, err := report.WriteOutputs(o.Dir, r, protect)
	if err != nil {
		return err
	}
	if !quiet {
		fmt.Fprintf(stderr, "boltrisk: wrote %d files to %s (open report.html)\n", len(files), o.Dir)
	}
	return nil
}
