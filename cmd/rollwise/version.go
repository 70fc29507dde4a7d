package main

import (
	"runtime/debug"
	"strings"
)

// version describes the build from Go's build information: the module
// version ("(devel)" when built from a checkout) and, where the build
// recorded them, the commit, its time and whether the tree had changes.
func version() string {
	info, ok := debug.ReadBuildInfo()
	if !ok {
		return "unknown (no build information)"
	}
	return describeBuild(info)
}

func describeBuild(info *debug.BuildInfo) string {
	v := info.Main.Version
	if v == "" {
		v = "(devel)"
	}
	var rev, at, modified string
	for _, s := range info.Settings {
		switch s.Key {
		case "vcs.revision":
			rev = s.Value
		case "vcs.time":
			at = s.Value
		case "vcs.modified":
			modified = s.Value
		}
	}
	var parts []string
	if rev != "" {
		parts = append(parts, "commit "+rev[:min(12, len(rev))])
	}
	if at != "" {
		parts = append(parts, at)
	}
	if modified == "true" {
		parts = append(parts, "with uncommitted changes")
	}
	parts = append(parts, info.GoVersion)
	return v + " (" + strings.Join(parts, ", ") + ")"
}
