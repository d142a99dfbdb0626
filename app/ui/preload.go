package ui

import (
	"encoding/json"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// A screen's first render comes before its OnMount, the first moment go-app
// hands it a Context. The Brief reads its draft and the settings from
// localStorage here, before that first render, so that it renders once
// with them instead of once with defaults and again when OnMount loads
// them. The two renders usually fall in the same task, but not always: a
// browser test saw the default form drawn first after a reload (an empty
// origin field where the crew had typed one). OnMount still loads them the
// usual way; when they match, nothing is drawn again. The Settings screen
// reads the saved settings before its first render the same way (a
// clean-clone run saw its defaults still on screen after a reload), and so
// do Supply (the settings, its session and the Brief draft's cylinders,
// legs and reserve policy) and Altitude (the settings and the Brief
// draft's route and patient). What lives only in IndexedDB (the vault and
// its transports) cannot be read before a first render and is loaded
// after it as before.

// storageGetter reads a JSON value from a key-value storage: go-app's
// BrowserStorage (ctx.LocalStorage()) and windowStorage both do.
type storageGetter interface {
	Get(k string, v any) error
}

// windowStorage reads window.localStorage as go-app's own BrowserStorage
// does (getItem, then JSON), without a Context. Browser only.
type windowStorage struct{}

func (windowStorage) Get(k string, v any) error {
	item := app.Window().Get("localStorage").Call("getItem", k)
	if item.IsNull() || item.IsUndefined() {
		return nil
	}
	return json.Unmarshal([]byte(item.String()), v)
}

// persistedState is how go-app keeps a persisted state in localStorage
// (go-app v10's storableState; a test holds the two together).
type persistedState struct {
	Value          json.RawMessage `json:",omitempty"`
	EncryptedValue []byte          `json:",omitempty"`
	ExpiresAt      time.Time       `json:",omitempty"`
}

// stateFrom reads the go-app state kept in ls under key into v, as
// ctx.GetState does for a state not yet in memory: v is left as it is when
// none is stored. It is false when the state cannot be read this way (kept
// encrypted, with an expiry go-app would check, or unreadable); v may then
// be partly written.
func stateFrom(ls storageGetter, key string, v any) bool {
	var st persistedState
	if err := ls.Get(key, &st); err != nil || len(st.EncryptedValue) != 0 || !st.ExpiresAt.IsZero() {
		return false
	}
	if len(st.Value) != 0 {
		if err := json.Unmarshal(st.Value, v); err != nil {
			return false
		}
	}
	return true
}

// settingsFrom reads the settings as LoadSettings does, from ls; ok is
// false when they cannot be read this way (kept encrypted, or unreadable).
func settingsFrom(ls storageGetter) (s Settings, ok bool) {
	s = DefaultSettings()
	if !stateFrom(ls, SettingsKey, &s) {
		return DefaultSettings(), false
	}
	s, _ = s.normalized()
	return s.clone(), true
}

// draftPreloader is a DraftStore that can also read its draft without a
// Context.
type draftPreloader interface {
	Preload() (BriefDraft, bool, error)
}

// preload reads the draft and the settings before the Brief's first
// render, in the browser, when its store can. Anything it cannot read
// leaves the defaults, and OnMount's load then renders again as before.
func (s *briefState) preload() {
	if !app.IsClient {
		return
	}
	p, ok := s.store.(draftPreloader)
	if !ok {
		return
	}
	settings, ok := preloadSettings()
	if !ok {
		return
	}
	d, found, err := p.Preload()
	if err != nil {
		return
	}
	s.settings = settings
	if found {
		s.draft = d
	}
}

// preloadSettings reads the saved settings before a first render, in the
// browser only (false elsewhere, or when they cannot be read this way).
func preloadSettings() (Settings, bool) {
	if !app.IsClient {
		return Settings{}, false
	}
	return settingsFrom(windowStorage{})
}
