package ui

import (
	"testing"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// BenchmarkBriefKeystroke is the Go work of one keystroke in the cabin
// leg's minutes, natively (go-app's DOM calls are no-ops here): the plan
// read and computed again, then the result panel redrawn and compared with
// what it showed. A scenario of our own (scenarioDraft).
func BenchmarkBriefKeystroke(b *testing.B) {
	d := scenarioDraft()
	br := newBriefWith(&memDraftStore{draft: &d})
	s := br.s
	s.draft = d
	s.recompute()
	p := &ctxProbe{child: &briefResult{Rev: s.rev, s: s}}
	e := app.NewTestEngine()
	if err := e.Load(p); err != nil {
		b.Fatal(err)
	}
	e.ConsumeAll()
	values := []string{"120", "12", "125", "12", "126"}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		s.draft.Legs[1].Minutes = Entry{T: values[i%len(values)]}
		s.recompute()
		if !s.model.ok() {
			b.Fatal("the scenario did not compute")
		}
		p.child = &briefResult{Rev: s.rev, s: s}
		p.ctx.Dispatch(nil)
		e.ConsumeAll()
	}
}

// BenchmarkBriefRead is reading the form and computing the plan alone.
func BenchmarkBriefRead(b *testing.B) {
	d := scenarioDraft()
	s := newBriefWith(&memDraftStore{draft: &d}).s
	s.draft = d
	s.recompute()
	if !s.model.ok() {
		b.Fatal("the scenario did not compute")
	}
	for i := 0; i < b.N; i++ {
		s.recompute()
	}
}
