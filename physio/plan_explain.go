package physio

import (
	"bytes"
	"encoding/json"
	"slices"
	"strings"
)

// Explanation is the Explain of a plan object: a Figure for each of its
// numbers, by the number's JSON key. In JSON it is an object with its keys
// in byte order, as a map of the same figures would be; a zero
// Explanation is null and an empty one {}.
//
// It is a short list rather than a map: a plan holds a few dozen of them
// with up to a dozen figures each, and the Brief computes a plan on every
// keystroke; in wasm, maps were two thirds of the bytes a plan allocated.
// Copies share their figures, as copies of a map do.
type Explanation struct{ list *explainList }

type explainList struct{ figs []keyedFigure }

type keyedFigure struct {
	key string
	fig Figure
}

// Get returns the figure for key and whether there is one.
func (e Explanation) Get(key string) (Figure, bool) {
	if e.list != nil {
		for i := range e.list.figs {
			if e.list.figs[i].key == key {
				return e.list.figs[i].fig, true
			}
		}
	}
	return Figure{}, false
}

// Len is the number of figures.
func (e Explanation) Len() int {
	if e.list == nil {
		return 0
	}
	return len(e.list.figs)
}

// Keys returns the keys in byte order.
func (e Explanation) Keys() []string {
	keys := make([]string, 0, e.Len())
	if e.list != nil {
		for _, f := range e.list.figs {
			keys = append(keys, f.key)
		}
	}
	slices.Sort(keys)
	return keys
}

// set gives key the figure f, replacing the one it had. e must have been
// made (newExplanation).
func (e Explanation) set(key string, f Figure) {
	for i := range e.list.figs {
		if e.list.figs[i].key == key {
			e.list.figs[i].fig = f
			return
		}
	}
	e.list.figs = append(e.list.figs, keyedFigure{key, f})
}

// explainArena hands out the Explanations of one plan from two arrays
// made at once. Each gets room for n figures, capped there: a figure past
// n moves that Explanation to an array of its own, never into the next
// one's room.
type explainArena struct {
	lists []explainList
	figs  []keyedFigure
}

func newExplainArena(explanations, figures int) explainArena {
	return explainArena{lists: make([]explainList, 0, explanations), figs: make([]keyedFigure, 0, figures)}
}

// newExplanation returns an empty Explanation with room for n figures.
func (a *explainArena) newExplanation(n int) Explanation {
	if len(a.lists) == cap(a.lists) {
		a.lists = make([]explainList, 0, max(8, cap(a.lists)))
	}
	if cap(a.figs)-len(a.figs) < n {
		a.figs = make([]keyedFigure, 0, max(n, cap(a.figs)))
	}
	start := len(a.figs)
	a.figs = a.figs[:start+n]
	a.lists = append(a.lists, explainList{figs: a.figs[start : start : start+n]})
	return Explanation{list: &a.lists[len(a.lists)-1]}
}

// MarshalJSON writes the figures as an object, keys in byte order (what
// encoding/json does for a map). Strings are written unescaped for HTML
// here: the encoder calling this escapes them, or not, as it does for
// everything else.
func (e Explanation) MarshalJSON() ([]byte, error) {
	if e.list == nil {
		return []byte("null"), nil
	}
	order := make([]int, len(e.list.figs))
	for i := range order {
		order[i] = i
	}
	slices.SortFunc(order, func(a, b int) int { return strings.Compare(e.list.figs[a].key, e.list.figs[b].key) })
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false)
	buf.WriteByte('{')
	for n, i := range order {
		if n > 0 {
			buf.WriteByte(',')
		}
		if err := enc.Encode(e.list.figs[i].key); err != nil {
			return nil, err
		}
		buf.Truncate(buf.Len() - 1) // the encoder's newline
		buf.WriteByte(':')
		if err := enc.Encode(e.list.figs[i].fig); err != nil {
			return nil, err
		}
		buf.Truncate(buf.Len() - 1)
	}
	buf.WriteByte('}')
	return buf.Bytes(), nil
}

// UnmarshalJSON reads an object of figures (or null).
func (e *Explanation) UnmarshalJSON(b []byte) error {
	var m map[string]Figure
	if err := json.Unmarshal(b, &m); err != nil {
		return err
	}
	if m == nil {
		*e = Explanation{}
		return nil
	}
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	l := &explainList{figs: make([]keyedFigure, 0, len(keys))}
	for _, k := range keys {
		l.figs = append(l.figs, keyedFigure{k, m[k]})
	}
	*e = Explanation{list: l}
	return nil
}
