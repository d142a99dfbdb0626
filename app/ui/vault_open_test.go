package ui

import (
	"context"
	"sync"
	"testing"
	"time"

	"alvea/app/logbook"
)

// Two loads at once share one open of the store, and an open that does not
// answer is reported (OpenWaiting) until it does, so the Logbook says the
// browser holds it instead of spinning. The open is held by a channel, not
// a clock: the test asserts order, not speed.
func TestVaultLoadSharedAndWaiting(t *testing.T) {
	release := make(chan struct{})
	var opens int
	var mu sync.Mutex
	s := newVaultSession(func(ctx context.Context) (logbook.Store, error) {
		mu.Lock()
		opens++
		mu.Unlock()
		<-release
		return logbook.NewMemStore(), nil
	}, logbook.MinimumKDF)
	s.patience = time.Millisecond
	waiting := make(chan struct{}, 1)
	cancel := s.Subscribe(func() {
		if s.OpenWaiting() {
			select {
			case waiting <- struct{}{}:
			default:
			}
		}
	})
	defer cancel()
	errs := make(chan error, 2)
	for i := 0; i < 2; i++ {
		go func() { errs <- s.Load(context.Background()) }()
	}
	<-waiting // the open outlasted its patience and the screens were told
	if ph, _ := s.Phase(); ph != phaseUnknown {
		t.Fatalf("phase while the open waits: %v", ph)
	}
	close(release)
	for i := 0; i < 2; i++ {
		if err := <-errs; err != nil {
			t.Fatalf("load: %v", err)
		}
	}
	if opens != 1 {
		t.Errorf("two loads at once opened the store %d times, want 1", opens)
	}
	if s.OpenWaiting() {
		t.Error("still reported waiting after the open answered")
	}
	if ph, _ := s.Phase(); ph != phaseEmpty {
		t.Errorf("phase after the open: %v, want empty", ph)
	}
}
