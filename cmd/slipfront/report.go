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
		Use:   "report RUN_OR_BATCH_DIR --out DIR",
		Short: "Draw the pictures of a run or batch folder and gather them in an HTML page",
		Example: "  slipfront report slipfront-demo --out demo-report\n" +
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
