/** A wrong command line: bad or missing option values. Exit code 2. */
import { RefdeltaError } from '@refdelta/core/defaults-and-errors';

export class UsageError extends RefdeltaError {
  override readonly name: string = 'UsageError';
}
