package logbook

import (
	"bytes"
	"context"
	"encoding/binary"
	"errors"
	"fmt"
	"hash/crc32"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"sync"
	"syscall"
)

// File store: one append-only log file, format version 1 (our own):
//
//	magic  10 bytes "alvea-log\n", version 1 byte
//	frame  u32 payload length (big-endian) | payload | u32 CRC-32C of payload
//	payload 'H' header bytes                          (header written)
//	        'R' seq u64, index, body, head (uvarint-length bytes each)
//	        'S' side-slot name, blob (uvarint-length bytes each; replaces)
//	        'D' side-slot name (uvarint-length bytes; the slot is emptied)
//
// Every write appends one frame and fsyncs before returning, so a record
// and its head are written together or not at all. At open, a final frame
// that runs past the end of the file or fails its CRC is a torn write (the
// power went mid-append; its Append never returned): it is ignored and cut
// off before the next write. A bad frame followed by good ones is skipped,
// and the vault then names its record as missing. Nothing is rewritten in
// place; the last 'H' frame is the header.
//
// A store whose whole tail is cut at a frame boundary looks like an older
// store: a rollback to an earlier complete state cannot be detected from the
// store alone (the same holds for any medium). Exported bundles carry the
// head, so an auditor comparing bundles sees it.
const (
	fileMagic    = "alvea-log\n"
	fileVersion  = 1
	maxFrameSize = maxHeaderSize + maxIndexSize + maxBodySize + headSize + 64
)

var castagnoli = crc32.MakeTable(crc32.Castagnoli)

// FileStore is a Store in one append-only file, for the desktop and the
// CLI. Safe for concurrent use within one process; do not open the same file
// from two processes.
type FileStore struct {
	mu      sync.Mutex
	f       *os.File
	end     int64 // offset after the last frame kept; the torn tail starts here
	header  []byte
	head    []byte
	records map[uint64]Sealed
	side    map[string][]byte
	skipped int // damaged frames skipped in the middle
}

var _ Store = (*FileStore)(nil)

// OpenFileStore opens (or creates) the log file at path and reads it.
func OpenFileStore(path string) (*FileStore, error) {
	f, err := os.OpenFile(path, os.O_RDWR|os.O_CREATE, 0o600)
	if err != nil {
		return nil, err
	}
	s := &FileStore{f: f, records: map[uint64]Sealed{}, side: map[string][]byte{}}
	data, err := os.ReadFile(path)
	if err != nil {
		f.Close()
		return nil, err
	}
	if len(data) == 0 {
		if err := s.writeAt(0, fileHeader()); err != nil {
			f.Close()
			return nil, err
		}
		syncDir(filepath.Dir(path))
		s.end = int64(len(fileHeader()))
		return s, nil
	}
	if err := s.scan(data); err != nil {
		f.Close()
		return nil, err
	}
	return s, nil
}

func fileHeader() []byte { return append([]byte(fileMagic), fileVersion) }

// scan reads every frame it can. Only a damaged file head is an error.
func (s *FileStore) scan(data []byte) error {
	fh := fileHeader()
	if len(data) < len(fh) {
		if bytes.HasPrefix(fh, data) { // torn at creation
			s.end = 0
			return nil
		}
		return fmt.Errorf("%w: not an alvea log file", ErrDamaged)
	}
	if !bytes.Equal(data[:len(fh)], fh) {
		return fmt.Errorf("%w: not an alvea log file, or an unsupported version", ErrDamaged)
	}
	off := len(fh)
	s.end = int64(off)
	for off < len(data) {
		if len(data)-off < 8 {
			break // torn
		}
		n := int(binary.BigEndian.Uint32(data[off:]))
		if n > maxFrameSize || n > len(data)-off-8 {
			break // torn: the frame runs past the end
		}
		payload := data[off+4 : off+4+n]
		sum := binary.BigEndian.Uint32(data[off+4+n:])
		next := off + 8 + n
		if crc32.Checksum(payload, castagnoli) != sum || !s.apply(payload) {
			if next == len(data) {
				break // torn final frame
			}
			s.skipped++
		}
		off = next
		s.end = int64(off)
	}
	return nil
}

// apply records one frame's payload; false if it is malformed.
func (s *FileStore) apply(p []byte) bool {
	if len(p) == 0 {
		return false
	}
	r := &reader{b: p[1:]}
	switch p[0] {
	case 'H':
		s.header = slices.Clone(p[1:])
		return true
	case 'R':
		seq := r.u64()
		idx := r.bytes(maxIndexSize)
		body := r.bytes(maxBodySize)
		head := r.bytes(headSize)
		if r.done() != nil {
			return false
		}
		s.records[seq] = Sealed{Seq: seq, Index: slices.Clone(idx), Body: slices.Clone(body)}
		s.head = slices.Clone(head)
		return true
	case 'S', 'D':
		name := string(r.bytes(MaxSideName))
		var blob []byte
		if p[0] == 'S' {
			blob = r.bytes(maxSideSize)
		}
		if r.done() != nil || CheckSideName(name) != nil {
			return false
		}
		if s.side == nil {
			s.side = map[string][]byte{}
		}
		if p[0] == 'S' {
			s.side[name] = slices.Clone(blob)
		} else {
			delete(s.side, name)
		}
		return true
	}
	return false
}

// Skipped reports how many damaged frames in the middle of the file were
// skipped at open (their records show as missing in the vault's report).
func (s *FileStore) Skipped() int {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.skipped
}

