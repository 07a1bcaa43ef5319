// Short sounds for a stone placed, a right move, a wrong move and a solved puzzle: off unless
// the player turns them on in Settings, synthesised here with the Web Audio API (no sound
// files). Each is a few oscillator notes with a quick fade, quiet, under half a second.

let soundsOn = false;
let audioContext = null;

// [frequency in Hz, start in s, length in s, wave] per note.
const SOUND_NOTES = {
  stone: [[190, 0, 0.06, 'triangle']],
  right: [[660, 0, 0.08, 'sine'], [880, 0.07, 0.11, 'sine']],
  wrong: [[330, 0, 0.12, 'triangle'], [220, 0.1, 0.2, 'triangle']],
  solved: [[523, 0, 0.1, 'sine'], [659, 0.09, 0.1, 'sine'], [784, 0.18, 0.22, 'sine']],
};

const SOUND_VOLUME = 0.12;

/** Turns the sounds on or off. */
export function setSounds(on) {
  soundsOn = !!on;
}

/** Plays one of the sounds above, if sounds are on and the browser can make them. */
export function sound(kind) {
  const notes = SOUND_NOTES[kind];
  if (!soundsOn || !notes) return;
  try {
    audioContext ??= new AudioContext();
    if (audioContext.state === 'suspended') audioContext.resume();
    const t0 = audioContext.currentTime + 0.01;
    for (const [freq, start, length, wave] of notes) {
      const osc = audioContext.createOscillator();
      const gain = audioContext.createGain();
      osc.type = wave;
      osc.frequency.value = freq;
      gain.gain.setValueAtTime(0, t0 + start);
      gain.gain.linearRampToValueAtTime(SOUND_VOLUME, t0 + start + 0.008);
      gain.gain.exponentialRampToValueAtTime(0.0001, t0 + start + length);
      osc.connect(gain).connect(audioContext.destination);
      osc.start(t0 + start);
      osc.stop(t0 + start + length + 0.02);
    }
    document.documentElement.dataset.lastSound = kind;
  } catch {
    // No audioContext here (or not yet allowed): play goes on in silence.
  }
}
