import { useCallback, useEffect, useRef, useState } from 'react';

const SOUND_KEY = 'steadyhand.wall.sound';

function readSetting(): boolean {
  try {
    return localStorage.getItem(SOUND_KEY) === 'on';
  } catch {
    return false;
  }
}

type AudioCtor = typeof AudioContext;

/** Two short tones; no file to load, nothing to fail offline. */
function beep(ctx: AudioContext): void {
  const start = ctx.currentTime + 0.02;
  for (const [i, freq] of [880, 660].entries()) {
    const osc = ctx.createOscillator();
    const gain = ctx.createGain();
    osc.type = 'sine';
    osc.frequency.value = freq;
    const t = start + i * 0.3;
    gain.gain.setValueAtTime(0.0001, t);
    gain.gain.exponentialRampToValueAtTime(0.4, t + 0.02);
    gain.gain.exponentialRampToValueAtTime(0.0001, t + 0.25);
    osc.connect(gain).connect(ctx.destination);
    osc.start(t);
    osc.stop(t + 0.27);
  }
}

/**
 * The wall's optional sound cue: off by default, remembered on this device. It sounds when a key
 * appears that was not there before (a rhythm check or an epinephrine dose falling due), never
 * for what was already due when the wall opened.
 */
export function useSoundCue(keys: readonly string[]): { on: boolean; toggle: () => void } {
  const [on, setOn] = useState(readSetting);
  const ctxRef = useRef<AudioContext | null>(null);
  const seen = useRef<Set<string> | null>(null);

  const ensureContext = useCallback((): AudioContext | null => {
    if (ctxRef.current) return ctxRef.current;
    const Ctor = (window.AudioContext ??
      (window as unknown as { webkitAudioContext?: AudioCtor }).webkitAudioContext) as AudioCtor | undefined;
    if (!Ctor) return null;
    try {
      ctxRef.current = new Ctor();
    } catch {
      return null;
    }
    return ctxRef.current;
  }, []);

  const toggle = useCallback(() => {
    const next = !on;
    setOn(next);
    try {
      localStorage.setItem(SOUND_KEY, next ? 'on' : 'off');
    } catch {
      // not remembered; still toggled for this page
    }
    if (next) {
      // Turning it on is a tap: the browser lets audio start here, and a tone confirms it.
      const ctx = ensureContext();
      if (ctx) {
        void ctx.resume().catch(() => undefined);
        beep(ctx);
      }
    }
  }, [on, ensureContext]);

  const joined = keys.join('|');
  useEffect(() => {
    const current = new Set(joined ? joined.split('|') : []);
    const before = seen.current;
    seen.current = current;
    if (!before || !on) return;
    const fresh = [...current].some((k) => !before.has(k));
    if (!fresh) return;
    const ctx = ensureContext();
    if (!ctx) return;
    void ctx.resume().catch(() => undefined);
    beep(ctx);
  }, [joined, on, ensureContext]);

  useEffect(
    () => () => {
      void ctxRef.current?.close().catch(() => undefined);
      ctxRef.current = null;
    },
    [],
  );

  return { on, toggle };
}
