module alvea

go 1.26.8

require (
	github.com/andybalholm/brotli v1.3.0
	github.com/chromedp/cdproto v0.159.0
	github.com/chromedp/chromedp v0.23.0
	github.com/maxence-charriere/go-app/v10 v10.1.11
	github.com/shopspring/decimal v1.6.0
	golang.org/x/crypto v0.59.0
	golang.org/x/term v0.48.0
)

require (
	github.com/go-json-experiment/json v0.0.0-20260213210345-44df1a37e875 // indirect
	github.com/google/uuid v1.6.0 // indirect
	golang.org/x/sys v0.50.0 // indirect
)
