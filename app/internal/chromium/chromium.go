//go:build !wasm

// Package chromium holds what the browser tests (app/e2e) and the bench
// (app/bench) share: where Debian's chromium is, the flags every headless
// run starts it with, the flags app.wasm is built with, and how to find the
// repository root.
package chromium

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"

	"github.com/chromedp/chromedp"
)

// Path is Debian's chromium, which make test (and make bench) install when
// missing.
const Path = "/usr/bin/chromium"

// WasmBuildFlags are the go build flags of app.wasm, the same as the
// Makefile's (a different set would invalidate Go's build cache for it).
var WasmBuildFlags = []string{"-trimpath", "-ldflags=-s -w"}

// Options are the allocator options of a headless run on its own profile
// (a fresh directory each time): no sandbox, GPU, QUIC, first-run pages,
// background networking, component updates or sync.
func Options(profile string) []chromedp.ExecAllocatorOption {
	return []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(Path),
		chromedp.Flag("headless", true),
		chromedp.Flag("no-sandbox", true),
		chromedp.Flag("disable-gpu", true),
		chromedp.Flag("disable-quic", true),
		chromedp.Flag("no-first-run", true),
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.UserDataDir(profile),
	}
}

// Installed reports an error naming what is missing when chromium is not
// at Path.
func Installed() error {
	if _, err := os.Stat(Path); err != nil {
		return fmt.Errorf("chromium is required (make test and make bench install it): %w", err)
	}
	return nil
}

// RepoRoot returns the nearest directory at or above the working directory
// that holds go.mod.
func RepoRoot() (string, error) {
	dir, err := os.Getwd()
	if err != nil {
		return "", err
	}
	for {
		if _, err := os.Stat(filepath.Join(dir, "go.mod")); err == nil {
			return dir, nil
		}
		parent := filepath.Dir(dir)
		if parent == dir {
			return "", errors.New("go.mod not found above the working directory")
		}
		dir = parent
	}
}
