// Turn kernels of the one-turn map: WebAssembly SIMD where it validates, plain TypeScript elsewhere.
// Units: dt in s, dE in eV (PHYSICS.md §4). See types.ts for the interface, js.ts for the operations.
import { createJsKernel } from './js.ts';
import type { TurnKernel } from './types.ts';
import { createWasmKernel, createWasmKernelAsync, wasmSimdSupported } from './wasm.ts';

export * from './types.ts';
export * from './induced.ts';
export { createJsKernel } from './js.ts';
export { createWasmKernel, createWasmKernelAsync, wasmSimdSupported, type WasmTurnKernel } from './wasm.ts';
export { sinPoly, SIN_POLY_REL_ERROR, SIN_POLY_ABS_ERROR, SIN_POLY_MAX_ARG } from './sine.ts';

/** 'wasm' where this environment validates the SIMD kernel module, else 'js'. */
export function chooseKernel(): 'wasm' | 'js' {
  return wasmSimdSupported() ? 'wasm' : 'js';
}

/** A kernel of the given implementation (default: chooseKernel()); synchronous: Node and workers. */
export function createKernel(impl: 'wasm' | 'js' = chooseKernel(), options: { initialParticles?: number } = {}): TurnKernel {
  return impl === 'wasm' ? createWasmKernel(options) : createJsKernel();
}

/** As createKernel, asynchronously: use this on a page's main thread (no synchronous wasm compile there). */
export async function createKernelAsync(impl: 'wasm' | 'js' = chooseKernel(), options: { initialParticles?: number } = {}): Promise<TurnKernel> {
  return impl === 'wasm' ? createWasmKernelAsync(options) : createJsKernel();
}
