package article

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"sort"
	"strings"
	"sync"

	"coefaudit/extract"
)

// Failure is a file that could not be read as an article, with why.
type Failure struct {
	File string `json:"file"`
	Err  error  `json:"-"`
	// Message is Err's text, for the JSON output.
	Message string `json:"error"`
}

// Result is everything an import read: each article's findings in the
// order the files were given, and the files that could not be read.
type Result struct {
	Articles []*Found   `json:"articles"`
	Failed   []*Failure `json:"failed"`
}

// Files lists the article files of the paths given: a file as it is, a
// folder's regular files (not its subfolders, nor hidden files) in name
// order. "-" stands for standard input.
func Files(paths []string) ([]string, error) {
	var out []string
	for _, p := range paths {
		if p == "-" {
			out = append(out, p)
			continue
		}
		fi, err := os.Stat(p)
		if err != nil {
			return nil, err
		}
		if !fi.IsDir() {
			out = append(out, p)
			continue
		}
		entries, err := os.ReadDir(p)
		if err != nil {
			return nil, err
		}
		var names []string
		for _, e := range entries {
			if e.Type().IsRegular() && !strings.HasPrefix(e.Name(), ".") {
				names = append(names, filepath.Join(p, e.Name()))
			}
		}
		sort.Strings(names)
		out = append(out, names...)
	}
	return out, nil
}

// Import reads every file (see Files) and recognises what it printed. A
// file that is not an article or is beyond the limits is a Failure naming
// it, and the others go on; progress, when not nil, is called after each
// file with the files done and their total. stdin is read for "-".
func Import(files []string, stdin io.Reader, progress func(done, total int)) *Result {
	res := &Result{}
	importEach(files, stdin, progress, func(file string, f *Found, err error) bool {
		if err != nil {
			res.Failed = append(res.Failed, &Failure{File: file, Err: err, Message: err.Error()})
			return true
		}
		res.Articles = append(res.Articles, f)
		return true
	})
	return res
}

// importEach reads the files by as many workers as there are cores, each
// file on its own, and hands each result to each in the order of the
// files, its study made distinct from those before it (distinctStudy).
// Only the results that came before their turn are held. When each
// returns false no file is started any more and importEach returns once
// the workers have stopped.
func importEach(files []string, stdin io.Reader, progress func(done, total int), each func(file string, f *Found, err error) bool) {
	type result struct {
		i   int
		f   *Found
		err error
	}
	next := make(chan int)
	results := make(chan result)
	stop := make(chan struct{})
	var wg sync.WaitGroup
	for range min(runtime.GOMAXPROCS(0), max(len(files), 1)) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				f, err := ReadFile(files[i], stdin)
				results <- result{i, f, err}
			}
		}()
	}
	go func() {
	feed:
		for i := range files {
			select {
			case next <- i:
			case <-stop:
				break feed
			}
		}
		close(next)
		wg.Wait()
		close(results)
	}()
	studies := map[string]int{}
	pending := map[int]result{}
	turn := 0
	stopped := false
	for r := range results {
		if stopped {
			continue // drained, so that the workers end
		}
		pending[r.i] = r
		for {
			r, ok := pending[turn]
			if !ok {
				break
			}
			delete(pending, turn)
			if r.err == nil {
				distinctStudy(r.f, studies)
			}
			if !each(files[turn], r.f, r.err) {
				stopped = true
				close(stop)
				break
			}
			turn++
			if progress != nil {
				progress(turn, len(files))
			}
		}
	}
}

