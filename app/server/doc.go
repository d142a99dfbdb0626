// Package server is the native side of Alvea's web app: the go-app handler
// configured for offline use (Alvea's own service worker, local icons, a
// content-hash version), the development server, and the static site writer.
//
// app.wasm is sent compressed (brotli or gzip, negotiated by
// Accept-Encoding; see Resources). The compressed copies are made here,
// natively, once per content and kept in CacheDir; the static site carries
// them as web/app.wasm.br and web/app.wasm.gz with a note for hosts
// (HOSTING.txt).
//
// It is imported only by the native build of the command (files built with
// !wasm), so none of it is compiled into app.wasm.
package server
