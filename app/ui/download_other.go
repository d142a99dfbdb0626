//go:build !js

package ui

import "errors"

// offerDownload has no browser to offer a file to natively; native tests
// replace the screens' download variables to capture the bytes.
func offerDownload(name, mediaType string, data []byte) error { return errors.ErrUnsupported }
