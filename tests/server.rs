//! The query server over real sockets on loopback: answers match batch mode, every error has
//! its status and JSON body, writes need the token, limits answer instead of hanging, and
//! many clients at once are all answered. Clients are plain HTTP/1.1 over `TcpStream`.

use std::io::{BufRead, BufReader, Read, Write};
use std::net::{SocketAddr, TcpStream};
use std::path::PathBuf;
use std::time::{Duration, Instant};

use satline::engine::Engine;
use satline::server::{Config, Limits, Running, Token, start};
use serde_json::Value;

/// The acceptance set of the design, as one script (the `let` feeds the `require`).
const ACCEPTANCE: &str = "\
solubility of KNO3 at 20 C
solubility of potassium nitrate at 68 F in mol/kg
which salts stay dissolved at 30 g/100g water from 2 C to 8 C margin 10%
which solutes stay dissolved at 1.5 mol/kg at 5 C
saturation of KNO3 at 40 g/100g water
ceiling of KCl from 2 C to 8 C margin 10% in mol/kg
heat of solution of KNO3 at 25 C
dissolved O2 at 25 C under air
dissolved CO2 at 4 C under 2.5 bar in g/L
freezing of NaCl at 10 g/100g water at -10 C
convert 20 g/100g water of KCl to mol/kg
describe NaCl
sources of NaCl
list salts with anion sulfate
let cold = from 2 C to 8 C
require KCl stays dissolved at 20 g/100g water over cold margin 10%
";

fn quiet(limits: Limits) -> Config {
    Config {
        addr: "127.0.0.1:0".parse().unwrap(),
        limits,
        log_requests: false,
        ..Config::default()
    }
}

fn server() -> Running {
    start(quiet(Limits::default())).unwrap()
}

/// One HTTP reply.
#[derive(Debug)]
struct Reply {
    status: u16,
    headers: Vec<(String, String)>,
    body: Vec<u8>,
}

impl Reply {
    fn json(&self) -> Value {
        serde_json::from_slice(&self.body)
            .unwrap_or_else(|e| panic!("not JSON ({e}): {}", String::from_utf8_lossy(&self.body)))
    }

    fn header(&self, name: &str) -> Option<&str> {
        self.headers
            .iter()
            .find(|(n, _)| n.eq_ignore_ascii_case(name))
            .map(|(_, v)| v.as_str())
    }

    /// The error object, after checking the status and that the shape is the documented one.
    fn error(&self, status: u16) -> Value {
        assert_eq!(
            self.status,
            status,
            "{}",
            String::from_utf8_lossy(&self.body)
        );
        assert_eq!(self.header("content-type"), Some("application/json"));
        let v = self.json();
        let e = v["error"].clone();
        for field in ["code", "message", "line", "column"] {
            assert!(e.get(field).is_some(), "no {field} in {v}");
        }
        assert!(e["code"].is_string() && e["message"].is_string(), "{v}");
        e
    }
}

/// A keep-alive HTTP/1.1 connection.
struct Client {
    reader: BufReader<TcpStream>,
}

impl Client {
    fn connect(addr: SocketAddr) -> Client {
        let stream = TcpStream::connect(addr).unwrap();
        stream
            .set_read_timeout(Some(Duration::from_secs(20)))
            .unwrap();
        stream.set_nodelay(true).unwrap();
        Client {
            reader: BufReader::new(stream),
        }
    }

    fn stream(&mut self) -> &mut TcpStream {
        self.reader.get_mut()
    }

    /// Sends the head of a request (and `body` after it).
    fn write_request(&mut self, method: &str, path: &str, headers: &[(&str, &str)], body: &[u8]) {
        let mut head = format!("{method} {path} HTTP/1.1\r\nHost: 127.0.0.1\r\n");
        for (n, v) in headers {
            head.push_str(&format!("{n}: {v}\r\n"));
        }
        if !headers
            .iter()
            .any(|(n, _)| n.eq_ignore_ascii_case("content-length"))
        {
            head.push_str(&format!("Content-Length: {}\r\n", body.len()));
        }
        head.push_str("\r\n");
        let s = self.stream();
        s.write_all(head.as_bytes()).unwrap();
        s.write_all(body).unwrap();
        s.flush().unwrap();
    }

