//! The page's routes over real sockets: `/` and its files, `GET /v1/query` and
//! `GET /v1/plot` answering byte for byte like their POST forms, the vocabulary the statement
//! box completes, and the librarian's reads (review queue, history) behind the token.

use std::io::{Read, Write};
use std::net::{SocketAddr, TcpStream};

use satline::server::{Config, Running, Token, start};
use satline::store::Store;
use serde_json::Value;

fn server(config: Config) -> Running {
    start(Config {
        addr: "127.0.0.1:0".parse().unwrap(),
        log_requests: false,
        ..config
    })
    .unwrap()
}

struct Reply {
    status: u16,
    head: String,
    body: Vec<u8>,
}

impl Reply {
    fn header(&self, name: &str) -> Option<String> {
        self.head.lines().find_map(|l| {
            let (n, v) = l.split_once(':')?;
            n.eq_ignore_ascii_case(name).then(|| v.trim().to_string())
        })
    }

    fn json(&self) -> Value {
        serde_json::from_slice(&self.body).unwrap()
    }
}

fn request(
    addr: SocketAddr,
    method: &str,
    path: &str,
    headers: &[(&str, &str)],
    body: &[u8],
) -> Reply {
    let mut s = TcpStream::connect(addr).unwrap();
    let mut head = format!("{method} {path} HTTP/1.1\r\nHost: {addr}\r\nConnection: close\r\n");
    for (n, v) in headers {
        head.push_str(&format!("{n}: {v}\r\n"));
    }
    head.push_str(&format!("Content-Length: {}\r\n\r\n", body.len()));
    s.write_all(head.as_bytes()).unwrap();
    s.write_all(body).unwrap();
    let mut raw = Vec::new();
    s.read_to_end(&mut raw).unwrap();
    let split = raw.windows(4).position(|w| w == b"\r\n\r\n").unwrap();
    let head = String::from_utf8_lossy(&raw[..split]).to_string();
    let status = head.split(' ').nth(1).unwrap().parse().unwrap();
    Reply {
        status,
        head,
        body: raw[split + 4..].to_vec(),
    }
}

fn get(addr: SocketAddr, path: &str) -> Reply {
    request(addr, "GET", path, &[], b"")
}

/// Percent-encoding of a query parameter's value.
fn encode(text: &str) -> String {
    text.bytes()
        .map(|b| {
            if b.is_ascii_alphanumeric() || b"-._~".contains(&b) {
                (b as char).to_string()
            } else {
                format!("%{b:02X}")
            }
        })
        .collect()
}

#[test]
fn the_page_and_its_files_come_from_the_server() {
    let running = server(Config::default());
    let addr = running.addr();
    let page = get(addr, "/");
    assert_eq!(page.status, 200);
    assert_eq!(
        page.header("content-type").unwrap(),
        "text/html; charset=utf-8"
    );
    assert!(
        page.header("content-security-policy")
            .unwrap()
            .contains("default-src 'self'")
    );
    let html = String::from_utf8(page.body).unwrap();
    assert!(html.contains("Does it stay dissolved?"));
    for (path, media) in [("/page.js", "text/javascript"), ("/page.css", "text/css")] {
        let r = get(addr, path);
        assert_eq!(r.status, 200, "{path}");
        assert!(
            r.header("content-type").unwrap().starts_with(media),
            "{path}"
        );
        assert!(r.body.len() > 1000, "{path}");
    }
}

#[test]
fn get_query_answers_exactly_like_post() {
    let running = server(Config::default());
    let addr = running.addr();
    for text in [
        "solubility of KNO3 at 20 C",
        "let cold = from 2 C to 8 C\nrequire KCl stays dissolved at 30 g/100g water over cold",
        "which salts stay dissolved at 30 g/100g water from 2 C to 8 C margin 10%",
        "solubilty of KNO3 at 20 C",
        "describe KNO4",
        "solubility of KNO3 at 150 C",
        "plot KCl from 0 C to 40 C; describe KCl",
        "# nothing",
    ] {
        let posted = request(
            addr,
            "POST",
            "/v1/query",
            &[("Content-Type", "text/plain")],
            text.as_bytes(),
        );
        let got = get(addr, &format!("/v1/query?q={}", encode(text)));
        assert_eq!(got.status, posted.status, "{text}");
        assert_eq!(got.body, posted.body, "{text}");
        assert_eq!(
            got.header("content-type").as_deref(),
            Some("application/json")
        );
    }
    let missing = get(addr, "/v1/query?query=describe%20KCl");
    assert_eq!(missing.status, 400);
    assert_eq!(missing.json()["error"]["code"], "bad-parameter");
    let twice = get(addr, "/v1/query?q=describe%20KCl&q=describe%20NaCl");
    assert_eq!(twice.status, 400);
}

