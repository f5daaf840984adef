// What the page hands back: the cleaned list as CSV, the report as JSON (the
// CLI's schema, untouched) and the list as a FHIR R4 ValueSet.

import { FHIR_ICD10CM } from "./inputs.js";

// Lines left out of the cleaned list: skipped ones, and codes of another
// system (they belong in a list of their own).
const SKIPPED = new Set(["blank", "comment", "column-headings", "other-system"]);

/** Each usable code once, in input order: {code, label, description, status, line}. */
export function cleanedRows(report) {
  const seen = new Set();
  const rows = [];
  for (const e of report.entries) {
    if (SKIPPED.has(e.status) || e.code == null) continue;
    const key = `${e.system ?? report.vocabulary}\t${e.code}`;
    if (seen.has(key)) continue;
    seen.add(key);
    rows.push({
      code: e.code,
      label: e.label ?? "",
      description: e.description ?? "",
      status: e.status,
      line: e.line,
      system: e.system ?? report.vocabulary,
    });
  }
  return rows;
}

/**
 * One CSV cell. A cell that a spreadsheet would read as a formula (starting
 * with =, +, -, @, tab or carriage return) gets a leading apostrophe.
 */
export function csvCell(value) {
  let s = String(value ?? "");
  if (/^[=+\-@\t\r]/.test(s)) s = "'" + s;
  if (/[",\r\n]/.test(s)) s = '"' + s.replace(/"/g, '""') + '"';
  return s;
}

export function toCsv(rows) {
  const out = ["code,label,description,status"];
  for (const r of rows) out.push([r.code, r.label, r.description, r.status].map(csvCell).join(","));
  return out.join("\r\n") + "\r\n";
}

/** The report exactly as the checker gave it, as the CLI prints it. */
export function toJsonReport(report) {
  return JSON.stringify(report, null, 2) + "\n";
}

/**
 * The cleaned list as a FHIR R4 ValueSet. Patterns (like E11.*) are not
 * concepts, so they are left out and counted in `leftOut`.
 */
// FHIR code system URIs (HL7 Terminology, the FHIR R4 code system registry;
// written from memory, the same as rollcall::systems::FHIR_URIS).
const FHIR_SYSTEMS = {
  icd10cm: FHIR_ICD10CM,
  icd10pcs: "http://www.cms.gov/Medicare/Coding/ICD10",
  icd9cm: "http://hl7.org/fhir/sid/icd-9-cm",
  hpo: "http://purl.obolibrary.org/obo/hp.owl",
  loinc: "http://loinc.org",
  snomed: "http://snomed.info/sct",
  ndc: "http://hl7.org/fhir/sid/ndc",
  hcpcs: "https://www.cms.gov/Medicare/Coding/HCPCSReleaseCodeSets",
  cpt: "http://www.ama-assn.org/go/cpt",
  rxnorm: "http://www.nlm.nih.gov/research/umls/rxnorm",
};

export function toValueSet(rows, report) {
  // One include per system, in order of first appearance; the list's own
  // system first.
  const bySystem = new Map([[report.vocabulary, []]]);
  let leftOut = 0;
  for (const r of rows) {
    if (r.status === "pattern" || !/^[A-Za-z0-9.:_-]+$/.test(r.code) || !FHIR_SYSTEMS[r.system || report.vocabulary]) {
      leftOut++;
      continue;
    }
    const c = { code: r.code };
    const display = r.description || r.label;
    if (display) c.display = display;
    const sys = r.system || report.vocabulary;
    if (!bySystem.has(sys)) bySystem.set(sys, []);
    bySystem.get(sys).push(c);
  }
  const parts = report.summary.by_system || [];
  const release = (sys) =>
    sys === report.vocabulary ? report.index.release : (parts.find((p) => p.system === sys) || {}).release;
  const used = [...bySystem].filter(([, concept]) => concept.length);
  const include = (used.length ? used : [[report.vocabulary, []]])
    .map(([sys, concept]) => {
      const inc = { system: FHIR_SYSTEMS[sys] || FHIR_ICD10CM };
      const version = release(sys);
      if (version && !/^none/.test(version)) inc.version = version;
      inc.concept = concept;
      return inc;
    });
  const o = report.options;
  const when = o.from === o.to ? `on ${o.from}` : `from ${o.from} to ${o.to}`;
  const resource = {
    resourceType: "ValueSet",
    status: "draft",
    experimental: true,
    name: "CheckedCodeList",
    title: "Code list checked with rollcall",
    description:
      `${report.vocabulary === "icd10cm" ? "ICD-10-CM" : report.vocabulary} codes checked ${when}` +
      `${o.billable ? ", billable codes required" : ""}, against index release ${report.index.release}.`,
    compose: { include },
  };
  return { resource, leftOut };
}

/** Offer text as a file download (a local blob: URL; nothing is uploaded). */
export function download(filename, mime, text) {
  const blob = new Blob([text], { type: mime });
  const url = URL.createObjectURL(blob);
  const a = document.createElement("a");
  a.href = url;
  a.download = filename;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
