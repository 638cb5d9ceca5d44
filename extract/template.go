package extract

import (
	"fmt"
	"io"

	"github.com/xuri/excelize/v2"
)

// templateRows is how many rows of each input sheet the template formats as
// text and covers with drop-down lists.
const templateRows = 5000

// templateSheet describes one input sheet of the template.
type templateSheet struct {
	name    string
	columns []string
	widths  []float64
	lists   map[string][]string // column name → allowed values
}

var templateSheets = []templateSheet{
	{
		name:    "coefficients",
		columns: coefficientColumnNames,
		widths:  []float64{14, 14, 10, 16, 16, 12, 12, 11, 10, 10, 18, 9, 10, 10, 10, 8, 8},
		lists:   map[string][]string{"measure": Measures},
	},
	{
		name:    "claims",
		columns: claimColumnNames,
		widths:  []float64{14, 12, 14, 14, 16, 12, 18, 8, 13, 16},
		lists:   map[string][]string{"published": Verdicts, "basis": Bases},
	},
	{
		name:    "correlations",
		columns: correlationColumnNames,
		widths:  []float64{14, 12, 16, 16, 10, 8, 10, 10},
	},
}

// WriteTemplate writes a blank input workbook to w: the sheets coefficients,
// claims and correlations with their header rows (bold, frozen), every input
// column formatted as text (number format "@", so that "0.40" keeps its
// trailing zero), drop-down lists for measure, published and basis, and an
// instructions sheet that explains every column and the accepted printed
// forms and shows the layout of a "table …" sheet. Each list covers rows 2 to
// 5001 of its column.
//
// References:
//
//	[1] ECMA International (2016). ECMA-376 Office Open XML File Formats,
//	    5th ed., Part 1, §18.8.30: built-in number format 49 is "@", text
//	    (from memory; excelize documents the same table).
func WriteTemplate(w io.Writer) error {
	f := excelize.NewFile()
	defer f.Close()
	header, err := f.NewStyle(&excelize.Style{
		Font:   &excelize.Font{Bold: true},
		Fill:   excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{"DDEBF7"}},
		NumFmt: 49,
	})
	if err != nil {
		return err
	}
	text, err := f.NewStyle(&excelize.Style{NumFmt: 49})
	if err != nil {
		return err
	}
	if err := f.SetSheetName("Sheet1", "instructions"); err != nil {
		return err
	}
	if err := writeInstructions(f); err != nil {
		return fmt.Errorf("instructions sheet: %w", err)
	}
	for _, ts := range templateSheets {
		if err := writeTemplateSheet(f, ts, header, text); err != nil {
			return fmt.Errorf("%s sheet: %w", ts.name, err)
		}
	}
	f.SetActiveSheet(0)
	return f.Write(w)
}

func writeTemplateSheet(f *excelize.File, ts templateSheet, header, text int) error {
	if _, err := f.NewSheet(ts.name); err != nil {
		return err
	}
	last, err := excelize.ColumnNumberToName(len(ts.columns))
	if err != nil {
		return err
	}
	if err := f.SetColStyle(ts.name, "A:"+last, text); err != nil {
		return err
	}
	for i, name := range ts.columns {
		col, _ := excelize.ColumnNumberToName(i + 1)
		if err := f.SetCellStr(ts.name, col+"1", name); err != nil {
			return err
		}
		if err := f.SetColWidth(ts.name, col, col, ts.widths[i]); err != nil {
			return err
		}
		values, ok := ts.lists[name]
		if !ok {
			continue
		}
		dv := excelize.NewDataValidation(true)
		dv.SetSqref(fmt.Sprintf("%s2:%s%d", col, col, templateRows+1))
		if err := dv.SetDropList(values); err != nil {
			return err
		}
		dv.SetError(excelize.DataValidationErrorStyleStop, "Not an allowed value", "Pick one of the values in the list.")
		if err := f.AddDataValidation(ts.name, dv); err != nil {
			return err
		}
	}
	if err := f.SetCellStyle(ts.name, "A1", last+"1", header); err != nil {
		return err
	}
	return f.SetPanes(ts.name, &excelize.Panes{Freeze: true, YSplit: 1, TopLeftCell: "A2", ActivePane: "bottomLeft"})
}

// instruction is one row of the instructions sheet: a heading, or a line of
// text, or cells of the table example.
type instruction struct {
	heading bool
	cells   []string
}

func instructionLine(s string) instruction       { return instruction{cells: []string{s}} }
func instructionHeading(s string) instruction    { return instruction{heading: true, cells: []string{s}} }
func instructionExample(c ...string) instruction { return instruction{cells: c} }

