/**
 * The transient solver's time loop (docs/design.md §2.2), in two implementations that do the same
 * arithmetic in the same order: `marchJs`, the reference (and the only one that takes behavioural
 * pads), and `marchWasm`, the same loop as a WebAssembly module (core/solver/march.wat), used for
 * linear nets when the host can instantiate it. The tests hold both to the same samples.
 */
import type { SparseLu } from './lu.js';
import type { PadSolver } from './pad.js';
import { MARCH_WASM_BASE64 } from './march-wasm.js';

/**
 * Element arrays and state for one edge run, set up outside the hot loop. Every companion source is
 * one number of state carried from step to step (docs/design.md §2.2):
 * - capacitor: J = (2C/h)·v + i, the source of the next step; after a step J' = 2·(2C/h)·v' − J;
 * - inductor: J = i + (h/2L)·v; after a step J' = 2·(h/2L)·v' + J;
 * - line end: e = v/Z0 + i in the ring; after a step e = 2·v/Z0 − Ih, Ih the history used in the step.
 * Each update is done at the start of the next step, in the same pass that adds the source to the
 * right-hand side, so every element is visited once per step.
 */
export interface RunState {
  /** Free nodes (the unknowns); x, rhs and rhsConst also hold the fixed nodes after them. */
  n: number;
  x: Float64Array;
  /** Right-hand side, starting as rhsConst; each free row is reset to it as the substitution reads it. */
  rhs: Float64Array;
  rhsConst: Float64Array;
  capA: Int32Array; capB: Int32Array; capG2: Float64Array; capJ: Float64Array;
  indA: Int32Array; indB: Int32Array; indG2: Float64Array; indJ: Float64Array;
  /** Per line, five integers: ring offset, ring mask, whole delay in steps, node a, node b. */
  lineInt: Int32Array;
  lineG2: Float64Array;
  /** Fraction of a step in each line's delay beyond its whole steps. */
  frac: Float64Array;
  /** Line k's ring: slot s holds [e_a, e_b] at offset + 2s; the slot of the sample being stepped parks [Ih_a, Ih_b]. */
  ring: Float64Array;
}

/** The time loop of a net without behavioural pads (marchJs or marchWasm). */
export type MarchLinear = (
  st: RunState, lu: SparseLu, h: number, steps: number, v0: number, v1: number, ramp: number, gd: number, drv: number,
  out: Float64Array, stride: number,
) => void;

/** True when the factors hold no entry off the diagonal and no row was swapped. */
function isDiagonal(lu: SparseLu, n: number): boolean {
  if (lu.lStart[n] !== 0 || lu.uStart[n] !== 0) return false;
  for (let i = 0; i < n; i++) if (lu.perm[i] !== i) return false;
  return true;
}

/**
 * The time loop: no allocation, no closures, no lookups by name; every array is a local typed array.
 * Samples go to one packed array, node i's sample m at out[i * stride + m]. Each step: the constant
 * right-hand side, the driver's source, then one pass per element kind that first completes the
 * element's state from the previous step's solution and then adds its source for this step; then the
 * substitution. When the factors hold no entry off the diagonal (every free node coupled to the others
 * only through lines, the usual net without series elements) and no row was swapped, the substitution
 * is one multiply per node (the diagonal fast path).
 */