#[test]
fn get_plot_draws_what_post_draws() {
    let running = server(Config::default());
    let addr = running.addr();
    let text = "plot KCl with loading 30 g/100g water from 2 C to 8 C";
    let posted = request(addr, "POST", "/v1/plot", &[], text.as_bytes());
    let got = get(addr, &format!("/v1/plot?q={}", encode(text)));
    assert_eq!(got.status, 200);
    assert_eq!(got.header("content-type").as_deref(), Some("image/svg+xml"));
    assert_eq!(got.body, posted.body);
    let png = get(
        addr,
        &format!(
            "/v1/plot?q={}&format=png&width=320&height=200",
            encode(text)
        ),
    );
    assert!(png.body.starts_with(b"\x89PNG"));
    let refused = get(addr, &format!("/v1/plot?q={}", encode("plot KNO4")));
    assert_eq!(refused.status, 404);
}

#[test]
fn the_vocabulary_holds_words_units_solutes_and_examples() {
    let running = server(Config::default());
    let v = get(running.addr(), "/v1/vocabulary").json();
    let has = |field: &str, word: &str| {
        v[field]
            .as_array()
            .unwrap()
            .iter()
            .any(|w| w.as_str() == Some(word))
    };
    assert!(has("keywords", "require") && has("keywords", "dissolved"));
    assert!(has("units", "g/100g water") && has("units", "C") && has("units", "bar"));
    assert!(has("solutes", "KNO3") && has("solutes", "potassium chloride"));
    assert!(v["examples"].as_array().unwrap().len() >= 5);
    assert!(v["caution"].as_str().unwrap().contains("stability testing"));
}

#[test]
fn the_review_queue_and_history_need_the_token() {
    let dir = tempfile::tempdir().unwrap();
    let db = dir.path().join("ref.db");
    assert_cmd::Command::cargo_bin("satline")
        .unwrap()
        .args(["init", "--db"])
        .arg(&db)
        .assert()
        .success();
    let read_only = server(Config {
        db: Some(db.clone()),
        ..Config::default()
    });
    assert_eq!(get(read_only.addr(), "/v1/admin/queue").status, 403);
    drop(read_only);

    let running = server(Config {
        db: Some(db.clone()),
        token: Token::new("s3cret"),
        ..Config::default()
    });
    let addr = running.addr();
    assert_eq!(get(addr, "/v1/admin/queue").status, 401);
    let bearer = [("Authorization", "Bearer s3cret")];
    let queue = request(addr, "GET", "/v1/admin/queue", &bearer, b"");
    assert_eq!(queue.status, 200);
    let waiting = Store::open_read_only(&db).unwrap().unreviewed().unwrap();
    let v = queue.json();
    assert_eq!(v["count"], waiting.len());
    assert_eq!(v["records"][0]["key"], waiting[0].key.as_str());

    // Approving through the admin route takes the record off the queue and into history.
    let key = waiting[0].key.clone();
    let solute = waiting[0].solute.clone();
    let body = serde_json::json!({"dataset": key, "decision": "approve", "note": "compared with the printed table", "actor": "tester"});
    let reviewed = request(
        addr,
        "POST",
        "/v1/admin/review",
        &[bearer[0], ("Content-Type", "application/json")],
        body.to_string().as_bytes(),
    );
    assert_eq!(reviewed.status, 200);
    let after = request(addr, "GET", "/v1/admin/queue", &bearer, b"").json();
    assert_eq!(after["count"], waiting.len() - 1);
    let history = request(
        addr,
        "GET",
        &format!("/v1/admin/history/{solute}"),
        &bearer,
        b"",
    )
    .json();
    assert_eq!(history["solute"], solute.as_str());
    let last = history["entries"]
        .as_array()
        .unwrap()
        .last()
        .unwrap()
        .clone();
    assert_eq!(last["action"], "approve");
    assert_eq!(last["actor"], "tester");
    let unknown = request(addr, "GET", "/v1/admin/history/KNO4", &bearer, b"");
    assert_eq!(unknown.status, 404);
}
