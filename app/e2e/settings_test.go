//go:build !wasm

package e2e

import (
	"strings"
	"testing"

	"github.com/chromedp/chromedp"
	"github.com/shopspring/decimal"
)

// A value out of range shows its message (field, range, unit) beside the
// field and is not saved; unit switching converts the display, and both the
// choice and the values survive a reload.
func TestSettingsValidationAndUnitsPersist(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.open(srv.URL("/settings"))

	// Defaults: psi, residual 200 psi.
	if got := b.value("#set-residual"); got != "200" {
		t.Fatalf("default safe residual = %q, want 200", got)
	}

	b.typeInto("#set-residual", "5000")
	b.waitFor("the residual message", `document.querySelector("#set-residual-msg") !== null`, 10e9)
	msg := b.text("#set-residual-msg")
	for _, want := range []string{"Safe residual", "between 0 and 1000 psi"} {
		if !strings.Contains(msg, want) {
			t.Errorf("message %q does not contain %q", msg, want)
		}
	}
	if got := eval[string](b, `document.querySelector("#set-residual").getAttribute("aria-invalid")`); got != "true" {
		t.Errorf("aria-invalid = %q, want true", got)
	}

	b.typeInto("#set-factor", "abc")
	b.waitFor("the factor message", `document.querySelector("#set-factor-msg") !== null`, 10e9)
	if msg := b.text("#set-factor-msg"); !strings.Contains(msg, "not a number") || !strings.Contains(msg, "between 1 and 3 ×") {
		t.Errorf("factor message = %q", msg)
	}
	b.typeInto("#set-factor", "2")
	b.waitFor("the factor message to clear", `document.querySelector("#set-factor-msg") === null`, 10e9)

	b.typeInto("#set-residual", "250")
	b.waitFor("the residual message to clear", `document.querySelector("#set-residual-msg") === null`, 10e9)

	// Switch cylinder pressure to bar, altitude to m, gases to kPa, night theme.
	b.tap("#set-pressure-bar")
	b.tap("#set-altitude-m")
	b.tap("#set-gas-kPa")
	b.tap("#set-theme-night")

	// 250 psi in bar by GNU units (external oracle), rounded up to 0.1 bar
	// (a higher residual is the safe side).
	oracle := decimal.RequireFromString(unitsConvert(t, "250 psi", "bar")).RoundCeil(1).String()
	b.waitFor("the residual in bar", `document.querySelector("#set-residual").value === "`+oracle+`"`, 10e9)

	check := func(when string) {
		t.Helper()
		for _, sel := range []string{"#set-pressure-bar", "#set-altitude-m", "#set-gas-kPa", "#set-theme-night"} {
			if got := eval[string](b, `document.querySelector("`+sel+`").getAttribute("aria-pressed")`); got != "true" {
				t.Errorf("%s: %s aria-pressed = %q, want true", when, sel, got)
			}
		}
		if got := b.value("#set-residual"); got != oracle {
			t.Errorf("%s: residual = %q bar, want %s (250 psi by GNU units, rounded up)", when, got, oracle)
		}
		if got := b.value("#set-factor"); got != "2" {
			t.Errorf("%s: factor = %q, want 2", when, got)
		}
		if got := b.text("#set-residual + .alv-unit, .alv-input-row:has(#set-residual) .alv-unit"); got != "bar" {
			t.Errorf("%s: residual unit shown = %q, want bar", when, got)
		}
		if got := eval[string](b, `document.documentElement.getAttribute("data-theme")`); got != "night" {
			t.Errorf("%s: theme = %q, want night", when, got)
		}
	}
	check("before reload")
	b.reload()
	check("after reload")

	// The saved night theme is applied before the app starts: with the wasm
	// held back (go-app's ?wasm=false), the page is already dim.
	b.must("open without wasm", chromedp.Navigate(srv.URL("/settings?wasm=false")))
	if got := eval[string](b, `document.documentElement.getAttribute("data-theme") ?? ""`); got != "night" {
		t.Errorf("before the app starts: theme = %q, want night", got)
	}
	if got := eval[string](b, `getComputedStyle(document.body).backgroundColor`); got != "rgb(11, 10, 9)" {
		t.Errorf("before the app starts: background = %q, want the night background rgb(11, 10, 9)", got)
	}
	b.open(srv.URL("/settings"))

	// Back to psi: the stored 250 psi shows again, not a round trip through bar.
	b.tap("#set-pressure-psi")
	b.waitFor("the residual in psi", `document.querySelector("#set-residual").value === "250"`, 10e9)
}

// A cylinder added by water capacity is listed and kept across a reload; a
// bad water capacity is refused with its message.
func TestSettingsCylinderCatalogue(t *testing.T) {
	srv := startApp(t, repoRoot)
	b := newBrowser(t, t.TempDir())
	b.open(srv.URL("/settings"))

	b.typeInto("#set-cyl-name", "Clinic 10 L")
	b.typeInto("#set-cyl-water", "500")
	b.typeInto("#set-cyl-pressure", "2200")
	b.tap("#cyl-add")
	b.waitFor("the water capacity message", `document.querySelector("#set-cyl-water-msg") !== null`, 10e9)
	if msg := b.text("#set-cyl-water-msg"); !strings.Contains(msg, "between 0.1 and 100 L") {
		t.Errorf("water capacity message = %q", msg)
	}
	b.typeInto("#set-cyl-water", "10")
	b.tap("#cyl-add")
	b.waitFor("the new cylinder", `document.querySelector("#cyl-own")?.textContent.includes("Clinic 10 L")`, 10e9)
	b.reload()
	if got := b.text("#cyl-own"); !strings.Contains(got, "Clinic 10 L") || !strings.Contains(got, "10 L") || !strings.Contains(got, "2200 psi") {
		t.Errorf("after reload the catalogue shows %q", got)
	}
	b.tap("#cyl-remove-0")
	b.waitFor("the cylinder removed", `document.querySelector("#cyl-own") === null`, 10e9)
}
