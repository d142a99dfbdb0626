package logbook

import (
	"crypto/sha256"
	"sort"
	"strings"
	"time"
)

// Flags mark index entries; they let a list show warnings without opening
// bodies.
type Flags uint8

const (
	// FlagIdentifying: the entry carries identifying patient free text.
	FlagIdentifying Flags = 1 << iota
	// FlagVoid: the amendment withdraws the entry it amends.
	FlagVoid
)

// IndexEntry is the small sealed summary each record carries, opened for
// listing without decrypting bodies.
type IndexEntry struct {
	Seq       uint64
	Transport TransportID
	Kind      Kind
	Of        Kind // the payload's kind: Kind itself, or for an amendment the kind amended
	At        time.Time
	Amends    uint64
	Flags     Flags
	// Set on open entries and on amendments of them:
	Vehicle, Origin, Destination string

	prev     link
	bodyHash [sha256.Size]byte
}

// Record returns the entry's report name, e.g. "R42".
func (e IndexEntry) Record() string { return RecordName(e.Seq) }

// Index plaintext, version 1 (binary): version 1 byte, prev link 32, body
// hash 32, transport (uvarint-length string), kind, of, at (unix
// milliseconds, u64), amends (uvarint), flags, vehicle, origin, destination
// (uvarint-length strings).
const indexVersion = 1

func (e *IndexEntry) encode() []byte {
	b := make([]byte, 0, 128+len(e.Vehicle)+len(e.Origin)+len(e.Destination))
	b = putU8(b, indexVersion)
	b = append(b, e.prev[:]...)
	b = append(b, e.bodyHash[:]...)
	b = putString(b, string(e.Transport))
	b = putU8(b, uint8(e.Kind))
	b = putU8(b, uint8(e.Of))
	b = putU64(b, uint64(e.At.UnixMilli()))
	b = appendUvarint(b, e.Amends)
	b = putU8(b, uint8(e.Flags))
	b = putString(b, e.Vehicle)
	b = putString(b, e.Origin)
	return putString(b, e.Destination)
}

func parseIndex(seq uint64, data []byte) (IndexEntry, error) {
	r := &reader{b: data}
	e := IndexEntry{Seq: seq}
	if r.u8() != indexVersion {
		return e, errShort
	}
	copy(e.prev[:], r.fixed(len(e.prev)))
	copy(e.bodyHash[:], r.fixed(len(e.bodyHash)))
	e.Transport = TransportID(r.string(32))
	e.Kind = Kind(r.u8())
	e.Of = Kind(r.u8())
	e.At = time.UnixMilli(int64(r.u64())).UTC()
	e.Amends = r.uvarint()
	e.Flags = Flags(r.u8())
	e.Vehicle = r.string(maxShortText)
	e.Origin = r.string(maxShortText)
	e.Destination = r.string(maxShortText)
	return e, r.done()
}

// indexOf builds the index summary of an entry.
func indexOf(e *Entry, of Kind) IndexEntry {
	ie := IndexEntry{Seq: e.Seq, Transport: e.Transport, Kind: e.Kind, Of: of, At: e.At, Amends: e.Amends}
	if e.Void {
		ie.Flags |= FlagVoid
	}
	if o := e.Open; o != nil {
		ie.Vehicle, ie.Origin, ie.Destination = o.Vehicle, o.Origin.Name, o.Destination.Name
		if strings.TrimSpace(o.Patient.Identifying) != "" {
			ie.Flags |= FlagIdentifying
		}
	}
	return ie
}

// TransportSummary is one line of the Logbook list, built from index
// entries only.
type TransportSummary struct {
	ID                           TransportID
	Opened                       time.Time // At of the open entry
	Closed                       time.Time // At of the latest close still in force; zero while open
	Vehicle, Origin, Destination string    // as last amended
	Entries                      int       // records of this transport, amendments included
	FirstSeq, LastSeq            uint64
	Amended                      bool // some entry was corrected
	BriefAmended                 bool // a new Brief was recorded in flight
	ChangedAfterClose            bool // an entry or correction was appended after the close
	Identifying                  bool // carries identifying patient text
}

// IsClosed reports whether the transport has a close in force.
func (s TransportSummary) IsClosed() bool { return !s.Closed.IsZero() }

// Listing is what List returns: the transports, newest first, the readable
// index entries in record order, and every problem verification found.
type Listing struct {
	Transports []TransportSummary
	Entries    []IndexEntry
	Problems   []Problem
	Head       uint64 // the authenticated head's record number (0 if none or damaged)
}

// summarise groups index entries by transport.
func summarise(entries []IndexEntry) []TransportSummary {
	byID := map[TransportID]*TransportSummary{}
	var order []TransportID
	kindOf := map[uint64]IndexEntry{}
	closeSeq := map[TransportID]uint64{}
	for _, e := range entries {
		kindOf[e.Seq] = e
		s := byID[e.Transport]
		if s == nil {
			s = &TransportSummary{ID: e.Transport, FirstSeq: e.Seq}
			byID[e.Transport] = s
			order = append(order, e.Transport)
		}
		s.Entries++
		s.LastSeq = e.Seq
		if s.IsClosed() && e.Kind != KindClose {
			s.ChangedAfterClose = true
		}
		if e.Flags&FlagIdentifying != 0 {
			s.Identifying = true
		}
		switch e.Kind {
		case KindOpen:
			s.Opened = e.At
			s.Vehicle, s.Origin, s.Destination = e.Vehicle, e.Origin, e.Destination
		case KindBrief:
			s.BriefAmended = true
		case KindClose:
			s.Closed = e.At
			closeSeq[e.Transport] = e.Seq
		case KindAmend:
			s.Amended = true
			target := kindOf[e.Amends]
			switch {
			case e.Flags&FlagVoid != 0 && target.Kind == KindClose && closeSeq[e.Transport] == e.Amends:
				s.Closed = time.Time{}
			case e.Of == KindOpen && e.Flags&FlagVoid == 0:
				s.Opened = e.At
				s.Vehicle, s.Origin, s.Destination = e.Vehicle, e.Origin, e.Destination
			case e.Of == KindClose && e.Flags&FlagVoid == 0:
				s.Closed = e.At
			}
		}
	}
	out := make([]TransportSummary, 0, len(order))
	for _, id := range order {
		out = append(out, *byID[id])
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].Opened.After(out[j].Opened) })
	return out
}

// Filter selects transports in a Listing. Zero fields select everything.
type Filter struct {
	From, To   time.Time // opened at or after From, before To
	Text       string    // case-insensitive substring of id, vehicle, origin or destination
	OpenOnly   bool      // only transports not yet closed
	ClosedOnly bool      // only closed transports
	Amended    bool      // only transports with a correction
}

// Filter returns the transports of l that f selects, newest first.
func (l *Listing) Filter(f Filter) []TransportSummary {
	text := strings.ToLower(strings.TrimSpace(f.Text))
	var out []TransportSummary
	for _, s := range l.Transports {
		if !f.From.IsZero() && s.Opened.Before(f.From) || !f.To.IsZero() && !s.Opened.Before(f.To) ||
			f.OpenOnly && s.IsClosed() || f.ClosedOnly && !s.IsClosed() || f.Amended && !s.Amended {
			continue
		}
		if text != "" && !strings.Contains(strings.ToLower(string(s.ID)+"\x00"+s.Vehicle+"\x00"+s.Origin+"\x00"+s.Destination), text) {
			continue
		}
		out = append(out, s)
	}
	return out
}
