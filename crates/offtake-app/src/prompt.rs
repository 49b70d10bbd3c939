//! Asking the user for a file or folder.
//!
//! Every file the app reads or writes is chosen through [`FilePrompt`]: the
//! native dialogs (rfd) in the running app, or a queue of answers given in
//! advance in headless tests and scripted sessions. Both paths run the same
//! code after the answer, so a test that scripts "save the plot image to
//! x.png" exercises the real export.

use std::collections::VecDeque;
use std::path::PathBuf;

/// What the app asks for; decides the dialog's title, filter and kind.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Ask {
    /// An existing project file to open.
    OpenProject,
    /// Where to save the project (suggested file name).
    SaveProject(String),
    /// A weather CSV to import.
    WeatherCsv,
    /// A folder for the result tables and workbook.
    ExportFolder,
    /// Where to save a plot's data (suggested file name).
    SaveCsv(String),
    /// Where to save a plot's image (suggested file name).
    SavePng(String),
    /// Where to save the design report (suggested file name).
    SaveReport(String),
}

/// Where answers come from.
#[derive(Debug, Default)]
pub enum FilePrompt {
    /// Native file dialogs.
    #[default]
    Native,
    /// Answers given in advance, used in order; when the queue is empty the
    /// prompt reports that no answer is available (the user "cancelled").
    Scripted(VecDeque<PathBuf>),
}

/// Why no file was chosen.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum NoAnswer {
    /// The user closed the dialog.
    Cancelled,
    /// Headless with no scripted answer left.
    NoDialogs,
}

impl FilePrompt {
    /// A prompt that answers from `paths`, in order.
    pub fn scripted(paths: impl IntoIterator<Item = PathBuf>) -> Self {
        Self::Scripted(paths.into_iter().collect())
    }

    /// Adds answers at the end of a scripted queue (turns a native prompt
    /// into a scripted one).
    pub fn push(&mut self, path: PathBuf) {
        match self {
            Self::Native => *self = Self::scripted([path]),
            Self::Scripted(queue) => queue.push_back(path),
        }
    }

    /// Asks; blocks while a native dialog is open.
    ///
    /// # Errors
    /// [`NoAnswer`] when the user cancels or no scripted answer is left.
    pub fn ask(&mut self, ask: &Ask) -> Result<PathBuf, NoAnswer> {
        match self {
            Self::Scripted(queue) => queue.pop_front().ok_or(NoAnswer::NoDialogs),
            Self::Native => native(ask).ok_or(NoAnswer::Cancelled),
        }
    }
}

fn native(ask: &Ask) -> Option<PathBuf> {
    let dialog = rfd::FileDialog::new();
    match ask {
        Ask::OpenProject => dialog.add_filter("Offtake project", &["ron"]).pick_file(),
        Ask::SaveProject(name) => dialog
            .add_filter("Offtake project", &["ron"])
            .set_file_name(name)
            .save_file(),
        Ask::WeatherCsv => dialog.add_filter("Weather CSV", &["csv"]).pick_file(),
        Ask::ExportFolder => dialog
            .set_title("Folder for the result tables and workbook")
            .pick_folder(),
        Ask::SaveCsv(name) => dialog
            .add_filter("CSV", &["csv"])
            .set_file_name(name)
            .save_file(),
        Ask::SavePng(name) => dialog
            .add_filter("PNG image", &["png"])
            .set_file_name(name)
            .save_file(),
        Ask::SaveReport(name) => dialog
            .add_filter("HTML report", &["html", "htm"])
            .set_file_name(name)
            .save_file(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn scripted_answers_in_order_then_reports_no_dialogs() {
        let mut p = FilePrompt::scripted([PathBuf::from("a.ron")]);
        p.push(PathBuf::from("b.csv"));
        assert_eq!(p.ask(&Ask::OpenProject), Ok(PathBuf::from("a.ron")));
        assert_eq!(p.ask(&Ask::WeatherCsv), Ok(PathBuf::from("b.csv")));
        assert_eq!(p.ask(&Ask::ExportFolder), Err(NoAnswer::NoDialogs));
    }
}
