//! The arguments: what the command line holds, read as the table of
//! `flags` says, and the check options they give.

use super::*;

pub(crate) struct Usage(pub(crate) String);

pub(crate) fn today() -> Date {
    let secs = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|d| d.as_secs())
        .unwrap_or(0);
    Date::from_days((secs / 86_400) as i32)
}

#[derive(Default)]
pub(crate) struct Args {
    pub(crate) command: String,
    pub(crate) files: Vec<String>,
    pub(crate) on: Option<Date>,
    pub(crate) from: Option<Date>,
    pub(crate) to: Option<Date>,
    pub(crate) billable: bool,
    pub(crate) format: Option<String>,
    pub(crate) index: Option<String>,
    /// show: a notes file for the index.
    pub(crate) notes: Option<String>,
    pub(crate) system: Option<String>,
    /// translate: the target system.
    pub(crate) into: Option<String>,
    /// check --format fhir: the ValueSet's canonical URL.
    pub(crate) valueset_url: Option<String>,
    /// How to read the list.
    pub(crate) reading: Reading,
    /// find: the day codes in use are preferred on.
    pub(crate) date: Option<Date>,
    /// find: how many codes to list.
    pub(crate) limit: Option<usize>,
}

/// Reads the command line: the command, then its operands and flags, each
/// flag taken only by the commands the table names for it.
pub(crate) fn parse(argv: &[String]) -> Result<Args, Usage> {
    let mut it = argv.iter();
    let name = it
        .next()
        .ok_or_else(|| Usage(format!("a command is needed: {}", flags::command_names())))?;
    let command = flags::command(name).ok_or_else(|| {
        Usage(format!(
            "unknown command \"{name}\"; the commands are {}",
            flags::command_names()
        ))
    })?;
    let mut a = Args {
        command: name.clone(),
        ..Args::default()
    };
    let mut given = Vec::new();
    while let Some(arg) = it.next() {
        if !arg.starts_with("--") {
            a.files.push(arg.clone());
            continue;
        }
        let takes = || flags::flag_names(command.name);
        let flag = flags::flag(arg).ok_or_else(|| {
            Usage(format!(
                "unknown option {arg} for {name}; {name} takes {}",
                takes()
            ))
        })?;
        if !flag.commands.contains(&command.name) {
            return Err(Usage(format!(
                "{arg} goes with {}, not with {name}; {name} takes {}",
                flags::sentence(flag.commands, "and"),
                takes()
            )));
        }
        let value = match flag.value {
            Some(_) => it
                .next()
                .ok_or_else(|| Usage(format!("{arg} needs a value")))?,
            None => "",
        };
        (flag.set)(&mut a, value)?;
        given.push(flag.name);
    }
    if let Some(f) = flags::flags_of(command.name).find(|f| f.required && !given.contains(&f.name))
    {
        return Err(Usage(format!(
            "{name} needs {} {}",
            f.name,
            f.value.unwrap_or_default()
        )));
    }
    if let Some(f) = &a.format {
        let export = command.exports && rollcall::export::FORMATS.contains(&f.as_str());
        if !command.formats.contains(&f.as_str()) && !export {
            let exports = match command.exports {
                true => format!(
                    ", or one of the exports ({})",
                    rollcall::export::FORMATS.join(", ")
                ),
                false => String::new(),
            };
            return Err(Usage(format!(
                "--format must be {}{exports} for {name}, not {f}",
                flags::sentence(command.formats, "or")
            )));
        }
    }
    Ok(a)
}

/// The check options asked for (the core's rule, `CheckOptions::asked`),
/// its refusals worded with the CLI's flags; with no day or period, the
/// default day of the index checked against (`Meta::default_day`), today for
/// a shape check.
pub(crate) fn options(a: &Args, default_day: Date) -> Result<CheckOptions, Usage> {
    CheckOptions::asked(a.on, a.from, a.to, a.billable, default_day).map_err(|e| {
        Usage(match e {
            DaysError::DayAndPeriod => {
                "give either --on DATE or --from DATE --to DATE, not both".into()
            }
            DaysError::Backwards { from, to } => format!("--to {to} is before --from {from}"),
            DaysError::HalfPeriod => "a study period needs both --from and --to".into(),
        })
    })
}
