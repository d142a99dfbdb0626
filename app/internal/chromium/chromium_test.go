//go:build !wasm

package chromium

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// RepoRoot finds this module's go.mod from a directory below it.
func TestRepoRoot(t *testing.T) {
	root, err := RepoRoot()
	if err != nil {
		t.Fatal(err)
	}
	mod, err := os.ReadFile(filepath.Join(root, "go.mod"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(string(mod), "module alvea\n") {
		t.Errorf("%s/go.mod starts %q, want module alvea", root, strings.SplitN(string(mod), "\n", 2)[0])
	}
	wd, _ := os.Getwd()
	if rel, err := filepath.Rel(root, wd); err != nil || rel != filepath.Join("app", "internal", "chromium") {
		t.Errorf("root %s is not two levels above the test's directory %s", root, wd)
	}
}

// The build flags are the Makefile's (one set everywhere keeps Go's build
// cache for app.wasm warm).
func TestWasmBuildFlagsMatchMakefile(t *testing.T) {
	root, err := RepoRoot()
	if err != nil {
		t.Fatal(err)
	}
	mk, err := os.ReadFile(filepath.Join(root, "Makefile"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(mk), `-trimpath -ldflags="-s -w"`) || strings.Join(WasmBuildFlags, " ") != "-trimpath -ldflags=-s -w" {
		t.Errorf("WasmBuildFlags %q and the Makefile's flags differ", WasmBuildFlags)
	}
}
