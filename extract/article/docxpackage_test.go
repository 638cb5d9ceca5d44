package article

import (
	"errors"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// TestDOCXMainPart: the main document part is the one the package
// relationship names (ECMA-376 Part 2, §9.3), whatever its name and
// however its target is written, and a package whose main part is missing
// or is not a Word document is no manuscript. The table is the first
// layout's (invented); a DOCX with the usual part name is the reference.
func TestDOCXMainPart(t *testing.T) {
	dir := t.TempDir()
	a := tarticle{author: "Quillon", year: "2026", tables: []ttable{layouts[0].table}}
	doc := docxDocument(a)
	usual, err := ReadDOCX(writeZip(t, filepath.Join(dir, "usual.docx"), docxPackage("word/document.xml", doc)))
	if err != nil {
		t.Fatal(err)
	}
	wantRows := keys(Recognise(usual).Coefficients)
	if len(wantRows) != 4 {
		t.Fatalf("the reference DOCX gave %v, want the layout's 4 coefficients", wantRows)
	}
	renamed := func(target string) map[string]string {
		m := docxPackage("word/document2.xml", doc)
		m["_rels/.rels"] = strings.Replace(m["_rels/.rels"], `Target="word/document2.xml"`, `Target="`+target+`"`, 1)
		return m
	}
	withType := func(ct string) map[string]string {
		m := docxPackage("word/document2.xml", doc)
		m["[Content_Types].xml"] = strings.Replace(m["[Content_Types].xml"], "application/vnd.openxmlformats-officedocument.wordprocessingml.document.main+xml", ct, 1)
		return m
	}
	noRels := docxPackage("word/document.xml", doc)
	delete(noRels, "_rels/.rels")
	tests := []struct {
		name    string
		members map[string]string
		says    string // "" when it reads as the reference
	}{
		{"main part word/document2.xml", renamed("word/document2.xml"), ""},
		{"absolute target", renamed("/word/document2.xml"), ""},
		{"target with dot segments and other case", renamed("./Word/../word/DOCUMENT2.xml"), ""},
		{"macro-enabled document", withType("application/vnd.ms-word.document.macroEnabled.main+xml"), ""},
		{"a stray word/document.xml is not the main part", func() map[string]string {
			m := renamed("word/document2.xml")
			m["word/document.xml"] = "<w:document/>"
			return m
		}(), ""},
		{"target not in the archive", renamed("word/missing.xml"), "not in the archive"},
		{"a workbook's main part", withType("application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"), "not a Word document"},
		{"no package relationships", noRels, "_rels/.rels"},
	}
	for i, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			file := writeZip(t, filepath.Join(dir, strings.Repeat("x", i+1)+".docx"), tt.members)
			got, err := ReadDOCX(file)
			if tt.says != "" {
				if err == nil || !errors.Is(err, ErrNotArticle) || !strings.Contains(err.Error(), tt.says) || !strings.Contains(err.Error(), file) {
					t.Errorf("error %v, want ErrNotArticle naming the file and saying %q", err, tt.says)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if rows := keys(Recognise(got).Coefficients); !slices.Equal(rows, wantRows) {
				t.Errorf("coefficients %v, want %v", rows, wantRows)
			}
		})
	}
}
