package idb

import (
	"context"
	"errors"
	"fmt"
	"sync"
	"syscall/js"

	"alvea/app/logbook"
)

const (
	// sidePrefix + name keys a side slot in the meta store. Side names are
	// a-z, 0-9 and '-' (logbook.CheckSideName), so no slot key can be
	// "header" or "head".
	sidePrefix = "side:"
)

// Store is the IndexedDB implementation of logbook.Store and
// logbook.StorageReporter.
//
// The connection is closed when the page is hidden (pagehide: a full page
// load elsewhere, or the tab closing) and when another page asks for a
// version change; the next operation opens it again. A page kept in the
// browser's back/forward cache with its connection (or its first open,
// which creates the database) still pending would otherwise hold the
// database, and the next page's open would wait behind it.
type Store struct {
	name string

	mu     sync.Mutex
	db     js.Value
	closed bool
}

var (
	_ logbook.Store           = (*Store)(nil)
	_ logbook.StorageReporter = (*Store)(nil)
)

// live is every connection of this page, open or being opened, closed
// together at pagehide.
var live = struct {
	sync.Mutex
	stores  map[*Store]struct{}
	opening map[int]js.Value // connections handed to upgradeneeded, not yet successful
	next    int
	hidden  bool // between pagehide and pageshow
	hook    sync.Once
}{stores: map[*Store]struct{}{}, opening: map[int]js.Value{}}

// hookPageHide installs, once, the pagehide listener that closes every
// connection. It is never released: it lives as long as the page.
func hookPageHide() {
	live.hook.Do(func() {
		win := js.Global()
		if !win.Get("addEventListener").Truthy() {
			return // not a page (a worker, or Node in tests)
		}
		win.Call("addEventListener", "pagehide", js.FuncOf(func(this js.Value, args []js.Value) any {
			live.Lock()
			live.hidden = true
			live.Unlock()
			closeAll()
			return nil
		}))
		win.Call("addEventListener", "pageshow", js.FuncOf(func(this js.Value, args []js.Value) any {
			live.Lock()
			live.hidden = false
			live.Unlock()
			return nil
		}))
	})
}

// closeAll closes every connection of the page. It never blocks.
func closeAll() {
	live.Lock()
	stores := make([]*Store, 0, len(live.stores))
	for s := range live.stores {
		stores = append(stores, s)
	}
	opening := make([]js.Value, 0, len(live.opening))
	for _, db := range live.opening {
		opening = append(opening, db)
	}
	live.Unlock()
	for _, s := range stores {
		s.markClosed()
	}
	for _, db := range opening {
		// Closing during the upgrade lets its transaction finish; the
		// open then fails (AbortError) and holds nothing.
		db.Call("close")
	}
}

// Open opens (creating on first use) the vault database.
func Open(ctx context.Context) (*Store, error) { return OpenNamed(ctx, DBName) }

// OpenNotify is Open, calling onBlocked (from a browser callback: it must
// not block) when the open waits because another page holds the database
// in an older version; the open keeps waiting.
func OpenNotify(ctx context.Context, onBlocked func()) (*Store, error) {
	return openDB(ctx, DBName, onBlocked)
}

// OpenNamed opens a database of another name (browser tests use a fresh
// one each).
func OpenNamed(ctx context.Context, name string) (*Store, error) {
	return openDB(ctx, name, nil)
}

func openDB(ctx context.Context, name string, onBlocked func()) (*Store, error) {
	s := &Store{name: name}
	db, err := connect(ctx, name, onBlocked)
	if err != nil {
		return nil, err
	}
	s.adopt(db)
	live.Lock()
	live.stores[s] = struct{}{}
	hidden := live.hidden
	live.Unlock()
	if hidden {
		s.markClosed() // opened as the page was hidden: reopened when used
	}
	return s, nil
}

