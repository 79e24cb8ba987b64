//! The Debye–Hückel limiting slope of the osmotic coefficient, A_φ(T), for water at 1 atm.

/// Lowest and highest temperature of the A_φ fit, K.
pub const A_PHI_RANGE_K: (f64, f64) = (234.15, 373.15);

/// Chebyshev coefficients of A_φ: S. L. Clegg, J. A. Rard & K. S. Pitzer, J. Chem. Soc.
/// Faraday Trans. 90 (1994) 1875–1894, Table 11 (the first is halved, as its eq. AII1
/// writes it). Transcribed from PyPI pytzer 0.6.0 (`debyehueckel.Aosm_CRP94`), compiled.
const CLEGG_1994: [f64; 19] = [
    0.797_256_081_240 / 2.0,
    0.573_389_669_896e-1,
    0.977_632_177_788e-3,
    0.489_973_732_417e-2,
    -0.313_151_784_342e-2,
    0.179_145_971_002e-2,
    -0.920_584_241_844e-3,
    0.443_862_726_879e-3,
    -0.203_661_129_991e-3,
    0.900_924_147_948e-4,
    -0.388_189_392_385e-4,
    0.164_245_088_592e-4,
    -0.686_031_972_567e-5,
    0.283_455_806_377e-5,
    -0.115_641_433_004e-5,
    0.461_489_672_579e-6,
    -0.177_069_754_948e-6,
    0.612_464_488_231e-7,
    -0.175_689_013_085e-7,
];

/// A_φ (kg^½ mol^−½) at `t_k`: Σ a_n T_n(X), X = (2T − 607.3)/139, T_n the Chebyshev
/// polynomials (T_0 = 1, T_1 = X, T_n = 2X·T_{n−1} − T_{n−2}); Clegg, Rard & Pitzer (1994)
/// eqs. AII1–AII2, fitted from 234.15 to 373.15 K ([`A_PHI_RANGE_K`]; callers keep to it).
pub fn a_phi(t_k: f64) -> f64 {
    let x = (2.0 * t_k - 607.3) / 139.0;
    let (mut previous, mut current) = (1.0, x);
    let mut sum = CLEGG_1994[0] + CLEGG_1994[1] * x;
    for a in &CLEGG_1994[2..] {
        let next = 2.0 * x * current - previous;
        sum += a * next;
        previous = current;
        current = next;
    }
    sum
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_phi_at_25_c_is_the_textbook_value() {
        // 0.3915 kg^½ mol^−½ at 25 °C (Pitzer & Mayorga 1973 use 0.392).
        assert!((a_phi(298.15) - 0.3915).abs() < 0.001, "{}", a_phi(298.15));
        // Smaller in the cold, smoothly through 263 K.
        let mut last = a_phi(234.15);
        for k in 1..=140 {
            let v = a_phi(234.15 + f64::from(k));
            assert!(v > last);
            last = v;
        }
    }
}
