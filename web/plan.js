// SPDX-License-Identifier: BSD-3-Clause
// plan.js: the night-plan panel: the run now and the next runs from
// /api/v1/plan, the night's timeline (/api/v1/plan.svg), and a field that
// adds a blackout.  Every value is inserted with textContent.
"use strict";

(function () {
  const EVERY_MS = 60000;
  const TOKEN_KEY = "moonrange.token";
  let zone = "UTC";

  function $(id) { return document.getElementById(id); }

  function setText(id, text) { $(id).textContent = text; }

  function hhmm(iso, tz) {
    const d = new Date(Date.parse(iso));
    if (isNaN(d.getTime())) return "–";
    try {
      return new Intl.DateTimeFormat("en-GB", {
        timeZone: tz, hour: "2-digit", minute: "2-digit", hour12: false
      }).format(d);
    } catch (e) {
      return d.toISOString().slice(11, 16);
    }
  }

  function when(iso) {
    return hhmm(iso, zone) + " (" + hhmm(iso, "UTC") + " UTC)";
  }

  async function getJson(path) {
    const r = await fetch(path, { headers: { "Accept": "application/json" } });
    let body = null;
    try { body = await r.json(); } catch (e) { body = null; }
    if (!r.ok) {
      throw new Error(body && body.error ? body.error.message : r.statusText);
    }
    return body;
  }

  function nowIso() {
    return new Date().toISOString().slice(0, 19) + "Z";
  }

  async function showNow(run, at) {
    setText("plan-now-target", run ? run.target : "nothing to range");
    if (!run) {
      setText("plan-now-detail", "");
      return;
    }
    let detail = "until " + when(run.end);
    try {
      const now = await getJson("/api/v1/now?at=" + at);
      const t = (now.targets || []).find(function (x) {
        return x.id === run.target;
      });
      if (t) {
        detail += " · elevation " + t.el_deg.toFixed(1) + "° · azimuth " +
          t.az_deg.toFixed(1) + "°";
      }
    } catch (e) { /* the run is shown without its pointing */ }
    setText("plan-now-detail", detail);
    setText("plan-now-why", run.reasons && run.reasons.length ?
      run.reasons[0] : "");
  }

  function showNext(runs) {
    const list = $("plan-next-list");
    list.textContent = "";
    runs.slice(0, 4).forEach(function (r) {
      const li = document.createElement("li");
      li.textContent = r.target + " " + when(r.start) + "–" +
        hhmm(r.end, zone) + " · " + r.expected_normal_points.toFixed(1) +
        " NP · value " + r.value.toFixed(3);
      list.appendChild(li);
    });
    if (runs.length === 0) {
      const li = document.createElement("li");
      li.textContent = "no further run tonight";
      list.appendChild(li);
    }
  }

  async function loadPlan() {
    const at = nowIso();
    try {
      const p = await getJson("/api/v1/plan?at=" + at);
      const t = Date.parse(at);
      const runs = p.runs || [];
      const current = runs.find(function (r) {
        return Date.parse(r.start) <= t && t < Date.parse(r.end);
      });
      const next = runs.filter(function (r) { return Date.parse(r.start) > t; });
      zone = p.time_zone || "UTC";
      await showNow(current || null, at);
      showNext(next);
      if (runs.length === 0) {
        setText("plan-summary", "Nothing can be ranged: " +
          (p.why_empty || "no window tonight") + ".");
      } else {
        setText("plan-summary", runs.length + " runs on " +
          p.targets_visited + " targets · " +
          p.expected_normal_points.toFixed(1) +
          " normal points expected · value " + p.total_value.toFixed(3) +
          " (greedy " + p.greedy_value.toFixed(3) + ")");
      }
      $("plan-timeline").src = "/api/v1/plan.svg?at=" + at;
    } catch (e) {
      setText("plan-summary", "plan not available: " + e.message);
    }
  }

  function token() {
    let t = null;
    try { t = sessionStorage.getItem(TOKEN_KEY); } catch (e) { t = null; }
    return t || $("b-token").value.trim();
  }

  async function addBlackout(ev) {
    ev.preventDefault();
    const until = $("b-until").value;
    const end = until ? new Date(until + "Z") : null;
    if (!end || isNaN(end.getTime())) {
      setText("b-status", "give the end of the blackout (UTC)");
      return;
    }
    const body = {
      start_utc: nowIso(),
      end_utc: end.toISOString().slice(0, 19) + "Z",
      reason: $("b-reason").value
    };
    try {
      const r = await fetch("/api/v1/blackouts", {
        method: "POST",
        headers: {
          "Content-Type": "application/json",
          "Authorization": "Bearer " + token()
        },
        body: JSON.stringify(body)
      });
      const j = await r.json().catch(function () { return null; });
      if (!r.ok) {
        setText("b-status", "refused: " + (j && j.error ?
          j.error.message : r.statusText));
        return;
      }
      setText("b-status", "blackout " + j.id + " until " + when(j.end_utc) +
        "; re-planned");
      await loadPlan();
    } catch (e) {
      setText("b-status", "not sent: " + e.message);
    }
  }

  function start() {
    let have = false;
    try { have = !!sessionStorage.getItem(TOKEN_KEY); } catch (e) { have = false; }
    $("b-token-row").hidden = have;
    $("blackout-form").addEventListener("submit", addBlackout);
    // An attempt logged on this page changes the plan: fetch it again.
    const log = $("log-form");
    if (log) {
      log.addEventListener("submit", function () {
        setTimeout(loadPlan, 1500);
      });
    }
    loadPlan();
    setInterval(loadPlan, EVERY_MS);
  }

  document.addEventListener("DOMContentLoaded", start);
})();
