// Command floor is the smallest go-app program: one route showing a single
// heading. make bench builds it with the same flags as Alvea and measures
// both, so Alvea's size and start-up are read against what any go-app
// program pays. It lives under testdata/ so that ./... leaves it out; build
// it by its path (go build ./testdata/floor).
package main

import "github.com/maxence-charriere/go-app/v10/pkg/app"

type heading struct{ app.Compo }

func (*heading) Render() app.UI { return app.H1().Text("Floor") }

func main() {
	app.Route("/", func() app.Composer { return &heading{} })
	app.RunWhenOnBrowser()
	serve() // natively only: the wasm never gets here
}
