package main

import (
	"coefaudit/cmd/coefaudit/internal/output"
	"coefaudit/extract"

	"github.com/spf13/cobra"
)

// templateOptions are what the template command runs with.
type templateOptions struct {
	path  string
	files *output.Files
}

func newTemplateCmd(runF func(*templateOptions) error) *cobra.Command {
	o := &templateOptions{}
	cmd := &cobra.Command{
		Use:   "template FILE.xlsx",
		Short: "Write a blank input workbook that explains every column",
		Long: `Write a blank workbook to FILE.xlsx with the sheets "coefficients", "claims"
and "correlations", their headers, drop-down lists for measure, published
and basis, input cells formatted as text (so that "0.40" keeps its zero),
and an "instructions" sheet explaining every column. An existing file is
not overwritten.`,
		Example: `  coefaudit template review.xlsx`,
		Args:    cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.path, o.files = args[0], runFiles(cmd)
			if runF != nil {
				return runF(o)
			}
			return runTemplate(o)
		},
	}
	return cmd
}

// runTemplate writes the blank workbook, never over an existing file.
func runTemplate(o *templateOptions) error {
	t, err := o.files.Create(o.path)
	if err != nil {
		return finish(o.files, flagError{err})
	}
	if err = extract.WriteTemplate(t); err == nil {
		err = t.Close()
	}
	return finish(o.files, err)
}
