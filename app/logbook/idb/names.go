package idb

import "errors"

// Declared for every platform, so that code which also builds natively
// (the UI's messages, the browser tests) can name them.

// DBName is the IndexedDB database the vault lives in.
const DBName = "alvea-logbook"

// The database's version, object stores and meta keys (see the package
// comment).
const (
	dbVersion  = 1
	storeMeta  = "meta"
	storeIndex = "index"
	storeBody  = "body"
	keyHeader  = "header"
	keyHead    = "head"
)

// ErrUnavailable: the browser offers no IndexedDB (private mode in some
// browsers, or storage disabled).
var ErrUnavailable = errors.New("idb: IndexedDB not available")
