//! The HTML pages in a real browser: headless Chromium (Debian's package),
//! driven over the Chrome DevTools Protocol. Each page must load with no
//! console error and no network request, show every entry's name, and show
//! each colour patch as a flat area of the colour it stands for.
//!
//! Chromium is found at `$INKFIT_CHROMIUM` or `/usr/bin/chromium`. Without
//! it these tests say so and pass, unless `INKFIT_BROWSER_TESTS=require`
//! (as `scripts/test-all` and CI set it), where a missing browser fails.
//! `INKFIT_SCREENSHOT_DIR=DIR` keeps the screenshots for looking at.

use std::io::{BufRead, BufReader};
use std::net::TcpStream;
use std::path::{Path, PathBuf};
use std::process::{Child, Command, Stdio};
use std::sync::mpsc;
use std::time::{Duration, Instant};

use base64::Engine as _;
use serde_json::{json, Value};

fn bin() -> PathBuf {
    PathBuf::from(env!("CARGO_BIN_EXE_inkfit"))
}

fn chromium() -> Option<PathBuf> {
    let p = std::env::var_os("INKFIT_CHROMIUM")
        .map(PathBuf::from)
        .unwrap_or_else(|| PathBuf::from("/usr/bin/chromium"));
    if p.exists() {
        return Some(p);
    }
    assert!(
        std::env::var("INKFIT_BROWSER_TESTS").as_deref() != Ok("require"),
        "INKFIT_BROWSER_TESTS=require, but no Chromium at {}",
        p.display()
    );
    eprintln!(
        "browser tests skipped: no Chromium at {} (apt-get install chromium)",
        p.display()
    );
    None
}

/// A headless browser with one page attached.
struct Browser {
    child: Child,
    ws: tungstenite::WebSocket<TcpStream>,
    session: String,
    next_id: u64,
    /// Every event seen so far.
    events: Vec<Value>,
    _profile: tempfile::TempDir,
}

impl Drop for Browser {
    fn drop(&mut self) {
        let _ = self.child.kill();
        let _ = self.child.wait();
    }
}

impl Browser {
    fn launch(exe: &Path, width: u32) -> Browser {
        let profile = tempfile::tempdir().unwrap();
        // The flags a closed network needs (no background connections), and
        // unmanaged sRGB output so screenshot pixels equal CSS sRGB values.
        let mut child = Command::new(exe)
            .args([
                "--headless",
                "--no-sandbox",
                "--disable-gpu",
                "--disable-quic",
                "--no-first-run",
                "--disable-background-networking",
                "--disable-component-update",
                "--disable-sync",
                "--disable-extensions",
                "--force-color-profile=srgb",
                "--hide-scrollbars",
                "--remote-debugging-port=0",
                &format!("--window-size={width},1000"),
                &format!("--user-data-dir={}", profile.path().display()),
                "about:blank",
            ])
            .stdout(Stdio::null())
            .stderr(Stdio::piped())
            .spawn()
            .expect("chromium starts");
        let stderr = child.stderr.take().unwrap();
        let (tx, rx) = mpsc::channel();
        std::thread::spawn(move || {
            for line in BufReader::new(stderr).lines().map_while(Result::ok) {
                if let Some(k) = line.find("ws://") {
                    let _ = tx.send(line[k..].trim().to_string());
                }
            }
        });
        let url = rx
            .recv_timeout(Duration::from_secs(60))
            .expect("chromium announces its DevTools address within 60 s");
        let host = url.trim_start_matches("ws://").split('/').next().unwrap().to_string();
        let stream = TcpStream::connect(&host).unwrap();
        stream.set_read_timeout(Some(Duration::from_secs(60))).unwrap();
        let (ws, _) = tungstenite::client(url.as_str(), stream).expect("websocket handshake");
        let mut b = Browser {
            child,
            ws,
            session: String::new(),
            next_id: 0,
            events: Vec::new(),
            _profile: profile,
        };
        let target = b.call(None, "Target.createTarget", json!({"url": "about:blank"}));
        let id = target["targetId"].as_str().unwrap().to_string();
        let att = b.call(None, "Target.attachToTarget", json!({"targetId": id, "flatten": true}));
        b.session = att["sessionId"].as_str().unwrap().to_string();
        for m in ["Runtime.enable", "Log.enable", "Network.enable", "Page.enable"] {
            b.page(m, json!({}));
        }
        b
    }

