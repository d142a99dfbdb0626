package server

import (
	"bytes"
	"flag"
	"image"
	"image/color"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"testing"
)

var updateIcons = flag.Bool("update-icons", false, "rewrite web/icon-*.png from the drawing below")

// The app icon, drawn the same as web/icon.svg (viewBox 0–100): a dark
// rounded square, a light ring (the alveolus) and an amber peak (altitude).
var (
	iconBackground = color.NRGBA{0x17, 0x32, 0x3d, 0xff}
	iconRing       = color.NRGBA{0xee, 0xf1, 0xee, 0xff}
	iconPeak       = color.NRGBA{0xf2, 0xa5, 0x41, 0xff}
)

// drawIcon renders the icon at size×size pixels with 4×4 supersampling.
// maskable fills the whole square (the platform applies its own mask; the
// drawing stays inside the central safe zone).
func drawIcon(size int, maskable bool) *image.NRGBA {
	img := image.NewNRGBA(image.Rect(0, 0, size, size))
	const ss = 4
	for py := 0; py < size; py++ {
		for px := 0; px < size; px++ {
			var r, g, b, a float64
			for sy := 0; sy < ss; sy++ {
				for sx := 0; sx < ss; sx++ {
					x := (float64(px) + (float64(sx)+0.5)/ss) * 100 / float64(size)
					y := (float64(py) + (float64(sy)+0.5)/ss) * 100 / float64(size)
					c, ok := iconColourAt(x, y, maskable)
					if !ok {
						continue
					}
					r += float64(c.R)
					g += float64(c.G)
					b += float64(c.B)
					a++
				}
			}
			if a == 0 {
				continue
			}
			img.SetNRGBA(px, py, color.NRGBA{
				R: uint8(math.Round(r / a)), G: uint8(math.Round(g / a)), B: uint8(math.Round(b / a)),
				A: uint8(math.Round(a * 255 / ss / ss)),
			})
		}
	}
	return img
}

func iconColourAt(x, y float64, maskable bool) (color.NRGBA, bool) {
	if !maskable && !insideRoundedSquare(x, y, 100, 20) {
		return color.NRGBA{}, false
	}
	const half = 3 // stroke-width 6
	if segmentDistance(x, y, 36, 58, 50, 42) <= half || segmentDistance(x, y, 50, 42, 64, 58) <= half {
		return iconPeak, true
	}
	if d := math.Hypot(x-50, y-50); math.Abs(d-26) <= half {
		return iconRing, true
	}
	return iconBackground, true
}

func insideRoundedSquare(x, y, side, radius float64) bool {
	cx := math.Max(radius, math.Min(x, side-radius))
	cy := math.Max(radius, math.Min(y, side-radius))
	return math.Hypot(x-cx, y-cy) <= radius
}

func segmentDistance(x, y, x1, y1, x2, y2 float64) float64 {
	dx, dy := x2-x1, y2-y1
	t := ((x-x1)*dx + (y-y1)*dy) / (dx*dx + dy*dy)
	t = math.Max(0, math.Min(1, t))
	return math.Hypot(x-(x1+t*dx), y-(y1+t*dy))
}

// TestIcons checks that the committed PNG icons are the drawing above at
// the sizes the manifest declares (192 and 512 px); -update-icons rewrites
// them.
func TestIcons(t *testing.T) {
	cases := []struct {
		file     string
		size     int
		maskable bool
	}{
		{"icon-192.png", 192, false},
		{"icon-512.png", 512, false},
		{"icon-maskable-512.png", 512, true},
	}
	for _, c := range cases {
		var buf bytes.Buffer
		if err := png.Encode(&buf, drawIcon(c.size, c.maskable)); err != nil {
			t.Fatal(err)
		}
		path := filepath.Join("..", "..", "web", c.file)
		if *updateIcons {
			if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
				t.Fatal(err)
			}
			continue
		}
		got, err := os.ReadFile(path)
		if err != nil {
			t.Fatalf("%s: %v (run go test ./app/server -run TestIcons -update-icons)", c.file, err)
		}
		cfg, err := png.DecodeConfig(bytes.NewReader(got))
		if err != nil {
			t.Fatalf("%s: %v", c.file, err)
		}
		if cfg.Width != c.size || cfg.Height != c.size {
			t.Errorf("%s is %d×%d, want %d×%d", c.file, cfg.Width, cfg.Height, c.size, c.size)
		}
		if !bytes.Equal(got, buf.Bytes()) {
			t.Errorf("%s differs from the drawing; run with -update-icons", c.file)
		}
	}
}
