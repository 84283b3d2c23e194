/**
 * Loading the pipeline's WebAssembly kernels (blur.wat, compose.wat): compiled from their text
 * by scripts/gen-wasm.ts, shipped as base64, instantiated once per thread on first use. Each
 * kernel gives the same bits as the TypeScript loops it stands in for; where an engine has no
 * WebAssembly SIMD, or a page's policy refuses to compile it, the loops run instead.
 */

const PAGE = 65536;

/** The module's exports, or null when this engine cannot run it. */
export function instantiate<T>(base64: string): T | null {
  if (typeof WebAssembly !== 'object') return null;
  const bytes = Uint8Array.from(atob(base64), (ch) => ch.charCodeAt(0));
  // An engine without SIMD does not validate the module.
  if (!WebAssembly.validate(bytes)) return null;
  try {
    return new WebAssembly.Instance(new WebAssembly.Module(bytes), {}).exports as T;
  } catch {
    // A page whose Content-Security-Policy lacks 'wasm-unsafe-eval' may not compile it.
    return null;
  }
}

/** A module's memory grown to at least `bytes` bytes; views made before a growth are stale after it. */
export function reserve(memory: WebAssembly.Memory, bytes: number): ArrayBuffer {
  const short = bytes - memory.buffer.byteLength;
  if (short > 0) memory.grow(Math.ceil(short / PAGE));
  return memory.buffer;
}

/**
 * Buffers laid out one after the other in a module's memory, each on a 16-byte boundary: the
 * byte offset of each named region, and where the last one ends.
 */
export function layout<K extends string>(sizes: Record<K, number>): { at: Record<K, number>; end: number } {
  const at = {} as Record<K, number>;
  let end = 0;
  for (const name of Object.keys(sizes) as K[]) {
    at[name] = end;
    end += Math.ceil(sizes[name] / 16) * 16;
  }
  return { at, end };
}

let enabled = true;

/** Whether the kernels may run (tests switch them off to compare with the loops). */
export function kernelsEnabled(): boolean {
  return enabled;
}

/** Switches every kernel off (the TypeScript loops run) or back on: for tests that compare the two. */
export function useKernels(on: boolean): void {
  enabled = on;
}
