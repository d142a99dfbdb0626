//go:build !wasm

package e2e

import (
	"testing"

	"alvea/app/ui"
)

// screensUnderTest is every tab: its id, route and heading.
var screensUnderTest = []struct{ tab, path, title string }{
	{"brief", "/", "Brief"},
	{"supply", "/supply", "Supply"},
	{"altitude", "/altitude", "Altitude"},
	{"logbook", "/logbook", "Logbook"},
	{"review", "/review", "Review"},
	{"settings", "/settings", "Settings"},
}

// The shell loads, every tab navigates inside the running app (no page
// load), each screen shows its heading and the caution where it shows
// clinical numbers, and no request leaves the app's origin.
func TestShellLoadsAndNavigates(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.open(srv.URL("/"))

	if got := b.text("#alvea-version"); got != srv.Version {
		t.Errorf("version shown = %q, want the served version %q", got, srv.Version)
	}
	// A page load would drop this value; in-app navigation keeps it.
	eval[bool](b, `(window.alveaProbe = true)`)
	for _, s := range screensUnderTest {
		b.tap("#tab-" + s.tab)
		b.waitFor("heading "+s.title, `document.querySelector("main h1")?.textContent === "`+s.title+`"`, 10e9)
		if got := eval[string](b, `location.pathname`); got != s.path {
			t.Errorf("%s: path = %q, want %q", s.title, got, s.path)
		}
		if !eval[bool](b, `window.alveaProbe === true`) {
			t.Fatalf("%s: the tab reloaded the page instead of navigating in the app", s.title)
		}
		if got := eval[string](b, `document.querySelector('#tab-`+s.tab+`').getAttribute("aria-current") ?? ""`); got != "page" {
			t.Errorf("%s: tab aria-current = %q, want page", s.title, got)
		}
		if s.tab != "settings" && b.text(".alv-caution p") != ui.CautionText {
			t.Errorf("%s: caution = %q, want %q", s.title, b.text(".alv-caution p"), ui.CautionText)
		}
	}
	if off := b.requestsNotFrom(srv.Origin()); len(off) > 0 {
		t.Errorf("requests to other origins: %q", off)
	}
	if b.requestCount() == 0 {
		t.Error("no request was recorded: the request log does not work")
	}
}

// Every route answers directly (a bookmark or a typed URL), and a route the
// app does not know is 404 from the server.
func TestRoutesServeDirectly(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	for _, s := range screensUnderTest {
		b.open(srv.URL(s.path))
		if got := b.text("main h1"); got != s.title {
			t.Errorf("%s: heading = %q, want %q", s.path, got, s.title)
		}
	}
}