    fn read_reply(&mut self) -> Reply {
        let mut line = String::new();
        self.reader.read_line(&mut line).unwrap();
        let status: u16 = line
            .split_whitespace()
            .nth(1)
            .unwrap_or_else(|| panic!("bad status line {line:?}"))
            .parse()
            .unwrap();
        let mut headers = Vec::new();
        loop {
            let mut h = String::new();
            self.reader.read_line(&mut h).unwrap();
            let h = h.trim_end();
            if h.is_empty() {
                break;
            }
            let (n, v) = h.split_once(':').unwrap();
            headers.push((n.trim().to_string(), v.trim().to_string()));
        }
        let length = headers
            .iter()
            .find(|(n, _)| n.eq_ignore_ascii_case("content-length"))
            .map(|(_, v)| v.parse::<usize>().unwrap());
        let body = match length {
            Some(n) => {
                let mut body = vec![0; n];
                self.reader.read_exact(&mut body).unwrap();
                body
            }
            None => {
                // Chunked: size line, data, CRLF; a zero size ends it.
                let mut body = Vec::new();
                loop {
                    let mut size = String::new();
                    self.reader.read_line(&mut size).unwrap();
                    let n = usize::from_str_radix(size.trim(), 16).unwrap();
                    let mut chunk = vec![0; n + 2];
                    self.reader.read_exact(&mut chunk).unwrap();
                    if n == 0 {
                        break;
                    }
                    body.extend_from_slice(&chunk[..n]);
                }
                body
            }
        };
        Reply {
            status,
            headers,
            body,
        }
    }

    fn request(
        &mut self,
        method: &str,
        path: &str,
        headers: &[(&str, &str)],
        body: &[u8],
    ) -> Reply {
        self.write_request(method, path, headers, body);
        self.read_reply()
    }

    fn get(&mut self, path: &str) -> Reply {
        self.request("GET", path, &[], b"")
    }

    fn query(&mut self, text: &str) -> Reply {
        self.request(
            "POST",
            "/v1/query",
            &[("Content-Type", "text/plain")],
            text.as_bytes(),
        )
    }
}

/// What batch mode prints for a script, as JSON values: the engine's answers in one session.
fn batch_answers(text: &str) -> Vec<Value> {
    let engine = Engine::open_embedded().unwrap();
    let mut session = engine.session();
    engine
        .run_text(text, &mut session)
        .iter()
        .map(satline::output::json::to_value)
        .collect()
}

#[test]
fn acceptance_set_answers_match_batch_mode() {
    let running = server();
    let mut c = Client::connect(running.addr());
    let expected = batch_answers(ACCEPTANCE);
    assert_eq!(expected.len(), 16);

    let reply = c.query(ACCEPTANCE);
    assert_eq!(reply.status, 200);
    assert_eq!(reply.json(), Value::Array(expected.clone()));

    // The same query sent as JSON gets the same answers.
    let body = serde_json::json!({ "query": ACCEPTANCE }).to_string();
    let reply = c.request(
        "POST",
        "/v1/query",
        &[("Content-Type", "application/json")],
        body.as_bytes(),
    );
    assert_eq!(reply.status, 200);
    assert_eq!(reply.json(), Value::Array(expected));

    // Every statement on the blocking pool gives the same answers.
    let offloaded = start(Config {
        inline_light: false,
        ..quiet(Limits::default())
    })
    .unwrap();
    let reply = Client::connect(offloaded.addr()).query(ACCEPTANCE);
    assert_eq!(reply.json(), Value::Array(batch_answers(ACCEPTANCE)));

    // Statement by statement too (the require with the let it uses).
    let lines: Vec<&str> = ACCEPTANCE.lines().collect();
    for line in &lines[..14] {
        let reply = c.query(line);
        assert_eq!(reply.status, 200, "{line}");
        assert_eq!(reply.json(), Value::Array(batch_answers(line)), "{line}");
    }
}

