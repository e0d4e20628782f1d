package main

import (
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"slipfront/internal/export"
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
			if err := o.prepare(); err != nil {
				return err
			}
			err := export.WriteReport(cmd.Context(), args[0], o.out)
			if err == nil {
				fmt.Fprintf(statusWriter(g, stderr), "wrote %s/index.html\n", o.out)
			}
			return err
		},
	}
	o.addFlags(cmd)
	return cmd
}
