//! Links: the core's reader of a link's query (what `--from-url` and the page use) on a
//! table of odd queries shared with the browser tests, and the command line's handling of
//! what a link or a shell can hand it.

use std::process::{Command, Stdio};

use latchwise::calculator::{query_inputs, Calculator, Visit};
use latchwise::registry::dispatch;

struct Pairs<'a>(&'a str);

impl Visit for Pairs<'_> {
    type Out = Vec<(String, String)>;
    fn visit<C: Calculator>(self) -> Self::Out {
        query_inputs::<C>(self.0).pairs().to_vec()
    }
}

#[test]
fn odd_queries_read_as_browsers_read_them() {
    let table: serde_json::Value =
        serde_json::from_str(include_str!("fixtures/odd_queries.json")).unwrap();
    let cases = table["cases"].as_array().unwrap();
    assert!(cases.len() >= 10);
    for c in cases {
        let q = c["query"].as_str().unwrap();
        let want: Vec<(String, String)> = c["pairs"]
            .as_array()
            .unwrap()
            .iter()
            .map(|p| {
                (
                    p[0].as_str().unwrap().to_string(),
                    p[1].as_str().unwrap().to_string(),
                )
            })
            .collect();
        let calc = c["calculator"].as_str().unwrap();
        assert_eq!(dispatch(calc, Pairs(q)).unwrap(), want, "{q}");
        // A URL around the same query reads the same.
        let url = format!("file:///x/dist/index.html?{q}");
        assert_eq!(dispatch(calc, Pairs(&url)).unwrap(), want, "{url}");
    }
}

fn latchwise(args: &[&str]) -> std::process::Output {
    Command::new(env!("CARGO_BIN_EXE_latchwise"))
        .args(args)
        .output()
        .unwrap()
}

const DEMO: &[&str] = &[
    "sync", "--tau", "20ps", "--tw", "40ps", "--fclk", "1GHz", "--fdata", "100MHz", "--stages",
    "2", "--tsu", "30ps", "--tcq", "50ps",
];

#[test]
fn a_repeated_option_is_refused() {
    let mut a = DEMO.to_vec();
    a.extend(["--tau", "25ps"]);
    let out = latchwise(&a);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("--tau given twice"));
}

#[test]
fn control_characters_from_a_link_are_escaped() {
    let out = latchwise(&["sync", "--from-url", "?tau=%1B%5B31mred%07&tw=40ps%0Afake"]);
    let err = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(2));
    assert!(!err.contains('\u{1b}') && !err.contains('\u{7}'), "{err:?}");
    assert!(err.contains("\\u{1b}[31mred\\u{7}"), "{err}");
    // A line break inside a value stays inside its message line.
    assert!(
        err.lines()
            .any(|l| l.contains("tw: unknown unit or prefix 'ps\\nfake'")),
        "{err}"
    );
}

/// JSON output stays valid JSON with control characters from a link in it: serde
/// escapes those below U+0020, and DEL and the C1 range (which a terminal obeys) are
/// written as `\u` escapes, not raw and not as Rust's `\u{..}` (which is not JSON).
#[test]
fn control_characters_in_json_are_json_escapes() {
    let out = latchwise(&[
        "budget",
        "--from-url",
        "?design=name,fclk,fdata,stages%0Aa%7Fb%C2%85c%1B,1GHz,1MHz,2&tau=20ps&tw=40ps&tsu=30ps&tcq=50ps",
        "--json",
    ]);
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = String::from_utf8(out.stdout).unwrap();
    assert!(!text.contains(['\u{7f}', '\u{85}', '\u{1b}']), "{text}");
    assert!(text.contains("a\\u007fb\\u0085c\\u001b"), "{text}");
    let v: serde_json::Value = serde_json::from_str(&text).unwrap();
    assert_eq!(v["rows"][0]["name"], "a\u{7f}b\u{85}c\u{1b}");
}

