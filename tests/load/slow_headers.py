#!/usr/bin/python3
# SPDX-License-Identifier: BSD-3-Clause
# slow_headers.py: 32 connections from 127.0.0.1 each sending one header
# line every 5 s and never finishing (the per-address limit is 32); a
# /status probe from the same address must succeed within 25 s, and the
# slow connections must have been closed by the daemon.  Bounded: 40 s.
# usage: slow_headers.py MOONRANGE_BINARY
import os
import re
import socket
import subprocess
import sys
import tempfile
import time

BIN = sys.argv[1]
tmp = tempfile.mkdtemp(prefix="moonrange-slow-")
db = os.path.join(tmp, "db")
subprocess.run([BIN, "init", "--db", db], check=True, stdout=subprocess.DEVNULL)
err = open(os.path.join(tmp, "err"), "w")
srv = subprocess.Popen([BIN, "serve", "--db", db, "--listen", "127.0.0.1:0",
                        "--log-level", "error"], stdout=subprocess.PIPE,
                       stderr=err, text=True)
port = int(re.search(r":(\d+)/$", srv.stdout.readline().strip()).group(1))


def probe():
    try:
        s = socket.create_connection(("127.0.0.1", port), timeout=3)
        s.sendall(b"GET /api/v1/status HTTP/1.1\r\nHost: 127.0.0.1\r\n"
                  b"Connection: close\r\n\r\n")
        data = s.recv(64)
        s.close()
        return data.startswith(b"HTTP/1.1 200")
    except OSError:
        return False


slow = []
for i in range(32):
    c = socket.create_connection(("127.0.0.1", port), timeout=5)
    c.sendall(b"GET /api/v1/status HTTP/1.1\r\n")
    slow.append(c)
t0 = time.monotonic()
ok_at = None
closed = 0
while time.monotonic() - t0 < 25:
    for c in list(slow):
        try:
            c.sendall(b"X-Slow: %d\r\n" % int(time.monotonic()))
        except OSError:
            slow.remove(c)
            closed += 1
    if probe():
        ok_at = time.monotonic() - t0
        break
    time.sleep(5)
for c in slow:
    c.close()
srv.terminate()
srv.wait(timeout=30)
subprocess.run(["rm", "-rf", tmp])
if ok_at is None:
    sys.exit("FAIL: no /status probe succeeded in 25 s while 32 slow-header "
             "connections were open")
print("slow_headers: a /status probe succeeded after %.1f s (%d of 32 slow "
      "connections closed by then)" % (ok_at, closed))
