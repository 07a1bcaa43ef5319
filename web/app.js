// Fivefold play board: loads the engine and forwards the page's events to it.
// The rules, the drawing and every sentence shown come from Rust; this file only passes
// events in and writes the returned text out (always as text, never as markup).

import init, { Session } from './pkg/fivefold_web.js';

const $ = (id) => document.getElementById(id);
const canvas = $('board');
const status = $('status');
const note = $('note');
const log = $('log');
const rule = $('rule');

// The log keeps this many lines; older ones are dropped.
const KEEP = 300;
// Replies whose last sentence is also shown beside the board.
const NOTED = new Set(['refused', 'won', 'drawn', 'nothing']);

function say(line) {
  const item = document.createElement('li');
  item.textContent = line;
  log.append(item);
  while (log.childElementCount > KEEP) log.firstElementChild.remove();
  log.scrollTop = log.scrollHeight;
}

function show(reply) {
  if (!reply) return;
  for (const line of reply.say) say(line);
  status.textContent = reply.status;
  if (NOTED.has(reply.kind)) {
    note.textContent = reply.say[reply.say.length - 1];
    note.dataset.kind = reply.kind;
    note.hidden = false;
  } else {
    note.textContent = '';
    note.hidden = true;
  }
}

async function main() {
  try {
    await init();
  } catch (err) {
    status.textContent = `The board could not start in this browser (${err}).`;
    return;
  }
  const session = new Session(canvas, rule.value);
  session.showForbidden($('marks').checked);
  const fit = () => session.fit(window.devicePixelRatio || 1);
  fit();
  new ResizeObserver(fit).observe(canvas);
  window.addEventListener('resize', fit);
  status.textContent = session.status();

  canvas.addEventListener('click', (e) => show(session.tap(e.clientX, e.clientY)));
  $('undo').addEventListener('click', () => show(session.undo()));
  $('new').addEventListener('click', () => show(session.newGame(rule.value)));
  rule.addEventListener('change', () => show(session.newGame(rule.value)));
  $('marks').addEventListener('change', (e) => session.showForbidden(e.target.checked));
  $('enter').addEventListener('submit', (e) => {
    e.preventDefault();
    const field = $('point');
    show(session.play(field.value));
    field.select();
  });
  document.documentElement.dataset.ready = 'true';
}

main();
