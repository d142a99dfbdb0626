package ui

import (
	"syscall/js"
	"time"
)

// offerDownload offers data as a file named name through a Blob URL: the
// bytes never appear in a URL (a blob: URL names an object in this page
// only), and the URL is revoked once the browser has taken them.
func offerDownload(name, mediaType string, data []byte) error {
	u8 := js.Global().Get("Uint8Array").New(len(data))
	js.CopyBytesToJS(u8, data)
	blob := js.Global().Get("Blob").New(js.ValueOf([]any{u8}), map[string]any{"type": mediaType})
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
