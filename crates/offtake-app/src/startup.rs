//! What the app opens when it starts: `offtake-app PATH` opens PATH;
//! without a path, the invented demo scheme from the user's data folder.
//!
//! On first start the demo (project and weather) is copied into the user's
//! data folder ([`user_data_dir`]) and opened there, so saving it never
//! writes into an installation or a source tree. The copy comes from beside
//! the installed binary when the release ships it
//! (`<binary folder>/demo-projects/` or `<binary folder>/../share/offtake/demo-projects/`),
//! else from the copy built into the binary. An existing copy in the data
//! folder is opened as it is (the user's edits are kept).

use std::ffi::OsString;
use std::path::{Path, PathBuf};

use offtake_io::atomic::{AtomicWriteError, write_atomically};

/// The demo project inside a `demo-projects` folder.
pub const DEMO_PROJECT_FILE: &str = "demo-scheme/scheme.ron";
/// The demo weather inside a `demo-projects` folder (the project names it
/// as `../demo-weather/weather.csv`).
pub const DEMO_WEATHER_FILE: &str = "demo-weather/weather.csv";

/// The demo built into the binary (invented data; see demo-projects/).
const BUILT_IN_PROJECT: &str = include_str!("../../../demo-projects/demo-scheme/scheme.ron");
const BUILT_IN_WEATHER: &str = include_str!("../../../demo-projects/demo-weather/weather.csv");

/// The project file named on the command line (`offtake-app PATH`): the
/// first argument that is not an option.
pub fn project_argument(args: impl IntoIterator<Item = OsString>) -> Option<PathBuf> {
    args.into_iter()
        .skip(1)
        .find(|a| !a.to_string_lossy().starts_with('-'))
        .map(PathBuf::from)
}

/// The user's data folder for Offtake: `$XDG_DATA_HOME/offtake`,
/// `~/.local/share/offtake`, `%APPDATA%\offtake`, or the temporary folder.
pub fn user_data_dir() -> PathBuf {
    let base = std::env::var_os("XDG_DATA_HOME")
        .map(PathBuf::from)
        .or_else(|| std::env::var_os("APPDATA").map(PathBuf::from))
        .or_else(|| std::env::var_os("HOME").map(|h| PathBuf::from(h).join(".local/share")))
        .unwrap_or_else(std::env::temp_dir);
    base.join("offtake")
}

/// Where the demo was taken from.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum DemoSource {
    /// Already in the data folder (opened as it is).
    DataFolder,
    /// Copied from a `demo-projects` folder shipped beside the binary.
    BesideBinary(PathBuf),
    /// Copied from the copy built into the binary.
    BuiltIn,
}

/// Why the demo could not be put in the data folder.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum DemoError {
    /// A folder could not be created.
    #[error("{}: cannot create the folder for the demo", path.display())]
    Folder {
        /// The folder.
        path: PathBuf,
        /// The system's reason.
        #[source]
        source: std::io::Error,
    },
    /// A shipped demo file could not be read.
    #[error("{}: cannot read the shipped demo file", path.display())]
    Read {
        /// The file.
        path: PathBuf,
        /// The system's reason.
        #[source]
        source: std::io::Error,
    },
    /// A demo file could not be written.
    #[error(transparent)]
    Write(#[from] AtomicWriteError),
}

/// The `demo-projects` folder shipped beside the binary at `exe`, if any.
pub fn shipped_demo_dir(exe: &Path) -> Option<PathBuf> {
    let dir = exe.parent()?;
    [
        dir.join("demo-projects"),
        dir.join("../share/offtake/demo-projects"),
    ]
    .into_iter()
    .find(|d| d.join(DEMO_PROJECT_FILE).is_file() && d.join(DEMO_WEATHER_FILE).is_file())
}

