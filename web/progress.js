// Progress: the player's history from the logbook (engine::logbook): the rating over time per
// rule as a line with its uncertainty band, puzzles per day as a calendar with the current and
// best streak, and accuracy by theme and by rule; every number also in a table. The numbers
// come from Rust; this file only draws them, in the page's own colours.

import { dayWords } from './pkg/fivefold_web.js';
import { today } from './practice.js';
import { $, el, fill } from './ui.js';

const WEEKS = 15;

function css(name) {
  return getComputedStyle(document.documentElement).getPropertyValue(name).trim() || '#000';
}

/** A canvas sized to its CSS box times the device pixel ratio; its 2D context, scaled to CSS
 * pixels, and its CSS size. */
function surface(canvas) {
  const r = canvas.getBoundingClientRect();
  const dpr = window.devicePixelRatio || 1;
  const w = Math.max(1, Math.round(r.width * dpr));
  const h = Math.max(1, Math.round(r.height * dpr));
  if (canvas.width !== w) canvas.width = w;
  if (canvas.height !== h) canvas.height = h;
  const ctx = canvas.getContext('2d');
  ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
  return { ctx, w: r.width, h: r.height };
}

function row(cells, header = false) {
  return el('tr', {}, cells.map((c, i) => el(header || i === 0 ? 'th' : 'td', header ? { scope: 'col' } : i === 0 ? { scope: 'row' } : {}, String(c))));
}

export class Progress {
  constructor(app) {
    this.app = app;
    this.rule = 'freestyle';
    $('progress-rule').addEventListener('change', (e) => {
      this.rule = e.target.value;
      this.render();
    });
    // The calendar too: the chart is hidden until a puzzle is rated.
    const resized = new ResizeObserver(() => this.draw());
    resized.observe($('progress-chart'));
    resized.observe($('progress-calendar'));
    app.practice.onChange(() => {
      if (!$('progress').hidden) this.render();
    });
  }

  activate() {
    this.render();
  }

  render() {
    const day = today();
    this.data = this.app.practice.handle.progress(day);
    const d = this.data;
    // Points of rated tries (Drill's) only: the engine leaves out the other screens', which
    // carry the rating as it stood.
    const series = d.ratings[this.rule] ?? [];
    this.series = series;
    $('progress-rule').value = this.rule;
    const last = series[series.length - 1];
    $('progress-rating-note').textContent = last
      ? `Now ${Math.round(last.rating)}, give or take ${Math.round(2 * last.deviation)} (the band shows twice the rating deviation, where the true rating lies 19 times in 20).`
      : `No rated ${this.rule} puzzles yet: your rating moves with every Drill puzzle.`;
    const s = d.streaks;
    // No streak to keep once it is broken: then today starts a new one.
    $('progress-streaks').textContent = s.current
      ? `Current streak: ${s.current} day${s.current === 1 ? '' : 's'}${s.todayDone ? '' : ' (play today to keep it)'}. Best: ${s.best}.`
      : `No current streak (play today to start one). Best: ${s.best}.`;
    const tally = (list) => [
      row(['', 'Solved clean', 'With help', 'Failed', 'Solved'], true),
      ...list.map((t) => row([t.words, t.clean, t.helped, t.failed, `${t.solved}%`])),
    ];
    const themes = $('progress-themes');
    fill(themes, themes.querySelector('caption'), ...(d.themes.length ? tally(d.themes) : [row(['Nothing finished yet'])]));
    const rules = $('progress-rules');
    fill(rules, rules.querySelector('caption'), ...(d.rules.length ? tally(d.rules.map((r) => ({ ...r, words: r.words[0].toUpperCase() + r.words.slice(1) }))) : [row(['Nothing finished yet'])]));
    const rt = $('progress-rating-table');
    fill(rt, rt.querySelector('caption'), row(['Day', 'Rating', 'Give or take'], true),
      ...(series.length ? series.map((p) => row([dayWords(p.day), Math.round(p.rating), Math.round(2 * p.deviation)]))
        : [row(['No rated puzzles yet'])]));
    const dt = $('progress-days-table');
    fill(dt, dt.querySelector('caption'), row(['Day', 'Puzzles'], true),
      ...(d.days.length ? d.days.map((x) => row([dayWords(x.day), x.count])) : [row(['Nothing finished yet'])]));
    $('progress').dataset.points = String(series.length);
    this.draw();
  }

  draw() {
    if (!this.data || $('progress').hidden) return;
    this.drawRating();
    this.drawCalendar();
  }

