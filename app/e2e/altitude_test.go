//go:build !wasm

package e2e

import (
	"fmt"
	"strings"
	"testing"
	"time"

	"alvea/physio"
)

// Cabin altitude both ways, checked against physio for the same inputs
// (REFERENCES §2: about 9.25 psi holds an 8 000 ft cabin at 50 000 ft,
// [calc] 9.234 psi); a bad value shows its message and no figure; axe-core
// and screenshots.
func TestAltitudeCabinBothWaysAndBadValue(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.open(srv.URL("/altitude"))

	b.typeInto("#alt-cruise", "50000")
	b.typeInto("#alt-diff", "9.234")
	cabin, err := physio.CabinAltitude(physio.Feet(50000), physio.Psi(9.234), physio.Feet(0))
	if err != nil {
		t.Fatal(err)
	}
	wantCabin, _ := physio.Round(cabin.Feet(), 0, physio.RoundUp)
	if d := cabin.Feet() - 8000; d < -10 || d > 10 {
		t.Fatalf("physio cabin %v ft, REFERENCES §2 says about 8000", cabin.Feet())
	}
	b.waitFor("the cabin altitude", fmt.Sprintf(`document.querySelector("#alt-cabin")?.textContent === %q`, wantCabin.String()), 10*time.Second)

	cruise, err := physio.MaxCruiseAltitude(physio.Feet(8000), physio.Psi(9.234))
	if err != nil {
		t.Fatal(err)
	}
	wantCruise, _ := physio.Round(cruise.Feet(), 0, physio.RoundDown)
	if got := b.text("#alt-max-cruise"); got != wantCruise.String() {
		t.Errorf("highest cruise = %q ft, want %s", got, wantCruise)
	}
	b.typeInto("#alt-cabin-limit", "6000")
	cruise, _ = physio.MaxCruiseAltitude(physio.Feet(6000), physio.Psi(9.234))
	wantCruise, _ = physio.Round(cruise.Feet(), 0, physio.RoundDown)
	b.waitFor("the highest cruise for 6000 ft", fmt.Sprintf(`document.querySelector("#alt-max-cruise")?.textContent === %q`, wantCruise.String()), 10*time.Second)
	for _, id := range []string{"#alt-gas-plot", "#alt-spo2-plot"} {
		if !b.exists(id) {
			t.Errorf("plot %s missing", id)
		}
	}

	b.typeInto("#alt-cruise", "70000")
	b.waitFor("the cruise message", `document.querySelector("#alt-cruise-msg") !== null`, 10*time.Second)
	if msg := b.text("#alt-cruise-msg"); !strings.Contains(msg, "Cruise altitude") || !strings.Contains(msg, "between -2000 and 65000 ft") {
		t.Errorf("message = %q", msg)
	}
	if b.exists("#alt-cabin") || b.exists("#alt-gas-plot") {
		t.Error("figures shown while the cruise altitude is invalid")
	}
	if txt := b.text("main"); strings.Contains(txt, "NaN") || strings.Contains(txt, "Inf") {
		t.Error("the screen shows NaN or Inf")
	}
	b.typeInto("#alt-cruise", "25000")
	b.typeInto("#alt-diff", "6")
	b.waitFor("the figures back", `document.querySelector("#alt-cabin") !== null`, 10*time.Second)

	if v := b.axe(); len(v) > 0 {
		t.Errorf("axe-core serious/critical violations on Altitude: %+v", v)
	}
	b.screenshot("altitude", 1024, 768)
	b.screenshot("altitude", 768, 1024)
}
