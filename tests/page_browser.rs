//! The page at `/` in a real browser: headless Chromium driven through chromedriver
//! (WebDriver, by fantoccini) against `satline serve` on a loopback port. Types a statement
//! with completion, checks the numbers of the answer table against the same statements'
//! JSON, asks "does it stay dissolved?" through the form and sees the curve, opens a plot,
//! follows an answer's link, visits a solute's page and the sources, and saves screenshots at
//! 1280×800 and 390×844 under `target/page-screenshots/` for a person to look at.
//!
//! Needs the Debian packages `chromium` and `chromium-driver` (`.ci/run` installs them).
//! Without them the test is skipped with a message, except under `CI=true`, where a missing
//! browser is a failure.

use std::io::{BufRead, BufReader, Read, Write};
use std::net::{SocketAddr, TcpListener, TcpStream};
use std::path::{Path, PathBuf};
use std::process::{Child, Command, Stdio};
use std::time::{Duration, Instant};

use fantoccini::key::Key;
use fantoccini::{Client, ClientBuilder, Locator};
use serde_json::{Value, json};

const WAIT: Duration = Duration::from_secs(15);

/// Children this test started, stopped when it ends however it ends.
struct Started(Vec<Child>);

impl Drop for Started {
    fn drop(&mut self) {
        for child in &mut self.0 {
            let _ = child.kill();
            let _ = child.wait();
        }
    }
}

/// The first of `names` found as an executable on `PATH`.
fn find_program(names: &[&str]) -> Option<PathBuf> {
    let path = std::env::var_os("PATH")?;
    for dir in std::env::split_paths(&path) {
        for name in names {
            let candidate = dir.join(name);
            if candidate.is_file() {
                return Some(candidate);
            }
        }
    }
    None
}

fn free_port() -> u16 {
    TcpListener::bind("127.0.0.1:0")
        .unwrap()
        .local_addr()
        .unwrap()
        .port()
}

/// `satline serve` on a free loopback port, read from its start-up line.
fn serve(started: &mut Started) -> SocketAddr {
    let mut child = Command::new(assert_cmd::cargo::cargo_bin("satline"))
        .env_remove("SATLINE_DB")
        .args(["serve", "--addr", "127.0.0.1:0", "--quiet"])
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    let mut stderr = BufReader::new(child.stderr.take().unwrap());
    started.0.push(child);
    let mut banner = String::new();
    stderr.read_line(&mut banner).unwrap();
    // Keep reading the error stream so the server never blocks on a full pipe.
    std::thread::spawn(move || {
        let mut rest = String::new();
        let _ = stderr.read_to_string(&mut rest);
    });
    let addr = banner
        .split("http://")
        .nth(1)
        .and_then(|rest| rest.split('/').next())
        .unwrap_or_else(|| panic!("no address in the start-up line: {banner}"));
    assert!(
        banner.contains(&format!("http://{addr}/ ")),
        "the start-up line names the page: {banner}"
    );
    addr.parse().unwrap()
}

/// chromedriver on a free loopback port, once it accepts connections.
fn chromedriver(program: &Path, started: &mut Started) -> u16 {
    let port = free_port();
    let child = Command::new(program)
        .arg(format!("--port={port}"))
        .stdout(Stdio::null())
        .stderr(Stdio::null())
        .spawn()
        .unwrap();
    started.0.push(child);
    let until = Instant::now() + WAIT;
    while TcpStream::connect(("127.0.0.1", port)).is_err() {
        assert!(Instant::now() < until, "chromedriver did not start");
        std::thread::sleep(Duration::from_millis(50));
    }
    port
}

/// Percent-encoding of a query parameter's value (everything but the unreserved bytes).
fn encode(text: &str) -> String {
    let mut out = String::new();
    for b in text.bytes() {
        if b.is_ascii_alphanumeric() || b"-._~".contains(&b) {
            out.push(b as char);
        } else {
            out.push_str(&format!("%{b:02X}"));
        }
    }
    out
}

