//! Helpers for the unit tests: a small seeded generator, so the tests need no extra
//! dependency and every run draws the same numbers.

/// xorshift64* (Vigna, "An experimental exploration of Marsaglia's xorshift generators,
/// scrambled", ACM TOMS 42, 2016).
pub struct Rng(u64);

impl Rng {
    /// A generator from a non-zero seed.
    pub fn new(seed: u64) -> Rng {
        Rng(seed.max(1))
    }

    pub fn next_u64(&mut self) -> u64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        self.0.wrapping_mul(0x2545_F491_4F6C_DD1D)
    }

    /// Uniform in [0, 1).
    pub fn unit(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 / (1u64 << 53) as f64
    }
}
