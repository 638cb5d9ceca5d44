package audit

import "coefaudit/extract"

// Check reads the input at path (a workbook, a folder of CSVs or a paired
// CSV) and audits it. The error is non-nil only when nothing could be read;
// problems with single rows are in the report.
func Check(path string, opts Options) (*Report, error) {
	in, err := extract.Read(path)
	if err != nil {
		return nil, err
	}
	return Audit(in, opts), nil
}