    /// Sends a command and waits for its answer, keeping events that come
    /// in between.
    fn call(&mut self, session: Option<&str>, method: &str, params: Value) -> Value {
        self.next_id += 1;
        let id = self.next_id;
        let mut msg = json!({"id": id, "method": method, "params": params});
        if let Some(s) = session {
            msg["sessionId"] = json!(s);
        }
        self.ws.send(tungstenite::Message::text(msg.to_string())).unwrap();
        let deadline = Instant::now() + Duration::from_secs(60);
        loop {
            assert!(Instant::now() < deadline, "no answer to {method} within 60 s");
            let m = self.ws.read().expect("a DevTools message");
            let Ok(text) = m.to_text() else { continue };
            let v: Value = serde_json::from_str(text).unwrap();
            if v["id"].as_u64() == Some(id) {
                assert!(v.get("error").is_none(), "{method}: {}", v["error"]);
                return v["result"].clone();
            }
            if v.get("method").is_some() {
                self.events.push(v);
            }
        }
    }

    fn page(&mut self, method: &str, params: Value) -> Value {
        let s = self.session.clone();
        self.call(Some(&s), method, params)
    }

    /// Waits for an event named `method`.
    fn wait_for(&mut self, method: &str) {
        let deadline = Instant::now() + Duration::from_secs(60);
        while !self.events.iter().any(|e| e["method"] == method) {
            assert!(Instant::now() < deadline, "no {method} within 60 s");
            let m = self.ws.read().expect("a DevTools message");
            if let Ok(text) = m.to_text() {
                let v: Value = serde_json::from_str(text).unwrap();
                if v.get("method").is_some() {
                    self.events.push(v);
                }
            }
        }
    }

    fn eval(&mut self, expr: &str) -> Value {
        let r = self.page("Runtime.evaluate", json!({"expression": expr, "returnByValue": true}));
        r["result"]["value"].clone()
    }
}

/// What a loaded page showed.
struct Shown {
    text: String,
    patches: Vec<Patch>,
    shot: image::RgbImage,
    events: Vec<Value>,
}

struct Patch {
    role: String,
    rgb: [u8; 3],
    centre: [f64; 2],
    size: [f64; 2],
}

fn hex(s: &str) -> [u8; 3] {
    let s = s.trim_start_matches('#');
    let v = u32::from_str_radix(s, 16).unwrap();
    [(v >> 16) as u8, (v >> 8) as u8, v as u8]
}

fn open_page(exe: &Path, page: &Path, shot_name: &str) -> Shown {
    open_page_with(exe, page, shot_name, "null").0
}

/// [`open_page`], also evaluating `probe` (a JavaScript expression) on the
/// loaded page and returning its value.
fn open_page_with(exe: &Path, page: &Path, shot_name: &str, probe: &str) -> (Shown, Value) {
    let width = 1280;
    let mut b = Browser::launch(exe, width);
    b.page(
        "Emulation.setDeviceMetricsOverride",
        json!({"width": width, "height": 1000, "deviceScaleFactor": 1, "mobile": false}),
    );
    let url = format!("file://{}", page.canonicalize().unwrap().display());
    b.page("Page.navigate", json!({"url": url}));
    b.wait_for("Page.loadEventFired");
    let text = b.eval("document.body.innerText").as_str().unwrap().to_string();
    let probed = b.eval(probe);
    let patches = b.eval(
        "JSON.stringify([...document.querySelectorAll('.patch')].map(e => { const r = e.getBoundingClientRect(); \
         return {role: e.dataset.role, rgb: e.dataset.rgb, x: r.x + r.width / 2 + window.scrollX, \
         y: r.y + r.height / 2 + window.scrollY, w: r.width, h: r.height}; }))",
    );
    let patches: Vec<Value> = serde_json::from_str(patches.as_str().unwrap()).unwrap();
    let height = b
        .eval("Math.ceil(document.documentElement.scrollHeight)")
        .as_f64()
        .unwrap();
    let shot = b.page(
        "Page.captureScreenshot",
        json!({"format": "png", "captureBeyondViewport": true,
               "clip": {"x": 0, "y": 0, "width": width, "height": height, "scale": 1}}),
    );
    let png = base64::engine::general_purpose::STANDARD
        .decode(shot["data"].as_str().unwrap())
        .unwrap();
    if let Some(dir) = std::env::var_os("INKFIT_SCREENSHOT_DIR") {
        std::fs::write(Path::new(&dir).join(shot_name), &png).unwrap();
    }
    let shot = image::load_from_memory(&png).unwrap().to_rgb8();
    let shown = Shown {
        text,
        patches: patches
            .iter()
            .map(|p| Patch {
                role: p["role"].as_str().unwrap().to_string(),
                rgb: hex(p["rgb"].as_str().unwrap()),
                centre: [p["x"].as_f64().unwrap(), p["y"].as_f64().unwrap()],
                size: [p["w"].as_f64().unwrap(), p["h"].as_f64().unwrap()],
            })
            .collect(),
        shot,
        events: std::mem::take(&mut b.events),
    };
    (shown, probed)
}

