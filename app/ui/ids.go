package ui

import (
	"strconv"
	"sync"
)

// indexedID returns prefix+i+suffix, the id of the i-th element of a list
// on screen ("b-warn3", "b-r-leg1-fio2"), or of a path in the plan
// document ("legs[1].minutes"). The Brief reads and writes out a
// few hundred of these on every keystroke, always the same ones, so each is
// made once and kept (the number of distinct ids is bounded by the form:
// its legs, cylinders and warnings).
func indexedID(prefix string, i int, suffix string) string {
	return indexedID2(prefix, i, "", suffix)
}

// indexedID2 returns prefix+i+sep+suffix, made once as indexedID.
func indexedID2(prefix string, i int, sep, suffix string) string {
	k := idKey{prefix, i, sep, suffix}
	ids.Lock()
	defer ids.Unlock()
	if id, ok := ids.m[k]; ok {
		return id
	}
	id := prefix + strconv.Itoa(i) + sep + suffix
	if ids.m == nil {
		ids.m = map[idKey]string{}
	}
	ids.m[k] = id
	return id
}

type idKey struct {
	prefix   string
	i        int
	sep, end string
}

var ids struct {
	sync.Mutex
	m map[idKey]string
}