export function marchJs(
  st: RunState, lu: SparseLu, h: number, steps: number, v0: number, v1: number, ramp: number, gd: number, drv: number,
  out: Float64Array, stride: number, pads: PadSolver | null = null,
): void {
  const { n, x, rhs, rhsConst, capA, capB, capG2, capJ, indA, indB, indG2, indJ } = st;
  const { lineInt, lineG2, frac, ring } = st;
  const { lStart, lCol, lVal, uStart, uCol, uVal, invDiag, perm } = lu;
  const nc = capA.length;
  const ni = indA.length;
  const nl = lineG2.length;
  const dv = v1 - v0;
  const diagonal = isDiagonal(lu, n);
  for (let m = 1; m <= steps; m++) {
    const time = m * h;
    const vs = ramp > 0 && time < ramp ? v0 + (dv * time) / ramp : v1;
    rhs[drv] += vs * gd;
    for (let k = 0; k < nc; k++) {
      const a = capA[k];
      const b = capB[k];
      const j = capG2[k] * (x[a] - x[b]) - capJ[k];
      capJ[k] = j;
      rhs[a] += j;
      rhs[b] -= j;
    }
    for (let k = 0; k < ni; k++) {
      const a = indA[k];
      const b = indB[k];
      const j = indG2[k] * (x[a] - x[b]) + indJ[k];
      indJ[k] = j;
      rhs[a] -= j;
      rhs[b] += j;
    }
    for (let k = 0, q = 0; k < nl; k++, q += 5) {
      const base = lineInt[q];
      const mask = lineInt[q + 1];
      const a = lineInt[q + 3];
      const b = lineInt[q + 4];
      // Complete the previous sample: e = 2v/Z0 − Ih at both ends (Ih parked in its slot).
      const pw = base + 2 * ((m - 1) & mask);
      const g2 = lineG2[k];
      ring[pw] = g2 * x[a] - ring[pw];
      ring[pw + 1] = g2 * x[b] - ring[pw + 1];
      // History at t − T = (m − D − f)·h: between slots m−D (weight 1−f) and m−D−1 (weight f).
      const s0 = (m - lineInt[q + 2]) & mask;
      const p0 = base + 2 * s0;
      const p1 = base + 2 * ((s0 - 1) & mask);
      const f = frac[k];
      const e0a = ring[p0];
      const e0b = ring[p0 + 1];
      const ha = e0b + f * (ring[p1 + 1] - e0b); // from end b
      const hb = e0a + f * (ring[p1] - e0a); // from end a
      // Park Ih in the slot of sample m (older than both read above) until the next step completes it.
      const ps = base + 2 * (m & mask);
      ring[ps] = ha;
      ring[ps + 1] = hb;
      rhs[a] += ha;
      rhs[b] += hb;
    }
    // Sparse forward/back substitution (see sparseLuSolve), inlined: writes the free nodes x[0..n).
    if (diagonal) {
      for (let i = 0; i < n; i++) {
        const xi = rhs[i] * invDiag[i];
        rhs[i] = rhsConst[i];
        x[i] = xi;
        out[i * stride + m] = xi;
      }
    } else {
      for (let i = 0; i < n; i++) {
        const row = perm[i];
        let acc = rhs[row];
        rhs[row] = rhsConst[row];
        for (let p = lStart[i], end = lStart[i + 1]; p < end; p++) acc -= lVal[p] * x[lCol[p]];
        x[i] = acc;
      }
      for (let i = n - 1; i >= 0; i--) {
        let acc = x[i];
        for (let p = uStart[i], end = uStart[i + 1]; p < end; p++) acc -= uVal[p] * x[uCol[p]];
        x[i] = acc * invDiag[i];
        out[i * stride + m] = x[i];
      }
    }
    // Behavioural pads (core/solver/pad.ts): x so far is the solution without their currents; the
    // samples are recorded again after the correction (a pass over n nodes costs less than
    // scattering the corrected entries).
    if (pads !== null) {
      pads.correct(x, time);
      for (let i = 0; i < n; i++) out[i * stride + m] = x[i];
    }
  }
}

type MarchExport = (...args: number[]) => void;

/** The kernel's memory, as the host's WebAssembly.Memory gives it. */
interface KernelMemory {
  readonly buffer: ArrayBuffer;
  grow(pages: number): number;
}

interface Kernel {
  memory: KernelMemory;
  march: MarchExport;
}

/** What the kernel needs of the host (core/ is built without the DOM's or Node's globals). */
interface WasmHost {
  WebAssembly?: {
    Module: new (bytes: Uint8Array) => object;
    Instance: new (module: object, imports: object) => { exports: Record<string, unknown> };
  };
  atob?: (base64: string) => string;
  process?: { env?: Record<string, string | undefined> };
}

let kernel: Kernel | null | undefined;

/**
 * The WebAssembly loop, instantiated on first use; null where the host cannot run it (then the
 * JavaScript loop runs). SLACKLINE_MARCH=js in the environment keeps the JavaScript loop (to compare).
 */
