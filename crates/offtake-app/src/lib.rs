//! # offtake-app
//!
//! The Offtake desktop planner. `main.rs` only starts eframe; the app itself
//! is [`OfftakeApp`], a library type that the interaction tests build and
//! drive headless with egui_kittest.
//!
//! ## Structure
//! - [`app`]: the window, panels, shortcuts and the end-of-frame command loop.
//! - [`command`]: the [`command::Command`] enum views emit.
//! - [`history`]: undo/redo by inverse edits.
//! - [`worker`]: debounced background recomputation on a thread.
//! - [`compute`]: the cached results the worker produces.
//! - [`state`]: runtime state beside the document.
//! - [`menu`], [`tree`], [`inspector`], [`status`], [`help`]: the panels.
//! - [`tabs`]: the centre workspace tabs, one file each.
//! - [`plot`], [`palette`]: the shared plot widget and colours.

pub mod app;
pub mod command;
pub mod compute;
pub mod document;
pub mod edit;
pub mod fields;
pub mod help;
pub mod history;
pub mod inspector;
pub mod menu;
pub mod palette;
pub mod plot;
pub mod recovery;
pub mod state;
pub mod status;
pub mod tabs;
pub mod tree;
pub mod worker;

pub use app::OfftakeApp;
