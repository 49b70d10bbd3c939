//! # offtake-app
//!
//! The Offtake desktop planner. `main.rs` only starts eframe; the app itself
//! is [`OfftakeApp`], a library type that the interaction tests build and
//! drive headless with egui_kittest.
//!
//! ## Structure
//! - [`app`]: the window, panels, shortcuts and the end-of-frame command loop;
//!   file commands (new, open, save, import weather), unsaved-changes guard.
//! - [`command`]: the [`command::Command`] enum views emit, tabs, selection.
//! - [`document`]: the open project with its file and saved state.
//! - [`edit`]: undoable edits of the project ([`edit::DocEdit`]) and their inverses.
//! - [`history`]: undo/redo by inverse edits.
//! - [`worker`]: debounced background recomputation on a thread.
//! - [`compute`]: what the worker computes ([`compute::Snapshot`] in,
//!   [`compute::Computed`] out) — the plug for the computation chain.
//! - [`export`]: the result tables and workbook, as `offtake run` writes them.
//! - [`import`]: the weather import window (background read, preview, warnings).
//! - [`library_editor`]: the crop and soil library editors (copy, edit, Kc curve).
//! - [`scenario_editor`]: a scenario edited as a cropping pattern (window).
//! - [`recovery`]: autosave to a recovery file and restore after a crash
//!   (keeping the project's path).
//! - [`startup`]: `offtake-app PATH`, and the demo copied into the user's data
//!   folder on first start.
//! - [`state`]: runtime state beside the document.
//! - [`menu`], [`tree`], [`inspector`], [`fields`], [`status`], [`help`]: the panels.
//! - [`tabs`]: the centre workspace tabs, one file each.
//! - [`plot`], [`palette`]: the shared plot widget and colours.
//! - [`prompt`]: where file and folder choices come from (native dialogs or
//!   answers given in advance, so headless tests run the real file paths).
//!
//! ## Plugging in a computation
//! [`OfftakeApp::with_compute`] takes any
//! `Box<dyn FnMut(compute::Snapshot) -> compute::Computed + Send>`; the
//! default, [`compute::default_compute`], validates the project, reads the
//! weather (cached while the file is unchanged), computes ET₀ and the library
//! Kc curves, and runs offtake-core's engine (`engine::run_scenario`, the
//! call `offtake run` makes) for the scenario shown. Engine results are kept
//! while the project, scenario and weather file stay the same, so a new
//! selection or season year only computes that planting's season balance
//! (`planting::season_detail`); the scenario comparison runs only while the
//! Compare tab is shown. Add a field to [`compute::Computed`], fill it there,
//! and read it in a tab.
//!
//! ## Measured (release build, 2-core shared machine, demo scheme, 25 years)
//! Both with `cargo test --release -p offtake-app --test frame_time -- --ignored --nocapture`:
//! - Recompute after an edit (a planting date): 31–85 ms of worker wall
//!   time over four runs of six edits; the engine is nearly all of it.
//! - Panning the 9131-day headworks hydrograph: 0.7–1.1 ms mean egui CPU
//!   time per frame (UI code and tessellation, no renderer), 95th
//!   percentile 0.7–4.9 ms, worst frame 4.8–8.8 ms.

pub mod app;
pub mod command;
pub mod compute;
pub mod document;
pub mod edit;
pub mod export;
pub mod fields;
pub mod help;
pub mod history;
pub mod import;
pub mod inspector;
pub mod library_editor;
pub mod menu;
pub mod palette;
pub mod plot;
pub mod prompt;
pub mod recovery;
pub mod scenario_editor;
pub mod section_fields;
pub mod startup;
pub mod state;
pub mod status;
pub mod tabs;
pub mod tree;
pub mod worker;

pub use app::OfftakeApp;
