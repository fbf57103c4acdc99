import { useRef, useState, type DragEvent } from 'react';
import { errorMessage } from '@/lib/api-client';

/** A drop zone (and file chooser) for one PDF; `onFile` gets the file dropped or chosen. */
export function PdfDropZone({ title, hint, onFile }: { title: string; hint: string; onFile: (file: File) => void }) {
  const input = useRef<HTMLInputElement>(null);
  const [over, setOver] = useState(false);
  const send = (file: File | undefined) => {
    if (file) onFile(file);
  };
  const onDrop = (e: DragEvent) => {
    e.preventDefault();
    setOver(false);
    send(e.dataTransfer.files[0]);
  };

  return (
    <div
      onDragOver={(e) => {
        e.preventDefault();
        setOver(true);
      }}
      onDragLeave={() => setOver(false)}
      onDrop={onDrop}
      className={`flex flex-col items-center justify-center gap-2 rounded-xs border-2 border-dashed px-6 py-10 text-center transition-colors ${
        over ? 'border-accent bg-accent-soft/50' : 'border-paper-line bg-paper-raised'
      }`}
    >
      <p className="text-sm font-medium text-ink">{title}</p>
      <p className="text-xs text-ink-soft">{hint}</p>
      <button
        type="button"
        onClick={() => input.current?.click()}
        className="mt-2 inline-flex h-9 items-center rounded-xs border border-paper-line bg-paper-raised px-4 text-sm font-medium text-ink hover:bg-paper-sunk"
      >
        Choose a file…
      </button>
      <input
        ref={input}
        type="file"
        accept="application/pdf,.pdf"
        className="sr-only"
        aria-label="PDF to verify"
        onChange={(e) => {
          send(e.target.files?.[0]);
          e.target.value = '';
        }}
      />
    </div>
  );
}

/** "Checking …" while a verify request runs, and its refusal in one sentence. */
export function VerifyProgress({ pending, error, fileName }: { pending: boolean; error: unknown; fileName?: string }) {
  return (
    <>
      {pending && (
        <p role="status" className="text-sm text-ink-soft">
          Checking {fileName}…
        </p>
      )}
      {error ? (
        <p role="alert" className="rounded-xs border border-danger/30 bg-danger/5 px-4 py-3 text-sm text-danger">
          {fileName ? <span className="font-medium">{fileName}: </span> : null}
          {errorMessage(error)}
        </p>
      ) : null}
    </>
  );
}
