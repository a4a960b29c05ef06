//! Start-up only: parse the command line, run a subcommand or open the window.

use std::io::Write as _;
use std::process::ExitCode;

use clap::Parser as _;
use planewise::cli::{Cli, CliError, run};

fn main() -> ExitCode {
    let cli = match Cli::try_parse() {
        Ok(cli) => cli,
        Err(e) => {
            if !e.use_stderr() {
                // --help and --version.
                let _ = e.print();
                return ExitCode::SUCCESS;
            }
            // One line naming the argument, as for every other bad input.
            // clap continues some messages on indented lines (the arguments involved) before a
            // blank line and the usage; join them.
            let rendered = e.render().to_string();
            let message: Vec<&str> = rendered
                .lines()
                .take_while(|l| !l.trim().is_empty())
                .map(str::trim)
                .collect();
            let mut message = message.join(" ");
            // clap's "tip: a similar subcommand exists: 'analyze'" follows the blank line.
            for tip in rendered
                .lines()
                .filter_map(|l| l.trim().strip_prefix("tip: "))
            {
                message.push_str("; ");
                message.push_str(tip);
            }
            let message = message.strip_prefix("error: ").unwrap_or(&message);
            eprintln!("planewise: {message} (see planewise --help)");
            return ExitCode::from(2);
        }
    };
    let Some(command) = cli.command else {
        return match planewise::window::app::run(
            cli.screenshot.as_deref(),
            cli.tab,
            cli.project.as_deref(),
            cli.table
                .as_deref()
                .map(|path| planewise::window::app::TableStart {
                    path,
                    unit: cli.table_unit,
                    ids: cli.table_ids.clone(),
                    first_case: cli.table_as.clone(),
                    more: cli
                        .table_case
                        .iter()
                        .map(|t| match t.split_once('=') {
                            Some((c, f)) => (c.trim().to_owned(), f.to_owned()),
                            None => (String::new(), t.clone()),
                        })
                        .collect(),
                }),
            cli.fatigue_history
                .zip(cli.fatigue_unit)
                .map(|(path, unit)| {
                    let pair = |text: Option<&str>| {
                        let text = text.unwrap_or_default();
                        let (a, b) = text.split_once(',').unwrap_or((text, ""));
                        (a.trim().to_owned(), b.trim().to_owned())
                    };
                    planewise::window::app::FatigueStart {
                        path,
                        unit,
                        limits: pair(cli.fatigue_limits.as_deref()),
                        sn: cli.fatigue_sn.as_deref().map(|s| pair(Some(s))),
                    }
                }),
            &planewise::cli::subcommand_names(),
        ) {
            Ok(()) => ExitCode::SUCCESS,
            Err(e) => {
                eprintln!("planewise: {e:#}");
                ExitCode::FAILURE
            }
        };
    };
    match run(&command) {
        Ok(out) => {
            let mut stdout = std::io::stdout().lock();
            match stdout
                .write_all(out.as_bytes())
                .and_then(|()| stdout.flush())
            {
                Ok(()) => ExitCode::SUCCESS,
                // The reader stopped early (`… | head`): nothing is wrong.
                Err(e) if e.kind() == std::io::ErrorKind::BrokenPipe => ExitCode::SUCCESS,
                Err(e) => {
                    eprintln!("planewise: could not write the output: {e}");
                    ExitCode::FAILURE
                }
            }
        }
        Err(CliError::Arg(e)) => {
            eprintln!("planewise: {e}");
            ExitCode::from(2)
        }
        Err(CliError::Other(e)) => {
            if e.downcast_ref::<std::io::Error>()
                .is_some_and(|io| io.kind() == std::io::ErrorKind::BrokenPipe)
            {
                return ExitCode::SUCCESS;
            }
            eprintln!("planewise: {e:#}");
            ExitCode::FAILURE
        }
    }
}
