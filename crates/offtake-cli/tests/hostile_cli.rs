//! The hostile project files of `tests/hostile/` (issue 15): each one's
//! command must exit with its stated code and print every expected line.
//! Errors stop `offtake run` and `compare` with exit code 2 and every error
//! listed; warnings never stop a run.

#![allow(clippy::unwrap_used, clippy::expect_used)]

use std::path::{Path, PathBuf};
use std::process::Command;

const HOSTILE: &str = concat!(env!("CARGO_MANIFEST_DIR"), "/../../tests/hostile");

fn offtake() -> Command {
    Command::new(env!("CARGO_BIN_EXE_offtake"))
}

/// What a hostile file's header says about it.
struct Expectation {
    command: String,
    exit: i32,
    lines: Vec<String>,
}

fn expectation(path: &Path) -> Expectation {
    let text = std::fs::read_to_string(path).unwrap();
    let mut command = None;
    let mut exit = None;
    let mut lines = Vec::new();
    for line in text.lines().take_while(|l| l.starts_with("//")) {
        if let Some(c) = line.strip_prefix("// command: ") {
            command = Some(c.trim().to_owned());
        } else if let Some(e) = line.strip_prefix("// exit: ") {
            exit = Some(e.trim().parse().unwrap());
        } else if let Some(x) = line.strip_prefix("// expect: ") {
            lines.push(x.to_owned());
        }
    }
    Expectation {
        command: command.unwrap_or_else(|| panic!("{}: no // command:", path.display())),
        exit: exit.unwrap_or_else(|| panic!("{}: no // exit:", path.display())),
        lines,
    }
}

fn hostile_files() -> Vec<PathBuf> {
    let mut files: Vec<PathBuf> = std::fs::read_dir(HOSTILE)
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.extension().is_some_and(|x| x == "ron"))
        .collect();
    files.sort();
    files
}

/// Runs `offtake <command> FILE` (with `--out` into a temporary folder for
/// `run`) and returns (exit code, stdout, stderr).
fn run_command(command: &str, file: &Path, out: &Path) -> (i32, String, String) {
    let mut cmd = offtake();
    cmd.arg(command).arg(file);
    if command == "run" {
        cmd.arg("--out").arg(out);
    }
    let o = cmd.output().unwrap();
    (
        o.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&o.stdout).into_owned(),
        String::from_utf8_lossy(&o.stderr).into_owned(),
    )
}

#[test]
fn every_hostile_file_gives_its_exit_code_and_messages() {
    let files = hostile_files();
    assert!(files.len() >= 15, "hostile corpus not found in {HOSTILE}");
    let mut failures = Vec::new();
    for file in &files {
        let e = expectation(file);
        let dir = tempfile::tempdir().unwrap();
        let (code, stdout, stderr) = run_command(&e.command, file, dir.path());
        let name = file.file_name().unwrap().to_string_lossy();
        if code != e.exit {
            failures.push(format!(
                "{name}: exit {code}, expected {}\nstdout:\n{stdout}\nstderr:\n{stderr}",
                e.exit
            ));
            continue;
        }
        // Errors go to standard error; warnings of a computed run to
        // standard output.
        let printed = if e.exit == 0 { &stdout } else { &stderr };
        for line in &e.lines {
            if !printed.contains(line.as_str()) {
                failures.push(format!("{name}: missing {line:?} in\n{printed}"));
            }
        }
        if e.exit == 2 {
            assert!(
                !dir.path().join("design_values.csv").exists(),
                "{name}: a table was written for an invalid project"
            );
            assert!(!stderr.contains("panicked"), "{name}: panicked\n{stderr}");
        }
    }
    assert!(failures.is_empty(), "{}", failures.join("\n\n"));
}

/// A 1 MB block id (it used to make a 2 MB project write an 8.6 GB table):
/// refused with a short message and no table written.
#[test]
fn a_megabyte_block_id_is_refused_with_a_short_message() {
    let base = std::fs::read_to_string(Path::new(HOSTILE).join("long-block-id.ron")).unwrap();
    let long_id = "b".repeat(65);
    let huge_id = "b".repeat(1 << 20);
    let dir = tempfile::tempdir().unwrap();
    let file = dir.path().join("huge-id.ron");
    std::fs::write(&file, base.replace(&long_id, &huge_id)).unwrap();
    std::fs::copy(
        Path::new(HOSTILE).join("weather.csv"),
        dir.path().join("weather.csv"),
    )
    .unwrap();
    let out = dir.path().join("results");
    let (code, _stdout, stderr) = run_command("run", &file, &out);
    assert_eq!(code, 2, "{}", &stderr[..stderr.len().min(2000)]);
    assert!(
        stderr.contains("(1048576 characters): is 1048576 characters long; at most 64 are allowed"),
        "{}",
        &stderr[..stderr.len().min(2000)]
    );
    assert!(stderr.len() < 4000, "message of {} bytes", stderr.len());
    assert!(!out.exists(), "results written for an invalid project");
}
