// Package server is the native side of Alvea's web app: the go-app handler
// configured for offline use (Alvea's own service worker, local icons, a
// content-hash version), the development server, and the static site writer.
//
// It is imported only by the native build of the command (files built with
// !wasm), so none of it is compiled into app.wasm.
package server
