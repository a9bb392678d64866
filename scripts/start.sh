#!/usr/bin/env bash
# `npm start`: installs what is missing, starts MariaDB and Redis on loopback (data under var/),
# builds every workspace, then runs the service, which applies the TypeORM migrations, seeds the
# demo data (once) and serves the built UI and the API on one local port.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$FOLDFOLIO_ROOT"

bash scripts/ensure-deps.sh
bash scripts/services.sh start

if (exec 3<>"/dev/tcp/127.0.0.1/$FOLDFOLIO_PORT") 2>/dev/null; then
  die "port $FOLDFOLIO_PORT is already in use (another Foldfolio?). Stop it, or choose another port: FOLDFOLIO_PORT=8090 npm start"
fi

log "building workspaces"
npm run build --silent >/dev/null || { npm run build; die "build failed"; }

log "starting Foldfolio: migrations, demo data, UI + API on http://127.0.0.1:$FOLDFOLIO_PORT"
log "demo sign-in: ada.quarrington@tarnwick.example / foldfolio-demo (admin; see README)"
FOLDFOLIO_SEED_DEMO=1 exec node service/dist/main.js