/// A GET over plain HTTP/1.1: the status, the content type and the body.
fn get(addr: SocketAddr, path: &str) -> (u16, String, Vec<u8>) {
    let mut s = TcpStream::connect(addr).unwrap();
    write!(
        s,
        "GET {path} HTTP/1.1\r\nHost: {addr}\r\nConnection: close\r\n\r\n"
    )
    .unwrap();
    let mut raw = Vec::new();
    s.read_to_end(&mut raw).unwrap();
    let split = raw.windows(4).position(|w| w == b"\r\n\r\n").unwrap();
    let head = String::from_utf8_lossy(&raw[..split]).to_string();
    let status = head.split(' ').nth(1).unwrap().parse().unwrap();
    let content_type = head
        .lines()
        .find_map(|l| {
            l.to_ascii_lowercase()
                .strip_prefix("content-type:")
                .map(|v| v.trim().to_string())
        })
        .unwrap_or_default();
    (status, content_type, raw[split + 4..].to_vec())
}

/// The JSON answers of `GET /v1/query?q=`.
fn answers_of(addr: SocketAddr, query: &str) -> Vec<Value> {
    let (status, _, body) = get(addr, &format!("/v1/query?q={}", encode(query)));
    assert_eq!(status, 200, "{}", String::from_utf8_lossy(&body));
    serde_json::from_slice(&body).unwrap()
}

/// Polls a script until it returns something other than null or false.
async fn wait_until(client: &Client, script: &str, what: &str) -> Value {
    let until = Instant::now() + WAIT;
    loop {
        let v = client.execute(script, vec![]).await.unwrap();
        if !v.is_null() && v != json!(false) && v != json!(0) {
            return v;
        }
        assert!(Instant::now() < until, "timed out waiting for {what}");
        tokio::time::sleep(Duration::from_millis(50)).await;
    }
}

/// Waits until the page shows the answers to `query`.
async fn wait_answered(client: &Client, query: &str) {
    let script = format!(
        "return document.getElementById('answers').dataset.query === {}",
        json!(query)
    );
    wait_until(client, &script, &format!("the answers to `{query}`")).await;
}

/// The numbers of every answer table on the page, answer by answer, as the page shows them
/// (`data-value`) and as text.
async fn numbers_on_page(client: &Client) -> Vec<Vec<(String, String)>> {
    let v = client
        .execute(
            "return [...document.querySelectorAll('#answers article.answer')].map(a =>
               [...a.querySelectorAll('td[data-field=value]')]
                 .filter(td => td.dataset.value !== undefined)
                 .map(td => [td.dataset.value, td.textContent]))",
            vec![],
        )
        .await
        .unwrap();
    serde_json::from_value(v).unwrap()
}

/// Checks that the page's tables hold exactly the JSON answers' values, with their units.
async fn same_numbers_as_json(client: &Client, addr: SocketAddr, query: &str) {
    let answers = answers_of(addr, query);
    let shown = numbers_on_page(client).await;
    assert_eq!(
        shown.len(),
        answers.len(),
        "one card per answer of `{query}`"
    );
    let mut compared = 0;
    for (answer, cells) in answers.iter().zip(&shown) {
        let rows: Vec<&Value> = answer["rows"]
            .as_array()
            .unwrap()
            .iter()
            .filter(|r| r.get("value").is_some_and(Value::is_number))
            .collect();
        assert_eq!(rows.len(), cells.len(), "{answer}");
        for (row, (data, text)) in rows.iter().zip(cells) {
            let value = row["value"].as_f64().unwrap();
            assert_eq!(data.parse::<f64>().unwrap(), value, "{row}");
            let unit = row["unit"].as_str().unwrap_or("");
            assert!(
                text.starts_with(&data.to_string()) && text.ends_with(unit),
                "`{text}` shows {value} {unit}"
            );
            compared += 1;
        }
    }
    assert!(compared > 0, "no number compared for `{query}`");
}

