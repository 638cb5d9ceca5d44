// Package report writes what an audit found, in every format a person or a
// program reads: a table for the terminal, CSV, the JSON of the output
// contract, Markdown, a self-contained HTML page with interval charts, and
// an xlsx workbook; the methods paragraph of each claim; the pooling
// report and its forest plots (package forestplot); the bootstrap
// comparison; and the audit of one typed comparison.
//
// The audit reports stream. Check opens an input (extract.Open), and a
// Writer of the chosen format takes the results as audit.Run hands them
// on: Begin with what is known first, Study for each run of a study's
// claims in input order, End with the summary and the input's own
// problems. A writer holds no claim after it has written it; what a format
// can only write at the end (the summary, the problems, the HTML page's
// cards, the xlsx workbook's input sheets) is held until then and is
// bounded as each writer's doc says. Every format gives the same outcome,
// p and notes for every claim: there is one path.
//
// Text from the input (names, labels, notes that quote them) is shown as
// written but can neither drive a terminal nor change the structure of a
// Markdown document: its control characters are shown escaped
// (EscapeControls, "\x1b") and its Markdown markup is escaped (mdText). A
// CSV cell or column name that a spreadsheet would evaluate is guarded
// with an apostrophe, and every text of the workbook is a text cell.
//
// report decides no verdict (package audit) and reads no number (package
// extract); it formats numbers with strconv and fmt, and encodes with
// encoding/csv, encoding/json, html/template and excelize.
package report
