/**
 * Laplace's equation ∇·(εr ∇φ) = 0 on a graded rectangular grid by the box-integration
 * (finite-volume) five-point difference scheme, solved by conjugate gradients preconditioned with the
 * modified incomplete Cholesky factorisation MIC(0) (docs/field-solver.md §4).
 * - Box integration: the flux between neighbours i and j is G_ij·(φ_i − φ_j) with
 *   G_ij = Σ over the two cells beside the link of εr·(half the cell's width across the link)/(link
 *   length) (R. S. Varga, Matrix Iterative Analysis, 1962, §6.3); dielectric interfaces on grid lines
 *   are then exact flux continuity.
 * - CG: M. R. Hestenes and E. Stiefel, J. Res. NBS 49, 1952; MIC(0) with relaxation ω:
 *   I. Gustafsson, BIT 18, 1978 (ω = 1 is the modified factorisation, ω = 0 plain IC(0) of
 *   J. A. Meijerink and H. A. van der Vorst, Math. Comp. 31, 1977).
 * All work arrays are allocated once per grid; the solve loop allocates nothing. Storage is row-major
 * with a guard band of nx + 1 zeros on both ends so that the stencil needs no bounds tests.
 */
import { InputError } from '../errors.js';
import { FREE, type Grid } from './grid.js';

/** MIC relaxation: just under 1 keeps the pivots safely positive on strongly graded grids. */
const OMEGA = 1;

export interface SolveStats {
  iterations: number;
  /** Final ‖r‖/‖b‖. */
  residual: number;
}

export class LaplaceSystem {
  readonly grid: Grid;
  private readonly pad: number;
  private readonly size: number;
  /** Link conductances to the east (k → k+1) and north (k → k+nx) neighbour, all links. */
  private readonly gxAll: Float64Array;
  private readonly gyAll: Float64Array;
  /** The same links with every link that touches a held node set to zero (the reduced matrix). */
  private readonly gx: Float64Array;
  private readonly gy: Float64Array;
  private readonly diag: Float64Array;
  private readonly invPivot: Float64Array;
  /** Potential: held values on fixed nodes, the solution elsewhere. */
  readonly phi: Float64Array;
  private readonly b: Float64Array;
  private readonly r: Float64Array;
  private readonly z: Float64Array;
  private readonly p: Float64Array;
  private readonly q: Float64Array;
  private readonly fixedNode: Uint8Array;

  constructor(grid: Grid) {
    this.grid = grid;
    const { nx, ny } = grid;
    this.pad = nx + 1;
    this.size = nx * ny + 2 * this.pad;
    const n = this.size;
    this.gxAll = new Float64Array(n);
    this.gyAll = new Float64Array(n);
    this.gx = new Float64Array(n);
    this.gy = new Float64Array(n);
    this.diag = new Float64Array(n);
    this.invPivot = new Float64Array(n);
    this.phi = new Float64Array(n);
    this.b = new Float64Array(n);
    this.r = new Float64Array(n);
    this.z = new Float64Array(n);
    this.p = new Float64Array(n);
    this.q = new Float64Array(n);
    this.fixedNode = new Uint8Array(n);
    for (let m = 0; m < nx * ny; m++) this.fixedNode[m + this.pad] = grid.kind[m] === FREE ? 0 : 1;
  }

  /** Index of node (i, j) in the padded arrays. */
  index(i: number, j: number): number {
    return this.pad + j * this.grid.nx + i;
  }

