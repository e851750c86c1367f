// SPDX-License-Identifier: BSD-3-Clause
// app.js: the station page: fetches /api/v1/ and shows it; no planning here.
// Every value from the API or the user is inserted with textContent.
"use strict";

(function () {
  const NOW_EVERY_MS = 5000;
  const LISTS_EVERY_MS = 60000;
  const FETCH_TIMEOUT_MS = 4000;   // a daemon that hangs counts as gone
  const TOKEN_KEY = "moonrange.token";

  let zone = "UTC";
  let zoneLabel = "Station";
  let offlineSince = null;         // Date of the first unanswered request
  let tokenPath = null;            // the daemon's token file, from /status
  let lastAnswer = null;           // Date of the daemon's last answer
  const asOf = {};                 // panel name -> Date of its last data

  // --- small DOM helpers ---------------------------------------------------

  function $(id) { return document.getElementById(id); }

  function setText(id, text) { $(id).textContent = text; }

  function cell(text, cls) {
    const td = document.createElement("td");
    td.textContent = text;
    if (cls) td.className = cls;
    return td;
  }

  // A cell of parts that each stay whole ("2026-12-02", "10:18–13:35Z"):
  // a narrow screen wraps the cell between parts only.
  function partsCell(parts, cls) {
    const td = document.createElement("td");
    td.className = "words" + (cls ? " " + cls : "");
    parts.forEach(function (part, i) {
      if (i > 0) td.appendChild(document.createTextNode(" "));
      const span = document.createElement("span");
      span.textContent = part;
      td.appendChild(span);
    });
    return td;
  }

  function wordsCell(text, cls) {
    return partsCell(String(text).split(" "), cls);
  }

  // Each cell carries its column's name, shown beside it when the table
  // is laid out as cards on a narrow screen.
  function labelCells(table, tr) {
    const heads = table.tHead.rows[0].cells;
    for (let i = 0; i < tr.cells.length && i < heads.length; i++)
      tr.cells[i].dataset.label = heads[i].textContent;
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

  // Weekday, day, month, hour and minute in the station's zone, and the
  // zone's short name ("PST"; en-US knows more of them than en-GB).
  function localParts(d, withZone) {
    const o = { timeZone: zone, weekday: "short", month: "short",
      day: "2-digit", hour: "2-digit", minute: "2-digit", hourCycle: "h23" };
    const p = {};
    for (const x of new Intl.DateTimeFormat("en-GB", o).formatToParts(d))
      p[x.type] = x.value;
    if (withZone)
      for (const x of new Intl.DateTimeFormat("en-US", { timeZone: zone,
        timeZoneName: "short" }).formatToParts(d))
        if (x.type === "timeZoneName") p.timeZoneName = x.value;
    return p;
  }

  function fmtLocal(iso) {
    const d = parseUtc(iso);
    if (!d) return "–";
    try {
      const p = localParts(d, true);
      return p.weekday + " " + p.day + " " + p.month + " " + p.hour + ":" +
        p.minute + " " + p.timeZoneName;
    } catch (e) {
      return fmtUtc(iso);
    }
  }

  // A window's span as [day, "hh:mm–hh:mm zone"] in the station's zone;
  // "+1d" when it ends on the next day there.
  function localSpan(startIso, endIso) {
    const a = parseUtc(startIso), b = parseUtc(endIso);
    if (!a || !b) return ["–"];
    try {
      const p = localParts(a, false), q = localParts(b, true);
      const next = p.day !== q.day ? " +1d" : "";
      return [p.weekday + " " + p.day + " " + p.month,
        p.hour + ":" + p.minute + "–" + q.hour + ":" + q.minute + next,
        q.timeZoneName];
    } catch (e) {
      return utcSpan(startIso, endIso);
    }
  }

  function utcSpan(startIso, endIso) {
    const a = parseUtc(startIso), b = parseUtc(endIso);
    if (!a || !b) return ["–"];
    const sa = a.toISOString(), sb = b.toISOString();
    const next = sa.slice(0, 10) !== sb.slice(0, 10) ? " +1d" : "";
    return [sa.slice(0, 10), sa.slice(11, 16) + "–" + sb.slice(11, 16) + "Z" + next];
  }

  function age(ms) {
    const s = Math.max(0, Math.round(ms / 1000));
    if (s < 120) return s + " s";
    if (s < 7200) return Math.round(s / 60) + " min";
    return Math.round(s / 3600) + " h";
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
    if (offlineSince) showStale();
  }

  // --- the daemon's health: a banner while it does not answer ---------------

  function showStale() {
    const now = Date.now();
    setText("offline-text", "No answer since " +
      offlineSince.toISOString().slice(11, 19) + " UTC (" +
      age(now - offlineSince.getTime()) + "). The greyed values are the " +
      "last ones received; the page keeps asking every " +
      NOW_EVERY_MS / 1000 + " s and recovers by itself.");
    // A panel that fetches on its own has no time here: its data are at
    // most as old as the daemon's last answer.
    for (const p of document.querySelectorAll("[data-asof]")) {
      const t = asOf[p.dataset.asof] || lastAnswer;
      p.textContent = t ? "as of " + t.toISOString().slice(11, 19) +
        " UTC, " + age(now - t.getTime()) + " old" : "no data yet";
    }
  }

  function lostDaemon() {
    if (offlineSince) return;
    offlineSince = new Date();
    document.body.classList.add("offline");
    $("offline").hidden = false;
    showStale();
  }

  function daemonBack() {
    if (!offlineSince) return;
    offlineSince = null;
    document.body.classList.remove("offline");
    $("offline").hidden = true;
    for (const p of document.querySelectorAll("[data-asof]"))
      p.textContent = "";
    refreshAll();
  }

  // --- the API ------------------------------------------------------------

  // fetch with a deadline; a network failure or timeout marks the daemon
  // gone (err.offline), any HTTP answer marks it back.
  async function call(path, init) {
    const ctl = new AbortController();
    const timer = setTimeout(function () { ctl.abort(); }, FETCH_TIMEOUT_MS);
    let r;
    try {
      r = await fetch(path, Object.assign({ cache: "no-store",
        signal: ctl.signal }, init || {}));
    } catch (e) {
      lostDaemon();
      const err = new Error("the daemon is not answering");
      err.offline = true;
      throw err;
    } finally {
      clearTimeout(timer);
    }
    lastAnswer = new Date();
    daemonBack();
    let body = null;
    try { body = await r.json(); } catch (e) { body = null; }
    return { r: r, body: body };
  }

  async function getJson(path, panel) {
    const x = await call(path, { headers: { "Accept": "application/json" } });
    if (!x.r.ok) {
      const msg = x.body && x.body.error ? x.body.error.message : x.r.statusText;
      const err = new Error(msg);
      err.status = x.r.status;
      throw err;
    }
    if (panel) asOf[panel] = new Date();
    return x.body;
  }

  // --- station ------------------------------------------------------------

  async function loadSite() {
    try {
      const st = await getJson("/api/v1/site");
      zone = st.time_zone || "UTC";
      zoneLabel = zone.split("/").pop().replace(/_/g, " ");
      setText("station", st.name + " · " + st.code + " · " +
        fixed(st.lat_deg, 4) + ", " + fixed(st.lon_deg, 4) + ", " +
        fixed(st.height_m, 0) + " m · " + zone);
      setText("clock-local-label", zoneLabel);
    } catch (e) {
      if (!e.offline) setText("station", "station not available: " + e.message);
    }
  }

  async function loadStatus() {
    try {
      const s = await getJson("/api/v1/status");
      setText("version", s.version);
      setText("plan-note", s.plan && s.plan.last_utc ?
        "plan of " + fmtUtc(s.plan.last_utc) : "no plan yet");
      if (typeof s.token_file === "string" && s.token_file !== "") {
        tokenPath = s.token_file;
        const span = $("token-path");
        const code = document.createElement("code");
        code.textContent = s.token_file;
        span.replaceChildren(document.createTextNode("This daemon reads it from "),
          code, document.createTextNode(" on its machine."));
      }
    } catch (e) {
      if (!e.offline) setText("plan-note", "status not available");
    }
  }

  async function loadTargets() {
    const sel = $("f-target");
    try {
      const t = await getJson("/api/v1/targets");
      const keep = sel.value;
      const opts = [];
      for (const x of t.targets) {
        if (!x.active) continue;
        const o = document.createElement("option");
        o.value = x.id;
        o.textContent = x.name ? x.id + " — " + x.name : x.id;
        opts.push(o);
      }
      sel.replaceChildren(...opts);
      if (keep) sel.value = keep;
    } catch (e) {
      if (!e.offline) sel.replaceChildren();
    }
  }

  // --- tonight's windows --------------------------------------------------

  // Reasons every window shares, written once above the table.
  function commonReasons(ws) {
    if (ws.length < 2) return [];
    return (ws[0].reasons || []).filter(function (r) {
      return ws.every(function (w) { return (w.reasons || []).indexOf(r) >= 0; });
    });
  }

  function toggleWhy(btn, row) {
    const open = btn.getAttribute("aria-expanded") !== "true";
    btn.setAttribute("aria-expanded", open ? "true" : "false");
    btn.textContent = open ? "Hide" : "Why";
    row.hidden = !open;
  }

  async function loadWindows() {
    const table = $("windows");
    const tbody = table.tBodies[0];
    try {
      const w = await getJson("/api/v1/windows?days=1&limit=25", "windows");
      const common = commonReasons(w.windows);
      const rows = [];
      for (const x of w.windows) {
        const tr = document.createElement("tr");
        tr.className = "win";
        tr.appendChild(cell(String(x.rank), "rank num"));
        tr.appendChild(cell(x.target, "target"));
        tr.appendChild(partsCell(localSpan(x.start, x.end), "time"));
        tr.appendChild(partsCell(utcSpan(x.start, x.end), "time"));
        tr.appendChild(cell(deg(x.max_el_deg), "num"));
        tr.appendChild(cell(deg(x.synodic_angle_deg), "num"));
        tr.appendChild(cell(fixed(x.coverage_weight, 2), "num"));
        tr.appendChild(cell(fixed(x.score, 1), "num score"));
        const own = (x.reasons || []).filter(function (r) {
          return common.indexOf(r) < 0;
        });
        const whyTd = document.createElement("td");
        whyTd.className = "why-cell";
        tr.appendChild(whyTd);
        labelCells(table, tr);
        rows.push(tr);
        if (own.length === 0) {
          whyTd.textContent = "–";
          continue;
        }
        // The factors behind the rank, folded in a row of their own.
        const why = document.createElement("tr");
        why.className = "why-row";
        why.id = "why-" + x.rank;
        why.hidden = true;
        const td = document.createElement("td");
        td.colSpan = 9;
        const ul = document.createElement("ul");
        for (const r of own) {
          const li = document.createElement("li");
          li.textContent = r;
          ul.appendChild(li);
        }
        td.appendChild(ul);
        why.appendChild(td);
        const btn = document.createElement("button");
        btn.type = "button";
        btn.className = "quiet why-btn";
        btn.textContent = "Why";
        btn.setAttribute("aria-expanded", "false");
        btn.setAttribute("aria-controls", why.id);
        btn.setAttribute("aria-label", "Why rank " + x.rank + " (" + x.target + ")");
        btn.addEventListener("click", function () { toggleWhy(btn, why); });
        whyTd.appendChild(btn);
        rows.push(why);
      }
      const c = $("windows-common");
      c.hidden = common.length === 0;
      if (common.length) {
        const b = document.createElement("strong");
        b.textContent = "Every window: ";
        c.replaceChildren(b, document.createTextNode(common.join(" · ")));
      }
      if (rows.length === 0)
        emptyRow(tbody, 9, "No window in the next 24 hours.");
      else
        tbody.replaceChildren(...rows);
      setText("windows-note", "next 24 h from " + fmtUtc(w.from || "") +
        ", ranked by expected returns × phase value");
    } catch (e) {
      if (!e.offline) emptyRow(tbody, 9, "Windows not available: " + e.message);
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
      const n = await getJson("/api/v1/now", "now");
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
      if (!e.offline) setText("now-time", "not available: " + e.message);
    }
  }

  // --- coverage chart -----------------------------------------------------

  // Two spellings of the same query: the browser keeps an image per URL
  // for the page's life, so alternating them makes it fetch the new chart.
  const CHART_URLS = ["/api/v1/coverage.svg?horizon=0&theme=dark",
    "/api/v1/coverage.svg?theme=dark&horizon=0"];
  let chartTurn = 0;

  function reloadChart() {
    chartTurn = 1 - chartTurn;
    $("coverage-chart").src = CHART_URLS[chartTurn];
  }

  // --- recent attempts ----------------------------------------------------

  async function loadAttempts() {
    const table = $("attempts");
    const tbody = table.tBodies[0];
    try {
      const a = await getJson("/api/v1/attempts?limit=12", "attempts");
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
        tr.appendChild(cell(x.notes, "notes"));
        labelCells(table, tr);
        rows.push(tr);
      }
      if (rows.length === 0)
        emptyRow(tbody, 8, "No attempt logged yet.");
      else
        tbody.replaceChildren(...rows);
      setText("attempts-note", "newest first");
    } catch (e) {
      if (!e.offline) emptyRow(tbody, 8, "Attempts not available: " + e.message);
    }
  }

  function refreshAll() {
    loadSite().then(tickClocks);
    loadStatus();
    loadTargets();
    loadNow();
    loadWindows();
    loadAttempts();
    reloadChart();
    asOf.coverage = new Date();
  }

  // --- the log form -------------------------------------------------------

  // The form's fields by the API's member names.
  const FIELDS = {
    target: "f-target", outcome: "f-outcome", start_utc: "f-start",
    end_utc: "f-end", shots: "f-shots", returns: "f-returns",
    normal_points: "f-nps", seeing_arcsec: "f-seeing",
    operator: "f-operator", notes: "f-notes"
  };

  // The words of a field's label ("Start UTC"), without its control.
  function labelOf(id) {
    const l = document.querySelector("label[for='" + id + "']");
    if (!l) return id;
    for (const n of l.childNodes)
      if (n.nodeType === Node.TEXT_NODE && n.textContent.trim() !== "")
        return n.textContent.trim();
    return id;
  }

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

  function clearInvalid() {
    for (const el of document.querySelectorAll("#log-form [aria-invalid]")) {
      el.removeAttribute("aria-invalid");
      el.removeAttribute("aria-errormessage");
      const l = el.closest("label");
      if (l) l.classList.remove("invalid");
    }
  }

  // Say what is wrong with one field, by its label, once; mark it and
  // put the cursor in it.  The values typed stay as they are.
  function fieldError(id, text) {
    const el = $(id);
    el.setAttribute("aria-invalid", "true");
    el.setAttribute("aria-errormessage", "form-status");
    const l = el.closest("label");
    if (l) l.classList.add("invalid");
    status(labelOf(id) + ": " + text, false);
    el.focus();
  }

  // An API error as the form shows it: the member's name in front of the
  // message (once or more) gives way to the field's label, and other
  // members named inside it are called by their labels too.
  function apiError(e) {
    const id = e.field ? FIELDS[e.field] : null;
    let msg = e.message || "refused";
    if (!id) {
      status((e.field ? e.field + ": " : "") + msg, false);
      return;
    }
    const prefix = new RegExp("^(" + e.field + ":\\s*)+");
    msg = msg.replace(prefix, "");
    for (const k of Object.keys(FIELDS))
      msg = msg.replace(new RegExp("\\b" + k + "\\b", "g"), labelOf(FIELDS[k]));
    fieldError(id, msg);
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

  // A number field as JSON: its number, or the text as typed (which the
  // API refuses by name), or null when empty.
  function numberOf(id) {
    const v = $(id).value.trim();
    if (v === "") return null;
    const n = Number(v);
    return isFinite(n) ? n : v;
  }

  function formBody() {
    const v = (id) => $(id).value.trim();
    const body = {
      target: v("f-target"),
      start_utc: v("f-start"),
      end_utc: v("f-end"),
      shots: numberOf("f-shots"),
      returns: numberOf("f-returns"),
      normal_points: numberOf("f-nps"),
      outcome: v("f-outcome"),
      operator: v("f-operator"),
      notes: $("f-notes").value
    };
    const seeing = numberOf("f-seeing");
    if (seeing !== null) body.seeing_arcsec = seeing;
    return body;
  }

  async function submitAttempt(ev) {
    ev.preventDefault();
    clearInvalid();
    let token = savedToken();
    if (!token) {
      token = $("f-token").value.trim();
      if (!token) {
        $("token-row").hidden = false;
        fieldError("f-token", "enter the token first (where it is: below the field).");
        return;
      }
    }
    $("f-submit").disabled = true;
    status("Sending…", true);
    try {
      const x = await call("/api/v1/attempts", {
        method: "POST",
        headers: {
          "Content-Type": "application/json",
          "Authorization": "Bearer " + token
        },
        body: JSON.stringify(formBody())
      });
      const r = x.r, body = x.body;
      if (r.status === 401) {
        try { sessionStorage.removeItem(TOKEN_KEY); } catch (e) { /* none */ }
        showTokenState();
        fieldError("f-token", tokenPath ? "refused by the daemon; compare it " +
          "with the line in " + tokenPath + "." : "refused: " +
          (body && body.error ? body.error.message : r.statusText));
        return;
      }
      if (!r.ok) {
        if (body && body.error) apiError(body.error);
        else status("Refused: " + r.statusText, false);
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
      asOf.coverage = new Date();
    } catch (e) {
      status("Not sent: " + e.message + "; the values stay in the form.", false);
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
    $("log-form").addEventListener("input", function (ev) {
      const el = ev.target;
      if (el.hasAttribute && el.hasAttribute("aria-invalid")) {
        el.removeAttribute("aria-invalid");
        const l = el.closest("label");
        if (l) l.classList.remove("invalid");
      }
    });
    $("f-forget").addEventListener("click", forgetToken);
    showTokenState();
    prefillTimes();
    tickClocks();
    setInterval(tickClocks, 1000);
    asOf.coverage = new Date();
    await loadSite();
    tickClocks();
    await Promise.all([loadStatus(), loadTargets(), loadNow(),
      loadWindows(), loadAttempts()]);
    setInterval(loadNow, NOW_EVERY_MS);
    setInterval(function () {
      if (offlineSince) return;
      loadWindows();
      loadAttempts();
      loadStatus();
    }, LISTS_EVERY_MS);
  }

  // For the other panels' scripts (web/plan.js, ...): the same fetch, so
  // that their requests also notice the daemon gone and back, and their
  // data-asof element shows the age of their data.
  window.moonrangePage = Object.freeze({ getJson: getJson });

  document.addEventListener("DOMContentLoaded", start);
})();
