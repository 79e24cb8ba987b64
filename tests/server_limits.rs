//! The server's limits over loopback: a body that never arrives on `/v1/plot` is answered
//! 408 within the time limit (it cannot hold a worker open), a picture larger than the
//! pixel cap is refused before anything is drawn, an idle connection, a head sent a byte at
//! a time and an idle kept-alive connection are closed within the header timeout, a head
//! over the size cap is refused, and `/v1/health` answers while hundreds of idle sockets
//! are open. Timeouts here are short, configured ones: no test sleeps for long.

use std::io::{Read, Write};
use std::net::TcpStream;
use std::time::{Duration, Instant};

use satline::server::{Config, Limits, start};

fn config(limits: Limits) -> Config {
    Config {
        addr: "127.0.0.1:0".parse().expect("an address"),
        limits,
        log_requests: false,
        ..Config::default()
    }
}

/// Sends `head` (and nothing more) and reads the reply's status line, waiting at most 20 s.
fn status_after(addr: std::net::SocketAddr, head: &str) -> (String, Duration) {
    let started = Instant::now();
    let mut stream = TcpStream::connect(addr).expect("connects");
    stream
        .set_read_timeout(Some(Duration::from_secs(20)))
        .expect("a read timeout");
    stream.write_all(head.as_bytes()).expect("writes");
    let mut reply = Vec::new();
    let mut buf = [0u8; 1024];
    while !reply.windows(2).any(|w| w == b"\r\n") {
        match stream.read(&mut buf) {
            Ok(0) | Err(_) => break,
            Ok(n) => reply.extend_from_slice(&buf[..n]),
        }
    }
    let text = String::from_utf8_lossy(&reply);
    (
        text.lines().next().unwrap_or("").to_string(),
        started.elapsed(),
    )
}

#[test]
fn a_slow_body_on_plot_is_answered_408_within_the_time_limit() {
    let running = start(config(Limits {
        time: Duration::from_millis(500),
        ..Limits::default()
    }))
    .expect("the server starts");
    // 40 bytes promised, none sent.
    let (status, took) = status_after(
        running.addr(),
        "POST /v1/plot HTTP/1.1\r\nHost: x\r\nContent-Length: 40\r\n\r\n",
    );
    assert!(status.contains(" 408 "), "{status}");
    assert!(took < Duration::from_secs(10), "{took:?}");
}

#[test]
fn an_oversize_picture_is_refused_before_drawing() {
    let running = start(config(Limits::default())).expect("the server starts");
    let body = "plot KNO3 from 0 C to 100 C";
    let (status, _) = status_after(
        running.addr(),
        &format!(
            "POST /v1/plot?format=png&width=4000&height=4000 HTTP/1.1\r\nHost: x\r\nContent-Length: {}\r\n\r\n{body}",
            body.len()
        ),
    );
    assert!(status.contains(" 413 "), "{status}");
    // A picture within the cap is drawn.
    let (status, _) = status_after(
        running.addr(),
        &format!(
            "POST /v1/plot?format=png&width=1000&height=800 HTTP/1.1\r\nHost: x\r\nContent-Length: {}\r\n\r\n{body}",
            body.len()
        ),
    );
    assert!(status.contains(" 200 "), "{status}");
}

/// Reads until the server closes the connection (or `within` passes) and says how long that
/// took, with whatever the server sent first.
fn closed_after(stream: &mut TcpStream, within: Duration) -> (Option<Duration>, String) {
    let started = Instant::now();
    stream
        .set_read_timeout(Some(Duration::from_millis(50)))
        .expect("a read timeout");
    let mut got = Vec::new();
    let mut buf = [0u8; 4096];
    while started.elapsed() < within {
        match stream.read(&mut buf) {
            Ok(0) => return (Some(started.elapsed()), text(&got)),
            Ok(n) => got.extend_from_slice(&buf[..n]),
            Err(e)
                if matches!(
                    e.kind(),
                    std::io::ErrorKind::WouldBlock | std::io::ErrorKind::TimedOut
                ) => {}
            Err(_) => return (Some(started.elapsed()), text(&got)),
        }
    }
    (None, text(&got))
}

fn text(bytes: &[u8]) -> String {
    String::from_utf8_lossy(bytes).into_owned()
}

fn short_header_time(ms: u64) -> Limits {
    Limits {
        header_time: Duration::from_millis(ms),
        ..Limits::default()
    }
}

#[test]
fn an_idle_connection_is_closed_within_the_header_timeout() {
    let running = start(config(short_header_time(300))).expect("the server starts");
    let mut idle = TcpStream::connect(running.addr()).expect("connects");
    let (closed, _) = closed_after(&mut idle, Duration::from_secs(10));
    let closed = closed.expect("the idle connection is closed");
    assert!(closed >= Duration::from_millis(250), "{closed:?}");
    assert!(closed < Duration::from_secs(3), "{closed:?}");
}

