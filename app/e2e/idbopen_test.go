//go:build !wasm

package e2e

import (
	"fmt"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
)

// lbOpened is true once the Logbook screen has left "Opening the logbook…"
// for one of its phases (create, unlock, list, or a plain message).
const lbOpened = `document.querySelector("#lb-create, #lb-unlock, #lb-nav-list") !== null`

// lbState describes what the Logbook screen shows, for failure messages.
func (b *browser) lbState() string {
	return fmt.Sprintf("status %q, problem %q, lead %q", b.text("#lb-status"), b.text("#lb-problem"), b.text(".lb-screen .alv-lead, .lb-screen .alv-card"))
}

// waitOpened waits (polling, no fixed sleep beyond the poll step) for the
// Logbook to leave its opening state, and fails with what it shows.
func (b *browser) waitOpened(what string, timeout time.Duration) {
	b.t.Helper()
	deadline := time.Now().Add(timeout)
	for !eval[bool](b, "!!("+lbOpened+")") {
		if time.Now().After(deadline) {
			b.t.Fatalf("%s: the Logbook did not open within %s: %s", what, timeout, b.lbState())
		}
		time.Sleep(50 * time.Millisecond)
	}
}

// A full page load of the Logbook right after a full page load of the
// Brief (which opens the vault's IndexedDB database on mount, creating it
// on the first visit) opens the Logbook, every time: first on a new
// profile (the database is created by the Brief's page), then again and
// again, leaving the Brief's page at once or after its open completed.
func TestIdbOpenAfterBriefFullLoad(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	const rounds = 10
	for round := 0; round < rounds; round++ {
		if round%2 == 0 {
			// Leave the Brief while its open may still be in flight.
			b.must("navigate /", chromedp.Navigate(srv.URL("/")))
		} else {
			b.open(srv.URL("/"))
		}
		b.open(srv.URL("/logbook"))
		b.waitOpened(fmt.Sprintf("round %d", round), 15*time.Second)
	}
	// The same with a vault in the database (the Brief then reads its
	// header too).
	b.typeInto("#lb-new-pass", testPass)
	b.typeInto("#lb-new-again", testPass)
	b.tap("#lb-create-go")
	b.waitLB("the vault to be created", `document.querySelector("#lb-nav-list") !== null`, waitLong)
	for round := 0; round < 4; round++ {
		b.open(srv.URL("/"))
		b.open(srv.URL("/logbook"))
		b.waitOpened(fmt.Sprintf("round %d with a vault", round), 15*time.Second)
		if !b.exists("#lb-unlock") {
			t.Fatalf("round %d with a vault: expected the unlock form: %s", round, b.lbState())
		}
	}
}

// Two tabs of the same profile: the Brief open in one, the Logbook
// loaded in another (several times over), and the Logbook in both: each
// opens.
func TestIdbOpenTwoTabs(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.open(srv.URL("/"))
	for round := 0; round < 4; round++ {
		tb, closeTab := b.tab()
		tb.open(srv.URL("/logbook"))
		tb.waitOpened(fmt.Sprintf("second tab, round %d", round), 15*time.Second)
		closeTab()
	}
	b.open(srv.URL("/logbook"))
	b.waitOpened("first tab", 15*time.Second)
	tb, closeTab := b.tab()
	defer closeTab()
	tb.open(srv.URL("/logbook"))
	tb.waitOpened("second tab beside a Logbook", 15*time.Second)
	if s := tb.lbState(); strings.Contains(s, "close other") {
		t.Errorf("a tab beside another says it is blocked: %s", s)
	}
}

// On a new profile each time (the Brief's page creates the database),
// the Logbook loaded at various moments after the Brief's page started
// opens every time. Before the fix, a Brief page put in the back/forward
// cache with that first open still pending held the database, and the
// Logbook's open waited behind it (round 0 to 2 hung at "Opening the
// logbook…").
func TestIdbOpenFirstVisit(t *testing.T) {
	srv := startApp(t, repoRoot)
	for round, delay := range []time.Duration{0, 5, 10, 20, 40, 80, 160, 320} {
		b := newBrowser(t, t.TempDir())
		b.open(srv.URL("/"))
		time.Sleep(delay * time.Millisecond) // when the Brief's page is left: the open in flight or done
		b.open(srv.URL("/logbook"))
		b.waitOpened(fmt.Sprintf("round %d (left the Brief %d ms after it started)", round, delay), 15*time.Second)
		b.Close()
	}
}