/// No console error, no uncaught exception, no error in the log, and no
/// network request beyond the page file itself.
fn assert_quiet(s: &Shown, page: &Path) {
    let own = format!("file://{}", page.canonicalize().unwrap().display());
    for e in &s.events {
        match e["method"].as_str().unwrap_or("") {
            "Runtime.consoleAPICalled" => {
                assert!(e["params"]["type"] != "error", "console error: {}", e["params"]);
            }
            "Runtime.exceptionThrown" => panic!("exception: {}", e["params"]),
            "Log.entryAdded" => {
                assert!(e["params"]["entry"]["level"] != "error", "log error: {}", e["params"]);
            }
            "Network.requestWillBeSent" => {
                // The page file itself, and the pictures it holds as data.
                let url = e["params"]["request"]["url"].as_str().unwrap_or("");
                assert!(
                    url == own || url.starts_with("data:"),
                    "a network request beyond the page: {url}"
                );
            }
            _ => {}
        }
    }
}

/// Every pixel of the middle 60 % of the patch within `tol` code values of
/// `want`: the patch is flat and is that colour.
fn assert_flat(s: &Shown, p: &Patch, want: [u8; 3], tol: i32, what: &str) {
    assert!(
        p.size[0] >= 24.0 && p.size[1] >= 24.0,
        "{what}: patch {:?} under 24×24 px",
        p.size
    );
    let (hw, hh) = (p.size[0] * 0.3, p.size[1] * 0.3);
    let (x0, x1) = ((p.centre[0] - hw).ceil() as u32, (p.centre[0] + hw).floor() as u32);
    let (y0, y1) = ((p.centre[1] - hh).ceil() as u32, (p.centre[1] + hh).floor() as u32);
    for y in y0..=y1 {
        for x in x0..=x1 {
            let got = s.shot.get_pixel(x, y).0;
            let off = (0..3)
                .map(|k| (i32::from(got[k]) - i32::from(want[k])).abs())
                .max()
                .unwrap();
            assert!(off <= tol, "{what}: pixel ({x}, {y}) is {got:?}, want {want:?} ± {tol}");
        }
    }
}

/// CIELAB D50 → 8-bit sRGB, written out here from the sources rather than
/// taken from inkfit: CIE 015:2018 (CIELAB to XYZ), the Bradford D50 → D65
/// matrix as CSS Color 4 gives it (digits from memory of that spec), and
/// IEC 61966-2-1 (the sRGB matrix and
/// transfer function). Clipped to the cube, as the page shows it.
fn srgb_of_lab(lab: [f64; 3]) -> [u8; 3] {
    let (xn, yn, zn) = (0.3457 / 0.3585, 1.0, (1.0 - 0.3457 - 0.3585) / 0.3585);
    let fy = (lab[0] + 16.0) / 116.0;
    let fx = fy + lab[1] / 500.0;
    let fz = fy - lab[2] / 200.0;
    let inv = |t: f64| {
        if t > 6.0 / 29.0 {
            t * t * t
        } else {
            3.0 * (6.0f64 / 29.0).powi(2) * (t - 4.0 / 29.0)
        }
    };
    let xyz50 = [xn * inv(fx), yn * inv(fy), zn * inv(fz)];
    let m = [
        [0.955473421488075, -0.02309845494876471, 0.06325924320057072],
        [-0.0283697093338637, 1.0099953980813041, 0.021041441191917323],
        [0.012314014864481998, -0.020507649298898964, 1.330365926242124],
    ];
    let xyz65: Vec<f64> = m
        .iter()
        .map(|r| r[0] * xyz50[0] + r[1] * xyz50[1] + r[2] * xyz50[2])
        .collect();
    let to_rgb = [
        [3.2406, -1.5372, -0.4986],
        [-0.9689, 1.8758, 0.0415],
        [0.0557, -0.2040, 1.0570],
    ];
    let mut out = [0u8; 3];
    for k in 0..3 {
        let lin = to_rgb[k][0] * xyz65[0] + to_rgb[k][1] * xyz65[1] + to_rgb[k][2] * xyz65[2];
        let lin = lin.clamp(0.0, 1.0);
        let v = if lin <= 0.0031308 {
            12.92 * lin
        } else {
            1.055 * lin.powf(1.0 / 2.4) - 0.055
        };
        out[k] = (v * 255.0).round() as u8;
    }
    out
}

