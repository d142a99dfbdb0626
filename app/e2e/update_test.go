//go:build !wasm

package e2e

import (
	"context"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
)

// A new version is offered, never applied by itself: with v2 on the server,
// the page running v1 shows the offer; a reload and a new tab still run v1;
// accepting switches to v2.
func TestDeferredUpdate(t *testing.T) {
	root1 := copyWeb(t, nil)
	root2 := copyWeb(t, map[string]string{"release-note.txt": "second version\n"})

	v1 := startApp(t, root1)
	addr := v1.Addr()
	b := newBrowser(t, t.TempDir())
	b.open(v1.URL("/"))
	b.waitControlled()
	if got := b.text("#alvea-version"); got != v1.Version {
		t.Fatalf("first load runs %q, want v1 %q", got, v1.Version)
	}
	if b.exists("#update-banner") {
		t.Fatal("the first visit offers an update")
	}
	v1.Stop()

	v2 := startAppAt(t, addr, root2)
	if v2.Version == v1.Version {
		t.Fatalf("v2 has the same version as v1 (%s): the version is not a content hash", v1.Version)
	}

	// The reload checks for a new worker; v2 installs and waits.
	b.reload()
	b.waitFor("the update offer", `document.querySelector("#update-banner") !== null`, 60*time.Second)
	if got := b.text("#alvea-version"); got != v1.Version {
		t.Errorf("after the offer the page runs %q, want v1 %q", got, v1.Version)
	}

	// A reload keeps v1 (and the offer).
	b.reload()
	if got := b.text("#alvea-version"); got != v1.Version {
		t.Errorf("reload before accepting runs %q, want v1 %q", got, v1.Version)
	}
	b.waitFor("the offer after reload", `document.querySelector("#update-banner") !== null`, 30*time.Second)

	// A new tab keeps v1 too.
	tab, cancelTab := chromedp.NewContext(b.ctx)
	func() {
		defer cancelTab()
		ctx, cancel := context.WithTimeout(tab, 60*time.Second)
		defer cancel()
		if err := chromedp.Do(ctx, chromedp.Navigate(v2.URL("/settings")),
			chromedp.Poll[chromedp.Void](`document.documentElement.getAttribute("data-alvea") === "wasm"`)); err != nil {
			t.Fatalf("new tab: %v", err)
		}
		got, err := chromedp.Run(ctx, chromedp.Evaluate[string](`document.querySelector("#alvea-version").textContent`))
		if err != nil {
			t.Fatal(err)
		}
		if got != v1.Version {
			t.Errorf("a new tab runs %q, want v1 %q", got, v1.Version)
		}
	}()

	// "Later" hides the offer and changes nothing.
	b.tap("#update-later")
	b.waitFor("the offer hidden", `document.querySelector("#update-banner") === null`, 10*time.Second)
	b.reload()
	b.waitFor("the offer again", `document.querySelector("#update-banner") !== null`, 30*time.Second)

	// Accept: the page reloads into v2.
	b.tap("#update-accept")
	b.waitFor("v2 running", `document.querySelector("#alvea-version")?.textContent === "`+v2.Version+`"`, 60*time.Second)
	b.waitReady()
	if b.exists("#update-banner") {
		t.Error("the offer is still shown after the update")
	}
	// The next reload stays on v2.
	b.reload()
	if got := b.text("#alvea-version"); got != v2.Version {
		t.Errorf("reload after accepting runs %q, want v2 %q", got, v2.Version)
	}
}
