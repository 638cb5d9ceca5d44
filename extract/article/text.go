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
// separated by blank lines, lines within one are joined. Tables laid out
// in plain text are not read as tables; their sentences are read as
// sentences. The text must be UTF-8; a line may hold at most MaxTextBytes
// and the text at most MaxArticleBytes (extract.ErrInputTooLarge beyond).
func ReadText(r io.Reader, file string) (*Article, error) {
	a := &Article{File: file, Format: FormatText, Study: studyKey("", "", "", file)}
	sc := bufio.NewScanner(io.LimitReader(r, MaxArticleBytes+1))
	sc.Buffer(make([]byte, 0, 64<<10), MaxTextBytes)
	var para []string
	var total int64
	flush := func() error {
		if len(para) == 0 {
			return nil
		}
		text := squeeze(strings.Join(para, " "))
		para = para[:0]
		if len(text) > MaxTextBytes {
			return errTextTooLong
		}
		if len(a.Paragraphs) >= MaxTableCells {
			return errTooManyItems
		}
		a.Paragraphs = append(a.Paragraphs, Paragraph{Place: fmt.Sprintf("paragraph %d", len(a.Paragraphs)+1), Text: text})
		return nil
	}
	for sc.Scan() {
		line := sc.Text()
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
		para = append(para, line)
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
	return a, nil
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
