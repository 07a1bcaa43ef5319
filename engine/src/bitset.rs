//! A fixed-size set of board cells, indexed by the board's padded cell index.

/// Number of 64-bit words: enough for the padded 19x19 board (29 x 29 = 841 cells).
pub(crate) const WORDS: usize = 14;

/// A set of padded cell indices, small enough to copy.
#[derive(Clone, Copy, PartialEq, Eq, Default, Debug)]
pub struct CellSet {
    words: [u64; WORDS],
}

impl CellSet {
    /// The empty set.
    pub const fn new() -> Self {
        CellSet { words: [0; WORDS] }
    }

    /// Adds a cell.
    #[inline]
    pub fn insert(&mut self, i: usize) {
        self.words[i >> 6] |= 1 << (i & 63);
    }

    /// Removes a cell.
    #[inline]
    pub fn remove(&mut self, i: usize) {
        self.words[i >> 6] &= !(1 << (i & 63));
    }

    /// Whether the cell is in the set.
    #[inline]
    pub fn contains(&self, i: usize) -> bool {
        self.words[i >> 6] >> (i & 63) & 1 == 1
    }

    /// Whether the set is empty.
    #[inline]
    pub fn is_empty(&self) -> bool {
        self.words.iter().all(|&w| w == 0)
    }

    /// Number of cells in the set.
    #[inline]
    pub fn len(&self) -> usize {
        self.words.iter().map(|w| w.count_ones() as usize).sum()
    }

    /// The smallest cell in the set.
    #[inline]
    pub fn first(&self) -> Option<usize> {
        self.iter().next()
    }

    /// Cells in increasing order.
    #[inline]
    pub fn iter(&self) -> CellSetIter {
        CellSetIter {
            words: self.words,
            word: 0,
        }
    }

    /// The union of two sets.
    #[inline]
    pub fn union(&self, other: &CellSet) -> CellSet {
        let mut out = *self;
        for (a, b) in out.words.iter_mut().zip(other.words.iter()) {
            *a |= *b;
        }
        out
    }
}

/// Iterator over the cells of a [`CellSet`] in increasing order.
pub struct CellSetIter {
    words: [u64; WORDS],
    word: usize,
}

impl Iterator for CellSetIter {
    type Item = usize;

    #[inline]
    fn next(&mut self) -> Option<usize> {
        while self.word < WORDS {
            let w = self.words[self.word];
            if w != 0 {
                let bit = w.trailing_zeros() as usize;
                self.words[self.word] = w & (w - 1);
                return Some(self.word * 64 + bit);
            }
            self.word += 1;
        }
        None
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn insert_remove_iterate() {
        let mut s = CellSet::new();
        for i in [840, 0, 63, 64, 500] {
            s.insert(i);
        }
        assert_eq!(s.iter().collect::<Vec<_>>(), vec![0, 63, 64, 500, 840]);
        assert_eq!(s.len(), 5);
        s.remove(64);
        assert!(!s.contains(64) && s.contains(63));
        assert_eq!(s.first(), Some(0));
        assert!(CellSet::new().is_empty());
    }
}
