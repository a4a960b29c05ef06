//! Helpers shared by the command-line tests.

#![allow(dead_code, reason = "each test file uses a different part")]
#![allow(
    clippy::unwrap_used,
    reason = "a test helper that fails should panic loudly"
)]

use std::process::{Command, Output};

/// Runs the built binary.
pub fn planewise(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_planewise"))
        .args(args)
        .output()
        .unwrap()
}

/// Runs the built binary and insists it succeeded (its stderr is the failure message).
pub fn planewise_ok(args: &[&str]) -> Output {
    let out = planewise(args);
    assert!(
        out.status.success(),
        "planewise {}: {}",
        args.join(" "),
        String::from_utf8_lossy(&out.stderr)
    );
    out
}

/// Each case (arguments after `subcommand`, the argument name the message must contain)
/// exits with status 2, prints one line on stderr naming the argument, and nothing on stdout.
pub fn assert_bad_input(subcommand: &str, cases: &[(&[&str], &str)]) {
    for (args, name) in cases {
        let mut full = vec![subcommand];
        full.extend_from_slice(args);
        let out = planewise(&full);
        let stderr = String::from_utf8_lossy(&out.stderr);
        assert_eq!(out.status.code(), Some(2), "{args:?}: {stderr}");
        assert!(out.stdout.is_empty(), "{args:?} printed on stdout");
        assert_eq!(stderr.trim_end().lines().count(), 1, "{args:?}: {stderr}");
        assert!(
            stderr.contains(name),
            "{args:?}: '{stderr}' does not name {name}"
        );
    }
}

/// Tests never open a native dialog: this one answers as a machine without a desktop portal or
/// zenity does.
pub struct NoDialogs;

impl planewise::window::app::Dialogs for NoDialogs {
    fn save_figure(&self, _suggested_name: &str) -> planewise::window::app::DialogOutcome {
        unavailable()
    }
    fn open_project(&self) -> planewise::window::app::DialogOutcome {
        unavailable()
    }
    fn save_project(&self, _suggested_name: &str) -> planewise::window::app::DialogOutcome {
        unavailable()
    }
    fn save_report(&self, _suggested_name: &str) -> planewise::window::app::DialogOutcome {
        unavailable()
    }
}

fn unavailable() -> planewise::window::app::DialogOutcome {
    planewise::window::app::DialogOutcome::Unavailable("test machine: no desktop portal".to_owned())
}

/// Types `text` into the window's text field whose accessible name (its hint or tooltip) starts
/// with `name`, replacing what it held, as a user does: focus, select all, type.
pub fn type_into(
    h: &mut egui_kittest::Harness<'static, planewise::window::app::PlanewiseApp>,
    name: &str,
    text: &str,
) {
    use egui_kittest::kittest::Queryable as _;
    fn field<'a>(
        h: &'a egui_kittest::Harness<'static, planewise::window::app::PlanewiseApp>,
        name: &'a str,
    ) -> egui_kittest::Node<'a> {
        h.get(
            egui_kittest::kittest::by()
                .role(egui::accesskit::Role::TextInput)
                .predicate(move |n| n.label().is_some_and(|l| l.starts_with(name))),
        )
    }
    field(h, name).focus();
    h.run();
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::A);
    h.key_press(egui::Key::Backspace);
    h.run();
    field(h, name).type_text(text);
    h.run();
}
