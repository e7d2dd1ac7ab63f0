"use client";
/**
 * The playhead shared by the stage, the plots and the scrubber: the current time on the plan's
 * timeline and whether it is playing. Kept outside React state so the 3D view can read it every
 * frame without re-rendering the page; React parts subscribe with {@link usePlayhead}.
 */
import { createContext, useContext, useEffect, useSyncExternalStore } from "react";

export interface PlayheadState {
  timeS: number;
  playing: boolean;
  totalS: number;
}

export class Playhead {
  private state: PlayheadState = { timeS: 0, playing: false, totalS: 0 };
  private listeners = new Set<() => void>();
  private frame = 0;
  private last = 0;

  get = (): PlayheadState => this.state;

  subscribe = (listener: () => void): (() => void) => {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  };

  private set(patch: Partial<PlayheadState>) {
    const next = { ...this.state, ...patch };
    next.timeS = Math.min(Math.max(0, next.timeS), next.totalS);
    if (next.timeS === this.state.timeS && next.playing === this.state.playing && next.totalS === this.state.totalS)
      return;
    this.state = next;
    for (const l of this.listeners) l();
  }

  setTotal(totalS: number) {
    this.set({ totalS: Math.max(0, totalS) });
  }

  seek(timeS: number) {
    this.set({ timeS });
  }

  play() {
    if (this.state.totalS <= 0) return;
    if (this.state.timeS >= this.state.totalS) this.set({ timeS: 0 });
    this.set({ playing: true });
    this.last = performance.now();
    const tick = (now: number) => {
      if (!this.state.playing) return;
      const dt = (now - this.last) / 1000;
      this.last = now;
      const t = this.state.timeS + dt;
      if (t >= this.state.totalS) {
        this.set({ timeS: this.state.totalS, playing: false });
        return;
      }
      this.set({ timeS: t });
      this.frame = requestAnimationFrame(tick);
    };
    this.frame = requestAnimationFrame(tick);
  }

  pause() {
    cancelAnimationFrame(this.frame);
    this.set({ playing: false });
  }

  toggle() {
    if (this.state.playing) this.pause();
    else this.play();
  }
}

export const PlayheadContext = createContext<Playhead | null>(null);

export function usePlayheadStore(): Playhead {
  const p = useContext(PlayheadContext);
  if (!p) throw new Error("usePlayheadStore needs a PlayheadContext provider");
  return p;
}

/** The playhead's state, re-rendering on every change (use sparingly: it changes every frame while playing). */
export function usePlayhead(): PlayheadState {
  const p = usePlayheadStore();
  return useSyncExternalStore(p.subscribe, p.get, p.get);
}

/** Keeps the playhead's total in step with the plan's duration. */
export function useSyncTotal(p: Playhead, totalS: number) {
  useEffect(() => {
    p.setTotal(totalS);
  }, [p, totalS]);
}
