//! The import window reads a weather file's header through offtake-io's one
//! header reader (issue 14): on a comma/semicolon tie the mapping table shows
//! the columns the importer will read, not another split of the line.

#![allow(clippy::unwrap_used, clippy::expect_used)]

use std::time::Duration;

use offtake_app::OfftakeApp;
use offtake_core::project::Project;

#[test]
fn the_mapping_table_shows_the_importers_columns_on_a_delimiter_tie() {
    let dir = tempfile::tempdir().unwrap();
    let file = dir.path().join("tie.csv");
    // One comma and one semicolon in the header (invented data).
    std::fs::write(&file, "Day;Max T,Min T\n2031-01-15;31,2\n").unwrap();
    let expected = offtake_io::weather::read_header(&file, None).unwrap();
    assert_eq!(expected.names, ["Day", "Max T,Min T"]);
    let mut app = OfftakeApp::new().without_dialogs();
    app.open_project(Project::default());
    app.preview_weather(file);
    app.wait_for_import(Duration::from_mins(2));
    let job = app.import.as_ref().expect("the import window is open");
    let read = job.result.as_ref().expect("the file was read");
    assert_eq!(read.headers, expected.names);
    let shown: Vec<&str> = job.roles.iter().map(|(name, _)| name.as_str()).collect();
    assert_eq!(shown, ["Day", "Max T,Min T"]);
}
