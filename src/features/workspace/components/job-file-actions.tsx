import { useRef, useState } from 'react';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import { Button } from '@/components/ui/button';
import { errorMessage } from '@/lib/api-client';
import { jobFilePath, useImportJobFile } from '../api/import-job-file';

/**
 * The whole model as a job file (the command line's format, README "Job files"): everyone may
 * download it; an engineer may import one onto this truss's geometry as the next model version.
 */
export function JobFileActions({ trussId, mayEdit, hasEdits, onImported }: { trussId: number; mayEdit: boolean; hasEdits: boolean; onImported: (view: TrussModelView) => void }) {
  const input = useRef<HTMLInputElement>(null);
  const importJob = useImportJobFile();
  const [problem, setProblem] = useState<string | null>(null);

  const onFile = async (file: File | undefined) => {
    setProblem(null);
    if (!file) return;
    let job: unknown;
    try {
      job = JSON.parse(await file.text());
    } catch {
      setProblem(`${file.name} is not a JSON job file; export one from this page to see the format.`);
      return;
    }
    importJob.mutate(
      { trussId, job },
      { onSuccess: (view) => onImported(view), onError: (error) => setProblem(errorMessage(error)) },
    );
  };

  return (
    <div className="flex flex-wrap items-center gap-2">
      <a className="text-xs font-medium text-accent underline-offset-2 hover:underline" href={jobFilePath(trussId)} download>
        Download job file
      </a>
      {mayEdit && (
        <>
          <input
            ref={input}
            type="file"
            accept="application/json,.json"
            className="sr-only"
            aria-label="Job file to import"
            onChange={(e) => {
              void onFile(e.target.files?.[0]);
              e.target.value = '';
            }}
          />
          <Button size="sm" variant="quiet" busy={importJob.isPending} disabled={hasEdits} title={hasEdits ? 'Save or discard your changes first' : undefined} onClick={() => input.current?.click()}>
            Import job file
          </Button>
        </>
      )}
      {problem && (
        <p role="alert" className="w-full text-xs text-danger">
          {problem}
        </p>
      )}
    </div>
  );
}
