//! The user's words on a figure: the strip above each figure tab (a caption field, "Pin a note"
//! and the notes listed with their text and a remove button), and the pointer handling that
//! pins a new note where the user clicks and moves a note's text by dragging it. Every change is
//! one [`Edit::SetAnnotations`], so undo takes back a new note, a drag or a retyped text.

use crate::picture::draw::Pos;
use crate::picture::draw::place::Pinned;
use crate::study::Edit;
use crate::study::annotations::{Annotation, FigureKind, Pin};
use crate::window::session::{Coalesce, Command};

/// Whether the next click on `kind`'s figure pins a note.
fn pinning_id(kind: FigureKind) -> egui::Id {
    egui::Id::unique(("planewise-pinning", kind))
}

fn set_all(all: Vec<Annotation>, coalesce: Option<Coalesce>, out: &mut Vec<Command>) {
    out.push(Command::Edit {
        edit: Edit::SetAnnotations(all),
        coalesce,
    });
}

/// The strip above a figure: caption, "Pin a note" and the list of this figure's notes for
/// `case`.
pub fn notes_bar(
    ui: &mut egui::Ui,
    case: &str,
    kind: FigureKind,
    all: &[Annotation],
    out: &mut Vec<Command>,
) {
    let id = pinning_id(kind);
    let mut pinning = ui.data(|d| d.get_temp::<bool>(id).unwrap_or(false));
    ui.horizontal_wrapped(|ui| {
        let pin = ui
            .selectable_label(pinning, "Pin a note")
            .on_hover_text(
                "Then click the figure where the note belongs (N). Drag a note's text to move it; Ctrl+Z takes a note or a move back.",
            );
        if pin.clicked() {
            pinning = !pinning;
        }
        if ui.input(|i| i.key_pressed(egui::Key::N) && !i.modifiers.any())
            && !ui.ctx().egui_wants_keyboard_input()
        {
            pinning = !pinning;
        }
        ui.label("Caption:");
        let caption_at = all
            .iter()
            .position(|a| a.case == case && a.figure == kind && a.is_caption());
        let mut caption = caption_at.map_or_else(String::new, |i| all[i].text.clone());
        let edit = ui.add(
            egui::TextEdit::singleline(&mut caption)
                .id(egui::Id::unique(("planewise-caption", kind)))
                .hint_text("written under the exported figure")
                .desired_width(ui.available_width().min(420.0)),
        );
        if edit.changed() {
            let mut next = all.to_vec();
            match caption_at {
                Some(i) if caption.is_empty() => {
                    next.remove(i);
                }
                Some(i) => next[i].text = caption,
                None => next.push(Annotation::caption(case, kind, &caption)),
            }
            set_all(next, Some(Coalesce::Caption), out);
        }
    });
    ui.data_mut(|d| d.insert_temp(id, pinning));
    let notes: Vec<usize> = all
        .iter()
        .enumerate()
        .filter(|(_, a)| a.case == case && a.figure == kind && !a.is_caption())
        .map(|(i, _)| i)
        .collect();
    if notes.is_empty() {
        return;
    }
    egui::CollapsingHeader::new(format!("Notes on this figure ({})", notes.len()))
        .id_salt(("planewise-notes", kind))
        .show(ui, |ui| {
            for (k, &i) in notes.iter().enumerate() {
                ui.horizontal(|ui| {
                    let mut text = all[i].text.clone();
                    let field = ui.add(
                        egui::TextEdit::singleline(&mut text)
                            .id(egui::Id::unique(("planewise-note", kind, k)))
                            .desired_width(ui.available_width().min(360.0) - 80.0),
                    );
                    if field.changed() {
                        let mut next = all.to_vec();
                        next[i].text = text;
                        set_all(next, Some(Coalesce::NoteText(i)), out);
                    }
                    if ui
                        .button("Remove")
                        .on_hover_text("Remove this note (Ctrl+Z brings it back)")
                        .clicked()
                    {
                        let mut next = all.to_vec();
                        next.remove(i);
                        set_all(next, None, out);
                    }
                });
            }
        });
}