#[test]
fn answers_are_the_lines_of_satline_run_json() {
    let running = server();
    let reply = Client::connect(running.addr()).query(ACCEPTANCE);
    let output = assert_cmd::Command::cargo_bin("satline")
        .unwrap()
        .env_remove("SATLINE_DB")
        .args(["run", "--format", "json", "-"])
        .write_stdin(ACCEPTANCE)
        .output()
        .unwrap();
    let lines: Vec<Value> = String::from_utf8(output.stdout)
        .unwrap()
        .lines()
        .map(|l| serde_json::from_str(l).unwrap())
        .collect();
    assert_eq!(lines.len(), 16);
    assert_eq!(reply.json(), Value::Array(lines));
}

#[test]
fn malformed_json_is_400_with_its_position() {
    let running = server();
    let mut c = Client::connect(running.addr());
    let reply = c.request(
        "POST",
        "/v1/query",
        &[("Content-Type", "application/json")],
        b"{\"query\": \"describe KCl\",\n  oops}",
    );
    let e = reply.error(400);
    assert_eq!(e["code"], "bad-json");
    assert_eq!(e["line"], 2);
    // A JSON object without the query field is refused too.
    let reply = c.request(
        "POST",
        "/v1/query",
        &[("Content-Type", "application/json")],
        b"{\"statements\": \"describe KCl\"}",
    );
    assert_eq!(reply.error(400)["code"], "bad-json");
}

#[test]
fn a_body_that_is_not_utf8_is_400_with_its_position() {
    let running = server();
    let reply = Client::connect(running.addr()).request(
        "POST",
        "/v1/query",
        &[("Content-Type", "text/plain")],
        b"describe KCl\ndescribe \xff\xfe",
    );
    let e = reply.error(400);
    assert_eq!(e["code"], "not-utf8");
    assert_eq!(
        (e["line"].as_u64(), e["column"].as_u64()),
        (Some(2), Some(10))
    );
}

#[test]
fn a_body_over_the_limit_is_413() {
    let running = server();
    let mut c = Client::connect(running.addr());
    let big = "# padding\n".repeat(6554); // 65,540 bytes, over 64 KiB
    assert!(big.len() > 64 * 1024);
    let e = c.query(&big).error(413);
    assert_eq!(e["code"], "body-too-large");
    // Exactly at the limit is read (and holds no statement: 400 empty-query).
    let at_limit = format!("{}#", "#".repeat(64 * 1024 - 2)) + "\n";
    assert_eq!(at_limit.len(), 64 * 1024);
    let e = Client::connect(running.addr()).query(&at_limit).error(400);
    assert_eq!(e["code"], "empty-query");
}

#[test]
fn a_bad_statement_is_400_an_unknown_solute_404_and_an_unanswerable_one_422() {
    let running = server();
    let mut c = Client::connect(running.addr());
    let reply = c.query("solubilty of KNO3 at 20 C");
    let e = reply.error(400);
    assert_eq!(e["stage"], "parse");
    assert_eq!(
        (e["line"].as_u64(), e["column"].as_u64()),
        (Some(1), Some(1))
    );
    let answers = reply.json()["answers"].clone();
    assert_eq!(
        answers,
        Value::Array(batch_answers("solubilty of KNO3 at 20 C"))
    );

    let reply = c.query("solubility of KNO4 at 20 C");
    let e = reply.error(404);
    assert_eq!(e["code"], "unknown-solute");
    assert_eq!(e["stage"], "evaluate");
    assert!(e["message"].as_str().unwrap().contains("KNO3"), "{e}");

    let reply = c.query("solubility of KNO3 at 150 C");
    let e = reply.error(422);
    assert_eq!(e["code"], "out-of-range");

    // One good statement among bad ones: 200, the bad ones ok:false in place.
    let mixed = "solubilty of KNO3 at 20 C\nsolubility of KNO3 at 20 C\ndescribe KNO4";
    let reply = c.query(mixed);
    assert_eq!(reply.status, 200);
    let v = reply.json();
    let oks: Vec<bool> = v
        .as_array()
        .unwrap()
        .iter()
        .map(|a| a["ok"].as_bool().unwrap())
        .collect();
    assert_eq!(oks, [false, true, false]);
    assert_eq!(v, Value::Array(batch_answers(mixed)));

    // A require that does not hold is an answer, not an error.
    let reply = c.query("require KNO3 stays dissolved at 60 g/100g water at 5 C");
    assert_eq!(reply.status, 200);
    assert_eq!(reply.json()[0]["holds"], false);

    assert_eq!(
        c.query("# only a comment").error(400)["code"],
        "empty-query"
    );
}

