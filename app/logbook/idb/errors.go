package idb

import "errors"

// ErrUnavailable: the browser offers no IndexedDB (private mode in some
// browsers, or storage disabled). Declared for every platform so callers
// can test for it in code that also builds natively.
var ErrUnavailable = errors.New("idb: IndexedDB not available")
