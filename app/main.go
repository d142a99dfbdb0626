// Command alvea is the Alvea app: in the browser (js/wasm) it runs the
// tablet screens; natively it serves the app, writes the static site, and
// runs plans and audits from a terminal.
//
// The native side lives in files built with !wasm (main_native.go), so the
// server, the static writer and the command-line tools are not compiled
// into app.wasm.
package main

import (
	"os"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/ui"
)

func main() {
	ui.Mark("alvea:main")
	ui.Register()
	// In the browser this runs the app and never returns; natively it
	// returns at once.
	app.RunWhenOnBrowser()
	os.Exit(runNative(os.Args[1:]))
}
