#!/usr/bin/env bash
# Installs what a fresh Debian machine with Node.js 20 lacks: Debian packages, then npm ci.
# Idempotent: does nothing when everything is present and the lock file has not changed.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

need_apt=()
command -v mariadbd >/dev/null 2>&1 || [ -x /usr/sbin/mariadbd ] || need_apt+=(mariadb-server)
command -v redis-server >/dev/null 2>&1 || need_apt+=(redis-server)
[ -x /usr/bin/chromium ] || need_apt+=(chromium)
[ -x /usr/bin/mkdssp ] || need_apt+=(dssp)
[ -f /usr/share/libcifpp/mmcif_pdbx.dic ] || need_apt+=(libcifpp-data)
command -v pdffonts >/dev/null 2>&1 || need_apt+=(poppler-utils)
/usr/bin/python3 -c 'import gemmi' >/dev/null 2>&1 || need_apt+=(python3-gemmi)
/usr/bin/python3 -c 'import Bio' >/dev/null 2>&1 || need_apt+=(python3-biopython)
# Pillow reads the PNG figures' size and dpi in the figure tests
/usr/bin/python3 -c 'import PIL' >/dev/null 2>&1 || need_apt+=(python3-pil)

if [ ${#need_apt[@]} -gt 0 ]; then
  log "installing Debian packages: ${need_apt[*]}"
  SUDO=""; [ "$(id -u)" -ne 0 ] && SUDO="sudo"
  $SUDO apt-get update -qq
  # The packages' maintainer scripts try to start system services; that fails harmlessly here.
  DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq "${need_apt[@]}" >/dev/null ||
    die "apt-get install failed for: ${need_apt[*]}"
fi

cd "$FOLDFOLIO_ROOT"
stamp="node_modules/.foldfolio-lock-sha"
want="$(sha256sum package-lock.json | cut -d' ' -f1)"
if [ ! -d node_modules ] || [ "$(cat "$stamp" 2>/dev/null)" != "$want" ]; then
  log "installing npm packages (npm ci)"
  npm ci --no-audit --no-fund --loglevel=error
  echo "$want" > "$stamp"
fi
