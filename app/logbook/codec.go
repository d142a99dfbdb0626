package logbook

import (
	"encoding/binary"
	"errors"
)

// A tiny append/read codec for the binary formats (header, head, index,
// bundle). Every length is checked against the bytes left before use, so a
// damaged or hostile input cannot make a reader allocate or index out of
// range.

var errShort = errors.New("logbook: input cut short or malformed")

func putU8(b []byte, v uint8) []byte   { return append(b, v) }
func putU32(b []byte, v uint32) []byte { return binary.BigEndian.AppendUint32(b, v) }
func putU64(b []byte, v uint64) []byte { return binary.BigEndian.AppendUint64(b, v) }

// putBytes writes a uvarint length then the bytes.
func putBytes(b, v []byte) []byte {
	b = binary.AppendUvarint(b, uint64(len(v)))
	return append(b, v...)
}

func appendUvarint(b []byte, v uint64) []byte { return binary.AppendUvarint(b, v) }

func putString(b []byte, s string) []byte { return putBytes(b, []byte(s)) }

type reader struct {
	b   []byte
	err error
}

func (r *reader) fail() {
	if r.err == nil {
		r.err = errShort
	}
	r.b = nil
}

func (r *reader) u8() uint8 {
	if len(r.b) < 1 {
		r.fail()
		return 0
	}
	v := r.b[0]
	r.b = r.b[1:]
	return v
}

func (r *reader) u32() uint32 {
	if len(r.b) < 4 {
		r.fail()
		return 0
	}
	v := binary.BigEndian.Uint32(r.b)
	r.b = r.b[4:]
	return v
}

func (r *reader) u64() uint64 {
	if len(r.b) < 8 {
		r.fail()
		return 0
	}
	v := binary.BigEndian.Uint64(r.b)
	r.b = r.b[8:]
	return v
}

func (r *reader) uvarint() uint64 {
	v, n := binary.Uvarint(r.b)
	if n <= 0 {
		r.fail()
		return 0
	}
	r.b = r.b[n:]
	return v
}

// fixed returns the next n bytes (aliasing the input).
func (r *reader) fixed(n int) []byte {
	if n < 0 || len(r.b) < n {
		r.fail()
		return nil
	}
	v := r.b[:n:n]
	r.b = r.b[n:]
	return v
}

// bytes reads a uvarint length and that many bytes, refusing lengths above
// max.
func (r *reader) bytes(max int) []byte {
	n := r.uvarint()
	if r.err != nil || n > uint64(max) || n > uint64(len(r.b)) {
		r.fail()
		return nil
	}
	return r.fixed(int(n))
}

func (r *reader) string(max int) string { return string(r.bytes(max)) }

// done reports an error if any read failed or bytes are left over.
func (r *reader) done() error {
	if r.err != nil {
		return r.err
	}
	if len(r.b) != 0 {
		return errShort
	}
	return nil
}
