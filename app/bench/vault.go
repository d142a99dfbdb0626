//go:build !wasm

package main

import (
	"context"
	"fmt"
	"time"

	"github.com/chromedp/chromedp"

	"alvea/app/logbook"
	"alvea/app/logbook/idb"
)

// benchPass is the passphrase of the seeded vault (made up for the bench).
const benchPass = "lantern over the salt marsh at noon"

// seedVault builds natively a vault of n records at the default key
// derivation — transports of 10 records (open, 8 notes, close), the last
// one left open so a record can be appended to it — and writes its sealed
// bytes into the page's IndexedDB in package idb's layout (database
// idb.DBName, stores meta, index and body). Nothing in the app is involved.
func seedVault(c *chrome, n int) error {
	ctx := context.Background()
	store := logbook.NewMemStore()
	v, err := logbook.Create(ctx, store, benchPass, logbook.DefaultKDF)
	if err != nil {
		return err
	}
	start := time.Date(2031, 3, 1, 8, 0, 0, 0, time.UTC)
	var id logbook.TransportID
	for i := 0; i < n; i++ {
		at := start.Add(time.Duration(i) * time.Minute)
		e := &logbook.Entry{Transport: id, At: at}
		switch {
		case i%10 == 0:
			id = logbook.NewTransportID(at)
			e.Transport, e.Kind = id, logbook.KindOpen
			e.Open = &logbook.Opening{Vehicle: fmt.Sprintf("Vehicle %d", i/10%7), Crew: []string{"AB"},
				Origin: logbook.Place{Name: fmt.Sprintf("Origin %d", i/10)}, Destination: logbook.Place{Name: "Base"}}
		case i%10 == 9 && i != n-1:
			e.Kind, e.Close = logbook.KindClose, &logbook.Closing{Outcome: "handed over"}
		default:
			e.Kind, e.Note = logbook.KindNote, &logbook.Note{Text: fmt.Sprintf("note %d", i)}
		}
		if _, err := v.Append(ctx, e); err != nil {
			return err
		}
	}
	header, head, err := store.Meta(ctx)
	if err != nil {
		return err
	}
	items, err := store.Index(ctx)
	if err != nil {
		return err
	}
	var recs []idb.SeedRecord
	for _, it := range items {
		body, err := store.Body(ctx, it.Seq)
		if err != nil {
			return err
		}
		recs = append(recs, idb.SeedRecord{Seq: it.Seq, Index: it.Index, Body: body})
	}
	for _, script := range idb.SeedScripts(recs, header, head) {
		if _, err := evalJS[bool](c, script); err != nil {
			return fmt.Errorf("seeding IndexedDB: %w", err)
		}
	}
	return nil
}

// vaultInBrowser measures the Logbook screen at 1x: unlock (the tap to the
// key derived: the screen then says it is reading the logbook), open and
// list (from there to the list of transports drawn), and append one note to
// the open transport (the tap to the new record in the timeline).
func vaultInBrowser(alvea *program, r *report) error {
	n := *records
	progress("vault: seeding %d records, then %d rounds of unlock, list and append at 1x", n, *runs)
	c, err := newChrome()
	if err != nil {
		return err
	}
	defer c.close()
	if err := c.do(120*time.Second, chromedp.Navigate(alvea.origin+"/settings")); err != nil {
		return err
	}
	if err := c.waitJS("the app", `document.documentElement.getAttribute("data-alvea") === "wasm"`, 120*time.Second); err != nil {
		return err
	}
	if err := seedVault(c, n); err != nil {
		return err
	}
	if err := c.do(120*time.Second, chromedp.Navigate(alvea.origin+"/logbook")); err != nil {
		return err
	}
	if err := c.waitJS("the unlock form", `document.querySelector("#lb-unlock")`, 60*time.Second); err != nil {
		return err
	}
	var unlock, list, appendMs []float64
	wantCount := fmt.Sprintf("%d of %d transports", (n+9)/10, (n+9)/10)
	for round := 0; round < *runs; round++ {
		if err := c.typeInto("#lb-pass", benchPass); err != nil {
			return err
		}
		res, err := evalJS[[]float64](c, `(async () => {
			const t0 = performance.now();
			document.querySelector("#lb-unlock-go").click();
			const until = (f) => new Promise(res => { const step = () => f() ? res(performance.now()) : setTimeout(step, 5); step(); });
			const t1 = await until(() => (document.querySelector("#lb-status")?.textContent ?? "").includes("Reading the logbook"));
			const t2 = await until(() => document.querySelector("#lb-count") !== null && !document.querySelector(".lb-busy"));
			return [t1 - t0, t2 - t1];
		})()`)
		if err != nil {
			return fmt.Errorf("unlock: %w", err)
		}
		unlock = append(unlock, res[0])
		list = append(list, res[1])
		if got, _ := evalJS[string](c, `document.querySelector("#lb-count").textContent.trim()`); got != wantCount {
			return fmt.Errorf("the list shows %q, want %q", got, wantCount)
		}
		if problems, _ := evalJS[bool](c, `document.querySelector("#lb-chain-problems") !== null`); problems {
			return fmt.Errorf("the seeded vault shows chain problems")
		}
		// The newest transport (first row) is the open one.
		if err := c.tap("#lb-list tbody button"); err != nil {
			return err
		}
		if err := c.waitJS("the timeline", `document.querySelector("#lb-note-text") !== null && !document.querySelector(".lb-busy")`, 30*time.Second); err != nil {
			return err
		}
		ms, err := evalJS[float64](c, fmt.Sprintf(`(async () => {
			const t = document.querySelector("#lb-note-text");
			t.value = "bench round %d"; t.dispatchEvent(new Event("input", {bubbles: true}));
			await new Promise(r => setTimeout(r, 50));
			const count = () => document.querySelectorAll("#lb-timeline li[data-seq]").length;
			const before = count();
			const t0 = performance.now();
			document.querySelector("#lb-note-go").click();
			await new Promise(res => { const step = () => (count() > before && !document.querySelector(".lb-busy")) ? res() : setTimeout(step, 2); step(); });
			return performance.now() - t0;
		})()`, round))
		if err != nil {
			return fmt.Errorf("append: %w", err)
		}
		appendMs = append(appendMs, ms)
		// Back to the list before the lock: a lock taken in a transport
		// brings the crew back to it at the next unlock, and the next
		// round times the list.
		if err := c.tap("#lb-nav-list"); err != nil {
			return err
		}
		if err := c.waitJS("the list", `document.querySelector("#lb-count") !== null && !document.querySelector(".lb-busy")`, 30*time.Second); err != nil {
			return err
		}
		if err := c.tap("#lb-lock"); err != nil {
			return err
		}
		if err := c.waitJS("the unlock form", `document.querySelector("#lb-unlock")`, 30*time.Second); err != nil {
			return err
		}
	}
	kdf := logbook.DefaultKDF
	r.add(section(fmt.Sprintf("vault in Chromium, Logbook screen, 1x CPU (ms); %s", kdf)))
	u := row{Name: "unlock (tap to key derived)", Unit: "ms", A: summary(unlock)}
	u.Budget = &budget{Text: "about 1 s (≤ 1.5 s), strength kept", Met: u.A.Median <= 1500}
	r.add(u)
	l := row{Name: fmt.Sprintf("open and list %d records (%d transports)", n, (n+9)/10), Unit: "ms", A: summary(list)}
	l.Budget = &budget{Text: "≤ 1.5 s", Met: l.A.Max <= 1500}
	r.add(l)
	r.add(row{Name: "append one record (tap to shown in the timeline)", Unit: "ms", A: summary(appendMs)})
	return nil
}