#[test]
fn unknown_solute_source_and_route_are_404() {
    let running = server();
    let mut c = Client::connect(running.addr());
    let e = c.get("/v1/solutes/KNO4").error(404);
    assert_eq!(e["code"], "unknown-solute");
    assert!(e["line"].is_null());
    assert_eq!(
        c.get("/v1/sources/no-such-key").error(404)["code"],
        "unknown-source"
    );
    assert_eq!(c.get("/v2/query").error(404)["code"], "no-such-route");
    assert_eq!(c.get("/nothing-here").error(404)["code"], "no-such-route");
    assert_eq!(
        c.request("DELETE", "/v1/health", &[], b"").error(405)["code"],
        "method-not-allowed"
    );
}

#[test]
fn catalog_routes() {
    let running = server();
    let mut c = Client::connect(running.addr());
    let engine = Engine::open_embedded().unwrap();

    let v = c.get("/v1/health").json();
    assert_eq!(v["status"], "ok");

    let v = c.get("/v1/version").json();
    assert_eq!(v["satline"], env!("CARGO_PKG_VERSION"));
    assert_eq!(v["fingerprint"], engine.catalog().fingerprint());
    assert_eq!(v["schema_version"], engine.catalog().schema_version());

    let all = c.get("/v1/solutes").json();
    assert_eq!(all["count"], engine.catalog().solutes().len());
    let sulfates = c.get("/v1/solutes?kind=salt&anion=Sulfate").json();
    let list = sulfates["solutes"].as_array().unwrap();
    assert!(!list.is_empty());
    // A filter names the ion's family word, as in `list`: "hydrogen sulfate" is a sulfate.
    assert!(list.iter().all(|s| {
        let anion = s["anion"].as_str().unwrap();
        (anion == "sulfate" || anion.ends_with(" sulfate")) && s["kind"] == "salt"
    }));
    let gases = c.get("/v1/solutes?kind=gas").json();
    assert!(
        gases["solutes"]
            .as_array()
            .unwrap()
            .iter()
            .all(|s| s["kind"] == "gas")
    );
    let potassium = c.get("/v1/solutes?cation=potassium").json();
    assert!(potassium["count"].as_u64().unwrap() >= 2);
    let tag = all["solutes"]
        .as_array()
        .unwrap()
        .iter()
        .find_map(|s| s["tags"].get(0).and_then(Value::as_str).map(str::to_string))
        .unwrap();
    let tagged = c.get(&format!("/v1/solutes?tag={tag}")).json();
    assert!(tagged["solutes"].as_array().unwrap().iter().all(|s| {
        s["tags"]
            .as_array()
            .unwrap()
            .iter()
            .any(|t| t.as_str().unwrap().eq_ignore_ascii_case(&tag))
    }));
    assert_eq!(
        c.get("/v1/solutes?kind=metal").error(400)["code"],
        "bad-parameter"
    );
    assert_eq!(
        c.get("/v1/solutes?colour=blue").error(400)["code"],
        "bad-parameter"
    );
    // The filters are the `list` statement's: `anion phosphate` finds hydrogen phosphate.
    let ids = |v: &Value, field: &str| -> Vec<String> {
        let mut ids: Vec<String> = v[field]
            .as_array()
            .unwrap()
            .iter()
            .map(|s| s["id"].as_str().unwrap().to_string())
            .collect();
        ids.sort();
        ids
    };
    let phosphates = c.get("/v1/solutes?anion=phosphate").json();
    let listed = c.query("list solutes with anion phosphate").json();
    let from_list = ids(&listed[0], "rows");
    assert_eq!(ids(&phosphates, "solutes"), from_list);
    assert!(from_list.iter().any(|id| id.contains("hydrogen-phosphate")));

    // One solute by formula, name or slug, with datasets, points and citations.
    let v = c.get("/v1/solutes/KNO3").json();
    assert_eq!(v["solute"]["id"], "potassium-nitrate");
    assert_eq!(c.get("/v1/solutes/potassium%20nitrate").json(), v);
    let datasets = v["datasets"].as_array().unwrap();
    assert!(!datasets.is_empty());
    assert!(!datasets[0]["points"].as_array().unwrap().is_empty());
    let source = &v["sources"][0];
    assert!(source["citation"].as_str().unwrap().len() > 10);
    let key = source["key"].as_str().unwrap();
    let one = c.get(&format!("/v1/sources/{key}")).json();
    assert_eq!(one["source"], *source);
    let sources = c.get("/v1/sources").json();
    assert_eq!(sources["count"], engine.catalog().sources().len());
}

