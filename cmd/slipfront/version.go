package main

import (
	"fmt"
	"io"
	"runtime"

	"github.com/spf13/cobra"

	"slipfront/internal/version"
)

func newVersionCmd(stdout io.Writer) *cobra.Command {
	return &cobra.Command{
		Use:   "version",
		Short: "Print the program version",
		Args:  cobra.NoArgs,
		RunE: func(*cobra.Command, []string) error {
			_, err := fmt.Fprintf(stdout, "slipfront %s (%s, %s/%s)\n", version.Version, runtime.Version(), runtime.GOOS, runtime.GOARCH)
			return err
		},
	}
}
