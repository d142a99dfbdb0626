package server

import (
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// WriteStatic writes the static site for the assets in root/web into out:
// go-app's pages (index.html and one .html per route), app.js, the service
// worker, the manifest and styles, and a copy of every file under root/web
// (go-app leaves web/ empty), plus web/app.wasm.br and web/app.wasm.gz
// (the compressed copies, waited for) and HOSTING.txt, the note for hosts
// on serving them. The routes must be registered before the call. It
// returns the version the site carries.
func WriteStatic(out, root string) (string, error) {
	h, err := NewHandler(root)
	if err != nil {
		return "", err
	}
	res := h.Resources.(*Resources)
	if err := res.Wait(); err != nil {
		return "", fmt.Errorf("server: compressing app.wasm: %w", err)
	}
	if err := os.MkdirAll(out, 0o755); err != nil {
		return "", fmt.Errorf("server: %w", err)
	}
	if err := app.GenerateStaticWebsite(out, h); err != nil {
		return "", fmt.Errorf("server: writing static site: %w", err)
	}
	pages, err := filepath.Glob(filepath.Join(out, "*.html"))
	if err != nil {
		return "", fmt.Errorf("server: %w", err)
	}
	for _, p := range pages {
		html, err := os.ReadFile(p)
		if err != nil {
			return "", fmt.Errorf("server: %w", err)
		}
		if html, err = PatchPage(html); err != nil {
			return "", fmt.Errorf("server: %s: %w", filepath.Base(p), err)
		}
		if err := os.WriteFile(p, html, 0o644); err != nil {
			return "", fmt.Errorf("server: %w", err)
		}
	}
	appJS := filepath.Join(out, "app.js")
	js, err := os.ReadFile(appJS)
	if err != nil {
		return "", fmt.Errorf("server: %w", err)
	}
	if js, err = PatchLoader(js); err != nil {
		return "", err
	}
	if err := os.WriteFile(appJS, js, 0o644); err != nil {
		return "", fmt.Errorf("server: %w", err)
	}
	web := filepath.Join(root, "web")
	files, err := webFiles(web)
	if err != nil {
		return "", err
	}
	for _, name := range files {
		if err := copyFile(filepath.Join(out, "web", filepath.FromSlash(name)), filepath.Join(web, filepath.FromSlash(name))); err != nil {
			return "", err
		}
	}
	for _, enc := range Encodings {
		b, ok := res.Copy(enc)
		if !ok {
			return "", fmt.Errorf("server: no %s copy of app.wasm", enc.Name)
		}
		if err := os.WriteFile(filepath.Join(out, "web", "app.wasm"+enc.Ext), b, 0o644); err != nil {
			return "", fmt.Errorf("server: %w", err)
		}
	}
	note := strings.ReplaceAll(hostingNote, "{{size}}", res.WasmContentLength())
	if err := os.WriteFile(filepath.Join(out, "HOSTING.txt"), []byte(note), 0o644); err != nil {
		return "", fmt.Errorf("server: %w", err)
	}
	return h.Version, nil
}

// hostingNote tells a host what the static site relies on. A plain file
// server cannot choose an encoding by the request, so the site works
// uncompressed anywhere and faster where the host is told.
const hostingNote = `Alvea static site: notes for the host

Every file here can be served as it is, with these content types:
  .html text/html, .js text/javascript, .css text/css,
  .webmanifest application/manifest+json, .wasm application/wasm,
  .svg image/svg+xml, .png image/png.
Serve app-worker.js and index.html with "Cache-Control: no-cache" (not
no-store: no-store makes the first visit download app.wasm twice).

web/app.wasm is {{size}} bytes. web/app.wasm.br (brotli) and
web/app.wasm.gz (gzip) hold the same bytes compressed. A host that can
choose a file by the request's Accept-Encoding should answer a request for
/web/app.wasm with:
  web/app.wasm.br and "Content-Encoding: br" when the request accepts br,
  else web/app.wasm.gz and "Content-Encoding: gzip" when it accepts gzip,
  else web/app.wasm;
always with "Content-Type: application/wasm" and "Vary: Accept-Encoding",
and never compressing app.wasm.br or app.wasm.gz a second time. (For
example: a rewrite rule on Accept-Encoding, or a host's own support for
pre-compressed files next to the original.) A host that cannot do this
serves web/app.wasm plain; the app works the same, with a larger download
on the first visit and on each update.

The loading progress counts the decoded bytes against the size above, so
it is right whichever copy is sent. The service worker stores the decoded
app.wasm and serves it offline.
`

func copyFile(dst, src string) error {
	if err := os.MkdirAll(filepath.Dir(dst), 0o755); err != nil {
		return fmt.Errorf("server: %w", err)
	}
	in, err := os.Open(src)
	if err != nil {
		return fmt.Errorf("server: %w", err)
	}
	defer in.Close()
	outFile, err := os.Create(dst)
	if err != nil {
		return fmt.Errorf("server: %w", err)
	}
	if _, err := io.Copy(outFile, in); err != nil {
		outFile.Close()
		return fmt.Errorf("server: copying %s: %w", src, err)
	}
	if err := outFile.Close(); err != nil {
		return fmt.Errorf("server: %w", err)
	}
	return nil
}