/// Waits until the first picture of the answers has loaded, and checks what it is. The page
/// loads a picture only when it is scrolled to (`loading="lazy"`), as a reader would, so the
/// wait scrolls it into view.
async fn picture_is_shown(client: &Client, addr: SocketAddr) {
    let src = wait_until(
        client,
        "const i = document.querySelector('#answers figure.curve img');
         if (i && !i.complete) i.scrollIntoView();
         return i && i.complete && i.naturalWidth > 0 ? i.getAttribute('src') : null",
        "the picture",
    )
    .await;
    let (status, content_type, body) = get(addr, src.as_str().unwrap());
    assert_eq!(status, 200);
    assert_eq!(content_type, "image/svg+xml");
    assert!(String::from_utf8_lossy(&body).contains("<svg"));
}

/// Sets the page's viewport (the window less the browser's own frame) to `width`×`height`.
async fn viewport(client: &Client, width: u32, height: u32) {
    client.set_window_size(width, height).await.unwrap();
    let frame = client
        .execute(
            "return [window.outerWidth - window.innerWidth, window.outerHeight - window.innerHeight]",
            vec![],
        )
        .await
        .unwrap();
    let extra = |i: usize| frame[i].as_u64().unwrap_or(0) as u32;
    client
        .set_window_size(width + extra(0), height + extra(1))
        .await
        .unwrap();
}

/// Saves a screenshot of the top of the page, after checking nothing is wider than the
/// viewport (which the caller has set).
async fn screenshot(client: &Client, width: u32, height: u32, name: &str, from: &str) {
    client
        .execute(
            "document.querySelector(arguments[0]).scrollIntoView()",
            vec![json!(from)],
        )
        .await
        .unwrap();
    // The page lays out again at the new size before the picture is taken.
    tokio::time::sleep(Duration::from_millis(300)).await;
    let overflow = client
        .execute(
            "return document.documentElement.scrollWidth - document.documentElement.clientWidth",
            vec![],
        )
        .await
        .unwrap();
    assert_eq!(
        overflow,
        json!(0),
        "nothing wider than the window at {width}×{height}"
    );
    let png = client.screenshot().await.unwrap();
    assert!(png.starts_with(b"\x89PNG"), "a PNG screenshot");
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("target/page-screenshots");
    std::fs::create_dir_all(&dir).unwrap();
    std::fs::write(dir.join(name), png).unwrap();
}

