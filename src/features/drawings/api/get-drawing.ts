import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DrawingView } from '@shared/schemas/drawing.schema';
import { api } from '@/lib/api-client';

/** One drawing version with its layers, healed model and import report. */
export function getDrawing(drawingId: number): Promise<DrawingView> {
  return api.get<DrawingView>(`/api/drawings/${drawingId}`);
}

export function getDrawingQueryOptions(drawingId: number) {
  return queryOptions({ queryKey: ['drawings', drawingId], queryFn: () => getDrawing(drawingId) });
}

export function useDrawing(drawingId: number | null) {
  return useQuery({ ...getDrawingQueryOptions(drawingId ?? 0), enabled: drawingId !== null });
}

/** Where the original bytes of a version are downloaded from. */
export function drawingFileUrl(drawingId: number): string {
  return `/api/drawings/${drawingId}/file`;
}
