package audit

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"reflect"
	"runtime"
	"slices"
	"strings"
	"sync"
	"testing"
	"time"

	"coefaudit/extract"
	"coefaudit/fixtures"
)

// writeLiterature writes n invented paired claims (every measure, design
// and way of printing an SE, with broken rows among them) to a file in dir.
func writeLiterature(tb testing.TB, dir string, n int, seed uint64) string {
	tb.Helper()
	path := filepath.Join(dir, fmt.Sprintf("paired-%d-%d.csv", n, seed))
	f, err := os.Create(path)
	if err != nil {
		tb.Fatal(err)
	}
	if err := fixtures.WritePairedClaims(f, n, seed); err != nil {
		tb.Fatal(err)
	}
	if err := f.Close(); err != nil {
		tb.Fatal(err)
	}
	return path
}

// TestStreamMatchesWholeAudit checks that a streamed audit of a paired CSV
// writes exactly what the audit of the whole file writes, as CSV byte for
// byte and as JSON value for value (the stream writes "summary" after
// "claims" and the problems in row order), with and without the
// multiplicity adjustment, on several worker counts.
func TestStreamMatchesWholeAudit(t *testing.T) {
	path := writeLiterature(t, t.TempDir(), 3000, 5)
	in, err := extract.Read(path)
	if err != nil {
		t.Fatal(err)
	}
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(0))
	for _, adj := range []string{AdjustNone, AdjustHolm, AdjustBH} {
		opts := Options{Adjust: adj}
		rep := Audit(in, opts)
		var wholeCSV, wholeJSON bytes.Buffer
		if err := WriteCSV(&wholeCSV, rep); err != nil {
			t.Fatal(err)
		}
		if err := WriteJSON(&wholeJSON, rep); err != nil {
			t.Fatal(err)
		}
		for _, procs := range []int{1, 3} {
			runtime.GOMAXPROCS(procs)
			var streamed bytes.Buffer
			sum, err := StreamPaired(path, opts, NewCSVSink(&streamed))
			if err != nil {
				t.Fatal(err)
			}
			if !bytes.Equal(streamed.Bytes(), wholeCSV.Bytes()) {
				t.Errorf("adjust %s, %d workers: the streamed CSV differs from the whole-file CSV at byte %d",
					adj, procs, firstDifference(streamed.Bytes(), wholeCSV.Bytes()))
			}
			if !reflect.DeepEqual(sum, rep.Summary) {
				t.Errorf("adjust %s: streamed summary %v, whole-file %v", adj, sum, rep.Summary)
			}
			streamed.Reset()
			if _, err := StreamPaired(path, opts, NewJSONSink(&streamed)); err != nil {
				t.Fatal(err)
			}
			var got, want map[string]any
			if err := json.Unmarshal(streamed.Bytes(), &got); err != nil {
				t.Fatalf("adjust %s: the streamed JSON does not parse: %v", adj, err)
			}
			if err := json.Unmarshal(wholeJSON.Bytes(), &want); err != nil {
				t.Fatal(err)
			}
			for _, m := range []map[string]any{got, want} {
				ps := m["problems"].([]any)
				slices.SortStableFunc(ps, func(a, b any) int { return strings.Compare(fmt.Sprint(a), fmt.Sprint(b)) })
			}
			if !reflect.DeepEqual(got, want) {
				t.Errorf("adjust %s, %d workers: the streamed JSON differs from the whole-file JSON", adj, procs)
			}
		}
	}
	if len(Audit(in, DefaultOptions).Problems) == 0 {
		t.Error("the invented literature has no broken rows; the test needs some")
	}
	if !IsPairedCSV(path) || IsPairedCSV(filepath.Dir(path)) {
		t.Error("IsPairedCSV misjudges a paired CSV or a folder")
	}
}

func firstDifference(a, b []byte) int {
	for i := range min(len(a), len(b)) {
		if a[i] != b[i] {
			return i
		}
	}
	return min(len(a), len(b))
}

