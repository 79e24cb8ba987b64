//! Recipes over HTTP: a query's JSON body may carry a recipe file's text in `recipes`,
//! whose recipes the statements then name; a faulty one is a 400 with its line and column.

use std::io::{Read, Write};
use std::net::TcpStream;

use satline::server::{Config, Limits, start};
use serde_json::{Value, json};

/// POSTs `body` as JSON to `/v1/query` and returns the status and the parsed reply.
fn post(addr: std::net::SocketAddr, body: &Value) -> (u16, Value) {
    let body = body.to_string();
    let mut stream = TcpStream::connect(addr).unwrap();
    let head = format!(
        "POST /v1/query HTTP/1.1\r\nHost: 127.0.0.1\r\nContent-Type: application/json\r\nContent-Length: {}\r\nConnection: close\r\n\r\n",
        body.len()
    );
    stream.write_all(head.as_bytes()).unwrap();
    stream.write_all(body.as_bytes()).unwrap();
    let mut reply = String::new();
    stream.read_to_string(&mut reply).unwrap();
    let status = reply.split_whitespace().nth(1).unwrap().parse().unwrap();
    let (_, json_text) = reply.split_once("\r\n\r\n").unwrap();
    (status, serde_json::from_str(json_text).unwrap())
}

#[test]
fn a_query_names_the_recipes_sent_with_it() {
    let running = start(Config {
        addr: "127.0.0.1:0".parse().unwrap(),
        limits: Limits::default(),
        log_requests: false,
        ..Config::default()
    })
    .unwrap();
    let recipes = include_str!("../grammar/examples/workshop.recipes");
    let (status, answers) = post(
        running.addr(),
        &json!({"query": "require rinse stays dissolved from 2 C to 8 C", "recipes": recipes}),
    );
    assert_eq!(status, 200, "{answers}");
    assert_eq!(answers[0]["holds"], true);
    assert_eq!(answers[0]["rows"].as_array().unwrap().len(), 3);

    // Without the recipes the name means nothing: a solute the reference does not know.
    let (status, _) = post(
        running.addr(),
        &json!({"query": "require rinse stays dissolved from 2 C to 8 C"}),
    );
    assert_ne!(status, 200);

    let (status, error) = post(
        running.addr(),
        &json!({"query": "describe ward", "recipes": "recipe ward\n  1 g/L NaCl\n  2 g/L KCll\n"}),
    );
    assert_eq!(status, 400);
    assert_eq!(error["error"]["code"], "bad-recipes", "{error}");
    assert_eq!(
        (
            error["error"]["line"].clone(),
            error["error"]["column"].clone()
        ),
        (json!(3), json!(9))
    );
}
