//! The one way Offtake writes a file: atomically, through a temporary file
//! beside the target.
//!
//! Every command and the app write through this module, so a write either
//! replaces the whole file or leaves the old one as it was:
//!
//! 1. A temporary file is created **exclusively** (`O_CREAT | O_EXCL`) in
//!    the target's folder under a name no other writer can have:
//!    `.NAME.PID.RANDOM.tmp`. An existing file or symlink at a candidate
//!    name is never opened or followed; another random name is tried.
//! 2. The caller writes into it ([`AtomicFile`] is an [`io::Write`]).
//! 3. [`AtomicFile::commit`] flushes and syncs it, gives it the permissions
//!    of the file it replaces (`rw-r--r--` for a new file on Unix) and
//!    renames it over the target; the folder is synced where the platform
//!    allows. A symlink *at the target* is replaced by the new file, never
//!    written through.
//! 4. On every error path, and when an [`AtomicFile`] is dropped without a
//!    commit, the temporary file is removed.
//!
//! A process killed between steps 1 and 3 cannot remove its temporary file.
//! The next [`AtomicFile::create`] for the same target removes such leftovers:
//! regular files named `.NAME.PID.*.tmp` whose process `PID` no longer runs
//! (checked through `/proc` on Linux; elsewhere leftovers are kept). Symlinks
//! and files of live processes are left alone.
//!
//! # Example
//! ```
//! # fn main() -> Result<(), offtake_io::atomic::AtomicWriteError> {
//! let dir = tempfile::tempdir().unwrap();
//! let target = dir.path().join("flows.csv");
//! offtake_io::atomic::write_atomically(&target, b"node,flow_ls\nheadworks,820\n")?;
//! assert_eq!(std::fs::read(&target).unwrap(), b"node,flow_ls\nheadworks,820\n");
//! # Ok(()) }
//! ```

use std::ffi::OsString;
use std::fs::File;
use std::io::{self, Write};
use std::path::{Path, PathBuf};

use thiserror::Error;

/// Environment variable naming a point at which the process aborts (as if
/// killed), for tests of interrupted writes. Only read in builds of the
/// library itself; an unset or unknown value does nothing.
pub const KILL_POINT_ENV: &str = "OFFTAKE_TEST_KILL_AT";

/// Why an atomic write failed. The target is unchanged in every case.
#[derive(Debug, Error)]
#[non_exhaustive]
pub enum AtomicWriteError {
    /// The temporary file could not be created in the target's folder.
    #[error("{}: cannot create a temporary file in this folder to write {}", dir.display(), target.display())]
    Create {
        /// The folder.
        dir: PathBuf,
        /// The file that was to be written.
        target: PathBuf,
        /// The system's reason.
        #[source]
        source: io::Error,
    },
    /// Writing, flushing or syncing the temporary file failed (e.g. disk full).
    #[error("{}: cannot write (the previous file, if any, is unchanged)", target.display())]
    Write {
        /// The file that was to be written.
        target: PathBuf,
        /// The system's reason.
        #[source]
        source: io::Error,
    },
    /// The finished temporary file could not be renamed over the target.
    #[error("{}: cannot replace the file (the previous file, if any, is unchanged)", target.display())]
    Replace {
        /// The file that was to be written.
        target: PathBuf,
        /// The system's reason.
        #[source]
        source: io::Error,
    },
}

/// A file being written atomically; see the module documentation.
///
/// Dropping it without [`AtomicFile::commit`] removes the temporary file and
/// leaves the target as it was.
#[derive(Debug)]
pub struct AtomicFile {
    tmp: tempfile::NamedTempFile,
    target: PathBuf,
    dir: PathBuf,
}

impl AtomicFile {
    /// Creates the temporary file for `target` (which need not exist).
    ///
    /// # Errors
    /// [`AtomicWriteError::Create`] when the folder is missing, read-only or
    /// full.
    pub fn create(target: &Path) -> Result<Self, AtomicWriteError> {
        let dir = folder_of(target);
        let name = file_name_of(target);
        remove_stale_temporaries(&dir, &name);
        let prefix = temporary_prefix(&name, std::process::id());
        let mut builder = tempfile::Builder::new();
        builder.prefix(&prefix).suffix(".tmp").rand_bytes(8);
        if let Some(p) = permissions_for(target) {
            builder.permissions(p);
        }
        let tmp = builder
            .tempfile_in(&dir)
            .map_err(|source| AtomicWriteError::Create {
                dir: dir.clone(),
                target: target.to_path_buf(),
                source,
            })?;
        Ok(Self {
            tmp,
            target: target.to_path_buf(),
            dir,
        })
    }

