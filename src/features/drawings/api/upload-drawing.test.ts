// @vitest-environment jsdom
import { describe, expect, it } from 'vitest';
import { ApiError } from '@/lib/api-client';
import { readUploadAnswer, uploadFormData } from './upload-drawing';

describe('upload request and answer', () => {
  it('when options are given, then layers go as a JSON array, tolerance as metres text, and the file under "file"', () => {
    const file = new File(['0\nEOF\n'], 'roof.dxf');
    const form = uploadFormData(file, { layers: ['CHORDS', 'WEBS'], units: 'mm', tolerance: 0.0005 });
    expect(form.get('layers')).toBe('["CHORDS","WEBS"]');
    expect(form.get('units')).toBe('mm');
    expect(form.get('tolerance')).toBe('0.0005');
    expect((form.get('file') as File).name).toBe('roof.dxf');
  });

  it('when no options are given, then only the file is sent', () => {
    const form = uploadFormData(new File(['x'], 'a.dxf'));
    expect([...form.keys()]).toEqual(['file']);
  });

  it('when the API refuses the file with 422, then the ApiError carries its code and one-sentence message', async () => {
    const body = JSON.stringify({ error: { code: 'not-dxf', message: 'The file is a PNG image, not a DXF drawing.' } });
    const error = await readUploadAnswer({ status: 422, text: body }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ApiError);
    expect((error as ApiError).code).toBe('not-dxf');
    expect((error as ApiError).message).toBe('The file is a PNG image, not a DXF drawing.');
  });

  it('when a proxy answers 413 with an HTML page, then the message still says the file is too large, without the page', async () => {
    const error = (await readUploadAnswer({ status: 413, text: '<html>Request Entity Too Large</html>' }).catch((e: unknown) => e)) as ApiError;
    expect(error.code).toBe('file-too-large');
    expect(error.message).not.toContain('<html>');
  });

  it('when the upload is accepted, then the new version is returned', async () => {
    const view = await readUploadAnswer({ status: 201, text: JSON.stringify({ id: 7, version: 2 }) });
    expect(view).toMatchObject({ id: 7, version: 2 });
  });
});
