//! Where the grid sits on the canvas, in CSS pixels, and which point a tap lands on.
//!
//! The grid is centred in the canvas with a wider margin on the left and at the bottom, where
//! the coordinates are written (numbers on the left, letters along the bottom). The
//! coordinates grow with the page's text size: their font is at least [`LABEL`] times the
//! root font size, and the margins widen to hold them (the grid shrinks a little instead).

use engine::Point;

/// Margin left of column `a`, in grid steps (room for two-digit row numbers).
pub const LEFT: f64 = 1.4;
/// Margin right of the last column, in grid steps.
pub const RIGHT: f64 = 0.75;
/// Margin above the top row, in grid steps.
pub const TOP: f64 = 0.75;
/// Margin below row `1`, in grid steps (room for the column letters).
pub const BOTTOM: f64 = 1.2;
/// The coordinates' smallest font size, in root font sizes (11 px at the usual 16 px).
pub const LABEL: f64 = 0.6875;
/// The coordinates' font size in grid steps, when that is larger.
const LABEL_STEPS: f64 = 0.42;
/// Gap between the row numbers and column `a`, in grid steps.
const NUMBER_GAP: f64 = 0.42;
/// Width of a two-digit row number and the space before it, in font sizes (a bold digit is
/// about 0.65 of the font size; the rest keeps the number a few pixels off the canvas edge).
const NUMBER_WIDTH: f64 = 1.6;
/// Distance from row `1` to the letters' centre: at least this many grid steps ...
const LETTER_STEPS: f64 = 0.78;
/// ... and at least this many steps plus [`HALF_LETTER`] font sizes.
const LETTER_GAP: f64 = 0.45;
/// Half a letter's height with a little space, in font sizes.
const HALF_LETTER: f64 = 0.6;

/// The grid's placement on a canvas of a given CSS size.
#[derive(Clone, Copy, PartialEq, Debug)]
pub struct Layout {
    /// Points per side.
    pub size: u8,
    /// CSS width of the canvas.
    pub width: f64,
    /// CSS height of the canvas.
    pub height: f64,
    /// Distance between neighbouring lines.
    pub step: f64,
    /// x of column `a`.
    pub x0: f64,
    /// y of row `1` (the bottom row; rows go up the screen).
    pub y0: f64,
    /// The coordinates' font size.
    pub label: f64,
    /// Distance from row `1` down to the centre of the column letters.
    pub letters: f64,
    /// Distance from column `a` left to the right edge of the row numbers.
    pub numbers: f64,
}

/// A need for room that grows linearly with the step: `per_step * step + fixed`.
#[derive(Clone, Copy)]
struct Need {
    per_step: f64,
    fixed: f64,
}

impl Need {
    fn at(self, step: f64) -> f64 {
        self.per_step * step + self.fixed
    }
}

/// The largest step at which every need fits in `room` (each need grows with the step).
fn largest_step(needs: &[Need], room: f64) -> f64 {
    needs
        .iter()
        .map(|n| (room - n.fixed) / n.per_step)
        .fold(f64::INFINITY, f64::min)
        .max(0.0)
}

/// The room across (grid, margins) a grid of `lines` spaces needs, as the larger of these
/// (the font is the larger of `LABEL_STEPS` steps and `min_label`).
fn needs_across(lines: f64, min_label: f64) -> [Need; 3] {
    let base = lines + RIGHT;
    [
        Need {
            per_step: base + LEFT,
            fixed: 0.0,
        },
        Need {
            per_step: base + NUMBER_GAP + NUMBER_WIDTH * LABEL_STEPS,
            fixed: 0.0,
        },
        Need {
            per_step: base + NUMBER_GAP,
            fixed: NUMBER_WIDTH * min_label,
        },
    ]
}

/// The room down a grid needs: the bottom margin is the larger of `BOTTOM` steps and the
/// letters' centre plus half a letter.
fn needs_down(lines: f64, min_label: f64) -> [Need; 5] {
    let base = lines + TOP;
    let l = LABEL_STEPS * HALF_LETTER;
    let m = HALF_LETTER * min_label;
    [
        Need {
            per_step: base + BOTTOM,
            fixed: 0.0,
        },
        Need {
            per_step: base + LETTER_STEPS + l,
            fixed: 0.0,
        },
        Need {
            per_step: base + LETTER_STEPS,
            fixed: m,
        },
        Need {
            per_step: base + LETTER_GAP + 2.0 * l,
            fixed: 0.0,
        },
        Need {
            per_step: base + LETTER_GAP,
            fixed: 2.0 * m,
        },
    ]
}

impl Layout {
    /// The layout of a `size` x `size` grid on a `width` x `height` canvas (CSS pixels), on a
    /// page whose root font size is `text` CSS pixels.
    pub fn new(size: u8, width: f64, height: f64, text: f64) -> Layout {
        let (width, height) = (width.max(0.0), height.max(0.0));
        let text = if text.is_finite() && text > 0.0 {
            text.min(64.0)
        } else {
            16.0
        };
        let min_label = LABEL * text;
        let lines = f64::from(size.max(2) - 1);
        let across = needs_across(lines, min_label);
        let down = needs_down(lines, min_label);
        let step = largest_step(&across, width).min(largest_step(&down, height));
        let label = (LABEL_STEPS * step).max(min_label);
        let letters = (LETTER_STEPS * step).max(LETTER_GAP * step + HALF_LETTER * label);
        let used = |needs: &[Need]| needs.iter().map(|n| n.at(step)).fold(0.0, f64::max);
        let left = (LEFT * step).max(NUMBER_GAP * step + NUMBER_WIDTH * label);
        Layout {
            size,
            width,
            height,
            step,
            x0: (width - used(&across)) / 2.0 + left,
            y0: (height - used(&down)) / 2.0 + (TOP + lines) * step,
            label,
            letters,
            numbers: NUMBER_GAP * step,
        }
    }

