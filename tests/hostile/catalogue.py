#!/usr/bin/python3
# SPDX-License-Identifier: BSD-3-Clause
# catalogue.py: the hostile-input catalogue, run against a real
# "moonrange serve" on 127.0.0.1 (raw sockets, so that malformed requests
# reach the server as written).  Each row: the request, the status it
# must get.  Then: every error body is valid UTF-8 JSON with an error
# code, nothing was stored, the server still answers, and the texts an
# accepted write brings back (CSV export, iCalendar, JSON) are escaped.
# usage: catalogue.py MOONRANGE_BINARY
import json
import os
import re
import socket
import sqlite3
import subprocess
import sys
import tempfile
import time

BIN = sys.argv[1]
tmp = tempfile.mkdtemp(prefix="moonrange-hostile-")
db = os.path.join(tmp, "db")
token = "hostile-catalogue-token-0123456789"
with open(os.path.join(tmp, "token"), "w") as f:
    f.write(token + "\n")
os.chmod(os.path.join(tmp, "token"), 0o600)
subprocess.run([BIN, "init", "--db", db], check=True, stdout=subprocess.DEVNULL)
# A target whose name carries iCalendar and CSV specials, and markup.
subprocess.run([BIN, "target", "add", "--db", db,
                "--name", 'Wren; <b>"odd"</b>, back\\slash',
                "--lat", "5", "--lon", "5", "WREN"], check=True,
               stdout=subprocess.DEVNULL)
err = open(os.path.join(tmp, "err"), "w")
srv = subprocess.Popen([BIN, "serve", "--db", db, "--listen", "127.0.0.1:0",
                        "--token-file", os.path.join(tmp, "token"),
                        "--refresh", "600"], stdout=subprocess.PIPE,
                       stderr=err, text=True)
line = srv.stdout.readline()
m = re.search(r":(\d+)/$", line.strip())
if not m:
    sys.exit("FAIL: the daemon did not start: %r" % line)
PORT = int(m.group(1))


def raw(data, timeout=20):
    """Send bytes as written; return (status, headers, body)."""
    s = socket.create_connection(("127.0.0.1", PORT), timeout=timeout)
    try:
        s.sendall(data)
        s.shutdown(socket.SHUT_WR)
    except OSError:
        pass  # the server answered (and closed) before the whole request
    out = b""
    while True:
        try:
            chunk = s.recv(65536)
        except (socket.timeout, ConnectionResetError):
            break
        if not chunk:
            break
        out += chunk
    s.close()
    head, _, body = out.partition(b"\r\n\r\n")
    st = re.match(rb"HTTP/1\.[01] (\d{3})", head)
    return (int(st.group(1)) if st else 0), head, body


def req(method, path, body=None, auth=True, ctype="application/json",
        extra=b""):
    h = b"%s %s HTTP/1.1\r\nHost: 127.0.0.1\r\nConnection: close\r\n" % (
        method.encode(), path if isinstance(path, bytes) else path.encode())
    if auth:
        h += b"Authorization: Bearer " + token.encode() + b"\r\n"
    if body is not None:
        if isinstance(body, str):
            body = body.encode()
        if ctype:
            h += b"Content-Type: " + ctype.encode() + b"\r\n"
        h += b"Content-Length: %d\r\n" % len(body)
    h += extra + b"\r\n"
    return raw(h + (body or b""))


def att(**kw):
    a = {"target": "HERON", "start_utc": "2027-01-10T03:00:00Z",
         "end_utc": "2027-01-10T03:10:00Z", "shots": 11000, "returns": 10,
         "normal_points": 1, "outcome": "ranged", "operator": "op"}
    for k, v in kw.items():
        if v is None:
            a.pop(k, None)
        else:
            a[k] = v
    return json.dumps(a, ensure_ascii=False)