#[test]
fn check_page_in_a_browser() {
    let Some(exe) = chromium() else { return };
    let dir = tempfile::tempdir().unwrap();
    let page = dir.path().join("landuse.html");
    let out = Command::new(bin())
        .args([
            "check",
            "fixtures/demo/landuse.csv",
            "--cvd",
            "protan,deutan,tritan",
            "--json",
            "--html",
        ])
        .arg(&page)
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let report: Value = serde_json::from_slice(&out.stdout).unwrap();
    let shown = open_page(&exe, &page, "check-landuse.png");
    assert_quiet(&shown, &page);
    let entries = report["entries"].as_array().unwrap();
    for e in entries {
        let name = e["name"].as_str().unwrap();
        assert!(shown.text.contains(name), "{name} is not on the page");
    }
    assert!(shown.text.contains("not a contract proof"), "the caution is missing");
    assert!(
        shown.text.contains("Fails") || shown.text.contains("Passes"),
        "no verdict in words"
    );
    let screen: Vec<&Patch> = shown.patches.iter().filter(|p| p.role == "screen").collect();
    let print: Vec<&Patch> = shown.patches.iter().filter(|p| p.role == "print").collect();
    assert_eq!(screen.len(), entries.len());
    assert_eq!(print.len(), entries.len());
    for ((e, s), p) in entries.iter().zip(&screen).zip(&print) {
        let name = e["name"].as_str().unwrap();
        // The demo's colours are sRGB hex on an sRGB screen: the screen patch
        // is the input colour itself (2 code values for the round trip
        // through lcms2's profile and the page's conversion).
        let input = hex(e["input"].as_str().unwrap());
        assert_flat(&shown, s, input, 2, &format!("{name} on screen"));
        // The printed patch is the printed CIELAB as sRGB (computed above
        // from the standards, not by inkfit), clipped.
        let lab: Vec<f64> = e["printed_lab"]
            .as_array()
            .unwrap()
            .iter()
            .map(|v| v.as_f64().unwrap())
            .collect();
        let want = srgb_of_lab([lab[0], lab[1], lab[2]]);
        assert_flat(&shown, p, want, 3, &format!("{name} in print"));
        // And the page says which colour it means to show.
        let off = (0..3)
            .map(|k| (i32::from(p.rgb[k]) - i32::from(want[k])).abs())
            .max()
            .unwrap();
        assert!(off <= 2, "{name}: data-rgb {:?} against {want:?}", p.rgb);
    }
}

