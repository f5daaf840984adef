//! The rollcall command line: argument parsing, output and exit status only;
//! all checking is in the library.
//!
//! Exit status: 0 no error-level finding, 1 error-level findings, 2 usage or
//! input error.

use rollcall::check::DaysError;
use rollcall::list::{Draft, Reading};
use rollcall::mixed::{check_listed_draft, systems_named_in, Primary};
use rollcall::systems::System;
use rollcall::{render, CheckOptions, Date, Index, View};
use std::io::Read;
use std::process::ExitCode;

mod args;
mod check;
mod compare;
mod find;
mod flags;
mod indexes;
mod info;
mod input;
mod show;
mod translate;

use args::*;
use indexes::*;
use input::*;

fn run(argv: &[String]) -> Result<ExitCode, String> {
    if argv.is_empty() || argv.iter().any(|a| a == "-h" || a == "--help") {
        print!("{}", flags::help());
        return Ok(ExitCode::SUCCESS);
    }
    if argv[0] == "--version" {
        println!("rollcall {}", env!("CARGO_PKG_VERSION"));
        return Ok(ExitCode::SUCCESS);
    }
    let a = parse(argv).map_err(|Usage(m)| format!("{m}\n(see rollcall --help)"))?;
    // The parser has found the command in the table, and checked the
    // format against the command's (the first is the default).
    let Some(c) = flags::command(&a.command) else {
        return Err(format!(
            "unknown command \"{}\"; the commands are {} (see rollcall --help)",
            a.command,
            flags::command_names()
        ));
    };
    let format = a
        .format
        .clone()
        .unwrap_or_else(|| c.formats.first().copied().unwrap_or("text").to_string());
    (c.run)(&a, &format)
}

fn write_out(s: &str) {
    use std::io::Write;
    let mut out = std::io::stdout().lock();
    // A closed pipe (rollcall ... | head) is not an error worth a message.
    let _ = out.write_all(s.as_bytes());
}

/// `value` as pretty JSON and a newline on standard output, written while
/// it is serialised.
fn write_json(value: &impl serde::Serialize) {
    use std::io::Write;
    let mut out = std::io::BufWriter::with_capacity(1 << 16, std::io::stdout().lock());
    // As in write_out: a closed pipe ends the output quietly.
    if serde_json::to_writer_pretty(&mut out, value).is_ok() {
        let _ = out.write_all(b"\n");
    }
    let _ = out.flush();
}

/// `value` on standard output in `format`: JSON as it is serialised, else
/// the CSV or the text its renderers write.
fn write_as<T: serde::Serialize>(
    format: &str,
    value: &T,
    csv: fn(&T) -> String,
    text: fn(&T) -> String,
) {
    match format {
        "json" => write_json(value),
        "csv" => write_out(&csv(value)),
        _ => write_out(&text(value)),
    }
}

fn main() -> ExitCode {
    let argv: Vec<String> = std::env::args().skip(1).collect();
    match run(&argv) {
        Ok(code) => code,
        Err(msg) => {
            eprintln!("rollcall: {msg}");
            ExitCode::from(2)
        }
    }
}