  drawRating() {
    const canvas = $('progress-chart');
    const series = this.series ?? [];
    // No rated puzzle yet: the note above says so, and no empty axes are drawn.
    canvas.hidden = !series.length;
    if (!series.length) return;
    const { ctx, w, h } = surface(canvas);
    ctx.fillStyle = css('--panel');
    ctx.fillRect(0, 0, w, h);
    const ink = css('--ink');
    const left = 44;
    const bottom = 22;
    const top = 8;
    const right = 8;
    ctx.strokeStyle = ink;
    ctx.lineWidth = 1;
    ctx.beginPath();
    ctx.moveTo(left, top);
    ctx.lineTo(left, h - bottom);
    ctx.lineTo(w - right, h - bottom);
    ctx.stroke();
    const lo = Math.min(...series.map((p) => p.rating - 2 * p.deviation));
    const hi = Math.max(...series.map((p) => p.rating + 2 * p.deviation));
    const y0 = Math.floor(lo / 100) * 100;
    const y1 = Math.ceil(hi / 100) * 100 || y0 + 100;
    const [first] = series;
    const last = series[series.length - 1];
    const d0 = first.day;
    const d1 = Math.max(last.day, d0 + 1);
    // A lone day stands in the middle.
    const x = (day) => series.length === 1 ? (left + w - right) / 2 : left + ((day - d0) / (d1 - d0)) * (w - left - right);
    const y = (v) => h - bottom - ((v - y0) / (y1 - y0)) * (h - top - bottom);
    // The uncertainty band, then the line, then a mark per day (a square, so it reads without
    // colour). The band is the ink's own colour, faint, so the line stands out in either scheme.
    ctx.fillStyle = ink;
    ctx.globalAlpha = 0.2;
    ctx.beginPath();
    series.forEach((p, i) => (i ? ctx.lineTo : ctx.moveTo).call(ctx, x(p.day), y(p.rating + 2 * p.deviation)));
    for (let i = series.length - 1; i >= 0; i--) ctx.lineTo(x(series[i].day), y(series[i].rating - 2 * series[i].deviation));
    ctx.closePath();
    ctx.fill();
    // One day alone has no width: its band is a bar.
    if (series.length === 1) ctx.fillRect(x(d0) - 6, y(first.rating + 2 * first.deviation), 12, 4 * first.deviation * (h - top - bottom) / (y1 - y0));
    ctx.globalAlpha = 1;
    ctx.strokeStyle = ink;
    ctx.lineWidth = 2;
    ctx.beginPath();
    series.forEach((p, i) => (i ? ctx.lineTo : ctx.moveTo).call(ctx, x(p.day), y(p.rating)));
    ctx.stroke();
    ctx.fillStyle = ink;
    for (const p of series) ctx.fillRect(x(p.day) - 3, y(p.rating) - 3, 6, 6);
    ctx.font = '12px system-ui, sans-serif';
    ctx.textAlign = 'right';
    ctx.textBaseline = 'middle';
    for (const v of [y0, y1]) ctx.fillText(String(v), left - 4, y(v));
    ctx.textAlign = 'left';
    ctx.textBaseline = 'alphabetic';
    // The first and the last day.
    const date = (d) => dayWords(d).split(' ').slice(1, 3).join(' ');
    if (series.length === 1) ctx.textAlign = 'center';
    ctx.fillText(date(d0), x(d0), h - 6);
    if (last.day !== d0) {
      ctx.textAlign = 'right';
      ctx.fillText(date(last.day), w - right, h - 6);
    }
    canvas.setAttribute('aria-label',
      `Rating over time (${this.rule}): ${series.length} day${series.length === 1 ? '' : 's'}, now ${Math.round(last.rating)}. The table below has every point.`);
  }

  drawCalendar() {
    const canvas = $('progress-calendar');
    const { ctx, w, h } = surface(canvas);
    ctx.fillStyle = css('--panel');
    ctx.fillRect(0, 0, w, h);
    const counts = new Map(this.data.days.map((d) => [d.day, d.count]));
    const end = this.data.today;
    // Columns are weeks (Monday first, the current week last), rows the days of the week.
    const weekday = (day) => (day + 3) % 7; // 1970-01-01 was a Thursday: Monday is 0.
    const start = end - weekday(end) - 7 * (WEEKS - 1);
    // Room on the left for the days' names and on top for the months'.
    const left = 30;
    const top = 16;
    const cell = Math.min((w - left - 2) / WEEKS, (h - top - 2) / 7);
    const max = Math.max(1, ...counts.values());
    const ink = css('--ink');
    ctx.fillStyle = ink;
    ctx.font = '11px system-ui, sans-serif';
    ctx.textBaseline = 'middle';
    for (const [r, name] of [[0, 'Mon'], [2, 'Wed'], [4, 'Fri'], [6, 'Sun']]) ctx.fillText(name, 0, top + (r + 0.5) * cell);
    // A month's name over the week of its first day, and the first week's month when no other
    // name is near.
    const month = (day) => dayWords(day).split(' ')[2].slice(0, 3);
    let named = WEEKS;
    for (let col = WEEKS - 1; col >= 0; col--) {
      const day = start + 7 * col;
      const first = [...Array(7)].map((_, i) => day + i).find((d) => d <= end && dayWords(d).split(' ')[1] === '1');
      if (first !== undefined || (col === 0 && named >= 3)) {
        ctx.fillText(month(first ?? day), left + col * cell, top / 2);
        named = col;
      }
    }
    for (let day = start; day <= end; day++) {
      const col = Math.floor((day - start) / 7);
      const rowi = weekday(day);
      const cx = left + col * cell;
      const cy = top + rowi * cell;
      const n = counts.get(day) ?? 0;
      ctx.strokeStyle = ink;
      ctx.lineWidth = 1;
      ctx.strokeRect(cx + 1.5, cy + 1.5, cell - 3, cell - 3);
      if (n > 0) {
        // A filled square whose size grows with the count: read by size, not colour.
        const k = 0.35 + 0.65 * (n / max);
        const s = (cell - 5) * k;
        ctx.fillStyle = ink;
        ctx.fillRect(cx + (cell - s) / 2, cy + (cell - s) / 2, s, s);
      }
      if (day === end) {
        ctx.lineWidth = 2;
        ctx.strokeRect(cx + 0.5, cy + 0.5, cell - 1, cell - 1);
      }
    }
    const played = [...counts.entries()].filter(([d]) => d >= start).length;
    canvas.setAttribute('aria-label', `Puzzles finished per day, the last ${WEEKS} weeks: ${played} day${played === 1 ? '' : 's'} played. The table below has every day.`);
  }
}
