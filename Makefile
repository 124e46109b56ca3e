# spallscope build targets. Every target that builds first runs the
# dependency step, so a fresh machine needs nothing installed by hand.

GO      ?= go
BIN     := bin/spallscope
DEMO    ?= out/demo

.PHONY: deps build test vet bench demo bundle clean

deps:
	./scripts/deps.sh

build: deps
	$(GO) build -o $(BIN) ./cmd/spallscope

vet: deps
	$(GO) vet ./...

test: deps
	$(GO) vet ./...
	$(GO) test -timeout 20m ./...

bench: deps
	$(GO) test -run '^$$' -bench . -benchmem ./...

demo: build
	./$(BIN) demo --out $(DEMO)

bundle: build
	./scripts/bundle.sh

clean:
	rm -rf bin out bundle
