package extract

import (
	"archive/zip"
	"bufio"
	"encoding/xml"
	"flag"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"github.com/xuri/excelize/v2"
)

var largeWorkbookPath = flag.String("large-workbook", "",
	"where BenchmarkReadWorkbook100k keeps its workbook (written when missing, reused when present), for measuring the command on it")

var (
	largeWorkbookClaims = flag.Int("large-workbook-claims", 100_000,
		"the claims of the workbook -large-workbook writes (the workbook-reading issue asks for 100,000)")
	largeFolderPath = flag.String("large-folder", "",
		"where BenchmarkOpenWorkbook100k writes its workbook again as a folder of CSV files (when missing), for measuring the command on it")
)

// stringTable numbers the distinct texts of a workbook in the order they
// are first used, as a spreadsheet program fills its shared-strings table.
type stringTable struct {
	index map[string]int
	list  []string
}

func (s *stringTable) ref(text string) int {
	if i, ok := s.index[text]; ok {
		return i
	}
	s.index[text] = len(s.list)
	s.list = append(s.list, text)
	return len(s.list) - 1
}

// sheetWriter writes a worksheet's rows as a spreadsheet program saves
// them: each cell with its reference, text as an index into the shared
// strings, numbers as stored values with a style.
type sheetWriter struct {
	w   *bufio.Writer
	sst *stringTable
	row int
	col int
}

func (s *sheetWriter) startRow() {
	s.row++
	s.col = 0
	fmt.Fprintf(s.w, `<row r="%d">`, s.row)
}

func (s *sheetWriter) endRow() { s.w.WriteString("</row>") }

func (s *sheetWriter) ref() string {
	s.col++
	name, _ := excelize.ColumnNumberToName(s.col)
	return name + strconv.Itoa(s.row)
}

func (s *sheetWriter) text(v string) {
	fmt.Fprintf(s.w, `<c r="%s" t="s"><v>%d</v></c>`, s.ref(), s.sst.ref(v))
}

// number writes a numeric cell with style 0 (General) or 1 ("0.00").
func (s *sheetWriter) number(v float64, style int) {
	ref := s.ref()
	if style == 0 {
		fmt.Fprintf(s.w, `<c r="%s"><v>%s</v></c>`, ref, strconv.FormatFloat(v, 'g', -1, 64))
		return
	}
	fmt.Fprintf(s.w, `<c r="%s" s="%d"><v>%s</v></c>`, ref, style, strconv.FormatFloat(v, 'g', -1, 64))
}