  /**
   * Assembles the links for the given cell permittivities (the grid's own, or all 1 for vacuum) and
   * factorises the preconditioner.
   */
  assemble(cellEr: Float64Array): void {
    const { nx, ny, xs, ys } = this.grid;
    const cx = nx - 1;
    const { gxAll, gyAll, gx, gy, diag, invPivot, fixedNode, pad } = this;
    gxAll.fill(0);
    gyAll.fill(0);
    for (let j = 0; j < ny; j++) {
      for (let i = 0; i < nx; i++) {
        const k = pad + j * nx + i;
        if (i < nx - 1) {
          const dx = xs[i + 1] - xs[i];
          let w = 0;
          if (j > 0) w += cellEr[(j - 1) * cx + i] * 0.5 * (ys[j] - ys[j - 1]);
          if (j < ny - 1) w += cellEr[j * cx + i] * 0.5 * (ys[j + 1] - ys[j]);
          gxAll[k] = w / dx;
        }
        if (j < ny - 1) {
          const dy = ys[j + 1] - ys[j];
          let w = 0;
          if (i > 0) w += cellEr[j * cx + i - 1] * 0.5 * (xs[i] - xs[i - 1]);
          if (i < nx - 1) w += cellEr[j * cx + i] * 0.5 * (xs[i + 1] - xs[i]);
          gyAll[k] = w / dy;
        }
      }
    }
    const end = pad + nx * ny;
    for (let k = pad; k < end; k++) {
      const free = fixedNode[k] === 0;
      gx[k] = free && fixedNode[k + 1] === 0 ? gxAll[k] : 0;
      gy[k] = free && fixedNode[k + nx] === 0 ? gyAll[k] : 0;
      diag[k] = free ? gxAll[k] + gxAll[k - 1] + gyAll[k] + gyAll[k - nx] : 1;
    }
    // MIC(0) pivots (Gustafsson 1978): d_k = a_k − Σ g²/d − ω·Σ (dropped fill g_x·g_y/d).
    for (let k = pad; k < end; k++) {
      if (fixedNode[k] !== 0) {
        invPivot[k] = 1;
        continue;
      }
      let d = diag[k];
      const w = k - 1;
      const s = k - nx;
      if (gx[w] !== 0) d -= gx[w] * (gx[w] + OMEGA * gy[w]) * invPivot[w];
      if (gy[s] !== 0) d -= gy[s] * (gy[s] + OMEGA * gx[s]) * invPivot[s];
      if (!(d > 1e-12 * diag[k])) d = diag[k]; // fall back to the diagonal where the pivot would vanish
      invPivot[k] = 1 / d;
    }
  }

  /** Holds conductor `driven` (0-based) at 1 V and every other held node at 0 V; clears free nodes unless warm. */
  private excite(driven: number, warm: boolean): void {
    const { kind } = this.grid;
    const { phi, pad } = this;
    const m = kind.length;
    const tag = driven + 1;
    for (let n = 0; n < m; n++) {
      const kn = kind[n];
      if (kn !== FREE) phi[n + pad] = kn === tag ? 1 : 0;
      else if (!warm) phi[n + pad] = 0;
    }
  }

  /** z = M⁻¹·r by the forward and backward MIC substitutions; returns r·z (fused into the sweep). */
  private applyPreconditioner(): number {
    const { r, z, gx, gy, invPivot, pad } = this;
    const nx = this.grid.nx;
    const end = pad + nx * this.grid.ny;
    for (let k = pad; k < end; k++) z[k] = (r[k] + gx[k - 1] * z[k - 1] + gy[k - nx] * z[k - nx]) * invPivot[k];
    let rz = 0;
    for (let k = end - 1; k >= pad; k--) {
      const zk = z[k] + (gx[k] * z[k + 1] + gy[k] * z[k + nx]) * invPivot[k];
      z[k] = zk;
      rz += r[k] * zk;
    }
    return rz;
  }

  /** q = A·p on the free nodes (p is zero on held nodes); returns p·q (fused). */
  private multiply(): number {
    const { p, q, gx, gy, diag, pad } = this;
    const nx = this.grid.nx;
    const end = pad + nx * this.grid.ny;
    let pq = 0;
    for (let k = pad; k < end; k++) {
      const pk = p[k];
      const qk = diag[k] * pk - gx[k] * p[k + 1] - gx[k - 1] * p[k - 1] - gy[k] * p[k + nx] - gy[k - nx] * p[k - nx];
      q[k] = qk;
      pq += pk * qk;
    }
    return pq;
  }