// TestClaimJSONMatchesEncodingJSON checks the hand-written claim encoder
// against encoding/json (the reference it stands in for) on every claim of
// the demo and of an invented literature, and on text with every character
// JSON must escape.
func TestClaimJSONMatchesEncodingJSON(t *testing.T) {
	rep, _ := demoReport(t)
	in, err := extract.Read(writeLiterature(t, t.TempDir(), 500, 9))
	if err != nil {
		t.Fatal(err)
	}
	claims := append(rep.Claims, Audit(in, Options{Adjust: AdjustHolm}).Claims...)
	odd := claims[0]
	odd.Study = "a\"b\\c\x00\x1f\t\n\r\b\f<>&\u2028\u2029\xff\xfe é 😀"
	odd.Notes = []string{"", "=1+1", odd.Study}
	odd.Alternatives = []Alternative{{Method: "x", Statistic: 1.5, P: nan}, {Method: "y"}}
	claims = append(claims, odd)
	for i := range claims {
		c := &claims[i]
		var want bytes.Buffer
		enc := json.NewEncoder(&want)
		enc.SetEscapeHTML(false)
		enc.SetIndent("    ", "  ")
		if err := enc.Encode(c); err != nil {
			t.Fatal(err)
		}
		got := appendClaimJSON(nil, c, "    ")
		if w := bytes.TrimSuffix(want.Bytes(), []byte("\n")); !bytes.Equal(got, w) {
			t.Fatalf("claim %d (%s): appendClaimJSON differs from encoding/json at byte %d:\n%s\nwant\n%s",
				i, c.Claim, firstDifference(got, w), got, w)
		}
	}
}

// TestCSVEncoderMatchesEncodingCSV checks the CSV field writer against
// encoding/csv on text that needs quoting, guarding or neither.
func TestCSVEncoderMatchesEncodingCSV(t *testing.T) {
	texts := []string{"", "plain", "a,b", `say "x"`, "line\nbreak", "cr\rhere", " lead", "\u00a0nbsp", `\.`, `\.x`, `\a`, "~x",
		"=SUM(A1)", "+1", "-2", "@x", "\tt", "\rr", "'q", "é", "\xff", "\vv", "\ff", "\nn", "\u0085x", "\u2003em", "\x1fus", "!x",
		strings.Repeat("long ", 8), strings.Repeat("long ", 8) + ",", strings.Repeat("x", 31) + "\"",
		strings.Repeat("x", 32) + "\r", strings.Repeat("y", 40) + "\n" + "z"}
	for _, s := range texts {
		var want bytes.Buffer
		w := csv.NewWriter(&want)
		w.Write([]string{safeText(s), s})
		w.Flush()
		got := appendCSVField(append(appendSafeText(nil, s), ','), s)
		if g := string(append(got, '\n')); g != want.String() {
			t.Errorf("text %q: wrote %q, encoding/csv writes %q", s, g, want.String())
		}
	}
	for _, notes := range [][]string{nil, {}, {""}, {"", "b"}, {"a", ""}, {"=x", "y"}, {" x", "y"}, {"a,b", "c"},
		{"a", `"q"`}, {"\u00a0a", "b"}, {"-1", "2,3"}, {"\tx", "y"}} {
		var want bytes.Buffer
		w := csv.NewWriter(&want)
		w.Write([]string{safeText(strings.Join(notes, " | "))})
		w.Flush()
		if got := string(appendNotesCell(nil, notes)) + "\n"; got != want.String() {
			t.Errorf("notes %q: wrote %q, encoding/csv writes %q", notes, got, want.String())
		}
	}
}

// TestStreamLongStudy checks that a study longer than MaxStreamFamily
// claims in a row is adjusted in blocks, with a problem saying where each
// new block starts, and that every claim is still written once.
func TestStreamLongStudy(t *testing.T) {
	n := MaxStreamFamily + 7
	var b strings.Builder
	b.WriteString("study,claim,published,first_measure,first_estimate,first_se,second_measure,second_group,second_estimate,second_se\n")
	for i := range n {
		fmt.Fprintf(&b, "One,c%d,differ,md,0.%02d,0.10,md,other,0.10,0.10\n", i, i%100)
	}
	path := filepath.Join(t.TempDir(), "long.csv")
	if err := os.WriteFile(path, []byte(b.String()), 0o600); err != nil {
		t.Fatal(err)
	}
	var out bytes.Buffer
	sum, err := StreamPaired(path, Options{Adjust: AdjustHolm}, NewJSONSink(&out))
	if err != nil {
		t.Fatal(err)
	}
	var rep struct {
		Claims []struct {
			Claim     string             `json:"claim"`
			PAdjusted map[string]float64 `json:"p_adjusted"`
		} `json:"claims"`
		Problems []Problem `json:"problems"`
	}
	if err := json.Unmarshal(out.Bytes(), &rep); err != nil {
		t.Fatal(err)
	}
	if sum.Claims != n || len(rep.Claims) != n {
		t.Fatalf("%d claims in the summary and %d written, want %d", sum.Claims, len(rep.Claims), n)
	}
	for i, c := range rep.Claims {
		if c.Claim != fmt.Sprintf("c%d", i) {
			t.Fatalf("claim %d is %s", i, c.Claim)
		}
	}
	if len(rep.Problems) != 1 || rep.Problems[0].Row != MaxStreamFamily+2 || rep.Problems[0].Column != "study" {
		t.Errorf("problems %+v, want one at row %d, column study", rep.Problems, MaxStreamFamily+2)
	}
}

