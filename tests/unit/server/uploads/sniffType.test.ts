import { describe, expect, it } from 'vitest';
import { assertTypeMatches, sniffType, UploadTypeError, type SniffedMime } from '../../../../server/uploads';
import { synthWav, typicalPluck } from './synthRecording';

const PDF = Buffer.from('%PDF-1.7\n1 0 obj\n<< /Type /Catalog >>\nendobj\n%%EOF\n', 'latin1');
const PNG = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0x00, 0x00, 0x00, 0x0d, 0x49, 0x48, 0x44, 0x52, 0, 0, 0, 1]);
const JPEG = Buffer.from([0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46, 0x00, 0x01]);
const WAV = synthWav({ sampleRateHz: 8000, durationS: 0.05, pluck: typicalPluck(100) });
const CSV = Buffer.from('speed_rpm,torque_Ncm\n0,40\n60,38\n', 'utf8');
const TEXT = Buffer.from('Belt notes: re-tension after the first week.\nÜber alles: 12 µm — fine.\n', 'utf8');
const ZIP = Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x14, 0x00, 0x00, 0x00]);

const ALL: SniffedMime[] = ['application/pdf', 'image/png', 'image/jpeg', 'audio/wav', 'text/csv'];

function uploadTypeErrorOf(run: () => unknown): UploadTypeError {
  try {
    run();
  } catch (err) {
    if (err instanceof UploadTypeError) return err;
    throw err;
  }
  throw new Error('expected an UploadTypeError, but the file was accepted');
}

describe('sniffType', () => {
  it.each([
    ['a PDF', PDF, { mime: 'application/pdf', ext: 'pdf' }],
    ['a PNG', PNG, { mime: 'image/png', ext: 'png' }],
    ['a JPEG', JPEG, { mime: 'image/jpeg', ext: 'jpg' }],
    ['a WAV', WAV, { mime: 'audio/wav', ext: 'wav' }],
    ['a CSV', CSV, { mime: 'text/csv', ext: 'csv' }],
    ['a CSV with a BOM and semicolons', Buffer.from('\uFEFFspeed_rpm;torque_Ncm\r\n0;40\r\n', 'utf8'), { mime: 'text/csv', ext: 'csv' }],
    ['plain UTF-8 text', TEXT, { mime: 'text/plain', ext: 'txt' }],
    ['"%PD" (too short for the PDF signature, so only text)', Buffer.from('%PD', 'latin1'), { mime: 'text/plain', ext: 'txt' }],
  ])('when the bytes are %s, then it says so', (_name, bytes, expected) => {
    // Arrange / Act
    const sniffed = sniffType(bytes);
    // Assert
    expect(sniffed).toEqual(expected);
  });

  it.each([
    ['empty', Buffer.alloc(0)],
    ['a ZIP archive', ZIP],
    ['text with a NUL byte', Buffer.from('speed,torque\n0\u0000,1\n', 'utf8')],
    ['Latin-1 text (not UTF-8)', Buffer.from('Drehmoment \xfc\n', 'latin1')],
    ['a RIFF file that is not WAVE', Buffer.from('RIFF\u0000\u0000\u0000\u0000AVI LIST', 'latin1')],
    ['a cut-off PNG signature', PNG.subarray(0, 5)],
    ['text followed by binary', Buffer.concat([CSV, Buffer.from([0x00, 0xff, 0xfe])])],
  ])('when the bytes are %s, then it returns null', (_name, bytes) => {
    // Arrange / Act / Assert
    expect(sniffType(bytes)).toBeNull();
  });
});

describe('assertTypeMatches', () => {
  it.each([
    ['datasheet.pdf', 'application/pdf', PDF, 'application/pdf'],
    ['photo.PNG', 'image/png', PNG, 'image/png'],
    ['photo.jpeg', 'image/jpeg', JPEG, 'image/jpeg'],
    ['photo.jpg', 'image/pjpeg', JPEG, 'image/jpeg'],
    ['pluck.wav', 'audio/x-wav', WAV, 'audio/wav'],
    ['curve.csv', 'application/vnd.ms-excel', CSV, 'text/csv'],
    ['curve.csv', 'text/csv; charset=utf-8', CSV, 'text/csv'],
    ['curve.txt', 'text/plain', CSV, 'text/csv'],
    ['notes.csv', 'text/csv', TEXT, 'text/plain'],
    ['scan', 'application/octet-stream', PDF, 'application/pdf'],
    ['scan.pdf', '', PDF, 'application/pdf'],
    ['scan.pdf', undefined, PDF, 'application/pdf'],
  ])('when "%s" is sent as "%s" with matching content, then the sniffed type is returned', (filename, declared, bytes, mime) => {
    // Arrange / Act
    const sniffed = assertTypeMatches(declared, filename, bytes, ALL);
    // Assert
    expect(sniffed.mime).toBe(mime);
  });

  // [case, file name, declared type, bytes, allowed, code, message fragment]
  const refusals: Array<[string, string, string, Buffer, SniffedMime[], string, RegExp]> = [
    ['a .png name on PDF bytes', 'photo.png', 'image/png', PDF, ALL, 'type_mismatch', /"photo.png" is named .png but contains PDF data/],
    [
      'a PDF type on PNG bytes',
      'image.png',
      'application/pdf',
      PNG,
      ALL,
      'type_mismatch',
      /was sent as application\/pdf but contains PNG data/,
    ],
    ['an .exe name on PDF bytes', 'setup.exe', 'application/octet-stream', PDF, ALL, 'type_mismatch', /named .exe/],
    ['an .html name on text', 'page.html', 'text/html', TEXT, ALL, 'type_mismatch', /named .html/],
    [
      'a WAV where only documents are accepted',
      'pluck.wav',
      'audio/wav',
      WAV,
      ['application/pdf', 'image/png', 'image/jpeg', 'text/csv'],
      'unsupported_type',
      /is a WAV file; accepted here: PDF, PNG, JPEG, text\/CSV/,
    ],
    ['a ZIP archive', 'parts.zip', 'application/zip', ZIP, ALL, 'unsupported_type', /not a file type we accept/],
    ['a ZIP renamed .pdf', 'parts.pdf', 'application/pdf', ZIP, ALL, 'unsupported_type', /not a file type we accept/],
    ['an empty file', 'empty.csv', 'text/csv', Buffer.alloc(0), ALL, 'empty_file', /"empty.csv" is empty/],
  ];

  it.each(refusals)(
    'when the upload is %s, then it throws UploadTypeError (415)',
    (_name, filename, declared, bytes, allowed, code, message) => {
      // Arrange / Act
      const error = uploadTypeErrorOf(() => assertTypeMatches(declared, filename, bytes, allowed));
      // Assert
      expect(error.code).toBe(code);
      expect(error.httpStatus).toBe(415);
      expect(error.message).toMatch(message);
    },
  );
});