#[test]
fn a_head_sent_a_byte_at_a_time_is_closed_within_the_header_timeout() {
    let running = start(config(short_header_time(400))).expect("the server starts");
    let mut slow = TcpStream::connect(running.addr()).expect("connects");
    slow.write_all(b"GET /v1/health HTTP/1.1\r\nHost: x\r\n")
        .expect("writes");
    let started = Instant::now();
    // One more header byte every 50 ms, never the blank line that ends the head.
    let mut cut = None;
    while started.elapsed() < Duration::from_secs(5) {
        if slow.write_all(b"X").is_err() {
            cut = Some(started.elapsed());
            break;
        }
        let (closed, _) = closed_after(&mut slow, Duration::from_millis(50));
        if closed.is_some() {
            cut = Some(started.elapsed());
            break;
        }
    }
    let cut = cut.expect("the half-sent head is closed");
    assert!(cut < Duration::from_secs(3), "{cut:?}");
}

#[test]
fn a_kept_alive_connection_is_closed_when_it_goes_idle_after_an_answer() {
    let running = start(config(short_header_time(300))).expect("the server starts");
    let mut kept = TcpStream::connect(running.addr()).expect("connects");
    kept.write_all(b"GET /v1/health HTTP/1.1\r\nHost: x\r\n\r\n")
        .expect("writes");
    let (closed, answer) = closed_after(&mut kept, Duration::from_secs(10));
    assert!(answer.starts_with("HTTP/1.1 200 "), "{answer}");
    let closed = closed.expect("the kept-alive connection is closed once idle");
    assert!(closed < Duration::from_secs(3), "{closed:?}");
}

#[test]
fn health_answers_while_hundreds_of_idle_sockets_are_open() {
    // Idle sockets would stay for a minute; the cap of 64 open connections makes room by
    // closing the quietest idle ones.
    let running = start(config(Limits {
        header_time: Duration::from_secs(60),
        connections: 64,
        ..Limits::default()
    }))
    .expect("the server starts");
    let idle: Vec<TcpStream> = (0..300)
        .map(|_| TcpStream::connect(running.addr()).expect("connects"))
        .collect();
    let started = Instant::now();
    let (status, _) = status_after(
        running.addr(),
        "GET /v1/health HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n",
    );
    assert!(status.contains(" 200 "), "{status}");
    assert!(
        started.elapsed() < Duration::from_secs(5),
        "{:?}",
        started.elapsed()
    );
    // The first idle socket was among those closed to make room.
    let mut first = idle.into_iter().next().expect("a socket");
    let (closed, _) = closed_after(&mut first, Duration::from_secs(5));
    assert!(closed.is_some(), "the oldest idle socket is still open");
}

#[test]
fn a_head_larger_than_the_cap_is_refused() {
    let running = start(config(Limits::default())).expect("the server starts");
    let big = "a".repeat(satline::server::MAX_HEAD_BYTES + 10);
    let (status, _) = status_after(
        running.addr(),
        &format!("GET /v1/health HTTP/1.1\r\nHost: x\r\nX-Big: {big}\r\n\r\n"),
    );
    assert!(status.contains(" 431 "), "{status}");
}

#[test]
fn a_plot_holds_its_place_among_max_concurrent() {
    let running = start(config(Limits {
        concurrent: 1,
        time: Duration::from_secs(5),
        ..Limits::default()
    }))
    .expect("the server starts");
    let body = "plot KNO3 from 0 C to 100 C";
    let mut plot = TcpStream::connect(running.addr()).expect("connects");
    plot.write_all(
        format!(
            "POST /v1/plot?format=svg HTTP/1.1\r\nHost: x\r\nConnection: close\r\nContent-Length: {}\r\n\r\n",
            body.len()
        )
        .as_bytes(),
    )
    .expect("writes");
    std::thread::sleep(Duration::from_millis(300));
    // The plot's body is still awaited: its place is taken.
    let (status, _) = status_after(
        running.addr(),
        "GET /v1/health HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n",
    );
    assert!(status.contains(" 503 "), "{status}");
    plot.write_all(body.as_bytes()).expect("writes");
    let (_, answer) = closed_after(&mut plot, Duration::from_secs(10));
    assert!(answer.starts_with("HTTP/1.1 200 "), "{answer}");
    let (status, _) = status_after(
        running.addr(),
        "GET /v1/health HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n",
    );
    assert!(status.contains(" 200 "), "{status}");
}

#[test]
fn a_token_beyond_loopback_is_warned_to_travel_in_clear() {
    use std::io::BufRead;
    let dir = tempfile::tempdir().expect("a directory");
    let token = dir.path().join("token");
    std::fs::write(&token, "s3cret\n").expect("writes");
    let mut child = std::process::Command::new(env!("CARGO_BIN_EXE_satline"))
        .env_remove("SATLINE_DB")
        .args(["serve", "--quiet", "--addr", "0.0.0.0:0", "--token-file"])
        .arg(&token)
        .stderr(std::process::Stdio::piped())
        .spawn()
        .expect("the server starts");
    let stderr = child.stderr.take().expect("the error stream");
    let lines: Vec<String> = std::io::BufReader::new(stderr)
        .lines()
        .take(3)
        .map(|l| l.expect("a line"))
        .collect();
    let _ = child.kill();
    let _ = child.wait();
    let text = lines.join("\n");
    assert!(text.contains("listening beyond loopback"), "{text}");
    assert!(
        text.contains("the write token travels in clear over plain HTTP")
            && text.contains("TLS-terminating proxy"),
        "{text}"
    );
}