// connect opens one connection. 'blocked' is not a failure: the open waits
// until the other connections close (ours close on versionchange), and
// onBlocked is told.
func connect(ctx context.Context, name string, onBlocked func()) (js.Value, error) {
	factory := js.Global().Get("indexedDB")
	if factory.IsUndefined() || factory.IsNull() {
		return js.Undefined(), ErrUnavailable
	}
	hookPageHide()
	// While an open is in flight, an unload listener keeps the page out
	// of the back/forward cache: a page frozen there with its open (the
	// one that creates the database) still pending holds the database,
	// and every later open, in any page, waits behind it.
	noCache := js.FuncOf(func(this js.Value, args []js.Value) any { return nil })
	win := js.Global()
	if win.Get("addEventListener").Truthy() {
		win.Call("addEventListener", "unload", noCache)
	}
	defer func() {
		if win.Get("removeEventListener").Truthy() {
			win.Call("removeEventListener", "unload", noCache)
		}
		noCache.Release()
	}()
	req := factory.Call("open", name, dbVersion)
	live.Lock()
	id := live.next
	live.next++
	live.Unlock()
	upgrade := js.FuncOf(func(this js.Value, args []js.Value) any {
		db := req.Get("result")
		live.Lock()
		live.opening[id] = db
		hidden := live.hidden
		live.Unlock()
		if hidden {
			// The page is going away: create nothing it would hold.
			req.Get("transaction").Call("abort")
			return nil
		}
		names := db.Get("objectStoreNames")
		for _, s := range []string{storeMeta, storeIndex, storeBody} {
			if !names.Call("contains", s).Bool() {
				db.Call("createObjectStore", s)
			}
		}
		return nil
	})
	blocked := js.FuncOf(func(this js.Value, args []js.Value) any {
		if onBlocked != nil {
			onBlocked()
		}
		return nil
	})
	req.Set("onupgradeneeded", upgrade)
	req.Set("onblocked", blocked)
	defer func() {
		live.Lock()
		delete(live.opening, id)
		live.Unlock()
		req.Set("onupgradeneeded", js.Null())
		req.Set("onblocked", js.Null())
		upgrade.Release()
		blocked.Release()
	}()
	if err := await(ctx, req, "success", "error"); err != nil {
		if ctx.Err() != nil {
			// The request may still succeed: close what it opens.
			var late js.Func
			late = js.FuncOf(func(this js.Value, args []js.Value) any {
				req.Get("result").Call("close")
				late.Release()
				return nil
			})
			req.Call("addEventListener", "success", late)
		}
		return js.Undefined(), fmt.Errorf("idb: open %s: %w", name, err)
	}
	return req.Get("result"), nil
}

// adopt takes a new connection, closed again when another page asks for a
// version change.
func (s *Store) adopt(db js.Value) {
	var onChange js.Func
	onChange = js.FuncOf(func(this js.Value, args []js.Value) any {
		s.mu.Lock()
		same := s.db.Equal(db)
		s.mu.Unlock()
		if same {
			s.markClosed()
		} else {
			db.Call("close")
		}
		return nil
	})
	db.Set("onversionchange", onChange)
	db.Set("onclose", onChange) // the browser closed it (storage cleared)
	s.mu.Lock()
	s.db, s.closed = db, false
	s.mu.Unlock()
}

// markClosed closes the connection now; the next operation opens another.
func (s *Store) markClosed() {
	s.mu.Lock()
	db, was := s.db, s.closed
	s.closed = true
	s.mu.Unlock()
	if !was && db.Truthy() {
		db.Call("close")
	}
}

// conn returns an open connection, opening one again after a close. It
// blocks: call it from a goroutine.
func (s *Store) conn(ctx context.Context) (js.Value, error) {
	s.mu.Lock()
	db, closed := s.db, s.closed
	s.mu.Unlock()
	if !closed {
		return db, nil
	}
	db, err := connect(ctx, s.name, nil)
	if err != nil {
		return js.Undefined(), err
	}
	s.adopt(db)
	live.Lock()
	hidden := live.hidden
	live.Unlock()
	if hidden {
		s.markClosed()
	}
	return db, nil
}

// Close closes the database connection for good.
func (s *Store) Close() {
	live.Lock()
	delete(live.stores, s)
	live.Unlock()
	s.markClosed()
}

// await waits, in the calling goroutine, for target's success event or
// one of its failure events. The callbacks only do a non-blocking send on
// a buffered channel, so they never block the browser's event loop. On
// return the handlers are removed before the functions are released.
func await(ctx context.Context, target js.Value, success string, failures ...string) error {
	done := make(chan error, 1)
	finish := func(err error) {
		select {
		case done <- err:
		default:
		}
	}
	events := append([]string{success}, failures...)
	funcs := make([]js.Func, len(events))
	for i, ev := range events {
		ev := ev
		funcs[i] = js.FuncOf(func(this js.Value, args []js.Value) any {
			if ev == success {
				finish(nil)
				return nil
			}
			// A failed request's error event bubbles to its transaction
			// before the transaction records the error: read the error
			// from the event's target (the request), then the target.
			from := target
			if len(args) > 0 && args[0].Truthy() {
				if t := args[0].Get("target"); t.Truthy() && t.Get("error").Truthy() {
					from = t
				}
			}
			finish(domError(from, ev))
			return nil
		})
		target.Set("on"+ev, funcs[i])
	}
	defer func() {
		for i, ev := range events {
			target.Set("on"+ev, js.Null())
			funcs[i].Release()
		}
	}()
	select {
	case err := <-done:
		return err
	case <-ctx.Done():
		return ctx.Err()
	}
}