async fn drive(client: &Client, addr: SocketAddr) {
    let page = format!("http://{addr}");
    client.goto(&format!("{page}/")).await.unwrap();
    wait_until(
        client,
        "return document.body.dataset.ready === 'true'",
        "the page",
    )
    .await;
    let caution = client.find(Locator::Id("caution")).await.unwrap();
    assert!(caution.text().await.unwrap().contains("stability testing"));

    // Type a statement, completing a formula with Tab, and answer it with Ctrl+Enter.
    let box_ = client.find(Locator::Id("statements")).await.unwrap();
    box_.click().await.unwrap();
    box_.send_keys("solubility of KN").await.unwrap();
    wait_until(
        client,
        "const l = document.getElementById('suggestions');
         return !l.hidden && l.textContent.includes('KNO3')",
        "the completion of KN",
    )
    .await;
    // Down the list to KNO3, then Enter takes it.
    let index = client
        .execute(
            "return [...document.querySelectorAll('#suggestions li')]
               .findIndex(li => li.firstChild.textContent === 'KNO3')",
            vec![],
        )
        .await
        .unwrap()
        .as_i64()
        .unwrap();
    assert!(index >= 0, "KNO3 is offered");
    let down = Key::Down.to_string().repeat(index as usize + 1);
    box_.send_keys(&down).await.unwrap();
    box_.send_keys(&Key::Enter.to_string()).await.unwrap();
    let typed = box_.prop("value").await.unwrap().unwrap();
    assert_eq!(typed, "solubility of KNO3 ");
    box_.send_keys("at 20 C\n").await.unwrap();
    box_.send_keys("solubility of KCl at 5 C").await.unwrap();
    let chord = format!("{}{}{}", Key::Control, Key::Enter, Key::Null);
    box_.send_keys(&chord).await.unwrap();
    let typed_query = "solubility of KNO3 at 20 C\nsolubility of KCl at 5 C";
    wait_answered(client, typed_query).await;
    same_numbers_as_json(client, addr, typed_query).await;

    // The form writes the require statement, runs it, and draws the curve with the loading.
    let form_statement = "require KCl stays dissolved at 30 g/100g water from 2 C to 8 C";
    for (id, value) in [
        ("check-solute", "KCl"),
        ("check-amount", "30"),
        ("check-from", "2"),
        ("check-to", "8"),
        ("check-margin", "0"),
    ] {
        let field = client.find(Locator::Id(id)).await.unwrap();
        field.clear().await.unwrap();
        field.send_keys(value).await.unwrap();
    }
    client
        .find(Locator::Id("check-unit"))
        .await
        .unwrap()
        .select_by_value("g/100g water")
        .await
        .unwrap();
    client
        .find(Locator::Css("#check-form button[type=submit]"))
        .await
        .unwrap()
        .click()
        .await
        .unwrap();
    wait_answered(client, form_statement).await;
    let written = client.find(Locator::Id("check-statement")).await.unwrap();
    assert_eq!(written.text().await.unwrap(), form_statement);
    let verdict = client.find(Locator::Css(".verdict")).await.unwrap();
    let json = answers_of(addr, form_statement);
    assert_eq!(json[0]["holds"], false, "30 g/100g water of KCl at 2 C");
    assert_eq!(verdict.attr("data-holds").await.unwrap().unwrap(), "false");
    assert!(
        verdict
            .text()
            .await
            .unwrap()
            .contains("Does not stay dissolved")
    );
    same_numbers_as_json(client, addr, form_statement).await;
    picture_is_shown(client, addr).await;
    screenshot(client, 1280, 800, "page-1280x800.png", "body").await;

    // An example that plots: the SVG is shown.
    let plot = "plot KNO3, KCl from 0 C to 100 C";
    let examples = client
        .find_all(Locator::Css("#examples button"))
        .await
        .unwrap();
    let mut clicked = false;
    for button in examples {
        if button.text().await.unwrap() == plot {
            button.click().await.unwrap();
            clicked = true;
            break;
        }
    }
    assert!(clicked, "the plot example is offered");
    wait_answered(client, plot).await;
    picture_is_shown(client, addr).await;

    // An answer's link reproduces it, in a fresh load of the page.
    let query = "let cold = from 2 C to 8 C\nceiling of KCl over cold margin 10% in mol/kg";
    client
        .goto(&format!("{page}/?q={}", encode(query)))
        .await
        .unwrap();
    wait_answered(client, query).await;
    let before = numbers_on_page(client).await;
    let link = client
        .find(Locator::Css("#answers a.answer-link"))
        .await
        .unwrap();
    let href = link.attr("href").await.unwrap().unwrap();
    client.goto("about:blank").await.unwrap();
    client.goto(&format!("{page}{href}")).await.unwrap();
    wait_answered(client, query).await;
    assert_eq!(numbers_on_page(client).await, before);
    same_numbers_as_json(client, addr, query).await;

    // A solute's page and the page of sources.
    client.goto(&format!("{page}/?solute=KCl")).await.unwrap();
    let points = wait_until(
        client,
        "return document.querySelectorAll('#solute-body .dataset tbody tr').length",
        "the solute's points",
    )
    .await;
    let facts = client
        .find(Locator::Css("#solute-body dl.facts"))
        .await
        .unwrap()
        .text()
        .await
        .unwrap();
    assert!(
        facts.contains("KCl") && !facts.contains("[object"),
        "the record: {facts}"
    );
    let overflow = client
        .execute(
            "return document.documentElement.scrollWidth - document.documentElement.clientWidth",
            vec![],
        )
        .await
        .unwrap();
    assert_eq!(overflow, json!(0), "the solute's page fits the window");
    let hidden = client
        .execute(
            "return document.getElementById('view-ask').offsetParent === null",
            vec![],
        )
        .await
        .unwrap();
    assert_eq!(hidden, json!(true), "only the solute's view is shown");
    let (_, _, body) = get(addr, "/v1/solutes/KCl");
    let record: Value = serde_json::from_slice(&body).unwrap();
    let stored: usize = record["datasets"]
        .as_array()
        .unwrap()
        .iter()
        .map(|d| d["points"].as_array().unwrap().len())
        .sum();
    assert_eq!(points.as_u64().unwrap() as usize, stored);
    client.goto(&format!("{page}/?view=sources")).await.unwrap();
    let listed = wait_until(
        client,
        "return document.querySelectorAll('#source-list li').length",
        "the sources",
    )
    .await;
    let (_, _, body) = get(addr, "/v1/sources");
    let sources: Value = serde_json::from_slice(&body).unwrap();
    assert_eq!(listed, sources["count"]);
}

