export {
  FOOT_M,
  INCH_M,
  POUND_FORCE_N,
  KIP_N,
  UNITS,
  UNIT_SYSTEMS,
  UnitError,
  baseUnit,
  unitConvert,
  unitFactor,
  unitFromBase,
  unitIsKnown,
  unitQuantity,
  unitToBase,
} from './units';
export type {
  ForceUnit,
  LengthUnit,
  LineLoadUnit,
  MomentUnit,
  PressureUnit,
  Quantity,
  Unit,
  UnitSystemId,
} from './units';
export {
  GROUP_SPACE,
  MINUS_SIGN,
  UNIT_DECIMALS,
  UNIT_SPACE,
  numberFormat,
  quantityFormat,
  unitFormat,
} from './format';
export type { NumberFormatOptions } from './format';
