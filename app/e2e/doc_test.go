//go:build !wasm

// Package e2e drives the whole app in headless Chromium (chromedp): the
// native server (or the static site) on 127.0.0.1, the real app.wasm, the
// real service worker. The helpers in harness_test.go are shared by every
// screen's browser test.
package e2e
