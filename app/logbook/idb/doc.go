// Package idb keeps a logbook vault in the browser's IndexedDB, behind the
// logbook.Store interface. It builds only for js/wasm (idb_js.go); this file
// exists so the package is visible to native tools.
//
// Layout: database "alvea-logbook", version 1, three object stores with
// out-of-line keys: "meta" (keys "header", "head", and "side:NAME" for each
// side slot, such as the sealed Brief draft "side:draft"), "index" and
// "body" (key: the record's sequence number). Values are Uint8Array
// ciphertext only; no key or value carries readable patient data.
//
// Every method waits for IndexedDB's request or transaction events (not
// Promises) and must be called from a goroutine, never from inside a
// js.FuncOf callback (in go-app: from Context.Async, not directly from an
// event handler), because it blocks until the browser answers. Append
// returns only after the transaction's complete event: then, and only then,
// is the record saved. QuotaExceededError maps to logbook.ErrQuota, and
// ConstraintError on a record key to logbook.ErrSeqExists.
package idb