var instructions = []instruction{
	instructionHeading("A blank input workbook"),
	instructionLine("Fill in the sheets coefficients and claims (correlations and \"table …\" sheets are optional), then run the check on this file. This sheet is not read."),
	instructionLine("Type every number exactly as the paper printed it, with its decimals: 0.40 is not 0.4, since the printed decimals say how far the numbers may have been rounded. The input columns are formatted as text so that the spreadsheet keeps them as typed."),
	instructionLine("Column names may be in any case and any order. Columns you add are kept and passed through to the output. Rows left entirely blank are skipped."),
	instructionLine(""),
	instructionHeading("Sheet coefficients: one row per coefficient the paper reported"),
	instructionLine("study: a key naming the study (any text). label: a name for the coefficient, unique within the study; claims refer to it."),
	instructionLine("measure: b (regression coefficient), beta (standardized coefficient), r (correlation), or, rr, hr (odds, risk and hazard ratios, analysed on the log scale), md (mean difference), other. Blank means other."),
	instructionLine("outcome, predictor: the variables (for r, the two variables correlated); used to find correlations."),
	instructionLine("group: the sample the estimate comes from; the same study and group mean the same people. model: the same study, group and model mean the same fitted model."),
	instructionLine("estimate: the coefficient as printed, ratios as ratios (not their logarithms). Significance stars may stay: 0.21** is read as 0.21."),
	instructionLine("ci_low, ci_high: the limits of its confidence interval; or ci: the whole interval in one cell, such as [0.12, 0.45], (.12–.45) or 0.12 to 0.45."),
	instructionLine("ci_level: the confidence level in percent (blank means 95); 0.95 is also read as 95."),
	instructionLine("se: the standard error. stat: the t or z statistic. p: the p-value. df: degrees of freedom. n: the sample size. Leave blank what was not printed."),
	instructionLine(""),
	instructionHeading("Sheet claims: one row per comparison the paper made between two coefficients"),
	instructionLine("study, claim: keys; claim names the comparison and is unique within the study."),
	instructionLine("first, second: the labels of the two coefficients compared, from the coefficients sheet of the same study."),
	instructionLine("published: what the paper concluded: differ, no-difference, first-larger or second-larger (signed: the first estimate is above the second), first-stronger or second-stronger (magnitude: |estimate|; for ratios the distance from 1)."),
	instructionLine("published_p: the p-value the paper gave for the difference itself, if any."),
	instructionLine("basis: how the paper reached its verdict: test (a test of the difference), overlap (whether the intervals overlap), significance-split (one significant, the other not), unstated."),
	instructionLine("alpha: the significance level (blank means 0.05). estimate_corr: the correlation between the two estimates, where the paper reported it. topic: claims with the same topic can be pooled."),
	instructionLine(""),
	instructionHeading("Sheet correlations: correlations in long form"),
	instructionLine("study, group, var_a, var_b, r, n: one row per pair of variables. A row with var_a equal to var_b gives that variable's sd and mean instead of r."),
	instructionLine(""),
	instructionHeading("Sheets named \"table …\": a correlation table as the paper printed it"),
	instructionLine("Name the sheet \"table \" and a name (\"table 2\"). Optional key rows first: study, group or n in the first cell and the value in the second. Then a header row whose first cell is \"variable\" or blank, optional n, mean and sd columns, and one column per variable, by name or by number."),
	instructionLine("Then one row per variable. Fill the lower or the upper triangle; the diagonal may be blank, a dash or 1. A blank row ends the table. Without a study row the study is the name after \"table \"; without a group row the table belongs to the study's one sample (a study with several samples needs a group row). For example:"),
	instructionExample("study", "Smith 2020"),
	instructionExample("n", "240"),
	instructionExample("variable", "mean", "sd", "1", "2", "3"),
	instructionExample("1. Anxiety", "3.10", "0.80", "—"),
	instructionExample("2. Stress", "2.70", "0.90", ".45**", "—"),
	instructionExample("3. Sleep", "6.50", "1.20", "−.30", "−.22*", "—"),
	instructionLine(""),
	instructionHeading("Numbers as printed"),
	instructionLine("Accepted: 0.43, .43, −0.43 (with a minus sign or a dash), 0,43 (decimal comma), 1,234.5, 2.3e-5, 2.3 × 10^-5, and stars after a number (0.21***)."),
	instructionLine("A comma followed by exactly three digits, as in 1,234, is ambiguous in an estimate (1.234 or 1234?) and is refused; in n and df it is a thousands separator."),
	instructionLine("p-values: .03, p = .03, p < .001, <.001, p ≤ .05, p > .10, ns (not significant)."),
	instructionLine("Intervals in one cell: [0.12, 0.45], (0.12; 0.45), (.12–.45), 0.12 to 0.45, −0.30 to −0.05, 0,12; 0,45, 95% CI 0.12 to 0.45."),
	instructionLine("A cell that cannot be read is reported with its sheet, row and column; the rest of the row and the other rows are still read."),
}

func writeInstructions(f *excelize.File) error {
	const sheet = "instructions"
	bold, err := f.NewStyle(&excelize.Style{Font: &excelize.Font{Bold: true, Size: 12}})
	if err != nil {
		return err
	}
	if err := f.SetColWidth(sheet, "A", "A", 14); err != nil {
		return err
	}
	if err := f.SetColWidth(sheet, "B", "G", 10); err != nil {
		return err
	}
	for i, in := range instructions {
		row := i + 1
		for j, c := range in.cells {
			cell, err := excelize.CoordinatesToCellName(j+1, row)
			if err != nil {
				return err
			}
			if err := f.SetCellStr(sheet, cell, c); err != nil {
				return err
			}
		}
		if in.heading {
			cell, _ := excelize.CoordinatesToCellName(1, row)
			if err := f.SetCellStyle(sheet, cell, cell, bold); err != nil {
				return err
			}
		}
	}
	return nil
}