#[test]
fn too_many_statements_is_413() {
    let running = start(quiet(Limits {
        statements: 3,
        ..Limits::default()
    }))
    .unwrap();
    let mut c = Client::connect(running.addr());
    assert_eq!(
        c.query("describe KCl; describe NaCl; describe KNO3").status,
        200
    );
    let e = c
        .query("describe KCl; describe NaCl; describe KNO3\ndescribe KCl")
        .error(413);
    assert_eq!(e["code"], "too-many-statements");
}

#[test]
fn a_body_that_never_arrives_is_408_not_a_hang() {
    let running = start(quiet(Limits {
        time: Duration::from_millis(300),
        ..Limits::default()
    }))
    .unwrap();
    let mut c = Client::connect(running.addr());
    let started = Instant::now();
    c.write_request(
        "POST",
        "/v1/query",
        &[("Content-Type", "text/plain"), ("Content-Length", "100")],
        b"describe",
    );
    let e = c.read_reply().error(408);
    assert_eq!(e["code"], "time-limit");
    assert!(started.elapsed() < Duration::from_secs(5));
}

#[test]
fn past_the_concurrent_limit_is_503() {
    let running = start(quiet(Limits {
        concurrent: 1,
        ..Limits::default()
    }))
    .unwrap();
    // The first request holds the only place while its body is awaited.
    let mut slow = Client::connect(running.addr());
    slow.write_request(
        "POST",
        "/v1/query",
        &[("Content-Type", "text/plain"), ("Content-Length", "12")],
        b"describe",
    );
    std::thread::sleep(Duration::from_millis(200));
    let reply = Client::connect(running.addr()).get("/v1/health");
    assert_eq!(reply.error(503)["code"], "busy");
    assert_eq!(reply.header("retry-after"), Some("1"));
    slow.stream().write_all(b" KCl").unwrap();
    assert_eq!(slow.read_reply().status, 200);
    assert_eq!(
        Client::connect(running.addr()).get("/v1/health").status,
        200
    );
}

