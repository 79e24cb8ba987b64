//! The OpenAPI description at `/v1/openapi.json`: a well-formed OpenAPI 3.1 document whose
//! routes are exactly the router's (each described route is routed, and each route the
//! server lists in its 404 message is described).

use std::collections::BTreeSet;
use std::io::{Read, Write};
use std::net::{SocketAddr, TcpStream};

use satline::server::{Config, start};
use serde_json::Value;

fn get_or_post(addr: SocketAddr, method: &str, path: &str) -> (u16, Vec<u8>) {
    let mut s = TcpStream::connect(addr).unwrap();
    write!(
        s,
        "{method} {path} HTTP/1.1\r\nHost: {addr}\r\nConnection: close\r\nContent-Length: 0\r\n\r\n"
    )
    .unwrap();
    let mut raw = Vec::new();
    s.read_to_end(&mut raw).unwrap();
    let split = raw.windows(4).position(|w| w == b"\r\n\r\n").unwrap();
    let status = String::from_utf8_lossy(&raw[..split])
        .split(' ')
        .nth(1)
        .unwrap()
        .parse()
        .unwrap();
    (status, raw[split + 4..].to_vec())
}

/// Every `$ref` in the document, anywhere.
fn refs(v: &Value, out: &mut Vec<String>) {
    match v {
        Value::Object(map) => {
            for (k, v) in map {
                match (k.as_str(), v) {
                    ("$ref", Value::String(r)) => out.push(r.clone()),
                    _ => refs(v, out),
                }
            }
        }
        Value::Array(list) => list.iter().for_each(|v| refs(v, out)),
        _ => {}
    }
}

const METHODS: [&str; 5] = ["get", "post", "put", "delete", "patch"];

#[test]
fn the_description_is_openapi_3_1_and_matches_the_router() {
    let running = start(Config {
        addr: "127.0.0.1:0".parse().unwrap(),
        log_requests: false,
        ..Config::default()
    })
    .unwrap();
    let addr = running.addr();
    let (status, body) = get_or_post(addr, "GET", "/v1/openapi.json");
    assert_eq!(status, 200);
    let doc: Value = serde_json::from_slice(&body).unwrap();

    // The document's structure.
    assert_eq!(doc["openapi"], "3.1.0");
    assert_eq!(doc["info"]["title"], "satline");
    assert_eq!(doc["info"]["version"], env!("CARGO_PKG_VERSION"));
    let schemas = doc["components"]["schemas"].as_object().unwrap();
    let security = doc["components"]["securitySchemes"].as_object().unwrap();
    assert_eq!(security["bearer"]["scheme"], "bearer");
    let mut described = BTreeSet::new();
    for (path, item) in doc["paths"].as_object().unwrap() {
        assert!(path.starts_with("/v1/"), "{path}");
        for (method, op) in item.as_object().unwrap() {
            assert!(METHODS.contains(&method.as_str()), "{method} {path}");
            described.insert(format!("{} {path}", method.to_uppercase()));
            let responses = op["responses"].as_object().unwrap();
            assert!(responses.contains_key("200"), "{method} {path}");
            for (code, r) in responses {
                assert!(code.parse::<u16>().is_ok(), "{method} {path}: {code}");
                assert!(r["description"].is_string(), "{method} {path} {code}");
            }
            // Every {name} of the path is a required path parameter, and nothing more.
            let named: BTreeSet<&str> = path
                .split('/')
                .filter_map(|seg| seg.strip_prefix('{')?.strip_suffix('}'))
                .collect();
            let params: BTreeSet<&str> = op["parameters"]
                .as_array()
                .map(|list| {
                    list.iter()
                        .filter(|p| p["in"] == "path")
                        .inspect(|p| assert_eq!(p["required"], true, "{path}"))
                        .map(|p| p["name"].as_str().unwrap())
                        .collect()
                })
                .unwrap_or_default();
            assert_eq!(named, params, "{method} {path}");
            for needs in op["security"].as_array().into_iter().flatten() {
                for scheme in needs.as_object().unwrap().keys() {
                    assert!(security.contains_key(scheme), "{scheme}");
                }
            }
        }
    }
    let mut all = Vec::new();
    refs(&doc, &mut all);
    assert!(!all.is_empty());
    for r in all {
        let name = r
            .strip_prefix("#/components/schemas/")
            .unwrap_or_else(|| panic!("{r}"));
        assert!(schemas.contains_key(name), "{r} is not defined");
    }
    for needed in [
        "Answer",
        "Row",
        "ErrorBody",
        "ErrorFields",
        "QueryBody",
        "ReviewBody",
    ] {
        assert!(schemas.contains_key(needed), "{needed}");
    }

    // The router's own list of routes (its 404 message), under /v1.
    let (status, body) = get_or_post(addr, "GET", "/v1/no-such-route");
    assert_eq!(status, 404);
    let message: Value = serde_json::from_slice(&body).unwrap();
    let message = message["error"]["message"].as_str().unwrap();
    let list = message.split("the routes are ").nth(1).unwrap();
    let mut routed = BTreeSet::new();
    for entry in list.split(", ") {
        let mut words = entry.split_whitespace();
        let (methods, path) = (words.next().unwrap(), words.next().unwrap());
        if path.starts_with("/v1/") {
            for method in methods.split('|') {
                routed.insert(format!("{method} {path}"));
            }
        }
    }
    assert_eq!(
        described, routed,
        "described routes against the router's list"
    );

    // Each described route is routed: neither 404 for the route nor 405 for the method.
    for route in &described {
        let (method, path) = route.split_once(' ').unwrap();
        let path = path
            .replace("{name}", "KCl")
            .replace("{solute}", "KCl")
            .replace("{key}", "crc-97-aqsol");
        let (status, body) = get_or_post(addr, method, &path);
        let text = String::from_utf8_lossy(&body);
        assert_ne!(status, 405, "{route}: {text}");
        assert!(!text.contains("no-such-route"), "{route}: {text}");
    }
}
