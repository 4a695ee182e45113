//! What a malformed case file says about itself: its header comments
//! `# malformed: WHAT`, `# key: DOTTED.KEY` (the key the message must name) and
//! `# hint: NAME` (the name a "did you mean" must offer).

/// The expectations written at the top of one case file.
#[derive(Debug, Default)]
pub struct Expect {
    /// What is wrong, in words.
    pub what: Option<String>,
    /// The dotted key the message must name.
    pub key: Option<String>,
    /// The name a "did you mean" must suggest.
    pub hint: Option<String>,
}

/// The header of `bytes` (leading `# field: value` lines; the rest is ignored,
/// and bytes that are not UTF-8 end the header).
pub fn read(bytes: &[u8]) -> Expect {
    let mut e = Expect::default();
    let text = match std::str::from_utf8(bytes) {
        Ok(t) => t,
        Err(err) => std::str::from_utf8(&bytes[..err.valid_up_to()]).unwrap_or_default(),
    };
    for line in text.lines() {
        let Some(rest) = line.strip_prefix("# ") else {
            break;
        };
        let Some((field, value)) = rest.split_once(": ") else {
            break;
        };
        let value = Some(value.trim().to_string());
        match field {
            "malformed" => e.what = value,
            "key" => e.key = value,
            "hint" => e.hint = value,
            _ => break,
        }
    }
    e
}

#[test]
fn header_fields_are_read_until_the_first_other_line() {
    let e = read(b"# malformed: x\n# key: time.dt\n# hint: dt\n[time]\n# key: other\n");
    assert_eq!(e.what.as_deref(), Some("x"));
    assert_eq!(e.key.as_deref(), Some("time.dt"));
    assert_eq!(e.hint.as_deref(), Some("dt"));
    assert!(read(b"").key.is_none());
}