#[cfg(unix)]
#[test]
fn a_non_utf8_argument_is_an_error_not_an_abort() {
    use std::os::unix::ffi::OsStrExt;
    let bad = std::ffi::OsStr::from_bytes(b"20p\xffs");
    let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
        .args(["sync", "--tau"])
        .arg(bad)
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("argument 3 is not valid UTF-8"), "{err}");
    assert!(!err.contains("panicked"), "{err}");
}

/// An output that cannot be written (a full disk, here Linux's /dev/full) is said on
/// standard error with exit status 2, for the text report, the JSON (the budget's rows
/// written by two threads too) and the help, never a silent success with a cut report;
/// a reader that closes the pipe early (below) is not such a failure.
#[cfg(target_os = "linux")]
#[test]
fn an_output_that_cannot_be_written_is_an_error() {
    let Ok(full) = std::fs::OpenOptions::new().write(true).open("/dev/full") else {
        return;
    };
    let design: String = std::iter::once("name,fclk,fdata,stages\n".to_string())
        .chain((0..20_000).map(|i| format!("x{i},1GHz,1MHz,2\n")))
        .collect();
    let file = std::env::temp_dir().join(format!("latchwise-full-{}.csv", std::process::id()));
    std::fs::write(&file, design).unwrap();
    let budget = [
        "budget",
        file.to_str().unwrap(),
        "--tau",
        "20ps",
        "--tw",
        "40ps",
        "--tsu",
        "30ps",
        "--tcq",
        "50ps",
    ];
    let json: Vec<&str> = budget.iter().copied().chain(["--json"]).collect();
    let sync_json: Vec<&str> = DEMO.iter().copied().chain(["--json"]).collect();
    for args in [
        DEMO,
        &sync_json,
        &budget,
        &json,
        &["sync", "--help"],
        &["--version"],
    ] {
        let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
            .args(args)
            .stdout(full.try_clone().unwrap())
            .output()
            .unwrap();
        let err = String::from_utf8_lossy(&out.stderr);
        assert_eq!(out.status.code(), Some(2), "{args:?}: {err}");
        assert!(
            err.contains("cannot write") && err.contains("No space left"),
            "{args:?}: {err}"
        );
        assert!(!err.contains("panicked"), "{err}");
    }
    let _ = std::fs::remove_file(file);
}

#[test]
fn a_closed_pipe_ends_quietly() {
    let mut child = Command::new(env!("CARGO_BIN_EXE_latchwise"))
        .args(["sync", "--help"])
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    // Close the reading end before the command writes.
    drop(child.stdout.take());
    let out = child.wait_with_output().unwrap();
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        !err.contains("panicked") && !err.contains("Broken pipe"),
        "{err}"
    );
    assert_eq!(out.status.code(), Some(0));
}

#[test]
fn ambiguous_units_and_old_names() {
    let mut a: Vec<&str> = DEMO
        .iter()
        .copied()
        .filter(|s| *s != "1GHz" && *s != "--fclk")
        .collect();
    a.extend(["--fclk", "400mhz"]);
    let out = latchwise(&a);
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains(
            "fclk: '400mhz' is ambiguous: write 400MHz for megahertz or 400mHz for millihertz"
        ),
        "{err}"
    );
    // The fleet size was `units` once: old links and options still read as devices.
    let mut a = DEMO.to_vec();
    a.extend(["--json", "--from-url", "?units=1000&service-years=5"]);
    let out = latchwise(&a);
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["inputs"]["devices"], "1000", "{v}");
    let mut a = DEMO.to_vec();
    a.extend(["--json", "--units", "1000", "--service-years", "5"]);
    let v: serde_json::Value = serde_json::from_slice(&latchwise(&a).stdout).unwrap();
    assert_eq!(v["inputs"]["devices"], "1000", "{v}");
}

#[test]
fn many_unknown_link_keys_are_counted_not_listed() {
    let q: String = (0..10_000).map(|i| format!("k{i}=1&")).collect();
    let mut a = DEMO.to_vec();
    let url = format!("?{q}");
    a.extend(["--from-url", &url]);
    let out = latchwise(&a);
    assert_eq!(out.status.code(), Some(0));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("'k0', 'k1'") && err.contains("and 9990 more"),
        "{err}"
    );
    assert!(err.len() < 400, "the note is capped: {} bytes", err.len());
}

