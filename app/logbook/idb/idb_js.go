package idb

import (
	"context"
	"errors"
	"fmt"
	"syscall/js"

	"alvea/app/logbook"
)

const (
	dbVersion  = 1
	storeMeta  = "meta"
	storeIndex = "index"
	storeBody  = "body"
	keyHeader  = "header"
	keyHead    = "head"
	// sidePrefix + name keys a side slot in the meta store. Side names are
	// a-z, 0-9 and '-' (logbook.CheckSideName), so no slot key can be
	// "header" or "head".
	sidePrefix = "side:"
)

// Store is the IndexedDB implementation of logbook.Store and
// logbook.StorageReporter.
type Store struct {
	db js.Value
}

var (
	_ logbook.Store           = (*Store)(nil)
	_ logbook.StorageReporter = (*Store)(nil)
)

// Open opens (creating on first use) the vault database.
func Open(ctx context.Context) (*Store, error) { return OpenNamed(ctx, DBName) }

// OpenNamed opens a database of another name (browser tests use a fresh
// one each).
func OpenNamed(ctx context.Context, name string) (*Store, error) {
	factory := js.Global().Get("indexedDB")
	if factory.IsUndefined() || factory.IsNull() {
		return nil, ErrUnavailable
	}
	req := factory.Call("open", name, dbVersion)
	upgrade := js.FuncOf(func(this js.Value, args []js.Value) any {
		db := req.Get("result")
		names := db.Get("objectStoreNames")
		for _, s := range []string{storeMeta, storeIndex, storeBody} {
			if !names.Call("contains", s).Bool() {
				db.Call("createObjectStore", s)
			}
		}
		return nil
	})
	req.Set("onupgradeneeded", upgrade)
	defer func() {
		req.Set("onupgradeneeded", js.Null())
		upgrade.Release()
	}()
	if err := await(ctx, req, "success", "error", "blocked"); err != nil {
		return nil, fmt.Errorf("idb: open %s: %w", name, err)
	}
	return &Store{db: req.Get("result")}, nil
}

// Close closes the database connection.
func (s *Store) Close() { s.db.Call("close") }

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

func (s *Store) tx(mode string, stores ...string) (js.Value, error) {
	names := make([]any, len(stores))
	for i, n := range stores {
		names[i] = n
	}
	var tx js.Value
	var err error
	func() {
		defer func() {
			if r := recover(); r != nil {
				err = fmt.Errorf("idb: transaction: %v", r)
			}
		}()
		tx = s.db.Call("transaction", js.ValueOf(names), mode)
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
	tx, err := s.tx("readonly", store)
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
	tx, err := s.tx("readonly", storeMeta)
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
	tx, err := s.tx("readwrite", storeMeta)
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
	tx, err := s.tx("readwrite", storeIndex, storeBody, storeMeta)
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
	tx, err := s.tx("readonly", storeIndex)
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
	tx, err := s.tx("readwrite", storeIndex, storeBody, storeMeta)
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
	tx, err := s.tx("readwrite", storeMeta)
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
	tx, err := s.tx("readwrite", storeMeta)
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
