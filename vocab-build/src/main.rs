//! vocab-build: reads official release files and writes a rollcall index.
//!
//! With no arguments it builds the bundled indexes from
//! `vocab-build/sources/` into `vocab/` (`recipes`). With arguments it
//! builds from any year's official files (`args`, see `--help`); each
//! release format is a module of `readers`, registered in `readers::FORMATS`.

mod args;
mod assemble;
mod build;
mod error;
mod formats;
mod provenance;
mod readers;
mod recipes;
mod stated;

use formats::{Builds, Options};
use readers::*;
use std::path::Path;
use std::process::ExitCode;

fn run(argv: &[String]) -> Result<(), String> {
    let root = Path::new(env!("CARGO_MANIFEST_DIR"));
    let vocab = root.join("..").join("vocab");
    let p = args::parse(argv)?;
    if p.help {
        print!("{}", args::help());
        return Ok(());
    }
    match p.files.as_slice() {
        [] if p.out.is_some() => Err(
            "--out needs source files; with none, vocab-build writes the bundled indexes to vocab/"
                .into(),
        ),
        [] => build_bundled(root, &vocab),
        [one] if one.format.is_own() => {
            let default = match one.format.builds {
                Builds::Own { default_out, .. } => default_out.map(|n| vocab.join(n)),
                Builds::Part { .. } => None,
            };
            let dest = p
                .out
                .or(default)
                .ok_or_else(|| format!("{} needs --out PATH", one.format.flag))?;
            build::build_own(one, &p.options, &dest, None)
        }
        files => {
            let dest = p
                .out
                .unwrap_or_else(|| vocab.join(format!("{}.rcx", p.vocabulary.id)));
            build::build(files, &dest, p.vocabulary, None)
        }
    }
}

/// Builds every bundled index from the sources, each checked against
/// `SHA256SUMS`.
fn build_bundled(root: &Path, vocab: &Path) -> Result<(), String> {
    let dir = root.join("sources");
    let sums = std::fs::read_to_string(dir.join("SHA256SUMS"))
        .map_err(|e| format!("{}: {e}", dir.join("SHA256SUMS").display()))?;
    for r in recipes::bundled(&dir) {
        let dest = vocab.join(r.out);
        match (r.vocabulary, r.files.as_slice()) {
            (Some(v), files) => build::build(files, &dest, v, Some(&sums))?,
            (None, [one]) => build::build_own(one, &Options::default(), &dest, Some(&sums))?,
            (None, _) => return Err(format!("the recipe of {} is not one release", r.out)),
        }
    }
    Ok(())
}

fn main() -> ExitCode {
    let argv: Vec<String> = std::env::args().skip(1).collect();
    match run(&argv) {
        Ok(()) => ExitCode::SUCCESS,
        Err(msg) => {
            eprintln!("vocab-build: {msg}");
            ExitCode::from(2)
        }
    }
}
