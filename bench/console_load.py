#!/usr/bin/env python3
"""Bounded load on the station console's JSON API (`scaleproof serve`, docs/console.md).

  bench/console_load.py --scaleproof BIN [--work DIR] [--clients 8] [--requests 500]

Starts `scaleproof demo --out WORK/demo` (a store with the demo's rigs and scale), then
`scaleproof serve --listen 127.0.0.1:0 --db WORK/demo/store.db`, and runs --clients threads,
each sending --requests requests over its own keep-alive connection (stdlib http.client) in
cycles like an operator's: open a session (POST /api/sessions), then for each of the four passes
of data-demo/sessions/01-pickup-travel-trailer.json: key it (POST /api/sessions/ID/passes) and
read the desk's result (GET /api/sessions/ID); every tenth request reads the sessions list, the
ledger or the session's plan (once it has the unhitched and hitched passes) instead. A 503 (store busy) is retried after its Retry-After and
counted; any other refusal is an error.
Afterwards: SIGINT stops the server (exit 0 required), `scaleproof check-store` must be clean, and
the store must hold exactly the sessions and passes the server acknowledged (201), none lost and
none doubled (sqlite3 counts by session and ticket).
Prints requests/s, p50/p90/p99 latency overall and per kind, the 503 retries, and the load
average; never asserts a speed (bench/README.md). Exit 0 when every check held.
"""
import argparse
import http.client
import json
import os
import re
import select
import shutil
import signal
import sqlite3
import statistics
import subprocess
import sys
import threading
import time

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(HERE)
START_LINE = re.compile(r"^scaleproof console: http://127\.0\.0\.1:(\d+)/$")
SESSION_FILE = os.path.join(ROOT, "data-demo", "sessions", "01-pickup-travel-trailer.json")
RIG, SCALE = "RA-1", "QX-1"  # data-demo/demo.json: the rig made from that session


def log(msg):
    print(msg, file=sys.stderr, flush=True)


def pct(values, q):
    if not values:
        return float("nan")
    s = sorted(values)
    return s[min(len(s) - 1, max(0, int(round(q / 100.0 * len(s) + 0.5)) - 1))]


