// SPDX-License-Identifier: BSD-3-Clause
// e2e.mjs: the station page in headless Chromium against a real daemon on
// 127.0.0.1: at 390, 768 and 1280 px no sideways scroll and every column
// of the windows visible, the reasons folded; the coverage chart dark on
// the page, its empty bins the most visible marks and its text >= 12 px;
// the now panel; form errors named by the field's label once, the field
// marked and focused, the values kept; logging attempts through the form;
// the download links; the daemon stopped (a banner within 10 s, the
// values greyed with their age) and started again (the page recovers by
// itself); the night plan's run-now panel and timeline (checkPlanPanel).
// Screenshots for the README: SCREENSHOT.png (1280 px), and beside it
// -768.png, -390.png, -offline.png and -plan.png (the timeline).
//
// usage: node e2e.mjs MOONRANGE_BINARY [SCREENSHOT.png]
// Exit 77 (skipped) when playwright-core or Chromium is missing, unless
// MOONRANGE_E2E_REQUIRED=1 (as in .ci/run), which makes that a failure.

import { spawn, execFileSync } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, rmSync, writeFileSync, chmodSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import assert from "node:assert/strict";

const CHROMIUM = process.env.MOONRANGE_CHROMIUM || "/usr/bin/chromium";
const bin = process.argv[2];
const shot = process.argv[3] || join(tmpdir(), "moonrange-screenshot.png");
const shotAt = (suffix) => shot.replace(/\.png$/, "") + "-" + suffix + ".png";
const required = process.env.MOONRANGE_E2E_REQUIRED === "1";

// Skip (exit 77) saying why, also to MOONRANGE_SKIP_DIR/e2e_browser.txt,
// which ctest prints beneath its summary (tests/skips.sh).
function skip(why) {
  console.log("e2e: " + (required ? "FAIL: " : "SKIPPED: ") + why);
  if (!required && process.env.MOONRANGE_SKIP_DIR) {
    mkdirSync(process.env.MOONRANGE_SKIP_DIR, { recursive: true });
    writeFileSync(join(process.env.MOONRANGE_SKIP_DIR, "e2e_browser.txt"), why + "\n");
  }
  process.exit(required ? 1 : 77);
}

if (!bin) {
  console.error("usage: node e2e.mjs MOONRANGE_BINARY [SCREENSHOT.png]");
  process.exit(2);
}
if (!existsSync(CHROMIUM))
  skip(CHROMIUM + " not found: apt-get install -y chromium");
let chromium;
try {
  ({ chromium } = await import("playwright-core"));
} catch (e) {
  skip("playwright-core not installed: (cd tests/e2e && npm ci --no-audit --no-fund)");
}

const dir = mkdtempSync(join(tmpdir(), "moonrange-e2e-"));
const db = join(dir, "station.db");
const tokenFile = join(dir, "token");
const token = "e2e-token-" + Math.random().toString(36).slice(2) + "0123456789";
let daemon = null;
let context = null;

async function cleanup() {
  if (context) await context.close().catch(() => {});
  if (daemon && daemon.exitCode === null) daemon.kill("SIGTERM");
  rmSync(dir, { recursive: true, force: true });
}

// Start "serve" on listen; resolves with the process and its URL.
function startDaemon(listen) {
  return new Promise((resolve, reject) => {
    const p = spawn(bin, ["serve", "--db", db, "--listen", listen,
      "--token-file", tokenFile, "--log-level", "warn"],
      { stdio: ["ignore", "pipe", "inherit"] });
    let out = "";
    const timer = setTimeout(() => reject(new Error("daemon did not start")), 15000);
    p.stdout.on("data", (d) => {
      out += d.toString();
      const m = out.match(/serving (http:\/\/127\.0\.0\.1:\d+\/)/);
      if (m) {
        clearTimeout(timer);
        resolve({ proc: p, url: m[1] });
      }
    });
    p.on("exit", (code) => reject(new Error("daemon exited with " + code)));
  });
}

function stopDaemon(p) {
  return new Promise((resolve) => {
    if (p.exitCode !== null) return resolve();
    p.on("exit", () => resolve());
    p.kill("SIGTERM");
  });
}

