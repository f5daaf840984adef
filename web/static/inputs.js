// Turning files into the lines the checker reads. TXT, CSV and TSV files are
// taken as they are (the checker finds the code and label columns itself, and
// line numbers stay those of the file); a FHIR ValueSet becomes
// "code<TAB>display" lines, with a system column when it holds concepts of
// other code systems than ICD-10-CM.

export const FHIR_ICD10CM = "http://hl7.org/fhir/sid/icd-10-cm";

/** A cell made safe to sit in a tab-separated line. */
function flat(value) {
  return String(value ?? "").replace(/[\t\r\n]+/g, " ").trim();
}

/**
 * The concepts of a FHIR ValueSet as lines: those of
 * compose.include[].concept[] and expansion.contains[] (nested too), each
 * code of each system once. ICD-10-CM concepts alone (or concepts without a
 * system) become "code<TAB>display"; with other systems, the lines get a
 * heading and a system column holding each concept's system URI
 * ("system<TAB>code<TAB>display"), which the checker reads per row (an
 * unknown URI is a finding on its line, never dropped).
 */
export function valueSetToLines(vs) {
  if (!vs || typeof vs !== "object" || Array.isArray(vs)) {
    throw new Error("the JSON file is not a FHIR resource");
  }
  if (vs.resourceType !== "ValueSet") {
    throw new Error(`the JSON file is a FHIR ${vs.resourceType ? `“${vs.resourceType}”` : "resource without resourceType"}, not a ValueSet`);
  }
  const seen = new Set();
  const rows = [];
  const add = (system, code, display) => {
    const c = flat(code);
    const sys = flat(system);
    const key = `${sys || FHIR_ICD10CM}\t${c}`;
    if (!c || seen.has(key)) return;
    seen.add(key);
    rows.push({ system: sys, code: c, display: flat(display) });
  };
  const includes = vs.compose && Array.isArray(vs.compose.include) ? vs.compose.include : [];
  let filtersOnly = 0;
  for (const inc of includes) {
    if (!inc || typeof inc !== "object") continue;
    if (!Array.isArray(inc.concept)) {
      if (inc.filter || inc.valueSet) filtersOnly++;
      continue;
    }
    for (const c of inc.concept) if (c && typeof c === "object") add(inc.system, c.code, c.display);
  }
  const walk = (items) => {
    if (!Array.isArray(items)) return;
    for (const c of items) {
      if (!c || typeof c !== "object") continue;
      if (c.code !== undefined && !c.abstract) add(c.system, c.code, c.display);
      walk(c.contains);
    }
  };
  if (vs.expansion) walk(vs.expansion.contains);
  const systems = new Set(rows.map((r) => r.system || FHIR_ICD10CM));
  const mixed = systems.size > 1 || (rows.length > 0 && !systems.has(FHIR_ICD10CM));
  const lines = mixed
    ? ["system\tcode\tdisplay", ...rows.map((r) => `${r.system}\t${r.code}\t${r.display}`)]
    : rows.map((r) => (r.display ? `${r.code}\t${r.display}` : r.code));
  const notes = [];
  if (mixed) notes.push(`${systems.size} code systems, named in the system column (${[...systems].join(", ")})`);
  if (filtersOnly) notes.push(`${filtersOnly} include rule(s) given by filter or other value set cannot be read`);
  if (vs.compose && Array.isArray(vs.compose.exclude) && vs.compose.exclude.length) notes.push("compose.exclude is not applied");
  if (!rows.length) throw new Error("the ValueSet lists no concepts (compose.include[].concept or expansion.contains)");
  return { text: lines.join("\n"), notes, count: rows.length };
}

/**
 * Turn the text of a dropped or opened file into checker lines.
 * Returns {text, note}; throws an Error with a readable message.
 */
export function fileToLines(name, raw) {
  const lower = String(name || "").toLowerCase();
  const text = String(raw).replace(/^\uFEFF/, "");
  if (text.includes("\u0000")) throw new Error(`“${name}” is not a text file`);
  const looksJson = /^\s*[{[]/.test(text);
  if (lower.endsWith(".json") || (looksJson && !lower.match(/\.(csv|tsv|txt)$/))) {
    let vs;
    try {
      vs = JSON.parse(text);
    } catch (e) {
      throw new Error(`“${name}” is not valid JSON: ${e.message}`);
    }
    const { text: lines, notes, count } = valueSetToLines(vs);
    return { text: lines, note: `Read ${count} concept(s) from the FHIR ValueSet “${name}”.${notes.length ? " " + notes.join("; ") + "." : ""}` };
  }
  const lines = text.replace(/\r\n?/g, "\n").replace(/\n$/, "");
  return { text: lines, note: `Read ${lines === "" ? 0 : lines.split("\n").length} line(s) from “${name}”.` };
}
