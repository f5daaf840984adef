// The page's own words: the core writes its messages for the command line
// (they name options such as --system); on the page the same advice is
// worded for what the page has (the "Code system" menu, a system column).
// Also each system's credit for the footer.

const TITLES = {
  icd10cm: "ICD-10-CM",
  icd10pcs: "ICD-10-PCS",
  icd9cm: "ICD-9-CM",
  hpo: "HPO",
  loinc: "LOINC",
  snomed: "SNOMED CT",
  ndc: "NDC",
  hcpcs: "HCPCS Level II",
  cpt: "CPT",
  rxnorm: "RxNorm",
};

/** A system's title by its name (icd10pcs -> ICD-10-PCS). */
export function titleOf(name) {
  return TITLES[name] || name;
}

/** A core message as the page says it: no command-line options. */
export function pageWords(message) {
  return String(message)
    .replace(/with --system ([a-z0-9]+)/g, (_, s) => `: pick “${titleOf(s)}” under Code system`)
    .replace(/\(--system NAME\)/g, "(in a “system” column, or under Code system)")
    .replace(
      /check these rows with rollcall check --system ([a-z0-9]+) \(the command line has every bundled index built in\) or on the served page, which fetches the index when a list needs it/g,
      (_, s) => `check these rows in a list of their own with “${titleOf(s)}” picked under Code system (on the served page; this one-file page holds the ICD-10-CM index only)`,
    )
    .replace(/--system ([a-z0-9]+)/g, (_, s) => `“${titleOf(s)}” under Code system`)
    .replace(/\bas on the command line\b/g, "");
}

// Who each bundled release comes from and on what terms (the release files
// are listed in vocab-build/sources/PROVENANCE.md); HPO's credit is the
// index's own notice, shown beside this.
const CREDITS = {
  icd10cm:
    "ICD-10-CM is a U.S. federal work from the Centers for Medicare & Medicaid Services (CMS) and the National Center for Health Statistics (CDC/NCHS); it is in the public domain. rollcall is not affiliated with or endorsed by CMS or CDC.",
  icd10pcs:
    "ICD-10-PCS is a U.S. federal work from the Centers for Medicare & Medicaid Services (CMS); it is in the public domain. rollcall is not affiliated with or endorsed by CMS.",
  icd9cm:
    "ICD-9-CM (its final release, FY2015, with the 2015 General Equivalence Mappings) is a U.S. federal work from the Centers for Medicare & Medicaid Services (CMS) and the National Center for Health Statistics (CDC/NCHS); it is in the public domain. rollcall is not affiliated with or endorsed by CMS or CDC.",
  hpo: "The Human Phenotype Ontology (HPO) is made by the HPO consortium and used under its licence, as the notice below says. rollcall is not affiliated with or endorsed by the HPO consortium.",
};

/** The footer's credit for the system in use (shape-only systems hold no content). */
export function creditOf(name) {
  return (
    CREDITS[name] ||
    `${titleOf(name)} is checked by the shape and check digit of its codes only: rollcall holds none of its content.`
  );
}

/** The footer's credit while one of the site's own indexes is in use (its licence notice is shown beside it). */
export function siteCreditOf(title) {
  return `${title} is checked against this site's own index, built by the site from a release it holds under its own licence; rollcall ships none of its content and is not affiliated with or endorsed by its publisher.`;
}
