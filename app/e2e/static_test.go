//go:build !wasm

package e2e

import (
	"os"
	"path/filepath"
	"testing"

	"alvea/app/server"
)

// The static site (what `alvea static` writes) runs from a plain file
// server, and keeps working offline once the file server is gone.
func TestStaticSiteWorksOffline(t *testing.T) {
	dist := t.TempDir()
	version, err := server.WriteStatic(dist, repoRoot)
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range []string{"index.html", "settings.html", "app.js", "app-worker.js", "manifest.webmanifest", "wasm_exec.js", "web/app.wasm", "web/alvea.css", "web/icon-192.png"} {
		if _, err := os.Stat(filepath.Join(dist, f)); err != nil {
			t.Errorf("static site lacks %s: %v", f, err)
		}
	}
	files := startFiles(t, dist)
	b := newBrowser(t, t.TempDir())
	b.open(files.URL("/"))
	b.waitControlled()
	if got := b.text("#alvea-version"); got != version {
		t.Errorf("static site runs %q, want %q", got, version)
	}
	b.tap("#tab-settings")
	b.waitFor("Settings", `document.querySelector("main h1")?.textContent === "Settings"`, 10e9)

	files.Stop()
	b.reload() // /settings: not a file on the host; the worker serves the shell
	if got := b.text("main h1"); got != "Settings" {
		t.Errorf("offline static /settings: heading = %q, want Settings", got)
	}
	b.open(files.URL("/?v=1"))
	if got := b.text("main h1"); got != "Brief" {
		t.Errorf("offline static /?v=1: heading = %q, want Brief", got)
	}
	if off := b.requestsNotFrom(files.Origin()); len(off) > 0 {
		t.Errorf("requests to other origins: %q", off)
	}
}
