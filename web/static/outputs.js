// What the page hands back beside the core's exports (the cleaned list as
// CSV, the FHIR ValueSet and the codes the list reaches, written by
// rollcall::export through the worker): the cleaned list as shown, the
// report as JSON (the CLI's schema, untouched) and the download itself.

// Lines left out of the cleaned list: skipped ones, and codes of another
// system (they belong in a list of their own).
const SKIPPED = new Set(["blank", "comment", "column-headings"]);

/**
 * The cleaned list as the page shows it, by the rule of the core's
 * `export::cleaned` (which writes every download): each usable code once,
 * in input order, as {code, label, description, status, line, system};
 * entries with an error-level finding are left out and listed as
 * {line, code, kinds}.
 */
export function cleanedRows(report) {
  const seen = new Set();
  const rows = [];
  const leftOut = [];
  for (const e of report.entries) {
    if (SKIPPED.has(e.status)) continue;
    const errors = e.findings.filter((f) => f.severity === "error").map((f) => f.kind);
    if (errors.length) {
      leftOut.push({ line: e.line, code: e.code ?? e.input.trim().split(/[\t,]/)[0].trim(), kinds: errors });
      continue;
    }
    if (e.status === "other-system" || e.code == null) continue;
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
  return { rows, leftOut };
}

/** The report exactly as the checker gave it, as the CLI prints it. */
export function toJsonReport(report) {
  return JSON.stringify(report, null, 2) + "\n";
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