#[test]
fn writes_need_the_token() {
    // Read-only: no token configured.
    let running = server();
    let mut c = Client::connect(running.addr());
    let e = c.request("POST", "/v1/admin/reload", &[], b"").error(403);
    assert_eq!(e["code"], "read-only");

    let dir = tempfile::tempdir().unwrap();
    let db: PathBuf = dir.path().join("reference.db");
    satline::store::init_file(&db, satline::seed_files::SEED_FILES, false).unwrap();
    let running = start(Config {
        db: Some(db.clone()),
        token: Token::new("test-token-123"),
        ..quiet(Limits::default())
    })
    .unwrap();
    let mut c = Client::connect(running.addr());
    let before = c.get("/v1/version").json();

    // The data change under the server (an invented rename, for the test only).
    let conn = rusqlite::Connection::open(&db).unwrap();
    conn.execute(
        "UPDATE solutes SET name = 'renamed for the test' WHERE id = 'potassium-nitrate'",
        [],
    )
    .unwrap();
    drop(conn);

    let e = c.request("POST", "/v1/admin/reload", &[], b"").error(401);
    assert_eq!(e["code"], "unauthorized");
    let reply = c.request(
        "POST",
        "/v1/admin/reload",
        &[("Authorization", "Bearer test-token-12")],
        b"",
    );
    assert_eq!(reply.error(401)["code"], "unauthorized");
    assert_eq!(reply.header("www-authenticate"), Some("Bearer"));
    // Nothing changed.
    assert_eq!(c.get("/v1/version").json(), before);
    assert_eq!(
        c.get("/v1/solutes/KNO3").json()["solute"]["name"],
        "potassium nitrate"
    );

    let reply = c.request(
        "POST",
        "/v1/admin/reload",
        &[("Authorization", "Bearer test-token-123")],
        b"",
    );
    assert_eq!(reply.status, 200);
    let v = reply.json();
    assert_eq!(v["reloaded"], true);
    assert_eq!(v["previous_fingerprint"], before["fingerprint"]);
    assert_ne!(v["fingerprint"], before["fingerprint"]);
    assert_eq!(
        c.get("/v1/solutes/KNO3").json()["solute"]["name"],
        "renamed for the test"
    );
}

#[test]
fn eight_clients_of_500_requests_are_all_answered() {
    let running = server();
    let addr = running.addr();
    let statements = [
        "solubility of KNO3 at 20 C",
        "which salts stay dissolved at 30 g/100g water from 2 C to 8 C margin 10%",
        "dissolved O2 at 25 C under air",
        "describe NaCl",
    ];
    let expected: Vec<Value> = statements
        .iter()
        .map(|s| Value::Array(batch_answers(s)))
        .collect();
    let started = Instant::now();
    let clients: Vec<_> = (0..8)
        .map(|k| {
            let expected = expected.clone();
            std::thread::spawn(move || {
                let mut c = Client::connect(addr);
                for i in 0..500 {
                    let which = (i + k) % statements.len();
                    let reply = c.query(statements[which]);
                    assert_eq!(reply.status, 200);
                    assert_eq!(reply.json(), expected[which], "client {k} request {i}");
                }
            })
        })
        .collect();
    for client in clients {
        client.join().unwrap();
    }
    assert!(started.elapsed() < Duration::from_secs(120));
}

#[test]
fn stopping_lets_a_request_in_progress_finish() {
    let running = server();
    let mut c = Client::connect(running.addr());
    c.write_request(
        "POST",
        "/v1/query",
        &[("Content-Type", "text/plain"), ("Content-Length", "12")],
        b"describe",
    );
    std::thread::sleep(Duration::from_millis(100));
    let stopper = std::thread::spawn(move || running.stop());
    std::thread::sleep(Duration::from_millis(100));
    c.stream().write_all(b" KCl").unwrap();
    let reply = c.read_reply();
    assert_eq!(reply.status, 200);
    assert_eq!(reply.json()[0]["kind"], "describe");
    stopper.join().unwrap().unwrap();
}

