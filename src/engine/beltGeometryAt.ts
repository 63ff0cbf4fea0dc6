import { solveLoop } from './beltLayout';
import { requireNumber, throwInputError } from './errors';
import { frameToTravel, type TravelInput } from './frame';

/** One belt's geometry at a carriage position. */
export interface BeltGeometry {
  id: string;
  /** Pitch-line length clamp to clamp [mm]. */
  loopLengthMm: number;
  /** Free spans in belt order [mm]. */
  spans: { from: string; to: string; lengthMm: number }[];
  /** Belt between load-bearing nodes: the arms that hold the carriage, from each motor pulley round either way [mm]. */
  arms: { from: string; to: string; lengthMm: number }[];
  /** Wrap on every pulley [°]. */
  wraps: { id: string; wrapDeg: number }[];
}

/**
 * Belt geometry at any carriage position: loop lengths, free spans, the holding arms and the wraps, for the
 * Design desk's "move the carriage" view and for pluck targets at a position other than the parking one.
 * @param args.design - a validated design (mechanism, frame, belt, pulleys, Y motors)
 * @param args.xMm - carriage position along the X travel, 0 … travel X [mm]
 * @param args.yMm - carriage position along the Y travel, 0 … travel Y [mm]
 * @returns one entry per belt
 */
export function beltGeometryAt(args: { design: TravelInput; xMm: number; yMm: number }): BeltGeometry[] {
  const s = 'beltGeometryAt';
  if (!args || typeof args.design !== 'object' || args.design === null) throwInputError(s, 'is required', 'design');
  const t = frameToTravel(args.design);
  const x = requireNumber(s, 'xMm', args.xMm, 0, Math.max(0, t.xMm) + 1e-9);
  const y = requireNumber(s, 'yMm', args.yMm, 0, Math.max(0, t.yMm) + 1e-9);
  return t.layout.loops.map((loop) => {
    const st = solveLoop(loop, t.originXMm + x, t.originYMm + y);
    return {
      id: loop.id,
      loopLengthMm: st.path.lengthMm,
      spans: st.path.spans.map((sp) => ({ from: sp.from, to: sp.to, lengthMm: sp.lengthMm })),
      arms: st.pieces.map((p) => ({ from: p.from, to: p.to, lengthMm: p.lengthMm })),
      wraps: st.path.wraps.map((w) => ({ id: w.id, wrapDeg: (w.wrapRad * 180) / Math.PI })),
    };
  });
}
