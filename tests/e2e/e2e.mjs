// SPDX-License-Identifier: BSD-3-Clause
// e2e.mjs: the station page in headless Chromium against a real daemon on
// 127.0.0.1: windows table, now panel, coverage chart, logging attempts
// through the form, the recent list and GET /api/v1/attempts; screenshots
// at 1280 px (SCREENSHOT.png, the README's picture once a plain attempt is
// logged) and 820 px (SCREENSHOT-820.png, no sideways scrolling).
//
// usage: node e2e.mjs MOONRANGE_BINARY [SCREENSHOT.png]
// Exit 77 (skipped) when playwright-core or Chromium is missing, unless
// MOONRANGE_E2E_REQUIRED=1 (as in .ci/run), which makes that a failure.

import { spawn, execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, rmSync, writeFileSync, chmodSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import assert from "node:assert/strict";

const CHROMIUM = process.env.MOONRANGE_CHROMIUM || "/usr/bin/chromium";
const bin = process.argv[2];
const shot = process.argv[3] || join(tmpdir(), "moonrange-screenshot.png");
const required = process.env.MOONRANGE_E2E_REQUIRED === "1";

function skip(why) {
  console.log("e2e: " + (required ? "FAIL: " : "skipped: ") + why);
  process.exit(required ? 1 : 77);
}

if (!bin) {
  console.error("usage: node e2e.mjs MOONRANGE_BINARY [SCREENSHOT.png]");
  process.exit(2);
}
if (!existsSync(CHROMIUM)) skip(CHROMIUM + " not found (apt-get install -y chromium)");
let chromium;
try {
  ({ chromium } = await import("playwright-core"));
} catch (e) {
  skip("playwright-core not installed (npm ci in tests/e2e)");
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

function startDaemon() {
  return new Promise((resolve, reject) => {
    const p = spawn(bin, ["serve", "--db", db, "--listen", "127.0.0.1:0",
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

try {
  execFileSync(bin, ["init", "--db", db], { stdio: "ignore" });
  writeFileSync(tokenFile, token + "\n");
  chmodSync(tokenFile, 0o600);
  const started = await startDaemon();
  daemon = started.proc;
  const url = started.url;

  context = await chromium.launchPersistentContext(join(dir, "profile"), {
    executablePath: CHROMIUM,
    headless: true,
    args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic",
      "--no-first-run", "--disable-background-networking",
      "--disable-component-update", "--disable-sync"],
    viewport: { width: 1280, height: 1500 }
  });
  const page = context.pages()[0] || await context.newPage();
  const problems = [];
  page.on("console", (m) => { if (m.type() === "error") problems.push(m.text()); });
  page.on("pageerror", (e) => problems.push(String(e)));
  // Nothing may leave the machine: every request goes to the daemon.
  const foreign = [];
  page.on("request", (r) => { if (!r.url().startsWith(url)) foreign.push(r.url()); });

  await page.goto(url, { waitUntil: "load" });

  // Tonight's windows: ranked rows with a target and UTC times.
  await page.waitForSelector("#windows tbody tr td.rank", { timeout: 15000 });
  const firstRank = await page.textContent("#windows tbody tr:first-child td.rank");
  assert.equal(firstRank.trim(), "1");
  const utcCell = await page.textContent("#windows tbody tr:first-child td:nth-child(5)");
  assert.match(utcCell, /^\d{4}-\d{2}-\d{2} \d{2}:\d{2}Z$/);

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

  // The coverage chart: the SVG endpoint, decoded by the browser.
  await page.waitForFunction(() => {
    const img = document.getElementById("coverage-chart");
    return img.complete && img.naturalWidth > 0;
  }, null, { timeout: 15000 });

  // Log a plain attempt through the form, at the times the form offers
  // (the last quarter hour); the page shows it in the recent list.
  const plainNote = "thin cirrus, steady returns";
  await logThroughForm(page, { target: "HERON", shots: "18000", returns: "412",
    nps: "3", seeing: "1.8", operator: "op-cedar", notes: plainNote, token });
  await page.waitForFunction((n) =>
    [...document.querySelectorAll("#attempts tbody td")].some((td) => td.textContent === n),
    plainNote, { timeout: 15000 });
  // The token is kept for the session: the token field is hidden now.
  assert.equal(await page.isHidden("#token-row"), true);

  // The picture of the page (the README shows it): a laptop, then a tablet.
  await page.screenshot({ path: shot, fullPage: true });
  await page.setViewportSize({ width: 820, height: 1180 });
  await page.waitForFunction(() =>
    getComputedStyle(document.querySelector(".grid")).gridTemplateColumns.split(" ").length === 1);
  const overflow = await page.evaluate(() =>
    document.documentElement.scrollWidth - document.documentElement.clientWidth);
  assert.equal(overflow, 0, "no sideways scrolling of the page at 820 px");
  await page.screenshot({ path: shot.replace(/\.png$/, "") + "-820.png", fullPage: true });
  await page.setViewportSize({ width: 1280, height: 1500 });

  // A second attempt whose operator holds markup that must arrive as text
  // (the token is not asked again).
  const note = "e2e note " + Date.now();
  const operator = "op-e2e <img src=x id=injected>";
  await logThroughForm(page, { target: "PLOVER", start: "2027-02-03T04:05:00Z",
    end: "2027-02-03T04:25:00Z", shots: "15000", returns: "77", nps: "2",
    seeing: "", operator, notes: note });

  // It shows in the recent list, as text.
  await page.waitForFunction((n) =>
    [...document.querySelectorAll("#attempts tbody td")].some((td) => td.textContent === n),
    note, { timeout: 15000 });
  const opCell = await page.$$eval("#attempts tbody td",
    (tds, op) => tds.some((td) => td.textContent === op), operator);
  assert.ok(opCell, "the operator is shown verbatim");
  assert.equal(await page.$("#injected"), null, "markup from data was not parsed");

  // And the API has it.
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

  assert.deepEqual(foreign, [], "requests outside the daemon");
  assert.deepEqual(problems, [], "console errors (CSP violations included)");

  // The chart opened on its own is a document under the daemon's policy
  // too: its styling must not be refused.
  const refused = [];
  page.on("console", (m) => { if (/Content Security Policy/.test(m.text())) refused.push(m.text()); });
  await page.goto(url + "api/v1/coverage.svg?horizon=0", { waitUntil: "load" });
  assert.match(await page.evaluate(() => document.documentElement.nodeName), /^svg$/i);
  await page.waitForTimeout(300);
  assert.deepEqual(refused, [], "the chart's own style refused by CSP");
  console.log("e2e: ok (screenshot " + shot + ")");
  await cleanup();
  process.exit(0);
} catch (e) {
  console.error("e2e: FAIL: " + (e && e.stack ? e.stack : e));
  await cleanup();
  process.exit(1);
}
