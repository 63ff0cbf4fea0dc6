import { describe, expect, it } from 'vitest';
import { pluckAdvice, type PluckReading } from '@/components/measurements/pluckAdvice';

/** A 100 Hz target whose band is ±10 % on tension (string law: f·√0.9 … f·√1.1), on a belt allowed 250 N. */
const reading = (frequencyHz: number, tensionN: number): PluckReading => ({
  frequencyHz,
  tensionN,
  targetFrequencyHz: 100,
  targetBandHz: { low: 100 * Math.sqrt(0.9), high: 100 * Math.sqrt(1.1) },
  allowableTensionN: 250,
});
const newtons = (n: number) => `${n.toFixed(0)} N`;

describe('pluckAdvice', () => {
  it('when the reading is on target, then there is nothing to say', () => {
    expect(pluckAdvice(reading(101, 41), newtons)).toEqual([]);
  });

  it('when the reading is twice an on-target frequency, then it hints at the second harmonic and to pluck again (issue 13)', () => {
    const [note] = pluckAdvice(reading(201, 162), newtons);
    expect(note).toMatchObject({ tone: 'warning', harmonic: 2 });
    expect(note.title).toContain('second harmonic');
    expect(note.text).toContain('100.5 Hz');
  });

  it('when the reading means more than the allowable tension, then a safety note says to stop and release, and names a possible overtone', () => {
    const [note] = pluckAdvice(reading(300, 360), newtons);
    expect(note.tone).toBe('danger');
    expect(note.title).toContain('360 N against 250 N');
    expect(note.text).toMatch(/release tension/);
    expect(note.harmonic).toBe(3);
  });

  it('when the reading is far above the target and no overtone fits, then it asks to check the span and the parking position', () => {
    const [note] = pluckAdvice(reading(170, 117), newtons);
    expect(note).toMatchObject({ tone: 'warning', title: 'Far above the target' });
  });
});
