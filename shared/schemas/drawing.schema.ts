import { z } from 'zod';
import { dxfImportOptionsSchema, type DxfImportResult, type DxfLayerInfo, type DxfImportOptions } from '@shared/dxf-import';

/** Options sent with an upload (multipart fields) or a re-import (JSON). */
export const drawingImportOptionsSchema = dxfImportOptionsSchema;

export type DrawingStatus = 'imported' | 'failed';

export interface DrawingSummaryView {
  id: number;
  trussId: number;
  version: number;
  originalName: string;
  size: number;
  sha256: string;
  status: DrawingStatus;
  uploadedBy: string;
  createdAt: string;
  importedAt: string;
  /** Joints and members of the last import, 0 when it failed. */
  jointCount: number;
  memberCount: number;
}

export interface DrawingView extends DrawingSummaryView {
  options: DxfImportOptions;
  layers: DxfLayerInfo[];
  /** The healed model and report of the last import; null when it failed. */
  result: DxfImportResult | null;
  /** Why the last import failed; null when it worked. */
  error: { code: string; message: string } | null;
}

export const reimportSchema = drawingImportOptionsSchema;
export type ReimportInput = z.infer<typeof reimportSchema>;

/** The engineer's working model of a truss, as the API shows it. */
export interface TrussModelView {
  trussId: number;
  drawingId: number | null;
  model: import('@shared/model/truss').TrussModel;
  takeoff: unknown | null;
  /** Send back with a save; a save against an older version is refused as a conflict. */
  version: number;
  updatedBy: string;
  updatedAt: string;
}
