import { useId, useRef, useState } from 'react';
import type { Instrument } from '@shared/schemas/instrument';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { isApiRequestError } from '@/lib/api';
import { showToast } from '@/lib/toast';
import { useUploadAntennaFactors } from '../data/upload-antenna-factors';

/** Row problems the server lists for a bad CSV: details.rows[] = {row, message}. */
function rowProblems(details: unknown): string[] {
  const rows = (details as { rows?: unknown } | undefined)?.rows;
  if (!Array.isArray(rows)) return [];
  return rows.flatMap((r) => {
    const { row, message } = (r ?? {}) as { row?: unknown; message?: unknown };
    return typeof message === 'string' ? [typeof row === 'number' ? `Line ${row}: ${message}` : message] : [];
  });
}

export function AntennaFactorUpload({ organisationId, instrument }: { organisationId: string; instrument: Instrument }) {
  const inputId = useId();
  const upload = useUploadAntennaFactors(organisationId);
  const inputRef = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<File | null>(null);
  const [problem, setProblem] = useState<{ message: string; rows: string[] } | null>(null);
  return (
    <div className="flex flex-col gap-2">
      <label htmlFor={inputId} className="text-sm font-bold">
        Antenna factor table (CSV: frequency in MHz, factor in dB/m)
      </label>
      <div className="flex flex-wrap gap-2">
        <input
          ref={inputRef}
          id={inputId}
          type="file"
          accept=".csv,text/csv"
          className="min-h-touch w-full min-w-0 rounded-lg border-2 border-field-border bg-surface p-2 text-fg file:mr-3 file:min-h-10 file:rounded file:border-0 file:bg-accent file:px-3 file:font-bold file:text-accent-fg sm:w-auto sm:flex-1"
          onChange={(event) => {
            setProblem(null);
            setFile(event.target.files?.[0] ?? null);
          }}
        />
        <Button
          variant="secondary"
          disabled={!file}
          busy={upload.isPending}
          busyLabel="Uploading…"
          onClick={() =>
            file &&
            upload.mutate(
              { instrumentId: instrument.id, file },
              {
                onSuccess: (next) => {
                  setFile(null);
                  if (inputRef.current) inputRef.current.value = '';
                  showToast({ tone: 'ok', message: `Antenna factors saved: ${next.antennaFactors?.points ?? 0} points.` });
                },
                onError: (error) =>
                  setProblem({ message: isApiRequestError(error) ? error.message : 'The upload failed.', rows: isApiRequestError(error) ? rowProblems(error.details) : [] }),
              },
            )
          }
        >
          Upload CSV
        </Button>
      </div>
      {problem && (
        <Alert tone="danger" title="The table was not saved">
          <p>{problem.message}</p>
          {problem.rows.length > 0 && (
            <ul className="list-disc pl-5">
              {problem.rows.slice(0, 10).map((r) => (
                <li key={r}>{r}</li>
              ))}
            </ul>
          )}
        </Alert>
      )}
    </div>
  );
}
