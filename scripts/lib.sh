# Shared by scripts/start and scripts/test. Source it; do not run it.

# npm ci when node_modules is missing or older than package-lock.json.
ensure_node_deps() {
  local stamp=node_modules/.cluepath-lock-sha
  local want; want="$(sha256sum package-lock.json | cut -d' ' -f1)"
  if [ ! -f "$stamp" ] || [ "$(cat "$stamp")" != "$want" ]; then
    echo "› installing npm packages (npm ci)"
    npm ci --no-audit --no-fund --loglevel=error
    echo "$want" >"$stamp"
  fi
}

# A free TCP port on 127.0.0.1.
free_port() {
  node -e 'const s=require("net").createServer();s.listen(0,"127.0.0.1",()=>{console.log(s.address().port);s.close()})'
}

# Waits until URL answers 200 (ANY=1: any HTTP status), or fails after ~30 s.
wait_for_http() {
  local url="$1"
  for _ in $(seq 1 150); do
    if node -e 'fetch(process.argv[1]).then(r=>process.exit(r.ok||process.env.ANY?0:1),()=>process.exit(1))' "$url"; then return 0; fi
    sleep 0.2
  done
  echo "no answer from $url" >&2
  return 1
}

# Debian's chromium for the browser tests (never a downloaded browser).
ensure_chromium() {
  [ -x /usr/bin/chromium ] && return 0
  if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null; then
    echo "› installing Debian's chromium for the browser tests"
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -qq
    apt-get install -y -qq chromium >/dev/null
  else
    echo "Chromium is needed for the browser tests. Install it with:" >&2
    echo "  sudo apt-get update && sudo apt-get install -y chromium" >&2
    return 1
  fi
}

# The local S3 fake and SMTP catcher (scripts/fakes.ts) in the background; sets fakes_pid.
# Uses S3_PORT, SMTP_PORT, S3_DIR, MAIL_CAPTURE_DIR and exports what the app reads.
start_fakes() {
  export S3_ENDPOINT="http://127.0.0.1:$S3_PORT" SMTP_URL="smtp://127.0.0.1:$SMTP_PORT"
  export S3_DIR MAIL_CAPTURE_DIR S3_PORT SMTP_PORT
  mkdir -p "$S3_DIR" "$MAIL_CAPTURE_DIR"
  node --import tsx scripts/fakes.ts &
  fakes_pid=$!
  for _ in $(seq 1 100); do
    if node -e 'const s=require("net").connect(+process.argv[1],"127.0.0.1");s.on("connect",()=>process.exit(0));s.on("error",()=>process.exit(1))' "$SMTP_PORT" \
      && ANY=1 wait_for_http "$S3_ENDPOINT/" >/dev/null 2>&1; then return 0; fi
    sleep 0.2
  done
  echo "the local S3 fake and mail catcher did not start" >&2
  return 1
}

# A throwaway MariaDB on a free port in a temporary folder, with the S3 fake and SMTP catcher,
# stopped and removed when the calling script exits. Exports DATABASE_URL (the integration tests'
# template), E2E_DATABASE_URL (the browser tests' database) and what start_fakes exports; sets $work.
start_throwaway_services() {
  work="$(mktemp -d "${TMPDIR:-/tmp}/cluepath-test.XXXXXX")"
  export DB_DIR="$work/db"
  export DB_PORT="$(free_port)"
  trap stop_throwaway_services INT TERM EXIT
  # A throwaway server: commits flushed about once a second, not one by one (nothing here outlives it).
  DB_FSYNC=0 DB_NAME=cluepath_test scripts/db start >/dev/null
  export DATABASE_URL="mysql://root@127.0.0.1:$DB_PORT/cluepath_test"
  export E2E_DATABASE_URL="mysql://root@127.0.0.1:$DB_PORT/cluepath_e2e"
  S3_PORT="$(free_port)" SMTP_PORT="$(free_port)" S3_DIR="$work/s3" MAIL_CAPTURE_DIR="$work/mail"
  start_fakes >/dev/null
}

stop_throwaway_services() {
  trap - INT TERM EXIT
  [ -n "${fakes_pid:-}" ] && kill "$fakes_pid" 2>/dev/null && wait "$fakes_pid" 2>/dev/null || true
  scripts/db stop || true
  rm -rf "$work"
}