// countingSink encodes a claim as one byte and counts, as claims are
// encoded, the most encoded but not yet written; Write is slow, so that
// the reader and the workers run as far ahead as the stream lets them.
type countingSink struct {
	mu                      sync.Mutex
	encoded, written, ahead int
}

func (s *countingSink) Begin([]string) error { return nil }
func (s *countingSink) AppendClaim(dst []byte, _ *ClaimResult, _ int) []byte {
	s.mu.Lock()
	s.encoded++
	s.ahead = max(s.ahead, s.encoded-s.written)
	s.mu.Unlock()
	return append(dst, 'x')
}
func (s *countingSink) Write(p []byte) (int, error) {
	time.Sleep(2 * time.Millisecond)
	s.mu.Lock()
	s.written += len(p)
	s.mu.Unlock()
	return len(p), nil
}
func (s *countingSink) Finish(Summary, []Problem, int) error { return nil }

// TestStreamBoundsClaimsInFlight checks that what a stream holds is
// bounded in claims, not in batches: in a file whose study column was left
// constant every batch is a block of MaxStreamFamily claims, and bounding
// the batches let 2·CPUs+1 such blocks be in flight (300 MB for a million
// claims). At most the bound in claims, or two blocks, and the block being
// written may be encoded ahead of what is written, and every claim is still
// written once.
func TestStreamBoundsClaimsInFlight(t *testing.T) {
	var b strings.Builder
	b.WriteString("study,claim,published,first_measure,first_estimate,first_se,second_measure,second_group,second_estimate,second_se\n")
	n := 12 * MaxStreamFamily
	for i := range n {
		fmt.Fprintf(&b, "One,c%d,differ,md,0.%02d,0.10,md,other,0.10,0.10\n", i, i%100)
	}
	path := filepath.Join(t.TempDir(), "one-study.csv")
	if err := os.WriteFile(path, []byte(b.String()), 0o600); err != nil {
		t.Fatal(err)
	}
	var sink countingSink
	sum, err := StreamPaired(path, DefaultOptions, &sink)
	if err != nil {
		t.Fatal(err)
	}
	if sum.Claims != n || sink.written != n {
		t.Fatalf("%d claims in the summary and %d written, want %d", sum.Claims, sink.written, n)
	}
	limit := int(streamInFlightLimit(streamWorkers()))
	// The batch being written holds only its output, outside the bound.
	if bound := max(limit, 2*MaxStreamFamily) + MaxStreamFamily; sink.ahead > bound {
		t.Errorf("%d claims were encoded ahead of the output, more than the bound %d", sink.ahead, bound)
	}
}

// failingWriter fails after a few writes.
type failingWriter struct{ left int }

var errDiskFull = errors.New("disk full")

func (w *failingWriter) Write(p []byte) (int, error) {
	if w.left--; w.left < 0 {
		return 0, errDiskFull
	}
	return len(p), nil
}

// TestStreamStopsOnWriteError checks that a failing output stops the
// stream with that error, and that every goroutine of the stream ends.
func TestStreamStopsOnWriteError(t *testing.T) {
	path := writeLiterature(t, t.TempDir(), 20000, 2)
	before := runtime.NumGoroutine()
	for _, sink := range []ClaimSink{NewCSVSink(&failingWriter{left: 3}), NewJSONSink(&failingWriter{left: 3})} {
		if _, err := StreamPaired(path, DefaultOptions, sink); !errors.Is(err, errDiskFull) {
			t.Errorf("StreamPaired to a failing writer: error %v, want %v", err, errDiskFull)
		}
	}
	for range 100 {
		if runtime.NumGoroutine() <= before {
			return
		}
		runtime.Gosched()
	}
	if n := runtime.NumGoroutine(); n > before {
		t.Errorf("%d goroutines left running after the failed streams (%d before)", n-before, before)
	}
}

// TestStreamReadError checks that a file that turns unreadable part way
// (a line beyond the reader's limit) fails the stream with the reader's
// error after the rows before it.
func TestStreamReadError(t *testing.T) {
	var b strings.Builder
	b.WriteString("study,claim,published,first_estimate,first_se,second_group,second_estimate,second_se\n")
	for i := range 2000 {
		fmt.Fprintf(&b, "S%d,c%d,differ,0.5,0.1,g,0.1,0.1\n", i/3, i)
	}
	b.WriteString("S,x,differ,0.5,0.1,g," + strings.Repeat("9", extract.MaxLineBytes+10) + ",0.1\n")
	path := filepath.Join(t.TempDir(), "long-line.csv")
	if err := os.WriteFile(path, []byte(b.String()), 0o600); err != nil {
		t.Fatal(err)
	}
	_, err := StreamPaired(path, DefaultOptions, NewCSVSink(io.Discard))
	if err == nil || !strings.Contains(err.Error(), "long-line.csv") {
		t.Errorf("StreamPaired of a file with an overlong line: error %v, want one naming the file", err)
	}
}

