//! Where the grid sits on the canvas, in CSS pixels, and which point a tap lands on.
//!
//! The grid is centred in the canvas with a wider margin on the left and at the bottom, where
//! the coordinates are written (numbers on the left, letters along the bottom).

use engine::Point;

/// Margin left of column `a`, in grid steps (room for two-digit row numbers).
pub const LEFT: f64 = 1.4;
/// Margin right of the last column, in grid steps.
pub const RIGHT: f64 = 0.75;
/// Margin above the top row, in grid steps.
pub const TOP: f64 = 0.75;
/// Margin below row `1`, in grid steps (room for the column letters).
pub const BOTTOM: f64 = 1.2;

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
}

impl Layout {
    /// The layout of a `size` x `size` grid on a `width` x `height` canvas (CSS pixels).
    pub fn new(size: u8, width: f64, height: f64) -> Layout {
        let (width, height) = (width.max(0.0), height.max(0.0));
        let lines = f64::from(size.max(2) - 1);
        let step = (width / (lines + LEFT + RIGHT)).min(height / (lines + TOP + BOTTOM));
        let spare_x = width - step * (lines + LEFT + RIGHT);
        let spare_y = height - step * (lines + TOP + BOTTOM);
        Layout {
            size,
            width,
            height,
            step,
            x0: spare_x / 2.0 + LEFT * step,
            y0: spare_y / 2.0 + (TOP + lines) * step,
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
        let l = Layout::new(15, 600.0, 600.0);
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
        let l = Layout::new(15, 400.0, 300.0);
        let (x, y) = l.centre(Point::new(0, 0));
        assert_eq!(l.hit(x - 0.6 * l.step, y), None);
        assert_eq!(l.hit(x, y + 0.6 * l.step), None);
        let (x, y) = l.centre(Point::new(14, 14));
        assert_eq!(l.hit(x + 0.6 * l.step, y), None);
        assert_eq!(l.hit(x, y - 0.6 * l.step), None);
        assert_eq!(l.hit(f64::NAN, 1.0), None);
        assert_eq!(Layout::new(15, 0.0, 0.0).hit(0.0, 0.0), None);
    }

    #[test]
    fn wide_canvas_centres_the_grid() {
        let l = Layout::new(15, 900.0, 300.0);
        let left = l.x0 - LEFT * l.step;
        let right = l.width - (l.x0 + 14.0 * l.step + RIGHT * l.step);
        assert!((left - right).abs() < 1e-9);
        assert!(left > 0.0);
    }
}
