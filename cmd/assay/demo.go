package main

import (
	"github.com/spf13/cobra"

	"assay/corpus/demo"
)

// demoSource is how the demo corpus is named in reports.
const demoSource = "demo corpus (embedded)"

func newDemoCmd(app *App) *cobra.Command {
	var f pickFlags
	cmd := &cobra.Command{
		Use:   "demo",
		Short: "Run pick on the embedded demo corpus",
		Long: `demo runs pick on a corpus built into assay: 178 invented documents of the
fictional Quillmere Basin Authority (flood defence, library and archive,
transit, moorland fire, staff conduct, water quality, community grants, IT
systems, wildlife survey, procurement), with a few near-duplicates, two exact
duplicates, a few one-off outliers, and letters and notices in French,
Spanish, Russian, Swedish, Norwegian and Hungarian. It takes every flag of
pick.`,
		Example: "  assay demo\n  assay demo --docs 12 --terms 25 --format json",
		Args: func(_ *cobra.Command, args []string) error {
			if len(args) != 0 {
				return usagef("demo takes no arguments (got %d)", len(args))
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, _ []string) error {
			opts, err := f.options(demoSource)
			if err != nil {
				return err
			}
			return runPick(cmd.Context(), app, demo.FS(), opts)
		},
	}
	f.register(cmd.Flags())
	return cmd
}
