import { createHash } from 'node:crypto';
import { getDb } from '../../../lib/server/db';
import { handler, json, requirePermission } from '../../../lib/server/http';
import { AppError, ValidationError } from '../../../lib/server/errors';
import { readLimitedBytes, readMultipartFiles } from '../../../lib/server/request-body';
import { importAddresses } from '../../../lib/server/repos/addresses';
import { ADDRESS_IMPORT_MAX_BYTES, csvErrorFields, parseAddressCsv } from '../../../lib/schemas/addresses';

const tooLarge = () => new AppError('PAYLOAD_TOO_LARGE', `The file is larger than ${ADDRESS_IMPORT_MAX_BYTES / 1024 / 1024} MB; split it and import the parts`);
const notCsv = () => new AppError('UNSUPPORTED_MEDIA_TYPE', 'Send a CSV file (columns label, postcode, lat, lon)');

const CSV_TYPES = ['text/csv', 'application/csv', 'text/plain', 'application/vnd.ms-excel', ''];

/** The uploaded CSV as bytes and a name: multipart field `file`, or a text/csv body; 413 while streaming. */
async function readUpload(request: Request): Promise<{ bytes: Uint8Array; fileName: string | null }> {
  const type = (request.headers.get('content-type') ?? '').toLowerCase();
  if (type.startsWith('multipart/form-data')) {
    const { files } = await readMultipartFiles(request, { maxFileBytes: ADDRESS_IMPORT_MAX_BYTES, fileTooLargeMessage: tooLarge().message });
    const file = files.find((f) => f.field === 'file');
    if (!file) throw new ValidationError('Choose a CSV file', { file: ['Choose a CSV file'] });
    const typeOk = CSV_TYPES.includes(file.mimeType.toLowerCase().split(';')[0]!.trim());
    const nameOk = !/\.[a-z0-9]+$/i.test(file.fileName) || /\.(csv|txt)$/i.test(file.fileName);
    if (!typeOk || !nameOk) throw notCsv();
    return { bytes: file.bytes, fileName: file.fileName === 'upload' ? null : file.fileName };
  }
  if (type.startsWith('text/csv') || type.startsWith('application/csv')) {
    return { bytes: await readLimitedBytes(request, ADDRESS_IMPORT_MAX_BYTES, tooLarge), fileName: null };
  }
  throw notCsv();
}

// Gazetteer import: all rows or none. Each bad row is reported by its line number.
export const POST = handler(async ({ locals, request }) => {
  const actor = requirePermission(locals, 'reference:manage');
  const { bytes, fileName } = await readUpload(request);
  if (bytes.byteLength === 0) throw new ValidationError('The file is empty', { file: ['The file is empty'] });
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw notCsv();
  }
  if (text.includes('\u0000')) throw notCsv();

  const parsed = parseAddressCsv(text);
  if (parsed.fileErrors.length) {
    throw new AppError('UNPROCESSABLE_CONTENT', parsed.fileErrors[0]!, { file: parsed.fileErrors });
  }
  if (parsed.errors.length) {
    const n = parsed.errors.length;
    throw new AppError(
      'UNPROCESSABLE_CONTENT',
      `${n} row${n === 1 ? ' has' : 's have'} problems; nothing was imported. Fix ${n === 1 ? 'it' : 'them'} and import the file again`,
      csvErrorFields(parsed.errors),
    );
  }
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  const summary = await getDb().transaction((trx) =>
    importAddresses(trx, parsed.rows, { fileName, sha256, bytes: bytes.byteLength }, actor.id),
  );
  return json(summary);
});
