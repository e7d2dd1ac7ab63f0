// @vitest-environment happy-dom
// The 3D view's software-renderer probe: SwiftShader / llvmpipe are recognised by the renderer string
// WebGL reports (WEBGL_debug_renderer_info), a GPU is not, and no WebGL at all is not "software".
import { afterEach, describe, expect, it, vi } from "vitest";

function fakeCanvas(renderer: string | null) {
  const gl = {
    getExtension: (name: string) =>
      name === "WEBGL_debug_renderer_info"
        ? { UNMASKED_RENDERER_WEBGL: 0x9246 }
        : name === "WEBGL_lose_context"
          ? { loseContext: () => {} }
          : null,
    getParameter: (p: number) => (p === 0x9246 ? renderer : null),
  };
  vi.spyOn(HTMLCanvasElement.prototype, "getContext").mockImplementation((() =>
    renderer === null ? null : gl) as unknown as HTMLCanvasElement["getContext"]);
}

async function probe(renderer: string | null): Promise<boolean> {
  vi.resetModules(); // the answer is cached per page load
  fakeCanvas(renderer);
  const { webglInSoftware } = await import("@/components/viewer/error-boundary");
  return webglInSoftware();
}

afterEach(() => vi.restoreAllMocks());

describe("drawing the 3D view in software", () => {
  it("is recognised for SwiftShader and llvmpipe, not for a GPU or without WebGL", async () => {
    expect(await probe("ANGLE (Google, Vulkan 1.3.0 (SwiftShader Device (Subzero)), SwiftShader driver)")).toBe(true);
    expect(await probe("llvmpipe (LLVM 15.0.6, 256 bits)")).toBe(true);
    expect(await probe("ANGLE (NVIDIA, NVIDIA GeForce RTX 3060 Direct3D11 vs_5_0 ps_5_0, D3D11)")).toBe(false);
    expect(await probe(null)).toBe(false);
  });
});