// Fill the log form (start and end: as the form offers them unless given;
// the token only when given), send it and wait for the page's receipt.
async function logThroughForm(page, f) {
  await page.selectOption("#f-target", f.target);
  await page.selectOption("#f-outcome", "ranged");
  if (f.start) await page.fill("#f-start", f.start);
  if (f.end) await page.fill("#f-end", f.end);
  await page.fill("#f-shots", f.shots);
  await page.fill("#f-returns", f.returns);
  await page.fill("#f-nps", f.nps);
  await page.fill("#f-seeing", f.seeing);
  await page.fill("#f-operator", f.operator);
  await page.fill("#f-notes", f.notes);
  if (f.token) await page.fill("#f-token", f.token);
  await page.click("#f-submit");
  await page.waitForFunction((t) => {
    const m = /^Logged attempt \d+ on (\S+)\.$/.exec(document.getElementById("form-status").textContent);
    return m !== null && m[1] === t;
  }, f.target, { timeout: 15000 });
}

// The layout at one width: no sideways scroll; every column of every
// window shown inside the viewport and its card, and named (by the
// table's head, or on a phone by the label beside the value).
async function checkLayout(page, width) {
  await page.setViewportSize({ width, height: 1000 });
  await page.waitForFunction((w) => document.documentElement.clientWidth === w, width);
  const r = await page.evaluate(() => {
    const doc = document.documentElement;
    const table = document.getElementById("windows");
    const card = table.closest(".card").getBoundingClientRect();
    const heads = [...table.tHead.rows[0].cells].map((th) => th.textContent);
    const headShown = getComputedStyle(table.tHead).position !== "absolute";
    const problems = [];
    const inside = (b) => b.width > 0 && b.height > 0 && b.left >= card.left - 0.5 &&
      b.right <= card.right + 0.5 && b.left >= 0 && b.right <= doc.clientWidth + 0.5;
    if (headShown)
      [...table.tHead.rows[0].cells].forEach((th, i) => {
        if (!inside(th.getBoundingClientRect())) problems.push("head " + heads[i] + " cut");
      });
    const rows = [...table.querySelectorAll("tbody tr.win")];
    for (const tr of rows)
      [...tr.cells].forEach((td, i) => {
        const b = td.getBoundingClientRect();
        if (!inside(b) || getComputedStyle(td).visibility === "hidden" ||
            td.scrollWidth > td.clientWidth + 1)
          problems.push("row " + tr.cells[0].textContent + " " + heads[i] + " not fully shown");
        if (!headShown) {
          const before = getComputedStyle(td, "::before").content;
          if (before !== JSON.stringify(heads[i]))
            problems.push("row " + tr.cells[0].textContent + " " + heads[i] + " unlabelled: " + before);
        }
      });
    return { overflow: doc.scrollWidth - doc.clientWidth, problems, rows: rows.length,
      cards: !headShown, columns: heads.length };
  });
  assert.equal(r.overflow, 0, "no sideways scroll at " + width + " px");
  assert.ok(r.rows > 0, "windows shown at " + width + " px");
  assert.equal(r.columns, 9);
  assert.deepEqual(r.problems, [], "every windows column visible at " + width + " px");
  return r;
}

