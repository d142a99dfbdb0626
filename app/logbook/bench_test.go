package logbook

import (
	"testing"
	"time"

	"alvea/physio"
)

// BenchmarkUnlock measures unlocking at DefaultKDF (the strength new
// vaults get).
func BenchmarkUnlock(b *testing.B) {
	s := NewMemStore()
	if _, err := Create(ctx, s, testPass, DefaultKDF); err != nil {
		b.Fatal(err)
	}
	v, _ := Open(ctx, s)
	v.SetAutoLock(0, nil)
	for b.Loop() {
		if err := v.Unlock(ctx, testPass); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkAppend measures sealing and storing one gauge reading (memory
// store: the crypto and encoding cost, not the medium's).
func BenchmarkAppend(b *testing.B) {
	v, _ := newTestVault(b)
	id := sampleTransport(b, v, t0)
	for b.Loop() {
		if _, err := v.Append(ctx, &Entry{Transport: id, Kind: KindGauge, At: t0, Gauge: &GaugeReading{Cylinder: "A", Pressure: physio.Psi(1800)}}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkOpenAndList10000 measures List over 10 000 records (1 250
// transports of 8 records, as sampleTransport writes them): read the
// index, open each sealed summary, verify the chain and head, group by
// transport. Bodies are not read.
func BenchmarkOpenAndList10000(b *testing.B) {
	v, s := newTestVault(b)
	for i := 0; i < 1250; i++ {
		sampleTransport(b, v, t0.Add(time.Duration(i)*time.Hour))
	}
	w, _ := Open(ctx, s)
	w.SetAutoLock(0, nil)
	w.Unlock(ctx, testPass)
	b.ResetTimer()
	for b.Loop() {
		l, err := w.List(ctx)
		if err != nil || len(l.Entries) != 10000 || len(l.Problems) != 0 {
			b.Fatalf("%v %d %v", err, len(l.Entries), l.Problems)
		}
	}
}
