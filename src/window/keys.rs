//! Every key of the window in one table ([`bindings`]): what it does, in the words the menus,
//! tooltips and Help → Keys and mouse use, the keys that do it and where they work. The global
//! handler ([`pressed`]), the menus ([`keys_text`]), the walk-through tab and the help's list
//! ([`list`]) all read this table, so a key changed here changes everywhere.

use egui::{Key, KeyboardShortcut, Modifiers};

use crate::picture::draw::camera::ViewPreset;
use crate::window::session::Command;

/// What a key does.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Act {
    /// Start a new project.
    NewProject,
    /// Open a project file.
    OpenProject,
    /// Save the project.
    Save,
    /// Save the project under a new name.
    SaveAs,
    /// Undo the last change.
    Undo,
    /// Redo what was undone.
    Redo,
    /// Open the export of the shown figure.
    ExportFigure,
    /// Copy the results as tab-separated text.
    CopyResults,
    /// Show or hide the left panel (inputs).
    LeftPanel,
    /// Show or hide the right panel (verdict and results).
    RightPanel,
    /// Turn the 3D view to a preset.
    View(ViewPreset),
    /// Walk-through: the next step.
    StepNext,
    /// Walk-through: the step before.
    StepBack,
    /// Walk-through: present the picture and its words only, or stop presenting.
    Present,
    /// Walk-through: leave presenting (or the walk-through when not presenting).
    Leave,
}

/// A key and how it is read.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Chord {
    /// Modifiers and a key, taken from the input so no widget also acts on it.
    Shortcut(KeyboardShortcut),
    /// A key pressed with any modifiers, left in the input.
    Key(Key),
}

/// Where a binding works.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Scope {
    /// Anywhere in the window, even while a text field has the keyboard.
    Window,
    /// Anywhere, when no text field has the keyboard (plain keys would be typed otherwise).
    NoTextField,
    /// In the walk-through tab, when no text field has the keyboard.
    Walkthrough,
}

/// One row of the table.
#[derive(Clone, Debug, PartialEq)]
pub struct Binding {
    /// What it does.
    pub act: Act,
    /// The keys, the first the one menus show first.
    pub chords: Vec<Chord>,
    /// What it does, in words (Help → Keys and mouse).
    pub what: String,
    /// Where it works.
    pub scope: Scope,
}

const fn command(key: Key) -> Chord {
    Chord::Shortcut(KeyboardShortcut::new(Modifiers::COMMAND, key))
}

const fn command_shift(key: Key) -> Chord {
    Chord::Shortcut(KeyboardShortcut::new(
        Modifiers::COMMAND.plus(Modifiers::SHIFT),
        key,
    ))
}

/// The 3D view's presets' keys, in [`ViewPreset::ALL`] order.
const VIEW_KEYS: [Key; 8] = [
    Key::Num1,
    Key::Num2,
    Key::Num3,
    Key::Num4,
    Key::Num5,
    Key::Num6,
    Key::Num7,
    Key::Num8,
];

/// Every binding, in the order Help lists them.
#[must_use]
pub fn bindings() -> Vec<Binding> {
    let row = |act, chords: &[Chord], what: &str, scope| Binding {
        act,
        chords: chords.to_vec(),
        what: what.to_owned(),
        scope,
    };
    let mut out = vec![
        row(
            Act::NewProject,
            &[command(Key::N)],
            "New project",
            Scope::Window,
        ),
        row(
            Act::OpenProject,
            &[command(Key::O)],
            "Open a project",
            Scope::Window,
        ),
        row(
            Act::Save,
            &[command(Key::S)],
            "Save the project",
            Scope::Window,
        ),
        row(
            Act::SaveAs,
            &[command_shift(Key::S)],
            "Save the project under a new name",
            Scope::Window,
        ),
        row(Act::Undo, &[command(Key::Z)], "Undo", Scope::Window),
        row(
            Act::Redo,
            &[command_shift(Key::Z), command(Key::Y)],
            "Redo",
            Scope::Window,
        ),
        row(
            Act::ExportFigure,
            &[command(Key::E)],
            "Export the shown figure",
            Scope::Window,
        ),
        row(
            Act::CopyResults,
            &[command_shift(Key::C)],
            "Copy the results as text",
            Scope::Window,
        ),
        row(
            Act::LeftPanel,
            &[Chord::Key(Key::F9)],
            "Show or hide the left panel",
            Scope::Window,
        ),
        row(
            Act::RightPanel,
            &[Chord::Key(Key::F10)],
            "Show or hide the right panel",
            Scope::Window,
        ),
    ];
    for (key, preset) in VIEW_KEYS.into_iter().zip(ViewPreset::ALL) {
        out.push(Binding {
            act: Act::View(preset),
            chords: vec![Chord::Shortcut(KeyboardShortcut::new(Modifiers::NONE, key))],
            what: format!("3D view: {}", preset.label()),
            scope: Scope::NoTextField,
        });
    }
    out.extend([
        row(
            Act::StepNext,
            &[Chord::Key(Key::ArrowRight), Chord::Key(Key::Space)],
            "Walk-through: next step",
            Scope::Walkthrough,
        ),
        row(
            Act::StepBack,
            &[Chord::Key(Key::ArrowLeft)],
            "Walk-through: previous step",
            Scope::Walkthrough,
        ),
        row(
            Act::Present,
            &[Chord::Key(Key::F11)],
            "Walk-through: present the picture and its words only",
            Scope::Walkthrough,
        ),
        row(
            Act::Leave,
            &[Chord::Key(Key::Escape)],
            "Walk-through: leave presenting",
            Scope::Walkthrough,
        ),
    ]);
    out
}

