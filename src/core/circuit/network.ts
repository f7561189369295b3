/**
 * Nodal analysis of the small linear network an oscillator is in one output
 * state (DESIGN §3.1). The timing-capacitor node voltage v is the state
 * variable and the output-stage source voltage is a parameter, so every other
 * node voltage, and the capacitor current, is affine in (v, vSource):
 *
 *     V_k = c0[k] + cv[k]·v + cs[k]·vSource          (+ cp[k]·I for a unit probe current)
 *     iCap = q0 + qv·v + qs·vSource                   (current into the capacitor)
 *
 * One elimination with four right-hand sides (constants, ∂/∂v, ∂/∂vSource,
 * unit current injected at the probe node) gives all of it. The probe column is
 * the Thevenin resistance seen at the probe node, used to size bias-current
 * errors. Topologies only describe branches; no per-topology formulas.
 */
import { CoreError } from '../errors.ts';

/** A resistive branch with an optional series EMF (a diode's forward drop).
 *  Current from `from` to `to` is (V_from − V_to − emfV) / resistanceOhm. */
export interface Branch {
  from: number;
  to: number;
  resistanceOhm: number;
  emfV: number;
  /** Label used for currents reported back (e.g. the part role). */
  label: string;
}

export interface NetworkSpec {
  nodeCount: number;
  /** Voltage of each node that is held by a rail (NaN for unknown nodes). Index 0 is ground, 0 V. */
  fixedV: ArrayLike<number>;
  /** Node whose voltage is the capacitor voltage v. */
  capNode: number;
  /** Node held at the output-stage source voltage (−1 when the output stage does not drive, e.g. open drain off). */
  sourceNode: number;
  /** Node whose Thevenin resistance is wanted (the decision node P). */
  probeNode: number;
  branches: readonly Branch[];
  /** Current injected into each node from outside the network (bias currents drawn out are negative), A. */
  injectionA: ArrayLike<number>;
}

/** Affine node solution: four coefficients per node (stride 4: const, v, source, probe). */
export interface NetworkSolution {
  spec: NetworkSpec;
  coeff: Float64Array;
  /** Capacitor current coefficients: const, per volt of v, per volt of source. */
  capConstA: number;
  capPerVoltV: number;
  capPerSourceV: number;
}

const STRIDE = 4;

export function solveNetwork(spec: NetworkSpec): NetworkSolution {
  const n = spec.nodeCount;
  const coeff = new Float64Array(n * STRIDE);
  // Map unknown nodes to matrix rows (scratch reused across calls: solves are synchronous and tiny,
  // and analyses run thousands per second, so per-call scratch would only feed the garbage collector).
  const row = scratchRows(n);
  let m = 0;
  for (let k = 0; k < n; k++) {
    if (k === spec.capNode) {
      coeff[k * STRIDE + 1] = 1;
    } else if (k === spec.sourceNode) {
      coeff[k * STRIDE + 2] = 1;
    } else if (Number.isNaN(spec.fixedV[k])) {
      row[k] = m++;
    } else {
      coeff[k * STRIDE] = spec.fixedV[k];
    }
  }
  const width = m + STRIDE; // augmented matrix: m columns + 4 right-hand sides
  const a = scratchMatrix(m * width);
  for (let k = 0; k < n; k++) {
    const r = row[k];
    if (r >= 0) {
      a[r * width + m] = spec.injectionA[k];
      if (k === spec.probeNode) a[r * width + m + 3] = 1;
    }
  }
  for (const b of spec.branches) {
    if (!(b.resistanceOhm > 0)) {
      throw new CoreError('invalid-value', `Branch ${b.label} needs a resistance > 0`);
    }
    const g = 1 / b.resistanceOhm;
    stampEnd(a, width, m, row, coeff, b.from, b.to, g, b.emfV);
    stampEnd(a, width, m, row, coeff, b.to, b.from, g, -b.emfV);
  }
  eliminate(a, m, width, spec);
  for (let k = 0; k < n; k++) {
    const r = row[k];
    if (r >= 0) {
      for (let c = 0; c < STRIDE; c++) coeff[k * STRIDE + c] = a[r * width + m + c];
    }
  }
  // Current into the capacitor = external injection at N minus currents leaving N through branches.
  let q0 = spec.injectionA[spec.capNode];
  let qv = 0;
  let qs = 0;
  for (const b of spec.branches) {
    let sign: number;
    let other: number;
    let emf: number;
    if (b.from === spec.capNode) {
      sign = 1;
      other = b.to;
      emf = b.emfV;
    } else if (b.to === spec.capNode) {
      sign = 1;
      other = b.from;
      emf = -b.emfV;
    } else continue;
    const g = sign / b.resistanceOhm;
    // leaving = g·(v − V_other − emf)
    q0 -= g * (-coeff[other * STRIDE] - emf);
    qv -= g * (1 - coeff[other * STRIDE + 1]);
    qs -= g * -coeff[other * STRIDE + 2];
  }
  return { spec, coeff, capConstA: q0, capPerVoltV: qv, capPerSourceV: qs };
}

