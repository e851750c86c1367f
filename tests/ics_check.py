# SPDX-License-Identifier: BSD-3-Clause
# ics_check.py: parse moonrange's iCalendar with Debian's python3-icalendar
# (an independent RFC 5545 parser) and check it against the JSON of the
# same query: one event per window, same start and end, stable UIDs.
# Usage: /usr/bin/python3 ics_check.py FILE.ics FILE.json
import datetime
import json
import sys

import icalendar


def utc(text):
    return datetime.datetime.strptime(text, "%Y-%m-%dT%H:%M:%SZ").replace(
        tzinfo=datetime.timezone.utc)


def main():
    raw = open(sys.argv[1], "rb").read()
    plan = json.load(open(sys.argv[2]))
    assert b"\n" not in raw.replace(b"\r\n", b""), "bare LF in the file"
    for line in raw.split(b"\r\n"):
        assert len(line) <= 75, "line longer than 75 octets: %r" % line
    cal = icalendar.Calendar.from_ical(raw)
    assert cal.name == "VCALENDAR"
    assert str(cal["VERSION"]) == "2.0"
    assert "moonrange" in str(cal["PRODID"])
    events = [c for c in cal.walk() if c.name == "VEVENT"]
    windows = plan["windows"]
    assert len(events) == len(windows), (len(events), len(windows))
    uids = set()
    for ev, w in zip(events, windows):
        start = ev.decoded("DTSTART")
        end = ev.decoded("DTEND")
        assert start.utcoffset() == datetime.timedelta(0), "not UTC"
        # JSON times are rounded to the second, so is iCalendar.
        assert abs((start - utc(w["start"])).total_seconds()) <= 1, (
            start, w["start"])
        assert abs((end - utc(w["end"])).total_seconds()) <= 1, (
            end, w["end"])
        uid = str(ev["UID"])
        assert uid.startswith(w["target"] + "-"), uid
        assert uid not in uids, "duplicate UID " + uid
        uids.add(uid)
        desc = str(ev["DESCRIPTION"])
        assert "score" in desc and "coverage weight" in desc, desc
        assert ev.decoded("DTSTAMP").utcoffset() == datetime.timedelta(0)
    print("ics ok: %d events" % len(events))


main()
