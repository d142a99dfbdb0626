package idb

import (
	"encoding/base64"
	"encoding/json"
	"fmt"
)

// SeedRecord is one sealed record as the store keeps it: its sequence
// number and its index and body ciphertexts.
type SeedRecord struct {
	Seq         uint64
	Index, Body []byte
}

// seedChunk is how many records one seeding script writes.
const seedChunk = 2500

// SeedScripts returns scripts for a page of the app's origin that write
// sealed records straight into the vault's database, in the layout above,
// and with the last of them the vault's header and chain head. Each script
// writes one transaction and evaluates to a promise of true once that
// transaction completes. The browser tests and the bench use it to put
// thousands of records (sealed natively by logbook.Vault) in place much
// faster than the app would append them; the app never does.
func SeedScripts(recs []SeedRecord, header, head []byte) []string {
	type rec struct {
		K    uint64 `json:"k"`
		I, B string // base64
	}
	enc := base64.StdEncoding.EncodeToString
	var out []string
	for from := 0; from == 0 || from < len(recs); from += seedChunk {
		var part []rec
		for _, r := range recs[from:min(from+seedChunk, len(recs))] {
			part = append(part, rec{K: r.Seq, I: enc(r.Index), B: enc(r.Body)})
		}
		js, _ := json.Marshal(part) // strings and numbers only: cannot fail
		meta := "null"
		if from+seedChunk >= len(recs) {
			meta = fmt.Sprintf(`{h: %q, d: %q}`, enc(header), enc(head))
		}
		out = append(out, fmt.Sprintf(`(async () => {
	const dec = s => Uint8Array.from(atob(s), c => c.charCodeAt(0));
	const db = await new Promise((res, rej) => {
		const r = indexedDB.open(%[1]q, %[7]d);
		r.onupgradeneeded = () => { for (const s of [%[2]q, %[3]q, %[4]q]) r.result.createObjectStore(s); };
		r.onsuccess = () => res(r.result); r.onerror = () => rej(r.error);
	});
	const tx = db.transaction([%[2]q, %[3]q, %[4]q], "readwrite");
	for (const r of %[5]s) {
		tx.objectStore(%[3]q).add(dec(r.I), r.k);
		tx.objectStore(%[4]q).add(dec(r.B), r.k);
	}
	const meta = %[6]s;
	if (meta) { tx.objectStore(%[2]q).put(dec(meta.h), %[8]q); tx.objectStore(%[2]q).put(dec(meta.d), %[9]q); }
	await new Promise((res, rej) => { tx.oncomplete = res; tx.onerror = () => rej(tx.error); tx.onabort = () => rej(tx.error); });
	db.close();
	return true;
})()`, DBName, storeMeta, storeIndex, storeBody, js, meta, dbVersion, keyHeader, keyHead))
	}
	return out
}
