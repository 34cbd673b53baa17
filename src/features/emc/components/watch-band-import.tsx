import { useId, useState } from 'react';
import type { WatchBandImportResult } from '@shared/schemas/watch-band';
import { WATCH_BAND_CSV_COLUMNS } from '@shared/bands/csv';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { isApiRequestError } from '@/lib/api';
import { showToast } from '@/lib/toast';
import { useImportWatchBands } from '../data/import-watch-bands';

const MAX_BYTES = 900_000;

/**
 * CSV import in two steps: the file is checked first and every bad row listed with its line; then the
 * user imports it whole (only when every row is good) or imports just the good rows.
 */
export function WatchBandImport({ organisationId }: { organisationId: string }) {
  const inputId = useId();
  const run = useImportWatchBands(organisationId);
  const [file, setFile] = useState<{ name: string; csv: string } | null>(null);
  const [report, setReport] = useState<WatchBandImportResult | null>(null);
  const [problem, setProblem] = useState<string | null>(null);

  const check = async (chosen: File | undefined) => {
    setReport(null);
    setProblem(null);
    setFile(null);
    if (!chosen) return;
    if (chosen.size > MAX_BYTES) return setProblem(`${chosen.name} is larger than 900 kB: split it into smaller files.`);
    const csv = await chosen.text();
    setFile({ name: chosen.name, csv });
    run.mutate({ csv, mode: 'check' }, { onSuccess: setReport, onError: (e) => setProblem(e.message) });
  };

  const commit = (mode: 'all' | 'valid_rows') => {
    if (!file) return;
    run.mutate(
      { csv: file.csv, mode },
      {
        onSuccess: (result) => {
          showToast({ tone: 'ok', message: `Imported ${file.name}: ${result.created} new, ${result.updated} changed${result.errors.length ? `, ${result.errors.length} ${result.errors.length === 1 ? 'row' : 'rows'} skipped` : ''}.` });
          setFile(null);
          setReport(null);
        },
        onError: (e) => setProblem(isApiRequestError(e) ? e.message : 'The import failed; nothing was changed.'),
      },
    );
  };

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-col gap-1">
        <label htmlFor={inputId} className="font-bold">
          Import bands from a CSV file
        </label>
        <p id={`${inputId}-hint`} className="text-sm text-fg-muted">
          Columns: {WATCH_BAND_CSV_COLUMNS.join(', ')} — edges in MHz. A row whose name matches a band you have changes that band; the others are added. The file is checked before anything is saved.
        </p>
        <input
          id={inputId}
          type="file"
          accept=".csv,text/csv"
          aria-describedby={`${inputId}-hint`}
          className="min-h-touch text-lg"
          onChange={(event) => void check(event.target.files?.[0])}
        />
      </div>
      {run.isPending && <p role="status">Checking…</p>}
      {problem && (
        <Alert tone="danger" title="The file was not imported">
          {problem}
        </Alert>
      )}
      {report && file && (
        <section aria-label="Import check" className="flex flex-col gap-3 rounded-xl border border-border bg-surface p-4" data-testid="import-report">
          <p>
            <span className="font-bold">{file.name}</span>: {report.rows} {report.rows === 1 ? 'row' : 'rows'}, {report.valid} good, {report.errors.length} with errors.
          </p>
          {report.errors.length > 0 && (
            <table className="w-full border-collapse text-left" aria-label="Rows with errors">
              <thead>
                <tr>
                  <th className="border-b border-border p-2">Line</th>
                  <th className="border-b border-border p-2">What is wrong</th>
                </tr>
              </thead>
              <tbody>
                {report.errors.map((e) => (
                  <tr key={e.line} data-testid="import-error">
                    <td className="border-b border-border p-2 align-top font-bold">{e.line}</td>
                    <td className="border-b border-border p-2">
                      <ul className="list-disc pl-5">
                        {e.messages.map((m) => (
                          <li key={m}>{m}</li>
                        ))}
                      </ul>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
          <div className="flex flex-wrap gap-3">
            {report.errors.length === 0 ? (
              <Button onClick={() => commit('all')} busy={run.isPending} disabled={report.valid === 0}>
                Import {report.valid} {report.valid === 1 ? 'band' : 'bands'}
              </Button>
            ) : (
              report.valid > 0 && (
                <Button onClick={() => commit('valid_rows')} busy={run.isPending}>
                  Import only the {report.valid} good {report.valid === 1 ? 'row' : 'rows'}
                </Button>
              )
            )}
            <Button
              variant="secondary"
              onClick={() => {
                setFile(null);
                setReport(null);
              }}
            >
              Cancel
            </Button>
          </div>
        </section>
      )}
    </div>
  );
}