// domError turns the error of a request or transaction into a Go error,
// mapping the names a caller must tell apart. DOM messages are the
// browser's and carry no record content.
func domError(target js.Value, event string) error {
	e := target.Get("error")
	if e.IsUndefined() || e.IsNull() {
		return fmt.Errorf("idb: %s", event)
	}
	name, msg := e.Get("name").String(), e.Get("message").String()
	switch name {
	case "QuotaExceededError":
		return fmt.Errorf("%w (%s)", logbook.ErrQuota, msg)
	case "ConstraintError":
		return fmt.Errorf("%w (%s)", errConstraint, msg)
	}
	return fmt.Errorf("idb: %s: %s: %s", event, name, msg)
}

var errConstraint = errors.New("idb: key already exists")

func (s *Store) tx(ctx context.Context, mode string, stores ...string) (js.Value, error) {
	db, err := s.conn(ctx)
	if err != nil {
		return js.Undefined(), err
	}
	names := make([]any, len(stores))
	for i, n := range stores {
		names[i] = n
	}
	var tx js.Value
	func() {
		defer func() {
			if r := recover(); r != nil {
				err = fmt.Errorf("idb: transaction: %v", r)
			}
		}()
		tx = db.Call("transaction", js.ValueOf(names), mode)
	}()
	return tx, err
}

func toJS(b []byte) js.Value {
	a := js.Global().Get("Uint8Array").New(len(b))
	js.CopyBytesToJS(a, b)
	return a
}

func toGo(v js.Value) []byte {
	if v.IsUndefined() || v.IsNull() {
		return nil
	}
	b := make([]byte, v.Get("length").Int())
	js.CopyBytesToGo(b, v)
	return b
}

// get runs one get request in a read-only transaction.
func (s *Store) get(ctx context.Context, store string, key any) (js.Value, error) {
	tx, err := s.tx(ctx, "readonly", store)
	if err != nil {
		return js.Undefined(), err
	}
	req := tx.Call("objectStore", store).Call("get", key)
	if err := await(ctx, req, "success", "error"); err != nil {
		return js.Undefined(), err
	}
	return req.Get("result"), nil
}

func (s *Store) Meta(ctx context.Context) ([]byte, []byte, error) {
	tx, err := s.tx(ctx, "readonly", storeMeta)
	if err != nil {
		return nil, nil, err
	}
	os := tx.Call("objectStore", storeMeta)
	hreq, headReq := os.Call("get", keyHeader), os.Call("get", keyHead)
	if err := await(ctx, tx, "complete", "error", "abort"); err != nil {
		return nil, nil, err
	}
	header := hreq.Get("result")
	if header.IsUndefined() || header.IsNull() {
		return nil, nil, logbook.ErrNoVault
	}
	return toGo(header), toGo(headReq.Get("result")), nil
}

func (s *Store) PutHeader(ctx context.Context, header []byte) error {
	tx, err := s.tx(ctx, "readwrite", storeMeta)
	if err != nil {
		return err
	}
	tx.Call("objectStore", storeMeta).Call("put", toJS(header), keyHeader)
	return await(ctx, tx, "complete", "error", "abort")
}

// Append writes the record's index and body with add (never overwrite) and
// the head with put, in one transaction, and returns after its complete
// event.
func (s *Store) Append(ctx context.Context, rec logbook.Sealed, head []byte) error {
	tx, err := s.tx(ctx, "readwrite", storeIndex, storeBody, storeMeta)
	if err != nil {
		return err
	}
	key := float64(rec.Seq) // exact below 2^53
	tx.Call("objectStore", storeIndex).Call("add", toJS(rec.Index), key)
	tx.Call("objectStore", storeBody).Call("add", toJS(rec.Body), key)
	tx.Call("objectStore", storeMeta).Call("put", toJS(head), keyHead)
	err = await(ctx, tx, "complete", "error", "abort")
	if errors.Is(err, errConstraint) {
		return logbook.SeqExistsError(rec.Seq)
	}
	return err
}

// Index reads all sealed indexes with getAllKeys and getAll in one
// read-only transaction (two requests rather than a cursor step per record).
func (s *Store) Index(ctx context.Context) ([]logbook.IndexItem, error) {
	tx, err := s.tx(ctx, "readonly", storeIndex)
	if err != nil {
		return nil, err
	}
	os := tx.Call("objectStore", storeIndex)
	keysReq, valsReq := os.Call("getAllKeys"), os.Call("getAll")
	if err := await(ctx, tx, "complete", "error", "abort"); err != nil {
		return nil, err
	}
	keys, vals := keysReq.Get("result"), valsReq.Get("result")
	n := keys.Get("length").Int()
	if vals.Get("length").Int() != n {
		return nil, errors.New("idb: index keys and values differ in number")
	}
	out := make([]logbook.IndexItem, 0, n)
	for i := 0; i < n; i++ {
		k := keys.Index(i)
		if k.Type() != js.TypeNumber || k.Float() < 1 {
			continue // not a record key; nothing we wrote
		}
		out = append(out, logbook.IndexItem{Seq: uint64(k.Float()), Index: toGo(vals.Index(i))})
	}
	return out, nil // IndexedDB returns keys in ascending order
}

