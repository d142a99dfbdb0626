// Command alvea is the Alvea app: in the browser (js/wasm) it runs the
// tablet screens; natively it serves the app, writes the static site, and
// runs plans and audits from a terminal.
package main

import (
	"fmt"
	"net/http"
	"os"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

type shell struct{ app.Compo }

func (s *shell) Render() app.UI {
	return app.Main().Body(
		app.H1().Text("Alvea"),
		app.P().Text("Planning aid. Verify against the gauges and the device's own figures; follow local protocol and medical direction."),
	)
}

func main() {
	app.Route("/", func() app.Composer { return &shell{} })
	app.RunWhenOnBrowser()

	h := &app.Handler{Name: "Alvea", Title: "Alvea"}
	http.Handle("/", h)
	fmt.Println("serving on http://127.0.0.1:8000")
	if err := http.ListenAndServe("127.0.0.1:8000", nil); err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
}
