// Hand-built WAV files for the decoder tests: headers wavefile would not write (extensible float, lying sizes).

export interface RawWavSpec {
  /** 1 PCM, 3 float, 6 A-law, 0xFFFE extensible (then `subformat` holds the real code). */
  formatTag: number;
  channels: number;
  sampleRateHz: number;
  bitsPerSample: number;
  /** Sample bytes exactly as they go into the data chunk. */
  data: Uint8Array;
  subformat?: number;
  /** Data chunk size to declare (default: data.length). */
  declaredDataSize?: number;
  /** Block align to declare (default: channels × bits/8). */
  blockAlign?: number;
}

/** Writes a little-endian RIFF/WAVE file with a 16-byte (or 40-byte extensible) fmt chunk. */
export function buildWav(spec: RawWavSpec): Buffer {
  const isExtensible = spec.formatTag === 0xfffe;
  const fmtSize = isExtensible ? 40 : 16;
  const bytesPerSample = spec.bitsPerSample / 8;
  const blockAlign = spec.blockAlign ?? spec.channels * bytesPerSample;
  const out = Buffer.alloc(12 + 8 + fmtSize + 8 + spec.data.length);
  let o = 0;
  o += out.write('RIFF', o, 'ascii');
  o = out.writeUInt32LE(out.length - 8, o);
  o += out.write('WAVE', o, 'ascii');
  o += out.write('fmt ', o, 'ascii');
  o = out.writeUInt32LE(fmtSize, o);
  o = out.writeUInt16LE(spec.formatTag, o);
  o = out.writeUInt16LE(spec.channels, o);
  o = out.writeUInt32LE(spec.sampleRateHz, o);
  o = out.writeUInt32LE(spec.sampleRateHz * blockAlign, o);
  o = out.writeUInt16LE(blockAlign, o);
  o = out.writeUInt16LE(spec.bitsPerSample, o);
  if (isExtensible) {
    o = out.writeUInt16LE(22, o); // cbSize
    o = out.writeUInt16LE(spec.bitsPerSample, o); // valid bits
    o = out.writeUInt32LE(0, o); // channel mask
    // KSDATAFORMAT_SUBTYPE GUID: {code}-0000-0010-8000-00AA00389B71
    o = out.writeUInt32LE(spec.subformat ?? 1, o);
    o = out.writeUInt16LE(0x0000, o);
    o = out.writeUInt16LE(0x0010, o);
    for (const b of [0x80, 0x00, 0x00, 0xaa, 0x00, 0x38, 0x9b, 0x71]) o = out.writeUInt8(b, o);
  }
  o += out.write('data', o, 'ascii');
  o = out.writeUInt32LE(spec.declaredDataSize ?? spec.data.length, o);
  Buffer.from(spec.data.buffer, spec.data.byteOffset, spec.data.byteLength).copy(out, o);
  return out;
}

/** 32-bit float little-endian sample bytes. */
export function float32Bytes(values: number[]): Uint8Array {
  const b = Buffer.alloc(values.length * 4);
  values.forEach((v, i) => b.writeFloatLE(v, i * 4));
  return b;
}

/** 16-bit signed little-endian sample bytes. */
export function int16Bytes(values: number[]): Uint8Array {
  const b = Buffer.alloc(values.length * 2);
  values.forEach((v, i) => b.writeInt16LE(v, i * 2));
  return b;
}
