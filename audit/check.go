package audit

import "coefaudit/extract"

// Check reads the input at path (a workbook, a folder of CSVs or a paired
// CSV) and audits it into one Report held in memory: for small inputs and
// tests; the reports stream through Run. The error is non-nil only when
// nothing could be read; problems with single rows are in the report.
func Check(path string, opts Options) (*Report, error) {
	src, err := extract.Open(path)
	if err != nil {
		return nil, err
	}
	defer src.Close()
	rep := &Report{Source: path, Alpha: extract.DefaultAlpha, Cautions: Cautions, Claims: []ClaimResult{}, Problems: []Problem{}}
	rep.Summary, err = Run(src.Studies(), opts, func(res StudyResult) error {
		rep.Claims = append(rep.Claims, res.Claims...)
		rep.Problems = append(rep.Problems, res.Problems...)
		return nil
	})
	if err != nil {
		return nil, err
	}
	rep.Problems = append(cellProblems(src.Problems()), rep.Problems...)
	return rep, nil
}
