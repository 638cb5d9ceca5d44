package main

import (
	"bufio"
	"bytes"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
	"syscall"
	"testing"
	"time"

	"coefaudit/fixtures"
)

// helperEnv, set to 1, makes the test binary run the program itself
// (TestMain), so that a test can start it as a process and signal it.
const helperEnv = "COEFAUDIT_TEST_RUN_MAIN"

func TestMain(m *testing.M) {
	if os.Getenv(helperEnv) == "1" {
		main()
	}
	os.Exit(m.Run())
}

// largePairedCSV writes an invented paired CSV of n claims
// (fixtures.WritePairedClaims) into a temporary folder.
func largePairedCSV(t *testing.T, n int) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), "claims.csv")
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	w := bufio.NewWriter(f)
	if err := fixtures.WritePairedClaims(w, n, 1, fixtures.DesignMixed); err != nil {
		t.Fatal(err)
	}
	if err := w.Flush(); err != nil {
		t.Fatal(err)
	}
	if err := f.Close(); err != nil {
		t.Fatal(err)
	}
	return path
}

// manyTopicsCSV writes an invented paired CSV of topics topics of three
// claims each: in each, two regression coefficients from independent
// groups, printed with their SEs, so that every topic is pooled.
func manyTopicsCSV(t *testing.T, topics int) string {
	t.Helper()
	var b strings.Builder
	b.WriteString("study,claim,published,basis,topic,first_label,first_measure,first_group,first_estimate,first_se," +
		"second_label,second_measure,second_group,second_estimate,second_se\n")
	for k := range topics {
		for i := range 3 {
			fmt.Fprintf(&b, "Study %d-%d,c,differ,test,topic %d,x,b,a,0.%d1,0.05,y,b,b,0.1%d,0.06\n", k, i, k, 3+i, i)
		}
	}
	path := filepath.Join(t.TempDir(), "topics.csv")
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// TestInterruptLeavesNothing starts the program on a large input, waits
// until it is writing (its temporary files exist), sends it SIGINT or
// SIGTERM and checks that it exits with the status a shell gives (128 +
// the signal's number), says why on standard error, and leaves neither
// its report, nor its temporary file, nor excelize's temporary files, nor
// forest plots behind. Before signals were handled, the process died
// with the signal and left its temporary files.
func TestInterruptLeavesNothing(t *testing.T) {
	if runtime.GOOS == "windows" {
		t.Skip("no SIGINT to send on Windows")
	}
	if testing.Short() {
		t.Skip("writes a paired CSV of 400,000 claims")
	}
	large := largePairedCSV(t, 400_000)
	topics := manyTopicsCSV(t, 300)
	tests := []struct {
		name   string
		args   []string // the report's file is appended to them
		file   string
		sig    syscall.Signal
		want   int
		signal func(out, tmp string) bool // the run is far enough to be signalled
	}{
		{"check, SIGINT", []string{"check", large, "--format", "csv", "--out"}, "audit.csv", syscall.SIGINT, 130, reportUnderWay},
		{"check, SIGTERM", []string{"check", large, "--format", "md", "--out"}, "audit.md", syscall.SIGTERM, 143, reportUnderWay},
		{"check, xlsx past excelize's memory", []string{"check", large, "--format", "xlsx", "--out"}, "audit.xlsx", syscall.SIGINT, 130,
			func(out, tmp string) bool {
				return reportUnderWay(out, tmp) && anyMatch(tmp, "excelize-*", "*/excelize-*")
			}},
		{"pool, plots under way", []string{"pool", topics, "--format", "md", "--out"}, "pool.md", syscall.SIGTERM, 143,
			func(out, tmp string) bool { return anyMatch(out, ".pool-topic-*", "pool-topic-*") }},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			out, tmp := t.TempDir(), t.TempDir()
			cmd := exec.Command(os.Args[0], append(tt.args, filepath.Join(out, tt.file))...)
			cmd.Env = append(os.Environ(), helperEnv+"=1", "TMPDIR="+tmp)
			var stdout, stderr bytes.Buffer
			cmd.Stdout, cmd.Stderr = &stdout, &stderr
			if err := cmd.Start(); err != nil {
				t.Fatal(err)
			}
			ended := make(chan error, 1)
			go func() { ended <- cmd.Wait() }()
			// Wait, without a time limit of our own, until the run is
			// writing; it must not end first.
			tick := time.NewTicker(2 * time.Millisecond)
			defer tick.Stop()
		wait:
			for {
				select {
				case err := <-ended:
					t.Fatalf("the run ended (%v) before it could be signalled; stderr %q", err, stderr.String())
				case <-tick.C:
					if tt.signal(out, tmp) {
						break wait
					}
				}
			}
			if err := cmd.Process.Signal(tt.sig); err != nil {
				t.Fatal(err)
			}
			<-ended
			if got := cmd.ProcessState.ExitCode(); got != tt.want {
				t.Errorf("exit status %d (%v), want %d", got, cmd.ProcessState, tt.want)
			}
			name := map[syscall.Signal]string{syscall.SIGINT: "SIGINT", syscall.SIGTERM: "SIGTERM"}[tt.sig]
			want := "coefaudit: interrupted by " + name + ": the run stopped, and no file it was writing was kept\n"
			if msg := stderr.String(); msg != want {
				t.Errorf("stderr = %q, want %q alone", msg, want)
			}
			if stdout.Len() != 0 {
				t.Errorf("stdout = %.200q, want nothing", stdout.String())
			}
			for _, dir := range []string{out, tmp} {
				if left := dirNames(t, dir); len(left) != 0 {
					t.Errorf("%s holds %q after the signal, want nothing", dir, left)
				}
			}
		})
	}
}

// reportUnderWay says whether the report's temporary file exists in out.
func reportUnderWay(out, _ string) bool { return anyMatch(out, ".*.tmp-*") }

func anyMatch(dir string, patterns ...string) bool {
	for _, p := range patterns {
		if m, _ := filepath.Glob(filepath.Join(dir, p)); len(m) > 0 {
			return true
		}
	}
	return false
}
