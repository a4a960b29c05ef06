//! Undo and redo: the states to go back and forward to, in bounded stacks, with runs of edits
//! of the same field merged into one step.

use std::collections::VecDeque;

/// How many steps back undo reaches.
pub const LIMIT: usize = 500;

/// Undo and redo stacks of states `T`; `K` names the field an edit touched, so that edits that
/// follow each other in the same field merge into one step.
#[derive(Debug)]
pub struct History<T, K> {
    undo: VecDeque<T>,
    redo: Vec<T>,
    last: Option<K>,
}

impl<T, K> Default for History<T, K> {
    fn default() -> Self {
        Self {
            undo: VecDeque::new(),
            redo: Vec::new(),
            last: None,
        }
    }
}

impl<T: Clone, K: PartialEq + Copy> History<T, K> {
    /// Records `before` as the state to return to, unless this edit continues the previous
    /// one in the same field. The oldest step is dropped past [`LIMIT`].
    pub fn record(&mut self, before: &T, coalesce: Option<K>) {
        if coalesce.is_none() || coalesce != self.last || self.undo.is_empty() {
            self.undo.push_back(before.clone());
            if self.undo.len() > LIMIT {
                self.undo.pop_front();
            }
        }
        self.last = coalesce;
        self.redo.clear();
    }

    /// The state to go back to from `current`, which becomes the state redo returns to.
    pub fn undo(&mut self, current: T) -> Option<T> {
        let back = self.undo.pop_back()?;
        self.redo.push(current);
        self.last = None;
        Some(back)
    }

    /// The state to go forward to from `current`, which becomes the state undo returns to.
    pub fn redo(&mut self, current: T) -> Option<T> {
        let forward = self.redo.pop()?;
        self.undo.push_back(current);
        self.last = None;
        Some(forward)
    }

    /// Ends any run of merged edits (the next edit starts a new undo step).
    pub fn break_run(&mut self) {
        self.last = None;
    }

    /// Forgets every step (a project was opened or created).
    pub fn clear(&mut self) {
        *self = Self::default();
    }

    /// Whether there is anything to undo.
    #[must_use]
    pub fn can_undo(&self) -> bool {
        !self.undo.is_empty()
    }

    /// Whether there is anything to redo.
    #[must_use]
    pub fn can_redo(&self) -> bool {
        !self.redo.is_empty()
    }

    /// Steps back undo can take.
    #[must_use]
    pub fn undo_len(&self) -> usize {
        self.undo.len()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn merged_runs_bounded_stack_and_redo() {
        assert_eq!(LIMIT, 500, "the loop below records more than LIMIT steps");
        let mut h: History<i32, u8> = History::default();
        h.record(&0, Some(1));
        h.record(&1, Some(1)); // same field: merged
        h.record(&2, Some(2));
        assert_eq!(h.undo_len(), 2);
        assert_eq!(h.undo(3), Some(2));
        assert_eq!(h.undo(2), Some(0));
        assert_eq!(h.undo(0), None);
        assert_eq!(h.redo(0), Some(2));
        for i in 0..510 {
            h.record(&i, None);
        }
        assert_eq!(h.undo_len(), LIMIT);
        assert!(!h.can_redo());
    }
}