// Close closes the file.
func (s *FileStore) Close() error {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.f.Close()
}

func frame(payload []byte) []byte {
	b := make([]byte, 0, len(payload)+8)
	b = binary.BigEndian.AppendUint32(b, uint32(len(payload)))
	b = append(b, payload...)
	return binary.BigEndian.AppendUint32(b, crc32.Checksum(payload, castagnoli))
}

// writeAt cuts any torn tail, writes b at off and fsyncs.
func (s *FileStore) writeAt(off int64, b []byte) error {
	if err := s.f.Truncate(off); err != nil {
		return mapDiskErr(err)
	}
	if _, err := s.f.WriteAt(b, off); err != nil {
		s.f.Truncate(off)
		return mapDiskErr(err)
	}
	if err := s.f.Sync(); err != nil {
		return mapDiskErr(err)
	}
	return nil
}

func (s *FileStore) appendFrame(payload []byte) error {
	fr := frame(payload)
	if s.end == 0 {
		fr = append(fileHeader(), fr...)
	}
	if err := s.writeAt(s.end, fr); err != nil {
		return err
	}
	s.end += int64(len(fr))
	return nil
}

func mapDiskErr(err error) error {
	if errors.Is(err, syscall.ENOSPC) || errors.Is(err, syscall.EDQUOT) {
		return fmt.Errorf("%w: %v", ErrQuota, err)
	}
	return err
}

func syncDir(dir string) {
	if d, err := os.Open(dir); err == nil {
		d.Sync()
		d.Close()
	}
}

func (s *FileStore) Meta(ctx context.Context) ([]byte, []byte, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.header == nil {
		return nil, nil, ErrNoVault
	}
	return slices.Clone(s.header), slices.Clone(s.head), nil
}

func (s *FileStore) PutHeader(ctx context.Context, header []byte) error {
	s.mu.Lock()
	defer s.mu.Unlock()
	if err := s.appendFrame(append([]byte{'H'}, header...)); err != nil {
		return err
	}
	s.header = slices.Clone(header)
	return nil
}

func (s *FileStore) Append(ctx context.Context, rec Sealed, head []byte) error {
	if err := ctx.Err(); err != nil {
		return err
	}
	s.mu.Lock()
	defer s.mu.Unlock()
	if _, ok := s.records[rec.Seq]; ok {
		return SeqExistsError(rec.Seq)
	}
	p := []byte{'R'}
	p = putU64(p, rec.Seq)
	p = putBytes(p, rec.Index)
	p = putBytes(p, rec.Body)
	p = putBytes(p, head)
	if err := s.appendFrame(p); err != nil {
		return err
	}
	s.records[rec.Seq] = Sealed{Seq: rec.Seq, Index: slices.Clone(rec.Index), Body: slices.Clone(rec.Body)}
	s.head = slices.Clone(head)
	return nil
}

func (s *FileStore) Index(ctx context.Context) ([]IndexItem, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	out := make([]IndexItem, 0, len(s.records))
	for _, r := range s.records {
		out = append(out, IndexItem{Seq: r.Seq, Index: slices.Clone(r.Index)})
	}
	slices.SortFunc(out, func(a, b IndexItem) int { return cmpU64(a.Seq, b.Seq) })
	return out, nil
}

func (s *FileStore) Body(ctx context.Context, seq uint64) ([]byte, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	r, ok := s.records[seq]
	if !ok {
		return nil, NotFoundError(seq)
	}
	return slices.Clone(r.Body), nil
}

func (s *FileStore) Clear(ctx context.Context) error {
	s.mu.Lock()
	defer s.mu.Unlock()
	fh := fileHeader()
	if err := s.writeAt(0, fh); err != nil {
		return err
	}
	s.end = int64(len(fh))
	s.header, s.head, s.records, s.side, s.skipped = nil, nil, map[uint64]Sealed{}, map[string][]byte{}, 0
	return nil
}

func (s *FileStore) PutSide(ctx context.Context, name string, blob []byte) error {
	if err := CheckSideName(name); err != nil {
		return err
	}
	if len(blob) > maxSideSize {
		return &FieldError{Field: "side slot " + name, Value: strconv.Itoa(len(blob)) + " bytes", Allowed: "at most " + strconv.Itoa(maxSideSize) + " bytes"}
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	s.mu.Lock()
	defer s.mu.Unlock()
	p := putBytes([]byte{'S'}, []byte(name))
	p = putBytes(p, blob)
	if err := s.appendFrame(p); err != nil {
		return err
	}
	s.side[name] = slices.Clone(blob)
	return nil
}

func (s *FileStore) GetSide(ctx context.Context, name string) ([]byte, error) {
	if err := CheckSideName(name); err != nil {
		return nil, err
	}
	s.mu.Lock()
	defer s.mu.Unlock()
	b, ok := s.side[name]
	if !ok {
		return nil, SideNotFoundError(name)
	}
	return slices.Clone(b), nil
}

func (s *FileStore) DeleteSide(ctx context.Context, name string) error {
	if err := CheckSideName(name); err != nil {
		return err
	}
	s.mu.Lock()
	defer s.mu.Unlock()
	if _, ok := s.side[name]; !ok {
		return nil
	}
	if err := s.appendFrame(putBytes([]byte{'D'}, []byte(name))); err != nil {
		return err
	}
	delete(s.side, name)
	return nil
}