    /// The centre of a point.
    pub fn centre(&self, p: Point) -> (f64, f64) {
        (
            self.x0 + f64::from(p.x) * self.step,
            self.y0 - f64::from(p.y) * self.step,
        )
    }

    /// The point nearest to `(x, y)`, if that is within half a step of it on both axes.
    pub fn hit(&self, x: f64, y: f64) -> Option<Point> {
        if self.step <= 0.0 || !x.is_finite() || !y.is_finite() {
            return None;
        }
        let col = ((x - self.x0) / self.step).round();
        let row = ((self.y0 - y) / self.step).round();
        let n = f64::from(self.size);
        ((0.0..n).contains(&col) && (0.0..n).contains(&row))
            .then(|| Point::new(col as u8, row as u8))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn grid_fits_and_centres_round_trip() {
        let l = Layout::new(15, 600.0, 600.0, 16.0);
        let span = l.step * (14.0 + LEFT + RIGHT);
        assert!((span - 600.0).abs() < 1e-9);
        let (x, y) = l.centre(Point::new(0, 0));
        assert!((x - LEFT * l.step).abs() < 1e-9);
        // A square canvas is limited by its width (the side margins are the wider pair); the
        // spare height is split above and below.
        let spare = 600.0 - l.step * (14.0 + TOP + BOTTOM);
        assert!(spare >= 0.0);
        assert!((y - (600.0 - BOTTOM * l.step - spare / 2.0)).abs() < 1e-9);
        for p in [
            Point::new(0, 0),
            Point::new(7, 7),
            Point::new(14, 14),
            Point::new(3, 11),
        ] {
            let (x, y) = l.centre(p);
            assert_eq!(l.hit(x, y), Some(p));
            assert_eq!(l.hit(x + 0.45 * l.step, y - 0.45 * l.step), Some(p));
        }
    }

    #[test]
    fn taps_off_the_grid_hit_nothing() {
        let l = Layout::new(15, 400.0, 300.0, 16.0);
        let (x, y) = l.centre(Point::new(0, 0));
        assert_eq!(l.hit(x - 0.6 * l.step, y), None);
        assert_eq!(l.hit(x, y + 0.6 * l.step), None);
        let (x, y) = l.centre(Point::new(14, 14));
        assert_eq!(l.hit(x + 0.6 * l.step, y), None);
        assert_eq!(l.hit(x, y - 0.6 * l.step), None);
        assert_eq!(l.hit(f64::NAN, 1.0), None);
        assert_eq!(Layout::new(15, 0.0, 0.0, 16.0).hit(0.0, 0.0), None);
    }

    #[test]
    fn wide_canvas_centres_the_grid() {
        let l = Layout::new(15, 900.0, 300.0, 16.0);
        let left = l.x0 - LEFT * l.step;
        let right = l.width - (l.x0 + 14.0 * l.step + RIGHT * l.step);
        assert!((left - right).abs() < 1e-9);
        assert!(left > 0.0);
    }

    #[test]
    fn coordinates_grow_with_the_text_and_stay_on_the_canvas() {
        for size in [15u8, 19] {
            for text in [16.0, 24.0, 32.0] {
                for side in [300.0, 364.0, 700.0] {
                    let l = Layout::new(size, side, side, text);
                    // The font follows the text size, and is never smaller than before.
                    assert!(l.label >= LABEL * text - 1e-9);
                    assert!(l.label >= 0.42 * l.step - 1e-9);
                    // Two-digit row numbers end left of column a and start inside the canvas.
                    assert!(
                        l.x0 - l.numbers - NUMBER_WIDTH * l.label >= -1e-9,
                        "{size} {text} {side}"
                    );
                    // The letters, half a letter below their centre, stay on the canvas.
                    assert!(l.y0 + l.letters + HALF_LETTER * l.label <= side + 1e-9);
                    // Stones on the top and right edge stay on the canvas too.
                    let (x, y) = l.centre(Point::new(size - 1, size - 1));
                    assert!(x + 0.5 * l.step <= side + 1e-9 && y - 0.5 * l.step >= -1e-9);
                }
                // Larger text takes room from the grid, never the other way round.
                assert!(
                    Layout::new(size, 364.0, 364.0, 32.0).step
                        <= Layout::new(size, 364.0, 364.0, 16.0).step
                );
            }
        }
        // At the usual text size a phone's board is as it was: the margins are set by the grid.
        let l = Layout::new(15, 364.0, 364.0, 16.0);
        assert!((l.step - 364.0 / (14.0 + LEFT + RIGHT)).abs() < 1e-9);
    }
}
