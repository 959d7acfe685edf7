package main

import (
	"fmt"
	"io"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"boltrisk/model"
	"boltrisk/model/units"
	"boltrisk/montecarlo"
	"boltrisk/montecarlo/scenario"
)

var catalogTopics = []string{"threads", "classes", "materials", "conditions", "tools", "inputs"}

func newCatalogCmd(stdout io.Writer) *cobra.Command {
	return &cobra.Command{
		Use:   "catalog [threads|classes|materials|conditions|tools|inputs]",
		Short: "Print the built-in tables: threads, property classes, materials, presets",
		Long: `Print the built-in catalogues with their sources. Without a topic, list the topics.
Any catalogue value can be overridden in a scenario by giving it explicitly.`,
		Args:      cobra.MaximumNArgs(1),
		ValidArgs: catalogTopics,
		RunE: func(cmd *cobra.Command, args []string) error {
			if len(args) == 0 {
				fmt.Fprintln(stdout, "topics:", catalogTopics)
				return nil
			}
			return writeCatalog(stdout, args[0])
		},
	}
}

func writeCatalog(w io.Writer, topic string) error {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	defer tw.Flush()
	switch topic {
	case "threads":
		fmt.Fprintln(tw, "name\tseries\td mm\tpitch mm\td2 mm\tminor mm\tAs mm²\tAs in²\t")
		for _, t := range model.Threads() {
			fmt.Fprintf(tw, "%s\t%s\t%.4g\t%.4g\t%.4f\t%.4f\t%.2f\t%.4f\t\n", t.Name, t.Series, t.D, t.Pitch, t.PitchDia, t.MinorDia, t.StressArea, t.StressArea/645.16)
		}
		fmt.Fprintln(tw, "\nSources: ISO 261/262/724 and ISO 898-1 (metric); ASME B1.1 (unified); areas from the standards' formulas.\t")
	case "classes":
		fmt.Fprintln(tw, "class\tstandard\tsizes\tSp MPa\tSy MPa\tSut MPa\tSe MPa\tnote\t")
		for _, c := range model.PropertyClasses() {
			sizes := "all"
			switch {
			case c.MaxD > 0:
				sizes = fmt.Sprintf("d ≤ %.4g mm", c.MaxD)
			case c.MinD > 0:
				sizes = fmt.Sprintf("d > %.4g mm", c.MinD)
			}
			se := "-"
			if c.Endurance > 0 {
				se = fmt.Sprintf("%.4g", c.Endurance)
			}
			fmt.Fprintf(tw, "%s\t%s\t%s\t%.4g\t%.4g\t%.4g\t%s\t%s\t\n", c.Name, c.Standard, sizes, c.Proof, c.Yield, c.Tensile, se, c.Note)
		}
		fmt.Fprintln(tw, "\nSe: fully corrected endurance strength of rolled threads, Shigley 9th ed. Table 8-17.\t")
	case "materials":
		fmt.Fprintln(tw, "material\tE GPa\tν\tWileman A\tWileman B\tfy MPa\tfu MPa\tsource\t")
		for _, m := range model.Materials() {
			fmt.Fprintf(tw, "%s\t%.4g\t%.3g\t%s\t%s\t%s\t%s\t%s\t\n", m.Name, m.Modulus/1000, m.Poisson, dash(m.WilemanA), dash(m.WilemanB), dash(m.Yield), dash(m.Tensile), m.Source)
		}
	case "conditions":
		fmt.Fprintln(tw, "condition\tnut factor K\tc.o.v.\tμ range\tdescription\tsource\t")
		for _, c := range scenario.Conditions {
			fmt.Fprintf(tw, "%s\t%.3g\t%.3g\t%.2f–%.2f (class %s)\t%s\t%s\t\n", c.Name, c.NutFactor, c.NutFactorCOV, c.FrictionLo, c.FrictionHi, c.FrictionClass, c.Description, c.Source)
		}
	case "tools":
		fmt.Fprintln(tw, "tool\tcontrols\ttolerance at 3σ\tdescription\tsource\t")
		for _, t := range scenario.Tools {
			fmt.Fprintf(tw, "%s\t%s\t±%.0f %%\t%s\t%s\t\n", t.Name, t.Controls, 100*t.Tolerance, t.Description, t.Source)
		}
	case "inputs":
		fmt.Fprintln(tw, "input path\tunit (SI)\tper bolt\tmeaning\t")
		for _, f := range scenario.Fields() {
			u, _ := units.SI.Unit(f.Dim)
			if u == "" {
				u = f.Dim.String()
			}
			fmt.Fprintf(tw, "%s\t%s\t%v\t%s\t\n", f.Path, u, f.Role&montecarlo.PerBolt != 0, f.Help)
		}
	default:
		return usagef("unknown catalogue %q (allowed: %v)", topic, catalogTopics)
	}
	return nil
}

func dash(v float64) string {
	if v == 0 {
		return "-"
	}
	return fmt.Sprintf("%.5g", v)
}