/// The binding of `act`.
#[must_use]
pub fn binding(act: Act) -> Binding {
    bindings()
        .into_iter()
        .find(|b| b.act == act)
        .unwrap_or_else(|| Binding {
            act,
            chords: Vec::new(),
            what: String::new(),
            scope: Scope::Window,
        })
}

/// One chord as the platform writes it ("Ctrl+Z", "⌘Z", "F9").
#[must_use]
pub fn chord_text(ctx: &egui::Context, chord: &Chord) -> String {
    match chord {
        Chord::Shortcut(s) if s.modifiers.is_none() => s.logical_key.name().to_owned(),
        Chord::Shortcut(s) => ctx.format_shortcut(s),
        Chord::Key(k) => k.name().to_owned(),
    }
}

/// The keys of `act`, as the menus and Help show them ("Ctrl+Shift+Z or Ctrl+Y").
#[must_use]
pub fn keys_text(ctx: &egui::Context, act: Act) -> String {
    binding(act)
        .chords
        .iter()
        .map(|c| chord_text(ctx, c))
        .collect::<Vec<_>>()
        .join(" or ")
}

/// Every key and what it does (Help → Keys and mouse).
#[must_use]
pub fn list(ctx: &egui::Context) -> Vec<(String, String)> {
    bindings()
        .into_iter()
        .map(|b| (keys_text(ctx, b.act), b.what))
        .collect()
}

/// The acts whose keys were pressed this frame among the bindings of `scope` (the caller knows
/// whether it is in that scope). Chords with more modifiers are read first, so Ctrl+Shift+Z is
/// not taken as Ctrl+Z.
#[must_use]
pub fn pressed(ctx: &egui::Context, scope: Scope) -> Vec<Act> {
    if scope != Scope::Window && ctx.egui_wants_keyboard_input() {
        return Vec::new();
    }
    let mut chords: Vec<(Act, Chord)> = bindings()
        .into_iter()
        .filter(|b| b.scope == scope)
        .flat_map(|b| b.chords.into_iter().map(move |c| (b.act, c)))
        .collect();
    let weight = |c: &Chord| match c {
        Chord::Shortcut(s) => {
            u8::from(s.modifiers.shift) + u8::from(s.modifiers.command || s.modifiers.ctrl)
        }
        Chord::Key(_) => 0,
    };
    chords.sort_by_key(|(_, c)| std::cmp::Reverse(weight(c)));
    let mut out = Vec::new();
    ctx.input_mut(|i| {
        for (act, chord) in chords {
            let hit = match chord {
                Chord::Shortcut(s) => i.consume_shortcut(&s),
                Chord::Key(k) => i.key_pressed(k),
            };
            if hit && !out.contains(&act) {
                out.push(act);
            }
        }
    });
    out
}

impl Act {
    /// The command a window-wide act gives (the walk-through's acts are the tab's own).
    #[must_use]
    pub fn command(self) -> Option<Command> {
        Some(match self {
            Self::NewProject => Command::NewProject,
            Self::OpenProject => Command::OpenProject,
            Self::Save => Command::Save,
            Self::SaveAs => Command::SaveAs,
            Self::Undo => Command::Undo,
            Self::Redo => Command::Redo,
            Self::ExportFigure => Command::OpenExport,
            Self::CopyResults => Command::CopyResults(crate::output::results::CopyFormat::Tsv),
            Self::LeftPanel => Command::ToggleInputs,
            Self::RightPanel => Command::ToggleResults,
            Self::View(preset) => Command::SetView(preset),
            Self::StepNext | Self::StepBack | Self::Present | Self::Leave => return None,
        })
    }
}

/// What the mouse does, where.
pub const MOUSE: [(&str, &str); 6] = [
    ("Drag in the 3D view", "Orbit"),
    ("Right-drag in the 3D view", "Pan"),
    ("Scroll in the 3D view", "Zoom"),
    ("Double-click in the 3D view", "Reset the view"),
    (
        "Drag the white handle at the tip of n",
        "Turn the cut plane",
    ),
    (
        "Click or drag in the map or the Mohr circles",
        "Put the cut plane there",
    ),
];
