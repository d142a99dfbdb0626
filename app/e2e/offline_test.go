//go:build !wasm

package e2e

import (
	"testing"
)

// After the first visit the app works with the network gone: a reload
// offline, a route with a query string, a reload with the server stopped,
// and a browser restart with the server still down.
func TestOfflineReloadAndRestart(t *testing.T) {
	srv := startApp(t, repoRoot)
	profile := t.TempDir()
	b := newBrowser(t, profile)
	b.open(srv.URL("/"))
	b.waitControlled()

	// 1. Device offline, server still up.
	b.setOffline(true)
	b.reload()
	if got := b.text("main h1"); got != "Brief" {
		t.Errorf("offline reload: heading = %q, want Brief", got)
	}
	// A route other than / with a query string: the worker ignores the
	// query and falls back to the app shell.
	b.open(srv.URL("/settings?from=test"))
	if got := b.text("main h1"); got != "Settings" {
		t.Errorf("offline /settings?from=test: heading = %q, want Settings", got)
	}
	b.setOffline(false)

	// 2. Server stopped.
	srv.Stop()
	b.open(srv.URL("/"))
	if got := b.text("#alvea-version"); got != srv.Version {
		t.Errorf("server stopped: version = %q, want %q", got, srv.Version)
	}
	b.open(srv.URL("/altitude"))
	if got := b.text("main h1"); got != "Altitude" {
		t.Errorf("server stopped, /altitude: heading = %q, want Altitude", got)
	}

	// 3. Browser restart on the same profile, server still down.
	b.Close()
	b2 := newBrowser(t, profile)
	b2.open(srv.URL("/supply"))
	if got := b2.text("main h1"); got != "Supply" {
		t.Errorf("after restart: heading = %q, want Supply", got)
	}
	b2.tap("#tab-settings")
	b2.waitFor("Settings after restart", `document.querySelector("main h1")?.textContent === "Settings"`, 10e9)
}
