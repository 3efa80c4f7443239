//! Fuzz target: the page's table editor and compact links on any text. Packing then
//! unpacking gives the text back; anything behind the packed mark unpacks or says why;
//! every row the layout finds is a line of the text, and its cells written back by the
//! editor read back the same.
#![no_main]

use latchwise::link::{pack, unpack, MARK};
use latchwise::table::{join, layout, split};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let text = String::from_utf8_lossy(data);
    assert_eq!(unpack(&pack(&text)), Some(Ok(text.to_string())));
    assert!(unpack(&format!("{MARK}{text}")).is_some());
    let l = layout(&text);
    let lines: Vec<&str> = text.lines().collect();
    if let Some(h) = l.header {
        assert!(h < lines.len());
    }
    for &r in &l.rows {
        assert!(r < lines.len() && l.header.is_some_and(|h| h < r));
        let cells = split(lines[r], l.delimiter);
        let line = join(&cells, l.delimiter);
        let want: Vec<String> = cells
            .iter()
            .map(|c| c.replace(['\n', '\r'], " ").trim().to_string())
            .collect();
        assert_eq!(split(&line, l.delimiter), want, "{line:?}");
        // The written row stays a row: not blank, not a comment.
        let again = layout(&format!("h\n{line}\n"));
        assert_eq!(again.rows, vec![1], "{line:?}");
    }
});
