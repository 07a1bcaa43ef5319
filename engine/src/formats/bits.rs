//! A bit writer and reader for the compact codes (share codes, result codes): fixed-width
//! fields, exponential-Golomb codes for small numbers of unknown size, and a reader that never
//! reads past its input and never loops longer than the bits it is given.
//!
//! Bits are written most significant first within each byte; the last byte is padded with
//! zero bits, and [`BitReader::finish`] checks that the padding is zero and that nothing
//! follows it, so every bit of a code is either meaningful or checked. [`crc32`] is the codes'
//! checksum.

/// CRC-32/ISO-HDLC of `bytes` (the checksum of zlib, gzip and PNG), from the `crc` crate with
/// its one-table variant: the codes are short, and larger tables would weigh on the page.
pub(crate) fn crc32(bytes: &[u8]) -> u32 {
    const CRC: crc::Crc<u32> = crc::Crc::<u32>::new(&crc::CRC_32_ISO_HDLC);
    CRC.checksum(bytes)
}

/// Writes bits into bytes.
#[derive(Default)]
pub(crate) struct BitWriter {
    bytes: Vec<u8>,
    /// Bits used in the last byte (0 to 7; 0 means the last byte is full or absent).
    used: u32,
}

impl BitWriter {
    /// Appends the low `n` bits of `value` (n at most 64), most significant first.
    pub(crate) fn put(&mut self, n: u32, value: u64) {
        debug_assert!(
            n <= 64 && (n == 64 || value >> n == 0),
            "{value} in {n} bits"
        );
        for i in (0..n).rev() {
            let bit = (value >> i & 1) as u8;
            if self.used == 0 {
                self.bytes.push(0);
            }
            let last = self.bytes.len() - 1;
            self.bytes[last] |= bit << (7 - self.used);
            self.used = (self.used + 1) % 8;
        }
    }

    /// Appends one bit.
    pub(crate) fn flag(&mut self, on: bool) {
        self.put(1, on as u64);
    }

    /// Appends `value` as an exponential-Golomb code of order `k`: `value + 2^k` in binary,
    /// after as many zero bits as that number has bits beyond `k + 1`. Small numbers take few
    /// bits, and no number needs a size decided in advance.
    pub(crate) fn golomb(&mut self, k: u32, value: u64) {
        let v = value as u128 + (1u128 << k);
        let width = 128 - v.leading_zeros();
        self.put(width - k - 1, 0);
        // `v` has `width` bits, at most 65; write the top bit apart so each part fits a u64.
        self.put(1, 1);
        self.put(width - 1, (v & ((1u128 << (width - 1)) - 1)) as u64);
    }

    /// Appends a whole number of any size up to 64 bits: its bit length in 7 bits, then the
    /// bits below its top bit.
    pub(crate) fn var(&mut self, value: u64) {
        let width = 64 - value.leading_zeros();
        self.put(7, width as u64);
        if width > 1 {
            self.put(width - 1, value & ((1u64 << (width - 1)) - 1));
        }
    }

    /// The number of bits written so far.
    #[cfg(test)]
    pub(crate) fn len(&self) -> usize {
        if self.used == 0 {
            self.bytes.len() * 8
        } else {
            (self.bytes.len() - 1) * 8 + self.used as usize
        }
    }

    /// The bytes, the last one padded with zero bits.
    pub(crate) fn into_bytes(self) -> Vec<u8> {
        self.bytes
    }
}

/// The bits of a code do not follow the format: too few, a number too large, padding that is
/// not zero. The reader says which part it was reading.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub(crate) struct BitError;

/// Reads what a [`BitWriter`] wrote.
pub(crate) struct BitReader<'a> {
    bytes: &'a [u8],
    /// The next bit to read, counted from the start.
    at: usize,
}

impl<'a> BitReader<'a> {
    pub(crate) fn new(bytes: &'a [u8]) -> Self {
        BitReader { bytes, at: 0 }
    }

    /// Reads `n` bits (at most 64).
    pub(crate) fn get(&mut self, n: u32) -> Result<u64, BitError> {
        if self.at + n as usize > self.bytes.len() * 8 {
            return Err(BitError);
        }
        let mut v = 0u64;
        for _ in 0..n {
            let bit = self.bytes[self.at / 8] >> (7 - self.at % 8) & 1;
            v = v << 1 | bit as u64;
            self.at += 1;
        }
        Ok(v)
    }

    /// Reads one bit.
    pub(crate) fn flag(&mut self) -> Result<bool, BitError> {
        Ok(self.get(1)? == 1)
    }

    /// Reads an exponential-Golomb code of order `k` whose value fits 64 bits.
    pub(crate) fn golomb(&mut self, k: u32) -> Result<u64, BitError> {
        let mut zeros = 0;
        while !self.flag()? {
            zeros += 1;
            if zeros + k > 64 {
                return Err(BitError);
            }
        }
        let rest = self.get(zeros + k)?;
        let v = (1u128 << (zeros + k)) | rest as u128;
        u64::try_from(v - (1u128 << k)).map_err(|_| BitError)
    }

