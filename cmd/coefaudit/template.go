package main

import (
	"coefaudit/cmd/coefaudit/internal/output"
	"coefaudit/extract"

	"github.com/spf13/cobra"
)

func newTemplateCmd() *cobra.Command {
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
			t, err := output.Create(args[0])
			if err != nil {
				return flagError{err}
			}
			if err := extract.WriteTemplate(t); err != nil {
				t.Abort()
				return err
			}
			return t.Close()
		},
	}
	return cmd
}
