package report

// methodsRow is one row of the xlsx report's methods sheet: the claim's
// source row, study, claim and outcome, and its methods paragraph (empty
// when none was written).
//
// The rows are spooled to a temporary file as the claims arrive and the
// sheet is written from it at the workbook's end. Why: excelize's
// StreamWriter keeps the buffer of every sheet it streams until the
// workbook is written, more than StreamChunkSize for a sheet longer than
// that, so a sheet streamed while the claims arrive holds its buffer beside
// the input the reader still holds. With the claims and methods sheets both
// streamed so, the xlsx report of BenchmarkReadWorkbook100k's workbook of
// 140,000 claims (-large-workbook-claims) passed its memory target
// (/usr/bin/time -v).
type methodsRow struct {
	Row                   int
	Study, Claim, Outcome string
	Methods               string
}
