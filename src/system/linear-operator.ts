/**
 * The operator interface shared by the space-time system: a square or
 * rectangular linear map applied into a caller-provided output array.
 */
export interface LinearOperator {
  /** Length of the input vector. */
  readonly inSize: number;
  /** Length of the output vector. */
  readonly outSize: number;
  /** y = Op x (overwrites y). Must not allocate per call. */
  apply(x: Float64Array, y: Float64Array): void;
}
