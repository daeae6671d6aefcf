#!/usr/bin/env bash
# npm run test:clock: the whole of `npm test` once under each of several fixed studio clocks, so a
# test that only passes at some hours, on some weekdays or away from a clock change shows up here
# rather than on the one evening it fails. Prints one line per clock and exits non-zero if any run
# failed. Each run's output is kept in .data/test-clock/NAME.log, its services' logs in NAME-logs/.
#
# Clocks (studio time, Europe/Helsinki), name|wall time:
#   TEST_CLOCKS="thursday-evening|2027-01-14 20:00:00;nye|2026-12-31 23:30:00" npm run test:clock
#
# How the clock is faked: libfaketime (LD_PRELOAD) with one relative offset, computed here once
# from the wanted start, for every process of the run: the app, the Stripe fake, the mail catcher,
# PostgreSQL, Vitest and Playwright. The clock keeps ticking from that start. A start-at
# ("@YYYY-MM-DD hh:mm:ss") setting is not used because every process would start its own clock
# at that moment when it starts; its shared-memory escape (FAKETIME_DONT_RESET) is not open to
# PostgreSQL, which runs as another user. Monotonic clocks stay real (timers, time-outs and
# PostgreSQL's waits measure real time). One limit, measured: libfaketime reads the real clock
# inside its wrappers of waiting calls (epoll_wait and the like), so a PostgreSQL timeout that falls
# due while a backend waits for a lock (lock_timeout, statement_timeout) is not seen as due; the one
# test that needs lock_timeout skips itself here and runs in every `npm test`. Static checks do not
# depend on the clock and are left to `npm test` (SKIP_STATIC=1). Chromium does not start under libfaketime, so
# playwright.config.ts launches it without the library and the e2e fixture (tests/e2e/support.ts)
# gives each page the run's clock instead.
source "$(dirname "$0")/lib.sh"

ensure_faketime

STUDIO_TZ="Europe/Helsinki"
DEFAULT_CLOCKS="thursday-evening|2027-01-14 20:00:00;sunday-before-midnight|2027-01-17 23:50:00;before-clock-change|2027-03-27 23:20:00;new-years-eve|2026-12-31 23:30:00"
IFS=';' read -r -a CLOCKS <<<"${TEST_CLOCKS:-$DEFAULT_CLOCKS}"

OUT="$ROOT/.data/test-clock"
rm -rf "$OUT"
mkdir -p "$OUT"

# libfaketime keeps a semaphore and a shared-memory segment per process tree in /dev/shm and cannot
# remove them when a process is killed; a stale pair makes a later process with the same id fail.
clean_shm() {
	local f pid
	for f in /dev/shm/faketime_shm_* /dev/shm/sem.faketime_sem_*; do
		[ -e "$f" ] || continue
		pid="${f##*_}"
		kill -0 "$pid" 2>/dev/null || rm -f "$f"
	done
}

SUMMARY=()
FAILED=0
for clock in "${CLOCKS[@]}"; do
	name="${clock%%|*}"
	wall="${clock#*|}"
	target="$(date -d "TZ=\"$STUDIO_TZ\" $wall" +%s)" || die "cannot read the clock $clock"
	offset="$((target - $(date +%s)))"
	log "[$name] the suite at $wall studio time ($STUDIO_TZ), a clock offset of ${offset}s; output in $OUT/$name.log"
	clean_shm
	set +e
	env LD_PRELOAD="$FAKETIME_LIB${LD_PRELOAD:+:$LD_PRELOAD}" \
		FAKETIME="$(printf '%+ds' "$offset")" \
		FAKETIME_DONT_FAKE_MONOTONIC=1 \
		SLATEROOM_CLOCK="$name" \
		SKIP_STATIC="${SKIP_STATIC:-1}" \
		bash "$ROOT/scripts/test.sh" >"$OUT/$name.log" 2>&1
	code=$?
	set -e
	clean_shm
	# The next run starts by emptying the logs folder: keep this run's service logs (the app's above
	# all: a crash is only explained there).
	[ -d "$ROOT/.data/test-logs" ] && cp -r "$ROOT/.data/test-logs" "$OUT/$name-logs"
	line="$(grep -aE '^slateroom: [0-9]+ passed' "$OUT/$name.log" | tail -n 1 || true)"
	[ -n "$line" ] || line="no test summary (see the log)"
	if [ "$code" != "0" ]; then
		FAILED=1
		SUMMARY+=("FAIL  $name ($wall): $line")
		grep -aE '^\s+(×|✘|FAIL)|✘ ' "$OUT/$name.log" | head -n 20 || true
	else
		SUMMARY+=("ok    $name ($wall): $line")
	fi
	log "${SUMMARY[-1]}"
done

log "test:clock, studio time $STUDIO_TZ:"
printf '  %s\n' "${SUMMARY[@]}"
exit "$FAILED"
