/**
 * The grid graded toward the poles (numerics.md §2). The cell size at distance d
 * from a pole is  Δ(d) = min(Δmax, δ + κ·d):  uniform (≈ δ) below d ≈ δ/κ, geometric
 * with ratio ≈ 1 + κ above it, and uniform Δmax in the bulk. The nodes are
 * equidistant in the stretched coordinate φ(r) = ∫₀^r dr'/Δ(r'), which is
 * integrated and inverted in closed form, so a grid is a deterministic function of
 * its parameters. Refinement toward a singularity only lowers δ at one pole.
 */
export interface GridParams {
  /** Right end R of the computational interval. */
  length: number;
  leftPole: boolean;
  rightPole: boolean;
  /** Cell size at the left / right pole (ignored when that end is not a pole). */
  deltaLeft: number;
  deltaRight: number;
  /** Growth rate of the cell size with the distance to a pole. */
  kappa: number;
  /** Bulk cell size. */
  spacingMax: number;
}

interface Segment {
  kind: 0 | 1 | 2; // 0: left-graded, 1: uniform, 2: right-graded
  a: number;
  b: number;
  phiA: number;
}

function segments(p: GridParams): { segs: Segment[]; total: number } {
  const R = p.length;
  const k = p.kappa;
  const dm = p.spacingMax;
  let leftEnd = p.leftPole ? Math.max(0, Math.min(R, (dm - p.deltaLeft) / k)) : 0;
  let rightStart = p.rightPole ? Math.min(R, Math.max(0, R - (dm - p.deltaRight) / k)) : R;
  if (leftEnd > rightStart) {
    // The two graded zones meet before reaching Δmax: switch where the lines cross.
    const rc = (p.deltaRight - p.deltaLeft + k * R) / (2 * k);
    leftEnd = rightStart = Math.min(R, Math.max(0, rc));
  }
  const segs: Segment[] = [];
  let phi = 0;
  if (leftEnd > 0) {
    segs.push({ kind: 0, a: 0, b: leftEnd, phiA: phi });
    phi += Math.log1p((k * leftEnd) / p.deltaLeft) / k;
  }
  if (rightStart > leftEnd) {
    segs.push({ kind: 1, a: leftEnd, b: rightStart, phiA: phi });
    phi += (rightStart - leftEnd) / dm;
  }
  if (rightStart < R) {
    segs.push({ kind: 2, a: rightStart, b: R, phiA: phi });
    const da = R - rightStart;
    phi += Math.log1p((k * da) / p.deltaRight) / k;
  }
  return { segs, total: phi };
}

/** Number of cells the parameters ask for (before rounding up to an integer). */
export function stretchedLength(p: GridParams): number {
  return segments(p).total;
}

/** Nodes r_0 = 0 < r_1 < … < r_cells = R, equidistant in φ. */
export function buildNodes(p: GridParams, cells: number): Float64Array {
  const { segs, total } = segments(p);
  const r = new Float64Array(cells + 1);
  const k = p.kappa;
  let s = 0;
  for (let i = 1; i < cells; i++) {
    const phi = (i * total) / cells;
    while (s + 1 < segs.length && phi >= segs[s + 1]!.phiA) s++;
    const seg = segs[s]!;
    const x = phi - seg.phiA;
    if (seg.kind === 0) {
      r[i] = seg.a + ((p.deltaLeft + k * seg.a) * Math.expm1(k * x)) / k;
    } else if (seg.kind === 1) {
      r[i] = seg.a + x * p.spacingMax;
    } else {
      const da = p.length - seg.a;
      const d = da + ((p.deltaRight + k * da) * Math.expm1(-k * x)) / k;
      r[i] = p.length - d;
    }
  }
  r[0] = 0;
  r[cells] = p.length;
  return r;
}

/** Grading used at the start of a run: cell size at a pole = Δmax / POLE_GRADING. */
export const POLE_GRADING = 10;

/**
 * Initial grid with exactly `points` nodes: Δmax is chosen so that φ(R) = points − 1,
 * δ = Δmax/10 at each pole and the graded zone reaches Δmax at distance
 * min(R/4, π/4). Doubling `points` halves every cell and nests the grids.
 */
export function initialGridParams(
  length: number,
  leftPole: boolean,
  rightPole: boolean,
  points: number,
): GridParams {
  const zone = Math.min(length / 4, Math.PI / 4);
  const unit: GridParams = {
    length,
    leftPole,
    rightPole,
    deltaLeft: 1 / POLE_GRADING,
    deltaRight: 1 / POLE_GRADING,
    kappa: (1 - 1 / POLE_GRADING) / zone,
    spacingMax: 1,
  };
  // φ scales like 1/Δmax when δ and κ scale with Δmax.
  const dm = stretchedLength(unit) / (points - 1);
  return {
    ...unit,
    deltaLeft: unit.deltaLeft * dm,
    deltaRight: unit.deltaRight * dm,
    kappa: unit.kappa * dm,
    spacingMax: dm,
  };
}

/** Cells for the parameters: the stretched length rounded up, at least 2. */
export function cellCount(p: GridParams): number {
  return Math.max(2, Math.ceil(stretchedLength(p) - 1e-9));
}
