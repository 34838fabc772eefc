//! `phdose adjust --html` end to end: the report is one self-contained page (nothing fetched),
//! headless Chromium renders it to a PNG that is not blank and shows the curves, and the page
//! text Chromium builds holds the numbers that `--format json` gives for the same run. Path
//! problems exit 2, a failed write exits 1. Each test uses its own temporary store.
//!
//! Chromium (Debian package `chromium`) is required: without it these tests fail and say so,
//! they never pass silently. `.ci/run` installs it; set `CHROMIUM` to use another binary.

use std::path::{Path, PathBuf};
use std::process::{Command, Output, Stdio};
use std::time::{Duration, Instant};

use phdose::units::{fmt_ph, fmt_volume};
use serde_json::Value;

fn temp_dir(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("phdose-html-{}-{name}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

fn phdose(dir: &Path, args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_phdose"))
        .args(args)
        .arg("--db")
        .arg(dir.join("store.sqlite"))
        .output()
        .expect("phdose runs")
}

fn text(bytes: &[u8]) -> String {
    String::from_utf8_lossy(bytes).into_owned()
}

/// Our own scenario: 4-chlorobenzoic acid and triethylamine in 40 mL of water, brought to
/// pH 8 with saturated bicarbonate (CO2 forms: the gas caution must show).
const RUN: &[&str] = &[
    "adjust",
    "--solute",
    "OC(=O)c1ccc(Cl)cc1",
    "3mmol",
    "--solute",
    "CCN(CC)CC 150mg",
    "--water",
    "40mL",
    "--to-ph",
    "6.5",
    "--reagent",
    "nahco3",
    "--stock",
    "sat",
];

/// The Chromium binary, or a failure that says how to get it.
fn chromium() -> PathBuf {
    if let Some(p) = std::env::var_os("CHROMIUM") {
        let p = PathBuf::from(p);
        assert!(p.is_file(), "CHROMIUM={} is not a file", p.display());
        return p;
    }
    let found = std::env::var_os("PATH").and_then(|paths| {
        std::env::split_paths(&paths)
            .map(|d| d.join("chromium"))
            .find(|p| p.is_file())
    });
    found.unwrap_or_else(|| {
        panic!(
            "headless Chromium is required to check the HTML report and was not found on \
             PATH: install the Debian package (apt-get update && apt-get install -y chromium; \
             .ci/run does this) or set CHROMIUM to its path"
        )
    })
}

/// Runs headless Chromium on `page` with `extra` flags, killed after two minutes.
fn run_chromium(page: &Path, extra: &[&str], work: &Path) -> Output {
    let profile = work.join(format!("profile-{}", extra.len()));
    std::fs::create_dir_all(&profile).unwrap();
    let mut child = Command::new(chromium())
        .args([
            "--headless",
            "--no-sandbox",
            "--disable-gpu",
            "--disable-quic",
            "--no-first-run",
            "--disable-background-networking",
            "--disable-component-update",
            "--disable-sync",
        ])
        .arg(format!("--user-data-dir={}", profile.display()))
        .args(extra)
        .arg(format!("file://{}", page.display()))
        .current_dir(work)
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("chromium starts");
    // Read the pipes on threads so a large DOM cannot block the browser.
    let mut out = child.stdout.take().unwrap();
    let mut err = child.stderr.take().unwrap();
    let out = std::thread::spawn(move || {
        let mut v = Vec::new();
        std::io::Read::read_to_end(&mut out, &mut v).map(|_| v)
    });
    let err = std::thread::spawn(move || {
        let mut v = Vec::new();
        std::io::Read::read_to_end(&mut err, &mut v).map(|_| v)
    });
    let start = Instant::now();
    let status = loop {
        if let Some(status) = child.try_wait().unwrap() {
            break status;
        }
        if start.elapsed() > Duration::from_secs(120) {
            let _ = child.kill();
            panic!("chromium did not finish within 120 s");
        }
        std::thread::sleep(Duration::from_millis(50));
    };
    Output {
        status,
        stdout: out.join().unwrap().unwrap_or_default(),
        stderr: err.join().unwrap().unwrap_or_default(),
    }
}

/// The visible text of an HTML document: tags dropped, the few entities we write decoded,
/// white space collapsed. Enough for finding numbers and SMILES.
fn visible_text(html: &str) -> String {
    let mut out = String::new();
    let mut in_tag = false;
    let mut skip = false; // inside <style> or <title>/<desc> of the SVG does not matter
    let mut tag = String::new();
    for c in html.chars() {
        match (in_tag, c) {
            (false, '<') => {
                in_tag = true;
                tag.clear();
            }
            (true, '>') => {
                in_tag = false;
                let name = tag.trim_start_matches('/').split_whitespace().next();
                if name == Some("style") {
                    skip = !tag.starts_with('/');
                }
                out.push(' ');
            }
            (true, c) => tag.push(c),
            (false, c) if !skip => out.push(c),
            _ => {}
        }
    }
    let out = out
        .replace("&lt;", "<")
        .replace("&gt;", ">")
        .replace("&quot;", "\"")
        .replace("&apos;", "'")
        .replace("&amp;", "&");
    out.split_whitespace().collect::<Vec<_>>().join(" ")
}

#[test]
fn the_adjust_report_renders_and_holds_the_numbers() {
    let dir = temp_dir("render");
    let json = phdose(&dir, &[RUN, &["--format", "json"]].concat());
    assert!(json.status.success(), "{}", text(&json.stderr));
    let v: Value = serde_json::from_slice(&json.stdout).unwrap();

    let page = dir.join("report.html");
    let plain = phdose(&dir, RUN);
    let with_html = phdose(&dir, &[RUN, &["--html", page.to_str().unwrap()]].concat());
    assert!(with_html.status.success(), "{}", text(&with_html.stderr));
    // The usual output does not change when a report is written as well.
    assert_eq!(text(&plain.stdout), text(&with_html.stdout));

    // Self-contained: nothing to fetch. The only URL is the SVG namespace name.
    let html = std::fs::read_to_string(&page).unwrap();
    for outside in [
        "src=", "href=", "<script", "<link", "<img", "@import", "url(",
    ] {
        assert!(
            !html.contains(outside),
            "the report must not reference {outside}"
        );
    }
    let urls = html.matches("http").count();
    let namespaces = html.matches("xmlns=\"http://www.w3.org/2000/svg\"").count();
    assert_eq!(urls, namespaces, "only the SVG namespace may name a URL");
    assert!(html.contains("<svg") && html.contains("size: A4"));

    // The PNG: Chromium's picture of the page at A4 proportions (150 dpi).
    let work = temp_dir("chromium");
    let shot = work.join("out.png");
    let o = run_chromium(
        &page,
        &[
            &format!("--screenshot={}", shot.display()),
            "--window-size=1240,1754",
        ],
        &work,
    );
    assert!(o.status.success(), "chromium: {}", text(&o.stderr));
    let (width, height, ink, curve) = png_stats(&shot);
    assert_eq!((width, height), (1240, 1754));
    let pixels = (width * height) as f64;
    // Dark ink (text, rules, axes) covers a few percent of a printed page of tables; a blank
    // or failed render has none.
    assert!(
        ink as f64 / pixels > 0.01,
        "too little ink: {ink} of {pixels} pixels"
    );
    // The first curve's colour (Okabe–Ito blue, #0072B2): the inline SVG was drawn.
    assert!(
        curve > 200,
        "the curves are not drawn ({curve} blue pixels)"
    );

    // The page text as Chromium builds it holds the numbers of the JSON run.
    let dom = run_chromium(&page, &["--dump-dom"], &work);
    assert!(dom.status.success(), "chromium: {}", text(&dom.stderr));
    let shown = visible_text(&text(&dom.stdout));
    let stock_ml = v["stock_volume_ml"].as_f64().expect("a solution stock");
    let expect = [
        fmt_volume(stock_ml / 1e3),
        fmt_ph(v["ph"].as_f64().unwrap()),
        fmt_ph(v["start_ph"].as_f64().unwrap()),
        fmt_volume(v["aqueous_volume_ml"].as_f64().unwrap() / 1e3),
        "OC(=O)c1ccc(Cl)cc1".to_string(),
        "CCN(CC)CC".to_string(),
        phdose::cli::shell::long_version().to_string(),
    ];
    for e in &expect {
        assert!(shown.contains(e.as_str()), "page text lacks {e:?}");
    }
    for s in v["solutes"].as_array().unwrap() {
        let neutral = format!("{:.1} %", 100.0 * s["fraction_neutral"].as_f64().unwrap());
        assert!(shown.contains(&neutral), "page text lacks {neutral}");
    }
    // Every caution is there, and the deferral to local rules and the SDS comes last.
    let cautions: Vec<&str> = v["cautions"]
        .as_array()
        .unwrap()
        .iter()
        .map(|c| c.as_str().unwrap())
        .collect();
    assert!(cautions.iter().any(|c| c.contains("vent")), "{cautions:?}");
    let last = cautions.last().unwrap();
    assert!(last.contains("SDS"));
    let at = shown.find(last).expect("the deferral is shown");
    for c in &cautions {
        assert!(shown.find(c).is_some_and(|i| i <= at), "{c}");
    }
    std::fs::remove_dir_all(&dir).ok();
    std::fs::remove_dir_all(&work).ok();
}

/// Width, height, dark pixels and pixels of the first curve colour (#0072B2, within 40 per
/// channel).
fn png_stats(path: &Path) -> (u32, u32, usize, usize) {
    let decoder = png::Decoder::new(std::io::BufReader::new(std::fs::File::open(path).unwrap()));
    let mut reader = decoder.read_info().unwrap();
    let mut buf = vec![0; reader.output_buffer_size().unwrap()];
    let info = reader.next_frame(&mut buf).unwrap();
    let channels = info.color_type.samples();
    assert_eq!(info.bit_depth, png::BitDepth::Eight);
    let (mut ink, mut curve) = (0, 0);
    for px in buf[..info.buffer_size()].chunks(channels) {
        let (r, g, b) = match px {
            [r, g, b, ..] => (*r as i32, *g as i32, *b as i32),
            [l, ..] => (*l as i32, *l as i32, *l as i32),
            [] => continue,
        };
        if r + g + b < 3 * 110 {
            ink += 1;
        }
        if r < 40 && (g - 0x72).abs() < 40 && (b - 0xB2).abs() < 40 {
            curve += 1;
        }
    }
    (info.width, info.height, ink, curve)
}

#[test]
fn a_missing_folder_exits_2_and_a_failed_write_exits_1() {
    let dir = temp_dir("paths");
    let missing = dir.join("no-such-folder").join("report.html");
    let o = phdose(
        &dir,
        &[RUN, &["--html", missing.to_str().unwrap()]].concat(),
    );
    assert_eq!(o.status.code(), Some(2), "{}", text(&o.stderr));
    assert!(
        text(&o.stderr).contains("does not exist"),
        "{}",
        text(&o.stderr)
    );
    let o = phdose(&dir, &[RUN, &["--html", dir.to_str().unwrap()]].concat());
    assert_eq!(o.status.code(), Some(2), "{}", text(&o.stderr));
    // /dev/full accepts the open and fails every write (no space left on device).
    if Path::new("/dev/full").exists() {
        let o = phdose(&dir, &[RUN, &["--html", "/dev/full"]].concat());
        assert_eq!(o.status.code(), Some(1), "{}", text(&o.stderr));
        assert!(text(&o.stderr).contains("cannot write the report"));
    }
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn the_buffer_report_holds_the_recipe_and_renders() {
    // Our own prep-room request: 500 mL of 50 mM Tris pH 8.0 for use at 37 °C, titrated.
    let dir = temp_dir("buffer");
    let run = [
        "buffer", "--system", "tris", "--ph", "8.0", "--conc", "50mM", "--volume", "500mL",
        "--temp", "37", "--recipe", "titrate",
    ];
    let json = phdose(&dir, &[&run[..], &["--format", "json"]].concat());
    assert!(json.status.success(), "{}", text(&json.stderr));
    let v: Value = serde_json::from_slice(&json.stdout).unwrap();
    let page = dir.join("buffer.html");
    let o = phdose(
        &dir,
        &[&run[..], &["--html", page.to_str().unwrap()]].concat(),
    );
    assert!(o.status.success(), "{}", text(&o.stderr));
    let html = std::fs::read_to_string(&page).unwrap();
    assert!(!html.contains("<script") && !html.contains("src=") && html.contains("<svg"));

    let work = temp_dir("buffer-chromium");
    let dom = run_chromium(&page, &["--dump-dom"], &work);
    assert!(dom.status.success(), "chromium: {}", text(&dom.stderr));
    let shown = visible_text(&text(&dom.stdout));
    for c in v["components"].as_array().unwrap() {
        let amount = match (c["mass_g"].as_f64(), c["volume_ml"].as_f64()) {
            (Some(g), _) => phdose::units::fmt_mass(g),
            (None, Some(ml)) => fmt_volume(ml / 1e3),
            _ => panic!("a component without an amount: {c}"),
        };
        assert!(shown.contains(&amount), "page text lacks {amount}");
    }
    assert!(shown.contains(&fmt_ph(v["ph"].as_f64().unwrap())));
    // The titrant's hazard, then the deferral last.
    let hcl = shown
        .find("Hydrochloric acid is corrosive")
        .expect("titrant caution");
    let sds = shown
        .rfind("the SDS of every reagent")
        .expect("the deferral");
    assert!(hcl < sds);
    std::fs::remove_dir_all(&dir).ok();
    std::fs::remove_dir_all(&work).ok();
}

/// Renders `page` in headless Chromium at A4 proportions and checks the picture is not blank
/// and the curves are drawn; returns the page text as Chromium builds it.
fn render(page: &Path, work: &Path) -> String {
    let shot = work.join("out.png");
    let o = run_chromium(
        page,
        &[
            &format!("--screenshot={}", shot.display()),
            "--window-size=1240,1754",
        ],
        work,
    );
    assert!(o.status.success(), "chromium: {}", text(&o.stderr));
    let (width, height, ink, _) = png_stats(&shot);
    assert_eq!((width, height), (1240, 1754));
    let pixels = (width * height) as f64;
    assert!(
        ink as f64 / pixels > 0.01,
        "too little ink: {ink} of {pixels} pixels"
    );
    let dom = run_chromium(page, &["--dump-dom"], work);
    assert!(dom.status.success(), "chromium: {}", text(&dom.stderr));
    // The first page holds the answer and tables, not the figure: look for the curve colour
    // on a tall shot of the whole page.
    let tall = work.join("tall.png");
    let o = run_chromium(
        page,
        &[
            &format!("--screenshot={}", tall.display()),
            "--window-size=1240,6000",
        ],
        work,
    );
    assert!(o.status.success(), "chromium: {}", text(&o.stderr));
    let (_, _, _, curve) = png_stats(&tall);
    assert!(
        curve > 200,
        "the curves are not drawn ({curve} blue pixels)"
    );
    visible_text(&text(&dom.stdout))
}

/// The page must fetch nothing: no sources, links, scripts or styles from elsewhere.
fn assert_self_contained(html: &str) {
    for outside in [
        "src=", "href=", "<script", "<link", "<img", "@import", "url(",
    ] {
        assert!(
            !html.contains(outside),
            "the report must not reference {outside}"
        );
    }
    assert!(html.contains("<svg") && html.contains("size: A4"));
}

#[test]
fn the_plan_report_holds_the_steps_fractions_and_recoveries_and_renders() {
    // Our own scenario: benzoic acid, triethylamine and naphthalene in ethyl acetate; the
    // naphthalene is wanted. Two washes (acid, then base) split the three.
    let dir = temp_dir("plan");
    let run = [
        "plan",
        "--solute",
        "OC(=O)c1ccccc1",
        "2mmol",
        "--solute",
        "CCN(CC)CC 1.5mmol",
        "--solute",
        "c1ccc2ccccc2c1",
        "128mg",
        "--organic",
        "50mL",
        "--solvent",
        "ethyl acetate",
        "--keep",
        "c1ccc2ccccc2c1",
    ];
    let json = phdose(&dir, &[&run[..], &["--format", "json"]].concat());
    assert!(json.status.success(), "{}", text(&json.stderr));
    let v: Value = serde_json::from_slice(&json.stdout).unwrap();
    let page = dir.join("plan.html");
    let plain = phdose(&dir, &run);
    let o = phdose(
        &dir,
        &[&run[..], &["--html", page.to_str().unwrap()]].concat(),
    );
    assert!(o.status.success(), "{}", text(&o.stderr));
    assert_eq!(text(&plain.stdout), text(&o.stdout));
    let html = std::fs::read_to_string(&page).unwrap();
    assert_self_contained(&html);

    let work = temp_dir("plan-chromium");
    let shown = render(&page, &work);
    let steps = v["steps"].as_array().unwrap();
    assert!(!steps.is_empty(), "this mixture separates: {v}");
    let mut expect = vec![
        "OC(=O)c1ccccc1".to_string(),
        "CCN(CC)CC".to_string(),
        "c1ccc2ccccc2c1".to_string(),
        "128mg".to_string(),
    ];
    for s in steps {
        expect.push(fmt_ph(s["ph"].as_f64().unwrap()));
        expect.push(
            match (s["stock_volume_ml"].as_f64(), s["reagent_mass_g"].as_f64()) {
                (Some(ml), _) => fmt_volume(ml / 1e3),
                (None, Some(g)) => phdose::units::fmt_mass(g),
                _ => panic!("a step without an amount: {s}"),
            },
        );
        expect.push(phdose::units::fmt_moles(s["reagent_mol"].as_f64().unwrap()));
    }
    for f in v["fractions"].as_array().unwrap() {
        expect.push(format!("{:.1} %", 100.0 * f["purity"].as_f64().unwrap()));
        expect.push(format!("{:.1} %", 100.0 * f["recovery"].as_f64().unwrap()));
    }
    for r in v["recoveries"].as_array().unwrap() {
        expect.push(format!(
            "{} %",
            phdose::report::sig(100.0 * r["overall"].as_f64().unwrap(), 3)
        ));
    }
    for e in &expect {
        assert!(shown.contains(e.as_str()), "page text lacks {e:?}");
    }
    // The answer comes first: step 1 is told before the inputs are listed.
    let answer = shown
        .find("Step 1: wash at pH")
        .expect("the answer in words");
    assert!(answer < shown.find("The mixture, as given").unwrap());
    let cautions: Vec<&str> = v["cautions"]
        .as_array()
        .unwrap()
        .iter()
        .map(|c| c.as_str().unwrap())
        .collect();
    let last = cautions.last().unwrap();
    assert!(last.contains("SDS"));
    let at = shown.rfind(last).expect("the deferral is shown");
    for c in &cautions {
        assert!(shown.find(c).is_some_and(|i| i <= at), "{c}");
    }
    std::fs::remove_dir_all(&dir).ok();
    std::fs::remove_dir_all(&work).ok();
}

#[test]
fn the_check_report_is_written_with_its_problem_and_fix_and_renders() {
    // examples/amine-back-extraction-ph.toml carries a planted mistake: the back-extraction
    // runs at pH 8, where the amine is still mostly protonated.
    let dir = temp_dir("check");
    let file = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/examples/amine-back-extraction-ph.toml"
    );
    let json = phdose(&dir, &["check", file, "--format", "json"]);
    assert_eq!(json.status.code(), Some(4), "{}", text(&json.stderr));
    let v: Value = serde_json::from_slice(&json.stdout).unwrap();
    let page = dir.join("check.html");
    let o = phdose(&dir, &["check", file, "--html", page.to_str().unwrap()]);
    // Problems found: exit 4 stays, and the report is written all the same.
    assert_eq!(o.status.code(), Some(4), "{}", text(&o.stderr));
    let html = std::fs::read_to_string(&page).expect("the report is written");
    assert_self_contained(&html);

    let work = temp_dir("check-chromium");
    let shown = render(&page, &work);
    let problems = v["problems"].as_array().unwrap();
    assert_eq!(problems.len(), 1, "{v}");
    let message = problems[0]["message"].as_str().unwrap();
    let fix = problems[0]["fix"].as_str().unwrap();
    assert!(message.contains("pH 8.00"), "{message}");
    let at = shown.find(message).expect("the problem is shown");
    assert!(shown[at..].contains(fix), "the fix follows the problem");
    // Prominent: the problem comes before the step table and the inputs.
    assert!(at < shown.find("The mixture, as written").unwrap());
    for s in v["steps"].as_array().unwrap() {
        if let Some(ph) = s["ph"].as_f64() {
            assert!(shown.contains(&fmt_ph(ph)), "page text lacks pH {ph}");
        }
    }
    let end = &v["end"];
    let recovered = format!("{:.1} %", end["product_recovery_pct"].as_f64().unwrap());
    assert!(shown.contains(&recovered), "page text lacks {recovered}");
    for smiles in ["CNCc1ccccc1", "CC(=O)c1ccccc1"] {
        assert!(shown.contains(smiles), "page text lacks {smiles}");
    }
    // Every step's cautions and the procedure's, the deferral last of all.
    let deferral = v["cautions"].as_array().unwrap().last().unwrap();
    let deferral = deferral.as_str().unwrap();
    let at = shown.rfind(deferral).expect("the deferral is shown");
    for s in v["steps"].as_array().unwrap() {
        for c in s["cautions"].as_array().unwrap() {
            let c = c.as_str().unwrap();
            assert!(shown.find(c).is_some_and(|i| i < at), "{c}");
        }
    }
    std::fs::remove_dir_all(&dir).ok();
    std::fs::remove_dir_all(&work).ok();
}
