//! The transposition table of the proof-number search: bounded memory, buckets of four entries,
//! replacement of the entry that cost the least work to compute.
//!
//! An entry keeps the proof and disproof numbers of a node, the move that proved or disproved it
//! (so that proofs can be read back without searching again), and the number of nodes its
//! subtree took (its "work"), which decides what to overwrite when a bucket is full: a cheap
//! entry is cheap to recompute. Keys are full 64-bit hashes; a false match needs two positions
//! with equal 64-bit keys, which we accept as is common practice for Zobrist-hashed tables.

/// Bytes per entry.
pub const ENTRY_BYTES: usize = std::mem::size_of::<Slot>();

const WAYS: usize = 4;

/// No move stored.
pub const NO_MOVE: u16 = u16::MAX;

/// One stored node.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub struct Slot {
    /// The node's key (0 marks an empty slot; a real key of 0 is remapped).
    pub key: u64,
    /// Proof number.
    pub pn: u32,
    /// Disproof number.
    pub dn: u32,
    /// Nodes searched below this entry, saturating.
    pub work: u32,
    /// The proving (or disproving) move, or [`NO_MOVE`].
    pub best: u16,
    /// The length of the proof below, in attacker moves, when proved (for shortest lines).
    pub depth: u16,
}

/// A bounded table of [`Slot`]s.
pub struct Table {
    entries: Vec<Slot>,
    mask: usize,
    /// The slots filled since the last clear, while they are few (so that clearing a table
    /// that was little used, as the generator does before every game, costs little).
    filled: Vec<u32>,
    /// Whether more slots were filled than `filled` keeps (then a clear wipes them all).
    crowded: bool,
}

/// A clear lists the filled slots up to this fraction of the table (1 / N).
const FILLED_FRACTION: usize = 16;

impl Table {
    /// A table using at most `megabytes` of memory (at least one bucket).
    pub fn with_megabytes(megabytes: usize) -> Table {
        let want = (megabytes.max(1) << 20) / ENTRY_BYTES / WAYS;
        let buckets = if want.is_power_of_two() {
            want
        } else {
            (want.next_power_of_two() / 2).max(1)
        };
        Table {
            entries: vec![Slot::default(); buckets * WAYS],
            mask: buckets - 1,
            filled: Vec::new(),
            crowded: false,
        }
    }

    /// Memory in bytes.
    pub fn bytes(&self) -> usize {
        self.entries.len() * ENTRY_BYTES
    }

    /// Number of slots in use (for diagnostics).
    pub fn occupied(&self) -> usize {
        self.entries.iter().filter(|e| e.key != 0).count()
    }

    /// Forgets everything.
    pub fn clear(&mut self) {
        if self.crowded {
            self.entries.fill(Slot::default());
        } else {
            for &i in &self.filled {
                self.entries[i as usize] = Slot::default();
            }
        }
        self.filled.clear();
        self.crowded = false;
    }

    #[inline]
    fn fix(key: u64) -> u64 {
        if key == 0 {
            1
        } else {
            key
        }
    }

    #[inline]
    fn bucket(&self, key: u64) -> usize {
        ((key >> 32) as usize & self.mask) * WAYS
    }

    /// The entry for a key, if stored.
    #[inline]
    pub fn get(&self, key: u64) -> Option<&Slot> {
        let key = Self::fix(key);
        let b = self.bucket(key);
        self.entries[b..b + WAYS].iter().find(|e| e.key == key)
    }

    /// Stores an entry, replacing the same key or else the entry with the least work.
    #[inline]
    pub fn put(&mut self, mut e: Slot) {
        e.key = Self::fix(e.key);
        let b = self.bucket(e.key);
        let slots = &mut self.entries[b..b + WAYS];
        let mut victim = 0;
        for (i, s) in slots.iter().enumerate() {
            if s.key == e.key {
                victim = i;
                break;
            }
            if s.key == 0 {
                victim = i;
                break;
            }
            if s.work < slots[victim].work {
                victim = i;
            }
        }
        if slots[victim].key == 0 && !self.crowded {
            if self.filled.len() < self.entries.len() / FILLED_FRACTION {
                self.filled.push((b + victim) as u32);
            } else {
                self.crowded = true;
                self.filled = Vec::new();
            }
        }
        self.entries[b + victim] = e;
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn size_is_bounded() {
        let t = Table::with_megabytes(32);
        assert!(t.bytes() <= 32 << 20, "{}", t.bytes());
        assert!(t.bytes() >= 8 << 20);
    }

    #[test]
    fn stores_and_replaces_cheapest() {
        let mut t = Table::with_megabytes(1);
        let mut e = Slot {
            key: 42,
            pn: 3,
            dn: 4,
            work: 10,
            best: 7,
            depth: 0,
        };
        t.put(e);
        assert_eq!(t.get(42).unwrap().pn, 3);
        e.pn = 0;
        t.put(e);
        assert_eq!(t.get(42).unwrap().pn, 0);
        assert!(t.get(43).is_none());
        // Fill one bucket with entries of rising work, then add one more: the cheapest goes.
        let base = 5u64 << 32;
        for (i, w) in [(1u64, 5u32), (2, 1), (3, 9), (4, 7)] {
            t.put(Slot {
                key: base | i,
                work: w,
                ..Default::default()
            });
        }
        t.put(Slot {
            key: base | 9,
            work: 3,
            ..Default::default()
        });
        assert!(t.get(base | 2).is_none());
        assert!(t.get(base | 9).is_some() && t.get(base | 1).is_some());
    }

    #[test]
    fn clear_forgets_everything_after_few_or_many_entries() {
        let mut t = Table::with_megabytes(1);
        let slots = t.bytes() / ENTRY_BYTES;
        for n in [10, slots / FILLED_FRACTION + 5, 3 * slots] {
            for i in 0..n as u64 {
                t.put(Slot {
                    key: crate::zobrist::splitmix64(i),
                    work: i as u32,
                    ..Slot::default()
                });
            }
            assert!(t.occupied() > 0);
            t.clear();
            assert_eq!(t.occupied(), 0, "after {n} entries");
        }
    }
}