#[test]
fn the_command_line_serves_logs_and_stops_on_sigint() {
    let dir = tempfile::tempdir().unwrap();
    let token = dir.path().join("token");
    std::fs::write(&token, "s3cret\n").unwrap();
    let mut child = std::process::Command::new(assert_cmd::cargo::cargo_bin("satline"))
        .env_remove("SATLINE_DB")
        .args(["serve", "--addr", "127.0.0.1:0", "--token-file"])
        .arg(&token)
        .stderr(std::process::Stdio::piped())
        .spawn()
        .unwrap();
    let mut stderr = BufReader::new(child.stderr.take().unwrap());
    let mut banner = String::new();
    stderr.read_line(&mut banner).unwrap();
    assert!(banner.contains("writes need the bearer token"), "{banner}");
    let addr: SocketAddr = banner
        .split("http://")
        .nth(1)
        .and_then(|rest| rest.split('/').next())
        .unwrap()
        .parse()
        .unwrap();
    assert!(addr.ip().is_loopback());
    let mut c = Client::connect(addr);
    assert_eq!(c.query("solubility of KNO3 at 20 C").status, 200);
    let reply = c.request(
        "POST",
        "/v1/admin/reload",
        &[("Authorization", "Bearer s3cret")],
        b"",
    );
    assert_eq!(reply.status, 200);
    let mut log = String::new();
    stderr.read_line(&mut log).unwrap();
    let line: Value = serde_json::from_str(&log).unwrap();
    assert_eq!(line["method"], "POST");
    assert_eq!(line["path"], "/v1/query");
    assert_eq!(line["status"], 200);
    assert!(line["duration_ms"].as_f64().unwrap() >= 0.0);
    drop(c);
    let killed = std::process::Command::new("kill")
        .args(["-INT", &child.id().to_string()])
        .status()
        .unwrap();
    assert!(killed.success());
    let status = child.wait().unwrap();
    assert!(status.success(), "{status}");
    let mut rest = String::new();
    stderr.read_to_string(&mut rest).unwrap();
    assert!(rest.contains("\"path\":\"/v1/admin/reload\""), "{rest}");
    assert!(rest.contains("satline: stopped"), "{rest}");
}

#[test]
fn start_reports_a_missing_database_and_a_taken_port() {
    use satline::server::ServerError;
    let dir = tempfile::tempdir().unwrap();
    let missing = start(Config {
        db: Some(dir.path().join("missing.db")),
        ..quiet(Limits::default())
    });
    assert!(
        matches!(missing, Err(ServerError::OpenStore { .. })),
        "{missing:?}"
    );
    let running = server();
    let taken = start(Config {
        addr: running.addr(),
        ..quiet(Limits::default())
    });
    assert!(matches!(taken, Err(ServerError::Bind { .. })), "{taken:?}");
}

#[test]
fn plot_answers_an_svg_picture_or_a_json_error() {
    let running = server();
    let mut c = Client::connect(running.addr());
    let reply = c.request(
        "POST",
        "/v1/plot",
        &[("Content-Type", "text/plain")],
        b"plot KNO3, KCl from 0 C to 100 C",
    );
    assert_eq!(reply.status, 200);
    assert_eq!(reply.header("content-type"), Some("image/svg+xml"));
    let svg = String::from_utf8(reply.body.clone()).unwrap();
    assert!(svg.contains("<svg"), "{svg}");
    assert!(svg.contains("potassium nitrate"));
    let reply = c.request(
        "POST",
        "/v1/plot?format=png&width=320&height=200",
        &[],
        b"plot KCl",
    );
    assert_eq!(reply.status, 200);
    assert_eq!(reply.header("content-type"), Some("image/png"));
    assert_eq!(&reply.body[1..4], b"PNG");
    let e = c
        .request("POST", "/v1/plot", &[], b"plot KNO4 from 0 C to 100 C")
        .error(404);
    assert_eq!(e["code"], "unknown-solute");
    let e = c
        .request("POST", "/v1/plot", &[], b"solubility of KNO3 at 20 C")
        .error(400);
    assert_eq!(e["code"], "bad-parameter");
}

