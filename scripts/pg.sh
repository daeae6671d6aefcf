#!/usr/bin/env bash
# scripts/pg.sh start|stop|status NAME PORT: the project's PostgreSQL clusters by name
# ("main" for npm start, "test" for npm test).
source "$(dirname "$0")/lib.sh"
cmd="${1:?start|stop|status}"
name="${2:-main}"
port="${3:-5433}"
ensure_postgres_binaries
case "$cmd" in
start) pg_start "$name" "$port" ;;
stop) pg_stop "$(pg_data_dir "$name")" ;;
status) as_pg "$PG_BIN/pg_ctl" -D "$(pg_data_dir "$name")" status ;;
*) die "unknown command $cmd" ;;
esac
