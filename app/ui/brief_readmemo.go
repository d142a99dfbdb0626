package ui

import "sync"

// readMemo keeps the readings readEntry gave last. A keystroke changes one
// field, and the Brief reads all of them again (thirty or so) to rebuild
// the plan document; readEntry is a pure function of its arguments, so a
// reading of the same text under the same spec and unit is reused as it
// is. The memo is bounded: it is emptied when full.
var readMemo struct {
	sync.Mutex
	m map[readKey]reading
}

type readKey struct {
	spec     fieldSpec
	e        Entry
	disp     string
	required bool
}

// readMemoMax bounds the memo: a few screens' worth of fields and the
// values typed into them since it was last emptied.
const readMemoMax = 512

// readEntryMemo is readEntry, from the memo when it holds the answer.
func readEntryMemo(spec fieldSpec, e Entry, disp string, required bool) reading {
	k := readKey{spec, e, disp, required}
	readMemo.Lock()
	r, ok := readMemo.m[k]
	readMemo.Unlock()
	if ok {
		return r
	}
	r = readEntry(spec, e, disp, required)
	readMemo.Lock()
	if readMemo.m == nil || len(readMemo.m) >= readMemoMax {
		readMemo.m = make(map[readKey]reading, 64)
	}
	readMemo.m[k] = r
	readMemo.Unlock()
	return r
}
