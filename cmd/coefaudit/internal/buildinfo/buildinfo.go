// Package buildinfo says which build of coefaudit is running, from the
// information the Go toolchain stamps into every binary (runtime/debug):
// the main module's version and the version-control revision it was built
// from. It keeps no state of its own.
package buildinfo

import (
	"runtime/debug"
	"strings"
)

// Describe writes one line naming the build: "coefaudit v1.2.0, revision
// 3f2a9c1d0b7e (2026-12-04T18:00:00Z, with local changes), go1.26.8".
// The module version is "(devel)" for a build from a source tree (go
// build, go run); the revision, its time and whether the tree had
// uncommitted changes come from the vcs.revision, vcs.time and
// vcs.modified settings that go build records when it runs inside a
// repository (not under go run or go test). ok false, when the binary
// carries no build information, gives "coefaudit (unknown build)".
func Describe(info *debug.BuildInfo, ok bool) string {
	if !ok || info == nil {
		return "coefaudit (unknown build)"
	}
	version := info.Main.Version
	if version == "" {
		version = "(devel)"
	}
	line := "coefaudit " + version
	settings := map[string]string{}
	for _, s := range info.Settings {
		settings[s.Key] = s.Value
	}
	if rev := settings["vcs.revision"]; rev != "" {
		line += ", revision " + shortRevision(rev)
		var about []string
		if t := settings["vcs.time"]; t != "" {
			about = append(about, t)
		}
		if settings["vcs.modified"] == "true" {
			about = append(about, "with local changes")
		}
		if len(about) > 0 {
			line += " (" + strings.Join(about, ", ") + ")"
		}
	} else {
		line += ", revision not recorded"
	}
	if info.GoVersion != "" {
		line += ", " + info.GoVersion
	}
	return line
}

// Current describes the running binary.
func Current() string {
	info, ok := debug.ReadBuildInfo()
	return Describe(info, ok)
}

// shortRevision keeps the first 12 characters of a commit hash, enough to
// name a commit of this repository unambiguously.
func shortRevision(rev string) string {
	if len(rev) > 12 {
		return rev[:12]
	}
	return rev
}