P = "/api/v1/attempts"
# (name, method, path, body, expected status, options)
CASES = [
    # --- defect 2: bytes that are not UTF-8 in what an error quotes
    ("query key 0x8E", "GET", b"/api/v1/status?%8E=1", None, 400, {}),
    ("path 0xFF", "GET", b"/api/v1/%FF", None, 404, {}),
    ("query value cut 2-byte", "GET", b"/api/v1/windows?days=" + b"9" * 40 +
     b"%C3%A9", None, 400, {}),
    ("body \\u0 then raw bytes", "POST", P, b'{"notes":"\\u0\xff\xfe', 400,
     {}),
    ("body raw 0xFF in string", "POST", P, att(notes="x").replace(
        '"x"', '"\xff"').encode("latin-1"), 400, {}),
    ("unknown member non-UTF-8", "POST", P, b'{"\xc3":1}', 400, {}),
    ("unknown member control", "POST", P, b'{"a\\u0007b":1}', 400, {}),
    # --- defect 3/4: one validation
    ("np > returns", "POST", P, att(normal_points=11), 400, {}),
    ("operator tab", "POST", P, att(operator="a\tb"), 400, {}),
    ("operator newline", "POST", P, att(operator="a\nb"), 400, {}),
    ("operator DEL", "POST", P, att(operator="a\x7fb"), 400, {}),
    ("operator C1", "POST", P, att(operator="a\x85b"), 400, {}),
    ("operator RLO", "POST", P, att(operator="a\u202eb"), 400, {}),
    ("operator LRI", "POST", P, att(operator="a\u2066b"), 400, {}),
    ("notes ESC", "POST", P, att(notes="\x1b[31m"), 400, {}),
    ("notes PDF", "POST", P, att(notes="x\u202c"), 400, {}),
    ("seeing 0.001", "POST", P, att(seeing_arcsec=0.001), 400, {}),
    ("seeing 61", "POST", P, att(seeing_arcsec=61), 400, {}),
    ("seeing string", "POST", P, att(seeing_arcsec="1"), 400, {}),
    ("1e6 returns from 10", "POST", P, att(shots=10, returns=1000000,
                                            normal_points=0), 400, {}),
    ("1e12 shots", "POST", P, att(shots=10**12), 400, {}),
    ("no_returns with 500", "POST", P, att(outcome="no_returns",
                                           returns=500, normal_points=0),
     400, {}),
    ("ranged with 0 shots", "POST", P, att(shots=0, returns=0,
                                           normal_points=0), 400, {}),
    ("start 2126", "POST", P, att(start_utc="2126-01-10T03:00:00Z",
                                  end_utc="2126-01-10T03:10:00Z"), 400, {}),
    ("start 1858", "POST", P, att(start_utc="1858-01-10T03:00:00Z",
                                  end_utc="1858-01-10T03:10:00Z"), 400, {}),
    ("end before start", "POST", P, att(end_utc="2027-01-10T02:00:00Z"),
     400, {}),
    ("longer than a day", "POST", P, att(end_utc="2027-01-12T03:00:00Z"),
     400, {}),
    ("leap second not there", "POST", P,
     att(start_utc="2017-06-30T23:59:60Z"), 400, {}),
    ("shots negative", "POST", P, att(shots=-1), 400, {}),
    ("shots float", "POST", P, att(shots=1.5), 400, {}),
    ("shots string", "POST", P, att(shots="10"), 400, {}),
    ("shots huge", "POST", P, att(shots=10**30), 400, {}),
    ("returns null", "POST", P, att(returns=None), 400, {}),
    ("outcome unknown", "POST", P, att(outcome="maybe"), 400, {}),
    ("outcome array", "POST", P, att(outcome=["ranged"]), 400, {}),
    ("target unknown", "POST", P, att(target="NOPE"), 400, {}),
    ("target injection", "POST", P, att(target="HERON' OR '1'='1"), 400,
     {}),
    ("target too long", "POST", P, att(target="H" * 200), 400, {}),
    ("operator too long", "POST", P, att(operator="o" * 200), 400, {}),
    ("notes too long", "POST", P, att(notes="n" * 600), 400, {}),
    ("operator empty", "POST", P, att(operator=""), 400, {}),
    ("time without zone", "POST", P, att(start_utc="2027-01-10T03:00:00"),
     400, {}),
    ("time 25h", "POST", P, att(start_utc="2027-01-10T25:00:00Z"), 400, {}),
    ("time Feb 30", "POST", P, att(start_utc="2027-02-30T03:00:00Z"), 400,
     {}),
    ("duplicate member", "POST", P,
     b'{"target":"HERON","target":"TERN"}', 400, {}),
    ("body array", "POST", P, b"[]", 400, {}),
    ("body empty", "POST", P, b"", 400, {}),
    ("body not JSON", "POST", P, b"target=HERON", 400, {}),
    ("body nested deep", "POST", P, b"[" * 5000 + b"]" * 5000, 400, {}),
    ("body NUL inside", "POST", P, b'{"operator":"a\\u0000b"}', 400, {}),
    ("body too large", "POST", P, b"{" + b" " * 70000 + b"}", 413, {}),
    ("wrong content type", "POST", P, att(), 415, {"ctype": "text/plain"}),
    ("no token", "POST", P, att(), 401, {"auth": False}),
    ("bad token", "POST", P, att(), 401,
     {"auth": False, "extra": b"Authorization: Bearer nope\r\n"}),
    ("token in query", "POST", P + "?token=" + token, att(), 400,
     {"auth": False}),
    # --- query strings of the routes
    ("windows days=abc", "GET", "/api/v1/windows?days=abc", None, 400, {}),
    ("windows days=0x10", "GET", "/api/v1/windows?days=0x10", None, 400, {}),
    ("windows days=nan", "GET", "/api/v1/windows?days=nan", None, 400, {}),
    ("windows days=1e999", "GET", "/api/v1/windows?days=1e999", None, 400,
     {}),
    ("windows days=-1", "GET", "/api/v1/windows?days=-1", None, 400, {}),
    ("windows from garbage", "GET", "/api/v1/windows?from=yesterday", None,
     400, {}),
    ("windows unknown param", "GET", "/api/v1/windows?evil=1", None, 400, {}),
    ("windows 17 params", "GET", "/api/v1/windows?" + "&".join(
        "a%d=1" % i for i in range(17)), None, 400, {}),
    ("now at garbage", "GET", "/api/v1/now?at=%00", None, 400, {}),
    ("phases days huge", "GET", "/api/v1/phases?days=99999999", None, 400,
     {}),
    ("coverage bins=1", "GET", "/api/v1/coverage?bins=1", None, 400, {}),
    ("coverage.svg theme", "GET", "/api/v1/coverage.svg?theme=<x>", None,
     400, {}),
    ("attempts limit -1", "GET", "/api/v1/attempts?limit=-1", None, 400, {}),
    ("attempts order", "GET", "/api/v1/attempts?order=random", None, 400,
     {}),
    ("attempt id text", "GET", "/api/v1/attempts/abc", None, 404, {}),
    ("attempt id huge", "GET", "/api/v1/attempts/99999999999999999999",
     None, 404, {}),
    ("attempt id missing", "GET", "/api/v1/attempts/424242", None, 404, {}),
    # --- paths and methods
    ("path NUL", "GET", b"/api/v1/status%00.html", None, 404, {}),
    ("path traversal", "GET", b"/../../etc/passwd", None, 404, {}),
    ("path encoded traversal", "GET", b"/%2e%2e/%2e%2e/etc/passwd", None,
     404, {}),
    ("DELETE attempts", "DELETE", P, None, 405, {}),
    ("PUT status", "PUT", "/api/v1/status", b"{}", 405, {}),
    ("unknown route", "GET", "/api/v2/status", None, 404, {}),
    ("Host of another site", "GET", "/api/v1/status", None, 400,
     {"host": b"evil.example"}),
    ("second Host header", "GET", "/api/v1/status", None, 400,
     {"auth": False, "extra": b"Host: evil.example\r\n"}),
    ("Content-Length and chunked", "POST", P, att(), 400,
     {"extra": b"Transfer-Encoding: chunked\r\n"}),
]

