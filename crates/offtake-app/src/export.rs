//! Export of the result tables and workbook: the same files `offtake run`
//! writes, built by one shared copy in `offtake_io::results`.

pub use offtake_io::results::{fmt_sig3, summary_text, tables, write_tables};
