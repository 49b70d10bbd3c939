//! What views ask for: the [`Command`] enum.
//!
//! Views never mutate the app while drawing. They push commands onto a list;
//! [`crate::OfftakeApp`] applies the list at the end of the frame, in order.
//! Document edits go through the undo history ([`crate::history`]); the
//! other commands change runtime state (tab, windows) or do file work.

use std::path::PathBuf;

/// The centre workspace tabs, in display order.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Default)]
pub enum Tab {
    /// Weather series, quality flags and daily ET₀.
    #[default]
    Weather,
    /// Kc curves of plantings.
    CropCurves,
    /// Root-zone water balance of a planting.
    WaterBalance,
    /// NIR and GIR at a node.
    Demand,
    /// Node hydrographs, design flows and capacities.
    CanalCapacity,
    /// Rotation roster.
    Rotation,
    /// Scenario comparison.
    Compare,
}

impl Tab {
    /// Every tab in display order.
    pub const ALL: [Tab; 7] = [
        Tab::Weather,
        Tab::CropCurves,
        Tab::WaterBalance,
        Tab::Demand,
        Tab::CanalCapacity,
        Tab::Rotation,
        Tab::Compare,
    ];

    /// The tab's title.
    pub fn title(self) -> &'static str {
        match self {
            Tab::Weather => "Weather & ET₀",
            Tab::CropCurves => "Crop curves",
            Tab::WaterBalance => "Water balance",
            Tab::Demand => "Demand",
            Tab::CanalCapacity => "Canal capacity",
            Tab::Rotation => "Rotation",
            Tab::Compare => "Compare",
        }
    }
}

/// A reference to a scheme-tree item by its stable id.
#[derive(Debug, Clone, PartialEq, Eq, Hash)]
pub enum ItemRef {
    /// A canal.
    Canal(String),
    /// A block.
    Block(String),
    /// A planting.
    Planting(String),
}

/// What is selected in the scheme tree (the inspector shows it).
#[derive(Debug, Clone, PartialEq, Eq, Hash, Default)]
pub enum Selection {
    /// Nothing.
    #[default]
    None,
    /// The scheme itself (name, notes).
    Scheme,
    /// A canal, block or planting.
    Item(ItemRef),
    /// The weather source.
    Weather,
    /// The computation options.
    Options,
}

/// The help windows.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum HelpWindow {
    /// Methods and their published sources.
    Methods,
    /// Cautions on the use of results.
    Cautions,
    /// Version and credits.
    About,
}

/// The side and bottom panels the View menu can hide.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PanelKind {
    /// Scheme tree, libraries and weather (left).
    Tree,
    /// Inspector (right).
    Inspector,
    /// Status bar (bottom).
    StatusBar,
}

/// A user intent recorded during the frame and applied at its end.
#[derive(Debug, Clone, PartialEq)]
pub enum Command {
    /// Show a workspace tab.
    SelectTab(Tab),
    /// Select a tree item (the inspector shows it).
    Select(Selection),
    /// Change the document (undoable).
    Edit(crate::edit::DocEdit),
    /// Open a help window.
    ShowHelp(HelpWindow),
    /// Show or hide a panel.
    TogglePanel(PanelKind),
    /// Start a new, empty project.
    NewProject,
    /// Pick a project file and open it.
    OpenProject,
    /// Open a project from the recent list.
    OpenRecent(PathBuf),
    /// Save to the current file (Save as… when there is none).
    Save,
    /// Pick a file and save to it.
    SaveAs,
    /// Pick a weather CSV file and import it.
    ImportWeather,
    /// Export the result tables as CSV files and an XLSX workbook.
    ExportWorkbook,
    /// Export the design report as one self-contained HTML file.
    ExportReport,
    /// Save the plotted data of one plot as CSV (full series, not decimated).
    ExportPlotCsv {
        /// Suggested file name.
        file_name: String,
        /// The CSV text.
        csv: String,
    },
    /// Save an image of one plot (screen area in points) as PNG.
    ExportPlotImage {
        /// Suggested file name.
        file_name: String,
        /// Area of the plot on screen, in points.
        rect: egui::Rect,
    },
    /// Undo the last edit.
    Undo,
    /// Redo the last undone edit.
    Redo,
    /// Delete the selected tree item (undoable).
    DeleteSelected,
    /// Run a command after the user agreed to discard unsaved changes.
    DiscardAndRun(Box<Command>),
    /// Open the crop or soil library editor.
    ShowLibrary(crate::library_editor::LibraryKind),
    /// Show the season starting in this year on the Water balance and Crop
    /// curves tabs.
    SetSeasonYear(i32),
    /// Show the results of a scenario (`None` = the base plan) in every tab.
    ShowScenario(Option<String>),
    /// Open the scenario editor on this scenario (`None` closes it).
    EditScenario(Option<String>),
}
