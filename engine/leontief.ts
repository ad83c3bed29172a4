/**
 * The open Leontief model: x = A x + d, so x = (I − A)⁻¹ d = L d.
 *
 * `LeontiefModel` factors I − A once in its constructor and then answers many questions:
 * output for any number of demand vectors (without forming L), row-vector products c′L by one
 * transposed solve (multipliers), the Leontief inverse L itself when it is the result wanted,
 * residuals and the condition estimate.
 *
 * @example
 * // Miller & Blair (2009), ch. 2, two sectors (from memory)
 * const m = LeontiefModel.fromFlows(fromRows([[150, 500], [200, 100]]), Float64Array.of(1000, 2000));
 * m.solve(Float64Array.of(600, 1500)); // ≈ [1247.52, 1841.58]
 */
import { InputError } from './errors';
import { conditionEstimate } from './linalg/condition';
import { LU } from './linalg/lu';
import type { Matrix } from './linalg/matrix';
import { colSums, identityMinus } from './linalg/matrix';
import { leontiefResidual } from './linalg/residual';
import type { Table } from './table';
import { coefficients } from './table';

export interface Solution {
  x: Float64Array;
  /** ‖d − (I − A)x‖∞ / (‖I − A‖∞‖x‖∞ + ‖d‖∞). */
  residual: number;
}

export class LeontiefModel {
  readonly n: number;
  /** Technical coefficients. */
  readonly A: Matrix;
  private readonly lu: LU;
  private cachedInverse?: Matrix;
  private cachedCondition?: number;

  constructor(A: Matrix) {
    if (A.rows !== A.cols) throw new InputError('not-square', `technical coefficients must be square; got ${A.rows} × ${A.cols}`);
    if (A.rows === 0) throw new InputError('empty', 'the model has no sectors');
    for (let k = 0; k < A.data.length; k++) {
      if (!Number.isFinite(A.data[k]!)) {
        const i = Math.floor(k / A.cols);
        const j = k % A.cols;
        throw new InputError('non-finite', `technical coefficient (${i + 1}, ${j + 1}) is ${A.data[k]}, not a finite number`, { row: i + 1, column: j + 1 });
      }
    }
    this.n = A.rows;
    this.A = A;
    this.lu = new LU(identityMinus(A), { overwrite: true });
  }

  /** A model from flows Z and outputs x (A = Z x̂⁻¹). */
  static fromFlows(Z: Matrix, x: Float64Array): LeontiefModel {
    return new LeontiefModel(coefficients({ Z, x }));
  }

  static fromTable(t: Table): LeontiefModel {
    return new LeontiefModel(coefficients(t));
  }

  /** True when I − A has an exactly zero pivot; every solve then throws `SingularMatrixError`. */
  get isSingular(): boolean {
    return this.lu.isSingular;
  }

  /** The 1-based column of the first zero pivot of I − A, or 0. */
  get singularColumn(): number {
    return this.lu.singularColumn;
  }

  /** Output x = L d for one demand vector. */
  solve(d: ArrayLike<number>): Float64Array {
    return this.lu.solve(d);
  }

  /** Output with its relative residual. */
  solveChecked(d: ArrayLike<number>): Solution {
    const x = this.lu.solve(d);
    return { x, residual: leontiefResidual(this.A, x, d) };
  }

  /** Output for many demand vectors: D is n × r (one column per vector), the result n × r. */
  solveMany(D: Matrix): Matrix {
    return this.lu.solveMany(D);
  }

  /** The row vector c′L, by one transposed solve: (I − A)′ y = c. */
  weighted(c: ArrayLike<number>): Float64Array {
    return this.lu.solveTranspose(c);
  }

  /** Output multipliers: the column sums of L, i′L, by one transposed solve. */
  outputMultipliers(): Float64Array {
    if (this.cachedInverse) return colSums(this.cachedInverse);
    return this.lu.solveTranspose(new Float64Array(this.n).fill(1));
  }

  /** The Leontief inverse L = (I − A)⁻¹, formed on first request and kept. */
  inverse(): Matrix {
    if (!this.cachedInverse) this.cachedInverse = this.lu.inverse();
    return this.cachedInverse;
  }

  /** Whether L has been formed (so that callers can prefer it for many columns). */
  get hasInverse(): boolean {
    return this.cachedInverse !== undefined;
  }

  /** The 1-norm condition estimate of I − A. */
  condition(): number {
    if (this.cachedCondition === undefined) this.cachedCondition = conditionEstimate(this.lu);
    return this.cachedCondition;
  }

  /** The relative residual of a solution x for demand d. */
  residual(x: ArrayLike<number>, d: ArrayLike<number>): number {
    return leontiefResidual(this.A, x, d);
  }

  /** Sign and log-magnitude of det(I − A). */
  determinant(): { sign: number; logAbs: number } {
    return this.lu.determinant();
  }
}
