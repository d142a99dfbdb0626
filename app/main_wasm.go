//go:build wasm

package main

// runNative is never reached in the browser (app.RunWhenOnBrowser blocks).
func runNative(args []string) int { return 0 }
