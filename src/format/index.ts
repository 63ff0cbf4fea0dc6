/**
 * The one formatting layer of Gantrywright: how every number, quantity, check message, input name and status reads,
 * on screen, in the review diff, on the design sheet and in e-mails, in the reader's unit system. Pure TypeScript
 * (no DOM, no Node): the client and the server's sheet and mail code import it as `@/format`; the engine never does.
 */
export { UNIT_SYSTEMS, isUnitSystem, type UnitSystem } from './unitSystem';
export {
  QUANTITIES,
  RATIO,
  conversionFactor,
  convert,
  displayUnit,
  toDisplay,
  fromDisplay,
  type DisplayUnit,
  type QuantityKey,
} from './displayUnits';
export { formatNumber, formatForInput, parseNumberInput, formatSignedPercent, RESULT_DIGITS } from './formatNumber';
export { formatQuantity, withUnit, NBSP } from './formatQuantity';
export { formatKind, kindDisplay, kindLabel, kindToShown, kindFromUnit, FINE_LENGTH_BELOW_MM, type KindDisplay } from './formatKind';
export { checkText, checkKind, renderParts, type CheckText } from './checkText';
export {
  MECHANISM_LABELS,
  MECHANISM_SHORT,
  DESIGN_STATUS_LABELS,
  SEVERITY_LABELS,
  statusLabel,
  mechanismLabel,
  plural,
  readOnlyReasonText,
} from './labels';
export { INPUT_FIELDS, fieldLabel, fieldMessage, formatInputValue, type InputField } from './inputFields';
export { formatDate, formatDateTime } from './formatDate';