before = sqlite3.connect(db).execute("SELECT count(*) FROM attempts").fetchone()[0]
failures = []
for name, method, path, body, want, opt in CASES:
    if "host" in opt:
        st, head, rb = raw(b"GET %s HTTP/1.1\r\nHost: %s\r\nConnection: "
                           b"close\r\n\r\n" % (path.encode(), opt["host"]))
    else:
        st, head, rb = req(method, path, body, auth=opt.get("auth", True),
                           ctype=opt.get("ctype", "application/json"),
                           extra=opt.get("extra", b""))
    if st != want:
        failures.append("%s: status %d, want %d: %r" % (name, st, want,
                                                        rb[:200]))
        continue
    if st >= 400 and path != b"/../../etc/passwd" and rb:
        try:
            j = json.loads(rb.decode("utf-8"))
            assert isinstance(j["error"]["code"], str)
            assert isinstance(j["error"]["message"], str)
        except Exception as e:  # noqa: BLE001
            if b"application/json" in head:
                failures.append("%s: error body not UTF-8 JSON (%s): %r" %
                                (name, e, rb[:200]))
after = sqlite3.connect(db).execute("SELECT count(*) FROM attempts").fetchone()[0]
if after != before:
    failures.append("%d rows were stored by refused requests" % (after - before))