class Client(threading.Thread):
    def __init__(self, n, port, requests, passes, barrier):
        super().__init__(daemon=True)
        self.n, self.port, self.requests, self.passes = n, port, requests, passes
        self.barrier = barrier
        self.lat = {}  # kind -> [seconds]
        self.retries = 0
        self.errors = []
        self.sessions = {}  # session id -> tickets acknowledged
        self.done = 0

    def call(self, conn, method, path, body=None):
        data = json.dumps(body).encode() if body is not None else None
        headers = {"Content-Type": "application/json"} if data is not None else {}
        while True:
            t0 = time.perf_counter()
            try:
                conn.request(method, path, body=data, headers=headers)
                r = conn.getresponse()
                payload = r.read()
            except (http.client.HTTPException, OSError):
                # The server may close a keep-alive connection between requests: reconnect
                # once; a request that got no answer is not counted as acknowledged.
                conn.close()
                conn.connect()
                conn.request(method, path, body=data, headers=headers)
                r = conn.getresponse()
                payload = r.read()
            dt = time.perf_counter() - t0
            if r.status == 503:
                self.retries += 1
                time.sleep(min(float(r.getheader("Retry-After", "1") or 1), 2.0))
                continue
            return r.status, payload, dt

    def run(self):
        conn = http.client.HTTPConnection("127.0.0.1", self.port, timeout=60)
        self.barrier.wait()
        session, step, cycle = None, 0, 0
        while self.done < self.requests:
            if session is None:
                kind = "open"
                status, payload, dt = self.call(conn, "POST", "/api/sessions",
                                                {"rig": RIG, "scale": SCALE,
                                                 "label": "load %d-%d" % (self.n, cycle)})
                if status == 201:
                    session = json.loads(payload)["id"]
                    self.sessions[session] = []
                    step = 0
            elif self.done % 10 == 9:
                kind = ("list", "ledger", "plan")[cycle % 3]
                if kind == "plan" and len(self.sessions[session]) < 2:
                    kind = "list"  # a plan needs the unhitched and the hitched pass
                path = {"list": "/api/sessions", "ledger": "/api/ledger",
                        "plan": "/api/sessions/%s/plan" % session}[kind]
                status, payload, dt = self.call(conn, "GET", path)
            elif step % 2 == 0:
                kind = "pass"
                p = dict(self.passes[step // 2])
                p["ticket"] = "L%d-%d-%d" % (self.n, cycle, step // 2)
                body = {k: v for k, v in p.items() if v is not None}
                status, payload, dt = self.call(conn, "POST", "/api/sessions/%s/passes" % session,
                                                body)
                if status == 201:
                    self.sessions[session].append(p["ticket"])
                step += 1
            else:
                kind = "desk"
                status, payload, dt = self.call(conn, "GET", "/api/sessions/%s" % session)
                step += 1
                if step == 2 * len(self.passes):
                    session, cycle = None, cycle + 1
            want = 201 if kind in ("open", "pass") else 200
            if status != want:
                self.errors.append("%s: HTTP %d %s" % (kind, status, payload[:300]))
                if kind == "open":
                    break  # nothing to key into
            self.lat.setdefault(kind, []).append(dt)
            self.done += 1
        conn.close()


def main():
    ap = argparse.ArgumentParser(description="console load (see the file's header)")
    ap.add_argument("--scaleproof", default=os.path.join(ROOT, "build-bench", "scaleproof"))
    ap.add_argument("--work", default=os.path.join(ROOT, "build-bench", "console-load"))
    ap.add_argument("--clients", type=int, default=8)
    ap.add_argument("--requests", type=int, default=500)
    args = ap.parse_args()
    sp = os.path.abspath(args.scaleproof)
    if os.path.exists(args.work):
        shutil.rmtree(args.work)
    os.makedirs(args.work)
    demo = os.path.join(args.work, "demo")
    subprocess.run([sp, "demo", "--out", demo], check=True, stdout=subprocess.DEVNULL)
    db = os.path.join(demo, "store.db")
    with open(SESSION_FILE, encoding="utf-8") as f:
        passes = [{k: p.get(k) for k in ("kind", "setting", "weighed_at", "steer", "drive",
                                        "trailer")} for p in json.load(f)["passes"]]
    base_sessions, base_passes = counts(db)

    err = open(os.path.join(args.work, "serve.stderr"), "w")
    server = subprocess.Popen([sp, "serve", "--listen", "127.0.0.1:0", "--db", db],
                              stdout=subprocess.PIPE, stderr=err, text=True)
    ok = True
    try:
        ready, _, _ = select.select([server.stdout], [], [], 20)
        line = server.stdout.readline().rstrip("\n") if ready else ""
        m = START_LINE.match(line)
        if not m:
            raise SystemExit("console_load: no start-up line from serve (got %r)" % line)
        port = int(m.group(1))
        barrier = threading.Barrier(args.clients + 1)
        clients = [Client(n, port, args.requests, passes, barrier) for n in range(args.clients)]
        for c in clients:
            c.start()
        load0 = os.getloadavg()
        barrier.wait()
        t0 = time.perf_counter()
        for c in clients:
            c.join()
        wall = time.perf_counter() - t0
        load1 = os.getloadavg()
    finally:
        server.send_signal(signal.SIGINT)
        try:
            rc = server.wait(timeout=30)
        except subprocess.TimeoutExpired:
            server.kill()
            rc = "killed after 30 s"
        err.close()
    if rc != 0:
        log("console_load: serve exited %s after SIGINT" % rc)
        ok = False

    errors = [e for c in clients for e in c.errors]
    for e in errors[:10]:
        log("console_load: " + e)
    if errors:
        ok = False
    check = subprocess.run([sp, "check-store", "--db", db], capture_output=True, text=True)
    if check.returncode != 0:
        log("console_load: check-store failed:\n" + check.stdout + check.stderr)
        ok = False

    # No lost, no doubled row: the store against what the server acknowledged.
    acked = {s: t for c in clients for s, t in c.sessions.items()}
    n_sessions, n_passes = counts(db)
    con = sqlite3.connect("file:%s?mode=ro" % db, uri=True)
    doubled = con.execute("SELECT count(*) FROM (SELECT session_id, ticket FROM passes "
                          "GROUP BY session_id, ticket HAVING count(*) > 1)").fetchone()[0]
    stored = {}
    for sid, ticket in con.execute("SELECT session_id, ticket FROM passes"):
        stored.setdefault(sid, []).append(ticket)
    con.close()
    lost = sum(1 for s, t in acked.items() for x in t if x not in stored.get(s, []))
    extra = sum(1 for s, t in stored.items() if s in acked for x in t if x not in acked[s])
    want_sessions = base_sessions + len(acked)
    want_passes = base_passes + sum(len(t) for t in acked.values())
    rows_ok = (n_sessions == want_sessions and n_passes == want_passes and doubled == 0
               and lost == 0 and extra == 0)
    if not rows_ok:
        ok = False

    lat = {}
    for c in clients:
        for k, v in c.lat.items():
            lat.setdefault(k, []).extend(v)
    every = [x for v in lat.values() for x in v]
    total = len(every)
    print("console load: %d clients x %d requests on loopback, %d answered in %.2f s" % (
        args.clients, args.requests, total, wall))
    print("  throughput      %.0f requests/s" % (total / wall if wall > 0 else float("nan")))
    print("  latency (ms)    p50 %.1f  p90 %.1f  p99 %.1f  max %.1f" % (
        1000 * pct(every, 50), 1000 * pct(every, 90), 1000 * pct(every, 99),
        1000 * max(every) if every else float("nan")))
    for k in ("open", "pass", "desk", "list", "ledger", "plan"):
        if k in lat:
            print("    %-7s %5d  p50 %6.1f  p99 %6.1f  mean %6.1f" % (
                k, len(lat[k]), 1000 * pct(lat[k], 50), 1000 * pct(lat[k], 99),
                1000 * statistics.mean(lat[k])))
    print("  503 retries     %d" % sum(c.retries for c in clients))
    print("  rows            sessions %d (+%d acknowledged), passes %d (+%d acknowledged); "
          "lost %d, doubled %d, unacknowledged %d: %s" % (
              n_sessions, len(acked), n_passes, want_passes - base_passes, lost, doubled, extra,
              "ok" if rows_ok else "MISMATCH"))
    print("  check-store     %s" % (check.stdout.strip().splitlines()[0] if check.stdout.strip()
                                    else "exit %d" % check.returncode))
    print("  serve exit      %s after SIGINT" % rc)
    print("  load average    %.2f %.2f %.2f before, %.2f %.2f %.2f after (2 cores)" % (
        load0 + load1))
    return 0 if ok else 1


def counts(db):
    con = sqlite3.connect("file:%s?mode=ro" % db, uri=True)
    s = con.execute("SELECT count(*) FROM sessions").fetchone()[0]
    p = con.execute("SELECT count(*) FROM passes").fetchone()[0]
    con.close()
    return s, p


if __name__ == "__main__":
    sys.exit(main())
