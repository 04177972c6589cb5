/**
 * Getting attention on a phone: a beep (WebAudio) and a vibration on a new or re-signalled alert,
 * and keeping the screen on while the live board is open.
 *
 * Browsers let a page make sound or vibrate only after the person has tapped it (user
 * activation): Chromium refuses navigator.vibrate before the first tap and logs an error for
 * every refused call. So nothing is asked for on load. The first tap anywhere on the page (or the
 * "Alarm sound" switch, or the board's "Tap to allow" button) arms both, once: from then on an
 * alert may vibrate and, with the switch on, sound. Until that tap the board says that the phone
 * will stay silent and still, instead of failing without a word.
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

/** True once the person has tapped the page (sticky user activation): vibration and sound may start. */
export const tapped = createStore(false);

function hasBeenTapped(): boolean {
  const activation = (navigator as Navigator & { userActivation?: { hasBeenActive: boolean } }).userActivation;
  return activation ? activation.hasBeenActive : tapped.get();
}

/**
 * Arms sound and vibration on the first tap or key press anywhere on the page, once. The events
 * are those that count as user activation (click after a tap or mouse press; keydown); the
 * listener goes away after the first.
 */
function armOnFirstTap(): void {
  const events = ['click', 'keydown', 'touchend'] as const;
  const onTap = () => {
    for (const e of events) document.removeEventListener(e, onTap, true);
    // After the event has run its course: a store change inside the tap would re-render the
    // screen under it (a radio button being checked would be set back before its change lands).
    setTimeout(() => {
      tapped.set(true);
      if (prefs.get().alarmSound) void armSound();
    }, 0);
  };
  for (const e of events) document.addEventListener(e, onTap, { capture: true, passive: true });
}
armOnFirstTap();

/** Sound and vibration for one alert, as far as the person and the phone allow. Never before the first tap. */
export function signalAlert(): void {
  const p = prefs.get();
  if (p.alarmSound) beep();
  if (p.vibrate && 'vibrate' in navigator && hasBeenTapped()) {
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