/// Puts the demo in `data_dir/demo-projects/` unless its project is
/// already there, and returns the project's path there.
///
/// # Errors
/// [`DemoError`] when the folder cannot be created or written.
pub fn install_demo(
    data_dir: &Path,
    shipped: Option<&Path>,
) -> Result<(PathBuf, DemoSource), DemoError> {
    let root = data_dir.join("demo-projects");
    let project = root.join(DEMO_PROJECT_FILE);
    if project.is_file() {
        return Ok((project, DemoSource::DataFolder));
    }
    let (project_text, weather_text, source) = match shipped {
        Some(dir) => {
            let read = |name: &str| {
                let path = dir.join(name);
                std::fs::read(&path).map_err(|source| DemoError::Read { path, source })
            };
            (
                read(DEMO_PROJECT_FILE)?,
                read(DEMO_WEATHER_FILE)?,
                DemoSource::BesideBinary(dir.to_path_buf()),
            )
        }
        None => (
            BUILT_IN_PROJECT.as_bytes().to_vec(),
            BUILT_IN_WEATHER.as_bytes().to_vec(),
            DemoSource::BuiltIn,
        ),
    };
    // Weather first: the project is the marker of a complete copy.
    for (name, bytes) in [
        (DEMO_WEATHER_FILE, &weather_text),
        (DEMO_PROJECT_FILE, &project_text),
    ] {
        let path = root.join(name);
        if let Some(folder) = path.parent() {
            std::fs::create_dir_all(folder).map_err(|source| DemoError::Folder {
                path: folder.to_path_buf(),
                source,
            })?;
        }
        write_atomically(&path, bytes)?;
    }
    Ok((project, source))
}

/// What to tell the user before the first save of a project file with
/// hand-written comments (`None` when it has none, or once the original is
/// kept beside it).
pub fn comment_notice(path: &Path) -> Option<String> {
    let original = offtake_io::project_file::original_path(path);
    if original.exists() {
        return None;
    }
    let text = std::fs::read_to_string(path).ok()?;
    let n = offtake_io::project_file::hand_written_comment_lines(&text);
    (n > 0).then(|| {
        format!(
            " — it has {n} line(s) of hand-written comments, which Offtake cannot keep: \
             saving writes Offtake's own layout, and the first save keeps the file as it \
             is now in {}",
            original.display()
        )
    })
}

impl crate::OfftakeApp {
    /// What the app opens at start: the project named on the command line,
    /// else the demo in `data_dir` (copied there on first start from
    /// `shipped` or from the built-in copy).
    pub fn open_at_start(
        &mut self,
        argument: Option<&Path>,
        data_dir: &Path,
        shipped: Option<&Path>,
    ) {
        if let Some(path) = argument {
            let path = std::path::absolute(path).unwrap_or_else(|_| path.to_path_buf());
            self.open_file(&path);
            return;
        }
        match install_demo(data_dir, shipped) {
            Ok((path, _)) => self.open_file(&path),
            Err(e) => {
                self.state.message = Some(format!(
                    "Could not put the demo in {}: {e}",
                    data_dir.display()
                ));
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_first_argument_that_is_not_an_option_is_the_project() {
        let args = |v: &[&str]| v.iter().map(OsString::from).collect::<Vec<_>>();
        assert_eq!(project_argument(args(&["offtake-app"])), None);
        assert_eq!(
            project_argument(args(&["offtake-app", "--verbose", "a/p.ron"])),
            Some(PathBuf::from("a/p.ron"))
        );
    }

    #[test]
    fn the_built_in_demo_is_copied_once_and_then_kept() {
        let dir = tempfile::tempdir().expect("dir");
        let (path, source) = install_demo(dir.path(), None).expect("install");
        assert_eq!(source, DemoSource::BuiltIn);
        assert_eq!(
            std::fs::read_to_string(&path).expect("read"),
            BUILT_IN_PROJECT
        );
        assert!(
            dir.path()
                .join("demo-projects")
                .join(DEMO_WEATHER_FILE)
                .is_file()
        );
        std::fs::write(&path, "edited").expect("edit");
        let (again, source) = install_demo(dir.path(), None).expect("again");
        assert_eq!((again.clone(), source), (path, DemoSource::DataFolder));
        assert_eq!(std::fs::read_to_string(&again).expect("read"), "edited");
    }

    #[test]
    fn a_demo_shipped_beside_the_binary_is_preferred() {
        let install = tempfile::tempdir().expect("dir");
        let bin = install.path().join("bin");
        let shipped = install.path().join("share/offtake/demo-projects");
        for (name, text) in [
            (DEMO_PROJECT_FILE, "project"),
            (DEMO_WEATHER_FILE, "weather"),
        ] {
            let p = shipped.join(name);
            std::fs::create_dir_all(p.parent().expect("parent")).expect("mkdir");
            std::fs::write(p, text).expect("write");
        }
        std::fs::create_dir_all(&bin).expect("bin");
        let found = shipped_demo_dir(&bin.join("offtake-app")).expect("found");
        let data = tempfile::tempdir().expect("data");
        let (path, source) = install_demo(data.path(), Some(&found)).expect("install");
        assert!(matches!(source, DemoSource::BesideBinary(_)));
        assert_eq!(std::fs::read_to_string(path).expect("read"), "project");
    }
}
