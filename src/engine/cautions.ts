import type { Caution } from './types';

/**
 * Safety cautions printed on every design sheet and shown on the Design desk (docs/models/checks.md "Cautions"). They are data so
 * that the sheet and the UI print the same words; they defer to the rules that apply where the machine is used.
 */
export const CAUTIONS: readonly Caution[] = [
  {
    id: 'pinch-points',
    title: 'Pinch points',
    text: 'Moving belts, pulleys, the gantry and the carriage can trap fingers, hair and loose clothing. Guard them or keep hands out of the working area while the motors are powered.',
  },
  {
    id: 'electrical-supply',
    title: 'Electrical supply',
    text: 'Stepper drivers and their power supplies carry mains voltage or high DC voltage and currents. Switch off and disconnect before wiring; let a qualified person make mains connections.',
  },
  {
    id: 'stored-energy',
    title: 'Stored energy',
    text: 'A tensioned belt and a gantry under acceleration store energy. Release belt tension before taking pulleys off, and expect the gantry to coast or move when power or a belt fails.',
  },
  {
    id: 'hot-motors',
    title: 'Hot motors and drivers',
    text: 'Stepper motors and drivers run hot, more so above their rated current; a motor case can get hot enough to burn skin. Let them cool before touching them, and keep cables and plastic parts off their surfaces.',
  },
  {
    id: 'unexpected-motion',
    title: 'Unexpected motion at power-up and homing',
    text: 'The carriage can move as soon as the drivers are powered, and homing drives it to the end stops without warning. Keep hands out of the working area when switching on, and check each motor’s direction with a short, slow move before the first homing.',
  },
  {
    id: 'emergency-stop',
    title: 'Emergency stop',
    text: 'Fit an emergency stop within reach that removes power from the motor drivers, not only a software stop, and test it before every run.',
  },
  {
    id: 'tool-hazards',
    title: 'The tool’s own hazards',
    text: 'The tool on the carriage brings hazards of its own — a blade, a hot nozzle, a laser, a spindle, dispensed chemicals. Follow the tool maker’s instructions and guard against them as well as against the stage.',
  },
  {
    id: 'codes-and-practice',
    title: 'Codes and licensed practice',
    text: 'These figures support design; they do not replace the local codes, the machine-safety rules that apply where the machine is used, or the judgement of licensed professionals.',
  },
];
