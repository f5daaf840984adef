//! Little-endian encoding helpers shared by the index writer and reader.

/// Appends values to a byte buffer.
#[derive(Default)]
pub struct Out {
    pub buf: Vec<u8>,
}

impl Out {
    pub fn u8(&mut self, v: u8) {
        self.buf.push(v);
    }
    pub fn u16(&mut self, v: u16) {
        self.buf.extend_from_slice(&v.to_le_bytes());
    }
    pub fn u32(&mut self, v: u32) {
        self.buf.extend_from_slice(&v.to_le_bytes());
    }
    pub fn i32(&mut self, v: i32) {
        self.buf.extend_from_slice(&v.to_le_bytes());
    }
    pub fn varint(&mut self, mut v: u32) {
        while v >= 0x80 {
            self.buf.push((v as u8) | 0x80);
            v >>= 7;
        }
        self.buf.push(v as u8);
    }
    pub fn str(&mut self, s: &str) {
        self.varint(s.len() as u32);
        self.buf.extend_from_slice(s.as_bytes());
    }
}

/// Reads values from a byte slice; every read is bounds-checked and a short
/// read is reported as `None`, never a panic.
pub struct In<'a> {
    pub data: &'a [u8],
    pub pos: usize,
}

impl<'a> In<'a> {
    pub fn new(data: &'a [u8]) -> In<'a> {
        In { data, pos: 0 }
    }
    pub fn take(&mut self, n: usize) -> Option<&'a [u8]> {
        let end = self.pos.checked_add(n)?;
        let s = self.data.get(self.pos..end)?;
        self.pos = end;
        Some(s)
    }
    pub fn u8(&mut self) -> Option<u8> {
        self.take(1).map(|b| b[0])
    }
    pub fn u16(&mut self) -> Option<u16> {
        self.take(2).map(|b| u16::from_le_bytes([b[0], b[1]]))
    }
    pub fn u32(&mut self) -> Option<u32> {
        self.take(4)
            .map(|b| u32::from_le_bytes([b[0], b[1], b[2], b[3]]))
    }
    pub fn i32(&mut self) -> Option<i32> {
        self.u32().map(|v| v as i32)
    }
    pub fn varint(&mut self) -> Option<u32> {
        let mut v: u32 = 0;
        for shift in (0..35).step_by(7) {
            let b = self.u8()?;
            v |= ((b & 0x7f) as u32).checked_shl(shift)?;
            if b < 0x80 {
                return Some(v);
            }
        }
        None
    }
    pub fn str(&mut self) -> Option<&'a str> {
        let n = self.varint()? as usize;
        std::str::from_utf8(self.take(n)?).ok()
    }
}

/// The `n` bytes of `data` from byte `at`, if they are all there. Offsets
/// and counts come from the file, so the end is computed without overflow
/// (a 32-bit `usize` in Wasm overflows far sooner).
#[inline]
pub fn bytes_at(data: &[u8], at: usize, n: usize) -> Option<&[u8]> {
    data.get(at..at.checked_add(n)?)
}

/// Entry `i` of a table of `width`-byte entries, if it is there.
#[inline]
pub fn entry(data: &[u8], i: usize, width: usize) -> Option<&[u8]> {
    bytes_at(data, i.checked_mul(width)?, width)
}

/// The little-endian `u32` at byte `at` of `data`, if it is there.
#[inline]
pub fn u32_at(data: &[u8], at: usize) -> Option<u32> {
    let b = bytes_at(data, at, 4)?;
    Some(u32::from_le_bytes([b[0], b[1], b[2], b[3]]))
}

/// The little-endian `u32` entry `i` of a table of them, if it is there.
#[inline]
pub fn u32_entry(data: &[u8], i: usize) -> Option<u32> {
    let b = entry(data, i, 4)?;
    Some(u32::from_le_bytes([b[0], b[1], b[2], b[3]]))
}

/// The little-endian `u16` entry `i` of a table of them, if it is there.
#[inline]
pub fn u16_entry(data: &[u8], i: usize) -> Option<u16> {
    let b = entry(data, i, 2)?;
    Some(u16::from_le_bytes([b[0], b[1]]))
}