    /// Reads a number written by [`BitWriter::var`].
    pub(crate) fn var(&mut self) -> Result<u64, BitError> {
        let width = self.get(7)? as u32;
        match width {
            0 => Ok(0),
            1..=64 => Ok(1u64 << (width - 1) | self.get(width - 1)?),
            _ => Err(BitError),
        }
    }

    /// Checks that only zero padding (less than a byte) is left.
    pub(crate) fn finish(mut self) -> Result<(), BitError> {
        let left = self.bytes.len() * 8 - self.at;
        if left >= 8 || self.get(left as u32)? != 0 {
            return Err(BitError);
        }
        Ok(())
    }
}

/// The bits needed to write every number below `n` (at least 1).
pub(crate) fn width_for(n: usize) -> u32 {
    (usize::BITS - n.saturating_sub(1).leading_zeros()).max(1)
}

/// The length of the exponential-Golomb code of `value` of order `k`.
pub(crate) fn golomb_len(k: u32, value: u64) -> usize {
    let v = value as u128 + (1u128 << k);
    let width = 128 - v.leading_zeros() as usize;
    2 * width - k as usize - 1
}

/// Maps a signed number to an unsigned one, small magnitudes first: 0, -1, 1, -2, 2 become
/// 0, 1, 2, 3, 4.
pub(crate) fn zigzag(v: i32) -> u64 {
    ((v << 1) ^ (v >> 31)) as u32 as u64
}

/// The inverse of [`zigzag`].
pub(crate) fn unzigzag(u: u64) -> i64 {
    (u >> 1) as i64 ^ -((u & 1) as i64)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn crc32_is_the_catalogued_crc_32_iso_hdlc() {
        // The check value of CRC-32/ISO-HDLC over the nine bytes "123456789" (the RevEng CRC
        // catalogue's `check=0xcbf43926`, from memory), and the empty input.
        assert_eq!(crc32(b"123456789"), 0xCBF4_3926);
        assert_eq!(crc32(b""), 0);
    }

    proptest::proptest! {
        /// The same checksum as crc32fast (what the codes used before), so that every code
        /// written earlier still reads.
        #[test]
        fn crc32_agrees_with_crc32fast(bytes in proptest::collection::vec(proptest::num::u8::ANY, 0..2000)) {
            proptest::prop_assert_eq!(crc32(&bytes), crc32fast::hash(&bytes));
        }
    }

    #[test]
    fn golomb_codes_are_the_published_ones() {
        // Exponential-Golomb order 0 (Teuhola 1978; the ue(v) code of ITU-T H.264, clause
        // 9.1, from memory): 0 -> 1, 1 -> 010, 2 -> 011, 3 -> 00100, 7 -> 0001000.
        let cases: [(u64, &str); 5] = [
            (0, "1"),
            (1, "010"),
            (2, "011"),
            (3, "00100"),
            (7, "0001000"),
        ];
        for (v, bits) in cases {
            let mut w = BitWriter::default();
            w.golomb(0, v);
            assert_eq!(w.len(), bits.len(), "{v}");
            assert_eq!(golomb_len(0, v), bits.len());
            let expected = u64::from_str_radix(bits, 2).unwrap() << (8 - bits.len());
            assert_eq!(w.into_bytes(), vec![expected as u8], "{v}");
        }
    }

    #[test]
    fn everything_written_reads_back() {
        let values = [0u64, 1, 2, 5, 255, 256, 1 << 40, u64::MAX - 1, u64::MAX];
        let mut w = BitWriter::default();
        for &v in &values {
            w.var(v);
            w.golomb(3, v);
            w.golomb(0, v);
            w.flag(v % 2 == 1);
        }
        w.put(5, 17);
        let bytes = w.into_bytes();
        let mut r = BitReader::new(&bytes);
        for &v in &values {
            assert_eq!(r.var(), Ok(v));
            assert_eq!(r.golomb(3), Ok(v));
            assert_eq!(r.golomb(0), Ok(v));
            assert_eq!(r.flag(), Ok(v % 2 == 1));
        }
        assert_eq!(r.get(5), Ok(17));
        assert_eq!(r.finish(), Ok(()));
        for v in [-5, -1, 0, 1, 7, i32::MAX, i32::MIN] {
            assert_eq!(unzigzag(zigzag(v)), v as i64);
        }
    }

    #[test]
    fn padding_must_be_zero_and_input_cannot_be_overrun() {
        assert_eq!(BitReader::new(&[0b1000_0001]).finish(), Err(BitError));
        let mut r = BitReader::new(&[0b1000_0000]);
        assert_eq!(r.flag(), Ok(true));
        assert_eq!(r.finish(), Ok(()));
        // A byte left over is not padding.
        assert_eq!(BitReader::new(&[0, 0]).finish(), Err(BitError));
        // Zeros without end are refused, not read forever.
        assert_eq!(BitReader::new(&[0; 16]).golomb(0), Err(BitError));
        assert_eq!(BitReader::new(&[]).get(1), Err(BitError));
    }
}
