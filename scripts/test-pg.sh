#!/usr/bin/env bash
# The API tests against a real PostgreSQL server (`npm run test:pg`). Starts a throw-away
# cluster of Debian's postgresql under a temporary folder on a free loopback port, points
# DATABASE_URL at it (each test file then gets a database of its own, see
# tests/support/test-app.ts), runs the api project and removes the cluster on exit.
# Extra arguments go to vitest, e.g. `npm run test:pg -- tests/api/orders.test.ts`.
set -euo pipefail
cd "$(dirname "$0")/.."

pg_bin="${PG_BIN:-$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1)}"
if [ -z "$pg_bin" ] || [ ! -x "$pg_bin/initdb" ]; then
  echo "PostgreSQL is not installed; install Debian's package: apt-get install -y postgresql" >&2
  exit 1
fi

cluster="$(mktemp -d "${TMPDIR:-/tmp}/underfoot-pg.XXXXXX")"
# The server refuses to run as root: run it as the postgres user, which must own the folder.
as_postgres=()
if [ "$(id -u)" = 0 ]; then
  chown postgres: "$cluster"
  as_postgres=(runuser -u postgres --)
fi

stop_cluster() {
  if [ -f "$cluster/data/postmaster.pid" ]; then
    "${as_postgres[@]}" "$pg_bin/pg_ctl" -D "$cluster/data" -m immediate -w stop >/dev/null 2>&1 || true
  fi
  rm -rf "$cluster"
}
trap stop_cluster EXIT
trap 'exit 130' INT TERM

port="$(node -e "const s = require('node:net').createServer(); s.listen(0, '127.0.0.1', () => { console.log(s.address().port); s.close(); });")"

# Trust on loopback is safe only because the cluster lives for this run; C.UTF-8 is the one UTF-8 locale a bare Debian has.
"${as_postgres[@]}" "$pg_bin/initdb" -D "$cluster/data" -U underfoot --auth=trust --encoding=UTF8 --locale=C.UTF-8 >"$cluster/initdb.log"
# Durability settings are off: the data is thrown away, and the tests wait on every commit.
"${as_postgres[@]}" "$pg_bin/pg_ctl" -D "$cluster/data" -l "$cluster/server.log" -w -t 60 \
  -o "-c listen_addresses=127.0.0.1 -c port=$port -c unix_socket_directories=$cluster -c fsync=off -c synchronous_commit=off -c full_page_writes=off" \
  start >/dev/null

export DATABASE_URL="postgres://underfoot@127.0.0.1:$port/postgres"
echo "--- api tests on PostgreSQL $("$pg_bin/postgres" --version | awk '{print $3}') (127.0.0.1:$port)"
status=0
npx vitest run --project api "$@" || status=$?
if [ "$status" -ne 0 ] && [ -s "$cluster/server.log" ]; then
  echo "--- PostgreSQL server log (errors)"
  grep -E 'ERROR|FATAL|PANIC' "$cluster/server.log" | tail -n 40 || true
fi
exit "$status"
