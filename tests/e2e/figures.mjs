// Prints the page's figures (not asserted): Wasm and index transfer sizes,
// time from navigation to "ready", and worker check times for 1,000, 10,000
// and 100,000 lines; the single-file page's size and time to ready from
// file://. Needs a built web/dist (web/build.sh) and web/dist-single.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import zlib from "node:zlib";
import { chromium } from "playwright-core";
import { serve } from "./serve.mjs";

import { ROOT, DIST, DEMO, HISTORY, CHROMIUM, BROWSER_ARGS } from "./env.mjs";
const RUNS = Number(process.env.RUNS || 5);

const kb = (n) => `${(n / 1024).toFixed(1)} KiB`;
const median = (xs) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const gz = (buf) => zlib.gzipSync(buf, { level: 9 }).length;

function sizes() {
  const wasm = fs.readFileSync(path.join(DIST, "rollcall-web_bg.wasm"));
  const index = fs.readFileSync(path.join(DIST, "icd10cm.rcx"));
  let js = 0;
  let jsGz = 0;
  for (const f of fs.readdirSync(DIST)) {
    if (/\.(js|css|html)$/.test(f)) {
      const b = fs.readFileSync(path.join(DIST, f));
      js += b.length;
      jsGz += gz(b);
    }
  }
  const book = fs.readFileSync(path.join(DIST, "rollcall-workbook_bg.wasm"));
  console.log(`wasm                 ${kb(wasm.length)} raw, ${kb(gz(wasm))} gzip   (target <= 250,000 bytes gzip)`);
  console.log(`workbook reader wasm ${kb(book.length)} raw, ${kb(gz(book))} gzip   (fetched with the first workbook)`);
  console.log(`index                ${kb(index.length)} raw, ${kb(gz(index))} gzip`);
  console.log(`html+js+css          ${kb(js)} raw, ${kb(jsGz)} gzip`);
}

// A list as a large study might send: the demo list, then distinct real codes
// of the release history (every k-th row), each with its description.
let historyRows = null;
function listOf(n) {
  const demo = fs.readFileSync(DEMO, "utf8").split("\n").filter((l) => l.trim() && !l.startsWith("#"));
  if (!historyRows) {
    historyRows = zlib.gunzipSync(fs.readFileSync(HISTORY)).toString("utf8").split("\n").slice(1).filter(Boolean)
      .map((l) => { const [code, , , desc] = l.split("\t"); return `${code}\t${desc || ""}`; });
  }
  const out = demo.slice(0, n);
  const step = Math.max(1, Math.floor(historyRows.length / n));
  for (let i = 0; out.length < n; i = (i + step) % historyRows.length) out.push(historyRows[i]);
  return out.join("\n");
}

async function main() {
  sizes();
  const server = await serve(DIST, 0);
  const origin = `http://127.0.0.1:${server.address().port}/`;
  const profile = fs.mkdtempSync(path.join(os.tmpdir(), "rollcall-fig-"));
  const ctx = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    args: BROWSER_ARGS,
  });
  try {
    const ready = [];
    let page;
    for (let i = 0; i < RUNS; i++) {
      if (page) await page.close();
      page = await ctx.newPage();
      await page.goto(origin);
      await page.waitForFunction(() => document.body.dataset.state === "ready", null, { timeout: 30_000 });
      ready.push(await page.evaluate(() => performance.getEntriesByName("rollcall-ready")[0].startTime));
    }
    console.log(`navigation -> ready  ${median(ready).toFixed(0)} ms median of ${RUNS} (target <= 400 ms; runs: ${ready.map((x) => x.toFixed(0)).join(", ")})`);
    // The single-file page (web/build-single.sh), opened from file://.
    const single = process.env.SINGLE || path.join(ROOT, "web/dist-single/rollcall.html");
    if (fs.existsSync(single)) {
      const bytes = fs.readFileSync(single);
      const fileReady = [];
      for (let i = 0; i < RUNS; i++) {
        const p = await ctx.newPage();
        await p.goto(`file://${single}`);
        await p.waitForFunction(() => document.body.dataset.state === "ready", null, { timeout: 30_000 });
        fileReady.push(await p.evaluate(() => performance.getEntriesByName("rollcall-ready")[0].startTime));
        await p.close();
      }
      console.log(`single-file page     ${bytes.length.toLocaleString("en-US")} bytes (${kb(bytes.length)}; ${kb(gz(bytes))} gzip); from file:// to ready ${median(fileReady).toFixed(0)} ms median of ${RUNS}`);
    } else {
      console.log("single-file page     not built (web/build-single.sh)");
    }
    for (const n of [1_000, 10_000, 100_000]) {
      await page.evaluate((t) => { document.getElementById("list").value = t; }, listOf(n));
      const worker = [];
      const round = [];
      for (let i = 0; i < RUNS; i++) {
        const before = await page.evaluate(() => Number(document.body.dataset.checked || 0));
        const t0 = await page.evaluate(() => performance.now());
        await page.click("#check-now");
        await page.waitForFunction((k) => Number(document.body.dataset.checked || 0) > k && document.body.dataset.checking === "false", before, { timeout: 120_000 });
        const [t1, ms] = await page.evaluate(() => [performance.now(), Number(document.body.dataset.checkMs)]);
        worker.push(ms);
        round.push(t1 - t0);
      }
      const target = n === 10_000 ? "  (target <= 30 ms)" : "";
      console.log(`check ${n.toLocaleString("en-US").padStart(7)} lines  ${median(worker).toFixed(1)} ms in the worker, ${median(round).toFixed(0)} ms until shown${target}`);
    }
  } finally {
    await ctx.close();
    server.close();
    fs.rmSync(profile, { recursive: true, force: true });
  }
}

main().catch((e) => {
  console.error(`figures: ${e.message}`);
  process.exit(1);
});
