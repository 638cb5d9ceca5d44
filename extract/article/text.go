package article

import (
	"bufio"
	"fmt"
	"io"
	"regexp"
	"strings"
	"unicode/utf8"

	"coefaudit/extract"
)

// ReadText reads plain text (a pasted results section): paragraphs are
// separated by blank lines, lines within one are joined. A table laid out
// in plain text (lines whose cells are separated by tabs or by two or more
// spaces, with a header line of column headings such as B, SE, β, t, p, or
// a correlation triangle's numbered columns; see tableRun) is read as a
// table, like the tables of the other formats: its label and caption from
// a line "Table 1. …" just before it, its footnotes from the note lines
// after it, and "text table at line N" as its label when no caption names
// it. The text must be UTF-8; a line may hold at most MaxTextBytes and the
// text at most MaxArticleBytes (extract.ErrInputTooLarge beyond).
func ReadText(r io.Reader, file string) (*Article, error) {
	tr := &textReader{art: &Article{File: file, Format: FormatText, Study: studyKey("", "", "", file)}}
	sc := bufio.NewScanner(io.LimitReader(r, MaxArticleBytes+1))
	sc.Buffer(make([]byte, 0, 64<<10), MaxTextBytes)
	var block []textLine
	var total int64
	n := 0
	flush := func() error {
		err := tr.block(block)
		block = block[:0]
		return err
	}
	for sc.Scan() {
		line := sc.Text()
		n++
		if total += int64(len(line)) + 1; total > MaxArticleBytes {
			return nil, fileError(file, fmt.Errorf("the text is larger than %d MiB: %w", MaxArticleBytes>>20, extract.ErrInputTooLarge))
		}
		if !utf8.ValidString(line) || strings.ContainsRune(line, 0) {
			return nil, fileError(file, fmt.Errorf("it is not UTF-8 text: %w", ErrNotArticle))
		}
		if strings.TrimSpace(line) == "" {
			if err := flush(); err != nil {
				return nil, fileError(file, err)
			}
			continue
		}
		block = append(block, textLine{n: n, text: line})
	}
	if err := sc.Err(); err != nil {
		if err == bufio.ErrTooLong {
			err = fmt.Errorf("a line is longer than %d bytes: %w", MaxTextBytes, extract.ErrInputTooLarge)
		}
		return nil, fileError(file, err)
	}
	if err := flush(); err != nil {
		return nil, fileError(file, err)
	}
	return tr.art, nil
}

// tableLabel matches a table's label at the start of its caption:
// "Table 2.", "Table 2:", "TABLE 3 ".
var tableLabel = regexp.MustCompile(`(?i)^(table\s+[A-Z]?\d+[a-z]?)[.:]?\s*`)

// splitLabel splits "Table 2. Regressions of …" into its label and caption.
func splitLabel(caption string) (label, rest string) {
	if m := tableLabel.FindStringSubmatchIndex(caption); m != nil {
		return caption[m[2]:m[3]], caption[m[1]:]
	}
	return "", caption
}

// tableNote matches the start of a table's note: "Note.", "Notes:",
// "Source:", "Abbreviations:", a star or dagger, "N = 820".
var tableNote = regexp.MustCompile(`(?i)^(notes?\b|source:|abbreviations?\b|\*|†|‡|§|n\s*=)`)

// isTableNote reports a paragraph that is a table's note.
func isTableNote(s string) bool { return tableNote.MatchString(strings.TrimSpace(s)) }
