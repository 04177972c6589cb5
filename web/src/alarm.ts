/**
 * Getting attention on a phone: a beep (WebAudio) and a vibration on a new or re-signalled alert,
 * and keeping the screen on while the live board is open.
 *
 * Browsers only let a page make sound after a tap on it, so the sound is "armed" by the tap on
 * the "Alarm sound" switch; after a reload the switch stays on but needs one tap again, and the
 * board says so instead of staying silent without a word.
 */
import { prefs } from './prefs.ts';
import { createStore } from './store.ts';

let audio: AudioContext | null = null;

/** True once sound may play (the person tapped, the browser allowed it). */
export const soundArmed = createStore(false);

/** Call from a tap handler: creates or resumes the audio context. */
export async function armSound(): Promise<boolean> {
  try {
    const Ctor = window.AudioContext ?? (window as unknown as { webkitAudioContext?: typeof AudioContext }).webkitAudioContext;
    if (!Ctor) return false;
    audio ??= new Ctor();
    if (audio.state === 'suspended') await audio.resume();
    soundArmed.set(audio.state === 'running');
    return audio.state === 'running';
  } catch {
    soundArmed.set(false);
    return false;
  }
}

/**
 * Three falling tones: 880, 660, 880 Hz square wave, 0.18 s each. Square waves carry over site
 * noise better than sine; the pattern is ours, not a standard alarm signal.
 */
export function beep(): void {
  if (!audio || audio.state !== 'running') return;
  const t0 = audio.currentTime + 0.02;
  const tones = [880, 660, 880];
  tones.forEach((hz, i) => {
    const osc = audio!.createOscillator();
    const gain = audio!.createGain();
    osc.type = 'square';
    osc.frequency.value = hz;
    const start = t0 + i * 0.22;
    gain.gain.setValueAtTime(0.0001, start);
    gain.gain.exponentialRampToValueAtTime(0.25, start + 0.02);
    gain.gain.exponentialRampToValueAtTime(0.0001, start + 0.18);
    osc.connect(gain).connect(audio!.destination);
    osc.start(start);
    osc.stop(start + 0.2);
  });
}

/** Sound and vibration for one alert, as far as the person and the phone allow. */
export function signalAlert(): void {
  const p = prefs.get();
  if (p.alarmSound) beep();
  if (p.vibrate && 'vibrate' in navigator) {
    try {
      navigator.vibrate([300, 150, 300, 150, 600]);
    } catch {
      // Some browsers throw when vibration is blocked by a permission policy: nothing to do.
    }
  }
}

// ---- keeping the screen on ----

let wakeLock: WakeLockSentinel | null = null;
let wantAwake = false;
export const screenKeptOn = createStore<boolean | null>(null);

async function requestWakeLock(): Promise<void> {
  if (!wantAwake || document.visibilityState !== 'visible') return;
  if (!('wakeLock' in navigator)) {
    screenKeptOn.set(false);
    return;
  }
  try {
    wakeLock = await navigator.wakeLock.request('screen');
    screenKeptOn.set(true);
    wakeLock.addEventListener('release', () => {
      wakeLock = null;
      screenKeptOn.set(false);
    });
  } catch {
    // Refused (battery saver, not a secure context): the board says the screen may sleep.
    screenKeptOn.set(false);
  }
}

/** Keeps the screen on while `on` is true (the live board is open); released otherwise. */
export function keepScreenOn(on: boolean): void {
  wantAwake = on;
  if (on) void requestWakeLock();
  else {
    void wakeLock?.release();
    wakeLock = null;
    screenKeptOn.set(null);
  }
}

// The lock is dropped whenever the page is hidden; take it again when the board comes back.
document.addEventListener('visibilitychange', () => {
  if (document.visibilityState === 'visible' && wantAwake && wakeLock === null) void requestWakeLock();
});
