// SPDX-License-Identifier: BSD-3-Clause
// eclipse.js: a notice above the panels when a lunar eclipse falls in the
// coming 30 days (GET /api/v1/eclipses): a rare full-moon chance, said
// ahead of time.  Every value is inserted with textContent.
"use strict";

(function () {
  const DAYS = 30;

  function utc(iso) {
    return typeof iso === "string" ? iso.slice(0, 10) + " " +
      iso.slice(11, 16) + " UTC" : "–";
  }

  async function show() {
    const box = document.getElementById("notices");
    if (!box) return;
    let body;
    try {
      const r = await fetch("/api/v1/eclipses?days=" + DAYS,
        { headers: { "Accept": "application/json" } });
      if (!r.ok) return;
      body = await r.json();
    } catch (e) {
      return;
    }
    const old = box.querySelectorAll("[data-notice='eclipse']");
    old.forEach(function (n) { n.remove(); });
    (body && Array.isArray(body.eclipses) ? body.eclipses : [])
      .forEach(function (e) {
        const c = e.contacts || {};
        const p = document.createElement("p");
        p.className = "notice";
        p.dataset.notice = "eclipse";
        p.textContent = "Lunar eclipse (" + e.kind + "): greatest " +
          utc(e.greatest) + ", from " + utc(c.P1) + " to " + utc(c.P4) +
          ". A rare full-moon chance: reflectors in the Earth's umbra " +
          "are dark.";
        box.appendChild(p);
      });
  }

  document.addEventListener("DOMContentLoaded", show);
})();