// The chart as the page shows it: its SVG imported beside the picture at
// the picture's size, so that each text's size on screen can be read;
// and the picture itself drawn on a canvas to measure how dark it is.
async function checkChart(page, width) {
  await page.waitForFunction(() => {
    const img = document.getElementById("coverage-chart");
    return img.complete && img.naturalWidth > 0;
  }, null, { timeout: 15000 });
  return page.evaluate(async () => {
    const img = document.getElementById("coverage-chart");
    const text = await (await fetch(img.src)).text();
    const svg = new DOMParser().parseFromString(text, "image/svg+xml").documentElement;
    const holder = document.createElement("div");
    holder.style.position = "absolute";
    holder.style.left = "0";
    holder.style.top = "0";
    holder.style.visibility = "hidden";
    document.body.appendChild(holder);
    const el = document.importNode(svg, true);
    el.setAttribute("width", String(img.clientWidth));
    el.setAttribute("height", String(img.clientHeight));
    holder.appendChild(el);
    let minPx = Infinity;
    for (const t of el.querySelectorAll("text")) {
      const m = t.getScreenCTM();   // rotated labels too: the length of a column
      const px = parseFloat(getComputedStyle(t).fontSize) * Math.hypot(m.a, m.b);
      if (px < minPx) minPx = px;
    }
    // WCAG 2 relative luminance and contrast against the chart's ground.
    const lum = (c) => {
      const m = /^#([0-9a-f]{6})$/i.exec(c || "");
      if (!m) return null;
      const v = [0, 2, 4].map((i) => parseInt(m[1].slice(i, i + 2), 16) / 255)
        .map((x) => x <= 0.03928 ? x / 12.92 : Math.pow((x + 0.055) / 1.055, 2.4));
      return 0.2126 * v[0] + 0.7152 * v[1] + 0.0722 * v[2];
    };
    const ground = lum(el.querySelector("rect.ground").getAttribute("fill"));
    const contrast = (c) => {
      const l = lum(c);
      return l === null ? 0 : (Math.max(l, ground) + 0.05) / (Math.min(l, ground) + 0.05);
    };
    const inkOf = (e) => Math.max(contrast(e.getAttribute("stroke")), contrast(e.getAttribute("fill")));
    let gapInk = Infinity, otherInk = 0, other = "";
    for (const e of el.querySelectorAll("path, rect, circle, line, polyline")) {
      if (e.closest("defs") || e.classList.contains("ground")) continue;
      if (e.classList.contains("gap-mark") || e.classList.contains("gap")) {
        gapInk = Math.min(gapInk, inkOf(e));
      } else if (inkOf(e) > otherInk) {
        otherInk = inkOf(e);
        other = e.outerHTML.slice(0, 80);
      }
    }
    const h = (e) => e.getBBox().height;
    const bands = [...el.querySelectorAll("path.bin.gap")];
    const bars = [...el.querySelectorAll("path.bin:not(.gap)")];
    const empties = bands.map((b) => Number(b.dataset.bin));
    const crossed = [...el.querySelectorAll("path.gap-mark:not(.small)")]
      .map((c) => Number(c.dataset.bin)).filter((b) => b >= 0);   // -1: the legend
    const words = [...el.querySelectorAll("text")].filter((t) => t.textContent === "empty").length;
    const tallest = Math.max(0, ...bars.map(h));
    const shortestBand = Math.min(Infinity, ...bands.map(h));
    holder.remove();
    // How dark the picture is: its mean (encoded) luminance drawn on a
    // canvas, beside that of the light variant for paper.
    const mean = (im) => {
      const cv = document.createElement("canvas");
      cv.width = img.clientWidth;
      cv.height = img.clientHeight;
      const g = cv.getContext("2d");
      g.drawImage(im, 0, 0, cv.width, cv.height);
      const px = g.getImageData(0, 0, cv.width, cv.height).data;
      let sum = 0;
      for (let i = 0; i < px.length; i += 4)
        sum += (0.2126 * px[i] + 0.7152 * px[i + 1] + 0.0722 * px[i + 2]) / 255;
      return sum / (px.length / 4);
    };
    const light = new Image();
    light.src = img.src.replace("theme=dark", "theme=light");
    await light.decode();
    return { src: img.src, minPx, gapInk, otherInk, other, empties, crossed, words,
      tallest, shortestBand, meanLum: mean(img), lightLum: mean(light) };
  });
}

// The night-plan panel (web/plan.js): the run-now block and the timeline
// drawn from GET /api/v1/plan.svg; then the timeline of a pinned night on
// the sample site (2027-03-20 from 19:00 PDT) saved beside the screenshot
// as SCREENSHOT-plan.png (the README's picture of the timeline).
async function checkPlanPanel(page, url, shotPath) {
  await page.waitForFunction(() => {
    const img = document.getElementById("plan-timeline");
    return img.complete && img.naturalWidth > 0;
  }, null, { timeout: 20000 });
  await page.waitForFunction(() =>
    document.getElementById("plan-summary").textContent.length > 0,
    null, { timeout: 20000 });
  const summary = await page.textContent("#plan-summary");
  assert.doesNotMatch(summary, /not available/, "the plan loads");
  const now = (await page.textContent("#plan-now-target")).trim();
  assert.ok(now.length > 0 && now !== "–", "the run-now block is filled");
  if (/runs on/.test(summary)) {
    assert.ok(await page.$$eval("#plan-next-list li", (l) => l.length) > 0);
  } else {
    assert.match(summary, /^Nothing can be ranged: /);
  }
  const at = "2027-03-20T02:00:00Z";
  const res = await fetch(url + "api/v1/plan.svg?at=" + at);
  assert.equal(res.status, 200);
  assert.match(res.headers.get("content-type"), /^image\/svg\+xml/);
  const svg = await res.text();
  for (const part of ['class="moon"', 'class="minel"', 'class="run"',
    'id="plan-now"', 'class="twi"']) {
    assert.ok(svg.includes(part), "timeline has " + part);
  }
  const sizes = [...svg.matchAll(/font-size:(\d+)px/g)].map((m) => Number(m[1]));
  assert.ok(sizes.length > 0 && Math.min(...sizes) >= 12, "text >= 12 px");
  const json = await (await fetch(url + "api/v1/plan?at=" + at)).json();
  assert.ok(json.targets_visited >= 3, "the sample night visits 3 targets");
  const view = await context.newPage();
  await view.setViewportSize({ width: 960, height: 500 });
  await view.goto(url + "api/v1/plan.svg?at=" + at, { waitUntil: "load" });
  await view.locator("svg").screenshot({
    path: shotPath.replace(/\.png$/, "") + "-plan.png" });
  await view.close();
}