let rowScratch = new Int32Array(16);
let matrixScratch = new Float64Array(256);

function scratchRows(n: number): Int32Array {
  if (rowScratch.length < n) rowScratch = new Int32Array(2 * n);
  rowScratch.fill(-1, 0, n);
  return rowScratch;
}

function scratchMatrix(size: number): Float64Array {
  if (matrixScratch.length < size) matrixScratch = new Float64Array(2 * size);
  matrixScratch.fill(0, 0, size);
  return matrixScratch;
}

/** Stamp one end of a branch (node p, far end q) into KCL row of p. */
function stampEnd(
  a: Float64Array,
  width: number,
  m: number,
  row: Int32Array,
  coeff: Float64Array,
  p: number,
  q: number,
  g: number,
  emf: number,
): void {
  const rp = row[p];
  if (rp < 0) return; // known node: no equation
  const base = rp * width;
  a[base + rp] += g;
  a[base + m] += g * emf;
  const rq = row[q];
  if (rq >= 0) {
    a[base + rq] -= g;
  } else {
    // Known far end: move g·V_q (affine in v and source) to the right-hand side.
    for (let c = 0; c < 3; c++) a[base + m + c] += g * coeff[q * STRIDE + c];
  }
}

/** Gauss–Jordan on the m×m system with 4 right-hand sides; a missing pivot is a floating node. */
function eliminate(a: Float64Array, m: number, width: number, spec: NetworkSpec): void {
  if (!gaussJordan(a, m, width)) {
    throw new CoreError('no-oscillation', `The network has a floating node (no DC path) in a ${spec.nodeCount}-node state`);
  }
}

/**
 * Gauss–Jordan elimination with partial pivoting, in place, on an m×m system
 * stored row-major with `width − m` right-hand sides after the matrix. False
 * when a column has no pivot (a node without a DC path). Shared with the
 * compiled evaluator so both give bit-identical answers.
 */
export function gaussJordan(a: Float64Array, m: number, width: number): boolean {
  for (let col = 0; col < m; col++) {
    let pivot = col;
    let best = Math.abs(a[col * width + col]);
    for (let r = col + 1; r < m; r++) {
      const v = Math.abs(a[r * width + col]);
      if (v > best) {
        best = v;
        pivot = r;
      }
    }
    if (!(best > 0)) return false;
    if (pivot !== col) {
      for (let c = 0; c < width; c++) {
        const t = a[col * width + c];
        a[col * width + c] = a[pivot * width + c];
        a[pivot * width + c] = t;
      }
    }
    const inv = 1 / a[col * width + col];
    for (let c = col; c < width; c++) a[col * width + c] *= inv;
    for (let r = 0; r < m; r++) {
      if (r === col) continue;
      const f = a[r * width + col];
      if (f === 0) continue;
      for (let c = col; c < width; c++) a[r * width + c] -= f * a[col * width + c];
    }
  }
  return true;
}

/** Voltage of a node for given v and source voltage. */
export function nodeVoltage(sol: NetworkSolution, node: number, capV: number, sourceV: number): number {
  const c = sol.coeff;
  const i = node * STRIDE;
  return c[i] + c[i + 1] * capV + c[i + 2] * sourceV;
}

/** Affine pieces of a node voltage: {constV, perCapV, perSourceV}. */
export function nodeAffine(sol: NetworkSolution, node: number): { constV: number; perCapV: number; perSourceV: number } {
  const c = sol.coeff;
  const i = node * STRIDE;
  return { constV: c[i], perCapV: c[i + 1], perSourceV: c[i + 2] };
}

/** Thevenin resistance seen at the probe node (voltage rise per ampere injected), ohm. */
export function probeResistanceOhm(sol: NetworkSolution): number {
  return sol.coeff[sol.spec.probeNode * STRIDE + 3];
}

/** Current through a branch (from → to) as an affine function: returns {constA, perCapA, perSourceA}. */
export function branchCurrentAffine(sol: NetworkSolution, b: Branch): { constA: number; perCapA: number; perSourceA: number } {
  const c = sol.coeff;
  const f = b.from * STRIDE;
  const t = b.to * STRIDE;
  const g = 1 / b.resistanceOhm;
  return {
    constA: g * (c[f] - c[t] - b.emfV),
    perCapA: g * (c[f + 1] - c[t + 1]),
    perSourceA: g * (c[f + 2] - c[t + 2]),
  };
}
