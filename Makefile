# spallscope build targets. Every target that builds first runs the
# dependency step, so a fresh machine needs nothing installed by hand.

GO      ?= go
BIN     := bin/spallscope
DEMO    ?= out/demo

.PHONY: deps build test vet bench demo bundle slurm-test clean

deps:
	./scripts/deps.sh

build: deps
	$(GO) build -o $(BIN) ./cmd/spallscope

vet: deps
	$(GO) vet ./...

# gofmt first: an unformatted file fails the run, as review would.
# The second run takes the pure-Go kernels of package subset (build tag
# purego) in place of its AVX2+FMA assembly, so that CI tests both paths;
# asm-check holds the checked-in assembly to what its generator writes.
test: deps
	@unformatted=$$(gofmt -l cmd dic render strain subset); \
	if [ -n "$$unformatted" ]; then echo "gofmt: these files are not formatted:"; echo "$$unformatted"; exit 1; fi
	./scripts/asm-check.sh
	$(GO) vet ./...
	$(GO) vet -tags purego ./subset/...
	$(GO) test -timeout 20m ./...
	$(GO) test -tags purego ./subset/...

bench: deps
	$(GO) test -run '^$$' -bench . -benchmem ./...

demo: build
	./$(BIN) demo --out $(DEMO)

bundle: build
	./scripts/bundle.sh

# A real single-host Slurm runs a campaign as an array job (installs
# slurm-wlm and munge when missing; needs root).
slurm-test: deps
	timeout 15m ./scripts/slurm-local-test

clean:
	rm -rf bin out bundle
