// Package article reads what an article printed — its tables and the
// results reported in its sentences — from JATS XML, HTML, DOCX or plain
// text, and turns it into the sheets of the input contract (coefficients,
// claims, "table …" correlation sheets) with a source for every number and
// a "to confirm" sheet for every guess.
//
// Reading goes in two steps. A format reader (jats.go, html.go, docx.go,
// text.go) fills the format-free model of model.go: tables as grids of
// cells with their label, caption and footnotes, and the article's
// paragraphs. The recognisers then read that model: regression tables
// (regression.go), correlation tables (correlation.go), statistics reported
// in sentences (sentences.go) and sentences that compare two effects
// (claims.go).
//
// A reader never repairs a number: every cell is kept as printed, and
// extract parses it exactly as it parses a typed workbook. What the reader
// was unsure of is a Confirm row; nothing is dropped without one.
//
// The parser of printed statistics in sentences (statistics.go) is this
// package's own.
package article
