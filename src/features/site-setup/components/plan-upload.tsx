import { useId, useRef, useState } from 'react';
import { PLAN_UPLOAD_MAX_BYTES } from '@shared/schemas/plan';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { isApiRequestError } from '@/lib/api';
import { showToast } from '@/lib/toast';
import { useUploadPlan } from '../data/upload-plan';
import type { UploadProgress } from '../data/upload-with-progress';

const ACCEPT = 'image/png,image/jpeg,image/webp,image/svg+xml,.png,.jpg,.jpeg,.webp,.svg';
const MAX_MB = PLAN_UPLOAD_MAX_BYTES / (1024 * 1024);

function formatBytes(bytes: number): string {
  return bytes >= 1024 * 1024 ? `${(bytes / (1024 * 1024)).toFixed(1)} MB` : `${Math.max(1, Math.round(bytes / 1024))} KB`;
}

/** Pick a plan image and upload it with a progress bar; the server checks the type by content. */
export function PlanUpload({ organisationId, siteId, levelId, hasPlan }: { organisationId: string; siteId: string; levelId: string; hasPlan: boolean }) {
  const inputId = useId();
  const upload = useUploadPlan(organisationId, siteId, levelId);
  const inputRef = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<File | null>(null);
  const [progress, setProgress] = useState<UploadProgress | null>(null);
  const [problem, setProblem] = useState<string | null>(null);

  const start = () => {
    if (!file) return;
    setProblem(null);
    setProgress({ loadedBytes: 0, totalBytes: file.size, fraction: 0 });
    upload.mutate(
      { file, onProgress: setProgress },
      {
        onSuccess: () => {
          showToast({ tone: 'ok', message: `${file.name} uploaded.` });
          setFile(null);
          setProgress(null);
          // Clear the picker too, or it keeps showing the uploaded file beside a disabled button.
          if (inputRef.current) inputRef.current.value = '';
        },
        onError: (error) => {
          setProgress(null);
          setProblem(isApiRequestError(error) ? error.message : 'The upload failed.');
        },
      },
    );
  };

  const percent = progress?.fraction == null ? null : Math.round(progress.fraction * 100);
  return (
    <div className="flex flex-col gap-3 rounded-xl border border-border bg-surface p-4">
      <div className="flex flex-col gap-1">
        <label htmlFor={inputId} className="font-bold">
          {hasPlan ? 'Replace the plan image' : 'Plan image'}
        </label>
        <p id={`${inputId}-hint`} className="text-sm text-fg-muted">
          PNG, JPEG, WebP or SVG, up to {MAX_MB} MB. Large images are scaled down for devices; the original is kept.
        </p>
        <input
          ref={inputRef}
          id={inputId}
          type="file"
          accept={ACCEPT}
          aria-describedby={`${inputId}-hint`}
          className="min-h-touch rounded-lg border-2 border-field-border bg-surface p-2 text-fg file:mr-3 file:min-h-10 file:rounded file:border-0 file:bg-accent file:px-3 file:font-bold file:text-accent-fg"
          onChange={(event) => {
            setProblem(null);
            setFile(event.target.files?.[0] ?? null);
          }}
        />
      </div>
      {file && file.size > PLAN_UPLOAD_MAX_BYTES && (
        <Alert tone="warning" title="This file is probably too large">
          {file.name} is {formatBytes(file.size)}; the server takes up to {MAX_MB} MB.
        </Alert>
      )}
      {progress && (
        <div className="flex flex-col gap-1">
          <label htmlFor={`${inputId}-progress`} className="text-sm font-bold">
            Uploading {file?.name}: {percent === null ? formatBytes(progress.loadedBytes) : `${percent} %`}
          </label>
          <progress id={`${inputId}-progress`} className="h-4 w-full accent-accent" max={1} value={progress.fraction ?? undefined} data-testid="upload-progress" />
        </div>
      )}
      {problem && (
        <Alert tone="danger" title="The plan was not uploaded">
          <span data-testid="upload-error">{problem}</span>
        </Alert>
      )}
      <div>
        <Button onClick={start} disabled={!file} busy={upload.isPending} busyLabel="Uploading…">
          Upload plan
        </Button>
      </div>
    </div>
  );
}