    /// The file this writes.
    pub fn target(&self) -> &Path {
        &self.target
    }

    /// The temporary file's path (for messages and tests).
    pub fn temporary_path(&self) -> &Path {
        self.tmp.path()
    }

    /// Flushes, syncs and renames the temporary file over the target.
    ///
    /// # Errors
    /// [`AtomicWriteError::Write`] or [`AtomicWriteError::Replace`]; the
    /// temporary file is removed and the target unchanged.
    pub fn commit(self) -> Result<(), AtomicWriteError> {
        self.commit_with(|| Ok(()))
    }

    /// As [`AtomicFile::commit`], running `before_replace` after the new
    /// content is durable and just before the rename (e.g. to copy the old
    /// file to a backup). An error from it aborts the write.
    ///
    /// # Errors
    /// As [`AtomicFile::commit`]; an error of `before_replace` is reported
    /// as [`AtomicWriteError::Replace`].
    pub fn commit_with(
        mut self,
        before_replace: impl FnOnce() -> io::Result<()>,
    ) -> Result<(), AtomicWriteError> {
        let target = self.target.clone();
        let write_err = |source| AtomicWriteError::Write {
            target: target.clone(),
            source,
        };
        self.tmp.as_file_mut().flush().map_err(write_err)?;
        self.tmp.as_file().sync_all().map_err(write_err)?;
        kill_point("atomic:synced");
        before_replace().map_err(|source| AtomicWriteError::Replace {
            target: target.clone(),
            source,
        })?;
        self.tmp
            .persist(&target)
            .map_err(|e| AtomicWriteError::Replace {
                target: target.clone(),
                source: e.error,
            })?;
        sync_folder(&self.dir);
        Ok(())
    }
}

impl io::Seek for AtomicFile {
    fn seek(&mut self, pos: io::SeekFrom) -> io::Result<u64> {
        self.tmp.as_file_mut().seek(pos)
    }
}

impl Write for AtomicFile {
    fn write(&mut self, buf: &[u8]) -> io::Result<usize> {
        self.tmp.as_file_mut().write(buf)
    }

    fn write_all(&mut self, buf: &[u8]) -> io::Result<()> {
        self.tmp.as_file_mut().write_all(buf)
    }

    fn flush(&mut self) -> io::Result<()> {
        self.tmp.as_file_mut().flush()
    }
}

/// Writes `bytes` to `target` atomically.
///
/// # Errors
/// [`AtomicWriteError`]; the target is unchanged.
pub fn write_atomically(target: &Path, bytes: &[u8]) -> Result<(), AtomicWriteError> {
    write_atomically_with(target, |w| w.write_all(bytes))
}

/// Writes `target` atomically with `fill`, which writes the whole content
/// into the (buffered) temporary file.
///
/// # Errors
/// [`AtomicWriteError`]; an error of `fill` is [`AtomicWriteError::Write`].
/// The target is unchanged.
pub fn write_atomically_with(
    target: &Path,
    fill: impl FnOnce(&mut dyn Write) -> io::Result<()>,
) -> Result<(), AtomicWriteError> {
    let mut file = AtomicFile::create(target)?;
    {
        let mut buffered = io::BufWriter::new(&mut file);
        fill(&mut buffered)
            .and_then(|()| buffered.flush())
            .map_err(|source| AtomicWriteError::Write {
                target: target.to_path_buf(),
                source,
            })?;
    }
    file.commit()
}

/// Permissions a file written atomically over `path` should get: those of
/// the regular file it replaces, or 0o644 (`rw-r--r--`) for a new file on
/// Unix. `None` elsewhere (the platform default). A symlink at `path` is not
/// followed.
pub fn permissions_for(path: &Path) -> Option<std::fs::Permissions> {
    if let Ok(meta) = std::fs::symlink_metadata(path)
        && meta.is_file()
    {
        return Some(meta.permissions());
    }
    #[cfg(unix)]
    {
        use std::os::unix::fs::PermissionsExt;
        Some(std::fs::Permissions::from_mode(0o644))
    }
    #[cfg(not(unix))]
    {
        None
    }
}

