import { AppError, type ErrorDetail } from '../errors/app-error';

/** Why a scaling analysis was refused; stable codes for the worker, the CLI and the tests. */
export type ScalingFitReason =
  | 'empty-table'
  | 'bad-point'
  | 'duplicate-point'
  | 'too-few-sizes'
  | 'one-x'
  | 'bad-orders'
  | 'no-degrees-of-freedom'
  | 'not-converged'
  | 'not-determined'
  | 'bootstrap-failed';

/**
 * A scaling analysis that cannot be done on this table or with these orders. It is an `invalid`
 * AppError (422) so the api answers it like any other bad input; the message says what to change.
 */
export class ScalingFitError extends AppError {
  readonly reason: ScalingFitReason;

  constructor(reason: ScalingFitReason, message: string, details?: ErrorDetail[]) {
    super('invalid', message, details);
    this.name = 'ScalingFitError';
    this.reason = reason;
  }
}

/** Thrown when the caller's cancel callback says stop; not a fault of the data, so not an AppError. */
export class ScalingFitCancelled extends Error {
  constructor(
    readonly done: number,
    readonly total: number,
  ) {
    super(`the scaling analysis was cancelled after ${done} of ${total} fits`);
    this.name = 'ScalingFitCancelled';
  }
}
