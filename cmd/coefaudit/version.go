package main

import (
	"fmt"

	"coefaudit/cmd/coefaudit/internal/buildinfo"

	"github.com/spf13/cobra"
)

// versionOptions are what the version command runs with.
type versionOptions struct {
	print func(string)
}

func newVersionCmd(runF func(*versionOptions) error) *cobra.Command {
	o := &versionOptions{}
	return &cobra.Command{
		Use:   "version",
		Short: "Print the version and the source revision of this build",
		Long: `Print the module version of this build of coefaudit and the revision of the
source it was built from, as the Go toolchain recorded them in the binary
("(devel)" for a build from a source tree; the revision is recorded by
go build inside a git checkout). "coefaudit --version" prints the same.`,
		Example: `  coefaudit version`,
		Args:    cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			o.print = func(s string) { fmt.Fprintln(cmd.OutOrStdout(), s) }
			if runF != nil {
				return runF(o)
			}
			o.print(buildinfo.Current())
			return nil
		},
	}
}
