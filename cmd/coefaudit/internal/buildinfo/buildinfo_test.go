package buildinfo

import (
	"runtime/debug"
	"strings"
	"testing"
)

// TestDescribe: the line names the module version and the VCS settings go
// build records (cmd/go documentation, "go help buildinfo" / "go version
// -m": vcs.revision, vcs.time, vcs.modified).
func TestDescribe(t *testing.T) {
	stamped := func(version string, settings ...string) *debug.BuildInfo {
		info := &debug.BuildInfo{GoVersion: "go1.26.8", Main: debug.Module{Path: "coefaudit", Version: version}}
		for i := 0; i+1 < len(settings); i += 2 {
			info.Settings = append(info.Settings, debug.BuildSetting{Key: settings[i], Value: settings[i+1]})
		}
		return info
	}
	tests := []struct {
		name string
		info *debug.BuildInfo
		ok   bool
		want string
	}{
		{"release from the module proxy", stamped("v1.2.0"), true, "coefaudit v1.2.0, revision not recorded, go1.26.8"},
		{"build in a clean repository", stamped("(devel)", "vcs", "git", "vcs.revision", "3f2a9c1d0b7e55aa0011223344556677889900aa",
			"vcs.time", "2026-12-04T18:00:00Z", "vcs.modified", "false"), true,
			"coefaudit (devel), revision 3f2a9c1d0b7e (2026-12-04T18:00:00Z), go1.26.8"},
		{"build with local changes", stamped("(devel)", "vcs.revision", "3f2a9c1d0b7e55aa", "vcs.modified", "true"), true,
			"coefaudit (devel), revision 3f2a9c1d0b7e (with local changes), go1.26.8"},
		{"no build information", nil, false, "coefaudit (unknown build)"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := Describe(tt.info, tt.ok); got != tt.want {
				t.Errorf("Describe() = %q, want %q", got, tt.want)
			}
		})
	}
}

// TestCurrent: the test binary has build information, whose main module is
// this one.
func TestCurrent(t *testing.T) {
	if got := Current(); !strings.HasPrefix(got, "coefaudit ") || strings.Contains(got, "unknown build") {
		t.Errorf("Current() = %q, want the build's description", got)
	}
}
