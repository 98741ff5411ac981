import { CliError } from '../src/lib/cli-error';

/** The CliError a promise rejects with; any other outcome fails the test. */
export async function failure(promise: Promise<unknown>): Promise<CliError> {
  try {
    await promise;
  } catch (e) {
    if (e instanceof CliError) return e;
    throw e;
  }
  throw new Error('expected a CliError');
}
