package main

import (
	"fmt"
	"io"
	"path/filepath"

	"github.com/spf13/cobra"

	"slipfront/pipeline"
)

func newReportCmd(g *globalOptions, stderr io.Writer) *cobra.Command {
	var o folderOptions
	cmd := &cobra.Command{
		Use:   "report FOLDER --out DIR",
		Short: "Draw the pictures of a generate, screen, run or batch folder and gather them in one HTML page",
		Long: "report reads a folder written by generate, screen, run (or demo) or batch (or merge), draws its\n" +
			"pictures into DIR and writes DIR/" + pipeline.ReportPageFile + ": one self-contained page (pictures embedded, no\n" +
			"link outside it) with the inputs, the program version, the scenario's date, the caution, the\n" +
			"tables and every picture with a caption that says what to read from it.\n\n" + caution,
		Example: "  slipfront report slipfront-demo --out demo-report\n" +
			"  slipfront report screen --out screen-report\n" +
			"  slipfront report visc --out visc-report",
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			err := pipeline.WriteReport(cmd.Context(), args[0], o.folder())
			if err == nil {
				fmt.Fprintf(statusWriter(g, stderr), "wrote %s\n", filepath.Join(o.out, pipeline.ReportPageFile))
			}
			return err
		},
	}
	o.addFlags(cmd)
	return cmd
}
