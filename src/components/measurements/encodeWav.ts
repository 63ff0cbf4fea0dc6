/**
 * A 16-bit PCM mono WAV file (RIFF, little-endian) of samples in full scale ±1; values beyond ±1 are clipped.
 * This is the format the measurement upload analyses, so a pluck recorded in the browser goes through the same
 * server path as an uploaded file.
 * @param samples - mono samples, full scale ±1
 * @param sampleRateHz - sample rate [Hz]
 * @returns the bytes of the file
 */
export function encodeWav(samples: Float32Array, sampleRateHz: number): ArrayBuffer {
  if (!Number.isInteger(sampleRateHz) || sampleRateHz <= 0)
    throw new Error(`[encodeWav] sample rate must be a positive whole number, got ${sampleRateHz}`);
  const bytesPerSample = 2;
  const dataBytes = samples.length * bytesPerSample;
  const buffer = new ArrayBuffer(44 + dataBytes);
  const view = new DataView(buffer);
  const ascii = (offset: number, text: string) => {
    for (let i = 0; i < text.length; i++) view.setUint8(offset + i, text.charCodeAt(i));
  };
  ascii(0, 'RIFF');
  view.setUint32(4, 36 + dataBytes, true);
  ascii(8, 'WAVE');
  ascii(12, 'fmt ');
  view.setUint32(16, 16, true); // fmt chunk size
  view.setUint16(20, 1, true); // PCM
  view.setUint16(22, 1, true); // mono
  view.setUint32(24, sampleRateHz, true);
  view.setUint32(28, sampleRateHz * bytesPerSample, true); // byte rate
  view.setUint16(32, bytesPerSample, true); // block align
  view.setUint16(34, 16, true); // bits per sample
  ascii(36, 'data');
  view.setUint32(40, dataBytes, true);
  for (let i = 0; i < samples.length; i++) {
    const v = Math.max(-1, Math.min(1, samples[i]));
    // ±1 ↔ −32768 … 32767, the usual convention for 16-bit audio.
    view.setInt16(44 + i * 2, v < 0 ? Math.round(v * 32768) : Math.round(v * 32767), true);
  }
  return buffer;
}

/**
 * Root-mean-square level of a block of samples as a share of full scale (0 … 1), for the level meter.
 * @param block - samples, full scale ±1
 */
export function rmsLevel(block: Float32Array): number {
  if (!block.length) return 0;
  let sum = 0;
  for (const v of block) sum += v * v;
  return Math.min(1, Math.sqrt(sum / block.length));
}

/**
 * A level as the meter shows it: decibels below full scale mapped onto 0–100 over a 60 dB range, so a quiet room
 * sits low and a pluck near the phone reaches the top half.
 * @param rms - RMS level, share of full scale
 */
export function meterPercent(rms: number): number {
  if (rms <= 0) return 0;
  const db = 20 * Math.log10(rms);
  return Math.max(0, Math.min(100, Math.round(((db + 60) / 60) * 100)));
}
