/**
 * The error every statistics function in shared/domain throws for data it cannot analyse: a
 * ragged grid, too few parts, no failures. A caller (the server) maps it to a 4xx with the
 * message as it stands, so the message is written for the person who entered the data.
 */
export class StudyDataError extends RangeError {
  override readonly name = 'StudyDataError';
  constructor(
    message: string,
    /** The input field the message is about, where there is one. */
    readonly field?: string,
  ) {
    super(message);
  }
}
