/**
 * Drawing import: ASCII DXF line drawings of a truss → joints and members in metres, with a
 * report of every change healing made. Pure (no I/O, no clock, no console): the server runs it
 * on upload, the client may run it for previews.
 *
 * Typical use:
 *   const parsed = dxfParseBytes(bytes);          // or dxfParse(text)
 *   const layers = dxfLayers(parsed);             // for the layer picker
 *   const result = dxfImport(parsed, { units: 'mm' });
 * Every refusal is a DxfImportError { code, message }.
 */
export { DxfImportError, isDxfImportError } from './errors';
export type { DxfImportErrorCode } from './errors';
export { dxfSniff, dxfDecode, dxfParse, dxfParseBytes, dxfAssertKind } from './parse';
export type { DxfFileKind } from './parse';
export { dxfLayers } from './layers';
export { DXF_DEFAULT_LIMITS, MAX_BLOCK_DEPTH, MAX_EXPLODED_SEGMENTS } from './explode';
export type { DxfExplodeLimits } from './explode';
export { tagOfIndex, jointTagsInOrder } from './tags';
export { dxfImport, dxfImportGeometry, dxfModelOf, dxfUnitOf, dxfHandover, namesList } from './import';
export { layerGroupHint, memberGroupsSuggest, memberGroupCodes } from './groups';
export type { LayerGroupHint, GroupSource } from './groups';
export { mechanismCheck, MECHANISM_RANK_MAX_JOINTS } from './mechanism';
export type { MechanismFinding } from './mechanism';
export { POLYLINE_FLAT_TOLERANCE } from './explode';
export { dxfLengthUnitSchema, dxfImportOptionsSchema, DXF_REPORT_MAX_LOCATIONS } from './types';
export type {
  DxfLengthUnit,
  DxfImportOptions,
  DxfPoint,
  DxfExtent,
  DxfParsed,
  DxfLayerInfo,
  DxfReportKind,
  DxfReportEntry,
  DxfMember,
  DxfImportResult,
  DxfGeometry,
  DxfGeometryResult,
} from './types';