/// A new browser session; `phone` emulates a 390×844 screen (a desktop window cannot be made
/// that narrow).
async fn session(port: u16, chromium: &Path, profile: &Path, phone: bool) -> Client {
    let mut options = json!({
        "binary": chromium,
        "args": [
            "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic",
            "--no-first-run", "--disable-background-networking",
            "--disable-component-update", "--disable-sync",
            "--disable-dev-shm-usage", "--window-size=1280,800",
            format!("--user-data-dir={}", profile.display()),
        ],
    });
    if phone {
        options["mobileEmulation"] =
            json!({"deviceMetrics": {"width": 390, "height": 844, "pixelRatio": 1.0}});
    }
    let mut capabilities = serde_json::Map::new();
    capabilities.insert("goog:chromeOptions".into(), options);
    ClientBuilder::new(hyper_util::client::legacy::connect::HttpConnector::new())
        .capabilities(capabilities)
        .connect(&format!("http://127.0.0.1:{port}"))
        .await
        .unwrap()
}

/// On a phone-sized screen: the form's answer by its link, nothing wider than the screen.
async fn on_a_phone(client: &Client, addr: SocketAddr) {
    let query = "require KCl stays dissolved at 30 g/100g water from 2 C to 8 C";
    client
        .goto(&format!("http://{addr}/?q={}", encode(query)))
        .await
        .unwrap();
    wait_answered(client, query).await;
    picture_is_shown(client, addr).await;
    let width = client
        .execute("return window.innerWidth", vec![])
        .await
        .unwrap();
    assert_eq!(width, json!(390));
    screenshot(client, 390, 844, "page-390x844.png", "#status").await;
}

/// Runs `steps` in a fresh session, closing it whether they pass or not.
async fn in_session<F, Fut>(client: Client, steps: F)
where
    F: FnOnce(Client) -> Fut,
    Fut: std::future::Future<Output = ()> + Send + 'static,
{
    let outcome = tokio::spawn(steps(client.clone())).await;
    let _ = client.close().await;
    if let Err(e) = outcome {
        std::panic::resume_unwind(e.into_panic());
    }
}

#[test]
fn the_page_in_a_real_browser() {
    let chromium = find_program(&["chromium", "chromium-browser", "google-chrome"]);
    let driver = find_program(&["chromedriver"]);
    let (Some(chromium), Some(driver)) = (chromium, driver) else {
        let message = "the browser test needs chromium and chromedriver \
                       (apt-get install chromium chromium-driver)";
        if std::env::var("CI").is_ok_and(|v| v == "true") {
            panic!("{message}");
        }
        eprintln!("skipped: {message}");
        return;
    };
    let mut started = Started(Vec::new());
    let addr = serve(&mut started);
    let port = chromedriver(&driver, &mut started);
    let profile = tempfile::tempdir().unwrap();
    let runtime = tokio::runtime::Builder::new_current_thread()
        .enable_all()
        .build()
        .unwrap();
    runtime.block_on(async {
        let desk = profile.path().join("desk");
        let client = session(port, &chromium, &desk, false).await;
        in_session(client, move |c| async move {
            viewport(&c, 1280, 800).await;
            drive(&c, addr).await
        })
        .await;
        let phone = profile.path().join("phone");
        let client = session(port, &chromium, &phone, true).await;
        in_session(client, move |c| async move { on_a_phone(&c, addr).await }).await;
    });
}