  /**
   * Solves for conductor `driven` at 1 V, the others and the planes at 0 V. `warm` keeps the free-node
   * values already in phi as the starting guess (the caller put a nearby solution there).
   * Throws InputError when CG does not reach `tolerance` within `maxIterations`.
   */
  solve(driven: number, tolerance: number, maxIterations: number, warm = false): SolveStats {
    const { phi, b, r, z, p, q, gxAll, gyAll, fixedNode, pad } = this;
    const nx = this.grid.nx;
    const end = pad + nx * this.grid.ny;
    this.excite(driven, warm);
    // b = coupling from held nodes into free nodes; the unknown u is φ on free nodes.
    let bNorm = 0;
    for (let k = pad; k < end; k++) {
      if (fixedNode[k] !== 0) {
        b[k] = 0;
        continue;
      }
      let v = 0;
      if (fixedNode[k + 1] !== 0) v += gxAll[k] * phi[k + 1];
      if (fixedNode[k - 1] !== 0) v += gxAll[k - 1] * phi[k - 1];
      if (fixedNode[k + nx] !== 0) v += gyAll[k] * phi[k + nx];
      if (fixedNode[k - nx] !== 0) v += gyAll[k - nx] * phi[k - nx];
      b[k] = v;
      bNorm += v * v;
    }
    bNorm = Math.sqrt(bNorm);
    if (!(bNorm > 0)) throw new InputError(`trace ${driven + 1}`, 'no free node touches this conductor: the mesh cannot resolve it');
    // r = b − A·u for the starting guess u (p holds u, zero on held nodes, while A·u is formed).
    for (let k = pad; k < end; k++) p[k] = fixedNode[k] === 0 ? phi[k] : 0;
    this.multiply();
    let r0 = 0;
    for (let k = pad; k < end; k++) {
      r[k] = b[k] - q[k];
      r0 += r[k] * r[k];
    }
    // A warm start may already be the solution (the dielectric potential reused in vacuum when the
    // dielectric is homogeneous): then nothing moves, and C = εr·C0 holds exactly.
    if (Math.sqrt(r0) / bNorm < tolerance) return { iterations: 0, residual: Math.sqrt(r0) / bNorm };
    let rz = this.applyPreconditioner();
    for (let k = pad; k < end; k++) p[k] = z[k];
    let it = 0;
    let rNorm = Infinity;
    for (; it < maxIterations; it++) {
      const alpha = rz / this.multiply();
      let rr = 0;
      for (let k = pad; k < end; k++) {
        phi[k] += alpha * p[k]; // p is zero on held nodes
        const rk = r[k] - alpha * q[k];
        r[k] = rk;
        rr += rk * rk;
      }
      rNorm = Math.sqrt(rr) / bNorm;
      if (!Number.isFinite(rNorm)) break;
      if (rNorm < tolerance) {
        it++;
        break;
      }
      const rzNew = this.applyPreconditioner();
      const beta = rzNew / rz;
      rz = rzNew;
      for (let k = pad; k < end; k++) p[k] = z[k] + beta * p[k];
    }
    if (!(rNorm < tolerance)) {
      throw new InputError('field solver mesh', `the iterative solve did not converge (relative residual ${rNorm.toExponential(2)} after ${it} iterations, wanted ${tolerance})`);
    }
    return { iterations: it, residual: rNorm };
  }

  /**
   * Charge on each conductor (per unit ε0, per metre) for the potential in phi: discrete Gauss's law,
   * the net flux G·(φ_inside − φ_outside) through every link that leaves the conductor
   * (docs/field-solver.md §4). `out[c]` receives conductor c's charge.
   */
  charges(out: Float64Array): void {
    const { kind, nx, ny } = this.grid;
    const { phi, gxAll, gyAll, pad } = this;
    out.fill(0);
    for (let j = 0; j < ny; j++) {
      for (let i = 0; i < nx; i++) {
        const n = j * nx + i;
        const a = kind[n];
        const k = n + pad;
        if (i < nx - 1) {
          const bKind = kind[n + 1];
          if (a !== bKind) {
            const flux = gxAll[k] * (phi[k] - phi[k + 1]);
            if (a > 0) out[a - 1] += flux;
            if (bKind > 0) out[bKind - 1] -= flux;
          }
        }
        if (j < ny - 1) {
          const bKind = kind[n + nx];
          if (a !== bKind) {
            const flux = gyAll[k] * (phi[k] - phi[k + nx]);
            if (a > 0) out[a - 1] += flux;
            if (bKind > 0) out[bKind - 1] -= flux;
          }
        }
      }
    }
  }

  /** Puts a starting guess (nx·ny, row-major) into the free nodes, for a warm `solve`. */
  seed(guess: Float64Array): void {
    const { phi, pad, fixedNode } = this;
    for (let n = 0; n < guess.length; n++) if (fixedNode[n + pad] === 0) phi[n + pad] = guess[n];
  }

  /** Copies the potential on the grid (nx·ny, row-major) into `out`. */
  potential(out: Float64Array): void {
    out.set(this.phi.subarray(this.pad, this.pad + this.grid.nx * this.grid.ny));
  }
}
