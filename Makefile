# Furlong developer commands. `make demo` and `make test` do all the set-up
# on a fresh Debian/Ubuntu machine (see .ci/setup.sh).

GO       ?= go
BIN      := bin/furlong
VERSION  := $(shell sed -n 's/^ *Version *= *"\(.*\)"/\1/p' FyneApp.toml)
LDFLAGS  := -X main.version=$(VERSION)
export LANG ?= C.UTF-8

.PHONY: setup build demo demo-series test screenshots dist distcheck clean

setup:
	@bash .ci/setup.sh

build: setup
	$(GO) build -tags migrated_fynedo -ldflags "$(LDFLAGS)" -o $(BIN) ./cmd/furlong

demo: build
	./$(BIN) --demo

demo-series: build
	./$(BIN) --demo-series

test: setup
	@bash .ci/test.sh

screenshots: build
	@bash .ci/screenshots.sh $(BIN) ui/screenshots

# The Linux and Windows packages under dist/ (see DEVELOPERS.md, "Making a release").
dist: setup
	@bash .ci/dist.sh

# make dist, then the packages' smoke tests (the Windows program under wine).
distcheck: dist
	@bash .ci/distcheck.sh

clean:
	rm -rf bin dist