/// Aborts the process (no destructors, no clean-up: as a kill would) when
/// [`KILL_POINT_ENV`] equals `point`. Tests use it to interrupt a write at a
/// deterministic step instead of racing a signal against the clock.
pub fn kill_point(point: &str) {
    static WANTED: std::sync::OnceLock<Option<String>> = std::sync::OnceLock::new();
    let wanted = WANTED.get_or_init(|| std::env::var(KILL_POINT_ENV).ok());
    if wanted.as_deref() == Some(point) {
        std::process::abort();
    }
}

fn folder_of(path: &Path) -> PathBuf {
    match path.parent() {
        Some(d) if !d.as_os_str().is_empty() => d.to_path_buf(),
        _ => PathBuf::from("."),
    }
}

fn file_name_of(path: &Path) -> String {
    path.file_name()
        .map_or_else(|| OsString::from("file"), OsString::from)
        .to_string_lossy()
        .into_owned()
}

/// `.NAME.PID.` — the fixed part of a temporary file's name.
fn temporary_prefix(name: &str, pid: u32) -> String {
    format!(".{name}.{pid}.")
}

/// Removes leftovers of killed writers of `name` in `dir`: regular files
/// `.NAME.PID.*.tmp` whose process no longer runs.
fn remove_stale_temporaries(dir: &Path, name: &str) {
    let Ok(entries) = std::fs::read_dir(dir) else {
        return;
    };
    let head = format!(".{name}.");
    for entry in entries.flatten() {
        let file_name = entry.file_name();
        let Some(text) = file_name.to_str() else {
            continue;
        };
        let Some(rest) = text
            .strip_prefix(&head)
            .and_then(|r| r.strip_suffix(".tmp"))
        else {
            continue;
        };
        let Some((pid, random)) = rest.split_once('.') else {
            continue;
        };
        let Ok(pid) = pid.parse::<u32>() else {
            continue;
        };
        if random.is_empty() || random.contains('.') || process_is_running(pid) != Some(false) {
            continue;
        }
        // Never a symlink or folder planted at such a name.
        if entry.file_type().is_ok_and(|t| t.is_file()) {
            let _ = std::fs::remove_file(entry.path());
        }
    }
}

/// Whether process `pid` runs; `None` when the platform cannot tell.
fn process_is_running(pid: u32) -> Option<bool> {
    if cfg!(target_os = "linux") {
        let proc_root = Path::new("/proc");
        if !proc_root.join("self").exists() {
            return None;
        }
        Some(proc_root.join(pid.to_string()).exists())
    } else {
        None
    }
}

