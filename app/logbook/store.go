package logbook

import (
	"context"
	"errors"
	"slices"
	"strconv"
	"sync"
)

// Sealed is one record as a store holds it: its sequence number (the only
// key, carrying nothing about the patient) and two sealed blobs. Index is
// small (what a list needs); Body holds the whole entry.
type Sealed struct {
	Seq   uint64
	Index []byte
	Body  []byte
}

// IndexItem is a record's sealed index without its body.
type IndexItem struct {
	Seq   uint64
	Index []byte
}

// Store keeps a vault's sealed bytes. It sees only ciphertext and sequence
// numbers. Implementations: NewMemStore (tests, bundles), OpenFileStore
// (desktop), and the IndexedDB adapter in package idb (browser).
//
// Every method may block on I/O and must honour ctx cancellation where the
// medium allows. Returned slices belong to the caller.
type Store interface {
	// Meta returns the vault header and the sealed head. It returns
	// ErrNoVault when the store holds no header. head is nil before the first
	// record.
	Meta(ctx context.Context) (header, head []byte, err error)
	// PutHeader writes the header atomically: at creation, and when the
	// passphrase changes (the data key is re-wrapped).
	PutHeader(ctx context.Context, header []byte) error
	// Append durably writes one record and the new head, all or nothing,
	// and returns only once both are on stable storage. It returns
	// ErrSeqExists (wrapped) if rec.Seq is already stored, and ErrQuota
	// (wrapped) when the medium is full.
	Append(ctx context.Context, rec Sealed, head []byte) error
	// Index returns every record's sealed index in ascending Seq order,
	// without bodies.
	Index(ctx context.Context) ([]IndexItem, error)
	// Body returns the sealed body of record seq, or ErrNotFound (wrapped).
	Body(ctx context.Context, seq uint64) ([]byte, error)
	// Clear removes the vault entirely, side slots included. The vault
	// calls it only to roll back an import that failed part-way.
	Clear(ctx context.Context) error

	// Side slots: a few named blobs kept beside the records, outside the
	// chain, each overwritten as a whole (the vault keeps its sealed Brief
	// draft in one, see Vault.SaveDraft). Names are short ASCII
	// (CheckSideName); blobs are ciphertext like everything else.

	// PutSide durably writes blob under name, replacing what was there, all
	// or nothing. ErrQuota (wrapped) when the medium is full.
	PutSide(ctx context.Context, name string, blob []byte) error
	// GetSide returns the blob under name, or ErrNotFound (wrapped).
	GetSide(ctx context.Context, name string) ([]byte, error)
	// DeleteSide removes the blob under name; an absent one is no error.
	DeleteSide(ctx context.Context, name string) error
}

// MaxSideName is the longest side-slot name, in bytes.
const MaxSideName = 32

// CheckSideName reports whether name can name a side slot: 1 to
// MaxSideName characters from a-z, 0-9 and '-'. Stores call it so that a
// slot name can never collide with a record or header key.
func CheckSideName(name string) error {
	if name == "" || len(name) > MaxSideName {
		return &FieldError{Field: "side slot name", Value: strconv.Quote(name), Allowed: "1 to 32 characters a-z, 0-9, -"}
	}
	for _, c := range []byte(name) {
		if !(c >= 'a' && c <= 'z' || c >= '0' && c <= '9' || c == '-') {
			return &FieldError{Field: "side slot name", Value: strconv.Quote(name), Allowed: "1 to 32 characters a-z, 0-9, -"}
		}
	}
	return nil
}

// StorageReporter is implemented by stores that can report on the medium
// (the IndexedDB adapter: navigator.storage.persist and estimate).
type StorageReporter interface {
	// Persist asks for storage the browser will not evict under pressure,
	// and reports whether it is granted.
	Persist(ctx context.Context) (granted bool, err error)
	// Estimate reports bytes used and the quota, as the medium states them.
	Estimate(ctx context.Context) (usage, quota int64, err error)
}

// StorageStatus is what the Logbook screen shows about the medium.
type StorageStatus struct {
	Known      bool  // false when the store cannot report (memory, file)
	Persistent bool  // the browser granted persistent storage
	Usage      int64 // bytes used, as the browser estimates it
	Quota      int64 // bytes allowed, as the browser estimates it
}

// Storage asks the store for persistence (when it can) and reports usage.
// Stores or browsers that cannot report (errors.ErrUnsupported) give a
// StorageStatus with Known false and no error.
func Storage(ctx context.Context, s Store) (StorageStatus, error) {
	r, ok := s.(StorageReporter)
	if !ok {
		return StorageStatus{}, nil
	}
	granted, err := r.Persist(ctx)
	if errors.Is(err, errors.ErrUnsupported) {
		return StorageStatus{}, nil
	} else if err != nil {
		return StorageStatus{}, err
	}
	usage, quota, err := r.Estimate(ctx)
	if errors.Is(err, errors.ErrUnsupported) {
		return StorageStatus{Persistent: granted}, nil
	} else if err != nil {
		return StorageStatus{}, err
	}
	return StorageStatus{Known: true, Persistent: granted, Usage: usage, Quota: quota}, nil
}

