"use client";
import { Component, type ReactNode } from "react";

interface State {
  error: Error | null;
}

/**
 * Keeps a failed 3D view (no WebGL, a lost context, a bad shape) from taking the page down: the
 * plots, the findings and the editor stay usable and the 3D view says what happened.
 */
export class StageErrorBoundary extends Component<{ children: ReactNode; onError?: (e: Error) => void }, State> {
  state: State = { error: null };

  static getDerivedStateFromError(error: Error): State {
    return { error };
  }

  componentDidCatch(error: Error) {
    this.props.onError?.(error);
  }

  render() {
    if (this.state.error) {
      return (
        <div
          role="alert"
          className="flex h-full flex-col items-center justify-center gap-2 bg-paper p-6 text-center text-sm text-ink-soft"
        >
          <p className="font-medium text-ink">The 3D view could not start.</p>
          <p>
            The browser refused a WebGL context ({this.state.error.message}). The moves, findings and plots still work;
            try another browser or enable hardware acceleration to see the arm.
          </p>
          <button type="button" className="text-brand-600 underline" onClick={() => this.setState({ error: null })}>
            Try again
          </button>
        </div>
      );
    }
    return this.props.children;
  }
}

let webglCached: boolean | undefined;

/** True when the browser can create a WebGL context at all (asked once per page). */
export function webglAvailable(): boolean {
  if (webglCached !== undefined) return webglCached;
  webglCached = probeWebgl();
  return webglCached;
}

function probeWebgl(): boolean {
  try {
    const c = document.createElement("canvas");
    return Boolean(c.getContext("webgl2") ?? c.getContext("webgl"));
  } catch {
    return false;
  }
}

let softwareCached: boolean | undefined;

/**
 * Whether WebGL is drawn in software (no GPU: SwiftShader, llvmpipe — headless browsers, virtual
 * machines, remote desktops), where every frame of the 3D view costs the request thread tens of
 * milliseconds; the view then draws at device pixel ratio 1 without multisampling.
 */
export function webglInSoftware(): boolean {
  if (softwareCached !== undefined) return softwareCached;
  softwareCached = false;
  try {
    const c = document.createElement("canvas");
    const gl = (c.getContext("webgl2") ?? c.getContext("webgl")) as WebGLRenderingContext | null;
    const info = gl?.getExtension("WEBGL_debug_renderer_info");
    const renderer = info && gl ? String(gl.getParameter(info.UNMASKED_RENDERER_WEBGL)) : "";
    softwareCached = /swiftshader|llvmpipe|softpipe|software/i.test(renderer);
    gl?.getExtension("WEBGL_lose_context")?.loseContext();
  } catch {
    softwareCached = false;
  }
  return softwareCached;
}
