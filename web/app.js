// SPDX-License-Identifier: BSD-3-Clause
// app.js: the station page: fetches /api/v1/ and shows it; no planning here.
// Every value from the API or the user is inserted with textContent.
"use strict";

(function () {
  const NOW_EVERY_MS = 5000;
  const LISTS_EVERY_MS = 60000;
  const TOKEN_KEY = "moonrange.token";

  let zone = "UTC";
  let zoneLabel = "Station";

  // --- small DOM helpers ---------------------------------------------------

  function $(id) { return document.getElementById(id); }

  function setText(id, text) { $(id).textContent = text; }

  function cell(text, cls) {
    const td = document.createElement("td");
    td.textContent = text;
    if (cls) td.className = cls;
    return td;
  }

  // A cell whose words never break inside ("2026-12-02", "op-amber" stay
  // whole when a narrow screen wraps the cell).
  function wordsCell(text, cls) {
    const td = document.createElement("td");
    td.className = "words" + (cls ? " " + cls : "");
    text.split(" ").forEach(function (word, i) {
      if (i > 0) td.appendChild(document.createTextNode(" "));
      const span = document.createElement("span");
      span.textContent = word;
      td.appendChild(span);
    });
    return td;
  }

  function emptyRow(tbody, cols, text) {
    const tr = document.createElement("tr");
    const td = cell(text, "empty");
    td.colSpan = cols;
    tr.appendChild(td);
    tbody.replaceChildren(tr);
  }

  function fixed(v, d) {
    return typeof v === "number" && isFinite(v) ? v.toFixed(d) : "–";
  }

  function deg(v, d) {
    const s = fixed(v, d === undefined ? 1 : d);
    return s === "–" ? s : s + "°";
  }

  // --- times: formatting only, in UTC and in the station's zone ------------

  function parseUtc(iso) {
    const t = Date.parse(iso);
    return isNaN(t) ? null : new Date(t);
  }

  function fmtUtc(iso) {
    const d = parseUtc(iso);
    if (!d) return "–";
    return d.toISOString().slice(0, 16).replace("T", " ") + "Z";
  }

  function fmtUtcSeconds(iso) {
    const d = parseUtc(iso);
    if (!d) return "–";
    return d.toISOString().slice(0, 19).replace("T", " ") + "Z";
  }

  function fmtLocal(iso) {
    const d = parseUtc(iso);
    if (!d) return "–";
    try {
      return new Intl.DateTimeFormat("en-US", {
        timeZone: zone, month: "short", day: "2-digit",
        hour: "2-digit", minute: "2-digit", hourCycle: "h23",
        timeZoneName: "short"
      }).format(d);
    } catch (e) {
      return fmtUtc(iso);
    }
  }

  function tickClocks() {
    const d = new Date();
    setText("clock-utc", d.toISOString().slice(11, 19));
    try {
      setText("clock-local", new Intl.DateTimeFormat("en-GB", {
        timeZone: zone, hour: "2-digit", minute: "2-digit",
        second: "2-digit", hour12: false
      }).format(d));
    } catch (e) {
      setText("clock-local", "--:--:--");
    }
  }

  // --- the API ------------------------------------------------------------

  async function getJson(path) {
    const r = await fetch(path, { headers: { "Accept": "application/json" } });
    let body = null;
    try { body = await r.json(); } catch (e) { body = null; }
    if (!r.ok) {
      const msg = body && body.error ? body.error.message : r.statusText;
      const err = new Error(msg);
      err.status = r.status;
      throw err;
    }
    return body;
  }

  // --- station ------------------------------------------------------------

  async function loadSite() {
    try {
      const s = await getJson("/api/v1/site");
      const st = s;
      zone = st.time_zone || "UTC";
      zoneLabel = zone.split("/").pop().replace(/_/g, " ");
      setText("station", st.name + " · " + st.code + " · " +
        fixed(st.lat_deg, 4) + ", " + fixed(st.lon_deg, 4) + ", " +
        fixed(st.height_m, 0) + " m · " + zone);
      setText("clock-local-label", zoneLabel);
    } catch (e) {
      setText("station", "station not available: " + e.message);
    }
  }

  async function loadStatus() {
    try {
      const s = await getJson("/api/v1/status");
      setText("version", s.version);
      setText("plan-note", s.plan && s.plan.last_utc ?
        "plan of " + fmtUtc(s.plan.last_utc) : "no plan yet");
    } catch (e) {
      setText("plan-note", "status not available");
    }
  }

  async function loadTargets() {
    const sel = $("f-target");
    try {
      const t = await getJson("/api/v1/targets");
      const opts = [];
      for (const x of t.targets) {
        if (!x.active) continue;
        const o = document.createElement("option");
        o.value = x.id;
        o.textContent = x.name ? x.id + " — " + x.name : x.id;
        opts.push(o);
      }
      sel.replaceChildren(...opts);
    } catch (e) {
      sel.replaceChildren();
    }
  }

  // --- tonight's windows --------------------------------------------------

  async function loadWindows() {
    const tbody = $("windows").tBodies[0];
    try {
      const w = await getJson("/api/v1/windows?days=1&limit=25");
      const rows = [];
      for (const x of w.windows) {
        const tr = document.createElement("tr");
        tr.appendChild(cell(String(x.rank), "rank num"));
        tr.appendChild(cell(x.target));
        tr.appendChild(wordsCell(fmtLocal(x.start), "time"));
        tr.appendChild(wordsCell(fmtLocal(x.end), "time"));
        tr.appendChild(wordsCell(fmtUtc(x.start), "time"));
        tr.appendChild(wordsCell(fmtUtc(x.end), "time"));
        tr.appendChild(cell(deg(x.max_el_deg), "num"));
        tr.appendChild(cell(deg(x.synodic_angle_deg), "num"));
        tr.appendChild(cell(fixed(x.coverage_weight, 2), "num"));
        tr.appendChild(cell(fixed(x.score, 1), "num"));
        rows.push(tr);
        // The factors behind the rank, on a line of their own.
        const why = document.createElement("tr");
        why.className = "why-row";
        const td = cell((x.reasons || []).join(" · "), "why");
        td.colSpan = 10;
        why.appendChild(td);
        rows.push(why);
      }
      if (rows.length === 0)
        emptyRow(tbody, 10, "No window in the next 24 hours.");
      else
        tbody.replaceChildren(...rows);
      setText("windows-note", "next 24 h from " + fmtUtc(w.from || "") +
        ", ranked by expected returns × phase value");
    } catch (e) {
      emptyRow(tbody, 10, "Windows not available: " + e.message);
    }
  }

  // --- now ----------------------------------------------------------------

  function phaseWords(m) {
    const s = m.synodic_angle_deg;
    const pct = fixed(100 * m.illuminated_fraction, 0) + " % lit";
    if (typeof s !== "number") return pct;
    return (s < 180 ? "waxing" : "waning") + ", " + pct;
  }

  async function loadNow() {
    const tbody = $("now-targets").tBodies[0];
    try {
      const n = await getJson("/api/v1/now");
      const m = n.moon;
      setText("now-time", "at " + fmtUtcSeconds(n.utc) + " · " + fmtLocal(n.utc));
      const el = $("moon-el");
      el.textContent = deg(m.el_deg, 2);
      el.className = "value " + (m.el_deg > 0 ? "up" : "down");
      setText("moon-az", deg(m.az_deg, 2));
      setText("moon-phase", phaseWords(m) + " · " + deg(m.synodic_angle_deg, 1));
      setText("sun-el", deg(n.sun.el_deg, 1));
      setText("sun-sep", deg(n.sun.separation_deg, 1));
      setText("dut1", fixed(n.dut1_s, 3) + " s (" + n.dut1_source + ")");
      const rows = [];
      for (const t of n.targets) {
        const tr = document.createElement("tr");
        tr.appendChild(cell(t.id));
        tr.appendChild(cell(deg(t.el_deg, 2), "num " + (t.el_deg > 0 ? "up" : "down")));
        tr.appendChild(cell(deg(t.az_deg, 2), "num"));
        tr.appendChild(cell(deg(t.sun_elevation_deg, 1), "num"));
        tr.appendChild(cell(t.sunlit ? "sunlit" : "dark", t.sunlit ? "lit" : "dark"));
        rows.push(tr);
      }
      if (rows.length === 0)
        emptyRow(tbody, 5, "No active target.");
      else
        tbody.replaceChildren(...rows);
    } catch (e) {
      setText("now-time", "not available: " + e.message);
    }
  }

  // --- coverage chart -----------------------------------------------------

  // Two spellings of the same query: the browser keeps an image per URL
  // for the page's life, so alternating them makes it fetch the new chart.
  const CHART_URLS = ["/api/v1/coverage.svg?horizon=0",
    "/api/v1/coverage.svg?horizon=0&min_count=1"];
  let chartTurn = 0;

  function reloadChart() {
    chartTurn = 1 - chartTurn;
    $("coverage-chart").src = CHART_URLS[chartTurn];
  }

  // --- recent attempts ----------------------------------------------------

  async function loadAttempts() {
    const tbody = $("attempts").tBodies[0];
    try {
      const a = await getJson("/api/v1/attempts?limit=12");
      const rows = [];
      for (const x of a.attempts) {
        const tr = document.createElement("tr");
        tr.appendChild(wordsCell(fmtUtc(x.start_utc), "time"));
        tr.appendChild(cell(x.target));
        tr.appendChild(cell(x.outcome.replace(/_/g, " ")));
        tr.appendChild(cell(String(x.shots), "num"));
        tr.appendChild(cell(String(x.returns), "num"));
        tr.appendChild(cell(String(x.normal_points), "num"));
        tr.appendChild(wordsCell(x.operator));
        tr.appendChild(cell(x.notes, "why"));
        rows.push(tr);
      }
      if (rows.length === 0)
        emptyRow(tbody, 8, "No attempt logged yet.");
      else
        tbody.replaceChildren(...rows);
      setText("attempts-note", "newest first");
    } catch (e) {
      emptyRow(tbody, 8, "Attempts not available: " + e.message);
    }
  }

  // --- the log form -------------------------------------------------------

  function savedToken() {
    try { return sessionStorage.getItem(TOKEN_KEY); } catch (e) { return null; }
  }

  function showTokenState() {
    const have = !!savedToken();
    $("token-row").hidden = have;
    $("f-forget").hidden = !have;
  }

  function status(text, ok) {
    const p = $("form-status");
    p.textContent = text;
    p.className = "status " + (ok ? "ok" : "err");
  }

  function isoMinute(d) {
    return d.toISOString().slice(0, 16) + ":00Z";
  }

  function prefillTimes() {
    const now = new Date();
    if (!$("f-start").value)
      $("f-start").value = isoMinute(new Date(now.getTime() - 15 * 60000));
    if (!$("f-end").value)
      $("f-end").value = isoMinute(now);
  }

  function formBody() {
    const v = (id) => $(id).value.trim();
    const body = {
      target: v("f-target"),
      start_utc: v("f-start"),
      end_utc: v("f-end"),
      shots: Number(v("f-shots")),
      returns: Number(v("f-returns")),
      normal_points: Number(v("f-nps")),
      outcome: v("f-outcome"),
      operator: v("f-operator"),
      notes: $("f-notes").value
    };
    if (v("f-seeing") !== "") body.seeing_arcsec = Number(v("f-seeing"));
    return body;
  }

  async function submitAttempt(ev) {
    ev.preventDefault();
    let token = savedToken();
    if (!token) {
      token = $("f-token").value.trim();
      if (!token) {
        status("Enter the write token first.", false);
        $("f-token").focus();
        return;
      }
    }
    $("f-submit").disabled = true;
    status("Sending…", true);
    try {
      const r = await fetch("/api/v1/attempts", {
        method: "POST",
        headers: {
          "Content-Type": "application/json",
          "Authorization": "Bearer " + token
        },
        body: JSON.stringify(formBody())
      });
      let body = null;
      try { body = await r.json(); } catch (e) { body = null; }
      if (r.status === 401) {
        try { sessionStorage.removeItem(TOKEN_KEY); } catch (e) { /* none */ }
        $("f-token").value = "";
        showTokenState();
        status("Token refused: " + (body ? body.error.message : r.statusText), false);
        return;
      }
      if (!r.ok) {
        const e = body && body.error ? body.error : null;
        status((e && e.field ? e.field + ": " : "") +
          (e ? e.message : r.statusText), false);
        return;
      }
      try { sessionStorage.setItem(TOKEN_KEY, token); } catch (e) { /* none */ }
      $("f-token").value = "";
      showTokenState();
      status("Logged attempt " + body.id + " on " + body.target + ".", true);
      $("f-notes").value = "";
      $("f-start").value = "";
      $("f-end").value = "";
      prefillTimes();
      await loadAttempts();
      reloadChart();
    } catch (e) {
      status("Not sent: " + e.message, false);
    } finally {
      $("f-submit").disabled = false;
    }
  }

  function forgetToken() {
    try { sessionStorage.removeItem(TOKEN_KEY); } catch (e) { /* none */ }
    showTokenState();
    status("Token forgotten for this session.", true);
  }

  // --- start --------------------------------------------------------------

  async function start() {
    $("log-form").addEventListener("submit", submitAttempt);
    $("f-forget").addEventListener("click", forgetToken);
    showTokenState();
    prefillTimes();
    tickClocks();
    setInterval(tickClocks, 1000);
    await loadSite();
    tickClocks();
    await Promise.all([loadStatus(), loadTargets(), loadNow(),
      loadWindows(), loadAttempts()]);
    setInterval(loadNow, NOW_EVERY_MS);
    setInterval(function () {
      loadWindows();
      loadAttempts();
      loadStatus();
    }, LISTS_EVERY_MS);
  }

  document.addEventListener("DOMContentLoaded", start);
})();
