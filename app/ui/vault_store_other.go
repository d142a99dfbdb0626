//go:build !js

package ui

import (
	"context"

	"alvea/app/logbook"
)

// openBrowserStore natively (prerender, native tests) gives a store in
// memory: the server never holds a vault.
func openBrowserStore(ctx context.Context) (logbook.Store, error) {
	return logbook.NewMemStore(), nil
}
