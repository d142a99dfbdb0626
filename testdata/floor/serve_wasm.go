//go:build wasm

package main

// serve is never reached in the browser (app.RunWhenOnBrowser blocks).
func serve() {}
