package server

import (
	_ "embed"
	"fmt"
	"io/fs"
	"path"
	"path/filepath"
	"sort"
	"strings"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

//go:embed worker.js
var workerTemplate string

// Page identity and colours shown by the browser before the app's own styles
// load. The colours match the day theme in web/alvea.css.
const (
	appName        = "Alvea"
	appTitle       = "Alvea — oxygen and altitude planner"
	appDescription = "Offline oxygen and altitude planner with an encrypted transport log, for air and long ground medical transport."
	themeColor     = "#17323d"
	backgroundTint = "#eef1ee"
)

// contentSecurityPolicy keeps every request on the page's own origin: the
// app makes no request to any other. 'wasm-unsafe-eval' lets the page
// compile app.wasm; 'unsafe-inline' for styles covers the style attributes
// go-app writes (plots size their SVG through them).
const contentSecurityPolicy = "default-src 'self'; " +
	"script-src 'self' 'wasm-unsafe-eval'; " +
	"style-src 'self' 'unsafe-inline'; " +
	"img-src 'self' data:; " +
	"connect-src 'self'; " +
	"worker-src 'self'; " +
	"manifest-src 'self'; " +
	"object-src 'none'; " +
	"base-uri 'self'; " +
	"form-action 'self'"

// Icons, all local: go-app's default icons are remote, and a remote icon in
// the precache list makes the service worker's install fail.
var icons = app.Icon{
	Default:  "/web/icon-192.png",
	Large:    "/web/icon-512.png",
	Maskable: "/web/icon-maskable-512.png",
	SVG:      "/web/icon.svg",
}

// NewHandler returns the go-app handler for the web assets in root/web
// (root/web/app.wasm must already be built). Its Version is the content hash
// of those assets, so a restart of the same build is not an update, and its
// service worker precaches every file under root/web.
func NewHandler(root string) (*app.Handler, error) {
	web := filepath.Join(root, "web")
	resources, err := NewResources(root)
	if err != nil {
		return nil, err
	}
	version, err := Version(root)
	if err != nil {
		return nil, err
	}
	files, err := webFiles(web)
	if err != nil {
		return nil, err
	}
	// alvea.css first; any other style sheet under web/ (a screen's own)
	// is linked after it, in name order.
	styles := []string{"/web/alvea.css"}
	for _, f := range files {
		if strings.HasSuffix(f, ".css") && f != "alvea.css" {
			styles = append(styles, "/web/"+f)
		}
	}
	cacheable := make([]string, 0, len(files))
	for _, f := range files {
		if f == "app.wasm" {
			continue // in go-app's own list
		}
		cacheable = append(cacheable, "/web/"+f)
	}
	return &app.Handler{
		Name:            appName,
		ShortName:       appName,
		Title:           appTitle,
		Description:     appDescription,
		Lang:            "en",
		Icon:            icons,
		ThemeColor:      themeColor,
		BackgroundColor: backgroundTint,
		LoadingLabel:    "Loading Alvea {progress}%",
		Styles:          styles,
		// web/boot.js goes first in the head, before the styles (see
		// PatchPage); go-app would put it after them.
		Scripts:               []string{"/web/alvea.js defer"},
		CacheableResources:    cacheable,
		RawHeaders:            []string{`<meta http-equiv="Content-Security-Policy" content="` + contentSecurityPolicy + `">`},
		Resources:             resources,
		WasmContentLength:     resources.WasmContentLength(),
		ServiceWorkerTemplate: workerTemplate,
		Version:               version,
	}, nil
}

// webFiles lists the regular files under dir as slash paths relative to it,
// sorted, skipping dot files (such as .keep) and compressed copies of
// app.wasm (app.wasm.br, app.wasm.gz: derived by this package, never read
// from web/, where an old one could be stale).
func webFiles(dir string) ([]string, error) {
	var files []string
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if strings.HasPrefix(d.Name(), ".") && p != dir {
			if d.IsDir() {
				return filepath.SkipDir
			}
			return nil
		}
		if d.Type().IsRegular() && !isWasmCopy(p, dir) {
			rel, err := filepath.Rel(dir, p)
			if err != nil {
				return err
			}
			files = append(files, path.Clean(filepath.ToSlash(rel)))
		}
		return nil
	})
	if err != nil {
		return nil, fmt.Errorf("server: listing web assets: %w", err)
	}
	sort.Strings(files)
	return files, nil
}

// isWasmCopy reports whether p is a compressed copy of dir/app.wasm.
func isWasmCopy(p, dir string) bool {
	for _, enc := range Encodings {
		if p == filepath.Join(dir, "app.wasm"+enc.Ext) {
			return true
		}
	}
	return false
}
