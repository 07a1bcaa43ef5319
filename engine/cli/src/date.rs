//! The dates a set carries in `created`: written `YYYY-MM-DD` and checked as calendar dates.
//!
//! The set file's reader accepts any month 01 to 12 and day 01 to 31; the command line is
//! stricter about what it writes, so that `--created 2026-02-30` is refused before any work
//! rather than written into a set. The calendar is the Gregorian one as ISO 8601 uses it,
//! extended backwards (proleptic): a year is a leap year when it is divisible by 4, except
//! centuries, which are leap years only when divisible by 400 (so 2000 and 2400 have a
//! 29 February, 1900 and 2100 do not). Years run from 0001 to 9999: four digits with no sign,
//! and no year zero, which ISO 8601 allows only by agreement between the parties.

use std::time::{SystemTime, UNIX_EPOCH};

/// Whether `year` has a 29 February (the Gregorian rule, applied to every year).
fn is_leap(year: u32) -> bool {
    year.is_multiple_of(4) && (!year.is_multiple_of(100) || year.is_multiple_of(400))
}

/// Days in `month` (1 to 12) of `year`.
fn days_in(year: u32, month: u32) -> u32 {
    match month {
        2 if is_leap(year) => 29,
        2 => 28,
        4 | 6 | 9 | 11 => 30,
        _ => 31,
    }
}

/// Reads `--created`: a calendar date written `YYYY-MM-DD` (see the module doc). The message
/// says what is wrong with it; clap puts the option's name in front.
pub fn parse_created(s: &str) -> Result<String, String> {
    let b = s.as_bytes();
    let shape = b.len() == 10
        && b[4] == b'-'
        && b[7] == b'-'
        && b.iter()
            .enumerate()
            .all(|(i, c)| i == 4 || i == 7 || c.is_ascii_digit());
    if !shape {
        return Err("not a date written YYYY-MM-DD, like 2026-12-01".into());
    }
    // Only ASCII digits remain in these slices, so the numbers always read.
    let number = |r: std::ops::Range<usize>| s[r].parse::<u32>().unwrap_or(0);
    let (year, month, day) = (number(0..4), number(5..7), number(8..10));
    if year == 0 {
        return Err("years run from 0001 to 9999".into());
    }
    if !(1..=12).contains(&month) {
        return Err(format!("there is no month {month:02} (01 to 12)"));
    }
    let last = days_in(year, month);
    if !(1..=last).contains(&day) {
        return Err(format!(
            "there is no day {day:02} in {year:04}-{month:02}, which has {last} days"
        ));
    }
    Ok(s.to_string())
}

/// Today's date in UTC, `YYYY-MM-DD`: the civil date of a count of days since 1970-01-01 in
/// the proleptic Gregorian calendar (the well-known days-to-civil conversion, common
/// practice). A clock before 1970 reads as 1970-01-01.
pub fn today() -> String {
    let days = SystemTime::now()
        .duration_since(UNIX_EPOCH)
        .map(|d| d.as_secs() / 86_400)
        .unwrap_or(0);
    civil(days)
}

/// The date `days` days after 1970-01-01.
fn civil(days: u64) -> String {
    let z = days as i64 + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z - era * 146_097;
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = yoe + era * 400 + i64::from(m <= 2);
    format!("{y:04}-{m:02}-{d:02}")
}

#[cfg(test)]
mod tests {
    use super::*;
    use chrono::{Datelike, NaiveDate};

    /// Every day, month and year field around the edges, checked against chrono's calendar
    /// (an independent implementation of the proleptic Gregorian calendar).
    #[test]
    fn a_date_is_accepted_exactly_when_chrono_knows_it() {
        let years = (1..=40)
            .chain(1580..=1620)
            .chain(1890..=2110)
            .chain([2400, 2500, 9996, 9999]);
        let mut accepted = 0;
        for y in years {
            for m in 0..=13u32 {
                for d in 0..=32u32 {
                    let text = format!("{y:04}-{m:02}-{d:02}");
                    let ours = parse_created(&text).is_ok();
                    let theirs = NaiveDate::from_ymd_opt(y, m, d).is_some();
                    assert_eq!(ours, theirs, "{text}");
                    accepted += usize::from(ours);
                }
            }
        }
        assert!(accepted > 100_000, "{accepted}");
    }

    #[test]
    fn the_leap_rule_of_the_module_doc() {
        // The examples of the module doc, which follow the Gregorian rule (common practice).
        for ok in [
            "2000-02-29",
            "2400-02-29",
            "2024-02-29",
            "2026-12-01",
            "0001-01-01",
        ] {
            assert_eq!(parse_created(ok), Ok(ok.to_string()));
        }
        for bad in [
            "1900-02-29",
            "2100-02-29",
            "2026-02-29",
            "2026-04-31",
            "0000-01-01",
        ] {
            assert!(parse_created(bad).is_err(), "{bad}");
        }
    }

    #[test]
    fn malformed_dates_say_what_they_are_not() {
        for bad in [
            "not-a-date",
            "2026-1-01",
            "2026-12-1",
            "2026/12/01",
            "20261201",
            "+2026-12-01",
            "2026-12-01 ",
            "２０２６-12-01",
            "",
        ] {
            let e = parse_created(bad).unwrap_err();
            assert!(e.contains("YYYY-MM-DD"), "{bad}: {e}");
        }
        assert!(parse_created("2026-13-01")
            .unwrap_err()
            .contains("month 13"));
        assert!(parse_created("2026-02-30")
            .unwrap_err()
            .contains("no day 30 in 2026-02, which has 28 days"));
    }

    #[test]
    fn days_since_1970_become_the_dates_chrono_gives() {
        let epoch = NaiveDate::from_ymd_opt(1970, 1, 1).unwrap();
        for days in (0..200_000u64)
            .step_by(37)
            .chain([59, 60, 365, 730, 10_957, 11_016])
        {
            let want = epoch + chrono::Days::new(days);
            let text = civil(days);
            assert_eq!(
                text,
                format!("{:04}-{:02}-{:02}", want.year(), want.month(), want.day()),
                "day {days}"
            );
            assert!(parse_created(&text).is_ok(), "{text}");
        }
        assert!(parse_created(&today()).is_ok());
    }
}
