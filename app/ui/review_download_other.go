//go:build !js

package ui

import "errors"

// Natively there is no download; native tests replace reviewDownload to
// capture the file.
var reviewDownload = func(name string, data []byte) error { return errors.ErrUnsupported }
