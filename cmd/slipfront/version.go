package main

import (
	"fmt"
	"io"
	"runtime"
	"strings"

	"github.com/spf13/cobra"

	"slipfront/internal/version"
)

// versionLine is what "slipfront version" and "slipfront --version" print.
func versionLine() string {
	return fmt.Sprintf("slipfront %s (%s, %s/%s)\n", version.Version, runtime.Version(), runtime.GOOS, runtime.GOARCH)
}

func newVersionCmd(stdout io.Writer) *cobra.Command {
	return &cobra.Command{
		Use:   "version",
		Short: "Print the program version (also: slipfront --version)",
		Args:  cobra.NoArgs,
		RunE: func(*cobra.Command, []string) error {
			_, err := io.WriteString(stdout, versionLine())
			return err
		},
	}
}

// addVersionFlag makes "slipfront --version" print the same line as
// "slipfront version".
func addVersionFlag(root *cobra.Command) {
	root.Version = version.Version
	root.SetVersionTemplate(strings.ReplaceAll(versionLine(), "{", "{{`{`}}"))
}