#[test]
fn gamut_page_in_a_browser() {
    let Some(exe) = chromium() else { return };
    let dir = tempfile::tempdir().unwrap();
    let page = dir.path().join("gamut.html");
    let out = Command::new(bin())
        .args(["gamut", "srgb", "offset-coated", "--json", "--html"])
        .arg(&page)
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let report: Value = serde_json::from_slice(&out.stdout).unwrap();
    let (shown, figures) = open_page_with(
        &exe,
        &page,
        "gamut.png",
        "document.querySelectorAll('figure svg[role=img][aria-label]').length",
    );
    assert_quiet(&shown, &page);
    assert_eq!(figures, json!(1), "the slices figure, labelled");
    assert!(shown.text.contains("not a contract proof"), "the caution is missing");
    for c in report["coverage"].as_array().unwrap() {
        // The share as the JSON gives it, in the page's words.
        let share = format!("{:.1} %", c["a_inside_b"].as_f64().unwrap() * 100.0);
        let (a, b) = (c["a"].as_str().unwrap(), c["b"].as_str().unwrap());
        assert!(
            shown.text.contains(&format!("{b} holds {share} of {a}")),
            "coverage of {a} in {b} ({share}) is not on the page"
        );
    }
    // Each sector's most chromatic colour, from the JSON's C*, L* and hue,
    // is shown as a flat patch of its sRGB value (computed here from the
    // standards, not by inkfit).
    let sectors: Vec<&Patch> = shown.patches.iter().filter(|p| p.role == "sector").collect();
    let profiles = report["profiles"].as_array().unwrap();
    let rows = profiles[0]["hue_sectors"].as_array().unwrap().len();
    assert_eq!(sectors.len(), rows * profiles.len());
    for (k, p) in sectors.iter().enumerate() {
        let g = &profiles[k % profiles.len()];
        let s = &g["hue_sectors"][k / profiles.len()];
        let (c, l, h) = (
            s["max_chroma"].as_f64().unwrap(),
            s["l_at_max"].as_f64().unwrap(),
            s["h_at_max"].as_f64().unwrap().to_radians(),
        );
        let want = srgb_of_lab([l, c * h.cos(), c * h.sin()]);
        assert_flat(
            &shown,
            p,
            want,
            3,
            &format!("{} sector {}", g["name"], k / profiles.len()),
        );
    }
}

#[test]
fn proof_page_in_a_browser() {
    let Some(exe) = chromium() else { return };
    let dir = tempfile::tempdir().unwrap();
    let page = dir.path().join("proof.html");
    let (proof, map) = (dir.path().join("proof.png"), dir.path().join("map.png"));
    let input = Path::new("fixtures/demo/landuse-map.png");
    let out = Command::new(bin())
        .arg("proof")
        .arg(input)
        .arg("--out")
        .arg(&proof)
        .arg("--delta-map")
        .arg(&map)
        .arg("--json")
        .arg("--html")
        .arg(&page)
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let report: Value = serde_json::from_slice(&out.stdout).unwrap();
    // Every picture's pixels as the browser decoded them (through a canvas),
    // by role.
    let probe = "JSON.stringify([...document.querySelectorAll('img[data-role]')].map(i => { \
        const c = document.createElement('canvas'); c.width = i.naturalWidth; c.height = i.naturalHeight; \
        const g = c.getContext('2d'); g.drawImage(i, 0, 0); \
        return {role: i.dataset.role, alt: i.alt, w: i.naturalWidth, h: i.naturalHeight, \
                px: Array.from(g.getImageData(0, 0, c.width, c.height).data)}; }))";
    let (shown, pictures) = open_page_with(&exe, &page, "proof.png", probe);
    assert_quiet(&shown, &page);
    assert!(shown.text.contains("not a contract proof"), "the caution is missing");
    let img = &report["images"][0];
    let p95 = format!("{:.2}", img["stats"]["p95"].as_f64().unwrap());
    assert!(shown.text.contains(&p95), "p95 {p95} is not on the page");
    let pictures: Vec<Value> = serde_json::from_str(pictures.as_str().unwrap()).unwrap();
    let roles: Vec<&str> = pictures.iter().map(|p| p["role"].as_str().unwrap()).collect();
    assert_eq!(roles, ["screen", "proof", "delta"]);
    // The demo map (480 × 360) is smaller than a picture's longest side, so
    // each picture must show its file pixel for pixel: the input, the proof
    // file and the ΔE00 map file, decoded here by the image crate. sRGB PNG
    // into an sRGB canvas: within 1 code value.
    for (p, file) in pictures.iter().zip([input, &proof, &map]) {
        let want = image::open(file).unwrap().to_rgb8();
        let role = p["role"].as_str().unwrap();
        assert!(!p["alt"].as_str().unwrap().is_empty(), "{role}: no alt text");
        assert_eq!(
            (p["w"].as_u64().unwrap(), p["h"].as_u64().unwrap()),
            (u64::from(want.width()), u64::from(want.height())),
            "{role}: picture size"
        );
        let px = p["px"].as_array().unwrap();
        for (k, w) in want.pixels().enumerate() {
            for c in 0..3 {
                let got = px[4 * k + c].as_i64().unwrap();
                assert!(
                    (got - i64::from(w.0[c])).abs() <= 1,
                    "{role}: pixel {k} channel {c} is {got}, the file has {}",
                    w.0[c]
                );
            }
        }
    }
}