// The speed target: a million paired claims audited to CSV in at most 3×
// the time encoding/csv takes merely to read and split the file.
// BenchmarkStreamMillion reports both, and their ratio as "x-read"; run it
// with -benchtime 1x. The file (140 MB, fixtures.WritePairedClaims) is
// written once per run of the benchmarks.
var millionFile struct {
	path string
	dir  string
}

func millionClaims(b *testing.B) string {
	if millionFile.path == "" {
		dir, err := os.MkdirTemp("", "coefaudit-bench-")
		if err != nil {
			b.Fatal(err)
		}
		millionFile.dir = dir
		millionFile.path = writeLiterature(b, dir, 1000000, 1)
	}
	return millionFile.path
}

func TestMain(m *testing.M) {
	code := m.Run()
	if millionFile.dir != "" {
		os.RemoveAll(millionFile.dir)
	}
	os.Exit(code)
}

func BenchmarkStreamMillion(b *testing.B) {
	path := millionClaims(b)
	before := readAndSplit(b, path) // warms the page cache too
	b.ResetTimer()
	for range b.N {
		if _, err := StreamPaired(path, DefaultOptions, NewCSVSink(io.Discard)); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	// The baseline is read before and after and averaged: on a shared
	// machine the speed drifts within a run.
	read := (before + readAndSplit(b, path)) / 2
	per := b.Elapsed().Seconds() / float64(b.N)
	b.ReportMetric(per*1e9/1e6, "ns/claim")
	b.ReportMetric(read, "read-s")
	b.ReportMetric(per/read, "x-read")
}

func BenchmarkStreamMillionJSON(b *testing.B) {
	path := millionClaims(b)
	b.ResetTimer()
	for range b.N {
		if _, err := StreamPaired(path, DefaultOptions, NewJSONSink(io.Discard)); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(b.Elapsed().Seconds()/float64(b.N)*1e9/1e6, "ns/claim")
}

// BenchmarkReadSplitMillion only reads and splits the file with
// encoding/csv, the baseline of the speed target.
func BenchmarkReadSplitMillion(b *testing.B) {
	path := millionClaims(b)
	b.ResetTimer()
	for range b.N {
		readAndSplit(b, path)
	}
}

// readAndSplit reads path with encoding/csv (records reused, as fast as
// it goes) and returns the seconds it took.
func readAndSplit(b *testing.B, path string) float64 {
	f, err := os.Open(path)
	if err != nil {
		b.Fatal(err)
	}
	defer f.Close()
	start := time.Now()
	r := csv.NewReader(f)
	r.ReuseRecord = true
	for {
		if _, err := r.Read(); err == io.EOF {
			break
		} else if err != nil {
			b.Fatal(err)
		}
	}
	return time.Now().Sub(start).Seconds()
}

// TestStreamHeaderProblems checks that a paired CSV missing a required
// column streams every row as incomplete, with the header's problem first
// in the JSON report, as the whole-file audit reports it.
func TestStreamHeaderProblems(t *testing.T) {
	path := filepath.Join(t.TempDir(), "no-published.csv")
	body := "study,claim,first_estimate,first_se,second_group,second_estimate,second_se\nS,c1,0.5,0.1,g,0.1,0.1\nS,c2,0.4,0.1,g,0.1,0.1\n"
	if err := os.WriteFile(path, []byte(body), 0o600); err != nil {
		t.Fatal(err)
	}
	var out bytes.Buffer
	sum, err := StreamPaired(path, DefaultOptions, NewJSONSink(&out))
	if err != nil {
		t.Fatal(err)
	}
	var rep struct {
		Problems []Problem `json:"problems"`
	}
	if err := json.Unmarshal(out.Bytes(), &rep); err != nil {
		t.Fatal(err)
	}
	if sum.Claims != 2 || sum.Counts[Incomplete] != 2 {
		t.Errorf("summary %+v, want 2 claims, both incomplete", sum)
	}
	if len(rep.Problems) == 0 || !strings.Contains(rep.Problems[0].Message, "published") {
		t.Errorf("problems %+v, want the missing published column first", rep.Problems)
	}
}