/// `latchwise ARGS --json`: the report, whatever the exit status.
fn report(args: &[&str]) -> serde_json::Value {
    let mut a = args.to_vec();
    a.push("--json");
    let out = latchwise(&a);
    serde_json::from_slice(&out.stdout)
        .unwrap_or_else(|e| panic!("{e}: {}", String::from_utf8_lossy(&out.stderr)))
}

#[test]
fn the_reproductions_that_once_printed_nan_inf_or_a_sentinel() {
    // A hop of 0.1 fs: the depth a target needs is beyond any chain; it used to print
    // 18446744073709551615.
    let v = report(&[
        "sync",
        "--tau",
        "20ps",
        "--tw",
        "40ps",
        "--fclk",
        "1GHz",
        "--fdata",
        "100MHz",
        "--stages",
        "2",
        "--tsu",
        "499.9999ps",
        "--tcq",
        "500ps",
        "--target-years",
        "1e5",
    ]);
    assert!(v["min_stages"].is_null(), "{v}");
    assert!(v["not_applicable"]["min_stages"]
        .as_str()
        .unwrap()
        .contains("more than 1000000"));
    // One flip-flop: the highest clock is a number the model accepts or "any", never 1e300.
    let v = report(&[
        "sync",
        "--tau",
        "20ps",
        "--tw",
        "40ps",
        "--fclk",
        "1GHz",
        "--fdata",
        "1",
        "--stages",
        "1",
        "--tsu",
        "30ps",
        "--tcq",
        "50ps",
        "--target-years",
        "1e-3",
    ]);
    match v["max_fclk_hz"].as_f64() {
        Some(f) => assert!(f <= 1e18, "{f}"),
        None => assert!(v["not_applicable"]["max_fclk_hz"].is_string(), "{v}"),
    }
    // tr/tau = 1e18: log10 MTBF = 4.3e17 is written from the logarithm.
    let out = latchwise(&[
        "sync", "--tau", "1as", "--tw", "40ps", "--fclk", "1GHz", "--fdata", "100MHz", "--tr", "1",
    ]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(text.contains("10^(4.34e17) years"), "{text}");
    assert!(
        !text.contains("9223372036854775807") && !text.contains("NaN"),
        "{text}"
    );
    // A noise of 1e-155 V under a 1 V signal once made a NaN shown as 'every decision at
    // risk'; it is now outside what the model can use, and says so.
    let out = latchwise(&[
        "comparator",
        "--tau",
        "15ps",
        "--treg",
        "80ps",
        "--vmin",
        "0.4",
        "--input",
        "nrz",
        "--amp",
        "1",
        "--sigma",
        "1e-155",
        "--fs",
        "5GHz",
    ]);
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("sigma: '1e-155' is too small: the smallest the model can use is"),
        "{err}"
    );
    // A value far from its usual range is noted, not refused.
    let v = report(&[
        "sync", "--tau", "8ns", "--tw", "40ps", "--fclk", "1GHz", "--fdata", "100MHz", "--stages",
        "2", "--tsu", "30ps", "--tcq", "50ps",
    ]);
    assert!(
        v["warnings"]
            .to_string()
            .contains("tau = 8 ns is far outside the usual"),
        "{v}"
    );
}