// memStore keeps everything in memory. Safe for concurrent use.
type memStore struct {
	mu      sync.Mutex
	header  []byte
	head    []byte
	records map[uint64]Sealed
	side    map[string][]byte
}

var _ Store = (*memStore)(nil)

// NewMemStore returns an empty in-memory store (tests, bundles opened for
// audit, and the CLI).
func NewMemStore() Store { return &memStore{records: map[uint64]Sealed{}, side: map[string][]byte{}} }

func (m *memStore) Meta(ctx context.Context) ([]byte, []byte, error) {
	m.mu.Lock()
	defer m.mu.Unlock()
	if m.header == nil {
		return nil, nil, ErrNoVault
	}
	return slices.Clone(m.header), slices.Clone(m.head), nil
}

func (m *memStore) PutHeader(ctx context.Context, header []byte) error {
	m.mu.Lock()
	defer m.mu.Unlock()
	m.header = slices.Clone(header)
	return nil
}

func (m *memStore) Append(ctx context.Context, rec Sealed, head []byte) error {
	if err := ctx.Err(); err != nil {
		return err
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	if _, ok := m.records[rec.Seq]; ok {
		return &seqExistsError{rec.Seq}
	}
	m.records[rec.Seq] = Sealed{Seq: rec.Seq, Index: slices.Clone(rec.Index), Body: slices.Clone(rec.Body)}
	m.head = slices.Clone(head)
	return nil
}

func (m *memStore) Index(ctx context.Context) ([]IndexItem, error) {
	m.mu.Lock()
	defer m.mu.Unlock()
	out := make([]IndexItem, 0, len(m.records))
	for _, r := range m.records {
		out = append(out, IndexItem{Seq: r.Seq, Index: slices.Clone(r.Index)})
	}
	slices.SortFunc(out, func(a, b IndexItem) int { return cmpU64(a.Seq, b.Seq) })
	return out, nil
}

func (m *memStore) Body(ctx context.Context, seq uint64) ([]byte, error) {
	m.mu.Lock()
	defer m.mu.Unlock()
	r, ok := m.records[seq]
	if !ok {
		return nil, &notFoundError{seq}
	}
	return slices.Clone(r.Body), nil
}

func (m *memStore) Clear(ctx context.Context) error {
	m.mu.Lock()
	defer m.mu.Unlock()
	m.header, m.head, m.records, m.side = nil, nil, map[uint64]Sealed{}, map[string][]byte{}
	return nil
}

func (m *memStore) PutSide(ctx context.Context, name string, blob []byte) error {
	if err := CheckSideName(name); err != nil {
		return err
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	if m.side == nil {
		m.side = map[string][]byte{}
	}
	m.side[name] = slices.Clone(blob)
	return nil
}

func (m *memStore) GetSide(ctx context.Context, name string) ([]byte, error) {
	if err := CheckSideName(name); err != nil {
		return nil, err
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	b, ok := m.side[name]
	if !ok {
		return nil, SideNotFoundError(name)
	}
	return slices.Clone(b), nil
}

func (m *memStore) DeleteSide(ctx context.Context, name string) error {
	if err := CheckSideName(name); err != nil {
		return err
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	delete(m.side, name)
	return nil
}

// tamper gives tests direct access to the stored bytes.
func (m *memStore) tamper(f func(header, head *[]byte, records map[uint64]Sealed)) {
	m.mu.Lock()
	defer m.mu.Unlock()
	f(&m.header, &m.head, m.records)
}

func cmpU64(a, b uint64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}

type seqExistsError struct{ seq uint64 }

func (e *seqExistsError) Error() string {
	return "logbook: record " + RecordName(e.seq) + " already stored"
}
func (e *seqExistsError) Unwrap() error { return ErrSeqExists }

type notFoundError struct{ seq uint64 }

func (e *notFoundError) Error() string { return "logbook: record " + RecordName(e.seq) + " not found" }
func (e *notFoundError) Unwrap() error { return ErrNotFound }

type sideNotFoundError struct{ name string }

func (e *sideNotFoundError) Error() string { return "logbook: side slot " + e.name + " is empty" }
func (e *sideNotFoundError) Unwrap() error { return ErrNotFound }

// SideNotFoundError returns the error a Store gives for an empty side slot
// (it unwraps to ErrNotFound).
func SideNotFoundError(name string) error { return &sideNotFoundError{name} }

// SeqExistsError and NotFoundError let other Store implementations (package
// idb) return the same wrapped errors.
func SeqExistsError(seq uint64) error { return &seqExistsError{seq} }

// NotFoundError returns the error a Store gives for a missing record.
func NotFoundError(seq uint64) error { return &notFoundError{seq} }
