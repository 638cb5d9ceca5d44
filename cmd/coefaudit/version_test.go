package main

import (
	"strings"
	"testing"

	"coefaudit/cmd/coefaudit/internal/buildinfo"
)

// TestVersion: "coefaudit version" and "coefaudit --version" print the
// same one line, the build's description from its build information.
func TestVersion(t *testing.T) {
	want := buildinfo.Current() + "\n"
	for _, args := range [][]string{{"version"}, {"--version"}} {
		stdout, stderr, code := runArgs(args...)
		if code != exitOK || stderr != "" {
			t.Errorf("coefaudit %s = %d, stderr %q", strings.Join(args, " "), code, stderr)
		}
		if stdout != want || !strings.HasPrefix(stdout, "coefaudit ") {
			t.Errorf("coefaudit %s printed %q, want %q", strings.Join(args, " "), stdout, want)
		}
	}
	if _, _, code := runArgs("version", "extra"); code != exitError {
		t.Errorf("coefaudit version extra = %d, want %d", code, exitError)
	}
}