// distinctStudy renames an article's study when an earlier article of the
// import has its key ("Ashby 2025" twice: the second is "Ashby 2025b"), as
// reference lists tell apart one author's papers of one year, so that two
// articles never merge into one study.
func distinctStudy(f *Found, seen map[string]int) {
	key := strings.ToLower(f.Study)
	seen[key]++
	n := seen[key]
	if n == 1 {
		return
	}
	name := fmt.Sprintf("%s (%d)", f.Study, n)
	if n <= 26 {
		name = f.Study + string(rune('a'+n-1))
	}
	seen[strings.ToLower(name)]++
	orig := f.Study
	f.Study = name
	for i := range f.Coefficients {
		f.Coefficients[i].Study = name
	}
	for i := range f.Claims {
		f.Claims[i].Study = name
	}
	for i := range f.Tables {
		if len(f.Tables[i].Rows) > 0 && len(f.Tables[i].Rows[0]) > 1 && f.Tables[i].Rows[0][0] == "study" {
			f.Tables[i].Rows[0][1] = name
		}
	}
	f.confirm("", fmt.Sprintf("an earlier article of the import has the study key %q: this one is %q", orig, name), f.File)
}

// ReadFile reads one article, its format chosen by its content (a zip
// archive is DOCX; XML whose root is <article> is JATS; a document that
// starts with an HTML tag is HTML; other text is text) and recognises its
// tables and sentences. "-" reads stdin as text.
func ReadFile(file string, stdin io.Reader) (*Found, error) {
	a, err := readArticle(file, stdin)
	if err != nil {
		return nil, err
	}
	return Recognise(a), nil
}

// Recognise reads the tables and sentences of an article read by one of
// the readers.
func Recognise(a *Article) *Found {
	f := &Found{File: a.File, Format: a.Format, Study: a.Study}
	readTables(a, f)
	readSentences(a, f)
	readClaims(a, f)
	return f
}

func readArticle(file string, stdin io.Reader) (*Article, error) {
	if file == "-" {
		return ReadText(stdin, "standard input")
	}
	fi, err := os.Stat(file)
	if err != nil {
		return nil, err
	}
	if fi.Size() > MaxArticleBytes {
		return nil, fmt.Errorf("%s is %d MiB; articles over %d MiB are not read: %w", file, fi.Size()>>20, MaxArticleBytes>>20, extract.ErrInputTooLarge)
	}
	fh, err := os.Open(file)
	if err != nil {
		return nil, err
	}
	defer fh.Close()
	head := make([]byte, 1024)
	n, _ := io.ReadFull(fh, head)
	head = head[:n]
	if bytes.HasPrefix(head, []byte("%PDF")) {
		return nil, fmt.Errorf("%s is a PDF, which is not read: use the article's JATS XML or HTML, or paste its text: %w", file, ErrNotArticle)
	}
	if bytes.HasPrefix(head, []byte("PK\x03\x04")) {
		fh.Close()
		return ReadDOCX(file)
	}
	if _, err := fh.Seek(0, io.SeekStart); err != nil {
		return nil, err
	}
	switch formatOf(head, file) {
	case FormatJATS:
		return ReadJATS(fh, file)
	case FormatHTML:
		return ReadHTML(fh, file)
	case FormatText:
		return ReadText(fh, file)
	}
	return nil, fmt.Errorf("%s is not an article (JATS XML, HTML, DOCX or text): %w", file, ErrNotArticle)
}

// formatOf decides a format by the first bytes of a file, and its name
// where they do not tell.
func formatOf(head []byte, file string) string {
	if bytes.IndexByte(head, 0) >= 0 {
		return ""
	}
	s := strings.ToLower(strings.TrimSpace(strings.TrimPrefix(string(head), "\ufeff")))
	ext := strings.ToLower(filepath.Ext(file))
	switch {
	case strings.HasPrefix(s, "<!doctype html") || strings.HasPrefix(s, "<html") || ext == ".html" || ext == ".htm":
		return FormatHTML
	case strings.HasPrefix(s, "<?xml") || strings.HasPrefix(s, "<!doctype article") || strings.HasPrefix(s, "<article") || ext == ".xml" || ext == ".nxml":
		return FormatJATS
	case strings.HasPrefix(s, "<") && strings.Contains(s, "<table"):
		return FormatHTML
	}
	return FormatText
}
