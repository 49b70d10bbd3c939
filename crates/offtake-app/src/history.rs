//! Undo/redo history of document edits.
//!
//! # How undo works here
//!
//! Views never change the document directly: they push a [`crate::command::Command`]
//! and the app applies all commands at the end of the frame. Commands that
//! change the document are *edits*. Applying an edit returns its **inverse
//! edit** (for a field change: the same field with its old value; for a
//! delete: an insert of the removed item, with its children, at its old
//! position). The history keeps those inverses, so an undo step costs only
//! the size of the touched item, never a snapshot of the whole project.
//!
//! - [`History::apply`] applies an edit, pushes its inverse on the undo stack
//!   and clears the redo stack.
//! - [`History::undo`] pops an inverse, applies it, and pushes *its* inverse
//!   (the original edit) on the redo stack; [`History::redo`] does the mirror.
//! - An edit that fails leaves the document and the history unchanged.
//!
//! The history is generic over the edit type so it does not depend on the
//! shape of the project document.

/// A change to a document `D` that can be undone.
pub trait Edit<D>: Sized {
    /// Why an edit could not be applied (for instance, its target is gone).
    type Error;

    /// Applies the edit to `doc` and returns the edit that undoes it.
    ///
    /// # Errors
    /// Returns an error, with `doc` unchanged, when the edit does not fit the
    /// document (unknown id, index out of range).
    fn apply(self, doc: &mut D) -> Result<Self, Self::Error>;

    /// Short description for menus ("Rename canal").
    fn label(&self) -> String;
}

/// One entry of the history: the edit to apply and the label of the user's action.
#[derive(Debug, Clone)]
struct Entry<E> {
    label: String,
    edit: E,
}

/// Undo and redo stacks of inverse edits.
#[derive(Debug, Clone)]
pub struct History<E> {
    undo: Vec<Entry<E>>,
    redo: Vec<Entry<E>>,
    limit: usize,
}

impl<E> Default for History<E> {
    fn default() -> Self {
        Self::with_limit(Self::DEFAULT_LIMIT)
    }
}

impl<E> History<E> {
    /// Number of undo steps kept by default.
    pub const DEFAULT_LIMIT: usize = 500;

    /// An empty history keeping at most `limit` undo steps (at least one).
    pub fn with_limit(limit: usize) -> Self {
        Self {
            undo: Vec::new(),
            redo: Vec::new(),
            limit: limit.max(1),
        }
    }

    /// Applies `edit` to `doc` and records its inverse.
    ///
    /// # Errors
    /// Passes on the edit's error; the history is then unchanged.
    pub fn apply<D>(&mut self, edit: E, doc: &mut D) -> Result<(), E::Error>
    where
        E: Edit<D>,
    {
        let label = edit.label();
        let inverse = edit.apply(doc)?;
        self.undo.push(Entry {
            label,
            edit: inverse,
        });
        if self.undo.len() > self.limit {
            self.undo.remove(0);
        }
        self.redo.clear();
        Ok(())
    }

    /// Undoes the last edit. Returns `None` when there is nothing to undo.
    ///
    /// # Errors
    /// When the inverse cannot be applied, the entry is dropped (it can never
    /// apply again) and its error returned.
    pub fn undo<D>(&mut self, doc: &mut D) -> Option<Result<String, E::Error>>
    where
        E: Edit<D>,
    {
        let Entry { label, edit } = self.undo.pop()?;
        Some(edit.apply(doc).map(|again| {
            self.redo.push(Entry {
                label: label.clone(),
                edit: again,
            });
            label
        }))
    }

    /// Redoes the last undone edit. Returns `None` when there is nothing to redo.
    ///
    /// # Errors
    /// As for [`History::undo`].
    pub fn redo<D>(&mut self, doc: &mut D) -> Option<Result<String, E::Error>>
    where
        E: Edit<D>,
    {
        let Entry { label, edit } = self.redo.pop()?;
        Some(edit.apply(doc).map(|inverse| {
            self.undo.push(Entry {
                label: label.clone(),
                edit: inverse,
            });
            label
        }))
    }

    /// Label of the edit [`History::undo`] would undo.
    pub fn undo_label(&self) -> Option<&str> {
        self.undo.last().map(|e| e.label.as_str())
    }

    /// Label of the edit [`History::redo`] would redo.
    pub fn redo_label(&self) -> Option<&str> {
        self.redo.last().map(|e| e.label.as_str())
    }

    /// Number of steps that can be undone.
    pub fn undo_len(&self) -> usize {
        self.undo.len()
    }

    /// Number of steps that can be redone.
    pub fn redo_len(&self) -> usize {
        self.redo.len()
    }

    /// Forgets every step (after New or Open).
    pub fn clear(&mut self) {
        self.undo.clear();
        self.redo.clear();
    }
}

#[cfg(test)]
mod tests {
    use super::{Edit, History};

    /// A test-only edit on a list of numbers: set one entry, returning the old value.
    #[derive(Debug, Clone, PartialEq)]
    struct Set {
        index: usize,
        value: i32,
    }

    impl Edit<Vec<i32>> for Set {
        type Error = String;
        fn apply(self, doc: &mut Vec<i32>) -> Result<Self, String> {
            let slot = doc
                .get_mut(self.index)
                .ok_or_else(|| format!("no entry {}", self.index))?;
            let old = std::mem::replace(slot, self.value);
            Ok(Set {
                index: self.index,
                value: old,
            })
        }
        fn label(&self) -> String {
            format!("Set entry {}", self.index)
        }
    }

    #[test]
    fn undo_then_redo_restores_each_state() {
        let mut doc = vec![1, 2, 3];
        let mut h = History::default();
        h.apply(
            Set {
                index: 1,
                value: 20,
            },
            &mut doc,
        )
        .expect("apply");
        h.apply(
            Set {
                index: 2,
                value: 30,
            },
            &mut doc,
        )
        .expect("apply");
        assert_eq!(doc, [1, 20, 30]);
        assert_eq!(h.undo_label(), Some("Set entry 2"));
        assert_eq!(h.undo(&mut doc), Some(Ok("Set entry 2".to_owned())));
        assert_eq!(doc, [1, 20, 3]);
        assert_eq!(h.undo(&mut doc), Some(Ok("Set entry 1".to_owned())));
        assert_eq!(doc, [1, 2, 3]);
        assert_eq!(h.undo(&mut doc), None);
        assert_eq!(h.redo(&mut doc), Some(Ok("Set entry 1".to_owned())));
        assert_eq!(doc, [1, 20, 3]);
        assert_eq!(h.redo_len(), 1);
        // A new edit clears the redo stack.
        h.apply(Set { index: 0, value: 9 }, &mut doc)
            .expect("apply");
        assert_eq!(h.redo_len(), 0);
        assert_eq!(h.redo(&mut doc), None);
    }

    #[test]
    fn failed_edit_changes_nothing() {
        let mut doc = vec![1];
        let mut h: History<Set> = History::default();
        assert!(h.apply(Set { index: 5, value: 0 }, &mut doc).is_err());
        assert_eq!(doc, [1]);
        assert_eq!(h.undo_len(), 0);
    }

    #[test]
    fn limit_drops_oldest_steps() {
        let mut doc = vec![0];
        let mut h = History::with_limit(2);
        for v in 1..=3 {
            h.apply(Set { index: 0, value: v }, &mut doc)
                .expect("apply");
        }
        assert_eq!(h.undo_len(), 2);
        while h.undo(&mut doc).is_some() {}
        assert_eq!(doc, [1]);
    }
}
