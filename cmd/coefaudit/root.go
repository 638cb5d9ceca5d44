package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"sync/atomic"
	"syscall"

	"coefaudit/cmd/coefaudit/internal/buildinfo"
	"coefaudit/cmd/coefaudit/internal/output"
	"coefaudit/report"

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
check"); 2 for a usage error or an input that cannot be read; 130 or 143
when the run was interrupted (Ctrl-C, SIGINT) or terminated (SIGTERM),
which removes every file the run had not finished.

Shell completion: "coefaudit completion bash" (or zsh, fish, powershell)
prints a completion script; "coefaudit completion bash --help" says how to
load it.`,
		SilenceErrors: true,
		SilenceUsage:  true,
		Version:       buildinfo.Current(),
	}
	root.SetVersionTemplate("{{.Version}}\n")
	root.SetOut(stdout)
	root.SetErr(stderr)
	// A flag cobra cannot parse is a usage error, like one a command rejects.
	root.SetFlagErrorFunc(func(_ *cobra.Command, err error) error { return flagError{err} })
	root.AddCommand(newCheckCmd(nil), newDemoCmd(nil), newTemplateCmd(nil), newCompareCmd(nil), newBootstrapCmd(nil), newPoolCmd(nil), newVersionCmd(nil), newImportCmd(nil))
	return root
}

// run executes the command line and returns the exit status. Errors are
// printed once, prefixed with the program's name.
//
// An interrupt (SIGINT, Ctrl-C) or SIGTERM ends the run at once: every
// file it was writing is removed (output.Files.Abort), and the status is
// 128 + the signal's number, as a shell reports a process the signal
// killed (130, 143). The command runs in a goroutine of its own, so that
// a run busy reading a large input need not notice the signal; the
// caller exits the process when run returns.
func run(args []string, stdout, stderr io.Writer) exitCode {
	files := output.NewFiles()
	sigs := make(chan os.Signal, 1)
	signal.Notify(sigs, os.Interrupt, syscall.SIGTERM)
	defer signal.Stop(sigs)
	var interrupted atomic.Bool
	done := make(chan exitCode, 1)
	go func() { done <- execute(args, stdout, stderr, files, &interrupted) }()
	select {
	case code := <-done:
		return code
	case sig := <-sigs:
		interrupted.Store(true)
		if !files.Abort() {
			// The files were already in place: the run is ending.
			interrupted.Store(false)
			return <-done
		}
		name, num := signalName(sig)
		fmt.Fprintf(stderr, "coefaudit: interrupted by %s: the run stopped, and no file it was writing was kept\n", name)
		return exitCode(128 + num)
	}
}

// signalName is the conventional name and the number of a signal run
// handles.
func signalName(sig os.Signal) (string, int) {
	if sig == syscall.SIGTERM {
		return "SIGTERM", int(syscall.SIGTERM)
	}
	return "SIGINT", int(syscall.SIGINT)
}

// execute runs the command line with the run's files. Once the run is
// interrupted, its error (its files were closed under it) is not printed:
// run says what happened.
func execute(args []string, stdout, stderr io.Writer, files *output.Files, interrupted *atomic.Bool) exitCode {
	root := newRootCmd(stdout, stderr)
	root.SetArgs(args)
	err := root.ExecuteContext(context.WithValue(context.Background(), filesKey{}, files))
	switch {
	case err == nil:
		return exitOK
	case errors.Is(err, errFlagged):
		return exitFlagged
	case interrupted.Load():
		return exitError
	}
	// The error may quote what was typed or read (a file name): its
	// control characters are shown, not sent to the terminal.
	fmt.Fprintf(stderr, "coefaudit: %s\n", report.EscapeControls(err.Error()))
	var fe flagError
	if errors.As(err, &fe) {
		fmt.Fprintln(stderr, "Run 'coefaudit help' for usage.")
	}
	return exitError
}

// filesKey is the context key of the run's output.Files.
type filesKey struct{}

// runFiles returns the files of the run executing cmd: those run handed
// it, or new ones for a command executed on its own (in tests).
func runFiles(cmd *cobra.Command) *output.Files {
	if f, ok := cmd.Context().Value(filesKey{}).(*output.Files); ok {
		return f
	}
	return output.NewFiles()
}

// finish ends a run's files: Commit when the run worked (err is nil or
// errFlagged), Abort otherwise. It returns err, or Commit's error.
func finish(files *output.Files, err error) error {
	if err != nil && !errors.Is(err, errFlagged) {
		files.Abort()
		return err
	}
	if cerr := files.Commit(); cerr != nil {
		return cerr
	}
	return err
}
