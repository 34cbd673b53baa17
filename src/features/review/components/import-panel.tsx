import { useState } from 'react';
import type { ImportReport } from '@shared/schemas/review';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { isApiRequestError } from '@/lib/api';
import { useImportReadings } from '../data/import-readings';

/** Import readings from a CSV: the file is checked first, then imported whole or its good rows only. */
export function ImportPanel({ organisationId, surveyId }: { organisationId: string; surveyId: string }) {
  const run = useImportReadings(organisationId, surveyId);
  const [file, setFile] = useState<{ name: string; text: string } | null>(null);
  const [report, setReport] = useState<ImportReport | null>(null);
  const check = (csv: string) => run.mutate({ csv, mode: 'check' }, { onSuccess: setReport });
  return (
    <section aria-labelledby="import-title" className="flex flex-col gap-3 rounded-xl border border-border bg-surface p-4">
      <h2 id="import-title" className="text-xl font-bold">
        Import readings from a CSV
      </h2>
      <p className="text-fg-muted">
        Columns as in the export: level_id (or level), x_m, y_m, surveyor_email, measured_at, and magnitude_mT or bx_mT, by_mT, bz_mT (any field unit may
        replace mT in the header). The file is checked first; nothing is imported until you choose.
      </p>
      <label htmlFor="import-file" className="font-bold">
        CSV file
      </label>
      <input
        id="import-file"
        type="file"
        accept=".csv,text/csv"
        className="min-h-touch"
        data-testid="import-file"
        onChange={async (e) => {
          const f = e.target.files?.[0];
          setReport(null);
          if (!f) return setFile(null);
          const text = await f.text();
          setFile({ name: f.name, text });
          check(text);
        }}
      />
      {run.isPending && <p role="status">Working on {file?.name}…</p>}
      {run.error && <Alert tone="danger" title="The import failed">{isApiRequestError(run.error) ? run.error.message : 'Try again.'}</Alert>}
      {report && (
        <div className="flex flex-col gap-2" data-testid="import-report">
          {report.committed ? (
            <Alert tone="ok" title="Imported">
              {report.importedReadings} readings and {report.createdStations} new stations.{report.badRows > 0 && ` ${report.badRows} bad rows were skipped.`}
            </Alert>
          ) : (
            <p>
              {report.rows} rows: {report.goodRows} good, {report.badRows} with problems.
            </p>
          )}
          {report.errors.length > 0 && (
            <div className="max-h-64 overflow-auto">
              <table className="w-full border-collapse text-left text-sm">
                <caption className="sr-only">Problems, row by row</caption>
                <thead>
                  <tr>
                    <th scope="col" className="px-2">Row</th>
                    <th scope="col" className="px-2">Column</th>
                    <th scope="col" className="px-2">Problem</th>
                  </tr>
                </thead>
                <tbody>
                  {report.errors.map((e, i) => (
                    <tr key={i} className="border-t border-border">
                      <td className="px-2">{e.row === 0 ? 'header' : e.row}</td>
                      <td className="px-2">{e.column ?? '—'}</td>
                      <td className="px-2">{e.message}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
          {!report.committed && file && report.goodRows > 0 && (
            <div className="flex flex-wrap gap-3">
              {report.badRows === 0 ? (
                <Button onClick={() => run.mutate({ csv: file.text, mode: 'all' }, { onSuccess: setReport })}>Import {report.goodRows} readings</Button>
              ) : (
                <Button variant="secondary" onClick={() => run.mutate({ csv: file.text, mode: 'valid' }, { onSuccess: setReport })}>
                  Import the {report.goodRows} good rows only
                </Button>
              )}
            </div>
          )}
        </div>
      )}
    </section>
  );
}