#[test]
fn the_librarian_writes_over_http_with_the_token() {
    // The invented demo solute of the README walkthrough (tests/fixtures/librarian).
    let dir = tempfile::tempdir().unwrap();
    let db: PathBuf = dir.path().join("lib.db");
    satline::store::init_empty(&db, "test", false).unwrap();
    let running = start(Config {
        db: Some(db.clone()),
        token: Token::new("test-token-123"),
        ..quiet(Limits::default())
    })
    .unwrap();
    let mut c = Client::connect(running.addr());
    let auth = [("Authorization", "Bearer test-token-123")];
    let source = r#"
[[source]]
key = "invented-demo-table"
kind = "other"
title = "Invented demo table for the satline walkthrough"
authors = "satline developers (invented data)"
year = 2026
"#;
    let csv = std::fs::read_to_string(
        std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
            .join("tests/fixtures/librarian/invented-demo-salt.csv"),
    )
    .unwrap();
    // Without the token nothing is written.
    let e = c
        .request(
            "POST",
            "/v1/admin/import?file=sources.toml",
            &[],
            source.as_bytes(),
        )
        .error(401);
    assert_eq!(e["code"], "unauthorized");
    // A refused request's body is not read, so the server may close that connection: the
    // librarian starts a new one.
    let mut c = Client::connect(running.addr());
    let before = std::fs::read(&db).unwrap();
    let reply = c.request(
        "POST",
        "/v1/admin/import?file=sources.toml",
        &auth,
        source.as_bytes(),
    );
    assert_eq!(
        reply.status,
        200,
        "{}",
        String::from_utf8_lossy(&reply.body)
    );
    // A dry run of the CSV writes nothing and says what would be added.
    let after_source = std::fs::read(&db).unwrap();
    assert_ne!(before, after_source);
    let reply = c.request(
        "POST",
        "/v1/admin/import?file=invented-demo-salt.csv&dry_run=true",
        &auth,
        csv.as_bytes(),
    );
    assert_eq!(
        reply.status,
        200,
        "{}",
        String::from_utf8_lossy(&reply.body)
    );
    assert_eq!(reply.json()["dry_run"], true);
    assert_eq!(std::fs::read(&db).unwrap(), after_source);
    let e = c
        .query("solubility of invented demo salt at 20 C")
        .error(404);
    assert_eq!(e["code"], "unknown-solute");
    // The real import: answered at once, marked unreviewed.
    let reply = c.request(
        "POST",
        "/v1/admin/import?file=invented-demo-salt.csv&actor=alice",
        &auth,
        csv.as_bytes(),
    );
    assert_eq!(
        reply.status,
        200,
        "{}",
        String::from_utf8_lossy(&reply.body)
    );
    let answer = &c.query("solubility of invented demo salt at 20 C").json()[0];
    assert_eq!(answer["ok"], true, "{answer}");
    assert!(answer["caveats"].to_string().contains("unreviewed"));
    // Review, retire and restore.
    let dataset = "invented-demo-salt/invented-demo-table";
    let review = format!(
        r#"{{"dataset": "{dataset}", "decision": "approve", "note": "checked", "actor": "bob"}}"#
    );
    let reply = c.request("POST", "/v1/admin/review", &auth, review.as_bytes());
    assert_eq!(
        reply.status,
        200,
        "{}",
        String::from_utf8_lossy(&reply.body)
    );
    let answer = &c.query("solubility of invented demo salt at 20 C").json()[0];
    assert!(
        !answer["caveats"].to_string().contains("unreviewed"),
        "{answer}"
    );
    let retire = format!(r#"{{"dataset": "{dataset}"}}"#);
    assert_eq!(
        c.request("POST", "/v1/admin/retire", &auth, retire.as_bytes())
            .status,
        200
    );
    let e = c
        .query("solubility of invented demo salt at 20 C")
        .error(422);
    assert_eq!(e["code"], "no-data");
    let restore = format!(r#"{{"dataset": "{dataset}", "restore": true}}"#);
    assert_eq!(
        c.request("POST", "/v1/admin/retire", &auth, restore.as_bytes())
            .status,
        200
    );
    assert_eq!(
        c.query("solubility of invented demo salt at 20 C").json()[0]["ok"],
        true
    );
    // A bad body is a JSON error, and nothing changes.
    let e = c
        .request("POST", "/v1/admin/review", &auth, b"{\"dataset\": 3")
        .error(400);
    assert_eq!(e["code"], "bad-json");
    let e = c
        .request(
            "POST",
            "/v1/admin/retire",
            &auth,
            br#"{"dataset": "no-such/dataset"}"#,
        )
        .error(422);
    assert_eq!(e["code"], "refused");
}
