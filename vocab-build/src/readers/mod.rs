//! One module per release format: each parses the text of one official
//! file into plain rows (or, for a release that states its own hierarchy,
//! into `stated::Term`s) and names the file and line of a bad row. What the
//! rows contribute to an index is decided in `assemble` (dated ICD
//! releases) or `stated` (ontologies and imports).

pub mod codefile;
pub mod conversion;
pub mod csv;
pub mod gems;
pub mod history;
pub mod loinc;
pub mod obo;
pub mod order;
pub mod rxnorm;
pub mod table;
pub mod tabular;
pub mod xml;