func (s *Store) Body(ctx context.Context, seq uint64) ([]byte, error) {
	v, err := s.get(ctx, storeBody, float64(seq))
	if err != nil {
		return nil, err
	}
	if v.IsUndefined() || v.IsNull() {
		return nil, logbook.NotFoundError(seq)
	}
	return toGo(v), nil
}

func (s *Store) Clear(ctx context.Context) error {
	tx, err := s.tx(ctx, "readwrite", storeIndex, storeBody, storeMeta)
	if err != nil {
		return err
	}
	for _, n := range []string{storeIndex, storeBody, storeMeta} {
		tx.Call("objectStore", n).Call("clear")
	}
	return await(ctx, tx, "complete", "error", "abort")
}

// PutSide writes a side-slot blob with put (it replaces) in its own
// transaction, and returns after its complete event.
func (s *Store) PutSide(ctx context.Context, name string, blob []byte) error {
	if err := logbook.CheckSideName(name); err != nil {
		return err
	}
	tx, err := s.tx(ctx, "readwrite", storeMeta)
	if err != nil {
		return err
	}
	tx.Call("objectStore", storeMeta).Call("put", toJS(blob), sidePrefix+name)
	return await(ctx, tx, "complete", "error", "abort")
}

// GetSide reads a side-slot blob.
func (s *Store) GetSide(ctx context.Context, name string) ([]byte, error) {
	if err := logbook.CheckSideName(name); err != nil {
		return nil, err
	}
	v, err := s.get(ctx, storeMeta, sidePrefix+name)
	if err != nil {
		return nil, err
	}
	if v.IsUndefined() || v.IsNull() {
		return nil, logbook.SideNotFoundError(name)
	}
	return toGo(v), nil
}

// DeleteSide removes a side-slot blob (delete of an absent key succeeds).
func (s *Store) DeleteSide(ctx context.Context, name string) error {
	if err := logbook.CheckSideName(name); err != nil {
		return err
	}
	tx, err := s.tx(ctx, "readwrite", storeMeta)
	if err != nil {
		return err
	}
	tx.Call("objectStore", storeMeta).Call("delete", sidePrefix+name)
	return await(ctx, tx, "complete", "error", "abort")
}

// storageManager returns navigator.storage, or an error if absent.
func storageManager() (js.Value, error) {
	nav := js.Global().Get("navigator")
	if nav.IsUndefined() {
		return js.Undefined(), errors.ErrUnsupported
	}
	sm := nav.Get("storage")
	if sm.IsUndefined() || sm.IsNull() {
		return js.Undefined(), errors.ErrUnsupported
	}
	return sm, nil
}

// promise waits for a Promise (the storage manager has no request API),
// with the same non-blocking callbacks as await.
func promise(ctx context.Context, p js.Value) (js.Value, error) {
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
		msg := "rejected"
		if len(args) > 0 && !args[0].IsUndefined() && !args[0].IsNull() {
			msg = args[0].Call("toString").String()
		}
		select {
		case done <- result{err: errors.New("idb: storage manager: " + msg)}:
		default:
		}
		return nil
	})
	p.Call("then", ok, fail)
	// The promise may settle after a cancelled wait; keep the functions
	// alive until it does, then release them.
	select {
	case r := <-done:
		ok.Release()
		fail.Release()
		return r.v, r.err
	case <-ctx.Done():
		go func() { <-done; ok.Release(); fail.Release() }()
		return js.Undefined(), ctx.Err()
	}
}

// Persist asks for persistent storage (navigator.storage.persist) and
// reports whether it was granted.
func (s *Store) Persist(ctx context.Context) (bool, error) {
	sm, err := storageManager()
	if err != nil {
		return false, err
	}
	if sm.Get("persist").IsUndefined() {
		return false, errors.ErrUnsupported
	}
	v, err := promise(ctx, sm.Call("persist"))
	if err != nil {
		return false, err
	}
	return v.Truthy(), nil
}

// Estimate reports usage and quota (navigator.storage.estimate).
func (s *Store) Estimate(ctx context.Context) (int64, int64, error) {
	sm, err := storageManager()
	if err != nil {
		return 0, 0, err
	}
	if sm.Get("estimate").IsUndefined() {
		return 0, 0, errors.ErrUnsupported
	}
	v, err := promise(ctx, sm.Call("estimate"))
	if err != nil {
		return 0, 0, err
	}
	num := func(name string) int64 {
		x := v.Get(name)
		if x.Type() != js.TypeNumber {
			return 0
		}
		return int64(x.Float())
	}
	return num("usage"), num("quota"), nil
}
