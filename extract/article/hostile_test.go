package article

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"coefaudit/extract"
)

// TestHostileArticles gives each reader a hostile or foreign file: each
// fails with an error naming the file and saying why, fast and without
// panicking, and the files after it are still read.
func TestHostileArticles(t *testing.T) {
	dir := t.TempDir()
	write := func(name, body string) string {
		path := filepath.Join(dir, name)
		if err := os.WriteFile(path, []byte(body), 0o600); err != nil {
			t.Fatal(err)
		}
		return path
	}
	huge := strings.Repeat("9", MaxTextBytes+10)
	laughs := `<?xml version="1.0"?>
<!DOCTYPE article [
 <!ENTITY lol "lol">
 <!ENTITY lol1 "&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;">
 <!ENTITY lol2 "&lol1;&lol1;&lol1;&lol1;&lol1;&lol1;&lol1;&lol1;&lol1;&lol1;">
 <!ENTITY lol9 "&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;">
]>
<article><body><p>&lol9;</p></body></article>`
	good := tarticle{author: "Quillon", year: "2026", tables: []ttable{layouts[0].table}}
	tests := []struct {
		name, file string
		target     error
		says       string
	}{
		{"deep XML", write("deep.xml", "<article>"+strings.Repeat("<sec>", 100000)), extract.ErrInputTooLarge, "nest more than"},
		{"billion laughs", write("laughs.xml", laughs), extract.ErrUnsupportedInput, "entity"},
		{"huge JATS cell", write("cell.xml", "<article><body><table-wrap><table><tr><td>"+huge+"</td></tr></table></table-wrap></body></article>"),
			extract.ErrInputTooLarge, "longer than"},
		{"huge HTML cell", write("cell.html", "<html><table><tr><td>"+huge+"</td></tr></table></html>"), extract.ErrInputTooLarge, "longer than"},
		{"huge text line", write("line.txt", huge), extract.ErrInputTooLarge, "longer than"},
		{"zip bomb DOCX", writeZip(t, filepath.Join(dir, "bomb.docx"), docxPackage("word/document.xml", strings.Repeat(" ", 4<<20))),
			extract.ErrInputTooLarge, "zip bomb"},
		{"zip without a document", writeZip(t, filepath.Join(dir, "other.docx"), map[string]string{"a.txt": "x"}), ErrNotArticle, "_rels/.rels"},
		{"XML that is no article", write("feed.xml", "<rss><channel/></rss>"), ErrNotArticle, "not <article>"},
		{"binary", write("image.png", "\x89PNG\r\n\x1a\n\x00\x00\x00"), ErrNotArticle, "not an article"},
		{"PDF", write("paper.pdf", "%PDF-1.7\n"), ErrNotArticle, "PDF"},
		{"damaged XML", write("cut.xml", "<article><body><p>cut"), extract.ErrUnsupportedInput, "damaged"},
	}
	var files []string
	for _, tt := range tests {
		files = append(files, tt.file)
	}
	goodFiles := articleFormats(t, dir, "good", good)
	for _, file := range goodFiles {
		files = append(files, file)
	}
	res := Import(files, nil, nil)
	if len(res.Articles) != len(goodFiles) {
		t.Errorf("%d articles read, want the %d good ones", len(res.Articles), len(goodFiles))
	}
	failed := map[string]*Failure{}
	for _, f := range res.Failed {
		failed[f.File] = f
	}
	for _, tt := range tests {
		f := failed[tt.file]
		if f != nil {
			t.Logf("%s: %s", tt.name, f.Message)
		}
		switch {
		case f == nil:
			t.Errorf("%s: read without an error", tt.name)
		case !errors.Is(f.Err, tt.target) || !strings.Contains(f.Message, tt.file) || !strings.Contains(f.Message, tt.says):
			t.Errorf("%s: error %q, want %v naming the file and saying %q", tt.name, f.Message, tt.target, tt.says)
		}
	}
	sheets := res.Sheets()
	confirm := sheets[len(sheets)-1]
	if confirm.Name != ToConfirmSheet || len(confirm.Rows) < 1+len(tests) {
		t.Errorf("the to confirm sheet has %d rows, want a line for each of the %d files not read", len(confirm.Rows)-1, len(tests))
	}
}
