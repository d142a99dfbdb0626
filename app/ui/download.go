package ui

// lbDownload (the Logbook's export) offers data as a file named name; tests replace it.
var lbDownload = func(name string, data []byte) error {
	return offerDownload(name, "application/octet-stream", data)
}

// reviewDownload offers the CSV export; tests replace it to capture the file.
var reviewDownload = func(name string, data []byte) error {
	return offerDownload(name, "text/csv;charset=utf-8", data)
}
