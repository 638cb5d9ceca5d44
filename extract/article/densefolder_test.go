package article

import (
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// TestWriteDenseArticles writes a folder of invented dense JATS articles
// for measuring check and import with /usr/bin/time -v; it runs only when
// COEFAUDIT_DENSE_DIR names the folder to write (created if missing):
//
//	COEFAUDIT_DENSE_DIR=/tmp/dense COEFAUDIT_DENSE_N=1000 COEFAUDIT_DENSE_CONTRADICT=1 \
//	    go test ./extract/article -run TestWriteDenseArticles
//
// Each article is denseArticle's (about 90 kB), with
// COEFAUDIT_DENSE_CONTRADICT its variant whose tables print 360 p-values
// that contradict their estimates.
func TestWriteDenseArticles(t *testing.T) {
	dir := os.Getenv("COEFAUDIT_DENSE_DIR")
	if dir == "" {
		t.Skip("COEFAUDIT_DENSE_DIR not set: no folder of dense articles to write")
	}
	n, err := strconv.Atoi(os.Getenv("COEFAUDIT_DENSE_N"))
	if err != nil || n <= 0 {
		n = 1000
	}
	body := denseArticle(os.Getenv("COEFAUDIT_DENSE_CONTRADICT") != "")
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	for i := range n {
		// Each article its own author, so that no two merge into one study.
		a := strings.Replace(body, "<surname>Tenby</surname>", fmt.Sprintf("<surname>Tenby%d</surname>", i), 1)
		if err := os.WriteFile(filepath.Join(dir, fmt.Sprintf("article%04d.xml", i)), []byte(a), 0o600); err != nil {
			t.Fatal(err)
		}
	}
}
