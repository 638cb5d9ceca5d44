package article

import (
	"bytes"
	"io"
	"maps"
	"os"
	"path/filepath"
	"slices"
	"testing"
)

// memFile is a file of memFiles.
type memFile struct {
	bytes.Buffer
	closed bool
}

func (m *memFile) Close() error { m.closed = true; return nil }

// TestImportFolderAsSheets: the CSV files ImportFolder writes as it reads
// are, byte for byte, those of the Result Import holds whole (each sheet
// written by WriteCSV), for articles in every format with correlation
// tables whose sheet names clash, and a file that is not read; every file
// is closed.
func TestImportFolderAsSheets(t *testing.T) {
	dir := t.TempDir()
	a := tarticle{author: "Quillon", year: "2026", paras: []string{
		"Garden hours predicted wellbeing for girls (β = .34, p < .001) and for boys (β = .12, p = .03); the association was stronger for girls than for boys.",
	}, tables: []ttable{layouts[0].table, correlationTable}}
	files := slices.Sorted(maps.Values(articleFormats(t, dir, "quillon", a)))
	pdf := filepath.Join(dir, "scan.pdf")
	if err := os.WriteFile(pdf, []byte("%PDF-1.4"), 0o600); err != nil {
		t.Fatal(err)
	}
	files = append(files, pdf)
	want := map[string]string{}
	for _, s := range Import(files, nil, nil).Sheets() {
		var b bytes.Buffer
		if err := WriteCSV(&b, s); err != nil {
			t.Fatal(err)
		}
		want[CSVName(s.Name)] = b.String()
	}
	got := map[string]*memFile{}
	res, err := ImportFolder(files, nil, nil, func(name string) (io.WriteCloser, error) {
		if got[name] != nil {
			t.Errorf("%s created twice", name)
		}
		got[name] = &memFile{}
		return got[name], nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Articles) != len(files)-1 || len(res.Failed) != 1 {
		t.Errorf("%d articles and %d failures, want %d and 1", len(res.Articles), len(res.Failed), len(files)-1)
	}
	if len(want) != 3+len(files)-1 { // coefficients, claims, to confirm and a table each
		t.Fatalf("the reference has %d sheets: %v", len(want), slices.Sorted(maps.Keys(want)))
	}
	for name, w := range want {
		g := got[name]
		switch {
		case g == nil:
			t.Errorf("%s not written", name)
		case !g.closed:
			t.Errorf("%s not closed", name)
		case g.String() != w:
			t.Errorf("%s:\n%s\nwant\n%s", name, g.String(), w)
		}
	}
	if len(got) != len(want) {
		t.Errorf("files %v, want %v", slices.Sorted(maps.Keys(got)), slices.Sorted(maps.Keys(want)))
	}
}