fn sync_folder(dir: &Path) {
    // Makes the rename durable where a folder can be synced; best effort,
    // the file itself is already synced and renamed.
    #[cfg(unix)]
    if let Ok(d) = File::open(dir) {
        let _ = d.sync_all();
    }
    #[cfg(not(unix))]
    let _ = dir;
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A name of the atomic writer's temporary files (`.NAME.PID.RANDOM.tmp`).
    fn is_temporary(name: &str) -> bool {
        name.starts_with('.') && name.rsplit('.').next() == Some("tmp")
    }

    fn leftovers(dir: &Path) -> Vec<String> {
        std::fs::read_dir(dir)
            .expect("list")
            .flatten()
            .map(|e| e.file_name().to_string_lossy().into_owned())
            .filter(|n| is_temporary(n))
            .collect()
    }

    #[test]
    fn writes_and_replaces_without_leftovers() {
        let dir = tempfile::tempdir().expect("dir");
        let target = dir.path().join("a.csv");
        write_atomically(&target, b"one").expect("write");
        write_atomically(&target, b"two").expect("write");
        assert_eq!(std::fs::read(&target).expect("read"), b"two");
        assert!(leftovers(dir.path()).is_empty());
    }

    #[test]
    fn failed_fill_leaves_target_and_no_temporary() {
        let dir = tempfile::tempdir().expect("dir");
        let target = dir.path().join("a.csv");
        std::fs::write(&target, b"old").expect("seed");
        let err = write_atomically_with(&target, |w| {
            w.write_all(b"half")?;
            Err(io::Error::other("disk full"))
        })
        .expect_err("fails");
        assert!(matches!(err, AtomicWriteError::Write { .. }), "{err}");
        assert!(err.to_string().contains("unchanged"), "{err}");
        assert_eq!(std::fs::read(&target).expect("read"), b"old");
        assert!(leftovers(dir.path()).is_empty());
    }

    #[test]
    fn dropped_file_is_removed() {
        let dir = tempfile::tempdir().expect("dir");
        let target = dir.path().join("a.csv");
        let mut f = AtomicFile::create(&target).expect("create");
        f.write_all(b"x").expect("write");
        let tmp = f.temporary_path().to_path_buf();
        assert!(tmp.exists());
        drop(f);
        assert!(!tmp.exists());
        assert!(!target.exists());
    }

    #[test]
    fn two_writers_get_different_temporaries() {
        let dir = tempfile::tempdir().expect("dir");
        let target = dir.path().join("a.csv");
        let a = AtomicFile::create(&target).expect("a");
        let b = AtomicFile::create(&target).expect("b");
        assert_ne!(a.temporary_path(), b.temporary_path());
    }

    #[test]
    fn missing_folder_is_a_create_error() {
        let dir = tempfile::tempdir().expect("dir");
        let target = dir.path().join("no/such/a.csv");
        let err = write_atomically(&target, b"x").expect_err("fails");
        assert!(matches!(err, AtomicWriteError::Create { .. }), "{err}");
    }

    #[cfg(unix)]
    #[test]
    fn stale_temporary_of_a_dead_process_is_removed_and_live_ones_kept() {
        let dir = tempfile::tempdir().expect("dir");
        let target = dir.path().join("a.csv");
        // PID 0 is never a user process: /proc/0 does not exist.
        let dead = dir.path().join(".a.csv.0.abcdefgh.tmp");
        let live = dir
            .path()
            .join(format!(".a.csv.{}.abcdefgh.tmp", std::process::id()));
        let other = dir.path().join(".b.csv.0.abcdefgh.tmp");
        for p in [&dead, &live, &other] {
            std::fs::write(p, b"x").expect("seed");
        }
        write_atomically(&target, b"new").expect("write");
        if process_is_running(0) == Some(false) {
            assert!(!dead.exists(), "a dead writer's leftover is removed");
        }
        assert!(live.exists(), "a live writer's file is kept");
        assert!(other.exists(), "another target's file is kept");
    }

    #[cfg(unix)]
    #[test]
    fn symlink_at_a_leftover_name_is_left_alone() {
        let dir = tempfile::tempdir().expect("dir");
        let victim = dir.path().join("victim.txt");
        std::fs::write(&victim, b"keep me").expect("seed");
        let target = dir.path().join("a.csv");
        let planted = dir.path().join(".a.csv.0.abcdefgh.tmp");
        std::os::unix::fs::symlink(&victim, &planted).expect("symlink");
        write_atomically(&target, b"new").expect("write");
        assert!(
            std::fs::symlink_metadata(&planted)
                .expect("still there")
                .file_type()
                .is_symlink()
        );
        assert_eq!(std::fs::read(&victim).expect("read"), b"keep me");
    }

    #[cfg(unix)]
    #[test]
    fn symlink_at_the_target_is_replaced_not_followed() {
        let dir = tempfile::tempdir().expect("dir");
        let victim = dir.path().join("victim.txt");
        std::fs::write(&victim, b"keep me").expect("seed");
        let target = dir.path().join("a.csv");
        std::os::unix::fs::symlink(&victim, &target).expect("symlink");
        write_atomically(&target, b"new").expect("write");
        assert_eq!(std::fs::read(&victim).expect("read"), b"keep me");
        assert_eq!(std::fs::read(&target).expect("read"), b"new");
        assert!(
            !std::fs::symlink_metadata(&target)
                .expect("meta")
                .file_type()
                .is_symlink()
        );
    }

    #[cfg(unix)]
    #[test]
    fn new_file_is_world_readable_and_replaced_file_keeps_its_mode() {
        use std::os::unix::fs::PermissionsExt;
        let dir = tempfile::tempdir().expect("dir");
        let target = dir.path().join("a.csv");
        write_atomically(&target, b"x").expect("write");
        let mode = |p: &Path| std::fs::metadata(p).expect("meta").permissions().mode() & 0o777;
        assert_eq!(mode(&target), 0o644);
        std::fs::set_permissions(&target, std::fs::Permissions::from_mode(0o600)).expect("chmod");
        write_atomically(&target, b"y").expect("write");
        assert_eq!(mode(&target), 0o600);
    }
}