# Alive afterwards.
st, _, _ = req("GET", "/api/v1/status", auth=False)
if st != 200:
    failures.append("/status after the catalogue: %d" % st)

# Accepted texts come back escaped: JSON, CSV export, iCalendar.
odd = 'O\'Brien, "the <b>night</b>" & co'
st, _, rb = req("POST", P, att(operator=odd, notes='line 1\nline "2", <i>',
                               start_utc="2027-01-11T03:00:00Z",
                               end_utc="2027-01-11T03:10:00Z"))
if st != 201:
    failures.append("escape check: POST %d %r" % (st, rb[:200]))
else:
    if json.loads(rb)["operator"] != odd:
        failures.append("JSON did not carry the operator back unchanged")
    csv = subprocess.run([BIN, "log", "export", "--db", db], check=True,
                         capture_output=True, text=True).stdout
    if '"O\'Brien, ""the <b>night</b>"" & co"' not in csv:
        failures.append("CSV export: operator not quoted")
    if '"line 1\nline ""2"", <i>"' not in csv:
        failures.append("CSV export: notes not quoted")
st, _, ics = req("GET", "/api/v1/windows.ics?days=30", auth=False)
ics = ics.decode("utf-8")
if st != 200:
    failures.append("windows.ics: %d" % st)
elif "WREN" in ics or "Wren" in ics:
    for ln in ics.split("\r\n"):
        if "Wren" in ln and ("Wren\\;" not in ln or "\\," not in ln):
            failures.append("iCalendar: name not escaped: %r" % ln)
st, _, rb = req("GET", "/api/v1/targets", auth=False)
if 'Wren; <b>\\"odd\\"</b>, back\\\\slash' not in rb.decode():
    failures.append("targets JSON: name not escaped: %r" % rb[:300])

srv.terminate()
rc = srv.wait(timeout=30)
if rc != 0:
    failures.append("exit status %d after SIGTERM" % rc)
err.close()
print("hostile catalogue: %d cases, %d failures" % (len(CASES), len(failures)))
for f in failures:
    print("FAIL: " + f)
subprocess.run(["rm", "-rf", tmp])
sys.exit(1 if failures else 0)
