package main

import (
	"fmt"
	"os"
	"path/filepath"

	"coefaudit/fixtures"

	"github.com/spf13/cobra"
)

// demoOptions are the flags of the demo command.
type demoOptions struct {
	check   checkOptions
	save    string
	article bool
}

func newDemoCmd(runF func(*demoOptions) error) *cobra.Command {
	o := &demoOptions{}
	cmd := &cobra.Command{
		Use:   "demo",
		Short: "Audit the bundled demo workbook (invented data)",
		Long: `Run "check" on the demo workbook bundled with the program: an invented
review of several studies whose claims show every outcome the audit can
give. The data are invented for the demonstration; no real study is meant.
"coefaudit demo --save FILE.xlsx" writes the workbook out so you can open it.

"coefaudit demo --article" instead imports and checks the demo articles, an
invented study in each format the article readers take (JATS XML, HTML,
DOCX, plain text), as "coefaudit check ARTICLE..." does; with --save DIR it
writes the articles into the folder DIR (created if missing).`,
		Example: `  coefaudit demo
  coefaudit demo --format json
  coefaudit demo --save demo.xlsx
  coefaudit demo --article
  coefaudit demo --article --save demo-articles/`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := o.check.report.validate(); err != nil {
				return err
			}
			o.check.stdout, o.check.files = cmd.OutOrStdout(), runFiles(cmd)
			o.check.stdin, o.check.stderr = cmd.InOrStdin(), cmd.ErrOrStderr()
			if runF != nil {
				return runF(o)
			}
			return runDemo(o)
		},
	}
	o.check.report.bind(cmd)
	cmd.Flags().StringVar(&o.save, "save", "", "write the demo workbook (with --article, the demo articles: a folder) here instead of auditing it")
	cmd.Flags().BoolVar(&o.article, "article", false, "import and check the demo articles (JATS, HTML, DOCX, text) instead of the demo workbook")
	return cmd
}

// runDemo writes the demo workbook out, or audits it as check does under
// the demo's own name, from a copy in the run's temporary folder.
func runDemo(o *demoOptions) error {
	files := o.check.files
	if o.article {
		return runDemoArticles(o)
	}
	if o.save != "" {
		t, err := files.Create(o.save)
		if err != nil {
			return finish(files, flagError{err})
		}
		if _, err = t.Write(fixtures.DemoWorkbook); err == nil {
			err = t.Close()
		}
		if err != nil {
			err = fmt.Errorf("saving the demo workbook: %w", err)
		}
		return finish(files, err)
	}
	dir, err := files.TempDir()
	if err != nil {
		return finish(files, err)
	}
	path := filepath.Join(dir, fixtures.DemoName)
	if err := os.WriteFile(path, fixtures.DemoWorkbook, 0o600); err != nil {
		return finish(files, fmt.Errorf("demo workbook: %w", err))
	}
	o.check.input, o.check.shown = path, fixtures.DemoName
	return runCheck(&o.check)
}

// runDemoArticles writes the demo articles out (--save DIR), or imports and
// checks them from the run's temporary folder.
func runDemoArticles(o *demoOptions) error {
	files := o.check.files
	dir := o.save
	if dir != "" {
		if err := os.Mkdir(dir, 0o755); err != nil && !os.IsExist(err) {
			return finish(files, flagError{fmt.Errorf("--save %s: %w", dir, err)})
		}
		_, err := fixtures.DemoArticles(dir)
		return finish(files, err)
	}
	dir, err := files.TempDir()
	if err != nil {
		return finish(files, err)
	}
	paths, err := fixtures.DemoArticles(dir)
	if err != nil {
		return finish(files, err)
	}
	o.check.input, o.check.shown, o.check.articles = paths[0], "the demo articles", paths
	return runCheck(&o.check)
}
