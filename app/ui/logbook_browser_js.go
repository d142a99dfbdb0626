package ui

import (
	"context"
	"errors"
	"syscall/js"
)

// Browser file handling for the Logbook: reading a chosen bundle file and
// offering the export as a download through a Blob URL (the bytes never
// appear in a URL; the URL names an object in this page only, and is
// revoked after the download starts).

// lbReadFile reads the file chosen in the file input with the element id.
// Call it from a goroutine: it waits for the browser.
var lbReadFile = func(ctx context.Context, id string) ([]byte, error) {
	el := js.Global().Get("document").Call("getElementById", id)
	if !el.Truthy() || el.Get("files").Get("length").Int() == 0 {
		return nil, lbErrNoFile
	}
	file := el.Get("files").Index(0)
	type result struct {
		v   js.Value
		err error
	}
	done := make(chan result, 1)
	ok := js.FuncOf(func(this js.Value, args []js.Value) any {
		select {
		case done <- result{v: args[0]}:
		default:
		}
		return nil
	})
	fail := js.FuncOf(func(this js.Value, args []js.Value) any {
		select {
		case done <- result{err: errors.New("ui: the file could not be read")}:
		default:
		}
		return nil
	})
	file.Call("arrayBuffer").Call("then", ok, fail)
	var r result
	select {
	case r = <-done:
	case <-ctx.Done():
		go func() { <-done; ok.Release(); fail.Release() }()
		return nil, ctx.Err()
	}
	ok.Release()
	fail.Release()
	if r.err != nil {
		return nil, r.err
	}
	u8 := js.Global().Get("Uint8Array").New(r.v)
	b := make([]byte, u8.Get("length").Int())
	js.CopyBytesToGo(b, u8)
	return b, nil
}

// lbFileName returns the name of the file chosen in the input with the id.
func lbFileName(id string) string {
	el := js.Global().Get("document").Call("getElementById", id)
	if !el.Truthy() || el.Get("files").Get("length").Int() == 0 {
		return ""
	}
	return el.Get("files").Index(0).Get("name").String()
}