// writeLargeWorkbook writes a workbook of the given number of claims, two
// coefficients each, in an invented literature: text in the shared strings
// (the template formats its input columns as text, so a spreadsheet program
// stores what is typed there as shared strings), except that n is a number
// in a General cell and every fourth estimate a number shown with two
// decimals, as when a table is pasted in. The parts are written with
// archive/zip, as ECMA-376 lays them out; excelize would hold the whole
// workbook in memory to write it.
func writeLargeWorkbook(tb testing.TB, path string, claims int) {
	tb.Helper()
	f, err := os.Create(path)
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	zw := zip.NewWriter(f)
	part := func(name, text string) {
		w, err := zw.Create(name)
		if err != nil {
			tb.Fatal(err)
		}
		if _, err := io.WriteString(w, text); err != nil {
			tb.Fatal(err)
		}
	}
	const ns = `xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"`
	const rel = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
	part("[Content_Types].xml", `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types"><Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/><Default Extension="xml" ContentType="application/xml"/><Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/><Override PartName="/xl/worksheets/sheet1.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/><Override PartName="/xl/worksheets/sheet2.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/><Override PartName="/xl/styles.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.styles+xml"/><Override PartName="/xl/sharedStrings.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sharedStrings+xml"/></Types>`)
	part("_rels/.rels", `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="`+rel+`/officeDocument" Target="xl/workbook.xml"/></Relationships>`)
	part("xl/workbook.xml", `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<workbook `+ns+` xmlns:r="`+rel+`"><sheets><sheet name="coefficients" sheetId="1" r:id="rId1"/><sheet name="claims" sheetId="2" r:id="rId2"/></sheets></workbook>`)
	part("xl/_rels/workbook.xml.rels", `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="`+rel+`/worksheet" Target="worksheets/sheet1.xml"/><Relationship Id="rId2" Type="`+rel+`/worksheet" Target="worksheets/sheet2.xml"/><Relationship Id="rId3" Type="`+rel+`/styles" Target="styles.xml"/><Relationship Id="rId4" Type="`+rel+`/sharedStrings" Target="sharedStrings.xml"/></Relationships>`)
	part("xl/styles.xml", `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<styleSheet `+ns+`><fonts count="1"><font><sz val="11"/><name val="Calibri"/></font></fonts><fills count="1"><fill><patternFill patternType="none"/></fill></fills><borders count="1"><border/></borders><cellStyleXfs count="1"><xf numFmtId="0" fontId="0" fillId="0" borderId="0"/></cellStyleXfs><cellXfs count="2"><xf numFmtId="0" fontId="0" fillId="0" borderId="0" xfId="0"/><xf numFmtId="2" fontId="0" fillId="0" borderId="0" xfId="0" applyNumberFormat="1"/></cellXfs></styleSheet>`)

	sst := &stringTable{index: map[string]int{}}
	rng := rand.New(rand.NewPCG(100, 1))
	round := func(v float64, dec int) string { return strconv.FormatFloat(v, 'f', dec, 64) }
	sheet := func(name string, fill func(s *sheetWriter)) {
		w, err := zw.Create(name)
		if err != nil {
			tb.Fatal(err)
		}
		bw := bufio.NewWriter(w)
		bw.WriteString(`<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n<worksheet " + ns + `><sheetData>`)
		fill(&sheetWriter{w: bw, sst: sst})
		bw.WriteString(`</sheetData></worksheet>`)
		if err := bw.Flush(); err != nil {
			tb.Fatal(err)
		}
	}
	measures := []string{"b", "beta", "or", "md"}
	sheet("xl/worksheets/sheet1.xml", func(s *sheetWriter) {
		s.startRow()
		for _, h := range []string{"study", "label", "measure", "outcome", "predictor", "group", "model", "estimate", "ci_low", "ci_high", "se", "p", "n"} {
			s.text(h)
		}
		s.endRow()
		for i := 0; i < claims; i++ {
			study := fmt.Sprintf("Study %06d", i)
			measure := measures[i%len(measures)]
			n := 40 + rng.IntN(2000)
			for k, label := range []string{"a", "b"} {
				// The estimate, its SE and the p they imply, on the log
				// scale for an odds ratio; the interval is estimate ± 1.96
				// SE, back on the printed scale.
				est := rng.NormFloat64() * 0.3
				se := 0.02 + rng.Float64()*0.2
				low, high := est-1.96*se, est+1.96*se
				p := math.Erfc(math.Abs(est/se) / math.Sqrt2)
				printed := est
				if measure == "or" {
					printed, low, high = math.Exp(est), math.Exp(low), math.Exp(high)
				}
				s.startRow()
				s.text(study)
				s.text(label)
				s.text(measure)
				s.text("outcome")
				s.text("x" + strconv.Itoa(k+1))
				s.text("all")
				s.text("m1")
				if i%4 == 0 {
					s.number(printed, 1)
				} else {
					s.text(round(printed, 2))
				}
				s.text(round(low, 2))
				s.text(round(high, 2))
				if measure == "or" {
					s.text("")
				} else {
					s.text(round(se, 3))
				}
				if p < 0.001 {
					s.text("< .001")
				} else {
					s.text(round(p, 3))
				}
				s.number(float64(n), 0)
				s.endRow()
			}
		}
	})
	published := []string{"differ", "no-difference", "first-larger", "second-stronger"}
	basis := []string{"test", "overlap", "significance-split", "unstated"}
	sheet("xl/worksheets/sheet2.xml", func(s *sheetWriter) {
		s.startRow()
		for _, h := range []string{"study", "claim", "first", "second", "published", "basis", "topic"} {
			s.text(h)
		}
		s.endRow()
		for i := 0; i < claims; i++ {
			s.startRow()
			s.text(fmt.Sprintf("Study %06d", i))
			s.text("c" + strconv.Itoa(i))
			s.text("a")
			s.text("b")
			s.text(published[i%len(published)])
			s.text(basis[(i/4)%len(basis)])
			s.text("topic " + strconv.Itoa(i%50))
			s.endRow()
		}
	})

	w, err := zw.Create("xl/sharedStrings.xml")
	if err != nil {
		tb.Fatal(err)
	}
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>`+"\n<sst %s uniqueCount=\"%d\">", ns, len(sst.list))
	for _, t := range sst.list {
		bw.WriteString("<si><t>")
		if err := xml.EscapeText(bw, []byte(t)); err != nil {
			tb.Fatal(err)
		}
		bw.WriteString("</t></si>")
	}
	bw.WriteString("</sst>")
	if err := bw.Flush(); err != nil {
		tb.Fatal(err)
	}
	if err := zw.Close(); err != nil {
		tb.Fatal(err)
	}
	if err := f.Close(); err != nil {
		tb.Fatal(err)
	}
}

// largeWorkbook returns the path of the benchmarks' workbook, written
// when missing into the benchmark's temporary directory or where
// -large-workbook says.
func largeWorkbook(b *testing.B) string {
	path := *largeWorkbookPath
	if path == "" {
		path = filepath.Join(b.TempDir(), "100k.xlsx")
	}
	if _, err := os.Stat(path); err != nil {
		writeLargeWorkbook(b, path, *largeWorkbookClaims)
	}
	return path
}

// BenchmarkReadWorkbook100k reads a workbook of 100,000 claims and 200,000
// coefficients written as a spreadsheet program writes it
// (writeLargeWorkbook). The file is written once, into the benchmark's
// temporary directory or where -large-workbook says.
func BenchmarkReadWorkbook100k(b *testing.B) {
	path := largeWorkbook(b)
	if fi, err := os.Stat(path); err == nil {
		b.Logf("%s: %d MiB", path, fi.Size()>>20)
	}
	b.ReportAllocs()
	for b.Loop() {
		in, err := Read(path)
		if err != nil {
			b.Fatal(err)
		}
		if len(in.Claims) != *largeWorkbookClaims || len(in.Coefficients) != 2**largeWorkbookClaims {
			b.Fatalf("Read = %d claims, %d coefficients, want %d and %d", len(in.Claims), len(in.Coefficients), *largeWorkbookClaims, 2**largeWorkbookClaims)
		}
	}
}
