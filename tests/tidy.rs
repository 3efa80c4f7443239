//! The project's conventions, read from the source tree and the pages: one vocabulary
//! (a readout's name is its JSON key and its page `<output name>`, with the same label;
//! a field's name is its page `<input name>`), every calculator on a page in the
//! navigation, every Rust file opening with `//!`, and a core that does no I/O.

use std::collections::BTreeSet;
use std::path::{Path, PathBuf};
use std::process::Command;

use latchwise::calculator::{Calculator, Visit};
use latchwise::params::RawInputs;
use latchwise::registry::{dispatch, ALL};
use serde_json::Value;

/// A link query carrying a demo data file, percent-encoded.
fn with_data(kind: &str, file: &str, extra: &str) -> String {
    let text = std::fs::read_to_string(root().join("examples").join(file)).unwrap();
    let data: String = text
        .bytes()
        .map(|b| match b {
            b'A'..=b'Z' | b'a'..=b'z' | b'0'..=b'9' | b'-' | b'.' | b'_' => (b as char).to_string(),
            _ => format!("%{b:02X}"),
        })
        .collect();
    format!("kind={kind}&data={data}{extra}")
}

/// Cases that together show every result of each calculator.
fn coverage(name: &str) -> Vec<String> {
    let fixed: &[&str] = match name {
        "sync" => &[
            "tau=20ps&tw=40ps&fclk=1GHz&fdata=100MHz&stages=2&tsu=30ps&tcq=50ps&target-years=1e6&devices=1e6&service-years=10",
            "tau=20ps&tw=40ps&fclk=1GHz&fdata=100MHz&tr=900ps&target-fit=1",
            "tau=20ps&tw=40ps&fclk=1GHz&fdata=1&stages=2&tsu=30ps&tcq=50ps&target-years=1e-7",
            "tau-master=20ps&tau-slave=30ps&duty=0.5&tw=10ps&tw2=30ps&fclk=1GHz&fdata=100MHz&stages=3&tsu=30ps&tcq=50ps&target-years=1e9",
            "tau=14ps,22ps&tw=40ps&fclk=500MHz&crossing=gray&increments=50MHz&stages=3&tsu=30ps&tcq=50ps&ratio=4/5&jitter=10ps&target-years=1e6",
            "tau=50ps&tw=35ps&fclk=500MHz&fdata=50MHz&stages=2&tsu=25ps&tcq=40ps&ratio=4/5&jitter=8ps&phase=125ps",
        ],
        "comparator" => &[
            "tau=15ps&treg=80ps&extra-stages=2&stage-time=100ps&vmin=0.4&gain=4&input=uniform&lsb=1mV&fs=5GHz&target-ber=1e-10",
            "tau=15ps&treg=40ps&vmin=0.4&gain=4&input=nrz&amp=40mV&sigma=4mV&fs=28GHz&target-ber=1e-12&vin=1uV",
            "cl=20f&gm=2m&g0=0.4m&treg=1ns&vmin=0.4&input=pam4&amp=150m&sigma=8m&fs=1G&target-ber=1e-15",
        ],
        "converter" => &[
            "bits=10&timing=async&tau=10ps&vmin=1&gain=1&vfs=1&fs=100MHz&tconv=1ns&tfix=30ps&fill=reset&sigma-n=0.5mV&static=512&margin-lsb=2&target-ber=1e-12",
            "bits=10&timing=sync&tau=20ps&vmin=0.4&gain=4&vfs=1&fs=100MHz&tbit=400ps&consume=hard&target-fit=1",
            "bits=8&timing=sync&cl=20f&gm=2m&g0=0.4m&vmin=0.4&vfs=0.8&fs=1G&tbit=150ps&consume=benign&margin-lsb=2&target-ber=1e-15&sigma-n=1mV",
        ],
        "supply" => {
            let char = std::fs::read_to_string(root().join("examples/supply-char.csv")).unwrap();
            let enc = |t: &str| -> String {
                t.bytes()
                    .map(|b| match b {
                        b'A'..=b'Z' | b'a'..=b'z' | b'0'..=b'9' | b'-' | b'.' | b'_' => (b as char).to_string(),
                        _ => format!("%{b:02X}"),
                    })
                    .collect()
            };
            let points = std::fs::read_to_string(root().join("examples/supply-points.csv")).unwrap();
            return vec![
                format!("char={}&points={}&ss=62.5mV&dvt=20mV&fdata=20MHz&stages=2&target-years=1e4", enc(&char), enc(&points)),
                format!("char={}&points={}&fdata=20MHz&stages=3", enc("vdd,tau,tw,tsu,tcq\n0.7,30ps,40ps,30ps,50ps\n0.9,12ps,20ps,20ps,35ps\n"), enc("name,vdd,fclk\nlow,0.7,400MHz\nhigh,0.9,1GHz\n")),
            ];
        }
        "fit" => {
            return vec![
                with_data("counts", "fit-counts.csv", "&fclk=1GHz&fdata=50MHz"),
                with_data("counts", "fit-counts.csv", "&fclk=1GHz&fdata=50MHz&window=t0"),
                with_data("delay", "fit-delay.csv", ""),
                with_data("delay", "fit-delay.csv", "&method=log"),
                with_data("comparator", "fit-comparator.csv", ""),
            ];
        }
        "budget" => {
            let corners = std::fs::read_to_string(root().join("examples/budget-corners.csv")).unwrap();
            let enc: String = corners
                .bytes()
                .map(|b| match b {
                    b'A'..=b'Z' | b'a'..=b'z' | b'0'..=b'9' | b'-' | b'.' | b'_' => (b as char).to_string(),
                    _ => format!("%{b:02X}"),
                })
                .collect();
            return vec![
                with_data("", "budget-design.csv", &format!("&corners={enc}&budget-fit=10&tau-sigma=0.05&tw-sigma=0.3&devices=1000000&service-years=10"))
                    .replacen("kind=&data=", "design=", 1),
                with_data("", "budget-design.csv", "&tau=12ps&tw=20ps&tsu=25ps&tcq=40ps&budget-fit=1e-30")
                    .replacen("kind=&data=", "design=", 1),
                // A mission profile: corners with their shares of service time.
                with_data("", "budget-design.csv", "&corners=corner%2Ctau%2Ctw%2Ctsu%2Ctcq%2Chours%0Acool%2C12ps%2C20ps%2C25ps%2C40ps%2C0.9%0Awarm%2C18ps%2C26ps%2C35ps%2C60ps%2C0.1&devices=1000&service-years=5")
                    .replacen("kind=&data=", "design=", 1),
            ];
        }
        other => panic!("no coverage cases for calculator '{other}': add them here"),
    };
    fixed.iter().map(|q| q.to_string()).collect()
}

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn read(path: &Path) -> String {
    std::fs::read_to_string(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()))
}

