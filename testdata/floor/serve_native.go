//go:build !wasm

package main

import (
	"flag"
	"fmt"
	"log"
	"net"
	"net/http"
	"os"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"alvea/app/server"
)

// serve serves the floor the way Alvea is served (app.wasm negotiated by
// Accept-Encoding, local icons so go-app's own service worker can
// precache) on -addr, for root/web/app.wasm. It prints the address.
func serve() {
	addr := flag.String("addr", "127.0.0.1:0", "address to listen on")
	root := flag.String("root", ".", "directory holding web/ (app.wasm and the icons)")
	flag.Parse()
	res, err := server.NewResources(*root)
	if err != nil {
		log.Fatal(err)
	}
	version, err := server.Version(*root)
	if err != nil {
		log.Fatal(err)
	}
	h := &app.Handler{
		Name:  "Floor",
		Title: "Floor",
		Icon: app.Icon{
			Default:  "/web/icon-192.png",
			Large:    "/web/icon-512.png",
			Maskable: "/web/icon-maskable-512.png",
		},
		Resources:         res,
		WasmContentLength: res.WasmContentLength(),
		Version:           version,
	}
	ln, err := net.Listen("tcp", *addr)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Fprintf(os.Stdout, "floor %s serving on http://%s\n", version, ln.Addr())
	log.Fatal(http.Serve(ln, h))
}
