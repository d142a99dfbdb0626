# Alvea. The README names two targets: run and test.
GO        ?= go
FLAGS     := -trimpath -ldflags="-s -w"
WASM_ENV  := GOOS=js GOARCH=wasm
ADDR      ?= 127.0.0.1:8000
FUZZTIME  ?= 20s

.PHONY: run test build wasm static bench fuzz vet clean

wasm:
	$(WASM_ENV) $(GO) build $(FLAGS) -o web/app.wasm ./app

build: wasm
	$(GO) build $(FLAGS) -o bin/alvea ./app

run: build
	./bin/alvea serve -addr $(ADDR)

vet:
	$(GO) vet ./...
	$(WASM_ENV) $(GO) vet ./...

test: vet
	$(GO) test -count=1 ./...

bench:
	$(GO) test -run='^$$' -bench=. -benchmem ./...

fuzz:
	@for pkg in $$($(GO) list ./...); do \
	  for f in $$($(GO) test -list='^Fuzz' $$pkg | grep '^Fuzz'); do \
	    echo "fuzz $$pkg $$f"; \
	    $(GO) test -run='^$$' -fuzz="^$$f$$" -fuzztime=$(FUZZTIME) $$pkg || exit 1; \
	  done; \
	done

clean:
	rm -rf bin dist web/app.wasm web/app.wasm.* testoutput