/// Every value of `attr` on the tags named `tag` (`<input`, `<select`, `<output`).
fn attr_values(html: &str, tag: &str, attr: &str) -> Vec<String> {
    html.match_indices(&format!("<{tag} "))
        .filter_map(|(i, _)| {
            let end = html[i..].find('>')? + i;
            let t = &html[i..end];
            let key = format!(" {attr}=\"");
            let s = t.find(&key)? + key.len();
            let e = t[s..].find('"')? + s;
            Some(t[s..e].to_string())
        })
        .collect()
}

/// Text with tags removed, entities of the pages resolved, and the page's Greek letter
/// written as its parameter name (the page shows τ where the command prints tau).
fn plain(html: &str) -> String {
    let mut out = String::new();
    let mut in_tag = false;
    for c in html.chars() {
        match c {
            '<' => in_tag = true,
            '>' => in_tag = false,
            c if !in_tag => out.push(c),
            _ => {}
        }
    }
    out.replace('τ', "tau").trim().to_string()
}

/// The label the page shows beside `<output name="name">`: the `<dt>` of its row or the
/// `<span class="lbl">` of its headline box.
fn page_label(html: &str, name: &str) -> Option<String> {
    let at = html.find(&format!("<output name=\"{name}\""))?;
    let before = &html[..at];
    let (open, close) = if before.trim_end().ends_with("<dd>") {
        ("<dt>", "</dt>")
    } else {
        ("<span class=\"lbl\">", "</span>")
    };
    let e = before.rfind(close)?;
    let s = before[..e].rfind(open)? + open.len();
    Some(plain(&before[s..e]))
}

/// The header comment of a page source: key -> value.
fn header(html: &str) -> Vec<(String, String)> {
    let first = html.lines().next().unwrap_or("");
    let body = first
        .strip_prefix("<!--")
        .and_then(|s| s.strip_suffix("-->"))
        .unwrap_or_else(|| panic!("page header missing: {first}"));
    body.split(';')
        .filter_map(|p| p.split_once(':'))
        .map(|(k, v)| (k.trim().to_string(), v.trim().to_string()))
        .collect()
}

struct Vocabulary;

impl Visit for Vocabulary {
    type Out = ();

