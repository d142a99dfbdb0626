# Alvea. The README names two targets: run and test.
GO          ?= go
FLAGS       := -trimpath -ldflags="-s -w"
WASM_ENV    := GOOS=js GOARCH=wasm
ADDR        ?= 127.0.0.1:8000
FUZZTIME    ?= 20s
TESTTIMEOUT ?= 30m

# Test tools that are not Go modules: Debian packages (browser, and the
# reference tools physio and the vault compare against) and axe-core from
# npm, pinned, installed into an ignored folder.
APT_TOOLS   := chromium:chromium units:units argon2:argon2 npm:npm brotli:brotli
AXE_VERSION := 4.10.3
TOOLS_DIR   := .tools
AXE_JS      := $(TOOLS_DIR)/node_modules/axe-core/axe.min.js

.PHONY: run test build wasm native static bench fuzz vet deps clean

# go build is incremental: these rebuild only what changed, always with the
# same flags (changing flags invalidates the build cache).
wasm:
	$(WASM_ENV) $(GO) build $(FLAGS) -o web/app.wasm ./app

native:
	$(GO) build $(FLAGS) -o bin/alvea ./app

build: wasm native

run: build
	./bin/alvea serve -addr $(ADDR)

static: build
	./bin/alvea static -out dist

deps:
	@missing=""; \
	for pair in $(APT_TOOLS); do \
	  cmd=$${pair%%:*}; pkg=$${pair##*:}; \
	  command -v $$cmd >/dev/null 2>&1 || missing="$$missing $$pkg"; \
	done; \
	if [ -n "$$missing" ]; then \
	  echo "installing:$$missing"; \
	  SUDO=""; [ "$$(id -u)" = 0 ] || SUDO=sudo; \
	  $$SUDO apt-get update && \
	  DEBIAN_FRONTEND=noninteractive $$SUDO apt-get install -y --no-install-recommends $$missing; \
	fi
	@if [ ! -f $(AXE_JS) ]; then \
	  echo "installing axe-core@$(AXE_VERSION) into $(TOOLS_DIR)"; \
	  mkdir -p $(TOOLS_DIR) && \
	  npm install --prefix $(TOOLS_DIR) --no-save --no-audit --no-fund --loglevel=error axe-core@$(AXE_VERSION); \
	fi

vet:
	$(GO) vet ./...
	$(WASM_ENV) $(GO) vet ./...

test: deps vet wasm
	$(GO) test -count=1 -timeout $(TESTTIMEOUT) ./...

# Alvea against the go-app floor (testdata/floor), both built here with
# FLAGS: sizes, transfer, start-up in Chromium, Brief keystrokes, the vault,
# and every package's go test -bench figures. Prints the table and writes
# dist/bench.md. BENCHFLAGS, e.g. -runs 7.
BENCHFLAGS ?=
bench: deps
	$(GO) run ./app/bench $(BENCHFLAGS)

fuzz:
	@for pkg in $$($(GO) list ./...); do \
	  for f in $$($(GO) test -list='^Fuzz' $$pkg | grep '^Fuzz'); do \
	    echo "fuzz $$pkg $$f"; \
	    $(GO) test -run='^$$' -fuzz="^$$f$$" -fuzztime=$(FUZZTIME) $$pkg || exit 1; \
	  done; \
	done

clean:
	rm -rf bin dist web/app.wasm web/app.wasm.* testoutput
