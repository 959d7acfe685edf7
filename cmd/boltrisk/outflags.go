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
	cmd.Flags().StringVar(&o.Dir, "out", "", "write PNG pictures, report.md and a self-contained report.html into this folder (created, or replaced as a whole at the end)")
	o.Now = time.Now
}

// provenance describes the run for the report.
func (o *outFlags) provenance(ss []*scenario.Scenario, seed uint64, requested, samples int64, workers int) report.Provenance {
	return report.Provenance{Version: toolVersion(), Command: "boltrisk " + strings.Join(os.Args[1:], " "),
		Seed: seed, Requested: requested, Samples: samples, Workers: workers, Date: o.Now(), Inputs: ss}
}

// write writes the review and lists the files on stderr.
func (o *outFlags) write(r *report.Review, ss []*scenario.Scenario, stderr io.Writer, quiet bool) error {
	files, err := report.WriteOutputs(o.Dir, r, inputFiles(ss...))
	if err != nil {
		return err
	}
	if !quiet {
		fmt.Fprintf(stderr, "boltrisk: wrote %d files to %s (open report.html)\n", len(files), o.Dir)
	}
	return nil
}