    fn visit<C: Calculator>(self) {
        let page = read(&root().join("www").join(C::PAGE));
        let meta = header(&page);
        let get = |k: &str| meta.iter().find(|(m, _)| m == k).map(|(_, v)| v.as_str());
        assert_eq!(get("page"), Some(C::NAME), "{}: page header", C::PAGE);
        assert_eq!(get("title"), Some(C::TITLE), "{}: title", C::PAGE);
        assert!(
            get("nav").is_some_and(|n| !n.is_empty()) && get("order").is_some(),
            "{}: every calculator's page is in the navigation",
            C::PAGE
        );

        // Fields: one <input> or <select> per field, and no input that is not a field.
        let fields: BTreeSet<String> = C::FIELDS.iter().map(|f| f.name.to_string()).collect();
        let inputs: BTreeSet<String> = attr_values(&page, "input", "name")
            .into_iter()
            .chain(attr_values(&page, "select", "name"))
            .chain(attr_values(&page, "textarea", "name"))
            .collect();
        assert_eq!(fields, inputs, "{}: fields against page inputs", C::NAME);

        // Readouts: JSON key, page output and label agree, over cases that show them all.
        let outputs: BTreeSet<String> = attr_values(&page, "output", "name").into_iter().collect();
        let mut shown = BTreeSet::new();
        let mut labelled: BTreeSet<String> = BTreeSet::new();
        for q in &coverage(C::NAME) {
            let case = C::read(&RawInputs::from_query(q)).unwrap_or_else(|e| panic!("{q}: {e}"));
            let report = C::evaluate(&case);
            let json = serde_json::to_value(&report).unwrap();
            let outcome = C::outcome(&report);
            for r in &outcome.readouts {
                let key = r.name;
                shown.insert(key.to_string());
                let j = json
                    .get(key)
                    .unwrap_or_else(|| panic!("{q}: readout {key} is no JSON key"));
                match (r.value, j) {
                    (Some(v), Value::Number(n)) => {
                        assert_eq!(n.as_f64(), Some(v), "{q}: {key} readout against JSON")
                    }
                    (Some(v), Value::Bool(b)) => {
                        assert_eq!(*b, v == 1.0, "{q}: {key} readout against JSON")
                    }
                    (None, Value::String(s)) => {
                        assert_eq!(s, &r.text, "{q}: {key}: readout text against JSON")
                    }
                    (None, Value::Null) => assert!(
                        json["not_applicable"][key].is_string(),
                        "{q}: {key} is null in JSON without a reason"
                    ),
                    (v, j) => panic!("{q}: {key}: readout {v:?} against JSON {j}"),
                }
                assert!(
                    outputs.contains(key),
                    "{q}: {key} has no <output> on {}",
                    C::PAGE
                );
                // The page's static label is the one its first case shows; the page's
                // script relabels from the readouts when a case words it otherwise
                // (a PAM4 symbol error ratio).
                if !labelled.contains(key) {
                    assert_eq!(
                        page_label(&page, key).as_deref(),
                        Some(r.label),
                        "{}: the page's label of {key}",
                        C::PAGE
                    );
                }
            }
            labelled.extend(outcome.readouts.iter().map(|r| r.name.to_string()));
            // The command prints the same readouts with the same labels.
            // A table goes to the command line as a file.
            let args: Vec<String> = RawInputs::from_query(q)
                .pairs()
                .iter()
                .enumerate()
                .flat_map(|(i, (k, v))| {
                    let text = C::FIELDS
                        .iter()
                        .any(|f| f.name == k && f.dim == latchwise::units::Dim::Text);
                    let value = if text {
                        let path = std::env::temp_dir().join(format!(
                            "latchwise-tidy-{}-{}-{i}.csv",
                            C::NAME,
                            std::process::id()
                        ));
                        std::fs::write(&path, v).unwrap();
                        path.to_string_lossy().into_owned()
                    } else {
                        v.clone()
                    };
                    [format!("--{k}"), value]
                })
                .collect();
            let out = Command::new(env!("CARGO_BIN_EXE_latchwise"))
                .arg(C::NAME)
                .args(&args)
                .output()
                .unwrap();
            let text = String::from_utf8_lossy(&out.stdout);
            for r in &outcome.readouts {
                let line = format!("{} ", r.label);
                assert!(
                    text.lines()
                        .any(|l| l.trim_start().starts_with(&line) && l.contains(&r.text)),
                    "{q}: the text report lacks '{} {}':\n{text}",
                    r.label,
                    r.text
                );
            }
        }
        assert_eq!(shown, outputs, "{}: page outputs against readouts", C::NAME);
    }
}

#[test]
fn one_vocabulary_across_core_json_cli_and_pages() {
    assert!(!ALL.is_empty());
    for about in ALL {
        dispatch(about.name, Vocabulary).unwrap();
    }
}