/// A figure's notes on screen: the index of each in the project's annotations and where it is
/// in the figure's pixels (`to_px` gives a pin's position, `None` when it is not on this figure
/// or not in view).
pub fn on_screen(
    case: &str,
    kind: FigureKind,
    all: &[Annotation],
    to_px: impl Fn(&Pin) -> Option<Pos>,
) -> Vec<(usize, Pinned<Pos>)> {
    all.iter()
        .enumerate()
        .filter(|(_, a)| a.case == case && a.figure == kind)
        .filter_map(|(i, a)| {
            let pin = to_px(a.pin.as_ref()?)?;
            Some((
                i,
                Pinned {
                    pin,
                    text: a.text.clone(),
                    offset: a.offset,
                },
            ))
        })
        .collect()
}

/// Pins a note where the user clicks while "Pin a note" is on, and moves a note's text while
/// it is dragged. `rect` is the figure's place on screen, `shown` its notes (from
/// [`on_screen`]), `text_px` the figure's text size and `from_px` the pin at a pixel (or `None`
/// where no pin can go). Returns whether the pointer was used here, so the figure's own click
/// and drag (moving the cut plane, orbiting) stay out of it.
#[allow(
    clippy::too_many_arguments,
    reason = "one call site per figure tab, each line named"
)]
pub fn handle_pointer(
    ui: &egui::Ui,
    response: &egui::Response,
    rect: egui::Rect,
    case: &str,
    kind: FigureKind,
    all: &[Annotation],
    shown: &[(usize, Pinned<Pos>)],
    text_px: f32,
    from_px: impl Fn(Pos) -> Option<Pin>,
    out: &mut Vec<Command>,
) -> bool {
    let local = |p: egui::Pos2| [p.x - rect.min.x, p.y - rect.min.y];
    let grabbed_id = response.id.with("note-grab");
    // As drawn: kept inside the picture.
    let drawn: Vec<(usize, Pinned<Pos>)> = shown
        .iter()
        .map(|(i, n)| (*i, n.inside(rect.width(), rect.height(), text_px)))
        .collect();
    let over_note = |p: Pos| {
        drawn
            .iter()
            .find(|(_, n)| n.rect(text_px).grown(3.0).contains(p))
            .map(|(i, n)| {
                (
                    *i,
                    [p[0] - n.text_at(text_px)[0], p[1] - n.text_at(text_px)[1]],
                )
            })
    };
    if response.drag_started_by(egui::PointerButton::Primary) {
        // Where the button went down, not where the drag was first noticed a few pixels on.
        let grab = ui
            .input(|i| i.pointer.press_origin())
            .or(response.interact_pointer_pos())
            .map(local)
            .and_then(over_note);
        ui.data_mut(|d| d.insert_temp(grabbed_id, grab));
    }
    let grab = ui.data(|d| d.get_temp::<Option<(usize, Pos)>>(grabbed_id).flatten());
    let serial = super::drag_serial(ui, response);
    if response.drag_stopped() {
        ui.data_mut(|d| d.remove::<Option<(usize, Pos)>>(grabbed_id));
    }
    if let Some((index, hold)) = grab {
        ui.ctx().set_cursor_icon(egui::CursorIcon::Grabbing);
        if response.dragged_by(egui::PointerButton::Primary)
            && response.drag_delta() != egui::Vec2::ZERO
            && let Some(p) = response.interact_pointer_pos().map(local)
            && let Some((_, note)) = shown.iter().find(|(i, _)| *i == index)
        {
            let text_at = [p[0] - hold[0], p[1] - hold[1]];
            let mut next = all.to_vec();
            next[index].offset = [
                (text_at[0] - note.pin[0]) / text_px,
                (text_at[1] - note.pin[1]) / text_px,
            ];
            set_all(next, Some(Coalesce::NoteDrag(serial)), out);
        }
        return true;
    }
    if response
        .hover_pos()
        .map(local)
        .and_then(over_note)
        .is_some()
    {
        ui.ctx().set_cursor_icon(egui::CursorIcon::Grab);
    }
    let id = pinning_id(kind);
    let pinning = ui.data(|d| d.get_temp::<bool>(id).unwrap_or(false));
    if pinning {
        ui.ctx().set_cursor_icon(egui::CursorIcon::Crosshair);
        if response.clicked()
            && let Some(pin) = response.interact_pointer_pos().map(local).and_then(from_px)
        {
            let count = all
                .iter()
                .filter(|a| a.case == case && !a.is_caption())
                .count();
            let mut next = all.to_vec();
            next.push(Annotation::note(case, pin, &format!("Note {}", count + 1)));
            set_all(next, None, out);
            ui.data_mut(|d| d.insert_temp(id, false));
        }
        return true;
    }
    false
}
