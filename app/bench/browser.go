//go:build !wasm

package main

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/cdproto/profiler"
	"github.com/chromedp/chromedp"

	"alvea/app/internal/chromium"
)

// chrome is one headless Chromium with one tab on a profile of its own,
// started with the browser tests' flags.
type chrome struct {
	ctx     context.Context
	cancel  func()
	profile string
}

func newChrome() (*chrome, error) {
	if err := chromium.Installed(); err != nil {
		return nil, err
	}
	profile, err := os.MkdirTemp("", "alvea-bench-profile-")
	if err != nil {
		return nil, err
	}
	c, err := chromeOn(profile)
	if err != nil {
		os.RemoveAll(profile)
		return nil, err
	}
	stop := c.cancel
	c.cancel = func() {
		stop()
		os.RemoveAll(profile)
	}
	return c, nil
}

// chromeOn starts Chromium on the profile directory given, which it
// leaves in place when closed (for a start after the browser was closed).
func chromeOn(profile string) (*chrome, error) {
	allocCtx, cancelAlloc := chromedp.NewExecAllocator(context.Background(), chromium.Options(profile)...)
	ctx, cancelCtx := chromedp.NewContext(allocCtx)
	c := &chrome{ctx: ctx, profile: profile, cancel: func() {
		cancelCtx()
		cancelAlloc()
	}}
	if err := chromedp.Do(ctx); err != nil {
		c.close()
		return nil, fmt.Errorf("starting chromium: %w", err)
	}
	if err := c.do(30*time.Second, chromedp.EmulateViewport(1024, 768)); err != nil {
		c.close()
		return nil, err
	}
	return c, nil
}

func (c *chrome) close() {
	if c.cancel != nil {
		c.cancel()
		c.cancel = nil
	}
}

func (c *chrome) do(timeout time.Duration, actions ...chromedp.Action[chromedp.Void]) error {
	ctx, cancel := context.WithTimeout(c.ctx, timeout)
	defer cancel()
	return chromedp.Do(ctx, actions...)
}

// evalJS evaluates expr (awaiting a Promise) and decodes its value.
func evalJS[T any](c *chrome, expr string) (T, error) {
	ctx, cancel := context.WithTimeout(c.ctx, 120*time.Second)
	defer cancel()
	return chromedp.Run(ctx, chromedp.Evaluate[T](expr, chromedp.EvalAwaitPromise))
}

// waitJS polls until expr is truthy.
func (c *chrome) waitJS(what, expr string, timeout time.Duration) error {
	deadline := time.Now().Add(timeout)
	for {
		ok, err := evalJS[bool](c, "!!("+expr+")")
		if err == nil && ok {
			return nil
		}
		if time.Now().After(deadline) {
			if err == nil {
				err = errors.New("timed out")
			}
			return fmt.Errorf("waiting for %s: %w", what, err)
		}
		time.Sleep(20 * time.Millisecond)
	}
}

func (c *chrome) throttle(rate float64) error {
	_, err := chromedp.Call(c.ctx, emulation.SetCPUThrottlingRate, emulation.SetCPUThrottlingRateParams{Rate: rate})
	return err
}

// onEveryPage runs src in every document the tab loads, before its own
// scripts.
func (c *chrome) onEveryPage(src string) error {
	_, err := chromedp.Call(c.ctx, page.AddScriptToEvaluateOnNewDocument, page.AddScriptToEvaluateOnNewDocumentParams{Source: src})
	return err
}

// typeInto replaces the content of the input by typing text, one key
// event per character, as the browser tests do.
func (c *chrome) typeInto(sel, text string) error {
	if err := c.do(30*time.Second, chromedp.Click(chromedp.CSS(sel))); err != nil {
		return fmt.Errorf("tap %s: %w", sel, err)
	}
	if _, err := evalJS[bool](c, fmt.Sprintf(`(() => { const e = document.querySelector(%q); e.focus(); e.select(); return true })()`, sel)); err != nil {
		return err
	}
	if err := c.do(30*time.Second, chromedp.SendKeys(chromedp.CSS(sel), text)); err != nil {
		return fmt.Errorf("type into %s: %w", sel, err)
	}
	return nil
}

func (c *chrome) tap(sel string) error {
	if err := c.do(30*time.Second, chromedp.Click(chromedp.CSS(sel))); err != nil {
		return fmt.Errorf("tap %s: %w", sel, err)
	}
	return nil
}

// pick chooses an option of a <select> and fires the change event a tap
// on the option fires.
func (c *chrome) pick(sel, value string) error {
	ok, err := evalJS[bool](c, fmt.Sprintf(`(() => { const e = document.querySelector(%q); if (!e) return false;
		e.focus(); e.value = %q; e.dispatchEvent(new Event("change", {bubbles: true})); return e.value === %q })()`, sel, value, value))
	if err != nil {
		return err
	}
	if !ok {
		return fmt.Errorf("select %s: no option %q", sel, value)
	}
	return nil
}

// startProfile starts V8's sampling profiler in the tab (every 100 µs).
func (c *chrome) startProfile() error {
	if _, err := chromedp.Call(c.ctx, profiler.Enable, cdp.Empty{}); err != nil {
		return err
	}
	if _, err := chromedp.Call(c.ctx, profiler.SetSamplingInterval, profiler.SetSamplingIntervalParams{Interval: 100}); err != nil {
		return err
	}
	_, err := chromedp.Call(c.ctx, profiler.Start, cdp.Empty{})
	return err
}

// stopProfile stops the profiler and writes its profile to file, in the
// .cpuprofile format DevTools opens.
func (c *chrome) stopProfile(file string) error {
	res, err := chromedp.Call(c.ctx, profiler.Stop, cdp.Empty{})
	if err != nil {
		return err
	}
	b, err := json.Marshal(res.Profile)
	if err != nil {
		return err
	}
	return os.WriteFile(file, b, 0o644)
}