export function marchKernel(): Kernel | null {
  if (kernel !== undefined) return kernel;
  kernel = null;
  const host = globalThis as unknown as WasmHost;
  const wasm = host.WebAssembly;
  if (host.process?.env?.SLACKLINE_MARCH === 'js' || !wasm || !host.atob) return kernel;
  try {
    const text = host.atob(MARCH_WASM_BASE64);
    const bytes = new Uint8Array(text.length);
    for (let i = 0; i < text.length; i++) bytes[i] = text.charCodeAt(i);
    const instance = new wasm.Instance(new wasm.Module(bytes), {});
    kernel = { memory: instance.exports.memory as KernelMemory, march: instance.exports.march as MarchExport };
  } catch {
    kernel = null; // e.g. a page whose content security policy forbids compiling WebAssembly
  }
  return kernel;
}

/** Places typed arrays one after another in the kernel's memory (8-byte aligned), growing it as needed. */
class Layout {
  private at = 0;
  private readonly items: { offset: number; array: Float64Array | Int32Array }[] = [];
  add(array: Float64Array | Int32Array): number {
    const offset = this.at;
    this.items.push({ offset, array });
    this.at += Math.ceil(array.byteLength / 8) * 8;
    return offset;
  }
  reserve(bytes: number): number {
    const offset = this.at;
    this.at += Math.ceil(bytes / 8) * 8;
    return offset;
  }
  /** Grows `memory` to hold everything and copies the arrays in. */
  write(memory: KernelMemory): void {
    const page = 65536;
    if (this.at > memory.buffer.byteLength) memory.grow(Math.ceil((this.at - memory.buffer.byteLength) / page));
    const f64 = new Float64Array(memory.buffer);
    const i32 = new Int32Array(memory.buffer);
    for (const { offset, array } of this.items) {
      if (array instanceof Float64Array) f64.set(array, offset / 8);
      else i32.set(array, offset / 4);
    }
  }
}

/**
 * marchJs without pads, run by the WebAssembly kernel: the state is copied into the kernel's memory,
 * the loop runs there, and the samples are copied back into `out` (the state the loop leaves in `st`
 * is not: no caller reads it after the run). Needs marchKernel() to be non-null.
 */
export function marchWasm(
  st: RunState, lu: SparseLu, h: number, steps: number, v0: number, v1: number, ramp: number, gd: number, drv: number,
  out: Float64Array, stride: number,
): void {
  const k = marchKernel();
  if (k === null) throw new Error('marchWasm: the WebAssembly kernel is not available');
  const n = st.n;
  const layout = new Layout();
  const x = layout.add(st.x);
  const rhs = layout.add(st.rhs);
  const rhsConst = layout.add(st.rhsConst);
  const capA = layout.add(st.capA);
  const capB = layout.add(st.capB);
  const capG2 = layout.add(st.capG2);
  const capJ = layout.add(st.capJ);
  const indA = layout.add(st.indA);
  const indB = layout.add(st.indB);
  const indG2 = layout.add(st.indG2);
  const indJ = layout.add(st.indJ);
  const lineInt = layout.add(st.lineInt);
  const lineG2 = layout.add(st.lineG2);
  const frac = layout.add(st.frac);
  const ring = layout.add(st.ring);
  const perm = layout.add(lu.perm);
  const lStart = layout.add(lu.lStart);
  const lCol = layout.add(lu.lCol);
  const lVal = layout.add(lu.lVal);
  const uStart = layout.add(lu.uStart);
  const uCol = layout.add(lu.uCol);
  const uVal = layout.add(lu.uVal);
  const invDiag = layout.add(lu.invDiag);
  const samples = layout.reserve(8 * n * stride);
  layout.write(k.memory);
  // sample 0 of each node (set by the caller) travels with the rest of the samples
  const mem = k.memory.buffer;
  const outView = new Float64Array(mem, samples, n * stride);
  for (let i = 0; i < n; i++) outView[i * stride] = out[i * stride];
  k.march(
    n, st.capA.length, st.indA.length, st.lineG2.length, steps, h, v0, v1, ramp, gd, drv, stride, isDiagonal(lu, n) ? 1 : 0,
    x, rhs, rhsConst, capA, capB, capG2, capJ, indA, indB, indG2, indJ, lineInt, lineG2, frac, ring,
    perm, lStart, lCol, lVal, uStart, uCol, uVal, invDiag, samples,
  );
  out.set(outView);
}