try {
  execFileSync(bin, ["init", "--db", db], { stdio: "ignore" });
  writeFileSync(tokenFile, token + "\n");
  chmodSync(tokenFile, 0o600);
  const started = await startDaemon("127.0.0.1:0");
  daemon = started.proc;
  const url = started.url;
  const port = new URL(url).port;

  context = await chromium.launchPersistentContext(join(dir, "profile"), {
    executablePath: CHROMIUM,
    headless: true,
    args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic",
      "--no-first-run", "--disable-background-networking",
      "--disable-component-update", "--disable-sync"],
    viewport: { width: 1280, height: 1000 }
  });
  const page = context.pages()[0] || await context.newPage();
  // Console errors count, except the failed requests that a test makes
  // on purpose (refused fields, the daemon stopped) while expected is set.
  const problems = [];
  let expected = null;
  page.on("console", (m) => {
    if (m.type() !== "error") return;
    if (expected && expected.test(m.text())) return;
    problems.push(m.text());
  });
  page.on("pageerror", (e) => problems.push(String(e)));
  // Nothing may leave the machine: every request goes to the daemon.
  const foreign = [];
  page.on("request", (r) => { if (!r.url().startsWith(url)) foreign.push(r.url()); });

  await page.goto(url, { waitUntil: "load" });

  // Tonight's windows: ranked rows with a target, times in the station's
  // zone and in UTC, the score.
  await page.waitForSelector("#windows tbody tr.win td.rank", { timeout: 15000 });
  assert.equal((await page.textContent("#windows tbody tr.win td.rank")).trim(), "1");
  const utcCell = await page.textContent("#windows tbody tr.win td:nth-child(4)");
  assert.match(utcCell, /^\d{4}-\d{2}-\d{2} \d{2}:\d{2}–\d{2}:\d{2}Z( \+1d)?$/);
  assert.match(await page.textContent("#windows tbody tr.win td.score"), /^\d+\.\d$/);

  // The reasons: folded behind each row; those every window shares are
  // written once above the table and in no row.
  const folded = await page.evaluate(() => {
    const rows = [...document.querySelectorAll("#windows tr.why-row")];
    const common = document.getElementById("windows-common");
    const shared = common.hidden ? "" : common.textContent;
    const repeated = rows.flatMap((r) => [...r.querySelectorAll("li")])
      .filter((li) => shared.includes(li.textContent)).length;
    return { rows: rows.length, hidden: rows.filter((r) => r.hidden).length,
      shown: rows.filter((r) => r.getBoundingClientRect().height > 0).length, repeated };
  });
  assert.ok(folded.rows > 0, "reasons behind the rows");
  assert.equal(folded.hidden, folded.rows, "reasons folded at first");
  assert.equal(folded.shown, 0);
  assert.equal(folded.repeated, 0, "a shared reason repeated in a row");
  await page.click("#windows tr.win .why-btn");
  assert.equal(await page.getAttribute("#windows tr.win .why-btn", "aria-expanded"), "true");
  assert.ok(await page.isVisible("#windows tr.why-row li"), "reasons unfold");
  await page.click("#windows tr.win .why-btn");
  assert.equal(await page.isVisible("#windows tr.why-row"), false, "and fold again");

  // The now panel: Moon elevation and azimuth, a phase, one row per target.
  await page.waitForFunction(() => /°$/.test(document.getElementById("moon-el").textContent));
  assert.match(await page.textContent("#moon-az"), /^\d+\.\d{2}°$/);
  assert.match(await page.textContent("#moon-phase"), /% lit/);
  const targetRows = await page.$$eval("#now-targets tbody tr", (rs) => rs.length);
  assert.equal(targetRows, 5, "five active targets in the sample site");
  // It refreshes itself every few seconds.
  const firstNow = await page.textContent("#now-time");
  assert.match(firstNow, /^at \d{4}-\d{2}-\d{2} \d{2}:\d{2}:\d{2}Z/);
  await page.waitForFunction((t) => document.getElementById("now-time").textContent !== t,
    firstNow, { timeout: 12000 });

  // The night plan: the run now, the next runs and the timeline.
  await checkPlanPanel(page, url, shot);

  // The coverage chart, at each width below too: dark on the page, the
  // empty bins (those the API counts as 0) marked by a band the full
  // height of the plot, a cross and the word, in the ink that stands out
  // most against the ground; no text under 12 px.
  const cov = await (await fetch(url + "api/v1/coverage?horizon=0")).json();
  const emptyBins = cov.pooled.counts.map((n, i) => n === 0 ? i : -1).filter((i) => i >= 0);
  assert.ok(emptyBins.length > 0, "the sample site has empty bins");
  const assertChart = (c, width) => {
    assert.match(c.src, /theme=dark/);
    assert.ok(c.meanLum < 0.3 && c.lightLum > 0.7, "the chart is dark on the page " +
      "(mean luminance " + c.meanLum.toFixed(3) + "; the light one for print " +
      c.lightLum.toFixed(3) + ") at " + width + " px");
    assert.ok(c.minPx >= 12, "chart text " + c.minPx.toFixed(2) + " px at " + width + " px");
    assert.deepEqual(c.empties, emptyBins);
    assert.deepEqual(c.crossed, emptyBins);
    assert.equal(c.words, emptyBins.length, "each empty bin says so");
    assert.ok(c.shortestBand >= c.tallest, "the empty bands stand taller than any bar");
    assert.ok(c.gapInk > c.otherInk, "the empty bins' ink (contrast " + c.gapInk.toFixed(2) +
      ") above every other mark's (" + c.otherInk.toFixed(2) + ": " + c.other + ")");
  };

  // Downloads: iCalendar of the windows, the coverage as CSV and SVG, and
  // each panel's JSON, all answered by the daemon with their types.
  const links = await page.$$eval(".downloads a", (as) => as.map((a) =>
    ({ href: a.href, text: a.textContent.trim(), panel: a.closest("[data-panel]").dataset.panel })));
  const kinds = links.map((l) => l.panel + ":" + l.text.split(" ")[0]).sort();
  assert.deepEqual(kinds, ["attempts:JSON", "coverage:CSV", "coverage:JSON", "coverage:SVG",
    "now:JSON", "windows:JSON", "windows:iCalendar"]);
  for (const l of links) {
    const res = await fetch(l.href);
    assert.equal(res.status, 200, l.href);
    const want = { iCalendar: "text/calendar", JSON: "application/json",
      CSV: "text/csv", SVG: "image/svg+xml" }[l.text.split(" ")[0]];
    assert.ok(res.headers.get("content-type").startsWith(want), l.href + " is " + want);
    await res.arrayBuffer();
  }

  // The log form: a refused field is named by its label, once, marked
  // and focused, and what was typed stays.  First without a token.
  await page.fill("#f-operator", "op-cedar");
  await page.fill("#f-start", "not a time");
  await page.click("#f-submit");
  await page.waitForFunction(() => /^Write token: /.test(document.getElementById("form-status").textContent));
  assert.equal(await page.evaluate(() => document.activeElement.id), "f-token");
  // A wrong token: refused, and the page says which file holds the right one.
  expected = /status of 40[01]/;
  await page.fill("#f-token", "not-the-token-0123456789");
  await page.click("#f-submit");
  await page.waitForFunction(() => /^Write token: refused/.test(document.getElementById("form-status").textContent));
  assert.ok((await page.textContent("#form-status")).includes(tokenFile), "the refusal names the token file");
  assert.equal(await page.evaluate(() => document.activeElement.id), "f-token");
  await page.fill("#f-token", token);
  const formError = async (id, label) => {
    await page.click("#f-submit");
    await page.waitForFunction((l) =>
      document.getElementById("form-status").textContent.startsWith(l + ": "), label, { timeout: 15000 });
    const s = await page.evaluate((i) => {
      const el = document.getElementById(i);
      return { text: document.getElementById("form-status").textContent,
        focus: document.activeElement.id, invalid: el.getAttribute("aria-invalid"),
        marked: el.closest("label").classList.contains("invalid"),
        border: getComputedStyle(el).borderTopColor, operator: document.getElementById("f-operator").value };
    }, id);
    assert.equal(s.text.split(label).length - 1, 1, "the label once in: " + s.text);
    assert.doesNotMatch(s.text, /start_utc|end_utc/, "no API member names in: " + s.text);
    assert.equal(s.focus, id, "focus on the field");
    assert.equal(s.invalid, "true");
    assert.ok(s.marked, "the field's label is marked");
    assert.equal(s.operator, "op-cedar", "typed values kept");
    return s.text;
  };
  assert.match(await formError("f-start", "Start UTC"), /^Start UTC: invalid UTC time 'not a time'/);
  assert.equal(await page.inputValue("#f-start"), "not a time");
  await page.fill("#f-start", "2027-02-03T04:25:00Z");
  await page.fill("#f-end", "2027-02-03T04:05:00Z");
  assert.equal(await formError("f-end", "End UTC"), "End UTC: must be after Start UTC");
  assert.equal(await page.getAttribute("#f-start", "aria-invalid"), null, "the earlier mark is gone");
  expected = null;
  // The page says where the token is: the file the daemon was given.
  assert.ok((await page.textContent("#token-where")).includes(tokenFile),
    "the token file's path on the page");

  // Log a plain attempt through the form, at the times the form offers
  // (the last quarter hour; a fresh page fills them in); the page shows
  // it in the recent list.
  await page.reload({ waitUntil: "load" });
  await page.waitForSelector("#windows tbody tr.win td.rank", { timeout: 15000 });
  const plainNote = "thin cirrus, steady returns";
  await logThroughForm(page, { target: "HERON", shots: "18000", returns: "412",
    nps: "3", seeing: "1.8", operator: "op-cedar", notes: plainNote, token });
  await page.waitForFunction((n) =>
    [...document.querySelectorAll("#attempts tbody td")].some((td) => td.textContent === n),
    plainNote, { timeout: 15000 });
  // The token is kept for the session: the token field is hidden now.
  assert.equal(await page.isHidden("#token-row"), true);
  assert.equal(await page.$$eval("#log-form [aria-invalid]", (e) => e.length), 0);

  // Each width: the layout and the chart; the pictures for the README.
  const widths = {};
  for (const w of [1280, 768, 390]) {
    widths[w] = await checkLayout(page, w);
    const c = await checkChart(page, w);
    assertChart(c, w);
    widths[w].chartPx = c.minPx;
    await page.evaluate(() => window.scrollTo(0, 0));
    // The phone's picture is its first screen: the windows as cards.
    await page.screenshot({ path: w === 1280 ? shot : shotAt(w), fullPage: w !== 390 });
  }
  assert.equal(widths[390].cards, true, "cards on a phone");
  assert.equal(widths[1280].cards, false, "a table on a laptop");
  await page.setViewportSize({ width: 1280, height: 1000 });

  // A second attempt whose operator holds markup that must arrive as text
  // (the token is not asked again).
  const note = "e2e note " + Date.now();
  const operator = "op-e2e <img src=x id=injected>";
  await logThroughForm(page, { target: "PLOVER", start: "2027-02-03T04:05:00Z",
    end: "2027-02-03T04:25:00Z", shots: "15000", returns: "77", nps: "2",
    seeing: "", operator, notes: note });
  await page.waitForFunction((n) =>
    [...document.querySelectorAll("#attempts tbody td")].some((td) => td.textContent === n),
    note, { timeout: 15000 });
  const opCell = await page.$$eval("#attempts tbody td",
    (tds, op) => tds.some((td) => td.textContent === op), operator);
  assert.ok(opCell, "the operator is shown verbatim");
  assert.equal(await page.$("#injected"), null, "markup from data was not parsed");

  // And the API has both.
  const res = await fetch(url + "api/v1/attempts?limit=5");
  assert.equal(res.status, 200);
  const body = await res.json();
  const row = body.attempts.find((a) => a.notes === note);
  assert.ok(row, "GET /api/v1/attempts lists the new attempt");
  assert.equal(row.target, "PLOVER");
  assert.equal(row.returns, 77);
  assert.equal(row.operator, operator);
  assert.equal(row.start_utc, "2027-02-03T04:05:00.000Z");
  const plain = body.attempts.find((a) => a.notes === plainNote);
  assert.ok(plain, "GET /api/v1/attempts lists the plain attempt");
  assert.equal(plain.target, "HERON");
  assert.equal(plain.operator, "op-cedar");
  assert.equal(plain.seeing_arcsec, 1.8);

  // The daemon stops: a banner within 10 s, the values greyed with their
  // age; it starts again on the same port: the page recovers by itself.
  assert.equal(await page.isVisible("#offline"), false);
  expected = /ERR_CONNECTION_REFUSED|Failed to load resource|ERR_EMPTY_RESPONSE|ERR_CONNECTION_RESET/;
  await stopDaemon(daemon);
  await page.waitForSelector("#offline", { state: "visible", timeout: 10000 });
  await page.waitForFunction(() =>
    [...document.querySelectorAll("[data-asof]")].every((p) => / old$/.test(p.textContent)),
    null, { timeout: 5000 });
  const stale = await page.evaluate(() => ({
    banner: document.getElementById("offline").textContent,
    dim: getComputedStyle(document.getElementById("windows")).opacity,
    // every panel's body greys, the plan's (another script's) too
    dimmed: [...document.querySelectorAll(".card[data-panel]:not([data-panel=log]) > :not(.card-head)")]
      .every((e) => Number(getComputedStyle(e).opacity) < 1),
    body: document.body.classList.contains("offline"),
    rows: document.querySelectorAll("#windows tbody tr.win").length
  }));
  assert.match(stale.banner, /not answering/);
  assert.match(stale.banner, /No answer since \d{2}:\d{2}:\d{2} UTC/);
  assert.ok(Number(stale.dim) < 1, "stale values greyed");
  assert.ok(stale.dimmed, "every panel's values greyed");
  assert.ok(stale.rows > 0, "the last values stay");
  await page.evaluate(() => window.scrollTo(0, 0));
  await page.waitForFunction(() => !/\(0 s\)/.test(document.getElementById("offline").textContent));
  await page.screenshot({ path: shotAt("offline"), fullPage: false });
  let again = null;
  for (let i = 0; i < 20 && !again; i++) {
    try {
      again = await startDaemon("127.0.0.1:" + port);
    } catch (e) {
      await new Promise((r) => setTimeout(r, 500));
    }
  }
  assert.ok(again, "the daemon starts again on port " + port);
  daemon = again.proc;
  await page.waitForSelector("#offline", { state: "hidden", timeout: 15000 });
  await page.waitForFunction(() =>
    !document.body.classList.contains("offline") &&
    [...document.querySelectorAll("[data-asof]")].every((p) => p.textContent === "") &&
    document.querySelectorAll("#windows tbody tr.win").length > 0, null, { timeout: 15000 });
  assert.equal(await page.evaluate(() => getComputedStyle(document.getElementById("windows")).opacity), "1");
  const nowBefore = await page.textContent("#now-time");
  await page.waitForFunction((t) => document.getElementById("now-time").textContent !== t,
    nowBefore, { timeout: 12000 });
  expected = null;

  assert.deepEqual(foreign, [], "requests outside the daemon");
  assert.deepEqual(problems, [], "console errors (CSP violations included)");

  // The chart opened on its own is a document under the daemon's policy
  // too: nothing in it may be refused.
  const refused = [];
  page.on("console", (m) => { if (/Content Security Policy/.test(m.text())) refused.push(m.text()); });
  await page.goto(again.url + "api/v1/coverage.svg?horizon=0", { waitUntil: "load" });
  assert.match(await page.evaluate(() => document.documentElement.nodeName), /^svg$/i);
  await page.waitForTimeout(300);
  assert.deepEqual(refused, [], "the chart's own style refused by CSP");
  console.log("e2e: ok: no sideways scroll at 390/768/1280 px (windows as " +
    (widths[390].cards ? "cards" : "a table") + " at 390), smallest chart text " +
    [390, 768, 1280].map((w) => widths[w].chartPx.toFixed(1) + " px at " + w).join(", ") +
    "; screenshots " + shot + " and -768, -390, -offline");
  await cleanup();
  process.exit(0);
} catch (e) {
  console.error("e2e: FAIL: " + (e && e.stack ? e.stack : e));
  await cleanup();
  process.exit(1);
}
