package main

import (
	"coefaudit/fixtures"

	"github.com/spf13/cobra"
)

func newDemoCmd() *cobra.Command {
	var o reportOptions
	cmd := &cobra.Command{
		Use:   "demo",
		Short: "Audit the bundled demo workbook (invented data)",
		Long: `Run "check" on the demo workbook bundled with the program: an invented
review of several studies whose claims show every outcome the audit can
give. The data are invented for the demonstration; no real study is meant.
"coefaudit demo --save FILE.xlsx" writes the workbook out so you can open it.`,
		Example: `  coefaudit demo
  coefaudit demo --format json
  coefaudit demo --save demo.xlsx`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := o.validate(); err != nil {
				return err
			}
			save, _ := cmd.Flags().GetString("save")
			if save != "" {
				return fixtures.SaveDemo(save)
			}
			path, cleanup, err := fixtures.DemoFile()
			if err != nil {
				return err
			}
			defer cleanup()
			return runReport(cmd, path, fixtures.DemoName, o)
		},
	}
	o.bind(cmd)
	cmd.Flags().String("save", "", "write the demo workbook to this file instead of auditing it")
	return cmd
}