/// A design shared as a compact link reads back exactly on the command line, in a link
/// a fraction of the plain one's length; a link cut short is refused at its field.
#[test]
fn a_compact_design_link_reads_back_on_the_command_line() {
    use latchwise::budget::BudgetCalculator;
    use latchwise::calculator::compact_query;
    let design = std::fs::read_to_string("examples/budget-design.csv").unwrap();
    let corners = std::fs::read_to_string("examples/budget-corners.csv").unwrap();
    let enc = |s: &str| {
        s.bytes()
            .map(|b| match b {
                b'a'..=b'z' | b'A'..=b'Z' | b'0'..=b'9' | b'-' | b'.' | b'_' | b'*' => {
                    char::from(b).to_string()
                }
                b' ' => "+".into(),
                _ => format!("%{b:02X}"),
            })
            .collect::<String>()
    };
    let plain = format!(
        "design={}&corners={}&budget-fit=10",
        enc(&design),
        enc(&corners)
    );
    let compact = compact_query::<BudgetCalculator>(&plain);
    assert!(
        compact.contains("design=~1") && compact.contains("corners=~1"),
        "{compact}"
    );
    assert!(
        compact.len() * 10 < plain.len() * 6,
        "{} vs {}",
        compact.len(),
        plain.len()
    );
    let url = format!("file:///x/budget.html?{compact}");
    let from_link = report(&["budget", "--from-url", &url]);
    let from_files = report(&[
        "budget",
        "examples/budget-design.csv",
        "--corners",
        "examples/budget-corners.csv",
        "--budget-fit",
        "10",
    ]);
    assert_eq!(from_link["log10_total_fit"], from_files["log10_total_fit"]);
    assert_eq!(from_link["rows"], from_files["rows"]);
    assert_eq!(from_link["fix"], from_files["fix"]);
    // The same link cut short inside the design's packed value.
    let at = url.find("design=~1").unwrap() + 40;
    let cut = &url[..at];
    let out = latchwise(&["budget", "--from-url", cut]);
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("design: the packed value in the link cannot be read: its compressed data is cut short or altered"),
        "{err}"
    );
}

/// Packing a query packs only long table values, where that makes them shorter; the
/// query reads back as it was.
#[test]
fn compact_queries_pack_only_long_table_values() {
    use latchwise::link::{encode, pack_pairs};
    use latchwise::params::RawInputs;
    let design = "name,fclk,fdata,stages\n".to_string() + &"b,1GHz,1MHz,2\n".repeat(30);
    let q = format!("tau=20+ps&design={}", encode(&design));
    let packed = pack_pairs(RawInputs::from_query(&q).pairs(), &["design", "corners"]);
    assert!(packed.starts_with("tau=20+ps&design=~1"), "{packed}");
    assert!(packed.len() < q.len() / 3);
    let back = RawInputs::from_query(&packed).unpack_tables(&["design", "corners"]);
    assert_eq!(back.get("design"), Some(design.as_str()));
    assert_eq!(back.get("tau"), Some("20 ps"));
    // A short value stays readable.
    let short = RawInputs::from_query("design=a%2Cb");
    assert_eq!(pack_pairs(short.pairs(), &["design"]), "design=a%2Cb");
}

/// Only a calculator's data tables unpack: a 22 kB link that packs 16 MiB into `tau` is
/// refused as the text it is, without unpacking it (it once froze the page for 10 s and
/// printed 16.8 MB), on the page's reader and the command's.
#[test]
fn a_packed_value_outside_a_table_is_never_unpacked() {
    use latchwise::calculator::query_inputs;
    use latchwise::synchronizer::SyncCalculator;
    let bomb = latchwise::link::pack(&"9".repeat((16 << 20) - 64));
    assert!(bomb.len() < 40_000, "{}", bomb.len());
    let q = format!("tau={bomb}&tw=40ps&fclk=1GHz&fdata=100MHz&stages=2&tsu=30ps&tcq=50ps");
    let raw = query_inputs::<SyncCalculator>(&q);
    assert_eq!(raw.get("tau"), Some(bomb.as_str()));
    let e = <SyncCalculator as latchwise::calculator::Calculator>::read(&raw)
        .err()
        .unwrap();
    assert!(e.to_string().contains("is not a number"), "{e}");
    let out = latchwise(&["sync", "--from-url", &format!("?{q}")]);
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("tau: '~1") && err.contains("is not a number"),
        "{err}"
    );
    assert!(err.len() < 1000, "{} bytes", err.len());
}
