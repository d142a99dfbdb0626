//go:build wasm

// Command engine is the go-app floor (testdata/floor) with Alvea's engine
// linked in and no screen of Alvea's: the plan (physio), the vault in the
// browser's IndexedDB, its bundles and the audit. make bench builds it with
// Alvea's flags and reports its app.wasm size beside the floor's and
// Alvea's, so that the size budget can be read against what the
// computation alone weighs. The engine is never run: main only refers to
// it (behind a condition the browser never meets) so the linker keeps it.
// It lives under testdata/ so that ./... leaves it out.
package main

import (
	"bytes"
	"context"
	"os"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/logbook"
	"alvea/app/logbook/idb"
	"alvea/physio"
)

type heading struct{ app.Compo }

func (*heading) Render() app.UI { return app.H1().Text("Floor") }

func main() {
	if len(os.Args) > 1<<20 {
		engine(os.Args[1], os.Args[2])
	}
	app.Route("/", func() app.Composer { return &heading{} })
	app.RunWhenOnBrowser()
}

// engine uses what the screens use of physio and the logbook.
func engine(doc, pass string) {
	ctx := context.Background()
	d, err := physio.ParsePlan([]byte(doc))
	if err != nil {
		println(err.Error())
		return
	}
	res, _ := physio.ComputePlan(d)
	println(res)
	store, _ := idb.Open(ctx)
	v, err := logbook.Create(ctx, store, pass, logbook.DefaultKDF)
	if err != nil {
		v, _ = logbook.Open(ctx, store)
		_ = v.Unlock(ctx, pass)
	}
	ie, _ := v.Append(ctx, &logbook.Entry{Kind: logbook.KindNote, Note: &logbook.Note{Text: doc}})
	println(ie.Seq)
	l, _ := v.List(ctx)
	println(l)
	t, _ := v.Transport(ctx, logbook.TransportID(doc))
	println(logbook.AuditTransport(t, logbook.AuditOptions{}).Deviations)
	rep, _ := logbook.AuditVault(ctx, v, logbook.AuditOptions{}, logbook.AuditFilter{})
	println(rep)
	p, _ := v.Verify(ctx)
	println(len(p))
	var buf bytes.Buffer
	_ = v.Export(ctx, &buf)
	_, _ = logbook.Import(ctx, store, buf.Bytes(), pass)
}
