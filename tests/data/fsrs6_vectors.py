"""Writes fsrs6_vectors.txt: FSRS-6 review sequences computed by the reference scheduler.

The reference is py-fsrs 6.3.2, the open-spaced-repetition project's Python scheduler
(`pip install fsrs==6.3.2`), with its default weights, no learning steps, no fuzz and the
reference cap of 36,500 days: that is the configuration Fivefold's day-based scheduler
(engine/src/schedule/fsrs.rs) implements. Reviews happen at 12:00 UTC on whole days, so the
elapsed days the reference computes are the differences of the day numbers written here.

Run:  python3 tests/data/fsrs6_vectors.py > tests/data/fsrs6_vectors.txt
"""

import random
from datetime import datetime, timedelta, timezone

from importlib.metadata import version
from fsrs import Card, Rating, Scheduler

EPOCH = datetime(1970, 1, 1, 12, 0, tzinfo=timezone.utc)
START = 19_000  # 2022-01-08
NAMES = {Rating.Again: "again", Rating.Hard: "hard", Rating.Good: "good", Rating.Easy: "easy"}
G = [Rating.Again, Rating.Hard, Rating.Good, Rating.Easy]


def run(case, retention, steps):
    """steps: list of (day, rating). Prints one line per review."""
    s = Scheduler(
        desired_retention=retention,
        learning_steps=(),
        relearning_steps=(),
        maximum_interval=36500,
        enable_fuzzing=False,
    )
    card = Card()
    for day, rating in steps:
        when = EPOCH + timedelta(days=day)
        card, _ = s.review_card(card, rating, when)
        interval = (card.due - card.last_review).days
        print(f"{case} {retention} {day} {NAMES[rating]} {card.stability!r} {card.difficulty!r} {interval}")


def on_due(grades, start=START):
    """Each review on the day the previous one set."""
    s = Scheduler(learning_steps=(), relearning_steps=(), maximum_interval=36500, enable_fuzzing=False)
    card, day, steps = Card(), start, []
    for g in grades:
        steps.append((day, g))
        card, _ = s.review_card(card, g, EPOCH + timedelta(days=day))
        day += (card.due - card.last_review).days
    return steps


def main():
    print("# FSRS-6 reference vectors: py-fsrs " + version("fsrs") + ", default weights, no learning")
    print("# steps, no fuzz, maximum interval 36500 days; written by fsrs6_vectors.py (see there).")
    print("# case retention day grade stability difficulty interval")
    case = 0
    # Every grade repeated, each review on its due day.
    for g in G:
        case += 1
        run(case, 0.9, on_due([g] * 8))
    # The published sequence of py-fsrs tests/test_basic.py, day by day.
    case += 1
    run(case, 0.9, on_due([Rating.Good] * 5 + [Rating.Again, Rating.Hard] + [Rating.Good] * 4 + [Rating.Easy]))
    # Same-day repeats of every grade after a first review.
    for g in G:
        case += 1
        run(case, 0.9, [(START, Rating.Good), (START, g), (START, g), (START + 3, Rating.Good), (START + 3, g)])
    # Random histories: grades, and reviews early, on time, late or on the same day.
    rng = random.Random(20251202)
    for _ in range(40):
        case += 1
        retention = rng.choice([0.9, 0.9, 0.9, 0.8, 0.95])
        s = Scheduler(desired_retention=retention, learning_steps=(), relearning_steps=(),
                      maximum_interval=36500, enable_fuzzing=False)
        card, day, steps = Card(), START + rng.randrange(0, 1000), []
        for _ in range(rng.randrange(3, 16)):
            g = rng.choices(G, weights=[2, 2, 4, 2])[0]
            steps.append((day, g))
            card, _ = s.review_card(card, g, EPOCH + timedelta(days=day))
            ivl = (card.due - card.last_review).days
            when = rng.random()
            if when < 0.1:
                gap = 0
            elif when < 0.4:
                gap = rng.randrange(1, ivl + 1)
            elif when < 0.7:
                gap = ivl
            else:
                gap = ivl + rng.randrange(1, 2 * ivl + 2)
            day += gap
        run(case, retention, steps)


main()
