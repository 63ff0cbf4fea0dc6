/** A note shown with a pluck reading. */
export interface PluckNote {
  tone: 'danger' | 'warning';
  /** Short headline. */
  title: string;
  /** What to do. */
  text: string;
  /** Harmonic number the reading may be (2, 3 …), when that explains it. */
  harmonic?: number;
}

/** What a reading is judged on. */
export interface PluckReading {
  frequencyHz: number;
  tensionN: number;
  targetFrequencyHz: number;
  /** Frequencies that count as on target [Hz]. */
  targetBandHz: { low: number; high: number };
  /** The belt's allowable tight-side tension [N]. */
  allowableTensionN: number;
}

/** A reading this many times the target is "far above" it even when no harmonic fits (our judgement). */
const FAR_ABOVE = 1.5;

/**
 * Notes for a pluck reading: a safety note when it means more tension than the belt may carry, and a hint when the
 * reading is a whole multiple of an on-target frequency — a plucked string rings at its overtones too, and a firm or
 * off-centre pluck, or a phone close to one end, can make the second or third the loudest. Numbers are formatted by
 * the caller (`formatTension`), so the notes follow the reader's unit system.
 * @param r - the reading, the span's target and band, and the belt's allowable tension
 * @param formatTension - force [N] → text in the reader's units
 * @returns notes, most serious first (none for an ordinary reading)
 */
export function pluckAdvice(r: PluckReading, formatTension: (n: number) => string): PluckNote[] {
  const notes: PluckNote[] = [];
  const harmonic = [2, 3, 4].find((n) => {
    const f = r.frequencyHz / n;
    return f >= r.targetBandHz.low && f <= r.targetBandHz.high;
  });
  if (r.tensionN > r.allowableTensionN) {
    notes.push({
      tone: 'danger',
      title: `Above the belt’s allowable tension: ${formatTension(r.tensionN)} against ${formatTension(r.allowableTensionN)}`,
      text:
        (harmonic
          ? `Before you loosen anything, pluck again: ${r.frequencyHz.toFixed(1)} Hz is ${harmonic}× a frequency on target, so this may be an overtone. `
          : '') +
        'If the belt really is this tight, do not tighten further: release tension now, with the motors unpowered. An overloaded belt can snap, and a tensioner or pulley can break loose.',
      harmonic,
    });
  } else if (harmonic) {
    notes.push({
      tone: 'warning',
      title: `This may be the ${harmonic === 2 ? 'second' : harmonic === 3 ? 'third' : 'fourth'} harmonic`,
      text: `${r.frequencyHz.toFixed(1)} Hz ÷ ${harmonic} = ${(r.frequencyHz / harmonic).toFixed(1)} Hz, which is on target. Pluck once, gently, in the middle of the span, and record again before changing the tension.`,
      harmonic,
    });
  } else if (r.frequencyHz > FAR_ABOVE * r.targetFrequencyHz) {
    notes.push({
      tone: 'warning',
      title: 'Far above the target',
      text: 'Check that you plucked the span you chose and that the carriage is parked where the sheet says, then pluck again.',
    });
  }
  return notes;
}
