package extract

import (
	"archive/zip"
	"fmt"
	"io"
	"iter"
	"strings"
)

// TextSheet is one sheet of the input contract held in memory as text
// cells, as an article reader builds it: Rows[0] is the header (for a
// "table …" sheet, the first key or header row), every cell as printed.
type TextSheet struct {
	Name string
	Rows [][]string
}

// ReadTextSheets reads sheets held in memory through the same readers as
// a workbook's sheets: coefficients, claims, correlations and "table …"
// sheets by name (case-insensitive; other sheets are ignored), each row
// placed at source, its sheet and its row (header = row 1). It fails as
// Read fails on a workbook without a claims sheet (ErrMissingSheet);
// everything else is a problem of a row or of the input.
func ReadTextSheets(source string, sheets []TextSheet) (*Input, error) {
	byName := map[string]*TextSheet{}
	found := map[string]string{}
	var tables []string
	for i := range sheets {
		s := &sheets[i]
		if _, dup := byName[s.Name]; dup {
			continue
		}
		byName[s.Name] = s
		switch key := strings.ToLower(trimSpace(s.Name)); key {
		case "coefficients", "claims", "correlations":
			if found[key] == "" {
				found[key] = s.Name
			}
		default:
			if _, ok := tableName(s.Name); ok {
				tables = append(tables, s.Name)
			}
		}
	}
	if found["claims"] == "" {
		return nil, fmt.Errorf("%s has no claims sheet: %w", source, ErrMissingSheet)
	}
	in := &inputSheets{path: source, close: func() error { return nil },
		open:  func(name string) (rowSource, error) { return &textSource{rows: byName[name].Rows}, nil },
		where: func(name string) Position { return Position{File: source, Sheet: name} }}
	if found["coefficients"] == "" {
		in.problems = append(in.problems, &CellError{Position: Position{File: source},
			Err: fmt.Errorf("no coefficients sheet: %w", ErrMissingSheet)})
	}
	in.kinds = kindsOf(found, tables)
	return in.read("")
}

// textSource is a rowSource over rows of text held in memory.
type textSource struct {
	rows [][]string
	i    int
}

func (s *textSource) Next(row *sheetRow) error {
	if s.i >= len(s.rows) {
		return io.EOF
	}
	row.Row, row.Fields, row.Problem, row.AfterBlank = s.i+1, 0, nil, false
	row.Cells = row.Cells[:0]
	for _, c := range s.rows[s.i] {
		row.Cells = append(row.Cells, sheetCell{Text: c})
	}
	s.i++
	return nil
}

func (s *textSource) Close() error { return nil }

// MaxXMLDepth is the deepest the readers of XML let elements nest: the
// workbook's parts, and the article readers' XML, which nests far less deep
// than this in any article (common practice, no source).
const MaxXMLDepth = maxXMLDepth

// OpenArchive opens a zip-based document (a workbook, a DOCX manuscript)
// read-only after checking it against the workbook reader's limits: its
// size on disk (MaxWorkbookBytes), its members (MaxZipMembers), their
// unpacked sizes alone and together (MaxUnzippedBytes), their compression
// ratio (MaxCompressionRatio) and a member that holds more than it
// declares. Beyond a limit it fails with ErrInputTooLarge, and a file that
// is no zip archive with ErrUnsupportedInput; the errors name path.
func OpenArchive(path string) (*zip.ReadCloser, error) {
	zr, _, err := checkArchive(path)
	return zr, err
}

// FromInputs makes one Source of inputs read one after another (the
// articles of an import, each read into an Input of its own), so that
// memory holds one input at a time, not all of them. Each input's studies
// come as FromInput gives them, its claims numbered after those of the
// inputs before it; its problems join the Source's as it is read, so that
// Problems is complete once the studies have been read. claimColumns are
// the claims rows' unknown columns, which must be known before the first
// input is read. An error of inputs ends the studies.
func FromInputs(path string, claimColumns []string, inputs iter.Seq2[*Input, error]) *Source {
	s := &Source{Path: path, ClaimColumns: claimColumns}
	s.studies = func(yield func(*Study, error) bool) {
		offset := 0
		for in, err := range inputs {
			if err != nil {
				yield(nil, err)
				return
			}
			s.problems = append(s.problems, in.Problems...)
			for st, err := range FromInput(in).Studies() {
				if st != nil {
					// FromInput numbers an input's claims from 0.
					for i := range st.Claims {
						st.Claims[i].Index += offset
					}
				}
				if !yield(st, err) {
					return
				}
			}
			offset += len(in.Claims)
		}
	}
	return s
}
