// How a rejected CSV import is reported: 422 with `fields` "line N" → reasons, capped in length.
import { MAX_LISTED_ROW_ERRORS, type RowError } from './csv-copy';
import { AppError } from './errors';

export function rowErrorFields(errors: readonly RowError[]): Record<string, string[]> {
  return Object.fromEntries(errors.slice(0, MAX_LISTED_ROW_ERRORS).map((e) => [`line ${e.line}`, e.messages]));
}

export function rowProblemsMessage(count: number): string {
  return `${count} row${count === 1 ? ' has' : 's have'} problems; nothing was imported. Fix ${count === 1 ? 'it' : 'them'} and import the file again`;
}

export function rowProblemsError(count: number, errors: readonly RowError[]): AppError {
  return new AppError('UNPROCESSABLE_CONTENT', rowProblemsMessage(count), rowErrorFields(errors));
}