#[test]
fn every_page_is_a_calculator_and_the_parts_carry_the_navigation() {
    let www = root().join("www");
    let head = read(&www.join("_parts/head.html"));
    assert!(head.contains("{{nav}}") && head.contains("{{title}}"));
    let pages: BTreeSet<String> = std::fs::read_dir(&www)
        .unwrap()
        .filter_map(|e| e.ok())
        .map(|e| e.file_name().to_string_lossy().into_owned())
        .filter(|n| n.ends_with(".html"))
        .collect();
    let registered: BTreeSet<String> = ALL.iter().map(|a| a.page.to_string()).collect();
    assert_eq!(
        pages, registered,
        "pages in www/ against registered calculators"
    );
    let orders: BTreeSet<String> = pages
        .iter()
        .map(|p| {
            let h = header(&read(&www.join(p)));
            h.into_iter().find(|(k, _)| k == "order").unwrap().1
        })
        .collect();
    assert_eq!(
        orders.len(),
        pages.len(),
        "each page has its own navigation order"
    );
}

/// Each page's module is built with its calculator's cargo feature alone (scripts/build),
/// so every calculator has a feature by its name, on by default and required by the
/// command line (enabling `tables` exactly when it has a data table), and its page names
/// that calculator.
#[test]
fn every_calculator_is_a_cargo_feature_and_its_page_names_it() {
    let cargo = read(&root().join("Cargo.toml"));
    let line = |start: &str| -> String {
        cargo
            .lines()
            .find(|l| l.starts_with(start))
            .unwrap_or_else(|| panic!("Cargo.toml has no line starting {start}"))
            .to_string()
    };
    let default = line("default = [");
    let required = line("required-features = [");
    for about in ALL {
        let quoted = format!("\"{}\"", about.name);
        // A calculator with a data table brings the table editor's exports ("tables");
        // one without has none, and no packing code.
        let tables = latchwise::calculator::has_tables(about.fields);
        let want = if tables {
            format!("{} = [\"tables\"]", about.name)
        } else {
            format!("{} = []", about.name)
        };
        assert!(
            cargo.lines().any(|l| l == want),
            "Cargo.toml: the feature line should be `{want}`"
        );
        assert!(
            default.contains(&quoted),
            "{} is not a default feature",
            about.name
        );
        assert!(
            required.contains(&quoted),
            "the command line does not require {}",
            about.name
        );
        let page = read(&root().join("www").join(about.page));
        let h = header(&page);
        let named = h.into_iter().find(|(k, _)| k == "page").unwrap().1;
        assert_eq!(named, about.name, "{} names its calculator", about.page);
    }
    assert_eq!(
        default.matches('"').count(),
        2 * ALL.len(),
        "a default feature with no calculator"
    );
}

fn rust_files(dir: &Path, out: &mut Vec<PathBuf>) {
    for e in std::fs::read_dir(dir).unwrap().filter_map(|e| e.ok()) {
        let p = e.path();
        if p.is_dir() {
            rust_files(&p, out);
        } else if p.extension().is_some_and(|x| x == "rs") {
            out.push(p);
        }
    }
}

#[test]
fn every_rust_file_says_what_it_holds() {
    let mut files = Vec::new();
    rust_files(&root().join("crate"), &mut files);
    rust_files(&root().join("tests"), &mut files);
    assert!(files.len() > 20);
    for f in files {
        assert!(
            read(&f).starts_with("//!"),
            "{} does not open with //!",
            f.display()
        );
    }
}

#[test]
fn the_core_does_no_io_and_no_calculator_imports_another() {
    let mut files = Vec::new();
    rust_files(&root().join("crate/src"), &mut files);
    for f in &files {
        let name = f.to_string_lossy();
        if name.ends_with("wasm.rs") {
            continue;
        }
        let text = read(f);
        let code: String = text
            .lines()
            .filter(|l| !l.trim_start().starts_with("//"))
            .collect::<Vec<_>>()
            .join("\n");
        for banned in [
            "std::fs",
            "std::io",
            "std::process",
            "std::env",
            "web_sys",
            "println!",
            "eprintln!",
            "print!(",
        ] {
            assert!(!code.contains(banned), "{name} names {banned}");
        }
        for (calc, other) in [
            ("synchronizer", "comparator"),
            ("comparator", "synchronizer"),
        ] {
            if name.contains(&format!("/src/{calc}/")) {
                assert!(
                    !code.contains(&format!("crate::{other}")),
                    "{name} imports the {other} calculator"
                );
            }
        }
    }
}
