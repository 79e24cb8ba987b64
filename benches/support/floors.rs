//! The bare-loop floors a screening is measured against: 100,000 cubic Hermite curves of 12
//! knots each, stored in flat arrays, evaluated (a) at one temperature and (b) for their
//! exact minimum over a range (segment ends plus the roots of each segment's quadratic
//! derivative). Nothing of satline runs here: this is the arithmetic alone, the yardstick the
//! engine's screenings are divided by. The curves are INVENTED by a deterministic generator
//! (timing only; not reference data).

/// Knots per curve.
pub const KNOTS: usize = 12;

/// `n` curves, knot `j` of curve `i` at index `i * KNOTS + j` of each array.
pub struct FlatCurves {
    pub n: usize,
    pub x: Vec<f64>,
    pub y: Vec<f64>,
    pub d: Vec<f64>,
}

impl FlatCurves {
    /// Invented rising curves from 273.15 K to 373.15 K, knots evenly spaced, slopes the
    /// mean of neighbouring secants (a Hermite curve; its shape does not matter for timing).
    pub fn invented(n: usize, mut unit: impl FnMut() -> f64) -> Self {
        let (mut x, mut y, mut d) = (
            Vec::with_capacity(n * KNOTS),
            Vec::with_capacity(n * KNOTS),
            Vec::with_capacity(n * KNOTS),
        );
        for _ in 0..n {
            let mut w = 0.005 + 0.3 * unit();
            let start = y.len();
            for j in 0..KNOTS {
                x.push(273.15 + 100.0 * j as f64 / (KNOTS - 1) as f64);
                y.push(w);
                w += 0.025 * unit();
            }
            for j in 0..KNOTS {
                let (a, b) = (start + j.saturating_sub(1), start + (j + 1).min(KNOTS - 1));
                d.push((y[b] - y[a]) / (x[b] - x[a]));
            }
        }
        Self { n, x, y, d }
    }

    fn hermite(&self, base: usize, k: usize, t: f64) -> f64 {
        let (i, j) = (base + k, base + k + 1);
        let h = self.x[j] - self.x[i];
        let s = (t - self.x[i]) / h;
        let (s2, s3) = (s * s, s * s * s);
        (2.0 * s3 - 3.0 * s2 + 1.0) * self.y[i]
            + (s3 - 2.0 * s2 + s) * h * self.d[i]
            + (-2.0 * s3 + 3.0 * s2) * self.y[j]
            + (s3 - s2) * h * self.d[j]
    }

    fn segment(&self, base: usize, t: f64) -> usize {
        let xs = &self.x[base..base + KNOTS];
        xs.partition_point(|&v| v <= t).clamp(1, KNOTS - 1) - 1
    }

    /// How many curves hold `w` at `t`: every curve evaluated once.
    pub fn holds_at(&self, w: f64, t: f64) -> usize {
        (0..self.n)
            .filter(|&c| {
                let base = c * KNOTS;
                self.hermite(base, self.segment(base, t), t) >= w
            })
            .count()
    }

    /// How many curves hold `w` over [t1, t2]: every curve's exact minimum there.
    pub fn holds_over(&self, w: f64, t1: f64, t2: f64) -> usize {
        (0..self.n)
            .filter(|&c| self.minimum(c * KNOTS, t1, t2) >= w)
            .count()
    }

    fn minimum(&self, base: usize, t1: f64, t2: f64) -> f64 {
        let (k1, k2) = (self.segment(base, t1), self.segment(base, t2));
        let mut best = self.hermite(base, k1, t1).min(self.hermite(base, k2, t2));
        for k in k1..=k2 {
            let (i, j) = (base + k, base + k + 1);
            if k > k1 {
                best = best.min(self.y[i]);
            }
            let h = self.x[j] - self.x[i];
            let (y0, y1, d0, d1) = (self.y[i], self.y[j], self.d[i], self.d[j]);
            let a = 6.0 * (y0 - y1) + 3.0 * h * (d0 + d1);
            let b = 6.0 * (y1 - y0) - h * (4.0 * d0 + 2.0 * d1);
            let c = h * d0;
            let disc = b * b - 4.0 * a * c;
            if a != 0.0 && disc >= 0.0 {
                for s in [
                    (-b - disc.sqrt()) / (2.0 * a),
                    (-b + disc.sqrt()) / (2.0 * a),
                ] {
                    let t = self.x[i] + s * h;
                    if s > 0.0 && s < 1.0 && t > t1 && t < t2 {
                        best = best.min(self.hermite(base, k, t));
                    }
                }
            }
        }
        best
    }
}
