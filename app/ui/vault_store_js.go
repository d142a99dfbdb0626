package ui

import (
	"context"

	"alvea/app/logbook"
	"alvea/app/logbook/idb"
)

// openBrowserStore opens the vault's IndexedDB database.
func openBrowserStore(ctx context.Context) (logbook.Store, error) {
	return idb.Open(ctx)
}
