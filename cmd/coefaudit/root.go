package main

import (
	"errors"
	"fmt"
	"io"

	"github.com/spf13/cobra"
)

// exitCode is the process's exit status.
type exitCode int

const (
	exitOK      exitCode = 0 // the run worked and nothing was flagged
	exitFlagged exitCode = 1 // the run worked and a claim was flagged
	exitError   exitCode = 2 // a usage or input error
)

// flagError marks an error in how the command was called.
type flagError struct{ err error }

func (e flagError) Error() string { return e.err.Error() }
func (e flagError) Unwrap() error { return e.err }

func flagErrorf(format string, a ...any) error { return flagError{fmt.Errorf(format, a...)} }

// errFlagged is returned by a command whose run worked but flagged claims.
var errFlagged = errors.New("claims flagged")

func newRootCmd(stdout, stderr io.Writer) *cobra.Command {
	root := &cobra.Command{
		Use:   "coefaudit",
		Short: "Audit published comparisons of coefficients",
		Long: `coefaudit checks the comparisons a paper makes between two coefficients
("the effect of A is stronger than that of B", "no difference between the
groups"). From what was printed - estimates, intervals, SEs, p-values,
sample sizes - it reconstructs what was left out, runs the test the design
requires and says whether the published verdict stands, allowing for the
rounding of the printed numbers.

A flag is a reason to look again, not proof of error or misconduct.

Exit status: 0 when the run worked and no claim was flagged; 1 when the
run worked and a claim was flagged (an outcome listed in --fail-on; by
default unsupported, missed, reversed or conflict; see "coefaudit help
check"); 2 for a usage error or an input that cannot be read.

Shell completion: "coefaudit completion bash" (or zsh, fish, powershell)
prints a completion script; "coefaudit completion bash --help" says how to
load it.`,
		SilenceErrors: true,
		SilenceUsage:  true,
	}
	root.SetOut(stdout)
	root.SetErr(stderr)
	// A flag cobra cannot parse is a usage error, like one a command rejects.
	root.SetFlagErrorFunc(func(_ *cobra.Command, err error) error { return flagError{err} })
	root.AddCommand(newCheckCmd(nil), newDemoCmd(nil), newTemplateCmd(nil), newCompareCmd(nil), newBootstrapCmd(nil), newPoolCmd(nil))
	return root
}

// run executes the command line and returns the exit status. Errors are
// printed once, prefixed with the program's name.
func run(args []string, stdout, stderr io.Writer) exitCode {
	root := newRootCmd(stdout, stderr)
	root.SetArgs(args)
	err := root.Execute()
	switch {
	case err == nil:
		return exitOK
	case errors.Is(err, errFlagged):
		return exitFlagged
	}
	fmt.Fprintf(stderr, "coefaudit: %v\n", err)
	var fe flagError
	if errors.As(err, &fe) {
		fmt.Fprintln(stderr, "Run 'coefaudit help' for usage.")
	}
	return exitError
}
