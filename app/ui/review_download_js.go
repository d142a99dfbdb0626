package ui

import (
	"syscall/js"
	"time"
)

// reviewDownload offers the CSV export as a file through a Blob URL: the
// rows never appear in a URL (the blob: URL names an object in this page
// only) and the URL is revoked once the browser has taken the bytes.
var reviewDownload = func(name string, data []byte) error {
	u8 := js.Global().Get("Uint8Array").New(len(data))
	js.CopyBytesToJS(u8, data)
	blob := js.Global().Get("Blob").New(js.ValueOf([]any{u8}), map[string]any{"type": "text/csv;charset=utf-8"})
	url := js.Global().Get("URL").Call("createObjectURL", blob)
	doc := js.Global().Get("document")
	a := doc.Call("createElement", "a")
	a.Set("href", url)
	a.Set("download", name)
	a.Set("hidden", true)
	doc.Get("body").Call("append", a)
	a.Call("click")
	a.Call("remove")
	time.AfterFunc(time.Minute, func() { js.Global().Get("URL").Call("revokeObjectURL", url) })
	return nil
}
